package report

import (
	"regexp"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Text from the input (study, claim and topic names, labels, notes that
// quote them, problems, the input's name) is shown as written, but can
// neither drive the terminal nor change the structure of a Markdown
// document: EscapeControls for the terminal, mdText for Markdown.

// hiddenRune reports whether r would act on a terminal or break a line
// rather than show: a control character (C0, DEL, C1; ESC among them), a
// bidirectional control, which reorders what a terminal shows, or a line
// or paragraph separator.
func hiddenRune(r rune) bool {
	return unicode.IsControl(r) || unicode.Is(unicode.Bidi_Control, r) || r == '\u2028' || r == '\u2029'
}

// EscapeControls shows the hidden runes of s (hiddenRune), and each byte
// that is not UTF-8 (0x9b is a CSI to an 8-bit terminal), as Go quotes
// them: ESC as \x1b, a tab as \t, a line end as \n, U+202E as \u202e.
// Every terminal writer passes text from the input through it, and so
// does the command's error line.
func EscapeControls(s string) string {
	i := firstHidden(s)
	if i < 0 {
		return s
	}
	var b strings.Builder
	b.WriteString(s[:i])
	for i < len(s) {
		r, size := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && size == 1) || hiddenRune(r) {
			q := strconv.Quote(s[i : i+size])
			b.WriteString(q[1 : len(q)-1])
		} else {
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}

// firstHidden returns the index of the first hidden rune of s, or of its
// first byte that is not UTF-8; -1 when there is none. Printable ASCII,
// nearly all of any report, is passed over a byte at a time.
func firstHidden(s string) int {
	for i := 0; i < len(s); {
		if c := s[i]; c >= 0x20 && c < 0x7f {
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && size == 1) || hiddenRune(r) {
			return i
		}
		i += size
	}
	return -1
}

// mdEscaper escapes the characters Markdown would read as markup in text
// taken from the input: emphasis, code spans and fences, links and images,
// HTML and entities, headings, table pipes, strikethrough.
var mdEscaper = strings.NewReplacer(`\`, `\\`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "&", "&amp;",
	"[", `\[`, "]", `\]`, "#", `\#`, "|", `\|`, "~", `\~`)

// mdBlockStart matches a list marker at the start of a text: placed after
// a list item's "- ", it would open a list inside the item.
var mdBlockStart = regexp.MustCompile(`^(?:[-+]|[0-9]{1,9}[.)])`)

// mdText writes text from the input into a Markdown document, on one line
// whatever it holds: its markup is escaped (mdEscaper), a line end or
// other control character is shown escaped (EscapeControls), a list
// marker at its start is escaped, and the white space around it is
// dropped, so that four spaces cannot open a code block. It serves in
// running text, list items, headings and table cells alike.
func mdText(s string) string {
	s = EscapeControls(mdEscaper.Replace(strings.TrimSpace(s)))
	if m := mdBlockStart.FindStringIndex(s); m != nil {
		s = s[:m[1]-1] + `\` + s[m[1]-1:]
	}
	return s
}
