package extract

import (
	"encoding/binary"
	"fmt"
	"math"
	"strings"
)

// heldCoefficients holds the coefficients sheet of a workbook or a folder
// while Open streams its claims: each row's cells packed end to end in one
// byte slice, read into Coefficients (readCoefficientInto, as Read reads
// them) only when a study that needs them is yielded.
//
// Why packed cells rather than Coefficients: a Coefficient takes some 500
// bytes before its texts, and held whole for a workbook of 200,000 of
// them they kept `check` near 350 MB while the claims streamed (the
// workbook of BenchmarkReadWorkbook100k; BenchmarkOpenWorkbook100k);
// packed, a row takes its texts and a few bytes a cell. Why not a first
// pass that indexes each study's rows and reads them again when the study
// comes: a sheet of a workbook is a deflated zip member, which can be read
// only from its start, so each study would re-read the sheet. Reading a
// row from the same cells, with the same header, gives the same
// Coefficient and the same problems as Read; a label used twice in a
// study is flagged within the study (checkDuplicateLabels), as Read flags
// it over the sheet, since its key holds the study.
type heldCoefficients struct {
	pos  Position
	cols *columns // the header; nil for a sheet without one
	cc   coefficientColumns
	// cells are the rows' cells, packed (packRow).
	cells []byte
	rows  []heldRow
	// byStudy chains the rows of each study, keyed by the study cell as
	// Read gives it to Coefficient.Study; order lists the studies in the
	// order of their first row.
	byStudy map[string]rowChain
	order   []string
	// problems are what the reader found wrong with a row (heldRow.problem).
	problems []error
}

// heldRow is one row of a held sheet: where its cells start in cells, its
// row number and field count (sheetRow), the next row of its study (−1 at
// the end) and its reader problem (an index into problems, −1 for none).
type heldRow struct {
	start         int
	row, fields   int32
	next, problem int32
}

// rowChain is the first and last row of a study among the held rows, and
// whether a study of claims has taken them (take).
type rowChain struct {
	first, last int32
	taken       bool
}

// holdCoefficientSheet reads the coefficients sheet once and holds its
// rows packed. It returns the sheet's problems, as readCoefficientSheet
// does, and a fatal error from the source.
func holdCoefficientSheet(src rowSource, pos Position) (*heldCoefficients, []*CellError, error) {
	h := &heldCoefficients{pos: pos, byStudy: map[string]rowChain{}}
	var rr rowReading
	var tooMany error
	cols, err := readSheet(src, pos, nameSet(coefficientColumnNames), func(cols *columns, row *sheetRow) bool {
		if h.cols == nil {
			cols.require("study", "label", "estimate")
			h.cols, h.cc = cols, lookupCoefficientColumns(cols, "")
		}
		if len(h.rows) == math.MaxInt32 {
			tooMany = fmt.Errorf("%s: the coefficients sheet holds more than %d rows: %w", pos, math.MaxInt32, ErrInputTooLarge)
			return false
		}
		rr.start(cols, row, pos)
		study := rr.text(h.cc.study)
		if h.cc.study >= 0 && h.cc.study < len(row.Cells) {
			// Not held: the study's name stands for it (unpack).
			row.Cells[h.cc.study] = sheetCell{}
		}
		h.add(study, row)
		return true
	})
	if cols != nil && h.cols == nil {
		cols.require("study", "label", "estimate")
	}
	if err == nil {
		err = tooMany
	}
	return h, sheetProblems(cols, pos, "coefficients"), err
}

// add holds one row of study.
func (h *heldCoefficients) add(study string, row *sheetRow) {
	i := int32(len(h.rows))
	r := heldRow{start: len(h.cells), row: int32(row.Row), fields: int32(row.Fields), next: -1, problem: -1}
	if row.Problem != nil {
		r.problem = int32(len(h.problems))
		h.problems = append(h.problems, row.Problem)
	}
	h.rows = append(h.rows, r)
	h.cells = packRow(h.cells, row.Cells)
	ch, seen := h.byStudy[study]
	if !seen {
		// A copy: the cell may be cut from a CSV line, which it would
		// keep alive.
		study = strings.Clone(study)
		h.order = append(h.order, study)
		h.byStudy[study] = rowChain{first: i, last: i}
		return
	}
	h.rows[ch.last].next = i
	ch.last = i
	h.byStudy[study] = ch
}

// of returns the coefficients of a study in input order, read from their
// held rows, each call a fresh copy.
func (h *heldCoefficients) of(study string) []Coefficient {
	ch, ok := h.byStudy[study]
	if !ok {
		return nil
	}
	var (
		out []Coefficient
		rr  rowReading
		row sheetRow
	)
	for i := ch.first; i >= 0; i = h.rows[i].next {
		h.unpack(i, &row)
		if h.cc.study >= 0 && h.cc.study < len(row.Cells) {
			// The study cell, as the row is read: its trimmed text.
			row.Cells[h.cc.study] = sheetCell{Text: study}
		}
		rr.start(h.cols, &row, h.pos)
		out = append(out, Coefficient{})
		readCoefficientInto(&rr, &h.cc, &out[len(out)-1])
	}
	checkDuplicateLabels(out)
	return out
}

// take is of for a study of claims, and reports whether its coefficients
// were taken before.
func (h *heldCoefficients) take(study string) ([]Coefficient, bool) {
	ch, ok := h.byStudy[study]
	if !ok {
		return nil, false
	}
	before := ch.taken
	if !before {
		ch.taken = true
		h.byStudy[study] = ch
	}
	return h.of(study), before
}

// untaken lists the studies whose coefficients were never taken, in the
// order of their first row.
func (h *heldCoefficients) untaken() []string {
	var out []string
	for _, name := range h.order {
		if !h.byStudy[name].taken {
			out = append(out, name)
		}
	}
	return out
}

// unpack fills row with held row i; its texts are new strings.
func (h *heldCoefficients) unpack(i int32, row *sheetRow) {
	r := h.rows[i]
	row.Row, row.Fields, row.Problem, row.AfterBlank = int(r.row), int(r.fields), nil, false
	if r.problem >= 0 {
		row.Problem = h.problems[r.problem]
	}
	row.Cells = unpackRow(h.cells[r.start:], row.Cells[:0])
}

// packRow appends a row's cells to b: their number, then for each a byte
// that is 1 for a numeric cell, the length and bytes of its text, and for
// a numeric cell those of its displayed text.
func packRow(b []byte, cells []sheetCell) []byte {
	b = binary.AppendUvarint(b, uint64(len(cells)))
	for _, c := range cells {
		text := func(s string) {
			b = binary.AppendUvarint(b, uint64(len(s)))
			b = append(b, s...)
		}
		if c.Numeric {
			b = append(b, 1)
			text(c.Text)
			text(c.Display)
			continue
		}
		b = append(b, 0)
		text(c.Text)
	}
	return b
}

// unpackRow reads the cells of a row packed at the start of b into cells.
func unpackRow(b []byte, cells []sheetCell) []sheetCell {
	next := func() uint64 {
		v, k := binary.Uvarint(b)
		b = b[k:]
		return v
	}
	text := func() string {
		n := next()
		s := string(b[:n])
		b = b[n:]
		return s
	}
	for n := next(); n > 0; n-- {
		numeric := b[0] == 1
		b = b[1:]
		c := sheetCell{Text: text(), Numeric: numeric}
		if numeric {
			c.Display = text()
		}
		cells = append(cells, c)
	}
	return cells
}
