package report

import (
	"bytes"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/pool"

	"github.com/yuin/goldmark"
	gast "github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	east "github.com/yuin/goldmark/extension/ast"
	"github.com/yuin/goldmark/text"
)

// hostileTexts are cells an input can hold that would drive a terminal or
// change a Markdown document's structure if written as they are.
var hostileTexts = []string{
	"\x1b[31mred\x1b[0m",               // terminal colour
	"\x1b]0;title\x07",                 // terminal title (OSC)
	"a\tb",                             // a tab: moves columns
	"line\n# heading",                  // a new line that opens a heading
	"x\n---",                           // a setext underline / thematic break
	"a | b",                            // a table pipe
	"# heading",                        // an ATX heading
	"- item",                           // a list item
	"1. first",                         // an ordered list item
	"    indented code",                // an indented code block
	"```\ncode",                        // a fence
	"~~~",                              // a tilde fence
	"<script>alert(1)</script>",        // HTML
	"[click](javascript:alert(1))",     // a link with a script target
	"<javascript:alert(1)>",            // an autolink
	"![img](http://example.invalid/x)", // an image
	"*emph* _emph_ **strong** ~~del~~", // emphasis and strikethrough
	"`code`",                           // a code span
	"&lt;b&gt; &amp; &#x1b;",           // entities
	"back\\slash\\",                    // backslashes
	"\u202eevil\u202c",                 // a bidirectional override
	"nel\u0085ls\u2028ps\u2029",        // C1 and Unicode line ends
	"bad \x9b utf-8",                   // a byte that is not UTF-8 (an 8-bit CSI)
	"> quote",                          // a block quote
	"| a | b |\n|---|---|\n| c | d |",  // a whole table
	"[ ] task",                         // a task list item
	"<!-- comment -->",                 // an HTML comment
	"text  ",                           // trailing spaces (a hard line break)
	"",                                 // nothing
}

