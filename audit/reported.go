package audit

import (
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"coefaudit/extract"
)

// ErrReported is wrapped by every error of ParseReported: a string that is
// not an estimate with its interval, SE or p.
var ErrReported = errors.New("not an estimate with its interval, SE or p")

// Reported is one estimate as an editor has it in front of them, every
// number kept as printed (see extract.Printed).
type Reported struct {
	Estimate extract.Printed
	// CI is the interval, both limits Absent when none was given; Level is
	// its confidence level in percent (extract.DefaultCILevel unless the
	// text said, as in "95% CI 0.30 to 0.52").
	CI    extract.Interval
	Level float64
	SE    extract.Printed
	P     extract.Printed
	// Stat is a printed t or z statistic and DF its df ("t(120) = 3.2"),
	// Absent when not given.
	Stat, DF extract.Printed
	// Measure is the measure a leading label names ("b =", "β =", "r =",
	// "OR"), "" without one.
	Measure string
	// PFromStars is set when P is the bound the estimate's trailing stars
	// state ("0.41***": p < .001), nothing else giving its SE.
	PFromStars bool
	// Text is the string as given, trimmed.
	Text string
}

// OnlyEstimate reports whether nothing but the estimate was given: no
// interval, SE, statistic, p or stars. A correlation needs only its n.
func (r Reported) OnlyEstimate() bool {
	return !r.CI.Present() && !r.SE.Present() && !r.P.Present() && !r.Stat.Present()
}

// ParseReported reads an estimate with what gives its standard error, as
// papers print it:
//
//	0.41 [0.30, 0.52]        0.41 (0.30 to 0.52)      0.41 (95% CI 0.30–0.52)
//	0.41, SE 0.05            0.41 (SE = 0.05)         0.41, p = .003
//	0.41 (p < .001)          0.41 [0.30, 0.52], p = .001
//	−0,41 (−0,52; −0,30)     1.85 (1.20 to 2.85)      (a ratio, on its own scale)
//	b = 0.41, SE = 0.12      β = .34, p < .01         OR 1.80 (1.21–2.68)
//	0.41, t(120) = 3.2       0.41***                  r = .45
//
// A leading label (b, B, β, beta, r, OR, RR, HR, MD, followed by "=" or a
// space) names the measure (Measure). A t or z statistic may be given with
// its df in brackets. Trailing stars with nothing else are read as the p
// bound they state (extract.StarsPBound: "0.41***" is p < .001). An
// estimate alone is accepted (OnlyEstimate): a correlation's SE comes from
// its n, and CompareReported refuses it for other measures.
//
// The estimate comes first; after it, in brackets or after a comma or
// semicolon, an interval (anything extract.ParseIntervalLevel reads), an
// SE ("SE 0.05", "SE = 0.05", "SE: 0.05"), or a p (anything extract.ParseP
// reads, starting with p). The numbers are read by extract.ParseNumber,
// ParseInterval and ParseP, so rounding is tracked as for a workbook.
// "±" is refused, since papers use it for an SE, an SD and a margin of
// error alike.
//
// It fails with an error wrapping ErrReported (and the extract parse error,
// where there is one) that says what was wrong: no estimate, only an
// estimate, an interval or an SE given twice, a part that is none of these.
func ParseReported(text string) (Reported, error) {
	s := strings.TrimSpace(text)
	r := Reported{Text: s, Level: extract.DefaultCILevel}
	fail := func(format string, a ...any) (Reported, error) {
		return Reported{}, fmt.Errorf("%q: %s: %w", s, fmt.Sprintf(format, a...), ErrReported)
	}
	if s == "" {
		return fail("empty; give an estimate with its interval, SE or p, e.g. \"0.41 [0.30, 0.52]\"")
	}
	if strings.ContainsRune(s, '±') {
		return fail("\"±\" may be an SE, an SD or a margin of error; write \"0.41, SE 0.05\" or the interval \"0.41 [0.31, 0.51]\"")
	}
	body := s
	if m, rest, ok := leadingLabel(s); ok {
		r.Measure, body = m, rest
	}
	estText := body[:estimateEnd(body)]
	rest := body[len(estText):]
	est, err := extract.ParseNumber(estText)
	if err != nil {
		return Reported{}, fmt.Errorf("%q: the estimate: %w (%w)", s, err, ErrReported)
	}
	if !est.Present() {
		return fail("no estimate before the interval, SE or p")
	}
	r.Estimate = est
	if err := r.readPart(rest); err != nil {
		return Reported{}, fmt.Errorf("%q: %w", s, err)
	}
	if r.OnlyEstimate() {
		if bound, ok := extract.StarsPBound(int(est.Stars)); ok {
			r.P = extract.Printed{Value: bound, Bound: extract.Below, Decimals: -1, Text: "p < " + strconv.FormatFloat(bound, 'g', -1, 64)}
			r.PFromStars = true
		}
	}
	return r, nil
}

