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
	in, err := extract.ReadTextSheets("articles", res.Sheets())
	if err != nil {
		return nil, err
	}
	for _, f := range res.Failed {
		in.Problems = append(in.Problems, &extract.CellError{Position: extract.Position{File: f.File}, Err: f.Err})
	}
	return extract.FromInput(in), nil
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

// Open lists the article files of paths (Files), imports them (Import) and
// makes their studies (Source).
func Open(paths []string, stdin io.Reader, progress func(done, total int)) (*extract.Source, *Result, error) {
	files, err := Files(paths)
	if err != nil {
		return nil, nil, err
	}
	res := Import(files, stdin, progress)
	src, err := Source(res)
	return src, res, err
}

// ToConfirmCount is the number of lines of the to confirm sheet.
func (r *Result) ToConfirmCount() int {
	n := len(r.Failed)
	for _, f := range r.Articles {
		n += len(f.ToConfirm)
	}
	return n
}
