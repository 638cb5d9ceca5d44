package extract

import (
	"errors"
	"io"
	"path/filepath"
	"strings"
	"testing"
)

// The estimates in testdata/folder are printed values from published
// tables, the same as in testdata/paired.csv (see TestReadPaired for the
// full citations): Torgerson DJ, Bell-Syer SEM (2001), JAMA 285:2891–2897,
// abstract (RR 0.67, 95% CI 0.46–0.98, P = .03; the 60-or-over CI
// 0.71–1.08 is from memory); Woodward M (2019), Heart 105(22):1701–1708,
// Table 4 (RR 2.15, 1.33 to 3.47); Annals of the Rheumatic Diseases,
// Table 3 "Comparing relative risks in two risk groups", COBRA trial
// (−0.7765, SE 0.4081; the article is not identified). The claims rows are
// made up for the reader and say nothing about the papers.
func TestReadFolder(t *testing.T) {
	dir := filepath.Join("testdata", "folder")
	in, err := Read(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Problems) != 0 {
		t.Errorf("Read(%s) sheet problems: %s, want none", dir, problemTexts(in.Problems))
	}
	coefFile := filepath.Join(dir, "coefficients.csv")

	t.Run("coefficients", func(t *testing.T) {
		if len(in.Coefficients) != 7 {
			t.Fatalf("Read(%s) gave %d coefficients, want 7", dir, len(in.Coefficients))
		}
		c := in.Coefficients[0]
		if c.File != coefFile || c.Sheet != "coefficients.csv" || c.Row != 2 || c.Measure != MeasureRR ||
			c.Estimate.Value != 0.67 || c.CI.Low.Value != 0.46 || c.CI.High.Value != 0.98 || c.CILevel != 95 ||
			c.P.Value != 0.03 || c.P.Bound != Exact || len(c.Problems) != 0 {
			t.Errorf("row 2 = %+v, want torgerson2001 under60 rr 0.67 (0.46, 0.98) p .03", c)
		}
		if c.Extra.Names[0] != "source" || c.Extra.Values[0] != "abstract" {
			t.Errorf("row 2 Extra = %+v, want source=abstract", c.Extra)
		}
		if c := in.Coefficients[1]; c.Measure != MeasureRR || c.CI.Low.Value != 0.71 || c.CI.High.Value != 1.08 || len(c.Problems) != 0 {
			t.Errorf("row 3 = %+v %s, want RR read as rr with CI 0.71–1.08", c, problemTexts(c.Problems))
		}
		if c := in.Coefficients[2]; c.Measure != MeasureRR || c.CI.Low.Value != 1.33 || c.CI.High.Value != 3.47 || len(c.Problems) != 0 {
			t.Errorf("row 4 = %+v %s, want \"Risk ratio\" read as rr with CI 1.33 to 3.47", c, problemTexts(c.Problems))
		}
		if c := in.Coefficients[4]; c.Estimate.Value != -0.7765 || c.SE.Value != 0.4081 || c.SE.Decimals != 4 {
			t.Errorf("row 6 = %+v, want −0.7765 with SE 0.4081", c)
		}
		if c := in.Coefficients[5]; c.Row != 7 || !hasProblem(c.Problems, ErrDuplicate, "first on row 6") {
			t.Errorf("row 7 problems %s, want a duplicate label naming row 6", problemTexts(c.Problems))
		}
	})

	t.Run("every cell malformed", func(t *testing.T) {
		c := in.Coefficients[6]
		for _, want := range []struct {
			target error
			column string
			text   string
		}{
			{ErrMalformedNumber, "estimate", `"0.4.3" is not a number`},
			{ErrMalformedInterval, "ci_low", "limits reversed"},
			{ErrMalformedInterval, "ci", `"[0.1 0.2" is not a confidence interval`},
			{ErrOutOfRange, "ci_level", "confidence level"},
			{ErrOutOfRange, "se", "cannot be negative"},
			{ErrMalformedNumber, "stat", `"z" is not a number`},
			{ErrMalformedP, "p", "no p-value is below 0"},
			{ErrOutOfRange, "df", "must be positive"},
			{ErrOutOfRange, "n", "whole number"},
		} {
			found := false
			for _, p := range c.Problems {
				if errors.Is(p, want.target) && p.Column == want.column && strings.Contains(p.Error(), want.text) {
					found = true
					want := coefFile + `, row 8, column "` + want.column + `": `
					if !strings.HasPrefix(p.Error(), want) {
						t.Errorf("problem %q does not start with %q", p.Error(), want)
					}
				}
			}
			if !found {
				t.Errorf("row 8: no %v problem in column %q saying %q; problems:%s", want.target, want.column, want.text, problemTexts(c.Problems))
			}
		}
	})

	t.Run("claims in order", func(t *testing.T) {
		rows := []int{2, 4, 6, 7, 8, 9}
		if len(in.Claims) != len(rows) {
			t.Fatalf("Read(%s) gave %d claims, want %d (one per non-blank row)", dir, len(in.Claims), len(rows))
		}
		for i, c := range in.Claims {
			if c.Row != rows[i] {
				t.Errorf("claim %d is on row %d, want row %d (the file's own line)", i, c.Row, rows[i])
			}
		}
		c := in.Claims[0]
		if c.Topic != "hrt\nby age" || c.Basis != BasisSignificanceSplit || c.Alpha != DefaultAlpha || len(c.Problems) != 0 {
			t.Errorf("claim row 2 = %+v, want the multi-line topic, significance-split, alpha 0.05", c)
		}
		c = in.Claims[1]
		if c.Published != PublishedNoDifference || c.PublishedP.Value != 0.96 || c.Basis != BasisTest || len(c.Problems) != 0 {
			t.Errorf("claim row 4 = %+v, want \"No difference\" read as no-difference, p .96", c)
		}
		c = in.Claims[2]
		if c.Published != PublishedFirstLarger || c.Alpha != 0.05 || c.Basis != BasisOverlap {
			t.Errorf("claim row 6 = %+v, want first-larger, alpha 5%% = 0.05, overlap", c)
		}
		c = in.Claims[3]
		for _, want := range []struct {
			target error
			column string
		}{
			{ErrMissingValue, "study"}, {ErrMissingValue, "claim"}, {ErrMissingValue, "first"}, {ErrMissingValue, "second"},
			{ErrUnknownValue, "published"}, {ErrMalformedP, "published_p"}, {ErrUnknownValue, "basis"},
			{ErrOutOfRange, "alpha"}, {ErrOutOfRange, "estimate_corr"},
		} {
			found := false
			for _, p := range c.Problems {
				found = found || (errors.Is(p, want.target) && p.Column == want.column)
			}
			if !found {
				t.Errorf("claim row 7: no %v problem in column %q; problems:%s", want.target, want.column, problemTexts(c.Problems))
			}
		}
		if c.Extra.Values[0] != "D" {
			t.Errorf("claim row 7 Extra = %+v, want reviewer D kept", c.Extra)
		}
		c = in.Claims[4]
		if !hasProblem(c.Problems, ErrDuplicate, "appears twice") || !hasProblem(c.Problems, ErrDuplicate, "the same coefficient") {
			t.Errorf("claim row 8 problems:%s, want a duplicate claim key and first = second", problemTexts(c.Problems))
		}
		c = in.Claims[5]
		if !hasProblem(c.Problems, nil, "the row has 3 fields and the header 11") || !hasProblem(c.Problems, ErrMissingValue, "published") {
			t.Errorf("claim row 9 problems:%s, want a ragged row and a blank published", problemTexts(c.Problems))
		}
	})

	t.Run("correlations", func(t *testing.T) {
		cs := in.Correlations
		if len(cs) != 4 {
			t.Fatalf("got %d correlations, want 4", len(cs))
		}
		if cs[0].R.Value != 0.45 || cs[0].R.Stars != 2 || cs[0].N.Value != 120 || len(cs[0].Problems) != 0 {
			t.Errorf("correlation row 2 = %+v, want .45** with n 120", cs[0])
		}
		if cs[1].SD.Value != 0.80 || cs[1].Mean.Value != 3.10 || cs[1].R.Present() || len(cs[1].Problems) != 0 {
			t.Errorf("correlation row 3 = %+v, want sd 0.80 and mean 3.10", cs[1])
		}
		if !hasProblem(cs[2].Problems, ErrDuplicate, "first on row 2") {
			t.Errorf("correlation row 4 problems:%s, want the pair in reverse order flagged as a duplicate", problemTexts(cs[2].Problems))
		}
		if !hasProblem(cs[3].Problems, ErrOutOfRange, "between −1 and 1") {
			t.Errorf("correlation row 5 problems:%s, want r = 1.3 refused", problemTexts(cs[3].Problems))
		}
	})

	t.Run("table", func(t *testing.T) {
		if len(in.Tables) != 1 {
			t.Fatalf("got %d tables, want 1", len(in.Tables))
		}
		tb := in.Tables[0]
		if tb.Name != "1" || tb.Study != "demo" || tb.Group != "all" || len(tb.Problems) != 0 {
			t.Errorf("table = name %q study %q group %q problems%s, want 1, demo, all, none", tb.Name, tb.Study, tb.Group, problemTexts(tb.Problems))
		}
		if strings.Join(tb.Variables, ",") != "Anxiety,Stress,Sleep" {
			t.Errorf("table variables = %v, want Anxiety, Stress, Sleep", tb.Variables)
		}
		if tb.R[0][1].Value != 0.45 || tb.R[1][0].Value != 0.45 || tb.R[0][2].Value != -0.30 || tb.R[2][1].Value != -0.22 || tb.R[1][1].Value != 1 {
			t.Errorf("table R = %v, want the symmetric matrix of .45, −.30, −.22", tableValues(tb))
		}
		if tb.N[1].Value != 118 || tb.Mean[2].Value != 6.50 || tb.SD[0].Value != 0.80 {
			t.Errorf("table n, mean, sd = %v %v %v", tb.N, tb.Mean, tb.SD)
		}
	})
}

