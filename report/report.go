package report

import (
	"errors"
	"fmt"
	"io"
	"iter"
	"slices"
	"sync"

	"coefaudit/audit"
	"coefaudit/extract"
)

// Header is what a report knows before its first claim.
type Header struct {
	// Source names the input as the report shows it.
	Source string
	// Alpha is the significance level of a claim that sets none.
	Alpha float64
	// ClaimColumns are the claims rows' unknown columns, in header order:
	// they pass through to the CSV and xlsx reports.
	ClaimColumns []string
	// Adjust is the multiplicity adjustment deciding the outcomes
	// (audit.AdjustNone, AdjustHolm or AdjustBH).
	Adjust string
	// Cautions are printed with every report a person reads; audit.Cautions
	// when empty.
	Cautions []string
	// ClaimRows and CoefficientRows are the input's rows as counted when it
	// was opened (extract.Source.Rows), when RowsKnown: a writer that holds
	// at most so many rows refuses the input before it is audited.
	ClaimRows, CoefficientRows int
	RowsKnown                  bool
}

// cautions returns the header's cautions, or the audit's.
func (h Header) cautions() []string {
	if len(h.Cautions) > 0 {
		return h.Cautions
	}
	return audit.Cautions
}

// Footer is what a report knows after its last claim.
type Footer struct {
	// Summary counts the claims and their outcomes.
	Summary audit.Summary
	// Problems are the input's problems that belong to no study (a
	// missing sheet or column, a header-only file); the studies' own came
	// with their results.
	Problems []audit.Problem
}

// Writer writes one report as the audit goes: Begin once, Study for each
// run of results in input order (audit.Run's emit), End once. Each method
// returns the first error of the underlying writer; after an error the
// report is incomplete and the caller discards it. Nothing is written to
// the io.Writer after End returns. A writer that keeps more than what it
// writes to the io.Writer (the xlsx writer's temporary files) is also an
// io.Closer, to be closed whether or not End ran; Check and Write do.
type Writer interface {
	Begin(h Header) error
	Study(res audit.StudyResult) error
	End(f Footer) error
}

// InputWriter is a Writer that also shows the input as it was read (the
// xlsx workbook keeps the input's sheets): Check hands it each study
// before the study is audited. Input is called as the studies are read,
// in a goroutine of audit.Run's own, but never while Study runs, so that
// a writer need not be safe for concurrent use.
type InputWriter interface {
	Writer
	Input(st *extract.Study) error
}

// ErrFormat is returned for a report format New does not know.
var ErrFormat = errors.New("unknown report format")

// Formats returns the formats New knows, in the order help lists them.
func Formats() []string { return []string{"table", "json", "csv", "md", "xlsx", "html"} }

// New returns the writer of format (one of Formats) writing to w. The
// writers buffer what they write and flush it by End.
func New(format string, w io.Writer) (Writer, error) { return newWriter(format, w, Options{}) }

// newWriter is New with the settings of Check.
func newWriter(format string, w io.Writer, o Options) (Writer, error) {
	switch format {
	case "table":
		return newTableWriter(w), nil
	case "json":
		return newJSONWriter(w), nil
	case "csv":
		return newCSVWriter(w), nil
	case "md":
		return newMarkdownWriter(w), nil
	case "html":
		return newHTMLWriter(w), nil
	case "xlsx":
		return newXLSXWriter(w, o.TempDir), nil
	}
	return nil, fmt.Errorf("%q: %w (want one of %v)", format, ErrFormat, Formats())
}

// Options are the settings of Check and Collect.
type Options struct {
	// Audit are the audit's settings.
	Audit audit.Options
	// Source names the input in the report; the path when empty.
	Source string
	// TempDir is the folder where a writer keeps its temporary files (the
	// xlsx writer's long sheets), so that a caller can remove them should
	// the run be cut short; the system's temporary folder when empty.
	TempDir string
	// Cautions are printed after the audit's own (audit.Cautions): that
	// the numbers of articles were read automatically, say.
	Cautions []string
}

// Check reads the input at path (a workbook, a folder of CSVs or a paired
// CSV), audits it study by study and writes the report in format to w as
// it goes: extract.Open, then Begin, audit.Run handing each run of results
// to Study, and End. It returns the summary of the claims audited. The
// error is non-nil when the input cannot be opened or read on, or the
// report cannot be written; problems with single rows are in the report.
// Nothing is written to w when the input cannot be opened.
func Check(path string, w io.Writer, format string, o Options) (audit.Summary, error) {
	wr, err := newWriter(format, w, o)
	if err != nil {
		return audit.Summary{}, err
	}
	src, err := extract.Open(path)
	if err != nil {
		return audit.Summary{}, err
	}
	defer src.Close()
	return run(src, wr, format, o)
}

