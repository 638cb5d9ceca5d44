package extract

import (
	"errors"
	"strings"
	"testing"
)

// Printed intervals; sources as in parse_test.go. The expected limits are
// the numbers the text denotes.
func TestParseInterval(t *testing.T) {
	tests := []struct {
		name       string
		text       string
		low, high  float64
		decLo      int
		decHi      int
		level      float64
		asymmetric bool
	}{
		{"square brackets", "[0.12, 0.45]", 0.12, 0.45, 2, 2, 0, false},
		{"parentheses en dash", "(.12–.45)", 0.12, 0.45, 2, 2, 0, false},
		{"parentheses em dash", "(.12—.45)", 0.12, 0.45, 2, 2, 0, false},
		{"to [AB11]", "1.4 to 32.6", 1.4, 32.6, 1, 1, 0, false},
		{"to in parentheses [W19]", "(1.33 to 3.47)", 1.33, 3.47, 2, 2, 0, false},
		{"unicode minus to [W19]", "(−0.778101 to 0.815661)", -0.778101, 0.815661, 6, 6, 0, false},
		{"en dash [TB01]", "0.46–0.98", 0.46, 0.98, 2, 2, 0, false},
		{"negative to [ARD]", "−1.0555 to 0.5933", -1.0555, 0.5933, 4, 4, 0, false},
		{"semicolon", "(0.12; 0.45)", 0.12, 0.45, 2, 2, 0, false},
		{"hyphen", "0.12-0.45", 0.12, 0.45, 2, 2, 0, false},
		{"spaced hyphen", "0.12 - 0.45", 0.12, 0.45, 2, 2, 0, false},
		{"both negative to", "−0.30 to −0.05", -0.30, -0.05, 2, 2, 0, false},
		{"both negative comma", "(-0.5, -0.1)", -0.5, -0.1, 1, 1, 0, false},
		{"both negative en dash", "[-0.5 – -0.1]", -0.5, -0.1, 1, 1, 0, false},
		{"both negative hyphens", "-0.5--0.1", -0.5, -0.1, 1, 1, 0, false},
		{"decimal commas semicolon", "0,12; 0,45", 0.12, 0.45, 2, 2, 0, false},
		{"decimal commas dash", "0,12–0,45", 0.12, 0.45, 2, 2, 0, false},
		{"decimal commas comma space", "(0,12, 0,45)", 0.12, 0.45, 2, 2, 0, false},
		{"bare comma with points", "(0.12,0.45)", 0.12, 0.45, 2, 2, 0, false},
		{"bare comma integers", "[12,45]", 12, 45, 0, 0, 0, false},
		{"level prefix", "95% CI 0.12 to 0.45", 0.12, 0.45, 2, 2, 95, false},
		{"level prefix colon brackets", "90% CI: [0.12, 0.45]", 0.12, 0.45, 2, 2, 90, false},
		{"level spaced", "99 % CI (0.1–0.4)", 0.1, 0.4, 1, 1, 99, false},
		{"level decimal", "99.9% CI 0.1 to 0.4", 0.1, 0.4, 1, 1, 99.9, false},
		{"CI without level", "CI 0.12–0.45", 0.12, 0.45, 2, 2, 0, false},
		{"spelled out", "95% confidence interval 0.12 to 0.45", 0.12, 0.45, 2, 2, 95, false},
		{"half-open", "[0.1, 0.4)", 0.1, 0.4, 1, 1, 0, false},
		{"label inside brackets", "(95% CI 0.12 to 0.45)", 0.12, 0.45, 2, 2, 95, false},
		{"minus sign as separator", "0.1 − 0.2", 0.1, 0.2, 1, 1, 0, false},
		{"asymmetric ratio [W19]", "1.33 to 3.47", 1.33, 3.47, 2, 2, 0, true},
		{"scientific", "[2.3e-5, 4.1e-5]", 2.3e-5, 4.1e-5, 6, 6, 0, false},
		{"scientific dash", "2.3e-5–4.1e-5", 2.3e-5, 4.1e-5, 6, 6, 0, false},
		{"equal limits", "0.2 to 0.2", 0.2, 0.2, 1, 1, 0, false},
		{"different decimals", "0.1 to 0.45", 0.1, 0.45, 1, 2, 0, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			iv, level, err := ParseIntervalLevel(tt.text)
			if err != nil {
				t.Fatalf("ParseIntervalLevel(%q) error %v", tt.text, err)
			}
			if iv.Low.Value != tt.low || iv.High.Value != tt.high || int(iv.Low.Decimals) != tt.decLo || int(iv.High.Decimals) != tt.decHi || level != tt.level {
				t.Errorf("ParseIntervalLevel(%q) = [%v (dec %d), %v (dec %d)] level %v, want [%v (dec %d), %v (dec %d)] level %v",
					tt.text, iv.Low.Value, iv.Low.Decimals, iv.High.Value, iv.High.Decimals, level, tt.low, tt.decLo, tt.high, tt.decHi, tt.level)
			}
			if !iv.Present() {
				t.Errorf("ParseIntervalLevel(%q).Present() = false, want true", tt.text)
			}
			iv2, err := ParseInterval(tt.text)
			if err != nil || iv2 != iv {
				t.Errorf("ParseInterval(%q) = %v, %v, want the same interval as ParseIntervalLevel", tt.text, iv2, err)
			}
		})
	}
}