func tableValues(tb CorrelationTable) [][]float64 {
	out := make([][]float64, len(tb.R))
	for i, row := range tb.R {
		out[i] = make([]float64, len(row))
		for j, p := range row {
			out[i][j] = p.Value
		}
	}
	return out
}

// TestReadFolderEuropean reads what a spreadsheet writes where the decimal
// mark is a comma: a byte order mark, CRLF, semicolons, decimal commas and
// dots grouping thousands in n.
func TestReadFolderEuropean(t *testing.T) {
	in, err := Read(filepath.Join("testdata", "folder-european"))
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Coefficients) != 2 || len(in.Claims) != 1 {
		t.Fatalf("got %d coefficients and %d claims, want 2 and 1", len(in.Coefficients), len(in.Claims))
	}
	a, b := in.Coefficients[0], in.Coefficients[1]
	if a.Study != "de" || a.Estimate.Value != 0.43 || a.CI.Low.Value != 0.12 || a.CI.High.Value != 0.45 || a.SE.Value != 0.08 || a.N.Value != 1234 || len(a.Problems) != 0 {
		t.Errorf("row 2 = %+v%s, want 0,43 (0,12; 0,45) se 0,08 n 1.234 = 1234", a, problemTexts(a.Problems))
	}
	if b.CI.Low.Value != 0.05 || b.CI.High.Value != 0.37 || b.N.Value != 1200 || len(b.Problems) != 0 {
		t.Errorf("row 3 = %+v%s, want [0,05; 0,37] and n 1200", b, problemTexts(b.Problems))
	}
	if in.Claims[0].Study != "de" || in.Claims[0].Published != PublishedDiffer {
		t.Errorf("claim = %+v, want study de (BOM dropped), differ", in.Claims[0])
	}
}

