package article

import (
	"encoding/xml"
	"fmt"
	"io"
	"strconv"
	"strings"

	"coefaudit/extract"
	"golang.org/x/net/html/charset"
)

// ReadJATS reads an article in JATS XML (NISO Z39.96-2021, and the NLM 3.0
// tag set before it, whose table and paragraph elements are the same): the
// study key from the front matter (the first author's surname and the
// publication year, else the DOI), every table-wrap (label, caption, the
// XHTML table with its thead, rowspan and colspan, table-wrap-foot) and the
// paragraphs of the abstract and body with their section titles.
//
// The XML is read with encoding/xml in strict mode: a DOCTYPE is read past
// and its DTD never fetched, entities are the XML ones and the HTML named
// characters (xml.HTMLEntity) only, so an entity the document defines for
// itself (a "billion laughs") is an error, not an expansion. Elements may
// nest at most extract.MaxXMLDepth deep, a cell or paragraph hold at most
// MaxTextBytes and the file at most MaxArticleBytes; beyond, the error
// wraps extract.ErrInputTooLarge. A cell's text is all its text, so that
// stars in <sup> or <xref ref-type="table-fn"> stay with the number.
//
// References:
//
//	[1] NISO (2021). JATS: Journal Article Tag Suite, version 1.3
//	    (ANSI/NISO Z39.96-2021): table-wrap, table-wrap-foot, fn, contrib,
//	    pub-date, article-id.
//	[2] W3C (2008). Extensible Markup Language (XML) 1.0, 5th ed., §4.1:
//	    entity references must be declared.
func ReadJATS(r io.Reader, file string) (*Article, error) {
	a, err := readJATS(io.LimitReader(r, MaxArticleBytes+1), file)
	if err != nil {
		return nil, fileError(file, err)
	}
	return a, nil
}

// jatsReader is the state of one pass over a JATS document.
type jatsReader struct {
	art     *Article
	open    []string // local names of the open elements
	bold    int      // open bold elements
	buf     *textBuf // the text being gathered, or nil
	bufFor  int      // depth of the element whose text buf gathers
	draft   *tableDraft
	inHead  bool
	thRow   bool // every cell of the current row so far is th
	spans   [2]int
	section []string
	paras   int
	surname string
	year    string
	doi     string
	title   *textBuf
}