// CheckSource is Check for a source already open, such as the articles an
// import read into memory: the same path from Begin to End. The source is
// not closed.
func CheckSource(src *extract.Source, w io.Writer, format string, o Options) (audit.Summary, error) {
	wr, err := newWriter(format, w, o)
	if err != nil {
		return audit.Summary{}, err
	}
	return run(src, wr, format, o)
}

// run writes the report of an open source.
func run(src *extract.Source, wr Writer, format string, o Options) (audit.Summary, error) {
	if c, ok := wr.(io.Closer); ok {
		defer c.Close()
	}
	h := Header{Source: o.Source, Alpha: extract.DefaultAlpha, ClaimColumns: src.ClaimColumns,
		Adjust: o.Audit.Adjust, Cautions: append(slices.Clip(audit.Cautions), o.Cautions...)}
	if h.Source == "" {
		h.Source = src.Path
	}
	h.ClaimRows, h.CoefficientRows, h.RowsKnown = src.Rows()
	if h.Adjust == "" {
		h.Adjust = audit.DefaultOptions.Adjust
	}
	if err := wr.Begin(h); err != nil {
		return audit.Summary{}, fmt.Errorf("writing the %s report: %w", format, err)
	}
	studies, opts, err := audit.StudiesOf(src, o.Audit)
	if err != nil {
		return audit.Summary{}, err
	}
	// audit.Run reads the studies in a goroutine of its own: Input (as a
	// study is read) and Study (as results come back) take turns.
	var turn sync.Mutex
	if iw, ok := wr.(InputWriter); ok {
		studies = showingInput(studies, iw, &turn)
	}
	sum, err := audit.Run(studies, opts, func(res audit.StudyResult) error {
		turn.Lock()
		defer turn.Unlock()
		if err := wr.Study(res); err != nil {
			return fmt.Errorf("writing the %s report: %w", format, err)
		}
		return nil
	})
	if err != nil {
		return sum, err
	}
	if err := wr.End(Footer{Summary: sum, Problems: audit.InputProblems(src.Problems())}); err != nil {
		return sum, fmt.Errorf("writing the %s report: %w", format, err)
	}
	return sum, nil
}

// showingInput hands each study to iw before it is audited, holding turn
// while it does.
func showingInput(studies iter.Seq2[*extract.Study, error], iw InputWriter, turn *sync.Mutex) iter.Seq2[*extract.Study, error] {
	return func(yield func(*extract.Study, error) bool) {
		for st, err := range studies {
			if err == nil {
				turn.Lock()
				err := iw.Input(st)
				turn.Unlock()
				if err != nil {
					yield(nil, fmt.Errorf("writing the input into the report: %w", err))
					return
				}
			}
			if !yield(st, err) {
				return
			}
		}
	}
}

// Collect reads and audits the input at path into one report held in
// memory, for what needs every claim at once (pooling). Its problems list
// the input's own first, then each study's.
func Collect(path string, o Options) (*audit.Report, error) {
	src, err := extract.Open(path)
	if err != nil {
		return nil, err
	}
	defer src.Close()
	rep, err := audit.Collect(src, o.Audit)
	if err != nil {
		return nil, err
	}
	if o.Source != "" {
		rep.Source = o.Source
	}
	return rep, nil
}

// Write writes a report already held in memory (the audit of one typed
// comparison, say) through the writer of format: each run of consecutive
// claims of one study is one Study call, and every problem of the report
// goes to End. There is no input to show, so the xlsx workbook has no
// input sheets.
func Write(format string, w io.Writer, rep *audit.Report) error {
	wr, err := New(format, w)
	if err != nil {
		return err
	}
	if c, ok := wr.(io.Closer); ok {
		defer c.Close()
	}
	return writeTo(wr, rep)
}

// writeTo writes a report held in memory through wr, a study at a time.
func writeTo(wr Writer, rep *audit.Report) error {
	h := Header{Source: rep.Source, Alpha: rep.Alpha, Cautions: rep.Cautions, Adjust: audit.DefaultOptions.Adjust}
	for i := range rep.Claims {
		for _, n := range rep.Claims[i].ExtraNames {
			if !slices.Contains(h.ClaimColumns, n) {
				h.ClaimColumns = append(h.ClaimColumns, n)
			}
		}
	}
	if err := wr.Begin(h); err != nil {
		return err
	}
	for start := 0; start < len(rep.Claims); {
		end := start + 1
		for end < len(rep.Claims) && rep.Claims[end].Study == rep.Claims[start].Study {
			end++
		}
		if err := wr.Study(audit.StudyResult{Study: rep.Claims[start].Study, Claims: rep.Claims[start:end]}); err != nil {
			return err
		}
		start = end
	}
	return wr.End(Footer{Summary: rep.Summary, Problems: rep.Problems})
}