func TestReadFolderMissing(t *testing.T) {
	in, err := Read(filepath.Join("testdata", "folder-missing-column"))
	if err != nil {
		t.Fatal(err)
	}
	for _, col := range []string{`"estimate"`, `"published"`} {
		if !hasProblem(in.Problems, ErrMissingColumn, col) {
			t.Errorf("sheet problems:%s, want a missing column %s", problemTexts(in.Problems), col)
		}
	}
	if len(in.Claims) != 2 {
		t.Fatalf("got %d claims, want 2", len(in.Claims))
	}
	for _, c := range in.Claims {
		if !hasProblem(c.Problems, ErrMissingColumn, "published") {
			t.Errorf("claim row %d problems:%s, want the missing published column", c.Row, problemTexts(c.Problems))
		}
	}
	if _, err := Read(filepath.Join("testdata", "folder-no-claims")); !errors.Is(err, ErrMissingSheet) {
		t.Errorf("Read(folder without claims.csv) error = %v, want ErrMissingSheet", err)
	}
}

func claimsFromCSV(t *testing.T, text string) ([]Claim, []*CellError, error) {
	t.Helper()
	src, err := newCSVSource(strings.NewReader(text), "mem.csv", nil)
	if err != nil {
		return nil, nil, err
	}
	return readClaimSheet(src, Position{File: "mem.csv"})
}

