package extract

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// The numeral itself, once ParseNumber has taken off the stars, the bound
// and the surrounding space: sign, digits, a decimal comma or point,
// thousands groups and an exponent in any of the ways papers print one.

// superscripts maps superscript digits and signs to ASCII, for "10⁻⁵".
var superscripts = map[rune]byte{
	'⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9',
	'⁻': '-', '⁺': '+',
}

// parseNumeral reads an optionally signed number with an optional exponent.
// It returns a non-empty reason when s is not a number.
func parseNumeral(s string, mode numberMode) (v float64, decimals int, reason string) {
	neg := false
	if r, size := utf8.DecodeRuneInString(s); r == '+' || isMinus(r) {
		neg = isMinus(r)
		s = strings.TrimLeftFunc(s[size:], isSpace)
		if s == "" {
			return 0, 0, "a sign but no number"
		}
	}
	unsigned := s
	mant, exp, hasExp, reason := splitExponent(s)
	if reason != "" {
		return 0, 0, reason
	}
	intPart, frac, reason := splitMantissa(mant, mode)
	if reason != "" {
		return 0, 0, reason
	}
	decimals = len(frac)
	if hasExp {
		decimals -= exp
		if decimals < 0 {
			decimals = -1
		}
	}
	if isPlainNumeral(unsigned) {
		// The digits are already in strconv's syntax: parse them in place.
		v, err := strconv.ParseFloat(unsigned, 64)
		if err != nil || math.IsInf(v, 0) {
			return 0, 0, "too large to be a number"
		}
		if neg {
			v = -v
		}
		return v, decimals, ""
	}
	var b strings.Builder
	b.Grow(len(intPart) + len(frac) + 8)
	if neg {
		b.WriteByte('-')
	}
	if intPart == "" {
		b.WriteByte('0')
	} else {
		b.WriteString(intPart)
	}
	if frac != "" {
		b.WriteByte('.')
		b.WriteString(frac)
	}
	if hasExp {
		b.WriteByte('e')
		b.WriteString(strconv.Itoa(exp))
	}
	v, err := strconv.ParseFloat(b.String(), 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, 0, "too large to be a number"
	}
	return v, decimals, ""
}

// isPlainNumeral reports whether s is an ASCII number strconv reads as
// printed: an optional sign, digits with at most one decimal point, and an
// optional e exponent, with nothing else.
func isPlainNumeral(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '-' || s[i] == '+') {
		i++
	}
	digits, dots := 0, 0
	for ; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digits++
		case c == '.':
			dots++
		case c == 'e' || c == 'E':
			return digits > 0 && dots <= 1 && isPlainExponent(s[i+1:])
		default:
			return false
		}
	}
	return digits > 0 && dots <= 1 && s[len(s)-1] != '.'
}

func isPlainExponent(e string) bool {
	if e != "" && (e[0] == '-' || e[0] == '+') {
		e = e[1:]
	}
	if e == "" || len(e) > 4 {
		return false
	}
	for i := 0; i < len(e); i++ {
		if e[i] < '0' || e[i] > '9' {
			return false
		}
	}
	return true
}

// splitExponent separates "2.3e-5", "2.3 × 10^-5" and "2.3×10⁻⁵" into the
// mantissa and the exponent.
func splitExponent(s string) (mant string, exp int, hasExp bool, reason string) {
	simple := true
	for i := 0; i < len(s); i++ {
		if c := s[i]; c >= 0x80 || c == 'e' || c == 'E' || c == 'x' || c == 'X' || c == '*' {
			simple = false
			break
		}
	}
	if simple {
		return s, 0, false, ""
	}
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		e := s[i+1:]
		n, ok := parseExponent(e)
		if !ok {
			return "", 0, false, fmt.Sprintf("%q is not an exponent", e)
		}
		if i == 0 {
			return "", 0, false, "an exponent without a number before it"
		}
		return s[:i], n, true, ""
	}
	// "× 10^-5", "x10^-5", "·10⁻⁵", "*10^-5": find the times sign.
	i := strings.IndexAny(s, "×xX·*")
	if i < 0 {
		return s, 0, false, ""
	}
	_, size := utf8.DecodeRuneInString(s[i:])
	mant = strings.TrimRightFunc(s[:i], isSpace)
	rest := strings.TrimLeftFunc(s[i+size:], isSpace)
	if !strings.HasPrefix(rest, "10") {
		return "", 0, false, "a times sign not followed by 10"
	}
	rest = rest[2:]
	if rest == "" {
		return "", 0, false, "a power of 10 without its exponent (write 10^-5 or 10⁻⁵)"
	}
	switch {
	case strings.HasPrefix(rest, "^"):
		rest = rest[1:]
	case strings.HasPrefix(rest, "**"):
		rest = rest[2:]
	default:
		var b strings.Builder
		for _, r := range rest {
			c, ok := superscripts[r]
			if !ok {
				return "", 0, false, "a power of 10 without its exponent (write 10^-5 or 10⁻⁵)"
			}
			b.WriteByte(c)
		}
		rest = b.String()
	}
	n, ok := parseExponent(rest)
	if !ok {
		return "", 0, false, fmt.Sprintf("%q is not an exponent", rest)
	}
	if mant == "" {
		return "", 0, false, "a power of 10 without a number before it"
	}
	return mant, n, true, ""
}

