package extract

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// Values in testdata/paired.csv are printed values from these publications;
// the claims around them are made up:
//   - Torgerson DJ, Bell-Syer SEM (2001), JAMA 285:2891–2897, abstract:
//     women under 60, RR 0.67, 95% CI 0.46–0.98, P = .03. Women 60 or over:
//     RR 0.88, read only as quoted in a rapid response to Altman DG, Bland
//     JM (2003), BMJ 326:219 (bmj.com/content/326/7382/219/rapid-responses);
//     its CI 0.71–1.08 is from memory.
//   - Woodward M (2019). Rationale and tutorial for analysing and reporting
//     sex differences in cardiovascular associations. Heart
//     105(22):1701–1708, Table 4 (Adventist study): women RR 2.15 (1.33 to
//     3.47); men ln(RR) 0.746688, SE 0.324736.
//   - Annals of the Rheumatic Diseases, Table 3 "Comparing relative risks in
//     two risk groups", COBRA trial: log RR −0.7765 (SE 0.4081) and −0.3567
//     (SE 0.1692) (table page ard.bmj.com/highwire/markup/174036; the
//     article's authors and title were not visible, so it is not
//     identified).
func TestReadPaired(t *testing.T) {
	path := filepath.Join("testdata", "paired.csv")
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Problems) != 0 {
		t.Errorf("sheet problems:%s, want none", problemTexts(in.Problems))
	}
	if len(in.Claims) != 5 || len(in.Coefficients) != 10 {
		t.Fatalf("Read(%s) = %d claims, %d coefficients, want 5 and 10", path, len(in.Claims), len(in.Coefficients))
	}
	for i, c := range in.Claims {
		if c.Row != i+2 || c.File != path {
			t.Errorf("claim %d position = %+v, want row %d of %s", i, c.Position, i+2, path)
		}
		first, second := in.Coefficients[2*i], in.Coefficients[2*i+1]
		if c.First != first.Label || c.Second != second.Label || first.Row != c.Row || second.Row != c.Row || first.Study != c.Study {
			t.Errorf("claim %d: labels %q/%q, coefficients %q/%q on rows %d/%d, want them to match", i, c.First, c.Second, first.Label, second.Label, first.Row, second.Row)
		}
	}

	age, under, over := in.Claims[0], in.Coefficients[0], in.Coefficients[1]
	if age.First != "age/under60" || age.Second != "age/over60" || age.Basis != BasisSignificanceSplit || len(age.Problems) != 0 {
		t.Errorf("claim age = %+v%s", age, problemTexts(age.Problems))
	}
	if under.Measure != MeasureRR || under.Estimate.Value != 0.67 || under.CI.Low.Value != 0.46 || under.CI.High.Value != 0.98 || under.P.Value != 0.03 {
		t.Errorf("age/under60 = %+v, want rr 0.67 (0.46–0.98) P .03", under)
	}
	if over.Measure != MeasureRR || over.CI.Low.Value != 0.71 || over.CI.High.Value != 1.08 {
		t.Errorf("age/over60 = %+v, want rr with CI 0.71, 1.08 from ci_low and ci_high", over)
	}
	if age.Extra.Names[0] != "comment" || age.Extra.Values[0] != "CI of over60 from memory" {
		t.Errorf("claim age Extra = %+v, want the comment column", age.Extra)
	}

	women, men := in.Coefficients[2], in.Coefficients[3]
	if women.Measure != MeasureRR || women.Group != "adventist" || women.CI.High.Value != 3.47 {
		t.Errorf("sex/women = %+v, want the shared measure rr and group adventist", women)
	}
	if men.Measure != MeasureOther || men.Group != "adventist" || men.SE.Value != 0.324736 {
		t.Errorf("sex/men = %+v, want its own measure other over the shared rr, the shared group, SE 0.324736", men)
	}

	cobra := in.Claims[2]
	if cobra.First != "cobra/first" || cobra.Second != "cobra/second" || in.Coefficients[4].Estimate.Value != -0.7765 {
		t.Errorf("claim cobra labels %q, %q, estimate %v, want the default labels and −0.7765", cobra.First, cobra.Second, in.Coefficients[4].Estimate.Value)
	}

	bad := in.Claims[3]
	if !hasProblem(bad.Problems, ErrUnknownValue, `"sometimes"`) || !hasProblem(bad.Problems, ErrDuplicate, "both \"b1/x\"") {
		t.Errorf("claim b1 problems:%s, want the published value and the repeated label", problemTexts(bad.Problems))
	}
	if p := in.Coefficients[6].Problems; !hasProblem(p, ErrMalformedNumber, `"abc"`) || p[0].Column != "first_estimate" {
		t.Errorf("b1/x (first) problems:%s, want first_estimate malformed", problemTexts(p))
	}
	if !hasProblem(in.Claims[4].Problems, ErrDuplicate, "first on row 4") {
		t.Errorf("repeated claim problems:%s, want a duplicate key naming row 4", problemTexts(in.Claims[4].Problems))
	}
}

