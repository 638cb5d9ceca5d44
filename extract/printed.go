package extract

import (
	"math"
	"strconv"
)

// Bound tells what kind of statement a printed number makes.
type Bound uint8

const (
	// Absent means the cell was blank: nothing was printed.
	Absent Bound = iota
	// Exact is an ordinary number, exact up to its rounding.
	Exact
	// Below is an upper bound, as in "p < .001": the value is below Value.
	Below
	// Above is a lower bound, as in "p > .10": the value is above Value.
	Above
	// NotSignificant is "ns": the paper only says p exceeded its alpha.
	NotSignificant
)

// String names the bound.
func (b Bound) String() string {
	switch b {
	case Absent:
		return "absent"
	case Exact:
		return "exact"
	case Below:
		return "below"
	case Above:
		return "above"
	case NotSignificant:
		return "ns"
	}
	return "Bound(" + strconv.Itoa(int(b)) + ")"
}

// Printed is a number as a paper printed it. Value is the number read; for
// Below and Above it is the bound. Decimals is the number of digits printed
// after the decimal separator, or -1 when they cannot be known (a number typed
// into a numeric spreadsheet cell has lost its trailing zeros). Text keeps the
// cell as it was written, for notes and messages.
type Printed struct {
	Value float64
	Text  string
	// The fields below are sized to keep a Printed to 32 bytes: a paired
	// row holds twenty of them, and a million rows stream through memory.
	// A cell is far shorter than 2³¹ bytes (MaxRecordBytes), so Decimals
	// holds any count of its digits.
	Decimals int32
	// Stars is the number of trailing significance stars ("0.21**" has 2),
	// at most math.MaxInt16.
	Stars int16
	Bound Bound
	// DecimalsFromDisplay is true when the cell was numeric in a workbook
	// and Decimals was taken from its displayed text: trailing zeros the
	// author typed may have been dropped, so the printed precision may have
	// been finer. The wider rounding interval is the conservative reading.
	DecimalsFromDisplay bool
}

// Present reports whether something was printed.
func (p Printed) Present() bool { return p.Bound != Absent }

// IsExact reports whether an ordinary number was printed.
func (p Printed) IsExact() bool { return p.Bound == Exact }

// HalfUnit returns half a unit in the last printed place, 0.5×10^(−Decimals):
// the most the true value can differ from the printed one. It returns 0 when
// the decimals are unknown, so that callers treat the value as exact and say so.
func (p Printed) HalfUnit() float64 {
	if p.Decimals < 0 {
		return 0
	}
	if int(p.Decimals) < len(negativePow10) {
		return 0.5 * negativePow10[p.Decimals]
	}
	return 0.5 * math.Pow(10, -float64(p.Decimals))
}

// negativePow10 holds 10^−d for the decimals numbers are printed with: the
// float64 nearest each, which is what math.Pow(10, −d) returns for them (a
// test checks it), without its cost on every printed number.
var negativePow10 = [...]float64{1, 1e-1, 1e-2, 1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10,
	1e-11, 1e-12, 1e-13, 1e-14, 1e-15, 1e-16, 1e-17, 1e-18, 1e-19, 1e-20, 1e-21, 1e-22}

// RoundingInterval returns the interval of true values that print as p:
// [Value − h, Value + h] with h = HalfUnit(). For Below it is
// [0, Value] when Value is a p-value-like bound, so callers handle bounds
// themselves; this method treats only Exact numbers and returns
// (Value, Value) for anything else.
func (p Printed) RoundingInterval() (lo, hi float64) {
	if p.Bound != Exact {
		return p.Value, p.Value
	}
	h := p.HalfUnit()
	return p.Value - h, p.Value + h
}

// Interval is a confidence interval as printed, both limits kept as printed.
type Interval struct {
	Low, High Printed
	// OneCell is true when the interval was printed in one cell (the ci
	// column) rather than as ci_low and ci_high.
	OneCell bool
}

// Present reports whether both limits were printed.
func (iv Interval) Present() bool { return iv.Low.IsExact() && iv.High.IsExact() }

// StarsPBound is the p bound a number of significance stars states: one
// star p < .05, two p < .01, three p < .001 (the usual convention of
// journal tables; common practice, no source). It reports false for no
// stars or more than three.
func StarsPBound(stars int) (float64, bool) {
	switch stars {
	case 1:
		return 0.05, true
	case 2:
		return 0.01, true
	case 3:
		return 0.001, true
	}
	return 0, false
}
