// Package output writes a report either to standard output or to a file,
// safely: a file is written under a temporary name beside its destination
// and renamed into place only when complete, and never over the input.
package output

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// ErrOutIsInput is returned when the report would be written over the input.
var ErrOutIsInput = errors.New("the output file is the input file")

// ErrExists is returned by Create when the file already exists.
var ErrExists = errors.New("file already exists")

// Target is where a report goes. Write to it, then Close to finish or
// Abort to throw a half-written file away.
type Target struct {
	w    io.Writer
	tmp  *os.File
	dest string
}

// Write implements io.Writer.
func (t *Target) Write(p []byte) (int, error) { return t.w.Write(p) }

// Open returns a Target writing to stdout when out is empty, else to the
// file out. It refuses an out that names the input (or one of the files of
// an input folder).
func Open(stdout io.Writer, out, input string) (*Target, error) {
	if out == "" {
		return &Target{w: stdout}, nil
	}
	if same(out, input) {
		return nil, fmt.Errorf("--out %s: %w", out, ErrOutIsInput)
	}
	if st, err := os.Stat(input); err == nil && st.IsDir() {
		if abs, err1 := filepath.Abs(out); err1 == nil {
			if dir, err2 := filepath.Abs(input); err2 == nil && filepath.Dir(abs) == dir && filepath.Ext(abs) == ".csv" {
				return nil, fmt.Errorf("--out %s would land among the input CSVs in %s: %w", out, input, ErrOutIsInput)
			}
		}
	}
	return openFile(out)
}

// Create is Open for a new file that must not exist yet.
func Create(path string) (*Target, error) {
	if _, err := os.Lstat(path); err == nil {
		return nil, fmt.Errorf("%s: %w", path, ErrExists)
	}
	return openFile(path)
}

func openFile(dest string) (*Target, error) {
	dir := filepath.Dir(dest)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(dest)+".tmp-*")
	if err != nil {
		return nil, fmt.Errorf("cannot write %s: %w", dest, err)
	}
	return &Target{w: tmp, tmp: tmp, dest: dest}, nil
}

// Close finishes the output: for a file, syncs and renames it into place.
func (t *Target) Close() error {
	if t.tmp == nil {
		return nil
	}
	name := t.tmp.Name()
	if err := t.tmp.Sync(); err != nil {
		t.tmp.Close()
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	if err := t.tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, t.dest); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	return nil
}

// Abort discards a partly written file.
func (t *Target) Abort() {
	if t.tmp != nil {
		t.tmp.Close()
		os.Remove(t.tmp.Name())
	}
}

// same reports whether two paths name the same file.
func same(a, b string) bool {
	sa, err1 := os.Stat(a)
	sb, err2 := os.Stat(b)
	if err1 == nil && err2 == nil {
		return os.SameFile(sa, sb)
	}
	aa, err1 := filepath.Abs(a)
	ab, err2 := filepath.Abs(b)
	return err1 == nil && err2 == nil && aa == ab
}
