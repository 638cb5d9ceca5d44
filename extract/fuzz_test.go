package extract

import (
	"errors"
	"math"
	"testing"
)

// The fuzz targets check that no cell makes a parser panic, that every
// refusal is a *ParseError of the right kind, and the invariants of what is
// accepted. Seed corpora are in testdata/fuzz/.

func FuzzParseNumber(f *testing.F) {
	f.Add("0.43")
	f.Add("−1,234.5e-3**")
	f.Fuzz(func(t *testing.T, text string) {
		p, err := ParseNumber(text)
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) || !errors.Is(err, ErrMalformedNumber) {
				t.Fatalf("ParseNumber(%q) error %v is not a *ParseError wrapping ErrMalformedNumber", text, err)
			}
			return
		}
		if p.Bound == Absent {
			return
		}
		if p.Bound != Exact || math.IsNaN(p.Value) || math.IsInf(p.Value, 0) || p.Decimals < -1 || p.Stars < 0 {
			t.Fatalf("ParseNumber(%q) = %+v, want an exact finite number", text, p)
		}
		again, err := ParseNumber(p.Text)
		if err != nil || again.Value != p.Value || again.Decimals != p.Decimals {
			t.Fatalf("ParseNumber(%q) = %+v, but its Text reads as %+v, %v", text, p, again, err)
		}
	})
}

func FuzzParseP(f *testing.F) {
	f.Add("p < .001")
	f.Add("n.s.")
	f.Fuzz(func(t *testing.T, text string) {
		p, err := ParseP(text)
		if err != nil {
			if !errors.Is(err, ErrMalformedP) {
				t.Fatalf("ParseP(%q) error %v does not wrap ErrMalformedP", text, err)
			}
			return
		}
		switch p.Bound {
		case Absent, NotSignificant:
		case Exact, Below, Above:
			if !(p.Value >= 0 && p.Value <= 1) {
				t.Fatalf("ParseP(%q) = %v, outside [0, 1]", text, p.Value)
			}
		default:
			t.Fatalf("ParseP(%q) bound %v", text, p.Bound)
		}
	})
}

func FuzzParseInterval(f *testing.F) {
	f.Add("[0.12, 0.45]")
	f.Add("95% CI −0.30 to −0.05")
	f.Fuzz(func(t *testing.T, text string) {
		iv, level, err := ParseIntervalLevel(text)
		if err != nil {
			if !errors.Is(err, ErrMalformedInterval) {
				t.Fatalf("ParseIntervalLevel(%q) error %v does not wrap ErrMalformedInterval", text, err)
			}
			return
		}
		if iv.Low.Bound == Absent && iv.High.Bound == Absent {
			return
		}
		if !iv.Present() || iv.Low.Value > iv.High.Value || level < 0 || level >= 100 {
			t.Fatalf("ParseIntervalLevel(%q) = %+v level %v, want ordered exact limits", text, iv, level)
		}
	})
}
