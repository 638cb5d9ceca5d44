package extract

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// The printed forms below come from published tables and style rules; the
// expected Value and Decimals are what the text denotes by definition (a
// printed "0.43" is the number 0.43 given to 2 decimals), so no computation
// is checked against itself. Sources:
//
//	[AB11] Altman DG, Bland JM (2011). How to obtain the confidence interval
//	       from a P value. BMJ 343:d2090 ("P=0.032", "1.4 to 32.6").
//	[TB01] Torgerson DJ, Bell-Syer SEM (2001). JAMA 285:2891–2897, abstract
//	       ("RR 0.67, 95% CI 0.46–0.98, P = .03").
//	[W19]  Woodward M (2019). Heart 105:1701–1708, Table 4
//	       ("2.15 (1.33 to 3.47)", "(−0.778101 to 0.815661)").
//	[ARD]  Annals of the Rheumatic Diseases, Table 3 "Comparing relative
//	       risks in two risk groups" ("−1.0555 to 0.5933"; read on the table
//	       page ard.bmj.com/highwire/markup/174036, where the article's
//	       authors and title were not visible: the article is not
//	       identified).
//	[APA]  APA Publication Manual, 7th ed. (2020): no leading zero for p and
//	       r (".03"), "p < .001" (from memory).
//	[ISO]  ISO 80000-1:2009, the decimal sign is a comma or a point (from
//	       memory).
//	[R]    R prints "p-value < 2.2e-16" at the limit of double precision
//	       (from memory).

func TestParseNumber(t *testing.T) {
	tests := []struct {
		name     string
		text     string
		value    float64
		decimals int
		stars    int
	}{
		{"plain [TB01]", "0.67", 0.67, 2, 0},
		{"leading point [APA]", ".43", 0.43, 2, 0},
		{"plus sign", "+0.43", 0.43, 2, 0},
		{"hyphen minus", "-0.43", -0.43, 2, 0},
		{"unicode minus [W19]", "−0.778101", -0.778101, 6, 0},
		{"en dash as minus", "–0.43", -0.43, 2, 0},
		{"minus then space", "− 0.43", -0.43, 2, 0},
		{"minus leading point", "−.30", -0.30, 2, 0},
		{"integer", "17", 17, 0, 0},
		{"trailing zeros kept [AB11]", "7.940", 7.94, 3, 0},
		{"decimal comma [ISO]", "0,43", 0.43, 2, 0},
		{"decimal comma leading zero three digits", "0,123", 0.123, 3, 0},
		{"decimal comma two digits", "12,45", 12.45, 2, 0},
		{"leading decimal comma", ",43", 0.43, 2, 0},
		{"thousands and point", "1,234.5", 1234.5, 1, 0},
		{"thousands and comma", "1.234,5", 1234.5, 1, 0},
		{"thousands grouped twice", "1,234,567", 1234567, 0, 0},
		{"stars", "0.21***", 0.21, 2, 3},
		{"star after space", "0.21 *", 0.21, 2, 1},
		{"stars after space", "−.22 **", -0.22, 2, 2},
		{"dagger", "0.21†", 0.21, 2, 0},
		{"non-breaking spaces", "\u00a00.43\u00a0", 0.43, 2, 0},
		{"thin space", "\u20090.43", 0.43, 2, 0},
		{"e notation", "2.3e-5", 2.3e-5, 6, 0},
		{"E notation padded", "2.3E-05", 2.3e-5, 6, 0},
		{"e notation positive", "1.25e2", 125, 0, 0},
		{"R limit [R]", "2.2e-16", 2.2e-16, 17, 0},
		{"times ten caret", "2.3 × 10^-5", 2.3e-5, 6, 0},
		{"times ten superscript", "2.3×10⁻⁵", 2.3e-5, 6, 0},
		{"x ten caret", "2.3 x 10^-5", 2.3e-5, 6, 0},
		{"coarser than units", "2.3e5", 230000, -1, 0},
		{"negative e notation", "−4.1e-3", -0.0041, 4, 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := ParseNumber(tt.text)
			if err != nil {
				t.Fatalf("ParseNumber(%q) error %v, want %v", tt.text, err, tt.value)
			}
			if math.Abs(got.Value-tt.value) > 1e-12*math.Max(1, math.Abs(tt.value)) || int(got.Decimals) != tt.decimals || int(got.Stars) != tt.stars || got.Bound != Exact {
				t.Errorf("ParseNumber(%q) = {%v, dec %d, stars %d, %v}, want {%v, dec %d, stars %d, exact}",
					tt.text, got.Value, got.Decimals, got.Stars, got.Bound, tt.value, tt.decimals, tt.stars)
			}
		})
	}
}

func TestParseNumberBlank(t *testing.T) {
	for _, text := range []string{"", "   ", "\u00a0", "\t"} {
		got, err := ParseNumber(text)
		if err != nil || got != (Printed{Bound: Absent}) {
			t.Errorf("ParseNumber(%q) = %+v, %v, want Absent and no error", text, got, err)
		}
	}
}

