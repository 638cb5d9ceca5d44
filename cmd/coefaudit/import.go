package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/cmd/coefaudit/internal/progress"
	"coefaudit/extract/article"

	"github.com/spf13/cobra"
)

// importOptions are what import runs with.
type importOptions struct {
	inputs []string
	out    string
	format string
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	files  *output.Files
}

func newImportCmd(runF func(*importOptions) error) *cobra.Command {
	o := &importOptions{}
	cmd := &cobra.Command{
		Use:   "import ARTICLE...",
		Short: "Read the tables and reported results of articles into a workbook to confirm",
		Long: `Read what articles printed and write the workbook that "check" takes, for a
reviewer to confirm. ARTICLE is a JATS XML file (.xml, .nxml), an HTML page,
a DOCX manuscript, a plain-text results section, "-" for text on standard
input, or a folder of such files.

Read are regression tables (predictor rows; B, SE, β, t, p, CI and OR
columns; models side by side or stacked; SEs in parentheses under the
estimates; stars with the footnote that defines them as p bounds; n and the
outcome from the caption and footnotes), correlation tables (written as
"table ..." sheets), results reported in sentences ("β = .34, 95% CI [.21,
.47], p < .001", "r(198) = .45", "OR = 1.80, 95% CI 1.21-2.68") and
sentences that compare two effects (candidate claims).

Every number keeps its text as printed and its place (the "source" column:
table, row, column, model, or paragraph and sentence). Every guess, every
number not read and every table not read as a results table is a line of
the "to confirm" sheet. A reader never repairs a number: an estimate outside
its own interval stays as printed, for check to flag.

--out FILE.xlsx writes a workbook; --out DIR writes a folder of CSV files
(created if missing and removed again if the import fails; its files
replaced); --format json writes everything found, with places, to --out or
standard output. Each article is written as soon as it is read, so a folder
of any size is imported in flat memory. A file that cannot be read is named
on standard error and on the "to confirm" sheet, and the others go on; the
exit status is 2 only when no file could be read.`,
		Example: `  coefaudit import article.xml --out review.xlsx
  coefaudit import articles/ --out review/            # a folder of CSV files
  coefaudit import manuscript.docx --format json
  pbpaste | coefaudit import - --out review.xlsx`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			switch {
			case o.format != "" && o.format != "json" && o.format != "xlsx" && o.format != "csv":
				return flagErrorf("--format %q: want xlsx, csv or json", o.format)
			case o.format != "json" && o.out == "":
				return flagErrorf("give --out FILE.xlsx, --out DIR (CSV files) or --format json")
			}
			o.inputs, o.stdin, o.stdout, o.stderr, o.files = args, cmd.InOrStdin(), cmd.OutOrStdout(), cmd.ErrOrStderr(), runFiles(cmd)
			if runF != nil {
				return runF(o)
			}
			return runImport(o)
		},
	}
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "the workbook (.xlsx), a folder for CSV files, or with --format json a file (- or nothing: standard output)")
	cmd.Flags().StringVarP(&o.format, "format", "f", "", "xlsx, csv (a folder) or json; by default xlsx for --out *.xlsx and csv otherwise")
	return cmd
}

// runImport reads the articles and writes what they printed.
func runImport(o *importOptions) error {
	files, err := article.Files(o.inputs)
	if err != nil {
		return finish(o.files, flagError{err})
	}
	format := o.format
	if format == "" {
		format = "csv"
		if strings.EqualFold(filepath.Ext(o.out), ".xlsx") {
			format = "xlsx"
		}
	}
	// Each article is written as soon as it is read.
	bar := progress.New(o.stderr, "reading articles")
	var res *article.Result
	if format == "csv" {
		res, err = writeImportFolder(o, files, bar.Update)
	} else {
		res, err = writeImportFile(o, files, format, bar.Update)
	}
	bar.Done()
	if err == nil {
		// Nothing is kept of a run that read nothing.
		err = importFailures(o, res)
	}
	return finish(o.files, err)
}

// importFailures names on standard error each file not read, and is an
// error when no file could be read.
func importFailures(o *importOptions, res *article.Result) error {
	for _, f := range res.Failed {
		fmt.Fprintf(o.stderr, "coefaudit: not read: %s\n", f.Message)
	}
	if len(res.Articles) == 0 {
		return fmt.Errorf("no file could be read as an article")
	}
	return nil
}

// writeImportFile reads the articles into the workbook
// (article.ImportWorkbook) or the JSON document (article.ImportJSON),
// each article written as soon as it is read.
func writeImportFile(o *importOptions, files []string, format string, progress func(done, total int)) (*article.Result, error) {
	t, err := o.files.Open(o.stdout, o.out, o.inputs[0])
	if err != nil {
		return nil, flagError{err}
	}
	var res *article.Result
	if format == "xlsx" {
		var dir string
		if dir, err = o.files.TempDir(); err != nil {
			return nil, err
		}
		res, err = article.ImportWorkbook(files, o.stdin, progress, t, dir)
	} else {
		res, err = article.ImportJSON(files, o.stdin, progress, t)
	}
	if err != nil {
		return nil, err
	}
	return res, t.Close()
}

// writeImportFolder reads the articles into the CSV folder
// (article.ImportFolder), creating the folder itself (not its parents)
// when missing. A run that fails or is interrupted leaves nothing it
// created: its files, and the folder when it made it (output.Files).
func writeImportFolder(o *importOptions, files []string, progress func(done, total int)) (*article.Result, error) {
	if err := o.files.Mkdir(o.out); err != nil {
		return nil, flagError{fmt.Errorf("--out %s: %w", o.out, err)}
	}
	return article.ImportFolder(files, o.stdin, progress, func(name string) (io.WriteCloser, error) {
		return o.files.Open(nil, filepath.Join(o.out, name), o.inputs[0])
	})
}