func TestEscapeControls(t *testing.T) {
	tests := []struct{ in, want string }{
		{"plain text", "plain text"},
		{"Müller, 2019 — 東京", "Müller, 2019 — 東京"},
		{"\x1b[31mred", `\x1b[31mred`},
		{"a\tb\nc\rd", `a\tb\nc\rd`},
		{"\x00\x7f", `\x00\x7f`},
		{"\u0085", `\u0085`},
		{"\u202eevil", `\u202eevil`},
		{"\u2028\u2029", `\u2028\u2029`},
		{"bad \x9b byte", `bad \x9b byte`},
		{"\ufffd kept", "\ufffd kept"},
	}
	for _, tt := range tests {
		if got := EscapeControls(tt.in); got != tt.want {
			t.Errorf("EscapeControls(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestMDText(t *testing.T) {
	tests := []struct{ in, want string }{
		{"Lee 2019", "Lee 2019"},
		{"S*1", `S\*1`},
		{"c|1\nsecond line", `c\|1\nsecond line`},
		{"# heading", `\# heading`},
		{"- item", `\- item`},
		{"+ item", `\+ item`},
		{"12. item", `12\. item`},
		{"3) item", `3\) item`},
		{"    code", "code"},
		{"a & b", "a &amp; b"},
		{"<b>", "&lt;b&gt;"},
		{"[x](javascript:alert(1))", `\[x\](javascript:alert(1))`},
		{"~~del~~", `\~\~del\~\~`},
		{"back\\", `back\\`},
		{"\x1b[31m", `\x1b\[31m`},
	}
	for _, tt := range tests {
		if got := mdText(tt.in); got != tt.want {
			t.Errorf("mdText(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// hostileResults is a study of three claims of text and three of "plain",
// each three with the text as names, labels, topic and note, and with the
// problem and input name it gives the footer and header; mask, when set,
// stands text in for another first.
func hostileResults(text string, mask func(string) string) (Header, audit.StudyResult, Footer) {
	if mask != nil {
		text = mask(text)
	}
	var res audit.StudyResult
	var f Footer
	for i, s := range []string{text, "plain"} {
		// Three claims per text, one topic, so that the pool pools them.
		for k := range 3 {
			row := 3*i + k + 2
			c := audit.ClaimResult{Row: row, Index: row - 2, Study: s, Claim: s, Topic: s, Measure: extract.MeasureB,
				Relation: audit.Independent, Method: "independent-z", Published: extract.PublishedDiffer,
				Recomputed: extract.PublishedDiffer, Outcome: audit.Consistent, Alpha: 0.05, Basis: extract.BasisTest,
				Difference: 0.2, DifferenceSE: 0.05, DifferenceCI: [2]audit.Number{0.1, 0.3}, P: 0.001, Statistic: 4,
				PoolScale: extract.ScaleAsPrinted, PoolEstimate: audit.Number(0.1 * float64(k+1)), PoolSE: 0.05,
				Notes: []string{s, "The SE of " + s + " was taken from its interval."}}
			c.First = audit.Side{Label: s, Estimate: 0.4, SE: 0.03, SEFrom: "se"}
			c.Second = audit.Side{Label: s + "2", Estimate: 0.2, SE: 0.04, SEFrom: "se"}
			res.Claims = append(res.Claims, c)
		}
		f.Problems = append(f.Problems, audit.Problem{Sheet: "claims", Row: i + 2, Column: s, Message: "cannot read " + s})
	}
	res.Study = res.Claims[0].Study
	f.Summary.Add(res.Claims)
	return Header{Source: text + ".xlsx", Alpha: 0.05, Adjust: audit.AdjustNone}, res, f
}

// writeResults writes one study's results in format.
func writeResults(t testing.TB, format string, h Header, res audit.StudyResult, f Footer) string {
	t.Helper()
	var buf bytes.Buffer
	wr, err := New(format, &buf)
	if err != nil {
		t.Fatal(err)
	}
	if err := wr.Begin(h); err != nil {
		t.Fatal(err)
	}
	if err := wr.Study(res); err != nil {
		t.Fatal(err)
	}
	if err := wr.End(f); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// writePool pools the claims of res by topic and writes the report with
// the Markdown or the terminal writer.
func writePool(t testing.TB, format string, h Header, res audit.StudyResult) string {
	t.Helper()
	rep, err := pool.Run(&audit.Report{Claims: res.Claims, Source: h.Source}, pool.Options{Method: pool.DL})
	if err != nil {
		t.Fatal(err)
	}
	rep.Plots = []string{h.Source + ".svg"}
	doc := PoolDocument{Report: rep, PlotsNote: "No forest plots were written: the report goes to " + h.Source + "."}
	var buf bytes.Buffer
	write := WritePoolMarkdown
	if format == "table" {
		write = WritePoolTable
	}
	if err := write(&buf, doc); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// blandText stands in for a text with one of the same length in runes
// that holds no markup and no control character: white space becomes a
// space (so that what trims it trims both alike), every other rune x.
func blandText(s string) string {
	return strings.Map(func(r rune) rune {
		if unicode.IsSpace(r) {
			return ' '
		}
		return 'x'
	}, strings.ToValidUTF8(s, "x"))
}

// badRune returns the first rune of a line that a terminal would act on
// or that is not UTF-8, and whether there is one.
func badRune(line string) (string, bool) {
	for i, r := range line {
		if r == utf8.RuneError {
			if _, size := utf8.DecodeRuneInString(line[i:]); size == 1 {
				return line[i : i+1], true
			}
		}
		if hiddenRune(r) {
			return string(r), true
		}
	}
	return "", false
}

// checkVisible fails for a line of out holding a control character or a
// byte that is not UTF-8.
func checkVisible(t testing.TB, what, out string) {
	t.Helper()
	for n, line := range strings.Split(out, "\n") {
		if r, bad := badRune(line); bad {
			t.Errorf("%s line %d holds %q unescaped: %q", what, n+1, r, line)
		}
	}
}

// mdShape parses a Markdown document with GitHub's tables and
// strikethrough (goldmark) and describes its structure: each block and
// inline element but text, in document order, a table as its cells per
// row.
func mdShape(doc string) string {
	md := goldmark.New(goldmark.WithExtensions(extension.Table, extension.Strikethrough))
	src := []byte(doc)
	root := md.Parser().Parse(text.NewReader(src))
	var b strings.Builder
	gast.Walk(root, func(n gast.Node, entering bool) (gast.WalkStatus, error) {
		if !entering {
			return gast.WalkContinue, nil
		}
		switch n.Kind() {
		case gast.KindText, gast.KindString:
			return gast.WalkContinue, nil
		case east.KindTableRow, east.KindTableHeader:
			b.WriteString(n.Kind().String())
			b.WriteString("(")
			b.WriteString(strings.Repeat("|", n.ChildCount()))
			b.WriteString(") ")
			return gast.WalkSkipChildren, nil
		case gast.KindHeading:
			b.WriteString(strings.Repeat("#", n.(*gast.Heading).Level))
		}
		b.WriteString(n.Kind().String())
		b.WriteString(" ")
		return gast.WalkContinue, nil
	})
	return b.String()
}

// checkMarkdownShape fails when the document written from texts has
// another structure than that written from bland stand-ins of them.
func checkMarkdownShape(t testing.TB, what, got, bland string) {
	t.Helper()
	if g, w := mdShape(got), mdShape(bland); g != w {
		t.Errorf("%s: the input's text changed the Markdown's structure:\ngot  %s\nwant %s\ndocument:\n%s", what, g, w, got)
	}
}

// checkMarkdownText writes the check's and the pool's Markdown of a study
// whose every text is s: the structure must be that of bland text, and no
// line may hold a control character.
func checkMarkdownText(t *testing.T, s string) {
	t.Helper()
	h, res, f := hostileResults(s, nil)
	bh, bres, bf := hostileResults(s, blandText)
	what := strings.ReplaceAll(s, "\n", `\n`)
	got := writeResults(t, "md", h, res, f)
	checkVisible(t, "check markdown", got)
	checkMarkdownShape(t, "check "+what, got, writeResults(t, "md", bh, bres, bf))
	got = writePool(t, "md", h, res)
	checkVisible(t, "pool markdown", got)
	checkMarkdownShape(t, "pool "+what, got, writePool(t, "md", bh, bres))
}

// checkTerminalText writes the check's and the pool's terminal tables of
// a study whose every text is s: no line may hold a control character,
// and there are as many lines as for bland text.
func checkTerminalText(t *testing.T, s string) {
	t.Helper()
	h, res, f := hostileResults(s, nil)
	bh, bres, bf := hostileResults(s, blandText)
	for _, out := range []struct{ what, got, bland string }{
		{"check table", writeResults(t, "table", h, res, f), writeResults(t, "table", bh, bres, bf)},
		{"pool table", writePool(t, "table", h, res), writePool(t, "table", bh, bres)},
	} {
		checkVisible(t, out.what, out.got)
		if g, w := strings.Count(out.got, "\n"), strings.Count(out.bland, "\n"); g != w {
			t.Errorf("%s of %q: %d lines, want %d:\n%s", out.what, s, g, w, out.got)
		}
	}
}

// TestHostileTextMarkdown: no text of the input changes the structure of
// the check's or the pool's Markdown (the same headings, lists, tables of
// the same shape, no link, image, HTML or code), and no line of them
// holds a control character.
func TestHostileTextMarkdown(t *testing.T) {
	for _, s := range hostileTexts {
		checkMarkdownText(t, s)
	}
}

// TestHostileTextTerminal: no text of the input puts a control character
// on the terminal or a line more in the check's or the pool's table.
func TestHostileTextTerminal(t *testing.T) {
	for _, s := range hostileTexts {
		checkTerminalText(t, s)
	}
}

// FuzzMarkdownWriters is checkMarkdownText of any text.
func FuzzMarkdownWriters(f *testing.F) {
	for _, s := range hostileTexts {
		f.Add(s)
	}
	f.Fuzz(checkMarkdownText)
}

// FuzzTerminalWriters is checkTerminalText of any text.
func FuzzTerminalWriters(f *testing.F) {
	for _, s := range hostileTexts {
		f.Add(s)
	}
	f.Fuzz(checkTerminalText)
}