func TestParseNumberRejects(t *testing.T) {
	tests := []struct {
		name, text, reason string
	}{
		{"two points", "0.4.3", "more than one decimal point"},
		{"ambiguous comma", "1,234", "ambiguous"},
		{"ambiguous comma five digits", "12,345", "ambiguous"},
		{"two decimal commas", "0,1,2", "more than one decimal comma"},
		{"letters", "abc", "is not part of a number"},
		{"percent", "43%", "percent"},
		{"space inside", "0. 43", "space inside"},
		{"sign only", "−", "a sign but no number"},
		{"stars only", "***", "stars but no number"},
		{"trailing point", "5.", "no digits after the decimal separator"},
		{"bad exponent", "2.3e-x", "not an exponent"},
		{"exponent without mantissa", "e5", "exponent without a number"},
		{"times without ten", "2.3 × 5", "not followed by 10"},
		{"power without exponent", "2.3 × 10", "without its exponent"},
		{"overflow", "1e999", "too large"},
		{"bad grouping", "1,23,4.5", "does not group thousands"},
		{"not applicable dash", "—", "not part of a number"},
		{"NA", "NA", "not part of a number"},
		{"parenthesized", "(0.05)", "not part of a number"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseNumber(tt.text)
			if err == nil {
				t.Fatalf("ParseNumber(%q) = no error, want one saying %q", tt.text, tt.reason)
			}
			if !errors.Is(err, ErrMalformedNumber) {
				t.Errorf("ParseNumber(%q) error %v does not wrap ErrMalformedNumber", tt.text, err)
			}
			msg := err.Error()
			if !strings.Contains(msg, tt.reason) || !strings.Contains(msg, "expected e.g.") || !strings.Contains(msg, "is not a number") {
				t.Errorf("ParseNumber(%q) error = %q, want it to say %q, that it is not a number and what is expected", tt.text, msg, tt.reason)
			}
		})
	}
}

// TestParseErrorMessage checks the exact wording the brief gives as the model.
func TestParseErrorMessage(t *testing.T) {
	_, err := ParseNumber("0.4.3")
	want := `"0.4.3" is not a number (more than one decimal point; expected e.g. 0.43, .43, −0.43, 0,43)`
	if err == nil || err.Error() != want {
		t.Errorf("ParseNumber(\"0.4.3\") error = %v, want %s", err, want)
	}
}

func TestParseCount(t *testing.T) {
	tests := []struct {
		name  string
		text  string
		value float64
	}{
		{"thousands", "1,234", 1234},
		{"thousands five digits", "12,345", 12345},
		{"grouped twice", "1,234,567", 1234567},
		{"decimal comma df", "45,5", 45.5},
		{"fractional df", "45.3", 45.3},
		{"plain", "240", 240},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := ParseCount(tt.text)
			if err != nil || got.Value != tt.value {
				t.Errorf("ParseCount(%q) = %v, %v, want %v", tt.text, got.Value, err, tt.value)
			}
		})
	}
	if _, err := ParseCount("240*"); !errors.Is(err, ErrMalformedNumber) {
		t.Errorf("ParseCount(\"240*\") error = %v, want a refused star", err)
	}
}

func TestHalfUnitOfParsed(t *testing.T) {
	// "0.43" stands for [0.425, 0.435) (DESIGN.md, input contract).
	p, err := ParseNumber("0.43")
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := p.RoundingInterval()
	if math.Abs(lo-0.425) > 1e-15 || math.Abs(hi-0.435) > 1e-15 {
		t.Errorf("ParseNumber(\"0.43\").RoundingInterval() = [%v, %v], want [0.425, 0.435]", lo, hi)
	}
	// "2.3e-5" stands for [2.25e-5, 2.35e-5).
	p, _ = ParseNumber("2.3e-5")
	if h := p.HalfUnit(); math.Abs(h-0.5e-6) > 1e-20 {
		t.Errorf("ParseNumber(\"2.3e-5\").HalfUnit() = %v, want 5e-7", h)
	}
}

func BenchmarkParseNumber(b *testing.B) {
	texts := []string{"0.43", "−.22**", "0,43", "2.3e-5", "1,234.5"}
	b.ReportAllocs()
	for b.Loop() {
		for _, s := range texts {
			if _, err := ParseNumber(s); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// TestStarsClamped checks that a cell with more significance stars than a
// Printed counts (math.MaxInt16) still reads, with the count at its cap,
// rather than wrapping to a negative count.
func TestStarsClamped(t *testing.T) {
	p, err := ParseNumber("0.21" + strings.Repeat("*", 40000))
	if err != nil {
		t.Fatal(err)
	}
	if p.Value != 0.21 || p.Stars != math.MaxInt16 {
		t.Errorf("ParseNumber(0.21 and 40000 stars) = value %v, %d stars; want 0.21, %d", p.Value, p.Stars, math.MaxInt16)
	}
}
