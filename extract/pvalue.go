package extract

import (
	"errors"
	"strings"
)

// ParseP reads a p-value as printed. It takes everything ParseNumber takes
// and, in addition,
//
//	p = .03   p=0.03   P = .03   (Exact)
//	p < .001   P<0.001   <.001   p ≤ .05   p <= .05   (Below: p is below Value)
//	p > .05   > .05   p ≥ .10   (Above: p is above Value)
//	ns   n.s.   NS   n.s   (NotSignificant: above the paper's alpha)
//
// A p outside [0, 1], "p < 0" and "p > 1" fail with a *ParseError wrapping
// ErrMalformedP that says why. "p = .000", as some programs print, is
// accepted as Exact 0 with 3 decimals: it stands for p < .0005.
//
// References:
//
//	[1] American Psychological Association (2020). Publication Manual of
//	    the American Psychological Association, 7th ed., §6.36: exact p to
//	    two or three decimals, "p < .001" below that (from memory).
//	[2] Altman DG, Bland JM (2011). How to obtain the confidence interval
//	    from a P value. BMJ 343:d2090 (prints "P=0.032").
func ParseP(text string) (Printed, error) {
	s := trimSpace(text)
	if s == "" {
		return Printed{Bound: Absent}, nil
	}
	if isNotSignificant(s) {
		return Printed{Bound: NotSignificant, Decimals: -1, Text: s}, nil
	}
	rest := s
	hasP := false
	if rest[0] == 'p' || rest[0] == 'P' {
		hasP = true
		rest = strings.TrimLeftFunc(rest[1:], isSpace)
	}
	bound := Exact
	op := ""
	for _, o := range pOperators {
		if strings.HasPrefix(rest, o.text) {
			op, bound = o.text, o.bound
			rest = strings.TrimLeftFunc(rest[len(o.text):], isSpace)
			break
		}
	}
	if hasP && op == "" {
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "expected <, = or > after p"}
	}
	if rest == "" {
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "no number"}
	}
	p, err := parsePrinted(rest, numberGeneral, ErrMalformedP)
	if err != nil {
		var pe *ParseError
		if errors.As(err, &pe) {
			pe.Text = s
		}
		return Printed{}, err
	}
	p.Bound, p.Text = bound, s
	switch {
	case p.Value < 0:
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "a p-value cannot be negative"}
	case p.Value > 1:
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "a p-value cannot exceed 1"}
	case bound == Below && p.Value == 0:
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "no p-value is below 0"}
	case bound == Above && p.Value == 1:
		return Printed{}, &ParseError{Text: s, Kind: ErrMalformedP, Reason: "no p-value is above 1"}
	}
	return p, nil
}

// pOperators are the relations a printed p may carry, longest first.
var pOperators = []struct {
	text  string
	bound Bound
}{
	{"<=", Below}, {"≤", Below}, {"⩽", Below}, {"<", Below},
	{">=", Above}, {"≥", Above}, {"⩾", Above}, {">", Above},
	{"=", Exact},
}

// isNotSignificant recognizes "ns", "n.s.", "NS", "n.s", "n. s.".
func isNotSignificant(s string) bool {
	if len(s) > 8 || (s[0] != 'n' && s[0] != 'N') {
		return false
	}
	var b strings.Builder
	for _, r := range s {
		if r == '.' || isSpace(r) {
			continue
		}
		b.WriteRune(r)
	}
	return strings.EqualFold(b.String(), "ns")
}
