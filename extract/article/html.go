package article

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"coefaudit/extract"

	"golang.org/x/net/html"
)

// ReadHTML reads an article page or a table saved from a browser with
// golang.org/x/net/html's tokenizer: every table (its caption split into
// label and caption, thead rows as header rows, tfoot rows and the notes
// printed right after the table as its footnotes, rowspan and colspan),
// the paragraphs with the heading above them, and the study key from the
// page's citation_author, citation_publication_date (or citation_date) and
// citation_doi meta tags. A token may hold at most MaxTextBytes and the
// file at most MaxArticleBytes (extract.ErrInputTooLarge beyond).
//
// References:
//
//	[1] WHATWG. HTML Living Standard, §4.9 Tabular data (table, caption,
//	    thead, tfoot, tr, td, th, rowspan, colspan) and §13.2 Parsing.
//	[2] Google Scholar inclusion guidelines: citation_author,
//	    citation_publication_date, citation_doi meta tags (from memory).
func ReadHTML(r io.Reader, file string) (*Article, error) {
	a, err := readHTML(io.LimitReader(r, MaxArticleBytes+1), file)
	if err != nil {
		return nil, fileError(file, err)
	}
	return a, nil
}

// htmlReader is the state of one pass over an HTML document.
type htmlReader struct {
	art         *Article
	draft       *tableDraft
	tables      int // tables open (nested ones join their cell's text)
	inHead      bool
	inFoot      bool
	bold        int
	skip        int // open script and style elements
	cell        *textBuf
	cellTag     string
	spans       [2]int
	caption     *textBuf
	para        *textBuf
	heading     *textBuf
	section     string
	paras       int
	notesFor    int // index+1 of the table whose notes may follow, 0 when none
	author, doi string
	year        string
	lastPara    string
}

func readHTML(r io.Reader, file string) (*Article, error) {
	z := html.NewTokenizer(r)
	z.SetMaxBuf(MaxTextBytes)
	h := &htmlReader{art: &Article{File: file, Format: FormatHTML}}
	var read int64
	for {
		tt := z.Next()
		read += int64(len(z.Raw()))
		if read > MaxArticleBytes {
			return nil, fmt.Errorf("the file is larger than %d MiB: %w", MaxArticleBytes>>20, extract.ErrInputTooLarge)
		}
		switch tt {
		case html.ErrorToken:
			err := z.Err()
			if err == io.EOF {
				if err := h.closeAll(); err != nil {
					return nil, err
				}
				if len(h.art.Tables) == 0 && len(h.art.Paragraphs) == 0 {
					return nil, fmt.Errorf("no table and no paragraph: %w", ErrNotArticle)
				}
				h.art.Study = studyKey(surnameOf(h.author), h.year, h.doi, file)
				return h.art, nil
			}
			if errors.Is(err, html.ErrBufferExceeded) {
				return nil, errTextTooLong
			}
			return nil, err
		case html.StartTagToken, html.SelfClosingTagToken:
			name, _ := z.TagName()
			attrs := map[string]string{}
			for {
				k, v, more := z.TagAttr()
				attrs[string(k)] = string(v)
				if !more {
					break
				}
			}
			if err := h.start(string(name), attrs, tt == html.SelfClosingTagToken); err != nil {
				return nil, err
			}
		case html.EndTagToken:
			name, _ := z.TagName()
			if err := h.end(string(name)); err != nil {
				return nil, err
			}
		case html.TextToken:
			if h.skip > 0 {
				continue
			}
			if err := h.text(string(z.Text())); err != nil {
				return nil, err
			}
		}
	}
}

// text adds text to what is being gathered.
func (h *htmlReader) text(s string) error {
	bold := h.bold > 0
	switch {
	case h.cell != nil:
		return h.cell.add(s, bold)
	case h.caption != nil:
		return h.caption.add(s, bold)
	case h.heading != nil:
		return h.heading.add(s, bold)
	case h.para != nil:
		return h.para.add(s, bold)
	case h.tables == 0 && strings.TrimSpace(s) != "":
		// Text outside any paragraph (a bare results section) is one.
		h.para = &textBuf{}
		return h.para.add(s, bold)
	}
	return nil
}

func (h *htmlReader) start(name string, attrs map[string]string, selfClosing bool) error {
	switch name {
	case "script", "style", "noscript", "template":
		if !selfClosing {
			h.skip++
		}
	case "meta":
		h.meta(attrs)
	case "b", "strong":
		h.bold++
	case "table":
		h.tables++
		if h.tables > 1 {
			return nil
		}
		if err := h.endParagraph(); err != nil {
			return err
		}
		h.draft = &tableDraft{}
		if l, _ := splitLabel(h.lastPara); l != "" {
			h.draft.label = l
		}
	case "caption":
		if h.tables == 1 && h.cell == nil {
			h.caption = &textBuf{}
		}
	case "thead":
		h.inHead = true
	case "tfoot":
		h.inFoot = true
	case "tr":
		if h.tables == 1 {
			if err := h.endCell(); err != nil {
				return err
			}
			if !h.inFoot {
				return h.draft.row(h.inHead)
			}
		}
	case "td", "th":
		if h.tables == 1 {
			if err := h.endCell(); err != nil {
				return err
			}
			h.cell, h.cellTag = &textBuf{}, name
			h.spans = [2]int{atoiOr1(attrs["rowspan"]), atoiOr1(attrs["colspan"])}
		}
	case "p", "div", "li", "section", "article", "blockquote", "figcaption":
		if h.tables == 0 {
			if err := h.endParagraph(); err != nil {
				return err
			}
			if name == "p" || name == "li" {
				h.para = &textBuf{}
			}
		}
	case "br":
		return h.text(" ")
	case "h1", "h2", "h3", "h4", "h5", "h6":
		if h.tables == 0 {
			if err := h.endParagraph(); err != nil {
				return err
			}
			h.heading = &textBuf{}
		}
	}
	return nil
}

