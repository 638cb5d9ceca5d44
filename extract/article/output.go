package article

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"coefaudit/extract"
)

// WriteJSON writes everything the import found, with places, as one JSON
// document: each article's coefficients, claims, correlation tables and
// lines to confirm, then the files not read.
func WriteJSON(w io.Writer, res *Result) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(res)
}

// WriteFolder writes the sheets as a folder of CSV files, one per sheet
// (CSVName), each through a file create opens.
func WriteFolder(res *Result, create func(name string) (io.WriteCloser, error)) error {
	for _, s := range res.Sheets() {
		w, err := create(CSVName(s.Name))
		if err != nil {
			return err
		}
		if err := WriteCSV(w, s); err != nil {
			w.Close()
			return fmt.Errorf("%s: %w", CSVName(s.Name), err)
		}
		if err := w.Close(); err != nil {
			return err
		}
	}
	return nil
}

// Caution is printed with every report of articles read automatically.
const Caution = "The numbers of these articles were read automatically from their tables and sentences, not typed by a person: " +
	"a column or a sentence may have been misread. Run \"coefaudit import\" on the same articles, confirm every number " +
	"against the article (the \"to confirm\" sheet lists each guess) and check the confirmed workbook before acting on any outcome."

// Source makes the studies of an import, for check: the sheets read from
// memory through extract's readers, every file not read a problem of the
// input naming it, and the claims rows carrying their source, sentence and
// "read: automatically" through to the report.
func Source(res *Result) (*extract.Source, error) {
	in := &extract.Input{Source: "articles"}
	for _, f := range res.Articles {
		if err := addArticle(in, f); err != nil {
			return nil, err
		}
	}
	for _, f := range res.Failed {
		addFailure(in, f.File, f.Err)
	}
	return extract.FromInput(in), nil
}

// addArticle reads one article's sheets into in, placed at its file, its
// claims numbered after those before it.
func addArticle(in *extract.Input, f *Found) error {
	one, err := extract.ReadTextSheets(f.File, (&Result{Articles: []*Found{f}}).Sheets())
	if err != nil {
		return err
	}
	for i := range one.Claims {
		one.Claims[i].Index += len(in.Claims)
	}
	in.Coefficients = append(in.Coefficients, one.Coefficients...)
	in.Claims = append(in.Claims, one.Claims...)
	in.Correlations = append(in.Correlations, one.Correlations...)
	in.Tables = append(in.Tables, one.Tables...)
	in.Problems = append(in.Problems, one.Problems...)
	return nil
}

// addFailure adds a file not read as a problem of the input naming it.
func addFailure(in *extract.Input, file string, err error) {
	in.Problems = append(in.Problems, &extract.CellError{Position: extract.Position{File: file}, Err: err})
}

// IsArticleInput reports whether check should read path as articles
// rather than as the input contract: "-", a file named as an article
// (.xml, .nxml, .html, .htm, .docx, .txt, .text), or a folder without a
// claims.csv.
func IsArticleInput(path string) bool {
	if path == "-" {
		return true
	}
	fi, err := os.Stat(path)
	if err != nil {
		return false
	}
	if fi.IsDir() {
		entries, err := os.ReadDir(path)
		if err != nil {
			return false
		}
		for _, e := range entries {
			if strings.EqualFold(e.Name(), "claims.csv") {
				return false
			}
		}
		return true
	}
	switch strings.ToLower(filepath.Ext(path)) {
	case ".xml", ".nxml", ".html", ".htm", ".docx", ".txt", ".text":
		return true
	}
	return false
}

// Open lists the article files of paths (Files), imports them and makes
// their studies as Source does, one article at a time: what an article
// found is dropped once its rows are read, so that memory holds the rows
// of the input contract, not every number's places and lines to confirm.
// The Result returned names each article read (File, Format, Study, and
// how many lines it has to confirm in ToConfirm's place: ConfirmCount)
// and each file not read.
func Open(paths []string, stdin io.Reader, progress func(done, total int)) (*extract.Source, *Result, error) {
	files, err := Files(paths)
	if err != nil {
		return nil, nil, err
	}
	in := &extract.Input{Source: "articles"}
	res := &Result{}
	importEach(files, stdin, progress, func(file string, f *Found, ferr error) {
		if ferr != nil {
			res.Failed = append(res.Failed, &Failure{File: file, Err: ferr, Message: ferr.Error()})
			addFailure(in, file, ferr)
			return
		}
		if err == nil {
			err = addArticle(in, f)
		}
		res.Articles = append(res.Articles, &Found{File: f.File, Format: f.Format, Study: f.Study, ConfirmCount: len(f.ToConfirm)})
	})
	if err != nil {
		return nil, nil, err
	}
	return extract.FromInput(in), res, nil
}

// ToConfirmCount is the number of lines to confirm: each article's and
// a line for each file not read.
func (r *Result) ToConfirmCount() int {
	n := len(r.Failed)
	for _, f := range r.Articles {
		n += max(len(f.ToConfirm), f.ConfirmCount)
	}
	return n
}