func TestCSVRowProblems(t *testing.T) {
	const header = "study,claim,first,second,published\n"
	t.Run("stray quote", func(t *testing.T) {
		cs, _, err := claimsFromCSV(t, header+"s,c1,a,b,differ\ns,c\"2,a,b,differ\ns,c3,a,b,differ\n")
		if err != nil {
			t.Fatal(err)
		}
		if len(cs) != 3 || cs[1].Row != 3 || !hasProblem(cs[1].Problems, nil, "cannot be read as CSV") || cs[2].Claim != "c3" {
			t.Errorf("claims = %d, row 3 problems:%s; want 3 claims, the bad row kept with a problem and c3 after it", len(cs), problemTexts(cs[1].Problems))
		}
	})
	t.Run("unclosed quote", func(t *testing.T) {
		cs, _, err := claimsFromCSV(t, header+"s,c1,a,b,differ\ns,\"c2,a,b,differ\ns,c3,a,b,differ\n")
		if err != nil {
			t.Fatal(err)
		}
		if len(cs) != 2 || !hasProblem(cs[1].Problems, nil, "lines 3 to") {
			t.Errorf("claims = %d, last problems:%s; want the unclosed quote reported with the lines it swallowed", len(cs), problemTexts(cs[len(cs)-1].Problems))
		}
	})
	t.Run("field too long", func(t *testing.T) {
		long := strings.Repeat("x", MaxFieldBytes+1)
		cs, _, err := claimsFromCSV(t, header+"s,c1,a,b,differ\ns,c2,"+long+",b,differ\ns,c3,a,b,differ\n")
		if err != nil {
			t.Fatal(err)
		}
		if len(cs) != 3 || !hasProblem(cs[1].Problems, ErrInputTooLarge, "field 3") || cs[1].First != "" {
			t.Errorf("claims = %d, row 3 problems:%s; want the long field refused as a row problem", len(cs), problemTexts(cs[1].Problems))
		}
	})
	t.Run("UTF-16", func(t *testing.T) {
		if _, _, err := claimsFromCSV(t, "\xff\xfes\x00"); !errors.Is(err, ErrUnsupportedInput) {
			t.Errorf("UTF-16 input error = %v, want ErrUnsupportedInput", err)
		}
	})
}

// endlessLine is a reader of a header and then one line that never ends,
// counting what was taken from it.
type endlessLine struct {
	head  string
	taken int64
	limit int64
}

func (r *endlessLine) Read(p []byte) (int, error) {
	if r.taken >= r.limit {
		return 0, io.EOF
	}
	n := 0
	for n < len(p) && r.taken < r.limit {
		if r.taken < int64(len(r.head)) {
			p[n] = r.head[r.taken]
		} else {
			p[n] = 'x'
		}
		n++
		r.taken++
	}
	return n, nil
}

// TestCSVLineTooLong feeds a 100 MB line and checks that it is refused with
// the row named, having read only a few MiB of it.
func TestCSVLineTooLong(t *testing.T) {
	r := &endlessLine{head: "study,claim,first,second,published\ns,c1,a,b,differ\n", limit: 100 << 20}
	src, err := newCSVSource(r, "big.csv", nil)
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = readClaimSheet(src, Position{File: "big.csv"})
	var ce *CellError
	if !errors.Is(err, ErrInputTooLarge) || !errors.As(err, &ce) || ce.Row != 3 {
		t.Fatalf("readClaimSheet(100 MB line) error = %v, want ErrInputTooLarge at row 3", err)
	}
	if r.taken > 2*MaxLineBytes {
		t.Errorf("read %d bytes of the 100 MB line before refusing it, want at most %d", r.taken, 2*MaxLineBytes)
	}
	if !strings.HasPrefix(err.Error(), "big.csv, row 3: line 3 is longer than 4 MiB") {
		t.Errorf("error = %q, want it to name the file and row", err)
	}
}

// TestCSVRecordTooLong feeds a quoted field of many short lines.
func TestCSVRecordTooLong(t *testing.T) {
	body := "study,claim\ns,\"" + strings.Repeat("short line\n", (MaxRecordBytes/11)+10000)
	src, err := newCSVSource(strings.NewReader(body), "multi.csv", nil)
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = readClaimSheet(src, Position{File: "multi.csv"})
	if !errors.Is(err, ErrInputTooLarge) || !strings.Contains(err.Error(), "record") {
		t.Errorf("readClaimSheet(16 MiB record) error = %v, want ErrInputTooLarge for the record", err)
	}
}