// parseExponent reads a signed integer exponent of at most four digits.
func parseExponent(e string) (int, bool) {
	neg := false
	if r, size := utf8.DecodeRuneInString(e); r == '+' || isMinus(r) {
		neg = isMinus(r)
		e = e[size:]
	}
	if e == "" || len(e) > 4 {
		return 0, false
	}
	n := 0
	for i := 0; i < len(e); i++ {
		if e[i] < '0' || e[i] > '9' {
			return 0, false
		}
		n = 10*n + int(e[i]-'0')
	}
	if neg {
		n = -n
	}
	return n, true
}

// splitMantissa checks the digits and separators of a mantissa and returns
// its integer and fractional digits.
func splitMantissa(s string, mode numberMode) (intPart, frac, reason string) {
	if s == "" {
		return "", "", "no digits"
	}
	digits, dots, commas := 0, 0, 0
	first, last := -1, -1
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digits++
			continue
		case c == '.':
			dots++
		case c == ',':
			commas++
		default:
			r, _ := utf8.DecodeRuneInString(s[i:])
			if isSpace(r) {
				return "", "", "a space inside the number"
			}
			if r == '%' {
				return "", "", "a percent sign (write the number as a proportion or in a column that takes percent)"
			}
			return "", "", fmt.Sprintf("%q is not part of a number", string(r))
		}
		if first < 0 {
			first = i
		}
		last = i
	}
	if digits == 0 {
		return "", "", "no digits"
	}
	switch {
	case dots+commas == 0:
		return s, "", ""
	case commas == 0:
		if dots > 1 {
			return "", "", "more than one decimal point"
		}
		return splitAt(s, first)
	case dots == 0 && commas == 1:
		i := first
		if isThousandsGroup(s[:i], s[i+1:]) {
			if mode == numberCount {
				return s[:i] + s[i+1:], "", ""
			}
			return "", "", fmt.Sprintf("ambiguous: %s with a decimal comma or %s%s with a thousands separator (write %s.%s or %s%s)",
				s[:i]+"."+s[i+1:], s[:i], s[i+1:], s[:i], s[i+1:], s[:i], s[i+1:])
		}
		return splitAt(s, i)
	case dots == 0:
		if grouped(s, ',') {
			return strings.ReplaceAll(s, ",", ""), "", ""
		}
		return "", "", "more than one decimal comma"
	}
	// Both kinds: the last separator is the decimal mark and the other
	// kind must group thousands before it.
	mark := s[last]
	group := byte(',')
	if mark == ',' {
		group = '.'
	}
	if strings.IndexByte(s[:last], mark) >= 0 {
		return "", "", "more than one decimal separator"
	}
	if !grouped(s[:last], group) {
		return "", "", fmt.Sprintf("%q does not group thousands", string(group))
	}
	whole := strings.ReplaceAll(s[:last], string(group), "")
	return splitAt(whole+"."+s[last+1:], len(whole))
}

// splitAt splits s at the decimal separator at index i.
func splitAt(s string, i int) (intPart, frac, reason string) {
	intPart, frac = s[:i], s[i+1:]
	if frac == "" {
		return "", "", "no digits after the decimal separator"
	}
	return intPart, frac, ""
}

// isThousandsGroup reports whether "a,b" reads as a thousands group: 1 to 3
// leading digits, not starting with 0, then exactly three digits.
func isThousandsGroup(a, b string) bool {
	return len(a) >= 1 && len(a) <= 3 && a[0] != '0' && len(b) == 3
}

// grouped reports whether s is digits grouped in threes by sep, the first
// group of 1 to 3 digits not starting with 0 (unless it is a lone 0).
func grouped(s string, sep byte) bool {
	parts := strings.Split(s, string(sep))
	if len(parts) < 2 {
		return false
	}
	first := parts[0]
	if len(first) < 1 || len(first) > 3 || (first[0] == '0' && len(first) > 1) || first == "0" {
		return false
	}
	for _, p := range parts[1:] {
		if len(p) != 3 {
			return false
		}
	}
	return true
}
