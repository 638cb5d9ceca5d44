package article

import (
	"archive/zip"
	"fmt"
	"html"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"
)

// The tests write invented articles in every format from one description,
// so that each layout of a table is read through each reader.

// tcell is one printed cell: its text, the columns it spans, and whether
// it is bold. Trailing stars are set as a superscript (JATS: a table-fn
// link), as journals print them.
type tcell struct {
	text string
	span int
	bold bool
}

// ttable is one printed table.
type ttable struct {
	label, caption string
	head, body     [][]tcell
	foot           []string
}

// tarticle is one invented article.
type tarticle struct {
	author, year string
	paras        []string
	tables       []ttable
}

// cells makes a row of one-column cells.
func cells(texts ...string) []tcell {
	out := make([]tcell, len(texts))
	for i, s := range texts {
		out[i] = tcell{text: s, span: 1}
	}
	return out
}

// splitStars splits trailing stars from a cell's text.
func splitStars(s string) (string, string) {
	t := strings.TrimRight(s, "*")
	return t, s[len(t):]
}

func esc(s string) string { return html.EscapeString(s) }

func jatsArticle(a tarticle) string {
	var b strings.Builder
	b.WriteString("\n<!DOCTYPE article PUBLIC \"-//NLM//DTD JATS (Z39.96) Journal Archiving and Interchange DTD v1.2 20190208//EN\" \"JATS-archivearticle1.dtd\">\n")
	b.WriteString(`<article xmlns:xlink="http://www.w3.org/1999/xlink"><front><article-meta>`)
	fmt.Fprintf(&b, `<contrib-group><contrib contrib-type="author"><name><surname>%s</surname></name></contrib></contrib-group><pub-date><year>%s</year></pub-date>`, esc(a.author), esc(a.year))
	b.WriteString(`</article-meta></front><body><sec><title>Results</title>`)
	for _, p := range a.paras {
		fmt.Fprintf(&b, "<p>%s</p>\n", esc(p))
	}
	for _, t := range a.tables {
		fmt.Fprintf(&b, "<table-wrap><label>%s</label><caption><title>%s</title></caption><table>", esc(t.label), esc(t.caption))
		markupRows(&b, t, `<xref ref-type="table-fn" rid="tf1">%s</xref>`, "bold")
		b.WriteString("</table>")
		if len(t.foot) > 0 {
			b.WriteString("<table-wrap-foot>")
			for i, f := range t.foot {
				fmt.Fprintf(&b, `<fn id="tf%d"><p>%s</p></fn>`, i+1, esc(f))
			}
			b.WriteString("</table-wrap-foot>")
		}
		b.WriteString("</table-wrap>\n")
	}
	b.WriteString("</sec></body></article>\n")
	return b.String()
}

func htmlArticle(a tarticle) string {
	var b strings.Builder
	fmt.Fprintf(&b, "<!DOCTYPE html><html><head><meta name=\"citation_author\" content=\"%s, A.\"><meta name=\"citation_publication_date\" content=\"%s/03/01\"><title>x</title></head><body><h2>Results</h2>\n",
		esc(a.author), esc(a.year))
	for _, p := range a.paras {
		fmt.Fprintf(&b, "<p>%s\n", esc(p)) // no </p>: browsers' pages omit it
	}
	for _, t := range a.tables {
		fmt.Fprintf(&b, "<table><caption>%s. %s</caption>", esc(t.label), esc(t.caption))
		markupRows(&b, t, "<sup>%s</sup>", "strong")
		b.WriteString("</table>\n")
		for _, f := range t.foot {
			fmt.Fprintf(&b, "<p>%s</p>\n", esc(f))
		}
	}
	b.WriteString("</body></html>\n")
	return b.String()
}

// markupRows writes a table's thead and tbody in XHTML, as JATS and HTML
// share them: stars in the element starsFormat makes, bold in boldTag.
func markupRows(b *strings.Builder, t ttable, starsFormat, boldTag string) {
	row := func(r []tcell, tag string) {
		b.WriteString("<tr>")
		for _, c := range r {
			text, stars := splitStars(c.text)
			inner := esc(text)
			if stars != "" {
				inner += fmt.Sprintf(starsFormat, stars)
			}
			if c.bold {
				inner = "<" + boldTag + ">" + inner + "</" + boldTag + ">"
			}
			fmt.Fprintf(b, `<%s colspan="%d">%s</%s>`, tag, max(c.span, 1), inner, tag)
		}
		b.WriteString("</tr>\n")
	}
	b.WriteString("<thead>")
	for _, r := range t.head {
		row(r, "th")
	}
	b.WriteString("</thead><tbody>")
	for _, r := range t.body {
		row(r, "td")
	}
	b.WriteString("</tbody>")
}