func TestPairedReaderHeader(t *testing.T) {
	if _, err := NewPairedReader(strings.NewReader("study,claim,first,second\n"), "x.csv"); !errors.Is(err, ErrUnsupportedInput) {
		t.Errorf("NewPairedReader(claims sheet) error = %v, want ErrUnsupportedInput", err)
	}
	if _, err := NewPairedReader(strings.NewReader("\n\n"), "x.csv"); !errors.Is(err, ErrMissingColumn) {
		t.Errorf("NewPairedReader(empty) error = %v, want ErrMissingColumn", err)
	}
	pr, err := NewPairedReader(strings.NewReader("study,first_estimate\ns,0.1\n"), "x.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, col := range []string{"claim", "published", "second_estimate"} {
		if !hasProblem(pr.Problems(), ErrMissingColumn, `"`+col+`"`) {
			t.Errorf("Problems():%s, want %q missing", problemTexts(pr.Problems()), col)
		}
	}
	pc, err := pr.Next()
	if err != nil {
		t.Fatal(err)
	}
	if !hasProblem(pc.Claim.Problems, ErrMissingColumn, "claim") || !hasProblem(pc.Second.Problems, ErrMissingColumn, "second_estimate") {
		t.Errorf("row problems: claim%s second%s, want the missing columns on the row", problemTexts(pc.Claim.Problems), problemTexts(pc.Second.Problems))
	}
	if _, err := pr.Next(); err != io.EOF {
		t.Errorf("Next() at the end = %v, want io.EOF", err)
	}
	if _, err := pr.Next(); err != io.EOF {
		t.Errorf("Next() after the end = %v, want io.EOF again", err)
	}
}

// pairedRows writes n synthetic paired rows (a load test; the numbers are
// arbitrary).
func pairedRows(n int) []byte {
	var b bytes.Buffer
	b.WriteString("study,claim,published,basis,measure,first_label,first_estimate,first_ci,first_se,first_p,first_n,second_label,second_estimate,second_ci_low,second_ci_high,second_se,second_p,second_n\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "s%d,c%d,differ,test,b,a,0.%02d,\"[0.1%d, 0.9%d]\",0.05,p < .001,1%03d,b,−0.%02d,−0.9,0.2,.1%d,.03,\"2,345\"\n",
			i%100, i, i%100, i%10, i%10, i%1000, i%100, i%10)
	}
	return b.Bytes()
}

func TestPairedReaderStream(t *testing.T) {
	const n = 20000
	pr, err := NewPairedReader(bytes.NewReader(pairedRows(n)), "big.csv")
	if err != nil {
		t.Fatal(err)
	}
	count := 0
	for {
		pc, err := pr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		if p := pairedProblems(pc); p != "" {
			t.Fatalf("row %d problems:%s", pc.Claim.Row, p)
		}
		if pc.Claim.Row != count+2 || pc.First.P.Bound != Below || pc.Second.N.Value != 2345 || pc.Claim.First != pc.Claim.Claim+"/a" {
			t.Fatalf("row %d = %+v, want row %d, p < .001, second n 2,345 read as 2345, label <claim>/a", count+2, pc, count+2)
		}
		count++
	}
	if count != n {
		t.Errorf("streamed %d claims, want %d", count, n)
	}
}

func BenchmarkPairedReader(b *testing.B) {
	data := pairedRows(100000)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		pr, err := NewPairedReader(bytes.NewReader(data), "bench.csv")
		if err != nil {
			b.Fatal(err)
		}
		rows := 0
		for {
			if _, err := pr.Next(); err != nil {
				if err != io.EOF {
					b.Fatal(err)
				}
				break
			}
			rows++
		}
		b.ReportMetric(float64(rows), "rows/op")
	}
}

