package extract

// plainDigits is the most digits plainNumeral reads: below 2^53, so
// their integer is exact as a float64, and at most 22 decimals, so the
// power of ten dividing it is exact too.
const plainDigits = 15

// exactPow10 holds the powers of ten up to 10^plainDigits, all exact in a
// float64.
var exactPow10 = [plainDigits + 1]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15}

// plainNumeral reads the numeral nearly every printed cell holds: an
// optional ASCII sign, then at most plainDigits digits with at most one
// decimal point that has a digit after it ("0.43", "-0.22", ".43", "570").
// ok is false for anything else (a Unicode minus, a comma, a star, an
// exponent, a space, more digits), which parsePrintedGeneral reads.
//
// The value is the integer of the digits divided by 10^decimals. Both are
// exact in a float64 and IEEE 754 division rounds correctly, so the result
// is the float64 nearest the numeral, the value strconv.ParseFloat returns
// (the exact case of Clinger's algorithm [1], which strconv also takes):
//
//	v = m / 10^d,   m < 10^15 < 2^53,   d ≤ 15 ≤ 22
//
// References:
//
//	[1] Clinger WD (1990). How to read floating point numbers accurately.
//	    Proceedings of the ACM SIGPLAN 1990 Conference on Programming
//	    Language Design and Implementation, 92–101.
func plainNumeral(s string) (v float64, decimals int, ok bool) {
	// A sign, plainDigits digits and a point at most: longer is not
	// plain, and m cannot overflow below.
	if s == "" || len(s) > plainDigits+2 {
		return 0, 0, false
	}
	i, neg := 0, s[0] == '-'
	if neg || s[0] == '+' {
		i = 1
	}
	var m uint64
	start := i
	for ; i < len(s) && s[i]-'0' < 10; i++ {
		m = 10*m + uint64(s[i]-'0')
	}
	digits := i - start
	if i < len(s) {
		if s[i] != '.' {
			return 0, 0, false
		}
		i++
		frac := i
		for ; i < len(s) && s[i]-'0' < 10; i++ {
			m = 10*m + uint64(s[i]-'0')
		}
		decimals = i - frac
		if i < len(s) || decimals == 0 {
			// Something after the decimals, or none after the point.
			return 0, 0, false
		}
		digits += decimals
	}
	if digits == 0 || digits > plainDigits {
		return 0, 0, false
	}
	v = float64(m) / exactPow10[decimals]
	if neg {
		v = -v
	}
	return v, decimals, true
}