// labelMeasures maps the labels papers put before an estimate to measures.
var labelMeasures = map[string]string{
	"b": extract.MeasureB, "β": extract.MeasureBeta, "beta": extract.MeasureBeta, "r": extract.MeasureR,
	"or": extract.MeasureOR, "rr": extract.MeasureRR, "hr": extract.MeasureHR, "md": extract.MeasureMD,
}

// leadingLabel strips a label such as "b =", "β =" or "OR " from the start
// of s and returns the measure it names ("B" is the unstandardized b, as
// in APA tables). The label must be followed by "=", ":" or a space, then
// the estimate.
func leadingLabel(s string) (measure, rest string, ok bool) {
	i := strings.IndexFunc(s, func(c rune) bool { return !unicode.IsLetter(c) })
	if i <= 0 {
		return "", s, false
	}
	m, known := labelMeasures[strings.ToLower(s[:i])]
	if !known {
		return "", s, false
	}
	after := s[i:]
	trimmed := strings.TrimLeftFunc(after, unicode.IsSpace)
	if strings.HasPrefix(trimmed, "=") || strings.HasPrefix(trimmed, ":") {
		trimmed = strings.TrimLeftFunc(trimmed[1:], unicode.IsSpace)
	} else if len(trimmed) == len(after) {
		return "", s, false // "b0.41": no separator
	}
	return m, trimmed, trimmed != ""
}

// statPart matches a printed t or z statistic with an optional df in
// brackets: "t(120) = 3.2", "t = −2.10", "z = 1.96", "t[48] = 2.3".
var statPart = regexp.MustCompile(`^(?i:([tz]))\s*(?:[(\[]\s*([^)\]]+?)\s*[)\]])?\s*=\s*(\S+)$`)

// estimateEnd finds where the leading estimate ends: at a space, a
// bracket, a semicolon, or a comma that is not a decimal comma (one not
// followed by a digit).
func estimateEnd(s string) int {
	for i, r := range s {
		switch {
		case unicode.IsSpace(r) || strings.ContainsRune("([{;", r):
			return i
		case r == ',':
			next, _ := utf8.DecodeRuneInString(s[i+1:])
			if !unicode.IsDigit(next) {
				return i
			}
		}
	}
	return len(s)
}

// readPart reads what follows the estimate: one part, or several separated
// at the top level by commas, semicolons or brackets.
func (r *Reported) readPart(t string) error {
	t = strings.TrimFunc(t, func(c rune) bool { return unicode.IsSpace(c) || c == ',' || c == ';' })
	if t == "" {
		return nil
	}
	if inner, ok := enclosed(t); ok {
		return r.readPart(inner)
	}
	if m := statPart.FindStringSubmatch(t); m != nil {
		return r.readStat(m[1], m[2], m[3])
	}
	iv, level, ivErr := extract.ParseIntervalLevel(t)
	if ivErr == nil {
		if r.CI.Present() {
			return fmt.Errorf("two intervals are given: %w", ErrReported)
		}
		r.CI = iv
		if level > 0 {
			r.Level = level
		}
		return nil
	}
	if parts := splitTopLevel(t); len(parts) > 1 && anyLabelled(parts) {
		for _, p := range parts {
			if err := r.readPart(p); err != nil {
				return err
			}
		}
		return nil
	}
	if v, ok := afterKeyword(t, "se"); ok {
		if r.SE.Present() {
			return fmt.Errorf("the SE is given twice: %w", ErrReported)
		}
		se, err := extract.ParseNumber(v)
		if err != nil {
			return fmt.Errorf("the SE: %w (%w)", err, ErrReported)
		}
		if !se.Present() || se.Value <= 0 {
			return fmt.Errorf("the SE %q must be a positive number: %w", v, ErrReported)
		}
		r.SE = se
		return nil
	}
	if isPPart(t) {
		if r.P.Present() {
			return fmt.Errorf("the p-value is given twice: %w", ErrReported)
		}
		p, err := extract.ParseP(t)
		if err != nil {
			return fmt.Errorf("the p-value: %w (%w)", err, ErrReported)
		}
		r.P = p
		return nil
	}
	return fmt.Errorf("%q is not an interval, an SE (\"SE 0.05\") or a p (\"p = .03\"): %w (%w)", t, ivErr, ErrReported)
}

