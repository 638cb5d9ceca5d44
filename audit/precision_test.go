package audit

import (
	"math"
	"testing"

	"coefaudit/extract"
)

// TestFormatP: p as journals print it. The style (three decimals, no
// leading zero, "< .001" below) is that of the APA Publication Manual, 7th
// ed. (2020), §6.36 (from memory).
func TestFormatP(t *testing.T) {
	for _, tt := range []struct {
		p         float64
		want      string
		statement string
	}{
		{0.0431, ".043", "p = .043"},
		{0.05, ".050", "p = .050"},
		{0.001, ".001", "p = .001"},
		{0.000999, "< .001", "p < .001"},
		{1e-12, "< .001", "p < .001"},
		{0.5, ".500", "p = .500"},
		{0.9994, ".999", "p = .999"},
		{0.9996, "> .999", "p > .999"},
		{1, "> .999", "p > .999"},
	} {
		if got := FormatP(tt.p); got != tt.want {
			t.Errorf("FormatP(%g) = %q, want %q", tt.p, got, tt.want)
		}
		if got := PStatement(tt.p); got != tt.statement {
			t.Errorf("PStatement(%g) = %q, want %q", tt.p, got, tt.statement)
		}
	}
}

// TestPSpan: a range of p never reads "from < .001 to < .001".
func TestPSpan(t *testing.T) {
	for _, tt := range []struct {
		lo, hi float64
		want   string
	}{
		{0.025, 0.053, "from .025 to .053"},
		{1e-6, 0.167, "from below .001 to .167"},
		{1e-9, 1e-6, "below .001 throughout"},
		{0.0431, 0.0434, "at .043 throughout"},
	} {
		if got := PSpan(tt.lo, tt.hi); got != tt.want {
			t.Errorf("PSpan(%g, %g) = %q, want %q", tt.lo, tt.hi, got, tt.want)
		}
	}
}

// TestFormatFixed: no negative zero, the decimals asked for.
func TestFormatFixed(t *testing.T) {
	for _, tt := range []struct {
		x    float64
		dec  int
		want string
	}{
		{-0.00001, 4, "0.0000"},
		{-0.004, 2, "0.00"},
		{-0.006, 2, "-0.01"},
		{0.0636, 3, "0.064"},
		{2.9, 2, "2.90"},
		{math.NaN(), 2, "NA"},
	} {
		if got := FormatFixed(tt.x, tt.dec); got != tt.want {
			t.Errorf("FormatFixed(%g, %d) = %q, want %q", tt.x, tt.dec, got, tt.want)
		}
	}
}

// TestDisplayDecimals: the printed decimals plus one, within [2, 4].
func TestDisplayDecimals(t *testing.T) {
	p := func(s string) extract.Printed {
		v, err := extract.ParseNumber(s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, tt := range []struct {
		name    string
		printed []extract.Printed
		want    int
	}{
		{"two decimals", []extract.Printed{p("0.43"), p("0.30")}, 3},
		{"one decimal", []extract.Printed{p("2.9"), p("0.5")}, 2},
		{"none", []extract.Printed{p("12"), p("3")}, 2},
		{"five decimals", []extract.Printed{p("0.12345")}, 4},
		{"the most wins", []extract.Printed{p("0.4"), p("0.431")}, 4},
		{"nothing printed", nil, 3},
	} {
		if got := DisplayDecimals(tt.printed...); got != tt.want {
			t.Errorf("%s: DisplayDecimals = %d, want %d", tt.name, got, tt.want)
		}
	}
}

// TestShownRatioOfRatios: a ratio measure's difference is shown as the
// ratio of the two ratios with its interval, to the printed decimals plus
// one, while the result keeps the log-scale values.
func TestShownRatioOfRatios(t *testing.T) {
	for _, tt := range []struct {
		name, first, second string
		want                string
	}{
		// Altman DG, Bland JM (2003). Interaction revisited. BMJ 326:219:
		// RR 0.67 (0.46 to 0.98) against 0.88 (0.71 to 1.08); ratio of the
		// RRs 0.76 (0.49 to 1.17) in the note, 0.761 (0.494 to 1.173) to
		// three decimals (PUBLISHED-VALUES.md §2.1, derived).
		{"Altman & Bland 2003", "0.67 (0.46 to 0.98)", "0.88 (0.71 to 1.08)",
			"ratio of the two ratios 0.761, 95% CI 0.494 to 1.173"},
		// Woodward M (2019). Heart 105(22):1701–1708, Table 4: RR 2.15
		// (1.33 to 3.47) in women; men ln RR 0.746688, SE 0.324736, i.e.
		// RR 2.1100 (1.1165 to 3.9875), exp(0.746688 ∓ 1.96 × 0.324736),
		// printed to four decimals here; RRR 1.02 (0.46 to 2.26), to four
		// decimals exp(0.01878) = 1.0190, exp(−0.778101) = 0.4593,
		// exp(0.815661) = 2.2607.
		{"Woodward 2019", "2.15 (1.33 to 3.47)", "2.1100 (1.1165 to 3.9875)",
			"ratio of the two ratios 1.0190, 95% CI 0.4593 to 2.2607"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			first, err := ParseReported(tt.first)
			if err != nil {
				t.Fatal(err)
			}
			second, err := ParseReported(tt.second)
			if err != nil {
				t.Fatal(err)
			}
			rep, err := CompareReported(Comparison{First: first, Second: second, Relation: Independent,
				Measure: extract.MeasureRR, Published: extract.PublishedNoDifference}, DefaultOptions)
			if err != nil {
				t.Fatal(err)
			}
			c := &rep.Claims[0]
			if got := c.DifferenceText(); got != tt.want {
				t.Errorf("DifferenceText() = %q, want %q", got, tt.want)
			}
			if s := c.Shown(); math.Abs(math.Log(s.Estimate)-float64(c.Difference)) > 1e-12 {
				t.Errorf("shown ratio %g is not exp of the log difference %g", s.Estimate, float64(c.Difference))
			}
		})
	}
}