// pairedMixed writes a paired CSV of n made-up rows with two unknown
// columns, cycling through clean rows and rows with problems of each kind:
// a malformed number, an unknown verdict, a label given twice, a short
// (ragged) row, values out of range, an ambiguous comma, reversed limits.
func pairedMixed(n int) []byte {
	var b bytes.Buffer
	b.WriteString("study,claim,published,basis,comment,first_label,first_estimate,first_ci_low,first_ci_high,first_n,second_label,second_estimate,second_se,second_p,page\n")
	for i := range n {
		est, pub, first, second, tail := "0.4"+strconv.Itoa(i%10), "differ", "a", "b", ",0.2"+strconv.Itoa(i%10)+",0.05,.03,p"+strconv.Itoa(i)
		lo, hi, n := "0.21", "0.60", "1"+strconv.Itoa(i)
		switch i % 8 {
		case 1:
			est = "abc"
		case 2:
			pub = "sometimes"
		case 3:
			first, second = "x", "x"
		case 4:
			tail = ""
		case 5:
			tail, n = ",0.3,0.05,1.5,p"+strconv.Itoa(i), "0"
		case 6:
			est = `"1,234"`
		case 7:
			lo, hi = "0.60", "0.21"
		}
		fmt.Fprintf(&b, "s%d,c%d,%s,test,\"note %d, kept\",%s,%s,%s,%s,%s,%s%s\n", i%3, i, pub, i, first, est, lo, hi, n, second, tail)
	}
	return b.Bytes()
}

// snapshotPaired copies every slice of pc and every problem it points to,
// so that a later change to pc's memory shows as a difference.
func snapshotPaired(pc PairedClaim) PairedClaim {
	problems := func(ps []*CellError) []*CellError {
		if ps == nil {
			return nil
		}
		out := make([]*CellError, len(ps))
		for i, p := range ps {
			c := *p
			out[i] = &c
		}
		return out
	}
	extra := func(e Extra) Extra {
		return Extra{Names: append([]string(nil), e.Names...), Values: append([]string(nil), e.Values...)}
	}
	pc.Claim.Problems, pc.Claim.Extra = problems(pc.Claim.Problems), extra(pc.Claim.Extra)
	pc.First.Problems, pc.First.Extra = problems(pc.First.Problems), extra(pc.First.Extra)
	pc.Second.Problems, pc.Second.Extra = problems(pc.Second.Problems), extra(pc.Second.Extra)
	return pc
}

// pairedSlices returns the slices of pc that a caller may write to.
func pairedSlices(pc *PairedClaim) (problems [][]*CellError, texts [][]string) {
	problems = [][]*CellError{pc.Claim.Problems, pc.First.Problems, pc.Second.Problems}
	texts = [][]string{pc.Claim.Extra.Names, pc.Claim.Extra.Values, pc.First.Extra.Names, pc.First.Extra.Values,
		pc.Second.Extra.Names, pc.Second.Extra.Values}
	return problems, texts
}

// describePaired shows the slices of pc for failure messages (Position's
// String method hides the rest from %+v).
func describePaired(pc PairedClaim) string {
	return fmt.Sprintf("row %d: claim extra %q problems%s; first extra %q problems%s; second extra %q problems%s",
		pc.Claim.Row, pc.Claim.Extra, problemTexts(pc.Claim.Problems), pc.First.Extra, problemTexts(pc.First.Problems),
		pc.Second.Extra, problemTexts(pc.Second.Problems))
}

// equalPaired compares two claims, problems by what they say.
func equalPaired(a, b PairedClaim) bool {
	return reflect.DeepEqual(snapshotPaired(a), snapshotPaired(b))
}

