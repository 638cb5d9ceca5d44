package report

import (
	"bufio"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"os"
)

// heldMethods keeps the rows of the xlsx report's methods sheet in a
// temporary file of dir (the system's temporary folder when empty) as the
// claims arrive, and the sheet is written from it at the workbook's end.
// Why a file: excelize's StreamWriter keeps the buffer of every sheet it
// streams until the workbook is written, more than StreamChunkSize for a
// sheet longer than that, so a sheet streamed while the claims arrive
// holds its buffer beside the input the reader still holds. With the
// claims and methods sheets both streamed so, the xlsx report of
// BenchmarkReadWorkbook100k's workbook of 140,000 claims
// (-large-workbook-claims) passed its memory target (/usr/bin/time -v).
// Gob rather than CSV, since a CSV reader turns a "\r\n" inside a field
// into "\n".
type heldMethods struct {
	dir  string
	file *os.File
	w    *bufio.Writer
	enc  *gob.Encoder
}

// methodsRow is one row of the methods sheet: the claim's source row,
// study, claim and outcome, and its methods paragraph (empty when none
// was written).
type methodsRow struct {
	Row                   int
	Study, Claim, Outcome string
	Methods               string
}

func (h *heldMethods) add(r methodsRow) error {
	if h.enc == nil {
		f, err := os.CreateTemp(h.dir, "methods-*.gob")
		if err != nil {
			return fmt.Errorf("a temporary file for the methods sheet: %w", err)
		}
		h.file, h.w = f, bufio.NewWriter(f)
		h.enc = gob.NewEncoder(h.w)
	}
	return h.enc.Encode(r)
}

// each calls fn with the held rows, from the first.
func (h *heldMethods) each(fn func(methodsRow) error) error {
	if h.enc == nil {
		return nil
	}
	if err := h.w.Flush(); err != nil {
		return err
	}
	if _, err := h.file.Seek(0, io.SeekStart); err != nil {
		return err
	}
	dec := gob.NewDecoder(bufio.NewReader(h.file))
	for {
		var r methodsRow
		if err := dec.Decode(&r); errors.Is(err, io.EOF) {
			return nil
		} else if err != nil {
			return err
		}
		if err := fn(r); err != nil {
			return err
		}
	}
}

// close removes the temporary file.
func (h *heldMethods) close() {
	if h.file != nil {
		h.file.Close()
		os.Remove(h.file.Name())
		h.file = nil
	}
}
