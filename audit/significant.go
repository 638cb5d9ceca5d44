package audit

import (
	"math"
	"strconv"
)

// A report writes about twenty numbers a claim, in the CSV cells (ten
// significant digits) and in the notes (four). strconv's general conversion
// takes some 50 ns a number; appendSignificant takes about half that for
// the magnitudes a report is made of, and hands strconv everything else.

// significantScale holds 10^k for k = 0 … 13, exact doubles;
// significantDecades the doubles nearest 10^e for e = −4 … 9 (above 10^e
// for e < 0).
var (
	significantScale   = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13}
	significantDecades = [...]float64{1e-4, 1e-3, 1e-2, 1e-1, 1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9}
)

// twoDigits lists 00 to 99.
const twoDigits = "00010203040506070809101112131415161718192021222324252627282930313233343536373839" +
	"40414243444546474849505152535455565758596061626364656667686970717273747576777879" +
	"8081828384858687888990919293949596979899"

// appendSignificant appends x as strconv.AppendFloat(dst, x, 'g', prec, 64)
// does, byte for byte, for 1 ≤ prec ≤ 10.
func appendSignificant(dst []byte, x float64, prec int) []byte {
	if out, ok := appendSignificantQuick(dst, x, prec); ok {
		return out
	}
	return strconv.AppendFloat(dst, x, 'g', prec, 64)
}

// appendSignificantQuick is appendSignificant where it needs no strconv:
// 1e-4 ≤ |x| < 10^prec, which 'g' writes without an exponent. It reports
// false, having appended nothing, elsewhere.
//
// Why it agrees: with 10^e ≤ |x| < 10^(e+1), the prec significant digits
// are the integer nearest P = |x|·10^(prec−1−e). The power of ten is an
// exact double (its exponent is at most 13 and at least −9), so the
// computed product (or quotient) s differs from P by at most half an ulp
// of s, below 2⁻¹⁹ as s < 10^10 < 2³⁴. Unless s lies within 4·10⁻⁶ of a
// half integer (then strconv decides, as it does an exact tie), P and s
// round to the same integer M. M must have prec digits (10^prec carries
// into the next decade), which also catches a decade misjudged at its
// edge. The 'g' format then writes M's digits with trailing zeros trimmed
// and the point after e + 1 of them, for −4 ≤ e < prec.
func appendSignificantQuick(dst []byte, x float64, prec int) ([]byte, bool) {
	ax := math.Abs(x)
	if prec < 1 || prec > 10 || !(ax >= significantDecades[0] && ax < significantScale[prec]) { // also 0, NaN and ±Inf
		return dst, false
	}
	// The decade from the binary exponent (log10 2 ≈ 78913/2¹⁸), put right
	// by one comparison either way.
	e := ((int(math.Float64bits(ax)>>52) - 1023) * 78913) >> 18
	e = min(max(e, -4), 9)
	if ax < significantDecades[e+4] {
		e--
	} else if e < 9 && ax >= significantDecades[e+5] {
		e++
	}
	if e < -4 {
		return dst, false
	}
	var s float64
	if k := prec - 1 - e; k >= 0 {
		s = ax * significantScale[k]
	} else {
		s = ax / significantScale[-k]
	}
	m, ok := roundedClearOfTie(s)
	if !ok {
		return dst, false
	}
	lo, hi := uint64(significantScale[prec-1]), uint64(significantScale[prec])
	if m == hi {
		m, e = lo, e+1
	}
	if m < lo || m >= hi || e >= prec {
		return dst, false
	}
	// M's digits, right-aligned in digits[:prec]. Past five digits the low
	// five are split off by one 64-bit division and the rest is 32-bit
	// arithmetic; low five that are all zeros (a short printed number at
	// ten digits) are not written at all.
	var digits [10]byte
	nd, i := prec, prec
	if prec > 5 {
		lo := uint32(m % 100000)
		m /= 100000
		i -= 5
		if lo == 0 {
			nd = i
		} else {
			h, k := lo/100, 2*(lo%100)
			digits[i+3], digits[i+4] = twoDigits[k], twoDigits[k+1]
			k = 2 * (h % 100)
			digits[i+1], digits[i+2] = twoDigits[k], twoDigits[k+1]
			digits[i] = byte('0' + h/100)
		}
	}
	w := uint32(m)
	for ; i >= 2; i -= 2 { // two digits a step
		k := 2 * (w % 100)
		digits[i-2], digits[i-1] = twoDigits[k], twoDigits[k+1]
		w /= 100
	}
	if i == 1 {
		digits[0] = byte('0' + w)
	}
	for digits[nd-1] == '0' {
		nd--
	}
	if x < 0 {
		dst = append(dst, '-')
	}
	switch dp := e + 1; {
	case dp <= 0:
		dst = append(dst, "0.0000"[:2-dp]...)
		return append(dst, digits[:nd]...), true
	case dp >= nd:
		dst = append(dst, digits[:nd]...)
		return append(dst, "000000000"[:dp-nd]...), true
	default:
		dst = append(append(dst, digits[:dp]...), '.')
		return append(dst, digits[dp:nd]...), true
	}
}

// roundedClearOfTie returns the integer nearest s ≥ 0, a scaled number
// whose one rounding error is far below the guard, and false when s lies
// within 4·10⁻⁶ of a half integer: there the exact value may round the
// other way, and strconv is left to decide.
//
// s is below 2⁴⁰ wherever it is called, so conversion to int64, which
// truncates, is its floor, without math.Floor's call.
func roundedClearOfTie(s float64) (uint64, bool) {
	if f := s - float64(int64(s)); math.Abs(f-0.5) < 4e-6 {
		return 0, false
	}
	return uint64(int64(s + 0.5)), true
}

// appendThreeDecimals appends x as strconv.AppendFloat(dst, x, 'f', 3, 64)
// does, byte for byte: quickly for 0 ≤ x ≤ 1000 (p-values), as
// appendSignificantQuick argues (x·1000 rounds once, to within 2⁻³³ for
// x·1000 below 2²⁰, so away from a tie it rounds as x does), and by strconv
// elsewhere.
func appendThreeDecimals(dst []byte, x float64) []byte {
	if !(x >= 0 && x <= 1000) || (x == 0 && math.Signbit(x)) {
		return strconv.AppendFloat(dst, x, 'f', 3, 64)
	}
	m, ok := roundedClearOfTie(x * 1000)
	if !ok {
		return strconv.AppendFloat(dst, x, 'f', 3, 64)
	}
	dst = append(strconv.AppendUint(dst, m/1000, 10), '.')
	frac := m % 1000
	return append(dst, byte('0'+frac/100), byte('0'+frac/10%10), byte('0'+frac%10))
}
