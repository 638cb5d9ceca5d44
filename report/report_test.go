package report

import (
	"runtime"
	"strconv"
	"sync/atomic"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// overlapWriter is an InputWriter that counts the calls of Input and Study
// under way and notes when one starts while another is running.
type overlapWriter struct {
	active, overlaps, inputs, studies atomic.Int64
}

func (w *overlapWriter) enter() {
	if w.active.Add(1) > 1 {
		w.overlaps.Add(1)
	}
	// Give another goroutine the chance to come in while this call is
	// under way, as a writer's work on a large study would.
	for range 20 {
		runtime.Gosched()
	}
	w.active.Add(-1)
}

func (w *overlapWriter) Begin(Header) error { return nil }
func (w *overlapWriter) End(Footer) error   { return nil }
func (w *overlapWriter) Input(*extract.Study) error {
	w.inputs.Add(1)
	w.enter()
	return nil
}
func (w *overlapWriter) Study(audit.StudyResult) error {
	w.studies.Add(1)
	w.enter()
	return nil
}

// manyStudies is an invented input of n studies of one claim each, two
// independent coefficients per study.
func manyStudies(n int) *extract.Input {
	in := &extract.Input{Source: "invented.xlsx"}
	for k := range n {
		study := "study " + strconv.Itoa(k+1)
		for i, label := range []string{"x", "y"} {
			in.Coefficients = append(in.Coefficients, extract.Coefficient{
				Position: extract.Position{Sheet: "coefficients", Row: 2 + 2*k + i},
				Study:    study, Label: label, Measure: extract.MeasureB, Group: label,
				Estimate: printed([]string{"0.41", "0.18"}[i]), SE: printed("0.06"), CILevel: 95,
			})
		}
		in.Claims = append(in.Claims, extract.Claim{Position: extract.Position{Sheet: "claims", Row: 2 + k},
			Study: study, Claim: "c", First: "x", Second: "y", Published: extract.PublishedDiffer,
			Basis: extract.BasisTest, Alpha: 0.05})
	}
	return in
}

// TestInputNeverBesideStudy: audit.Run reads the studies in a goroutine of
// its own, so the writer's Input (called as each study is read) ran beside
// its Study (called as results come back); the xlsx writer, whose Input
// and Study share a map, died with "concurrent map writes" on a paired CSV
// of 200,000 claims. Input and Study must never run at once.
func TestInputNeverBesideStudy(t *testing.T) {
	const n = 2000
	w := &overlapWriter{}
	if _, err := run(extract.FromInput(manyStudies(n)), w, "test", Options{}); err != nil {
		t.Fatal(err)
	}
	if w.inputs.Load() != n || w.studies.Load() != n {
		t.Fatalf("Input called %d times, Study %d times; want %d each", w.inputs.Load(), w.studies.Load(), n)
	}
	if got := w.overlaps.Load(); got != 0 {
		t.Errorf("Input and Study ran at once %d times, want never", got)
	}
}
