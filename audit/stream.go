package audit

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"

	"coefaudit/extract"
)

// MaxStreamProblems is how many input problems a streamed audit keeps for
// its report; beyond it they are counted, so that a file of bad rows cannot
// exhaust memory.
const MaxStreamProblems = 10000

// ClaimSink receives a streamed audit: each claim once, in input order, then
// the summary and the input's problems.
type ClaimSink interface {
	Claim(c *ClaimResult) error
	Finish(s Summary, problems []Problem, omitted int) error
}

// IsPairedCSV reports whether path is a single paired CSV (one claim per
// row with both coefficients inline), the form that can be streamed.
func IsPairedCSV(path string) bool {
	st, err := os.Stat(path)
	if err != nil || st.IsDir() {
		return false
	}
	f, err := os.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	_, err = extract.NewPairedReader(f, path)
	return err == nil
}

// StreamPaired audits a paired CSV as a stream: one row is read, audited and
// handed to sink before the next, so memory does not grow with the number
// of claims. A study's claims are held together while they are contiguous,
// so that the multiplicity adjustment can run over them. The claims carry no
// methods paragraph: the streamed reports (CSV, JSON) do not show it. A
// study whose rows
// are not contiguous is adjusted per run of rows (documented in the help).
// It returns the summary of outcomes.
func StreamPaired(path string, opts Options, sink ClaimSink) (Summary, error) {
	f, err := os.Open(path)
	if err != nil {
		return Summary{}, fmt.Errorf("reading %s: %w", path, err)
	}
	defer f.Close()
	pr, err := extract.NewPairedReader(bufio.NewReaderSize(f, 1<<16), path)
	if err != nil {
		return Summary{}, err
	}
	var (
		problems []Problem
		omitted  int
		summary  = Summary{Counts: map[string]int{}}
		block    []ClaimResult
	)
	keep := func(ps []Problem) {
		for _, p := range ps {
			if len(problems) < MaxStreamProblems {
				problems = append(problems, p)
			} else {
				omitted++
			}
		}
	}
	for _, e := range pr.Problems() {
		keep([]Problem{{Sheet: e.Sheet, Row: e.Row, Column: e.Column, Message: e.Err.Error()}})
	}
	flush := func() error {
		finishClaims(block, opts, false)
		for i := range block {
			summary.Claims++
			summary.Counts[block[i].Outcome]++
			if err := sink.Claim(&block[i]); err != nil {
				return err
			}
		}
		block = block[:0]
		return nil
	}
	in := &extract.Input{Source: path, Coefficients: make([]extract.Coefficient, 2), Claims: make([]extract.Claim, 1)}
	for {
		pc, err := pr.Next()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return summary, err
		}
		if len(block) > 0 && block[0].Study != pc.Claim.Study {
			if err := flush(); err != nil {
				return summary, err
			}
		}
		in.Coefficients[0], in.Coefficients[1], in.Claims[0] = pc.First, pc.Second, pc.Claim
		a := newAuditor(in)
		block = append(block, a.claim(pc.Claim))
		keep(a.problems(in))
	}
	if err := flush(); err != nil {
		return summary, err
	}
	return summary, sink.Finish(summary, problems, omitted)
}

// CSVSink writes a streamed audit as the CSV report, one row per claim.
type CSVSink struct {
	cw     *csv.Writer
	extra  []string
	header bool
}

// NewCSVSink returns a sink writing CSV to w.
func NewCSVSink(w io.Writer) *CSVSink { return &CSVSink{cw: csv.NewWriter(w)} }

// Claim writes one claim, the header before the first; a paired CSV's
// unknown columns are those of its header, so the first row names them.
func (s *CSVSink) Claim(c *ClaimResult) error {
	if !s.header {
		s.extra = c.ExtraNames
		if err := s.cw.Write(append(append([]string{}, csvColumns...), s.extra...)); err != nil {
			return err
		}
		s.header = true
	}
	return s.cw.Write(csvRecord(c, s.extra))
}

// Finish flushes the CSV; problems go to the JSON and table reports, not
// into the rows.
func (s *CSVSink) Finish(Summary, []Problem, int) error {
	if !s.header {
		if err := s.cw.Write(csvColumns); err != nil {
			return err
		}
	}
	s.cw.Flush()
	return s.cw.Error()
}

// JSONSink writes a streamed audit in the JSON form of the output contract:
// the same keys, with "claims" written as they come and "summary" and
// "problems" after them.
type JSONSink struct {
	w     *bufio.Writer
	n     int
	alpha float64
}

// NewJSONSink returns a sink writing JSON to w.
func NewJSONSink(w io.Writer) *JSONSink {
	return &JSONSink{w: bufio.NewWriterSize(w, 1<<16), alpha: extract.DefaultAlpha}
}

// Claim writes one claim.
func (s *JSONSink) Claim(c *ClaimResult) error {
	if s.n == 0 {
		fmt.Fprintf(s.w, "{\n  \"alpha\": %s,\n  \"claims\": [\n", formatAlpha(s.alpha))
	} else {
		s.w.WriteString(",\n")
	}
	s.n++
	b, err := json.MarshalIndent(c, "    ", "  ")
	if err != nil {
		return err
	}
	s.w.WriteString("    ")
	_, err = s.w.Write(b)
	return err
}

// Finish writes the summary and the problems and flushes.
func (s *JSONSink) Finish(sum Summary, problems []Problem, omitted int) error {
	if s.n == 0 {
		fmt.Fprintf(s.w, "{\n  \"alpha\": %s,\n  \"claims\": [", formatAlpha(s.alpha))
	}
	s.w.WriteString("\n  ],\n  \"summary\": ")
	b, err := json.Marshal(sum)
	if err != nil {
		return err
	}
	s.w.Write(b)
	if problems == nil {
		problems = []Problem{}
	}
	if omitted > 0 {
		problems = append(problems, Problem{Message: fmt.Sprintf("%d further problems were found and not listed", omitted)})
	}
	b, err = json.MarshalIndent(problems, "  ", "  ")
	if err != nil {
		return err
	}
	s.w.WriteString(",\n  \"problems\": ")
	s.w.Write(b)
	s.w.WriteString("\n}\n")
	return s.w.Flush()
}