func TestParseIntervalBlank(t *testing.T) {
	iv, err := ParseInterval("  ")
	if err != nil || iv.Present() || iv.Low.Bound != Absent || iv.High.Bound != Absent {
		t.Errorf("ParseInterval(blank) = %+v, %v, want both limits Absent and no error", iv, err)
	}
}

func TestParseIntervalRejects(t *testing.T) {
	tests := []struct {
		name, text, reason string
	}{
		{"one number", "0.12", "one number only"},
		{"three numbers comma", "(0.12, 0.45, 0.60)", "more than two numbers"},
		{"three numbers dash", "0.1–0.2–0.3", "more than two numbers"},
		{"three numbers to", "0.1 to 0.2 to 0.3", "more than two numbers"},
		{"reversed", "[0.45, 0.12]", "limits reversed"},
		{"reversed negative", "−0.05 to −0.30", "limits reversed"},
		{"unclosed", "(0.12 0.45", "has no closing bracket"},
		{"unopened", "0.12, 0.45]", "has no opening bracket"},
		{"no separator", "[0.12 0.45]", "no separator between the limits"},
		{"garbage", "n/a", "no lower and upper limit"},
		{"words", "not reported", "no lower and upper limit"},
		{"bad limit", "[0.1.2, 0.4]", "lower limit"},
		{"bad upper limit", "0.1 to abc", "upper limit"},
		{"star on limit", "[0.12*, 0.45]", "does not belong"},
		{"ambiguous commas", "0,12,0,45", "ambiguous commas"},
		{"level out of range", "150% CI 0.1 to 0.2", "between 0 and 100"},
		{"label only", "95% CI", "a label but no limits"},
		{"missing limit", "0.12 to ", "no lower and upper limit"},
		{"empty brackets", "( )", "empty brackets"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseInterval(tt.text)
			if err == nil {
				t.Fatalf("ParseInterval(%q) = no error, want %q", tt.text, tt.reason)
			}
			msg := err.Error()
			if !errors.Is(err, ErrMalformedInterval) || !strings.Contains(msg, tt.reason) || !strings.Contains(msg, "is not a confidence interval") {
				t.Errorf("ParseInterval(%q) error = %q, want ErrMalformedInterval saying %q", tt.text, msg, tt.reason)
			}
		})
	}
}

func BenchmarkParseInterval(b *testing.B) {
	texts := []string{"[0.12, 0.45]", "(.12–.45)", "95% CI −0.30 to −0.05", "0,12; 0,45"}
	b.ReportAllocs()
	for b.Loop() {
		for _, s := range texts {
			if _, err := ParseInterval(s); err != nil {
				b.Fatal(err)
			}
		}
	}
}
