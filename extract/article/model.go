package article

import (
	"errors"
	"fmt"
)

// Limits of the article readers (common practice, no source): an article
// file is far smaller than MaxArticleBytes, a table cell or a paragraph far
// shorter than MaxTextBytes, and a table far smaller than MaxTableCells.
// Beyond a limit the file is refused with an error wrapping
// extract.ErrInputTooLarge that names it; the other files go on.
const (
	MaxArticleBytes = 32 << 20
	MaxTextBytes    = 1 << 20
	MaxTableCells   = 1 << 16
	MaxSpan         = 1000
)

// Format names of the readers.
const (
	FormatJATS = "jats"
	FormatHTML = "html"
	FormatDOCX = "docx"
	FormatText = "text"
)

// ErrNotArticle is returned for a file that none of the readers takes.
var ErrNotArticle = errors.New("not an article")

// Article is what a reader found in one file: its tables and paragraphs,
// in the order printed, and the study key taken from it.
type Article struct {
	File   string
	Format string
	// Study is the study key: the first author's surname and the year,
	// else the DOI, else the file's name.
	Study      string
	Tables     []Table
	Paragraphs []Paragraph
}

// Table is one printed table: its label ("Table 2"), caption, footnotes
// and cells, spans expanded into a grid (see grid).
type Table struct {
	Label   string
	Caption string
	Foot    []string
	Rows    []Row
}

// Row is one table row; Head marks a header row (thead, th cells).
type Row struct {
	Cells []Cell
	Head  bool
}

// Cell is one cell of the grid: its whole text (stars in superscripts or
// footnote links included), and whether it was printed bold.
type Cell struct {
	Text string
	Bold bool
}

// Paragraph is one paragraph of the article's text with its place.
type Paragraph struct {
	Place string
	Text  string
}

// name returns the table's label, or "table N" by its place.
func (t *Table) name(i int) string {
	if t.Label != "" {
		return t.Label
	}
	return fmt.Sprintf("table %d", i+1)
}

// rawCell is a cell before spans are expanded.
type rawCell struct {
	Cell
	rowSpan, colSpan int
}

// grid expands rowspan and colspan: a header cell is repeated over the
// columns and rows it spans (so that "Model 1" heads each of its columns),
// a body cell stands in its first position only, the others blank (so that
// a predictor's name spanning its estimate and SE rows is not read twice).
// It fails beyond MaxTableCells, counting the positions spans fill.
func grid(raw [][]rawCell, head []bool) ([]Row, error) {
	var rows []Row
	pending := map[[2]int]Cell{} // positions filled by a rowspan above
	cells := 0
	for r, rr := range raw {
		var out []Cell
		fill := func() {
			for {
				c, ok := pending[[2]int{r, len(out)}]
				if !ok {
					return
				}
				delete(pending, [2]int{r, len(out)})
				out = append(out, c)
			}
		}
		for _, rc := range rr {
			fill()
			rs, cs := min(max(rc.rowSpan, 1), MaxSpan), min(max(rc.colSpan, 1), MaxSpan)
			rs = min(rs, len(raw)-r)
			if cells += rs * cs; cells > MaxTableCells {
				return nil, errTooManyCells
			}
			for k := 0; k < cs; k++ {
				c := rc.Cell
				if k > 0 && !head[r] {
					c = Cell{}
				}
				start := len(out)
				out = append(out, c)
				for d := 1; d < rs; d++ {
					below := c
					if !head[r] {
						below = Cell{}
					}
					pending[[2]int{r + d, start}] = below
				}
			}
		}
		fill()
		rows = append(rows, Row{Cells: out, Head: head[r]})
	}
	return rows, nil
}
