package extract

import (
	"errors"
	"fmt"
	"regexp"
	"strings"
	"unicode/utf8"
)

// ParseInterval reads a confidence interval printed in one cell. It accepts
//
//	[0.12, 0.45]   (0.12, 0.45)   (0.12; 0.45)   0.12 to 0.45
//	(.12–.45)   (.12—.45)   0.12-0.45   0.12 - 0.45
//	−0.30 to −0.05   (-0.5, -0.1)   [-0.5 – -0.1]
//	0,12; 0,45   0,12–0,45   (0,12, 0,45)   (decimal commas)
//	95% CI 0.12 to 0.45   95% CI: [0.12, 0.45]   CI 0.12–0.45
//
// The limits are separated by " to ", a semicolon, a comma followed by a
// space, a dash (hyphen, en or em dash) that follows a digit, or, when the
// numbers use decimal points, a bare comma; a dash that does not follow a
// digit is a minus sign. Each limit is read like ParseNumber, without stars.
//
// It fails with a *ParseError wrapping ErrMalformedInterval when the cell
// holds one number only, more than two, an unclosed bracket, limits that are
// reversed (lower above upper) or anything else. An asymmetric interval is
// not an error. A blank cell gives an Interval with both limits Absent and no
// error. Use ParseIntervalLevel to learn a printed confidence level.
//
// References:
//
//	[1] American Psychological Association (2020). Publication Manual of
//	    the American Psychological Association, 7th ed., §6.44: "95% CI
//	    [0.12, 0.45]" (from memory).
//	[2] Altman DG, Bland JM (2011). How to obtain the confidence interval
//	    from a P value. BMJ 343:d2090 (prints "1.4 to 32.6").
func ParseInterval(text string) (Interval, error) {
	iv, _, err := ParseIntervalLevel(text)
	return iv, err
}

// ParseIntervalLevel is ParseInterval that also returns the confidence level,
// in percent, when the cell printed one ("90% CI 0.1 to 0.4" gives 90), and
// 0 when it did not.
func ParseIntervalLevel(text string) (iv Interval, level float64, err error) {
	s := trimSpace(text)
	if s == "" {
		return Interval{Low: Printed{Bound: Absent}, High: Printed{Bound: Absent}}, 0, nil
	}
	fail := func(format string, args ...any) (Interval, float64, error) {
		return Interval{}, 0, &ParseError{Text: s, Kind: ErrMalformedInterval, Reason: fmt.Sprintf(format, args...)}
	}
	body, level, reason := stripCIPrefix(s)
	if reason != "" {
		return fail("%s", reason)
	}
	body, reason = stripBrackets(body)
	if reason != "" {
		return fail("%s", reason)
	}
	if body == "" {
		return fail("empty brackets")
	}
	if level == 0 {
		// "(95% CI 0.12 to 0.45)": the label inside the brackets.
		if body, level, reason = stripCIPrefix(body); reason != "" {
			return fail("%s", reason)
		}
	}
	low, high, reason := splitLimits(body)
	if reason != "" {
		return fail("%s", reason)
	}
	lo, err := parsePrinted(low, numberLimit, ErrMalformedInterval)
	if err != nil {
		return fail("lower limit: %s", limitReason(err))
	}
	hi, err := parsePrinted(high, numberLimit, ErrMalformedInterval)
	if err != nil {
		return fail("upper limit: %s", limitReason(err))
	}
	if !lo.Present() || !hi.Present() {
		return fail("a limit is missing")
	}
	if lo.Value > hi.Value {
		return fail("limits reversed: the lower limit %s is above the upper limit %s", lo.Text, hi.Text)
	}
	return Interval{Low: lo, High: hi}, level, nil
}

// stripCIPrefix removes a leading "95% CI" or "CI" and returns the level
// printed (0 for none).
func stripCIPrefix(s string) (body string, level float64, reason string) {
	if s == "" || !mayHaveCIPrefix(s) {
		return s, 0, ""
	}
	m := ciPrefix.FindStringSubmatch(s)
	if m == nil {
		return s, 0, ""
	}
	body = trimSpace(s[len(m[0]):])
	if m[1] != "" {
		lv, err := ParseNumber(m[1])
		if err != nil || !(lv.Value > 0 && lv.Value < 100) {
			return "", 0, "a confidence level must lie between 0 and 100 percent"
		}
		level = lv.Value
	}
	if body == "" {
		return "", 0, "a label but no limits"
	}
	return body, level, ""
}

