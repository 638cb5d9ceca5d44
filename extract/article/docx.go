package article

import (
	"encoding/xml"
	"fmt"
	"io"
	"strings"

	"coefaudit/extract"
)

// ReadDOCX reads a manuscript in WordprocessingML (.docx): the tables of
// its main document part (found as mainPart says; w:tbl, rows marked w:tblHeader as header rows,
// w:gridSpan and w:vMerge as spans), a "Table N" paragraph before a table
// (and the title paragraph after it) as its label and caption, the notes
// right after it ("Note.", "*p < .05") as its footnotes, and the other
// paragraphs as the text. The archive is checked against the workbook
// reader's limits first (extract.OpenArchive: size, members, unpacked
// size, compression ratio), and the XML read as ReadJATS reads it: strict,
// no entities of its own, bounded depth and text. The study key is the
// file's name, since a manuscript's properties name its last editor
// rather than its authors.
//
// References:
//
//	[1] ECMA International (2016). ECMA-376 Office Open XML File Formats,
//	    5th ed., Part 1, §17.4 (tables: tbl, tr, tc, gridSpan, vMerge,
//	    tblHeader) and §17.3 (paragraphs and runs: p, r, t, b).
func ReadDOCX(file string) (*Article, error) {
	zr, err := extract.OpenArchive(file)
	if err != nil {
		return nil, err
	}
	defer zr.Close()
	doc, err := mainPart(&zr.Reader, file)
	if err != nil {
		return nil, err
	}
	rc, err := doc.Open()
	if err != nil {
		return nil, fileError(file, err)
	}
	defer rc.Close()
	a, err := readDOCX(io.LimitReader(rc, MaxArticleBytes+1), file, doc.Name)
	if err != nil {
		return nil, fileError(file, err)
	}
	return a, nil
}

// docxReader is the state of one pass over a document part.
type docxReader struct {
	art      *Article
	depth    int
	tables   int // w:tbl open (nested ones join their cell's text)
	draft    *tableDraft
	cell     *textBuf
	spans    [2]int
	merged   bool // the cell continues a vertical merge
	para     *textBuf
	runBold  bool
	inRPr    bool
	inT      bool // inside w:t, whose text is the document's
	head     bool
	recent   []string // the last paragraphs before a table
	notesFor int
	paras    int
}

func readDOCX(r io.Reader, file, part string) (*Article, error) {
	cr := &countingReader{r: r}
	dec := xml.NewDecoder(cr)
	dec.Strict = true
	d := &docxReader{art: &Article{File: file, Format: FormatDOCX, Study: studyKey("", "", "", file)}}
	for {
		tok, err := dec.Token()
		if cr.n > MaxArticleBytes {
			return nil, fmt.Errorf("its document part is larger than %d MiB: %w", MaxArticleBytes>>20, extract.ErrInputTooLarge)
		}
		if err == io.EOF {
			return d.art, nil
		}
		if err != nil {
			line, _ := dec.InputPos()
			return nil, fmt.Errorf("%s, line %d: %v", part, line, err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if d.depth++; d.depth > extract.MaxXMLDepth {
				return nil, errTooDeep
			}
			if err := d.start(el); err != nil {
				return nil, err
			}
		case xml.EndElement:
			d.depth--
			if err := d.end(el.Name.Local); err != nil {
				return nil, err
			}
		case xml.CharData:
			if d.para != nil && d.inT {
				if err := d.para.add(string(el), d.runBold); err != nil {
					return nil, err
				}
			}
		}
	}
}

// on reads a w:val switch: absent or anything but 0, false, off is on.
func on(el xml.StartElement) bool {
	switch attrOf(el, "val") {
	case "0", "false", "off", "none":
		return false
	}
	return true
}

func (d *docxReader) start(el xml.StartElement) error {
	switch el.Name.Local {
	case "tbl":
		d.tables++
		if d.tables == 1 {
			d.draft = &tableDraft{}
			d.caption()
		}
	case "tr":
		if d.tables == 1 {
			d.head = false
			return d.draft.row(false)
		}
	case "tblHeader":
		if d.tables == 1 && on(el) && len(d.draft.head) > 0 {
			d.draft.head[len(d.draft.head)-1] = true
		}
	case "tc":
		if d.tables == 1 {
			d.cell, d.spans, d.merged = &textBuf{}, [2]int{1, 1}, false
		}
	case "gridSpan":
		if d.tables == 1 {
			d.spans[1] = atoiOr1(attrOf(el, "val"))
		}
	case "vMerge":
		if d.tables == 1 && attrOf(el, "val") != "restart" {
			d.merged = true
		}
	case "p":
		if d.para == nil {
			d.para = &textBuf{}
		}
	case "r":
		d.runBold = false
	case "rPr":
		d.inRPr = true
	case "t":
		d.inT = true
	case "b":
		if d.inRPr {
			d.runBold = on(el)
		}
	case "tab", "br", "cr":
		if d.para != nil {
			return d.para.add(" ", false)
		}
	}
	return nil
}

func (d *docxReader) end(name string) error {
	switch name {
	case "rPr":
		d.inRPr = false
	case "t":
		d.inT = false
	case "p":
		if d.para == nil {
			return nil
		}
		if d.tables > 0 {
			// A cell's paragraphs are its lines.
			if d.cell != nil {
				if err := d.cell.add(d.para.b.String()+" ", d.para.all && d.para.seen); err != nil {
					return err
				}
			}
			d.para = nil
			return nil
		}
		text := d.para.String()
		d.para = nil
		return d.paragraph(text)
	case "tc":
		if d.tables == 1 && d.cell != nil {
			c := d.cell
			d.cell = nil
			if d.merged {
				c = &textBuf{}
			}
			return d.draft.cell(c, 1, d.spans[1], false)
		}
	case "tbl":
		d.tables--
		if d.tables == 0 {
			t, err := d.draft.table()
			if err != nil {
				return err
			}
			if len(d.art.Tables) >= MaxTableCells {
				return errTooManyItems
			}
			d.art.Tables = append(d.art.Tables, t)
			d.draft = nil
			d.notesFor = len(d.art.Tables)
		}
	}
	return nil
}

// caption takes a table's label and caption from the paragraphs just
// before it: "Table 2. Title" in one, or "Table 2" then the title.
func (d *docxReader) caption() {
	n := len(d.recent)
	switch {
	case n >= 2 && tableLabel.MatchString(d.recent[n-2]) && strings.TrimSpace(tableLabel.ReplaceAllString(d.recent[n-2], "")) == "":
		d.draft.label, _ = splitLabel(d.recent[n-2])
		d.draft.caption = d.recent[n-1]
	case n >= 1 && tableLabel.MatchString(d.recent[n-1]):
		d.draft.label, d.draft.caption = splitLabel(d.recent[n-1])
	}
}

// paragraph adds a paragraph outside tables: a note right after a table is
// its footnote.
func (d *docxReader) paragraph(text string) error {
	if text == "" {
		return nil
	}
	if d.notesFor > 0 && isTableNote(text) {
		t := &d.art.Tables[d.notesFor-1]
		t.Foot = append(t.Foot, text)
		return nil
	}
	d.notesFor = 0
	if d.recent = append(d.recent, text); len(d.recent) > 2 {
		d.recent = d.recent[1:]
	}
	if len(d.art.Paragraphs) >= MaxTableCells {
		return errTooManyItems
	}
	d.paras++
	d.art.Paragraphs = append(d.art.Paragraphs, Paragraph{Place: fmt.Sprintf("paragraph %d", d.paras), Text: text})
	return nil
}
