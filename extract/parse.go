package extract

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// ParseError explains why a printed cell could not be read. Its message
// names the cell as written, the reason and the forms that are accepted:
//
//	"0.4.3" is not a number (more than one decimal point; expected e.g. 0.43, .43, −0.43, 0,43)
//
// errors.Is(err, ErrMalformedNumber) (or ErrMalformedP, ErrMalformedInterval)
// tells the kinds apart.
type ParseError struct {
	// Text is the cell, trimmed.
	Text string
	// Kind is ErrMalformedNumber, ErrMalformedP or ErrMalformedInterval.
	Kind error
	// Reason says what was wrong, in a few words.
	Reason string
}

// Error implements error.
func (e *ParseError) Error() string {
	noun, examples := "not a number", "0.43, .43, −0.43, 0,43"
	switch e.Kind {
	case ErrMalformedP:
		noun, examples = "not a p-value", "p < .001, p = .03, .03, ns"
	case ErrMalformedInterval:
		noun, examples = "not a confidence interval", "[0.12, 0.45], (.12–.45), 0.12 to 0.45"
	}
	return fmt.Sprintf("%q is %s (%s; expected e.g. %s)", e.Text, noun, e.Reason, examples)
}

// Unwrap returns the sentinel Kind.
func (e *ParseError) Unwrap() error { return e.Kind }

// ParseNumber reads a number as a paper printed it. It accepts
//
//	0.43   .43   +0.43   −0.43 (U+2212)   –0.43 (en dash as a minus)
//	0,43 (decimal comma)   1,234.5   1.234,5   1,234,567 (thousands grouped)
//	0.21***   0.21 *   0.21† (trailing significance marks; Stars counts the *)
//	2.3e-5   2.3E-05   2.3 × 10^-5   2.3×10⁻⁵   2.3 x 10^-5
//
// and leading and trailing spaces, including non-breaking ones. A single
// comma followed by exactly three digits ("1,234", "12,345") is refused as
// ambiguous: it is 1.234 with a decimal comma or 1234 with a thousands
// separator, and only the paper knows which (ParseCount reads it as a
// thousands separator, as n and df are). "0,123" is read as a decimal comma,
// since no thousands group starts with 0.
//
// Decimals is the number of digits printed after the decimal separator. For
// scientific notation it is the mantissa's decimals shifted by the exponent,
// so that "2.3e-5" has 6 decimals and stands for [2.25e-5, 2.35e-5). A
// precision coarser than units ("2.3e5", known to ±5000) cannot be written
// as a count of decimals and is reported as unknown (−1).
//
// A printed number stands for every value that rounds to it:
//
//	true value ∈ [Value − h, Value + h),   h = ½ · 10^(−Decimals)
//	Decimals("m × 10^e") = Decimals(m) − e
//
// A blank cell gives Printed{Bound: Absent} and no error. Anything else fails
// with a *ParseError wrapping ErrMalformedNumber.
//
// References:
//
//	[1] ISO 80000-1:2009. Quantities and units — Part 1: General, §7.3.2:
//	    the decimal sign is a comma or a point, and digits may be grouped
//	    in threes (from memory).
//	[2] American Psychological Association (2020). Publication Manual of
//	    the American Psychological Association, 7th ed., §6.36: no zero
//	    before the decimal point of a value that cannot exceed 1 (from
//	    memory).
func ParseNumber(text string) (Printed, error) {
	return parsePrinted(text, numberGeneral, ErrMalformedNumber)
}

// ParseCount reads a count or degrees of freedom (the n and df columns). It
// takes everything ParseNumber takes, except significance stars, and reads a
// comma followed by groups of three digits as a thousands separator:
// "1,234" is 1234, while "45,5" (one or two digits after the comma) is 45.5
// with a decimal comma. It does not require a whole number, since df of a
// Welch test or a mixed model is often fractional; the reader of the n
// column checks that itself.
func ParseCount(text string) (Printed, error) {
	return parsePrinted(text, numberCount, ErrMalformedNumber)
}

// numberMode selects how a comma is read.
type numberMode int

const (
	// numberGeneral: a lone "d,ddd" is ambiguous and refused.
	numberGeneral numberMode = iota
	// numberCount: ",ddd" groups are thousands.
	numberCount
	// numberLimit: like numberGeneral; used for interval limits.
	numberLimit
)

// parsePrinted reads a printed number: the common plain numeral by
// plainNumeral, anything else by parsePrintedGeneral, which gives the same
// result for a plain numeral too (a test checks that they agree).
func parsePrinted(text string, mode numberMode, kind error) (Printed, error) {
	s := trimSpace(text)
	if s == "" {
		return Printed{Bound: Absent}, nil
	}
	if v, dec, ok := plainNumeral(s); ok {
		return Printed{Value: v, Decimals: int32(dec), Bound: Exact, Text: s}, nil
	}
	return parsePrintedGeneral(s, mode, kind)
}

// parsePrintedGeneral reads any printed number ParseNumber and ParseCount
// accept.
func parsePrintedGeneral(text string, mode numberMode, kind error) (Printed, error) {
	s := trimSpace(text)
	if s == "" {
		return Printed{Bound: Absent}, nil
	}
	body, stars, marks := splitStars(s)
	if (stars > 0 || marks) && mode != numberGeneral {
		what := "a significance star"
		if stars == 0 {
			what = "a significance mark"
		}
		return Printed{}, &ParseError{Text: s, Kind: kind, Reason: what + " does not belong in this column"}
	}
	if body == "" {
		return Printed{}, &ParseError{Text: s, Kind: kind, Reason: "stars but no number"}
	}
	v, dec, reason := parseNumeral(body, mode)
	if reason != "" {
		return Printed{}, &ParseError{Text: s, Kind: kind, Reason: reason}
	}
	return Printed{Value: v, Decimals: int32(dec), Bound: Exact, Stars: int16(min(stars, math.MaxInt16)), Text: s}, nil
}

// trimSpace trims white space, including the non-breaking and thin spaces
// that typeset tables carry into copied text.
func trimSpace(s string) string {
	if isTrimmed(s) {
		return s
	}
	return strings.TrimFunc(s, isSpace)
}

// isTrimmed reports a string that trimSpace returns as it is because it
// starts and ends with a visible ASCII byte (0x21 to 0x7f), as nearly every
// cell does. It is small enough to be inlined where every cell passes.
func isTrimmed(s string) bool {
	return s == "" || (s[0]-0x21 < 0x5f && s[len(s)-1]-0x21 < 0x5f)
}

func isSpace(r rune) bool {
	switch r {
	case ' ', '\t', '\n', '\r', '\v', '\f', '\u00a0', '\u2007', '\u2009', '\u200a', '\u202f', '\u205f', '\u3000', '\ufeff':
		return true
	}
	return false
}

// isMinus reports whether r is printed as a minus sign before a number.
func isMinus(r rune) bool {
	switch r {
	case '-', '\u2212', '\u2013', '\u2012', '\ufe63', '\uff0d':
		return true
	}
	return false
}

// splitStars strips trailing significance marks: stars, which it counts,
// and daggers and double daggers, which it accepts without counting (they
// usually mark p < .10 and are kept in Text).
func splitStars(s string) (body string, stars int, marks bool) {
	body = s
	for body != "" {
		r, size := utf8.DecodeLastRuneInString(body)
		switch {
		case r == '*' || r == '\u2217':
			stars++
		case r == '\u2020' || r == '\u2021':
			marks = true
		case isSpace(r):
		default:
			return body, stars, marks
		}
		body = body[:len(body)-size]
	}
	return body, stars, marks
}

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
