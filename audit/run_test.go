package audit

import (
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"coefaudit/extract"
)

// runFile audits a file through extract.Open and Run, as every report does.
func runFile(t *testing.T, text string, opts Options) ([]StudyResult, Summary) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "paired.csv")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	src, err := extract.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	var runs []StudyResult
	sum, err := Run(src.Studies(), opts, func(r StudyResult) error {
		runs = append(runs, r)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return runs, sum
}

// TestRunInterleavedStudyIsOneFamily: the rows of study A stand apart, with
// B's between them. A's two claims are still one family of the Holm
// adjustment (each p doubled at most), the results come in input order,
// and the outcomes are those of the same rows written study by study.
//
// The two p are those of independent z tests: (0.5 − 0.2)/√0.02 = 2.121,
// p = 0.0339, and (0.45 − 0.2)/√0.02 = 1.768, p = 0.0771; Holm (1979)
// multiplies the smaller by 2 (0.0678) and keeps the larger (0.0771), so
// neither difference stands at α = 0.05 once adjusted.
func TestRunInterleavedStudyIsOneFamily(t *testing.T) {
	const header = "study,claim,published,first_group,first_estimate,first_se,second_group,second_estimate,second_se\n"
	a1 := "A,a1,differ,girls,0.500,0.100,boys,0.200,0.100\n"
	a2 := "A,a2,differ,girls,0.450,0.100,boys,0.200,0.100\n"
	b1 := "B,b1,differ,girls,0.900,0.100,boys,0.200,0.100\n"
	interleaved, _ := runFile(t, header+a1+b1+a2, Options{Adjust: AdjustHolm})
	together, _ := runFile(t, header+a1+a2+b1, Options{Adjust: AdjustHolm})

	var order []string
	got := map[string]ClaimResult{}
	for _, run := range interleaved {
		for _, c := range run.Claims {
			order = append(order, c.Claim)
			got[c.Claim] = c
		}
	}
	if strings.Join(order, ",") != "a1,b1,a2" {
		t.Errorf("claims came as %v, want input order a1,b1,a2", order)
	}
	for _, run := range together {
		for _, want := range run.Claims {
			c := got[want.Claim]
			if c.Outcome != want.Outcome || c.AdjustedP == nil || want.AdjustedP == nil || c.AdjustedP.Holm != want.AdjustedP.Holm {
				t.Errorf("claim %s: interleaved %s (Holm %v), together %s (Holm %v)", want.Claim, c.Outcome, c.AdjustedP, want.Outcome, want.AdjustedP)
			}
		}
	}
	a := got["a1"]
	if a.AdjustedP == nil {
		t.Fatalf("a1 has no adjusted p: %+v", a)
	}
	if a.family != 2 || a.Outcome != Unsupported || !near(float64(a.AdjustedP.Holm), 2*float64(a.P), 1e-12) || !near(float64(a.P), 0.0339, 5e-4) {
		t.Errorf("a1: family %d, p %v, Holm %v, outcome %s; want family 2, p 0.0339, Holm 2p, unsupported", a.family, a.P, a.AdjustedP.Holm, a.Outcome)
	}
}

func near(a, b, tol float64) bool { return a-b <= tol && b-a <= tol }

// manyStudies is an input of n studies of one independent claim each.
func manyStudies(n int) *extract.Input {
	in := &extract.Input{}
	for i := range n {
		s := "S" + strconv.Itoa(i)
		in.Coefficients = append(in.Coefficients,
			extract.Coefficient{Study: s, Label: "a", Group: "g", Measure: extract.MeasureB, Estimate: printed("0.500"), SE: printed("0.100")},
			extract.Coefficient{Study: s, Label: "b", Group: "h", Measure: extract.MeasureB, Estimate: printed("0.200"), SE: printed("0.100")})
		in.Claims = append(in.Claims, extract.Claim{Study: s, Claim: "c", First: "a", Second: "b", Published: extract.PublishedDiffer, Alpha: 0.05, Basis: extract.BasisTest})
	}
	return in
}

// TestRunStopsOnErrors: an error of emit or of the studies ends Run with
// that error, after the claims before it, and leaves no goroutine blocked
// (the test would hang).
func TestRunStopsOnErrors(t *testing.T) {
	stop := errors.New("disk full")
	calls := 0
	sum, err := Run(extract.FromInput(manyStudies(5000)).Studies(), DefaultOptions, func(StudyResult) error {
		if calls++; calls == 3 {
			return stop
		}
		return nil
	})
	if !errors.Is(err, stop) || calls != 3 || sum.Claims > 3 {
		t.Errorf("emit failing at call 3: error %v after %d calls, %d claims summed", err, calls, sum.Claims)
	}

	bad := errors.New("unreadable row")
	studies := func(yield func(*extract.Study, error) bool) {
		for st := range extract.FromInput(manyStudies(2)).Studies() {
			if !yield(st, nil) {
				return
			}
		}
		yield(nil, bad)
	}
	emitted := 0
	sum, err = Run(studies, DefaultOptions, func(r StudyResult) error { emitted += len(r.Claims); return nil })
	if !errors.Is(err, bad) || emitted != 2 || sum.Claims != 2 {
		t.Errorf("studies failing after 2: error %v, %d claims emitted, %d summed; want the error after both claims", err, emitted, sum.Claims)
	}
}

// TestRunBatchesStudiesWithoutClaims: studies without claims (articles
// whose claims were not matched) are audited as they come, not held until
// the source ends, and a batch of such studies holds about as many
// coefficients as a batch of claims would (a dense article's hundreds of
// coefficients weigh more than one claim). Before the fix the whole source
// was one batch. The source waits, after a few batches' worth of studies,
// for the first result to come out; held whole, none would, and the wait
// ends at its deadline.
func TestRunBatchesStudiesWithoutClaims(t *testing.T) {
	for _, tc := range []struct {
		name          string
		coefficients  int // per study
		studies, wait int // wait for a result before study number wait
	}{
		{"one coefficient each", 1, 20 * batchClaims, 2 * batchClaims},
		{"dense articles", 16 * batchClaims, 20, 2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var emitted atomic.Int64 // emit runs in Run's goroutine, the source in its own
			sawResult := false
			studies := func(yield func(*extract.Study, error) bool) {
				for i := range tc.studies {
					if i == tc.wait {
						deadline := time.Now().Add(20 * time.Second)
						for emitted.Load() == 0 && time.Now().Before(deadline) {
							time.Sleep(time.Millisecond)
						}
						sawResult = emitted.Load() > 0
					}
					name := "s" + strconv.Itoa(i)
					st := &extract.Study{Name: name, Coefficients: make([]extract.Coefficient, tc.coefficients)}
					for j := range st.Coefficients {
						st.Coefficients[j] = extract.Coefficient{Study: name, Label: "x" + strconv.Itoa(j)}
					}
					if !yield(st, nil) {
						return
					}
				}
			}
			_, err := Run(studies, DefaultOptions, func(StudyResult) error {
				emitted.Add(1)
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			if !sawResult {
				t.Errorf("no study of the first %d was emitted while the source waited; want them handed out in batches", tc.wait)
			}
			if emitted.Load() != int64(tc.studies) {
				t.Errorf("%d of %d studies emitted", emitted.Load(), tc.studies)
			}
		})
	}
}
