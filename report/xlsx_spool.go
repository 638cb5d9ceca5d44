package report

import (
	"bufio"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"os"
)

// spool keeps values in a temporary file of dir (the system's temporary
// folder when empty) until the xlsx report's end reads them back in the
// order they came. The xlsx report spools what it can only write at its
// end but must not hold in memory (heldCoefficients, the methods rows).
// The values are gob-encoded: a CSV file would do for rows of text, but a
// CSV reader turns a "\r\n" inside a field into "\n".
type spool[T any] struct {
	dir, what string // what names the values, for errors
	file      *os.File
	w         *bufio.Writer
	enc       *gob.Encoder
}

// add writes v to the spool, creating its file at the first value.
func (s *spool[T]) add(v T) error {
	if s.enc == nil {
		f, err := os.CreateTemp(s.dir, "coefaudit-*.gob")
		if err != nil {
			return fmt.Errorf("a temporary file for %s: %w", s.what, err)
		}
		s.file, s.w = f, bufio.NewWriter(f)
		s.enc = gob.NewEncoder(s.w)
	}
	if err := s.enc.Encode(v); err != nil {
		return fmt.Errorf("a temporary file for %s: %w", s.what, err)
	}
	return nil
}

// each calls fn with the spooled values, from the first.
func (s *spool[T]) each(fn func(T) error) error {
	if s.enc == nil {
		return nil
	}
	if err := s.w.Flush(); err != nil {
		return fmt.Errorf("a temporary file for %s: %w", s.what, err)
	}
	if _, err := s.file.Seek(0, io.SeekStart); err != nil {
		return fmt.Errorf("a temporary file for %s: %w", s.what, err)
	}
	dec := gob.NewDecoder(bufio.NewReader(s.file))
	for {
		var v T
		if err := dec.Decode(&v); errors.Is(err, io.EOF) {
			return nil
		} else if err != nil {
			return fmt.Errorf("a temporary file for %s: %w", s.what, err)
		}
		if err := fn(v); err != nil {
			return err
		}
	}
}

// close removes the temporary file.
func (s *spool[T]) close() {
	if s.file != nil {
		s.file.Close()
		os.Remove(s.file.Name())
		s.file = nil
	}
}
