package extract

import (
	"errors"
	"strings"
	"testing"
)

// Printed forms and their sources as in parse_test.go.

func TestParseP(t *testing.T) {
	tests := []struct {
		name     string
		text     string
		value    float64
		decimals int
		bound    Bound
	}{
		{"exact no space [AB11]", "P=0.032", 0.032, 3, Exact},
		{"exact spaced [TB01]", "P = .03", 0.03, 2, Exact},
		{"lower-case", "p = .03", 0.03, 2, Exact},
		{"lower-case no space", "p=0.03", 0.03, 2, Exact},
		{"bare [APA]", ".03", 0.03, 2, Exact},
		{"below [APA]", "p < .001", 0.001, 3, Below},
		{"below capital", "P<0.001", 0.001, 3, Below},
		{"below bare", "<.001", 0.001, 3, Below},
		{"below spaced bare", "< .001", 0.001, 3, Below},
		{"at most", "p ≤ .05", 0.05, 2, Below},
		{"at most ascii", "p <= .05", 0.05, 2, Below},
		{"above", "> .05", 0.05, 2, Above},
		{"above with p", "p > 0.10", 0.10, 2, Above},
		{"at least", "p ≥ .10", 0.10, 2, Above},
		{"R limit [R]", "p < 2.2e-16", 2.2e-16, 17, Below},
		{"decimal comma", "p < 0,001", 0.001, 3, Below},
		{"printed zero", "p = .000", 0, 3, Exact},
		{"one", "1.00", 1, 2, Exact},
		{"with star", "p = .03*", 0.03, 2, Exact},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := ParseP(tt.text)
			if err != nil {
				t.Fatalf("ParseP(%q) error %v", tt.text, err)
			}
			if got.Value != tt.value || int(got.Decimals) != tt.decimals || got.Bound != tt.bound {
				t.Errorf("ParseP(%q) = {%v, dec %d, %v}, want {%v, dec %d, %v}", tt.text, got.Value, got.Decimals, got.Bound, tt.value, tt.decimals, tt.bound)
			}
		})
	}
	for _, text := range []string{"ns", "n.s.", "NS", "n.s", "N.S.", "n. s."} {
		got, err := ParseP(text)
		if err != nil || got.Bound != NotSignificant {
			t.Errorf("ParseP(%q) = %v, %v, want NotSignificant", text, got.Bound, err)
		}
	}
	if got, err := ParseP(" "); err != nil || got.Bound != Absent {
		t.Errorf("ParseP(blank) = %v, %v, want Absent", got.Bound, err)
	}
}

func TestParsePRejects(t *testing.T) {
	tests := []struct {
		name, text, reason string
	}{
		{"above one", "1.5", "cannot exceed 1"},
		{"negative", "−0.03", "cannot be negative"},
		{"below zero", "p < 0", "no p-value is below 0"},
		{"above one bound", "p > 1", "no p-value is above 1"},
		{"no operator", "p .03", "expected <, = or > after p"},
		{"operator only", "p <", "no number"},
		{"garbage", "significant", "not part of a number"},
		{"two points", "p = 0.0.3", "more than one decimal point"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseP(tt.text)
			if err == nil {
				t.Fatalf("ParseP(%q) = no error, want %q", tt.text, tt.reason)
			}
			if !errors.Is(err, ErrMalformedP) || !strings.Contains(err.Error(), tt.reason) || !strings.Contains(err.Error(), "is not a p-value") {
				t.Errorf("ParseP(%q) error = %q, want ErrMalformedP saying %q", tt.text, err, tt.reason)
			}
		})
	}
}
