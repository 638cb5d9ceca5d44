package extract

import (
	"archive/zip"
	"encoding/xml"
	"fmt"
	"io"
	"path"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// Cell types as the worksheet XML's t attribute gives them.
const (
	xmlNone    byte = 0
	xmlNumeric byte = 'n'
	xmlText    byte = 's'
	xmlBool    byte = 'b'
	xmlError   byte = 'e'
	xmlDate    byte = 'd'
)

// cellTypes reads the t attribute of every cell of a worksheet, streaming,
// one row at a time and in step with excelize's rows.
type cellTypes struct {
	rc      io.ReadCloser
	dec     *xml.Decoder
	ahead   int    // the row number read ahead, 0 for none
	kinds   []byte // the kinds of row ahead, by column
	width   int    // the last column of row ahead whose cell has content
	lastRow int
	done    bool
	err     error
}

func newCellTypes(zr *zip.Reader, part string) *cellTypes {
	for _, m := range zr.File {
		if m.Name == part {
			rc, err := m.Open()
			if err != nil {
				return &cellTypes{err: err}
			}
			return &cellTypes{rc: rc, dec: xml.NewDecoder(rc)}
		}
	}
	return &cellTypes{err: fmt.Errorf("no part %q", part)}
}

// row returns the kinds of the cells of row n (1-based, asked in increasing
// order), nil for a row with no cells.
func (t *cellTypes) row(n int) []byte {
	for !t.done && t.err == nil && t.ahead < n {
		t.readRow()
	}
	if t.ahead == n {
		return t.kinds
	}
	return nil
}

// valueWidth returns the last column of row n (asked after row(n)) whose
// cell has content (a value, an inline string or a formula), 0 for none:
// the width excelize will return for the row.
func (t *cellTypes) valueWidth(n int) int {
	if t.ahead == n {
		return t.width
	}
	return 0
}

// readRow reads the next row element.
func (t *cellTypes) readRow() {
	t.kinds, t.width = t.kinds[:0], 0
	for {
		tok, err := t.dec.Token()
		if err != nil {
			if err != io.EOF {
				t.err = err
			}
			t.done = true
			return
		}
		switch el := tok.(type) {
		case xml.StartElement:
			switch el.Name.Local {
			case "row":
				t.lastRow++
				if r, err := strconv.Atoi(attr(el, "r")); err == nil && r > 0 {
					t.lastRow = r
				}
				t.ahead = t.lastRow
				t.readCells()
				return
			}
		case xml.EndElement:
			if el.Name.Local == "sheetData" {
				t.done = true
				return
			}
		}
	}
}

// readCells reads the c elements of the current row.
func (t *cellTypes) readCells() {
	col := 0
	for {
		tok, err := t.dec.Token()
		if err != nil {
			t.err, t.done = err, true
			return
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if el.Name.Local != "c" {
				if err := t.dec.Skip(); err != nil {
					t.err, t.done = err, true
					return
				}
				continue
			}
			col++
			if ref := attr(el, "r"); ref != "" {
				if c, _, err := excelize.CellNameToCoordinates(ref); err == nil {
					col = c
				}
			}
			kind := xmlNumeric
			switch attr(el, "t") {
			case "s", "str", "inlineStr":
				kind = xmlText
			case "b":
				kind = xmlBool
			case "e":
				kind = xmlError
			case "d":
				kind = xmlDate
			}
			if col > 0 && col <= excelize.MaxColumns {
				for len(t.kinds) < col {
					t.kinds = append(t.kinds, xmlNone)
				}
				t.kinds[col-1] = kind
			}
			content, err := skipCell(t.dec)
			if err != nil {
				t.err, t.done = err, true
				return
			}
			if content {
				t.width = max(t.width, col)
			}
		case xml.EndElement:
			if el.Name.Local == "row" {
				return
			}
		}
	}
}

// skipCell skips the rest of a c element and reports whether it had a
// child element (v, is or f), which is what makes excelize return it; a
// cell with a style and nothing else does not widen the row.
func skipCell(dec *xml.Decoder) (bool, error) {
	content := false
	for depth := 1; depth > 0; {
		tok, err := dec.Token()
		if err != nil {
			return content, err
		}
		switch tok.(type) {
		case xml.StartElement:
			depth++
			content = true
		case xml.EndElement:
			depth--
		}
	}
	return content, nil
}

// Close closes the stream.
func (t *cellTypes) Close() error {
	if t.rc == nil {
		return nil
	}
	return t.rc.Close()
}

func attr(el xml.StartElement, name string) string {
	for _, a := range el.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}

// sheetParts maps sheet names to their archive members, following the
// package relationships to the workbook part and its relationships to the
// worksheets (ECMA-376 Part 2, Open Packaging Conventions). It returns what
// it can; a sheet it cannot place is read without cell types.
func sheetParts(zr *zip.Reader) map[string]string {
	parts := map[string]string{}
	byName := map[string]*zip.File{}
	for _, m := range zr.File {
		byName[strings.ToLower(strings.ReplaceAll(m.Name, "\\", "/"))] = m
	}
	type rel struct {
		ID     string `xml:"Id,attr"`
		Type   string `xml:"Type,attr"`
		Target string `xml:"Target,attr"`
	}
	type rels struct {
		Rels []rel `xml:"Relationship"`
	}
	readXML := func(name string, v any) bool {
		m, ok := byName[strings.ToLower(name)]
		if !ok {
			return false
		}
		rc, err := m.Open()
		if err != nil {
			return false
		}
		defer rc.Close()
		return xml.NewDecoder(io.LimitReader(rc, MaxXMLPartBytes)).Decode(v) == nil
	}
	resolve := func(base, target string) string {
		if strings.HasPrefix(target, "/") {
			return strings.TrimPrefix(target, "/")
		}
		return path.Join(path.Dir(base), target)
	}
	wbPart := "xl/workbook.xml"
	var root rels
	if readXML("_rels/.rels", &root) {
		for _, r := range root.Rels {
			if strings.HasSuffix(r.Type, "/officeDocument") {
				wbPart = resolve("", r.Target)
			}
		}
	}
	var wb struct {
		Sheets []struct {
			Name  string     `xml:"name,attr"`
			Attrs []xml.Attr `xml:",any,attr"`
		} `xml:"sheets>sheet"`
	}
	var wbRels rels
	if !readXML(wbPart, &wb) || !readXML(path.Join(path.Dir(wbPart), "_rels", path.Base(wbPart)+".rels"), &wbRels) {
		return parts
	}
	targets := map[string]string{}
	for _, r := range wbRels.Rels {
		targets[r.ID] = resolve(wbPart, r.Target)
	}
	for _, s := range wb.Sheets {
		for _, a := range s.Attrs {
			if a.Name.Local == "id" {
				if t, ok := targets[a.Value]; ok {
					if m, ok := byName[strings.ToLower(t)]; ok {
						parts[s.Name] = m.Name
					}
				}
			}
		}
	}
	return parts
}
