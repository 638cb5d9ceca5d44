package article

import (
	"bufio"
	"encoding/json"
	"errors"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"coefaudit/extract"
)

// ImportJSON reads every file as Import does and writes everything found,
// with places, as one JSON document to w: {"articles": [...], "failed":
// [...]}, each article's coefficients, claims, correlation tables and
// lines to confirm, then the files not read. Each article is encoded
// through encoding/json as soon as it is read and then dropped, so that
// memory stays flat over a folder of any number of articles. Nothing is
// written when no article was read. The Result is as ImportFolder's.
func ImportJSON(files []string, stdin io.Reader, progress func(done, total int), w io.Writer) (*Result, error) {
	bw := bufio.NewWriter(w)
	res := &Result{}
	var err error
	importEach(files, stdin, progress, func(file string, f *Found, ferr error) bool {
		if ferr != nil {
			res.Failed = append(res.Failed, &Failure{File: file, Err: ferr, Message: ferr.Error()})
			return true
		}
		sep := ",\n    "
		if len(res.Articles) == 0 {
			sep = "{\n  \"articles\": [\n    "
		}
		res.Articles = append(res.Articles, &Found{File: f.File, Format: f.Format, Study: f.Study, ConfirmCount: len(f.ToConfirm)})
		var b []byte
		if b, err = json.MarshalIndent(f, "    ", "  "); err != nil {
			return false
		}
		bw.WriteString(sep)
		_, err = bw.Write(b)
		return err == nil
	})
	if err != nil || len(res.Articles) == 0 {
		return res, err
	}
	failed, err := json.MarshalIndent(res.Failed, "  ", "  ")
	if err != nil {
		return nil, err
	}
	bw.WriteString("\n  ],\n  \"failed\": ")
	bw.Write(failed)
	bw.WriteString("\n}\n")
	return res, bw.Flush()
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

// addArticle reads one article's sheets into in, placed at its file.
func addArticle(in *extract.Input, f *Found) error {
	one, err := extract.ReadTextSheets(f.File, (&Result{Articles: []*Found{f}}).Sheets())
	if err != nil {
		return err
	}
	in.Coefficients = append(in.Coefficients, one.Coefficients...)
	in.Claims = append(in.Claims, one.Claims...)
	in.Correlations = append(in.Correlations, one.Correlations...)
	in.Tables = append(in.Tables, one.Tables...)
	for _, p := range one.Problems {
		// An article without a claim leaves its claims sheet a header:
		// that is what was printed, not a problem of the input.
		if len(f.Claims) == 0 && p.Sheet == "claims" && p.Row == 0 && errors.Is(p, extract.ErrMissingValue) {
			continue
		}
		in.Problems = append(in.Problems, p)
	}
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

// Open lists the article files of paths (Files) and returns their
// studies as Source makes them, but read one article at a time as the
// studies are ranged over (extract.FromInputs): an article's numbers are
// held only until its studies have been audited, and what it found beyond
// its rows (the places, the lines to confirm) is dropped once its rows are
// read, so that memory stays flat over a folder of any number of
// articles. The Result names each article read (File, Format, Study and
// ConfirmCount) and each file not read; like the Source's problems, it is
// complete once the studies have been read.
func Open(paths []string, stdin io.Reader, progress func(done, total int)) (*extract.Source, *Result, error) {
	files, err := Files(paths)
	if err != nil {
		return nil, nil, err
	}
	res := &Result{}
	inputs := func(yield func(*extract.Input, error) bool) {
		importEach(files, stdin, progress, func(file string, f *Found, ferr error) bool {
			in := &extract.Input{Source: file}
			if ferr != nil {
				res.Failed = append(res.Failed, &Failure{File: file, Err: ferr, Message: ferr.Error()})
				addFailure(in, file, ferr)
				return yield(in, nil)
			}
			res.Articles = append(res.Articles, &Found{File: f.File, Format: f.Format, Study: f.Study, ConfirmCount: len(f.ToConfirm)})
			if err := addArticle(in, f); err != nil {
				return yield(nil, err)
			}
			return yield(in, nil)
		})
	}
	return extract.FromInputs("articles", slices.Clone(claimHeader[6:]), inputs), res, nil
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
