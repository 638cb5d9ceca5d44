package extract

import (
	"fmt"
	"math"
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

// parsePrinted reads any printed number ParseNumber and ParseCount accept.
func parsePrinted(text string, mode numberMode, kind error) (Printed, error) {
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
