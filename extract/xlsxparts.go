package extract

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"path"
	"strconv"
	"strings"
	"unicode/utf16"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"
)

// maxSheets bounds the sheets of a workbook that are listed (common
// practice, no source).
const maxSheets = 1 << 14

// maxSharedStrings bounds the entries of the shared-strings table, each
// of which costs an offset whatever its length: a million-row sheet of
// eight text columns all different (common practice, no source).
const maxSharedStrings = 8 << 20

// packageInfo is what the reader takes from the package around the
// sheets: the sheets in workbook order, the member of each, the styles and
// shared-strings parts, and the date system. The parts are found as
// ECMA-376 Part 2 (Open Packaging Conventions) says: the package's
// relationships name the workbook part, whose relationships name the rest.
type packageInfo struct {
	sheets        []string
	sheetPart     map[string]*zip.File // nil for a sheet listed without its part
	styles        *zip.File            // nil when absent
	sharedStrings *zip.File            // nil when absent
	date1904      bool
}

// readPackage reads the package's relationships and the workbook part.
func readPackage(zr *zip.Reader) (*packageInfo, error) {
	byName := make(map[string]*zip.File, len(zr.File))
	for _, m := range zr.File {
		byName[strings.ToLower(strings.ReplaceAll(m.Name, "\\", "/"))] = m
	}
	member := func(name string) *zip.File { return byName[strings.ToLower(name)] }
	resolve := func(base, target string) string {
		if strings.HasPrefix(target, "/") {
			return strings.TrimPrefix(target, "/")
		}
		return path.Join(path.Dir(base), target)
	}
	meta := xmlLimits{depth: maxXMLDepth, elements: maxMetaXMLElements}

	wbPart := "xl/workbook.xml"
	if m := member("_rels/.rels"); m != nil {
		err := scanPart(m, meta, func(p *partXML, el xml.StartElement) error {
			if el.Name.Local == "Relationship" && strings.HasSuffix(attr(el, "Type"), "/officeDocument") {
				wbPart = resolve("", attr(el, "Target"))
			}
			return nil
		})
		if err != nil {
			return nil, err
		}
	}
	wbm := member(wbPart)
	if wbm == nil {
		return nil, fmt.Errorf("it has no workbook part (%s): %w", wbPart, ErrUnsupportedInput)
	}
	pkg := &packageInfo{sheetPart: map[string]*zip.File{}}
	var ids []string
	err := scanPart(wbm, meta, func(p *partXML, el xml.StartElement) error {
		switch el.Name.Local {
		case "sheet":
			if len(pkg.sheets) == maxSheets {
				return fmt.Errorf("it lists more than %d sheets: %w", maxSheets, ErrInputTooLarge)
			}
			pkg.sheets = append(pkg.sheets, attr(el, "name"))
			ids = append(ids, attr(el, "id"))
		case "workbookPr":
			v := attr(el, "date1904")
			pkg.date1904 = v == "1" || v == "true"
		}
		return nil
	})
	if err != nil {
		return nil, err
	}

	wanted := make(map[string]bool, len(ids))
	for _, id := range ids {
		wanted[id] = true
	}
	targets := map[string]string{}
	if m := member(path.Join(path.Dir(wbPart), "_rels", path.Base(wbPart)+".rels")); m != nil {
		err := scanPart(m, meta, func(p *partXML, el xml.StartElement) error {
			if el.Name.Local != "Relationship" || attr(el, "TargetMode") == "External" {
				return nil
			}
			target := resolve(wbPart, attr(el, "Target"))
			switch typ := attr(el, "Type"); {
			case strings.HasSuffix(typ, "/styles"):
				pkg.styles = member(target)
			case strings.HasSuffix(typ, "/sharedStrings"):
				pkg.sharedStrings = member(target)
			case wanted[attr(el, "Id")]:
				targets[attr(el, "Id")] = target
			}
			return nil
		})
		if err != nil {
			return nil, err
		}
	}
	if pkg.styles == nil {
		pkg.styles = member(path.Join(path.Dir(wbPart), "styles.xml"))
	}
	if pkg.sharedStrings == nil {
		pkg.sharedStrings = member(path.Join(path.Dir(wbPart), "sharedStrings.xml"))
	}
	for i, name := range pkg.sheets {
		if _, dup := pkg.sheetPart[name]; !dup {
			pkg.sheetPart[name] = member(targets[ids[i]])
		}
	}
	return pkg, nil
}

// scanPart reads a member to its end, handing each start element to f.
func scanPart(m *zip.File, lim xmlLimits, f func(p *partXML, el xml.StartElement) error) error {
	p, err := openPartXML(m, lim)
	if err != nil {
		return err
	}
	defer p.Close()
	for {
		tok, err := p.Token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return partError(m.Name, err)
		}
		if el, ok := tok.(xml.StartElement); ok {
			if err := f(p, el); err != nil {
				return err
			}
		}
	}
}

// isLimit reports an error that says an input is beyond the limits.
func isLimit(err error) bool { return errors.Is(err, ErrInputTooLarge) }

