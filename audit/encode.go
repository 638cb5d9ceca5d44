package audit

import (
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// The CSV and JSON reports of a claim are built by appending to a byte
// slice, with no intermediate strings: a streamed audit of a million claims
// spends most of its time here otherwise. The bytes are exactly those
// encoding/csv and encoding/json write (the tests compare them), so a
// streamed report and a whole-file one are the same file.

// appendCSVField appends one CSV field, quoted when encoding/csv would
// quote it: when it holds a comma, quote, CR or LF, starts with a space, or
// is `\.`.
func appendCSVField(dst []byte, s string) []byte {
	if !csvNeedsQuotes(s) {
		return append(dst, s...)
	}
	return append(appendCSVQuoted(append(dst, '"'), s), '"')
}

// appendCSVQuoted appends s with its quotes doubled.
func appendCSVQuoted(dst []byte, s string) []byte {
	for {
		i := strings.IndexByte(s, '"')
		if i < 0 {
			return append(dst, s...)
		}
		dst = append(append(dst, s[:i+1]...), '"')
		s = s[i+1:]
	}
}

// csvNeedsQuotes reports whether encoding/csv would quote s. A cell that
// starts with a printable ASCII byte other than the backslash, as most do,
// can neither lead with white space nor be `\.`, and only its bytes are
// looked at.
func csvNeedsQuotes(s string) bool {
	if s != "" && s[0] > ' ' && s[0] < utf8.RuneSelf && s[0] != '\\' {
		return hasCSVSpecial(s)
	}
	return leadsWithSpace(s) || s == `\.` || hasCSVSpecial(s)
}

// leadsWithSpace reports whether s starts with white space as
// unicode.IsSpace has it, which encoding/csv quotes: for an ASCII byte the
// space and \t through \r.
func leadsWithSpace(s string) bool {
	if s == "" {
		return false
	}
	if c := s[0]; c < utf8.RuneSelf {
		return c == ' ' || (c >= '\t' && c <= '\r')
	}
	r, _ := utf8.DecodeRuneInString(s)
	return unicode.IsSpace(r)
}

// hasCSVSpecial reports whether s holds a comma, quote, CR or LF. In a long
// cell each is looked for with IndexByte, which is vectorized: the notes
// cells are long.
func hasCSVSpecial(s string) bool {
	if len(s) < 32 {
		// Short cells (labels, methods, outcomes) are quicker to scan once:
		// all four bytes sort at or below the comma.
		for i := 0; i < len(s); i++ {
			if c := s[i]; c <= ',' && (c == ',' || c == '"' || c == '\n' || c == '\r') {
				return true
			}
		}
		return false
	}
	return strings.IndexByte(s, ',') >= 0 || strings.IndexByte(s, '"') >= 0 ||
		strings.IndexByte(s, '\n') >= 0 || strings.IndexByte(s, '\r') >= 0
}

// appendSafeText appends a text cell as safeText guards it and encoding/csv
// quotes it. Only a guarded cell, which is rare, costs the concatenation.
func appendSafeText(dst []byte, s string) []byte {
	return appendCSVField(dst, safeText(s))
}

// appendCSVNumber appends a number with ten significant digits, as
// strconv's 'g' format writes them; nothing when it is not known.
func appendCSVNumber(dst []byte, n Number) []byte {
	if !n.Known() {
		return dst
	}
	return strconv.AppendFloat(dst, float64(n), 'g', 10, 64)
}

// appendCSVClaim appends one claim's CSV row and its line end, with the
// claims row's own unknown columns named in extra after the result columns.
func appendCSVClaim(dst []byte, c *ClaimResult, extra []string) []byte {
	op, oip := nan, nan
	if c.Overlap != nil {
		op, oip = c.Overlap.Proportion, c.Overlap.ImpliedP
	}
	dst = strconv.AppendInt(dst, int64(c.Row), 10)
	text := func(s string) { dst = appendSafeText(append(dst, ','), s) }
	plain := func(s string) { dst = appendCSVField(append(dst, ','), s) }
	number := func(n Number) { dst = appendCSVNumber(append(dst, ','), n) }
	text(c.Study)
	text(c.Claim)
	text(c.First.Label)
	number(c.First.Estimate)
	number(c.First.SE)
	text(c.First.SEFrom)
	text(c.Second.Label)
	number(c.Second.Estimate)
	number(c.Second.SE)
	text(c.Second.SEFrom)
	plain(c.Relation)
	plain(c.Method)
	plain(c.Scale)
	number(c.Difference)
	number(c.DifferenceSE)
	number(c.DifferenceCI[0])
	number(c.DifferenceCI[1])
	number(c.Statistic)
	number(c.DF)
	number(c.P)
	number(c.PRange[0])
	number(c.PRange[1])
	dst = append(append(dst, ','), formatAlpha(c.Alpha)...)
	plain(c.Basis)
	plain(c.Published)
	plain(c.Recomputed)
	plain(c.Outcome)
	number(op)
	number(oip)
	dst = append(dst, ',')
	dst = appendNotesCell(dst, c.Notes)
	for _, name := range extra {
		v := ""
		for i, n := range c.ExtraNames {
			if n == name {
				v = c.ExtraValues[i]
			}
		}
		text(v)
	}
	return append(dst, '\n')
}

// appendNotesCell appends the notes joined by " | " as one text cell, as
// safeText and encoding/csv would write the joined string, without building
// it.
func appendNotesCell(dst []byte, notes []string) []byte {
	const sep = " | "
	if len(notes) == 1 {
		return appendSafeText(dst, notes[0])
	}
	if len(notes) == 0 {
		return dst
	}
	head := notes[0]
	if head == "" {
		head = sep
	}
	guard := isGuarded(head[0])
	quote := false
	for _, n := range notes {
		quote = quote || hasCSVSpecial(n)
	}
	if !guard {
		quote = quote || leadsWithSpace(head)
	}
	if quote {
		dst = append(dst, '"')
	}
	if guard {
		dst = append(dst, '\'')
	}
	for i, n := range notes {
		if i > 0 {
			dst = append(dst, sep...)
		}
		if quote {
			dst = appendCSVQuoted(dst, n)
		} else {
			dst = append(dst, n...)
		}
	}
	if quote {
		dst = append(dst, '"')
	}
	return dst
}

// isGuarded reports whether a text cell starting with b would be evaluated
// by a spreadsheet, and so needs safeText's apostrophe.
func isGuarded(b byte) bool {
	switch b {
	case '=', '+', '-', '@', '\t', '\r':
		return true
	}
	return false
}

// appendJSONString appends s as a JSON string the way encoding/json writes
// it with HTML escaping off: quote, backslash and control characters
// escaped, invalid UTF-8 replaced by U+FFFD, U+2028 and U+2029 escaped.
func appendJSONString(dst []byte, s string) []byte {
	const hex = "0123456789abcdef"
	dst = append(dst, '"')
	start := 0
	for i := 0; i < len(s); {
		b := s[i]
		if b < utf8.RuneSelf {
			if b >= 0x20 && b != '"' && b != '\\' {
				i++
				continue
			}
			dst = append(dst, s[start:i]...)
			switch b {
			case '\\', '"':
				dst = append(dst, '\\', b)
			case '\b':
				dst = append(dst, '\\', 'b')
			case '\f':
				dst = append(dst, '\\', 'f')
			case '\n':
				dst = append(dst, '\\', 'n')
			case '\r':
				dst = append(dst, '\\', 'r')
			case '\t':
				dst = append(dst, '\\', 't')
			default:
				dst = append(dst, '\\', 'u', '0', '0', hex[b>>4], hex[b&0xF])
			}
			i++
			start = i
			continue
		}
		c, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case c == utf8.RuneError && size == 1:
			dst = append(dst, s[start:i]...)
			dst = append(dst, `\ufffd`...)
		case c == '\u2028' || c == '\u2029':
			dst = append(dst, s[start:i]...)
			dst = append(dst, '\\', 'u', '2', '0', '2', hex[c&0xF])
		default:
			i += size
			continue
		}
		i += size
		start = i
	}
	dst = append(dst, s[start:]...)
	return append(dst, '"')
}

