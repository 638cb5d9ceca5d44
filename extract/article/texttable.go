package article

import (
	"fmt"
	"regexp"
	"sort"
	"strings"
	"unicode"
)

// textLine is one line of a text article and its number, from 1.
type textLine struct {
	n    int
	text string
}

// textCell is one cell of a line of a text table and the columns it takes:
// runes, for a table aligned by spaces; fields, for one separated by tabs.
type textCell struct {
	text       string
	start, end int
}

// columnNumber matches a correlation table's column heading: "1", "2.", "(3)".
var columnNumber = regexp.MustCompile(`^\(?\d{1,2}[.)]?$`)

// cellsOf splits a line of a text table into its cells: at each tab when
// the line has one (each tab starts a field, so that empty cells keep
// their place), else at each run of two or more spaces.
func cellsOf(line string) []textCell {
	var out []textCell
	if strings.Contains(line, "\t") {
		for k, f := range strings.Split(line, "\t") {
			if f = strings.TrimSpace(f); f != "" {
				out = append(out, textCell{text: f, start: k, end: k + 1})
			}
		}
		return out
	}
	runes := []rune(line)
	for i := 0; i < len(runes); {
		for i < len(runes) && unicode.IsSpace(runes[i]) {
			i++
		}
		if i == len(runes) {
			break
		}
		start, end := i, i
		for i < len(runes) {
			if !unicode.IsSpace(runes[i]) {
				i++
				end = i
				continue
			}
			j := i
			for j < len(runes) && unicode.IsSpace(runes[j]) {
				j++
			}
			if j-i >= 2 || j == len(runes) {
				break // two spaces end a cell; one is inside it
			}
			i = j
		}
		out = append(out, textCell{text: string(runes[start:end]), start: start, end: end})
	}
	return out
}

// stub reports whether a cell is a line's first column, the row's name.
func stub(cells []textCell, k int) bool { return k == 0 && cells[0].start == 0 }

// headerLine reports whether a line of a text table is a header line: a
// line with a cell past the row names, whose cells past them hold no
// number but column headings ("B", "95% CI", "(1)", "Model 2", "1").
func headerLine(cells []textCell) bool {
	if len(cells) == 0 || len(cells) == 1 && cells[0].start == 0 {
		return false
	}
	if stub(cells, 0) && numberedName.MatchString(cells[0].text) {
		return false
	}
	for k, c := range cells {
		if stub(cells, k) || strings.IndexFunc(c.text, unicode.IsDigit) < 0 || columnNumber.MatchString(c.text) || roleOf(c.text).role != "" {
			continue
		}
		return false
	}
	return true
}

// tableRun finds a text table starting at lines[i]: the lines from there
// with two or more cells, with the one-cell lines between them (a stacked
// model's "Model 2") and the indented ones right after the last (an SE
// row), up to a note. It is a table when at least two of its lines have
// cells and one names a column the table readers know (B, SE, β, t, p, a
// CI, OR, "(1)", "Model 1", M, SD, n) or, as correlation tables do, two
// columns by number. It returns the end of the run and whether it is one.
func tableRun(lines []textLine, i int) (int, bool) {
	if len(cellsOf(lines[i].text)) < 2 {
		return i, false
	}
	end, multi, known := i, 0, false
	for j := i; j < len(lines); j++ {
		cells := cellsOf(lines[j].text)
		switch {
		case len(cells) >= 2:
			end, multi = j+1, multi+1
			numbers := 0
			for k, c := range cells {
				if stub(cells, k) {
					continue
				}
				known = known || roleOf(c.text).role != ""
				if columnNumber.MatchString(c.text) {
					numbers++
				}
			}
			known = known || numbers >= 2 && headerLine(cells)
			continue
		case len(cells) == 1 && cells[0].start > 0 && end == j:
			end = j + 1 // an indented cell right after a row: its SE
			continue
		case len(cells) == 1 && !isTableNote(cells[0].text) && !tableLabel.MatchString(cells[0].text):
			continue // kept only if a line with cells follows
		}
		break
	}
	return end, multi >= 2 && known
}

