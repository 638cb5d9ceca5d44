package extract

import (
	"archive/zip"
	"bufio"
	"encoding/xml"
	"errors"
	"fmt"
	"io"

	"golang.org/x/net/html/charset"
)

// Bounds on the XML of one archive member, whatever its compression. A
// stored (uncompressed) member passes the compression-ratio check at any
// size, and encoding/xml keeps a record of every element still open, so
// that a few MB of nested elements would otherwise take gigabytes and
// minutes. Worksheet XML nests about seven deep (worksheet, sheetData,
// row, c, is, r, t) and the other parts read about as deep. A sheet or a
// shared-strings table may hold as many elements as a sheet may have cells
// (maxSheetCells), some 20 million more than MaxUnzippedBytes of worksheet
// XML holds, which encoding/xml reads in about three seconds (common
// practice, no source).
const (
	maxXMLDepth        = 64
	maxSheetXMLElement = maxSheetCells
	// maxMetaXMLElements bounds the package's other parts (relationships,
	// the workbook part, styles, shared strings apart): a spreadsheet
	// program's styles part holds at most some 65,000 cell formats.
	maxMetaXMLElements = 1 << 21
)

// xmlLimits bounds the XML of one part.
type xmlLimits struct {
	depth    int // elements open at once
	elements int // elements in all
}

// errXMLStructure marks XML that encoding/xml's RawToken reads but that is
// not well formed: an end tag that closes another element, or a part that
// ends with elements open.
var errXMLStructure = errors.New("the XML is not well formed")

// partXML streams the tokens of one archive member, refusing XML that nests
// deeper or holds more elements than its limits, and checking that end
// tags match, which RawToken leaves to its caller. Tokens are read raw:
// names keep their prefixes, and elements are matched by their local
// names, as writers of SpreadsheetML differ in their prefixes.
type partXML struct {
	name     string
	rc       io.ReadCloser
	dec      *xml.Decoder
	lim      xmlLimits
	open     []string // the local names of the open elements
	elements int
}

// openPartXML opens a member for reading as XML. The member was checked
// against its declared size when the archive was opened, and archive/zip
// stops a member that holds more than it declares.
func openPartXML(m *zip.File, lim xmlLimits) (*partXML, error) {
	rc, err := m.Open()
	if err != nil {
		return nil, fmt.Errorf("part %q cannot be opened (%v): %w", m.Name, err, ErrUnsupportedInput)
	}
	dec := xml.NewDecoder(bufio.NewReaderSize(rc, 64<<10))
	// An encoding other than UTF-8, declared in the XML declaration, is
	// read as excelize reads it.
	dec.CharsetReader = charset.NewReaderLabel
	return &partXML{name: m.Name, rc: rc, dec: dec, lim: lim, open: make([]string, 0, 16)}, nil
}

// Token returns the next token: io.EOF at the end of a whole part, an
// error wrapping ErrInputTooLarge beyond the limits, and any other error
// for XML that is damaged. A CharData token's bytes are valid until the
// next call.
func (p *partXML) Token() (xml.Token, error) {
	tok, err := p.dec.RawToken()
	if err != nil {
		if err == io.EOF && len(p.open) > 0 {
			return nil, fmt.Errorf("it ends inside <%s>: %w", p.open[len(p.open)-1], errXMLStructure)
		}
		return nil, err
	}
	switch el := tok.(type) {
	case xml.StartElement:
		p.elements++
		switch {
		case len(p.open) >= p.lim.depth:
			return nil, fmt.Errorf("part %q nests its XML elements more than %d deep (line %d): %w", p.name, p.lim.depth, p.line(), ErrInputTooLarge)
		case p.elements > p.lim.elements:
			return nil, fmt.Errorf("part %q holds more than %d XML elements: %w", p.name, p.lim.elements, ErrInputTooLarge)
		}
		p.open = append(p.open, el.Name.Local)
	case xml.EndElement:
		n := len(p.open)
		if n == 0 || p.open[n-1] != el.Name.Local {
			want := "nothing"
			if n > 0 {
				want = "<" + p.open[n-1] + ">"
			}
			return nil, fmt.Errorf("line %d: </%s> closes %s: %w", p.line(), el.Name.Local, want, errXMLStructure)
		}
		p.open = p.open[:n-1]
	}
	return tok, nil
}

// line is the line of the input the decoder has reached.
func (p *partXML) line() int {
	line, _ := p.dec.InputPos()
	return line
}

// depth is the number of elements open.
func (p *partXML) depth() int { return len(p.open) }

// parent returns the local name of the element n levels above the
// innermost open one (0 for the innermost), or "".
func (p *partXML) parent(n int) string {
	if i := len(p.open) - 1 - n; i >= 0 {
		return p.open[i]
	}
	return ""
}

// skip reads to the end of the element just started.
func (p *partXML) skip() error {
	for d := p.depth(); p.depth() >= d; {
		if _, err := p.Token(); err != nil {
			return err
		}
	}
	return nil
}

// Close closes the member.
func (p *partXML) Close() error { return p.rc.Close() }

// attr returns the value of the attribute with the given local name.
func attr(el xml.StartElement, name string) string {
	for _, a := range el.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}
