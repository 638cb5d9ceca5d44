package article

import (
	"bytes"
	"encoding/xml"
	"strings"
	"testing"

	"coefaudit/extract"

	nethtml "golang.org/x/net/html"
	"golang.org/x/net/html/charset"
)

// checkFound is what every reader must give whatever its input: sheets
// that extract's readers take without failing, and estimates that are
// text of the input, never a number the reader made up. shown is the
// text the input shows once its format's own library has read it (tags
// out, entities read): "b=1<h>4" shows b=14, as a browser shows it.
func checkFound(t *testing.T, input, shown string, a *Article) {
	f := Recognise(a)
	res := &Result{Articles: []*Found{f}}
	if _, err := extract.ReadTextSheets("fuzz", res.Sheets()); err != nil {
		t.Fatalf("the sheets of an import do not read back: %v", err)
	}
	for _, c := range f.Coefficients {
		est := strings.TrimRight(c.Estimate, "*")
		if !strings.Contains(input, est) && !strings.Contains(squeeze(input), est) &&
			!strings.Contains(shown, est) && !strings.Contains(squeeze(shown), est) {
			t.Fatalf("estimate %q is not in the input", c.Estimate)
		}
	}
}

// shownHTML is the text of an HTML input as golang.org/x/net/html's
// tokenizer reads it, without the content of the elements a browser
// does not show as text: script, style and template (WHATWG HTML
// Living Standard, §15.3.1 Hidden elements) and noscript, hidden when
// scripting is on (§4.12.2). So "b=1<script>0</script>4" shows b=14, and
// a ">" inside a quoted attribute value or a "<" that opens no tag is
// read as the standard reads it (§13.2.5 Tokenization).
func shownHTML(s string) string {
	z := nethtml.NewTokenizer(strings.NewReader(s))
	var b strings.Builder
	hidden := 0
	for {
		switch z.Next() {
		case nethtml.ErrorToken:
			return b.String()
		case nethtml.StartTagToken:
			if name, _ := z.TagName(); notShown[string(name)] {
				hidden++
			}
		case nethtml.EndTagToken:
			if name, _ := z.TagName(); notShown[string(name)] && hidden > 0 {
				hidden--
			}
		case nethtml.TextToken:
			if hidden == 0 {
				b.Write(z.Text())
			}
		}
	}
}

// notShown are the elements whose content shownHTML leaves out.
var notShown = map[string]bool{"script": true, "style": true, "template": true, "noscript": true}

// shownXML is the character data of an XML input as encoding/xml reads
// it, with HTML's named entities and a declared charset as the JATS
// reader takes them: CDATA sections are text; comments, processing
// instructions and attribute values are not (W3C XML 1.0, §2.4 and
// §2.7). The text read before any error is returned.
func shownXML(s string) string {
	dec := xml.NewDecoder(strings.NewReader(s))
	dec.Strict = true
	dec.Entity = xml.HTMLEntity
	dec.CharsetReader = charset.NewReaderLabel
	var b strings.Builder
	for {
		tok, err := dec.Token()
		if err != nil {
			return b.String()
		}
		if cd, ok := tok.(xml.CharData); ok {
			b.Write(cd)
		}
	}
}

func FuzzReadJATS(f *testing.F) {
	f.Add(jatsArticle(tarticle{author: "Quillon", year: "2026", paras: []string{"Sleep (β = .34, p < .001) was stronger than screen time (β = .10)."},
		tables: []ttable{layouts[0].table, layouts[1].table, correlationTable}}))
	f.Add("<article><body><table-wrap><table><tr><td rowspan=\"900\" colspan=\"900\">1</td></tr></table></table-wrap></body></article>")
	f.Add("<article><body><p>&amp;&lt;&nbsp;</p></body></article>")
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ReadJATS(strings.NewReader(s), "fuzz.xml")
		if err != nil {
			return
		}
		checkFound(t, s, shownXML(s), a)
	})
}

func FuzzReadHTML(f *testing.F) {
	f.Add(htmlArticle(tarticle{author: "Quillon", year: "2026", paras: []string{"b = 0.41, SE = 0.12, t(120) = 3.20."},
		tables: []ttable{layouts[2].table, layouts[4].table}}))
	f.Add("<table><tr><td rowspan=3>x<td>1<tr><td>2</table><p>Note. N = 3")
	f.Add("<p>b=1<script>0</script>4, b=2<span title=\"9>\">5, a < b=3<i>6")
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ReadHTML(strings.NewReader(s), "fuzz.html")
		if err != nil {
			return
		}
		checkFound(t, s, shownHTML(s), a)
	})
}

// FuzzReadDOCX fuzzes the document part, which is what ReadDOCX reads
// once the archive has passed extract.OpenArchive's checks.
func FuzzReadDOCX(f *testing.F) {
	f.Add(docxDocument(tarticle{paras: []string{"OR = 1.80, 95% CI 1.21–2.68."}, tables: []ttable{layouts[3].table}}))
	f.Add(`<w:document xmlns:w="x"><w:body><w:tbl><w:tr><w:tc><w:tcPr><w:gridSpan w:val="99999"/><w:vMerge/></w:tcPr></w:tc></w:tr></w:tbl></w:body></w:document>`)
	f.Fuzz(func(t *testing.T, s string) {
		a, err := readDOCX(strings.NewReader(s), "fuzz.docx", "word/document.xml")
		if err != nil {
			return
		}
		checkFound(t, s, shownXML(s), a)
	})
}

func FuzzReadText(f *testing.F) {
	f.Add("Girls (β = .30, p = .01) and boys (β = .10, p = .20) differed.\n\nr(198) = .45, p < .001.")
	f.Add("OR = 1.80, 95% CI 1.21–2.68; HR = 0.9, 99% CI [0.5, 1.1]")
	f.Add(textTableOf(layouts[0].table, false, false))
	f.Add(textTableOf(layouts[1].table, true, true))
	f.Add(textTableOf(correlationTable, false, true))
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ReadText(bytes.NewReader([]byte(s)), "fuzz.txt")
		if err != nil {
			return
		}
		checkFound(t, s, s, a)
	})
}