// textTable makes a table of the lines of a text table: columns are the
// runs of positions the cells of its rows take (the header lines above
// the lowest left out, since their headings span columns), and each
// heading of those upper lines spans the columns under it and the columns
// to its right up to the next heading, as a spanning heading is printed
// over the first of its columns. The leading header lines are its header
// rows.
func textTable(lines []textLine) ([]Row, error) {
	cells := make([][]textCell, len(lines))
	head := 0
	for i, l := range lines {
		cells[i] = cellsOf(l.text)
		if head == i && headerLine(cells[i]) && i+1 < len(lines) {
			head++
		}
	}
	// The columns: the union of the places of the cells of the lowest
	// header line and the body, runs of one-cell lines at the left out
	// (a label there may run over several columns).
	var spans [][2]int
	for i := max(head-1, 0); i < len(cells); i++ {
		if len(cells[i]) == 1 && cells[i][0].start == 0 {
			continue
		}
		for _, c := range cells[i] {
			spans = append(spans, [2]int{c.start, c.end})
		}
	}
	sort.Slice(spans, func(a, b int) bool { return spans[a][0] < spans[b][0] })
	var cols [][2]int
	for _, s := range spans {
		if n := len(cols); n > 0 && s[0] < cols[n-1][1] {
			cols[n-1][1] = max(cols[n-1][1], s[1])
			continue
		}
		cols = append(cols, s)
	}
	if len(cols) == 0 {
		return nil, nil
	}
	if len(lines)*len(cols) > MaxTableCells {
		return nil, errTooManyCells
	}
	// colOf gives the columns a cell overlaps, else the next to its
	// right; cols are in order and apart, so that a search finds them.
	colOf := func(c textCell) (first, last int) {
		first = sort.Search(len(cols), func(k int) bool { return cols[k][1] > c.start })
		if first == len(cols) {
			return len(cols) - 1, len(cols) - 1
		}
		last = first
		for last+1 < len(cols) && cols[last+1][0] < c.end {
			last++
		}
		return first, last
	}
	rows := make([]Row, len(lines))
	for i := range lines {
		out := make([]Cell, len(cols))
		upper := i < head-1
		covered := make([]bool, len(cols))
		for _, c := range cells[i] {
			first, last := colOf(c)
			if !upper {
				last = first
			}
			for k := first; k <= last; k++ {
				if out[k].Text != "" {
					out[k].Text += " " + c.text // two cells over one column: kept, not lost
				} else {
					out[k].Text = c.text
				}
				covered[k] = true
			}
		}
		if upper {
			for k := 2; k < len(cols); k++ {
				if !covered[k] && covered[k-1] && out[k-1].Text != "" {
					out[k], covered[k] = out[k-1], true
				}
			}
		}
		rows[i] = Row{Cells: out, Head: i < head}
	}
	return rows, nil
}

// textReader is the state of ReadText: the article so far, and what may
// attach to a table (a caption paragraph before it, notes after it).
type textReader struct {
	art *Article
	// caption is set when the last paragraph is a table's label and
	// caption ("Table 2. Regressions …"), which the table after it takes.
	caption bool
	// notesFor is the table (from 1) whose notes may follow.
	notesFor int
}

// block reads a run of lines between blank lines: its text tables, each
// with the caption line just before it and the note lines after it, and
// its other lines as paragraphs.
func (r *textReader) block(lines []textLine) error {
	var prose []textLine
	for i := 0; i < len(lines); {
		end, ok := tableRun(lines, i)
		if !ok {
			// No table starts later in the run either (its lines are a
			// part of these): the run is passed over at once.
			end = max(end, i+1)
			prose = append(prose, lines[i:end]...)
			i = end
			continue
		}
		t := Table{}
		switch n := len(prose); {
		case n >= 2 && bareLabel(prose[n-2].text):
			t.Label, _ = splitLabel(squeeze(prose[n-2].text))
			t.Caption, prose = squeeze(prose[n-1].text), prose[:n-2]
		case n >= 1 && tableLabel.MatchString(squeeze(prose[n-1].text)):
			t.Label, t.Caption = splitLabel(squeeze(prose[n-1].text))
			prose = prose[:n-1]
		case n == 0 && r.caption:
			last := r.art.Paragraphs[len(r.art.Paragraphs)-1]
			r.art.Paragraphs = r.art.Paragraphs[:len(r.art.Paragraphs)-1]
			t.Label, t.Caption = splitLabel(last.Text)
		}
		if err := r.paragraph(prose); err != nil {
			return err
		}
		prose = nil
		if t.Label == "" {
			t.Label = fmt.Sprintf("text table at line %d", lines[i].n)
		}
		rows, err := textTable(lines[i:end])
		if err != nil {
			return err
		}
		t.Rows = rows
		for i = end; i < len(lines); i++ {
			switch s := squeeze(lines[i].text); {
			case isTableNote(s):
				t.Foot = append(t.Foot, s)
				continue
			case len(t.Foot) > 0:
				t.Foot[len(t.Foot)-1] += " " + s // a note's next line
				continue
			}
			break
		}
		if len(r.art.Tables) >= MaxTableCells {
			return errTooManyItems
		}
		r.art.Tables = append(r.art.Tables, t)
		r.notesFor, r.caption = len(r.art.Tables), false
	}
	return r.paragraph(prose)
}

// bareLabel reports a line that is a table's label alone: "Table 2".
func bareLabel(s string) bool {
	return tableLabel.MatchString(s) && strings.TrimSpace(tableLabel.ReplaceAllString(s, "")) == ""
}

// paragraph adds lines as one paragraph; a note right after a table is
// the table's.
func (r *textReader) paragraph(lines []textLine) error {
	if len(lines) == 0 {
		return nil
	}
	texts := make([]string, len(lines))
	for i, l := range lines {
		texts[i] = l.text
	}
	text := squeeze(strings.Join(texts, " "))
	if len(text) > MaxTextBytes {
		return errTextTooLong
	}
	if r.notesFor > 0 && isTableNote(text) {
		t := &r.art.Tables[r.notesFor-1]
		t.Foot = append(t.Foot, text)
		return nil
	}
	if len(r.art.Paragraphs) >= MaxTableCells {
		return errTooManyItems
	}
	r.notesFor = 0
	r.caption = len(lines) <= 2 && tableLabel.MatchString(text)
	r.art.Paragraphs = append(r.art.Paragraphs, Paragraph{Place: fmt.Sprintf("paragraph %d", len(r.art.Paragraphs)+1), Text: text})
	return nil
}
