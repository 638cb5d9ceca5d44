package article

import (
	"errors"
	"fmt"
	"strings"
	"unicode"

	"coefaudit/extract"
)

var (
	errTooManyCells = fmt.Errorf("a table holds more than %d cells: %w", MaxTableCells, extract.ErrInputTooLarge)
	errTextTooLong  = fmt.Errorf("a cell or paragraph is longer than %d bytes: %w", MaxTextBytes, extract.ErrInputTooLarge)
	errTooDeep      = fmt.Errorf("elements nest more than %d deep: %w", extract.MaxXMLDepth, extract.ErrInputTooLarge)
	errTooManyItems = fmt.Errorf("more than %d tables or paragraphs: %w", MaxTableCells, extract.ErrInputTooLarge)
)

// textBuf gathers the text of one cell, caption or paragraph, refusing
// more than MaxTextBytes.
type textBuf struct {
	b    strings.Builder
	bold bool // some of the text was bold
	all  bool // every non-space character was bold
	seen bool // some non-space character came
}

func (t *textBuf) add(s string, bold bool) error {
	if t.b.Len()+len(s) > MaxTextBytes {
		return errTextTooLong
	}
	if strings.TrimSpace(s) != "" {
		if !t.seen {
			t.all = bold
		} else if !bold {
			t.all = false
		}
		t.seen = true
		t.bold = t.bold || bold
	}
	t.b.WriteString(s)
	return nil
}

// String returns the text with runs of white space made one space.
func (t *textBuf) String() string { return squeeze(t.b.String()) }

// squeeze makes every run of white space one space and trims the ends.
func squeeze(s string) string {
	return strings.Join(strings.FieldsFunc(s, unicode.IsSpace), " ")
}

// tableDraft gathers one table as a reader meets it.
type tableDraft struct {
	label, caption string
	foot           []string
	raw            [][]rawCell
	head           []bool
	cells          int
}

// row starts a row.
func (d *tableDraft) row(head bool) error {
	if len(d.raw) >= MaxTableCells {
		return errTooManyCells
	}
	d.raw = append(d.raw, nil)
	d.head = append(d.head, head)
	return nil
}

// cell adds a cell to the current row (starting one if none is open).
func (d *tableDraft) cell(t *textBuf, rowSpan, colSpan int, header bool) error {
	if len(d.raw) == 0 {
		if err := d.row(header); err != nil {
			return err
		}
	}
	if d.cells++; d.cells > MaxTableCells {
		return errTooManyCells
	}
	r := len(d.raw) - 1
	d.raw[r] = append(d.raw[r], rawCell{Cell: Cell{Text: t.String(), Bold: t.seen && t.all}, rowSpan: rowSpan, colSpan: colSpan})
	return nil
}

// table finishes the draft.
func (d *tableDraft) table() (Table, error) {
	rows, err := grid(d.raw, d.head)
	if err != nil {
		return Table{}, err
	}
	return Table{Label: d.label, Caption: d.caption, Foot: d.foot, Rows: rows}, nil
}

// fileError names the file in an error of a reader.
func fileError(file string, err error) error {
	if errors.Is(err, extract.ErrInputTooLarge) || errors.Is(err, extract.ErrUnsupportedInput) || errors.Is(err, ErrNotArticle) {
		return fmt.Errorf("%s: %w", file, err)
	}
	return fmt.Errorf("%s is damaged (%v): %w", file, err, extract.ErrUnsupportedInput)
}