func (h *htmlReader) end(name string) error {
	switch name {
	case "script", "style", "noscript", "template":
		if h.skip > 0 {
			h.skip--
		}
	case "b", "strong":
		if h.bold > 0 {
			h.bold--
		}
	case "td", "th":
		if h.tables == 1 {
			return h.endCell()
		}
	case "caption":
		if h.caption != nil && h.draft != nil {
			label, rest := splitLabel(h.caption.String())
			if label != "" {
				h.draft.label = label
			}
			h.draft.caption = rest
			h.caption = nil
		}
	case "thead":
		h.inHead = false
	case "tfoot":
		h.inFoot = false
	case "table":
		if h.tables == 0 {
			return nil
		}
		h.tables--
		if h.tables > 0 {
			return nil
		}
		if err := h.endCell(); err != nil {
			return err
		}
		t, err := h.draft.table()
		if err != nil {
			return err
		}
		if len(h.art.Tables) >= MaxTableCells {
			return errTooManyItems
		}
		h.art.Tables = append(h.art.Tables, t)
		h.draft = nil
		h.notesFor = len(h.art.Tables)
	case "p", "li", "div":
		if h.tables == 0 {
			return h.endParagraph()
		}
	case "h1", "h2", "h3", "h4", "h5", "h6":
		if h.heading != nil {
			h.section = h.heading.String()
			h.heading = nil
			h.notesFor = 0
		}
	}
	return nil
}

// endCell closes the open cell: a tfoot cell's text is a footnote.
func (h *htmlReader) endCell() error {
	if h.cell == nil {
		return nil
	}
	c := h.cell
	h.cell = nil
	if h.inFoot {
		if s := c.String(); s != "" {
			h.draft.foot = append(h.draft.foot, s)
		}
		return nil
	}
	return h.draft.cell(c, h.spans[0], h.spans[1], h.cellTag == "th")
}

// endParagraph closes the open paragraph: a note right after a table is
// that table's footnote, anything else a paragraph of the text.
func (h *htmlReader) endParagraph() error {
	if h.para == nil {
		return nil
	}
	text := h.para.String()
	h.para = nil
	if text == "" {
		return nil
	}
	if h.notesFor > 0 && isTableNote(text) {
		t := &h.art.Tables[h.notesFor-1]
		t.Foot = append(t.Foot, text)
		return nil
	}
	h.notesFor = 0
	h.lastPara = text
	if len(h.art.Paragraphs) >= MaxTableCells {
		return errTooManyItems
	}
	h.paras++
	place := fmt.Sprintf("paragraph %d", h.paras)
	if h.section != "" {
		place = fmt.Sprintf("section %q, %s", h.section, place)
	}
	h.art.Paragraphs = append(h.art.Paragraphs, Paragraph{Place: place, Text: text})
	return nil
}

// closeAll ends what the document left open.
func (h *htmlReader) closeAll() error {
	for h.tables > 0 {
		if err := h.end("table"); err != nil {
			return err
		}
	}
	return h.endParagraph()
}

// meta reads the citation meta tags.
func (h *htmlReader) meta(attrs map[string]string) {
	name, content := strings.ToLower(attrs["name"]), strings.TrimSpace(attrs["content"])
	switch name {
	case "citation_author", "dc.creator":
		if h.author == "" {
			h.author = content
		}
	case "citation_publication_date", "citation_date", "dc.date":
		if h.year == "" && len(content) >= 4 {
			h.year = yearIn(content)
		}
	case "citation_doi":
		if h.doi == "" {
			h.doi = content
		}
	}
}

// yearIn returns the first run of four digits of a date.
func yearIn(s string) string {
	for i := 0; i+4 <= len(s); i++ {
		if strings.IndexFunc(s[i:i+4], func(r rune) bool { return r < '0' || r > '9' }) < 0 {
			return s[i : i+4]
		}
	}
	return ""
}

// surnameOf takes the surname of "Surname, Given" or "Given Surname".
func surnameOf(author string) string {
	if i := strings.Index(author, ","); i >= 0 {
		return strings.TrimSpace(author[:i])
	}
	f := strings.Fields(author)
	if len(f) == 0 {
		return ""
	}
	return f[len(f)-1]
}