// partError says what is wrong with a part of the package other than a
// sheet: too large, or damaged.
func partError(name string, err error) error {
	if isLimit(err) {
		return err
	}
	return fmt.Errorf("its part %q is damaged (%v): %w", name, err, ErrUnsupportedInput)
}

// cellStyles is what the reader needs of the styles part: the number
// format of each cell format (cellXfs, which a cell's s attribute
// indexes), and the codes of the workbook's own number formats.
type cellStyles struct {
	numFmt []int
	custom map[int]string
}

// readStyles reads the styles part; nil reads as no styles.
func readStyles(m *zip.File) (*cellStyles, error) {
	st := &cellStyles{custom: map[int]string{}}
	if m == nil {
		return st, nil
	}
	meta := xmlLimits{depth: maxXMLDepth, elements: maxMetaXMLElements}
	err := scanPart(m, meta, func(p *partXML, el xml.StartElement) error {
		switch {
		case el.Name.Local == "numFmt" && p.parent(1) == "numFmts":
			id, err := strconv.Atoi(attr(el, "numFmtId"))
			if err == nil && len(st.custom) < excelize.MaxCellStyles {
				code := attr(el, "formatCode16")
				if code == "" {
					code = attr(el, "formatCode")
				}
				st.custom[id] = code
			}
		case el.Name.Local == "xf" && p.parent(1) == "cellXfs":
			// Beyond the most cell formats a spreadsheet allows, a cell
			// reads as unformatted.
			if len(st.numFmt) < excelize.MaxCellStyles {
				id, _ := strconv.Atoi(attr(el, "numFmtId"))
				st.numFmt = append(st.numFmt, id)
			}
		}
		return nil
	})
	return st, err
}

// sharedStrings is the workbook's table of shared strings: their texts end
// to end in one string, so that a cell, and every record read from it,
// shares the table's memory instead of copying its text.
type sharedStrings struct {
	text string
	ends []uint32
}

// len returns the number of entries.
func (s *sharedStrings) len() int { return len(s.ends) }

// get returns entry i.
func (s *sharedStrings) get(i int) (string, bool) {
	if i < 0 || i >= len(s.ends) {
		return "", false
	}
	start := uint32(0)
	if i > 0 {
		start = s.ends[i-1]
	}
	return s.text[start:s.ends[i]], true
}

// readSharedStrings reads the shared-strings part; nil reads as an empty
// table. An entry's text is its t elements, directly or in rich-text runs
// (r), end to end; phonetic runs (rPh) are left out, as a spreadsheet does
// in the cell's value.
func readSharedStrings(m *zip.File) (*sharedStrings, error) {
	s := &sharedStrings{}
	if m == nil {
		return s, nil
	}
	lim := xmlLimits{depth: maxXMLDepth, elements: maxSheetXMLElement}
	p, err := openPartXML(m, lim)
	if err != nil {
		return nil, err
	}
	defer p.Close()
	var buf []byte
	start := 0
	for {
		tok, err := p.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, partError(m.Name, err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if el.Name.Local == "si" {
				if len(s.ends) == maxSharedStrings {
					return nil, fmt.Errorf("its shared-strings table holds more than %d strings: %w", maxSharedStrings, ErrInputTooLarge)
				}
				start = len(buf)
			}
		case xml.CharData:
			if p.parent(0) == "t" && (p.parent(1) == "si" || p.parent(1) == "r" && p.parent(2) == "si") {
				buf = append(buf, el...)
			}
		case xml.EndElement:
			if el.Name.Local == "si" {
				buf = append(buf[:start], unescapeXstring(buf[start:])...)
				s.ends = append(s.ends, uint32(len(buf)))
			}
		}
	}
	s.text = string(buf)
	return s, nil
}

// unescapeXstring undoes the escaping of a spreadsheet string (ST_Xstring,
// ECMA-376 Part 1, §22.9.2.19): _xHHHH_ stands for the UTF-16 code unit
// HHHH, which is how characters that XML 1.0 cannot hold (a carriage
// return, a control character) are written, and _x005F_ for an underscore
// that would otherwise start such an escape. It writes into b's storage,
// since the text only shrinks.
func unescapeXstring(b []byte) []byte {
	if !bytes.Contains(b, []byte("_x")) {
		return b
	}
	unit := func(i int) (rune, bool) {
		if i+7 > len(b) || b[i] != '_' || b[i+1] != 'x' || b[i+6] != '_' {
			return 0, false
		}
		v, err := strconv.ParseUint(string(b[i+2:i+6]), 16, 16)
		return rune(v), err == nil
	}
	out := b[:0]
	for i := 0; i < len(b); {
		r, ok := unit(i)
		if !ok {
			out = append(out, b[i])
			i++
			continue
		}
		i += 7
		if utf16.IsSurrogate(r) {
			if r2, ok := unit(i); ok {
				if d := utf16.DecodeRune(r, r2); d != utf8.RuneError {
					r = d
					i += 7
				}
			}
		}
		out = utf8.AppendRune(out, r)
	}
	return out
}