// A PairedClaim must share no memory that can change with what later calls
// of Next return: the audit keeps claims on other goroutines while the
// reader goes on. The reader must neither rewrite what it returned nor hand
// two rows the same slice (writing to one row, capacity included, must
// leave every other row as it was).
func TestPairedReaderRowsShareNothing(t *testing.T) {
	const n = 48
	read := func() ([]PairedClaim, []PairedClaim) {
		pr, err := NewPairedReader(bytes.NewReader(pairedMixed(n)), "mixed.csv")
		if err != nil {
			t.Fatal(err)
		}
		var kept, snaps []PairedClaim
		for {
			pc, err := pr.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatal(err)
			}
			kept, snaps = append(kept, pc), append(snaps, snapshotPaired(pc))
		}
		return kept, snaps
	}
	kept, snaps := read()
	if len(kept) != n {
		t.Fatalf("read %d rows, want %d", len(kept), n)
	}
	withProblems := 0
	for i := range kept {
		if !equalPaired(kept[i], snaps[i]) {
			t.Errorf("row %d changed while later rows were read:\n got %s\nwant %s", kept[i].Claim.Row, describePaired(kept[i]), describePaired(snaps[i]))
		}
		if len(kept[i].Claim.Problems)+len(kept[i].First.Problems)+len(kept[i].Second.Problems) > 0 {
			withProblems++
		}
		wantPage := "p" + strconv.Itoa(i)
		if i%8 == 4 {
			wantPage = "" // the short row
		}
		if e := kept[i].Claim.Extra; len(e.Values) != 2 || e.Values[0] != "note "+strconv.Itoa(i)+", kept" || e.Values[1] != wantPage {
			t.Errorf("row %d Extra = %+v, want the comment and page columns", kept[i].Claim.Row, e)
		}
	}
	if withProblems != n*7/8 {
		t.Errorf("%d rows with problems, want %d (all but the clean ones)", withProblems, n*7/8)
	}

	// Write over every slice of one row, up to its capacity, and check the
	// others; a fresh read for each row keeps the rows independent.
	poison := &CellError{Err: errors.New("poison")}
	for i := 0; i < n; i++ {
		kept, snaps := read()
		problems, texts := pairedSlices(&kept[i])
		for _, ps := range problems {
			ps = ps[:cap(ps)]
			for k := range ps {
				ps[k] = poison
			}
		}
		for _, ts := range texts {
			ts = ts[:cap(ts)]
			for k := range ts {
				ts[k] = "poison"
			}
		}
		for j := range kept {
			if j != i && !equalPaired(kept[j], snaps[j]) {
				t.Fatalf("writing to the slices of row %d changed row %d:\n got %s\nwant %s", kept[i].Claim.Row, kept[j].Claim.Row, describePaired(kept[j]), describePaired(snaps[j]))
			}
		}
	}
}

// The same from goroutines: a reader streams rows to workers that check
// each against a row read apart and then write over its slices, as an audit
// might. Run with -race, any memory the rows share with the reader or with
// each other is reported.
func TestPairedReaderConcurrentConsumers(t *testing.T) {
	const n = 400
	data := pairedMixed(n)
	want := make([]PairedClaim, 0, n)
	pr, err := NewPairedReader(bytes.NewReader(data), "mixed.csv")
	if err != nil {
		t.Fatal(err)
	}
	for {
		pc, err := pr.Next()
		if err != nil {
			break
		}
		want = append(want, snapshotPaired(pc))
	}
	type job struct {
		i  int
		pc PairedClaim
	}
	jobs := make(chan job, 8)
	go func() {
		defer close(jobs)
		pr, err := NewPairedReader(bytes.NewReader(data), "mixed.csv")
		if err != nil {
			return
		}
		for i := 0; ; i++ {
			pc, err := pr.Next()
			if err != nil {
				return
			}
			jobs <- job{i, pc}
		}
	}()
	var wg sync.WaitGroup
	bad := make(chan string, n)
	seen := make(chan int, n)
	for range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				runtime.Gosched() // let the reader go on to later rows first
				if !equalPaired(j.pc, want[j.i]) {
					bad <- fmt.Sprintf("row %d = %s, want %s", j.pc.Claim.Row, describePaired(j.pc), describePaired(want[j.i]))
				}
				problems, texts := pairedSlices(&j.pc)
				for _, ps := range problems {
					for k := range ps {
						ps[k] = nil
					}
				}
				for _, ts := range texts {
					for k := range ts {
						ts[k] = ""
					}
				}
				seen <- j.i
			}
		}()
	}
	wg.Wait()
	close(bad)
	close(seen)
	for msg := range bad {
		t.Error(msg)
	}
	if len(seen) != n {
		t.Errorf("workers saw %d rows, want %d", len(seen), n)
	}
}
