package extract

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"testing"
)

// Values in testdata/paired.csv are printed values from the sources listed
// in testdata/README.md; the claims around them are made up.
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
		if len(pc.Claim.Problems)+len(pc.First.Problems)+len(pc.Second.Problems) != 0 {
			t.Fatalf("row %d problems:%s%s%s", pc.Claim.Row, problemTexts(pc.Claim.Problems), problemTexts(pc.First.Problems), problemTexts(pc.Second.Problems))
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
