package extract

import (
	"encoding/binary"
	"fmt"
	"math"
	"slices"
	"strings"
)

// heldCoefficients holds the coefficients sheet of a workbook or a folder
// while Open streams its claims: each row's cells packed end to end in one
// byte slice, read into Coefficients (readCoefficientInto, as Read reads
// them) only when a study that needs them is yielded.
//
// Why packed cells rather than Coefficients: a Coefficient takes some 500
// bytes before its texts, and held whole for the 200,000 coefficients of
// BenchmarkOpenWorkbook100k's workbook they kept `check` far above its
// memory target while the claims streamed; packed, a row takes its texts
// and a few bytes a cell. Why not a first
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
	// studies are the studies in the order of their first row, each with
	// the chain of its rows; named is how they are found while the sheet
	// is read, sorted (their indexes by name) once it has been, since a
	// map of as many studies as claims takes twice the memory.
	studies []heldStudy
	named   map[string]int32
	sorted  []int32
	// odd holds, by row, what few rows have: a reader's problem, or a
	// number of fields other than the header's (sheetRow).
	odd map[int32]oddRow
}

// heldRow is one row of a held sheet: where its cells start in cells, its
// row number and the next row of its study (−1 at the end).
type heldRow struct {
	start     uint32
	row, next int32
}

// oddRow is what a held row has that most rows do not.
type oddRow struct {
	fields  int
	problem error
}

// heldStudy is a study of the held rows: its name, as Read gives it to
// Coefficient.Study, its first and last row, and whether a study of
// claims has taken its coefficients (take).
type heldStudy struct {
	name        string
	first, last int32
	taken       bool
}

// holdCoefficientSheet reads the coefficients sheet once and holds its
// rows packed. It returns the sheet's problems, as readCoefficientSheet
// does, and a fatal error from the source.
func holdCoefficientSheet(src rowSource, pos Position) (*heldCoefficients, []*CellError, error) {
	h := &heldCoefficients{pos: pos, named: map[string]int32{}, odd: map[int32]oddRow{}}
	var rr rowReading
	var tooMany error
	cols, err := readSheet(src, pos, nameSet(coefficientColumnNames), func(cols *columns, row *sheetRow) bool {
		if h.cols == nil {
			cols.require("study", "label", "estimate")
			h.cols, h.cc = cols, lookupCoefficientColumns(cols, "")
		}
		if len(h.rows) == math.MaxInt32 || len(h.cells) > math.MaxUint32-MaxRecordBytes {
			tooMany = fmt.Errorf("%s: the coefficients sheet holds more than %d rows or %d GiB: %w", pos, math.MaxInt32, math.MaxUint32>>30, ErrInputTooLarge)
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
	h.sort()
	return h, sheetProblems(cols, pos, "coefficients"), err
}

// add holds one row of study.
func (h *heldCoefficients) add(study string, row *sheetRow) {
	i := int32(len(h.rows))
	if row.Problem != nil || row.Fields > 0 && row.Fields != h.cols.width {
		h.odd[i] = oddRow{fields: row.Fields, problem: row.Problem}
	}
	h.rows = append(h.rows, heldRow{start: uint32(len(h.cells)), row: int32(row.Row), next: -1})
	h.cells = packRow(h.cells, row.Cells)
	k, seen := h.named[study]
	if !seen {
		// A copy: the cell may be cut from a CSV line, which it would
		// keep alive (until sort).
		study = strings.Clone(study)
		h.named[study] = int32(len(h.studies))
		h.studies = append(h.studies, heldStudy{name: study, first: i, last: i})
		return
	}
	st := &h.studies[k]
	h.rows[st.last].next = i
	st.last = i
}

// sort indexes the studies by name, in place of named, once the sheet
// has been read, and copies their names into one string, since each
// string of its own takes an allocation (BenchmarkOpenWorkbook100k).
func (h *heldCoefficients) sort() {
	var b strings.Builder
	for _, st := range h.studies {
		b.WriteString(st.name)
	}
	names := b.String()
	for i := range h.studies {
		n := len(h.studies[i].name)
		h.studies[i].name, names = names[:n], names[n:]
	}
	h.sorted = make([]int32, len(h.studies))
	for i := range h.sorted {
		h.sorted[i] = int32(i)
	}
	slices.SortFunc(h.sorted, func(a, b int32) int { return strings.Compare(h.studies[a].name, h.studies[b].name) })
	h.named = nil
}

// find returns the held study of a name, or nil.
func (h *heldCoefficients) find(name string) *heldStudy {
	i, ok := slices.BinarySearchFunc(h.sorted, name, func(k int32, name string) int { return strings.Compare(h.studies[k].name, name) })
	if !ok {
		return nil
	}
	return &h.studies[h.sorted[i]]
}

// of returns the coefficients of a study in input order, read from their
// held rows, each call a fresh copy.
func (h *heldCoefficients) of(study string) []Coefficient {
	st := h.find(study)
	if st == nil {
		return nil
	}
	var (
		out []Coefficient
		rr  rowReading
		row sheetRow
	)
	for i := st.first; i >= 0; i = h.rows[i].next {
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
	st := h.find(study)
	if st == nil {
		return nil, false
	}
	before := st.taken
	st.taken = true
	return h.of(study), before
}

// untaken lists the studies whose coefficients were never taken, in the
// order of their first row.
func (h *heldCoefficients) untaken() []string {
	var out []string
	for _, st := range h.studies {
		if !st.taken {
			out = append(out, st.name)
		}
	}
	return out
}

// unpack fills row with held row i; its texts are new strings.
func (h *heldCoefficients) unpack(i int32, row *sheetRow) {
	r, o := h.rows[i], h.odd[i]
	// A row of as many fields as the header reads as one that does not
	// say (a workbook's): rowReading.start checks only the others.
	row.Row, row.Fields, row.Problem, row.AfterBlank = int(r.row), o.fields, o.problem, false
	row.Cells = unpackRow(h.cells[r.start:], row.Cells[:0])
}

// packRow appends a row's cells to b: their number, then for each twice
// the length of its text, plus 1 for a numeric cell, and the text, and for
// a numeric cell the length and bytes of its displayed text.
func packRow(b []byte, cells []sheetCell) []byte {
	b = binary.AppendUvarint(b, uint64(len(cells)))
	for _, c := range cells {
		numeric := uint64(0)
		if c.Numeric {
			numeric = 1
		}
		b = binary.AppendUvarint(b, uint64(len(c.Text))<<1|numeric)
		b = append(b, c.Text...)
		if c.Numeric {
			b = binary.AppendUvarint(b, uint64(len(c.Display)))
			b = append(b, c.Display...)
		}
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
	text := func(n uint64) string {
		s := string(b[:n])
		b = b[n:]
		return s
	}
	for n := next(); n > 0; n-- {
		v := next()
		c := sheetCell{Text: text(v >> 1), Numeric: v&1 == 1}
		if c.Numeric {
			c.Display = text(next())
		}
		cells = append(cells, c)
	}
	return cells
}