// docxDocument writes a WordprocessingML main document part.
func docxDocument(a tarticle) string {
	var b strings.Builder
	b.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n")
	b.WriteString(`<w:document xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main"><w:body>`)
	para := func(s string) {
		fmt.Fprintf(&b, `<w:p><w:r><w:t xml:space="preserve">%s</w:t></w:r></w:p>`, esc(s))
	}
	para("Results")
	for _, p := range a.paras {
		para(p)
	}
	for _, t := range a.tables {
		para(t.label)
		para(t.caption)
		b.WriteString("<w:tbl>")
		row := func(r []tcell, head bool) {
			b.WriteString("<w:tr>")
			if head {
				b.WriteString("<w:trPr><w:tblHeader/></w:trPr>")
			}
			for _, c := range r {
				b.WriteString("<w:tc>")
				if c.span > 1 {
					fmt.Fprintf(&b, `<w:tcPr><w:gridSpan w:val="%d"/></w:tcPr>`, c.span)
				}
				text, stars := splitStars(c.text)
				rpr := ""
				if c.bold {
					rpr = "<w:rPr><w:b/></w:rPr>"
				}
				fmt.Fprintf(&b, `<w:p><w:r>%s<w:t xml:space="preserve">%s</w:t></w:r>`, rpr, esc(text))
				if stars != "" {
					fmt.Fprintf(&b, `<w:r><w:rPr><w:vertAlign w:val="superscript"/></w:rPr><w:t>%s</w:t></w:r>`, stars)
				}
				b.WriteString("</w:p></w:tc>")
			}
			b.WriteString("</w:tr>")
		}
		for _, r := range t.head {
			row(r, true)
		}
		for _, r := range t.body {
			row(r, false)
		}
		b.WriteString("</w:tbl>")
		for _, f := range t.foot {
			para(f)
		}
	}
	b.WriteString("</w:body></w:document>")
	return b.String()
}

// writeZip writes a zip archive of the named members.
func writeZip(t testing.TB, path string, members map[string]string) string {
	t.Helper()
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	zw := zip.NewWriter(f)
	for name, body := range members {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write([]byte(body)); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// textArticle writes the paragraphs as plain text, and the tables as a
// pasted results section shows them: columns aligned by spaces, the
// caption line above and the notes below, in one block of lines.
func textArticle(a tarticle) string {
	parts := slices.Clone(a.paras)
	for _, t := range a.tables {
		parts = append(parts, textTableOf(t, false, false))
	}
	return strings.Join(parts, "\n\n") + "\n"
}

// textTableOf writes a table as text: its cells separated by tabs, or
// aligned by spaces (each column as wide as its widest cell, two spaces
// between columns, a heading spanning columns printed over the first);
// its caption line apart, a paragraph of its own, when apart is true.
func textTableOf(t ttable, tabs, apart bool) string {
	var grid [][]string
	width := 0
	for _, r := range append(slices.Clone(t.head), t.body...) {
		var row []string
		for _, c := range r {
			row = append(row, c.text)
			for range max(c.span, 1) - 1 {
				row = append(row, "")
			}
		}
		grid = append(grid, row)
		width = max(width, len(row))
	}
	widths := make([]int, width)
	for _, row := range grid {
		for j, s := range row {
			widths[j] = max(widths[j], utf8.RuneCountInString(s))
		}
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%s. %s\n", t.label, t.caption)
	if apart {
		b.WriteString("\n")
	}
	for _, row := range grid {
		var line strings.Builder
		for j, s := range row {
			switch {
			case tabs && j > 0:
				line.WriteString("\t" + s)
			case tabs:
				line.WriteString(s)
			default:
				line.WriteString(s + strings.Repeat(" ", widths[j]-utf8.RuneCountInString(s)+2))
			}
		}
		b.WriteString(strings.TrimRight(line.String(), " ") + "\n")
	}
	for _, f := range t.foot {
		b.WriteString(f + "\n")
	}
	return strings.TrimRight(b.String(), "\n")
}

// articleFormats writes an article in each format with tables into dir
// and returns the files by format.
func articleFormats(t testing.TB, dir, name string, a tarticle) map[string]string {
	t.Helper()
	files := map[string]string{
		FormatJATS: filepath.Join(dir, name+".xml"),
		FormatHTML: filepath.Join(dir, name+".html"),
	}
	files[FormatText] = filepath.Join(dir, name+".txt")
	for format, body := range map[string]string{FormatJATS: jatsArticle(a), FormatHTML: htmlArticle(a), FormatText: textArticle(a)} {
		if err := os.WriteFile(files[format], []byte(body), 0o600); err != nil {
			t.Fatal(err)
		}
	}
	files[FormatDOCX] = writeZip(t, filepath.Join(dir, name+".docx"), docxPackage("word/document.xml", docxDocument(a)))
	return files
}

// docxPackage is the members of a DOCX package whose main document part,
// named main, holds document: its content types and the package
// relationship to it, as ECMA-376 Part 2 (§9.3, §10.1.2) has them.
func docxPackage(main, document string) map[string]string {
	return map[string]string{
		"[Content_Types].xml": `<?xml version="1.0"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
			`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
			`<Default Extension="xml" ContentType="application/xml"/>` +
			`<Override PartName="/` + main + `" ContentType="application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml"/></Types>`,
		"_rels/.rels": `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="` + main + `"/></Relationships>`,
		main: document,
	}
}