// appendJSONNumber appends a Number as its MarshalJSON does.
func appendJSONNumber(dst []byte, n Number) []byte {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return append(dst, "null"...)
	}
	return strconv.AppendFloat(dst, f, 'g', -1, 64)
}

// jsonObject appends the members of one indented JSON object, as
// json.MarshalIndent lays them out.
type jsonObject struct {
	dst    []byte
	indent string // of the object's members
	n      int
}

// elem starts the next member or array element on its own line.
func (o *jsonObject) elem() {
	if o.n > 0 {
		o.dst = append(o.dst, ',')
	}
	o.n++
	o.dst = append(append(o.dst, '\n'), o.indent...)
}

func (o *jsonObject) key(k string) {
	o.elem()
	o.dst = append(o.dst, '"')
	o.dst = append(o.dst, k...)
	o.dst = append(o.dst, `": `...)
}

func (o *jsonObject) str(k, v string)        { o.key(k); o.dst = appendJSONString(o.dst, v) }
func (o *jsonObject) num(k string, v Number) { o.key(k); o.dst = appendJSONNumber(o.dst, v) }

// numbers appends an array of numbers, one per line.
func (o *jsonObject) numbers(k string, vs ...Number) {
	arr := o.open(k, '[')
	for _, v := range vs {
		arr.elem()
		arr.dst = appendJSONNumber(arr.dst, v)
	}
	o.close(arr, ']')
}