// readStat reads a t or z statistic and its df.
func (r *Reported) readStat(kind, df, value string) error {
	if r.Stat.Present() {
		return fmt.Errorf("the statistic is given twice: %w", ErrReported)
	}
	st, err := extract.ParseNumber(value)
	if err != nil {
		return fmt.Errorf("the %s statistic: %w (%w)", kind, err, ErrReported)
	}
	r.Stat = st
	if df == "" {
		return nil
	}
	if strings.EqualFold(kind, "z") {
		return fmt.Errorf("a z statistic has no df (%q): %w", df, ErrReported)
	}
	d, err := extract.ParseCount(df)
	if err != nil || !d.IsExact() || d.Value <= 0 {
		return fmt.Errorf("the df %q of the t statistic must be a positive number: %w", df, ErrReported)
	}
	r.DF = d
	return nil
}

// enclosed reports whether t is one bracketed group, and returns its inside.
func enclosed(t string) (string, bool) {
	if t == "" || !strings.ContainsRune("([{", rune(t[0])) {
		return "", false
	}
	depth := 0
	for i, c := range t {
		switch c {
		case '(', '[', '{':
			depth++
		case ')', ']', '}':
			depth--
			if depth == 0 {
				return t[1:i], i == len(t)-1
			}
		}
	}
	return "", false
}

// splitTopLevel cuts t at commas and semicolons outside brackets and before
// a bracket that opens after other text. A comma between digits is a
// decimal comma, not a separator.
func splitTopLevel(t string) []string {
	var parts []string
	depth, start := 0, 0
	cut := func(i int) {
		if p := strings.TrimSpace(t[start:i]); p != "" {
			parts = append(parts, p)
		}
		start = i
	}
	attached := false // the open bracket group belongs to the text before it
	for i, c := range t {
		switch {
		case c == '(' || c == '[' || c == '{':
			// A bracket right after a letter belongs to it, as the df of
			// "t(120)"; after anything else it opens a part.
			if depth == 0 {
				prev, _ := utf8.DecodeLastRuneInString(t[:i])
				if attached = unicode.IsLetter(prev); !attached {
					cut(i)
				}
			}
			depth++
		case c == ')' || c == ']' || c == '}':
			depth--
			if depth == 0 && !attached {
				cut(i + 1)
			}
		case depth == 0 && (c == ';' || c == ',' && !decimalComma(t, i)):
			cut(i)
			start = i + 1
		}
	}
	cut(len(t))
	return parts
}

// anyLabelled reports whether a part is bracketed or names an SE or a p,
// so that the text is several parts rather than one bad interval.
func anyLabelled(parts []string) bool {
	for _, p := range parts {
		if _, ok := afterKeyword(p, "se"); ok || isPPart(p) || statPart.MatchString(p) || strings.ContainsRune("([{", rune(p[0])) {
			return true
		}
	}
	return false
}

func decimalComma(t string, i int) bool {
	prev, _ := utf8.DecodeLastRuneInString(t[:i])
	next, _ := utf8.DecodeRuneInString(t[i+1:])
	return unicode.IsDigit(prev) && unicode.IsDigit(next)
}

// afterKeyword returns the text after a leading keyword (case-insensitive)
// followed by a space, "=" or ":".
func afterKeyword(t, kw string) (string, bool) {
	if len(t) <= len(kw) || !strings.EqualFold(t[:len(kw)], kw) {
		return "", false
	}
	rest := t[len(kw):]
	r, _ := utf8.DecodeRuneInString(rest)
	if !unicode.IsSpace(r) && r != '=' && r != ':' {
		return "", false
	}
	return strings.TrimLeftFunc(strings.TrimLeft(strings.TrimSpace(rest), "=:"), unicode.IsSpace), true
}

// isPPart reports whether t is a p-value statement ("p = .03", "p<.001", "ns").
func isPPart(t string) bool {
	if strings.EqualFold(strings.ReplaceAll(strings.ReplaceAll(t, ".", ""), " ", ""), "ns") {
		return true
	}
	if len(t) < 2 || (t[0] != 'p' && t[0] != 'P') {
		return false
	}
	r, _ := utf8.DecodeRuneInString(strings.TrimLeftFunc(t[1:], unicode.IsSpace))
	return strings.ContainsRune("=<>≤≥⩽⩾", r)
}