// mayHaveCIPrefix is a cheap test before the prefix expression: a level
// has a percent sign, and the label starts with c or C.
func mayHaveCIPrefix(s string) bool {
	return s[0] == 'c' || s[0] == 'C' || strings.IndexByte(s, '%') >= 0
}

// ciPrefix matches a leading "95% CI", "95 % CI:", "CI", "C.I." or
// "95% confidence interval", capturing the level.
var ciPrefix = regexp.MustCompile(`(?i)^(?:(\d+(?:[.,]\d+)?)\s*%\s*)?(?:ci|c\.i\.|confidence\s+interval)\s*[:=]?\s*`)

func limitReason(err error) string {
	var pe *ParseError
	if errors.As(err, &pe) {
		return fmt.Sprintf("%q: %s", pe.Text, pe.Reason)
	}
	return err.Error()
}

// stripBrackets removes one pair of enclosing brackets: "(", "[" or "{"
// opening and ")", "]" or "}" closing (half-open notation such as
// "[0.1, 0.4)" is accepted).
func stripBrackets(s string) (string, string) {
	open := strings.ContainsRune("([{", rune(s[0]))
	last, _ := utf8.DecodeLastRuneInString(s)
	closing := strings.ContainsRune(")]}", last)
	switch {
	case open && closing:
		return trimSpace(s[1 : len(s)-1]), ""
	case open:
		return "", fmt.Sprintf("the opening %q has no closing bracket", s[:1])
	case closing:
		return "", fmt.Sprintf("the closing %q has no opening bracket", string(last))
	}
	return s, ""
}

// toSeparator matches " to " between the limits.
var toSeparator = regexp.MustCompile(`(?i)\s+to\s+`)

// splitLimits finds the one separator between two limits.
func splitLimits(s string) (low, high, reason string) {
	if strings.Contains(s, "to") || strings.Contains(s, "TO") || strings.Contains(s, "To") {
		if locs := toSeparator.FindAllStringIndex(s, -1); len(locs) > 0 {
			if len(locs) > 1 {
				return "", "", "more than two numbers"
			}
			return s[:locs[0][0]], s[locs[0][1]:], ""
		}
	}
	if n := strings.Count(s, ";"); n > 0 {
		if n > 1 {
			return "", "", "more than two numbers"
		}
		i := strings.IndexByte(s, ';')
		return s[:i], s[i+1:], ""
	}
	// A comma followed by a space separates even decimal-comma limits.
	at, count := -1, 0
	for i := 0; i+1 < len(s); i++ {
		if s[i] == ',' {
			if r, _ := utf8.DecodeRuneInString(s[i+1:]); isSpace(r) {
				if count == 0 {
					at = i
				}
				count++
			}
		}
	}
	if count > 0 {
		if count > 1 {
			return "", "", "more than two numbers"
		}
		return s[:at], s[at+1:], ""
	}
	// A dash after a digit separates; a dash elsewhere is a minus sign.
	end := -1
	var prev rune
	for i, r := range s {
		if isDash(r) && prev >= '0' && prev <= '9' {
			if count == 0 {
				at, end = i, i+utf8.RuneLen(r)
			}
			count++
		}
		if !isSpace(r) {
			prev = r
		}
	}
	if count > 0 {
		if count > 1 {
			return "", "", "more than two numbers"
		}
		return s[:at], s[end:], ""
	}
	if n := strings.Count(s, ","); n > 0 {
		switch {
		case n == 1 || strings.Contains(s, "."):
			if n > 1 {
				return "", "", "more than two numbers"
			}
			i := strings.IndexByte(s, ',')
			return s[:i], s[i+1:], ""
		default:
			return "", "", "ambiguous commas: with decimal commas separate the limits by a semicolon (0,12; 0,45)"
		}
	}
	if _, err := parsePrinted(s, numberGeneral, ErrMalformedNumber); err == nil {
		return "", "", "one number only; an interval needs a lower and an upper limit"
	}
	if f := strings.FieldsFunc(s, isSpace); len(f) == 2 {
		_, e1 := parsePrinted(f[0], numberLimit, ErrMalformedNumber)
		_, e2 := parsePrinted(f[1], numberLimit, ErrMalformedNumber)
		if e1 == nil && e2 == nil {
			return "", "", "no separator between the limits (use a comma, a semicolon, a dash or \"to\")"
		}
	}
	return "", "", "no lower and upper limit found"
}

// isDash reports whether r can separate two limits.
func isDash(r rune) bool {
	switch r {
	case '-', '\u2013', '\u2014', '\u2012', '\u2212':
		return true
	}
	return false
}