func readJATS(r io.Reader, file string) (*Article, error) {
	cr := &countingReader{r: r}
	dec := xml.NewDecoder(cr)
	dec.Strict = true
	dec.Entity = xml.HTMLEntity
	dec.CharsetReader = charset.NewReaderLabel
	j := &jatsReader{art: &Article{File: file, Format: FormatJATS}}
	sawArticle := false
	for {
		tok, err := dec.Token()
		if cr.n > MaxArticleBytes {
			return nil, fmt.Errorf("the file is larger than %d MiB: %w", MaxArticleBytes>>20, extract.ErrInputTooLarge)
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			line, _ := dec.InputPos()
			if strings.Contains(err.Error(), "invalid character entity") {
				return nil, fmt.Errorf("line %d: %v; entities a document defines for itself are never expanded", line, err)
			}
			return nil, fmt.Errorf("line %d: %v", line, err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if len(j.open) >= extract.MaxXMLDepth {
				return nil, errTooDeep
			}
			if len(j.open) == 0 && el.Name.Local == "article" {
				sawArticle = true
			}
			j.open = append(j.open, el.Name.Local)
			if err := j.start(el); err != nil {
				return nil, err
			}
		case xml.EndElement:
			if err := j.end(el.Name.Local); err != nil {
				return nil, err
			}
			j.open = j.open[:len(j.open)-1]
		case xml.CharData:
			if j.buf != nil {
				if err := j.buf.add(string(el), j.bold > 0); err != nil {
					return nil, err
				}
			}
		}
	}
	if !sawArticle {
		return nil, fmt.Errorf("its root element is not <article>: %w", ErrNotArticle)
	}
	j.art.Study = studyKey(j.surname, j.year, j.doi, file)
	return j.art, nil
}

// countingReader counts the bytes read, for the size limit.
type countingReader struct {
	r io.Reader
	n int64
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += int64(n)
	return n, err
}

// gather starts gathering the text of the element just opened, unless an
// outer element already is.
func (j *jatsReader) gather() {
	if j.buf == nil {
		j.buf, j.bufFor = &textBuf{}, len(j.open)
	}
}

// within reports whether an element of that name is open.
func (j *jatsReader) within(name string) bool {
	for _, o := range j.open {
		if o == name {
			return true
		}
	}
	return false
}

func (j *jatsReader) start(el xml.StartElement) error {
	name := el.Name.Local
	switch name {
	case "bold", "b", "strong":
		j.bold++
	case "table-wrap":
		if j.draft == nil {
			j.draft = &tableDraft{}
			if j.buf != nil && j.bufFor < len(j.open) {
				// A table inside a paragraph: the paragraph's text so
				// far stands, the table's does not join it.
				j.flushParagraph()
			}
		}
	case "thead":
		j.inHead = true
	case "tr":
		if j.draft != nil {
			j.thRow = true
			return j.draft.row(j.inHead)
		}
	case "td", "th":
		if j.draft != nil {
			j.spans = [2]int{atoiOr1(attrOf(el, "rowspan")), atoiOr1(attrOf(el, "colspan"))}
			if name == "td" {
				j.thRow = false
			}
			j.gather()
		}
	case "label", "caption":
		if j.draft != nil && j.parentIs("table-wrap") {
			j.gather()
		}
	case "surname":
		if j.surname == "" && j.within("contrib") && j.within("article-meta") {
			j.gather()
		}
	case "year":
		if j.year == "" && j.within("pub-date") && j.within("article-meta") {
			j.gather()
		}
	case "article-id":
		if j.doi == "" && attrOf(el, "pub-id-type") == "doi" && j.within("article-meta") {
			j.gather()
		}
	case "title":
		if j.draft == nil && j.buf == nil && j.parentIs("sec") {
			j.gather()
		}
	case "sec":
		j.section = append(j.section, "")
	case "fn":
		if j.draft != nil && j.within("table-wrap-foot") {
			j.gather()
		}
	case "p":
		if j.draft != nil && j.within("table-wrap-foot") || j.draft == nil && (j.within("body") || j.within("abstract")) {
			j.gather()
		}
	}
	return nil
}

// parentIs reports whether the element just opened sits in one named so.
func (j *jatsReader) parentIs(name string) bool {
	return len(j.open) >= 2 && j.open[len(j.open)-2] == name
}

func (j *jatsReader) end(name string) error {
	switch name {
	case "bold", "b", "strong":
		j.bold--
	case "thead":
		j.inHead = false
	case "tr":
		if j.draft != nil && j.thRow && len(j.draft.raw) > 0 {
			j.draft.head[len(j.draft.head)-1] = true
		}
	case "sec":
		j.section = j.section[:len(j.section)-1]
	case "table-wrap":
		if j.draft != nil && len(j.open) > 0 && !j.withinOuter("table-wrap") {
			t, err := j.draft.table()
			if err != nil {
				return err
			}
			if len(j.art.Tables) >= MaxTableCells {
				return errTooManyItems
			}
			j.art.Tables = append(j.art.Tables, t)
			j.draft = nil
		}
	}
	if j.buf == nil || j.bufFor != len(j.open) {
		return nil
	}
	text := j.buf.String()
	buf := j.buf
	j.buf = nil
	switch name {
	case "td", "th":
		return j.draft.cell(buf, j.spans[0], j.spans[1], name == "th")
	case "label":
		j.draft.label = text
	case "caption":
		j.draft.caption = text
	case "surname":
		j.surname = text
	case "year":
		j.year = text
	case "article-id":
		j.doi = text
	case "title":
		if len(j.section) > 0 {
			j.section[len(j.section)-1] = text
		}
	case "p", "fn":
		if j.draft != nil {
			if text != "" {
				j.draft.foot = append(j.draft.foot, text)
			}
			return nil
		}
		return j.paragraph(text)
	}
	return nil
}

// withinOuter reports whether an element of that name is open outside the
// innermost one.
func (j *jatsReader) withinOuter(name string) bool {
	for _, o := range j.open[:len(j.open)-1] {
		if o == name {
			return true
		}
	}
	return false
}

// flushParagraph ends the paragraph gathered so far, before a table it
// holds.
func (j *jatsReader) flushParagraph() {
	text := j.buf.String()
	j.buf = nil
	j.paragraph(text)
}

// paragraph adds a paragraph of the body with its place.
func (j *jatsReader) paragraph(text string) error {
	if text == "" {
		return nil
	}
	if len(j.art.Paragraphs) >= MaxTableCells {
		return errTooManyItems
	}
	j.paras++
	place := fmt.Sprintf("paragraph %d", j.paras)
	for i := len(j.section) - 1; i >= 0; i-- {
		if j.section[i] != "" {
			place = fmt.Sprintf("section %q, %s", j.section[i], place)
			break
		}
	}
	if j.within("abstract") {
		place = "abstract, " + place
	}
	j.art.Paragraphs = append(j.art.Paragraphs, Paragraph{Place: place, Text: text})
	return nil
}

// attrOf returns the value of the attribute with the given local name.
func attrOf(el xml.StartElement, name string) string {
	for _, a := range el.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}

// atoiOr1 reads a span, 1 when absent or not a positive number.
func atoiOr1(s string) int {
	n, err := strconv.Atoi(strings.TrimSpace(s))
	if err != nil || n < 1 {
		return 1
	}
	return n
}

// studyKey names the study as a review does: "Surname Year", else the DOI,
// else the file's base name.
func studyKey(surname, year, doi, file string) string {
	switch {
	case surname != "" && year != "":
		return surname + " " + year
	case doi != "":
		return doi
	}
	base := file
	if i := strings.LastIndexAny(base, `/\`); i >= 0 {
		base = base[i+1:]
	}
	if i := strings.LastIndex(base, "."); i > 0 {
		base = base[:i]
	}
	return base
}