// open starts a nested object or array member; close ends it.
func (o *jsonObject) open(k string, brace byte) *jsonObject {
	o.key(k)
	o.dst = append(o.dst, brace)
	return &jsonObject{dst: o.dst, indent: deeper(o.indent)}
}

// deeper is indent two spaces deeper, without allocating for the depths a
// claim reaches.
func deeper(indent string) string {
	const spaces = "                                "
	if n := len(indent) + 2; n <= len(spaces) && indent == spaces[:len(indent)] {
		return spaces[:n]
	}
	return indent + "  "
}

func (o *jsonObject) close(inner *jsonObject, brace byte) {
	o.dst = inner.dst
	if inner.n > 0 {
		o.dst = append(append(o.dst, '\n'), o.indent...)
	}
	o.dst = append(o.dst, brace)
}

// appendClaimJSON appends one claim as json.MarshalIndent(c, prefix, "  ")
// writes it after prefix, with HTML escaping off (as WriteJSON writes).
func appendClaimJSON(dst []byte, c *ClaimResult, prefix string) []byte {
	dst = append(dst, '{')
	o := &jsonObject{dst: dst, indent: deeper(prefix)}
	o.str("study", c.Study)
	o.str("claim", c.Claim)
	o.key("row")
	o.dst = strconv.AppendInt(o.dst, int64(c.Row), 10)
	for _, side := range []struct {
		k string
		s *Side
	}{{"first", &c.First}, {"second", &c.Second}} {
		in := o.open(side.k, '{')
		in.str("label", side.s.Label)
		in.num("estimate", side.s.Estimate)
		in.num("se", side.s.SE)
		in.str("se_from", side.s.SEFrom)
		o.close(in, '}')
	}
	o.str("relation", c.Relation)
	o.str("method", c.Method)
	o.num("difference", c.Difference)
	o.num("difference_se", c.DifferenceSE)
	o.numbers("difference_ci", c.DifferenceCI[0], c.DifferenceCI[1])
	o.num("statistic", c.Statistic)
	o.num("df", c.DF)
	o.num("p", c.P)
	o.numbers("p_range", c.PRange[0], c.PRange[1])
	o.str("published", c.Published)
	o.str("recomputed", c.Recomputed)
	o.str("outcome", c.Outcome)
	notes := o.open("notes", '[')
	for _, n := range c.Notes {
		notes.elem()
		notes.dst = appendJSONString(notes.dst, n)
	}
	o.close(notes, ']')
	if c.Overlap == nil {
		o.key("overlap")
		o.dst = append(o.dst, "null"...)
	} else {
		in := o.open("overlap", '{')
		in.num("proportion", c.Overlap.Proportion)
		in.num("implied_p", c.Overlap.ImpliedP)
		o.close(in, '}')
	}
	if len(c.Alternatives) > 0 {
		arr := o.open("alternatives", '[')
		for i := range c.Alternatives {
			al := &c.Alternatives[i]
			arr.elem()
			arr.dst = append(arr.dst, '{')
			in := &jsonObject{dst: arr.dst, indent: deeper(arr.indent)}
			in.str("method", al.Method)
			in.num("statistic", al.Statistic)
			in.num("p", al.P)
			arr.close(in, '}')
		}
		o.close(arr, ']')
	}
	if ap := c.AdjustedP; ap != nil {
		in := o.open("p_adjusted", '{')
		in.num("bh", ap.BH)
		in.num("holm", ap.Holm)
		o.close(in, '}')
	}
	dst = o.dst
	if o.n > 0 {
		dst = append(append(dst, '\n'), prefix...)
	}
	return append(dst, '}')
}
