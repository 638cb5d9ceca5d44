// Package output writes a report either to standard output or to a file,
// safely: a regular file is written under a temporary name beside its
// destination and renamed into place only when complete, and never over the
// input. A destination that exists and is not a regular file (a device such
// as /dev/null, a FIFO, /dev/stdout) is written in place, never replaced; a
// symbolic link is followed, never replaced.
package output

import (
	"bufio"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// ErrOutIsInput is returned when the report would be written over the input.
var ErrOutIsInput = errors.New("the output file is the input file")

// ErrExists is returned by Create when the file already exists.
var ErrExists = errors.New("file already exists")

// ErrNotWritable is returned for a destination that is neither a regular
// file nor something that can be written in place (a directory, a socket).
var ErrNotWritable = errors.New("not a file that a report can be written to")

// maxSymlinks bounds the links followed when resolving a dangling link, as
// the kernel's own limit (MAXSYMLINKS) does.
const maxSymlinks = 40

// Target is where a report goes. Write to it, then Close to finish or
// Abort to throw a half-written file away. A Target of a run's Files is
// renamed into place by Files.Commit, with the run's other files.
type Target struct {
	w      io.Writer
	buf    *bufio.Writer // in front of a file; flushed by seal
	tmp    *os.File      // a regular file being written under a temporary name
	dest   string        // where tmp is renamed to
	mode   fs.FileMode
	keep   bool     // dest existed: give tmp its mode
	inPos  *os.File // a non-regular destination opened in place
	files  *Files   // the run's files this Target belongs to, if any
	sealed bool     // closed by its run, waiting for Files.Commit
}

// name is the file the Target writes, for messages.
func (t *Target) name() string {
	if t.inPos != nil {
		return t.inPos.Name()
	}
	return t.dest
}

// Write implements io.Writer.
func (t *Target) Write(p []byte) (int, error) {
	if t.buf != nil {
		return t.buf.Write(p)
	}
	return t.w.Write(p)
}

// fileBuffer is the size of the buffer in front of a file: the writers
// write a few kilobytes at a time, and for the 746 MB CSV report of
// BenchmarkCheckMillionCSV's million paired claims written with --out,
// strace -c counted 182,088 writes taking 2.1 s of system time; with the
// buffer, 712 writes take 1.3 s.
const fileBuffer = 1 << 20

// buffered puts a buffer in front of the Target's file.
func (t *Target) buffered() *Target {
	t.buf = bufio.NewWriterSize(t.w, fileBuffer)
	return t
}

// Open returns a Target writing to stdout when out is empty or "-", else to
// the file out. It refuses an out that names the input (or one of the files
// of an input folder).
func Open(stdout io.Writer, out, input string) (*Target, error) {
	if out == "" || out == "-" {
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

// openFile decides how dest is written. What the path finally names (after
// every symbolic link) decides: a regular file or nothing is written through
// a temporary file renamed over it; a device or FIFO is opened in place.
func openFile(dest string) (*Target, error) {
	st, err := os.Stat(dest)
	switch {
	case err == nil && st.Mode().IsRegular():
		real, err := filepath.EvalSymlinks(dest)
		if err != nil {
			return nil, fmt.Errorf("cannot write %s: %w", dest, err)
		}
		return createTemp(dest, real, st.Mode().Perm(), true)
	case err == nil && st.IsDir():
		return nil, fmt.Errorf("cannot write %s: it is a directory: %w", dest, ErrNotWritable)
	case err == nil && st.Mode()&fs.ModeSocket != 0:
		return nil, fmt.Errorf("cannot write %s: it is a socket: %w", dest, ErrNotWritable)
	case err == nil:
		// A device, a FIFO or a terminal: written in place, as a shell's
		// redirection would, and never replaced by a regular file.
		f, err := os.OpenFile(dest, os.O_WRONLY, 0)
		if err != nil {
			return nil, fmt.Errorf("cannot write %s: %w", dest, err)
		}
		return (&Target{w: f, inPos: f}).buffered(), nil
	case errors.Is(err, fs.ErrNotExist):
		real, err := resolveDangling(dest)
		if err != nil {
			return nil, fmt.Errorf("cannot write %s: %w", dest, err)
		}
		return createTemp(dest, real, 0, false)
	default:
		return nil, fmt.Errorf("cannot write %s: %w", dest, err)
	}
}

// resolveDangling follows the symbolic links of a path whose final target
// does not exist yet, so that the new file is created where the link points
// and the link itself is left alone.
func resolveDangling(path string) (string, error) {
	for range maxSymlinks {
		fi, err := os.Lstat(path)
		if errors.Is(err, fs.ErrNotExist) {
			return path, nil
		}
		if err != nil {
			return "", err
		}
		if fi.Mode()&fs.ModeSymlink == 0 {
			return path, nil
		}
		link, err := os.Readlink(path)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(link) {
			link = filepath.Join(filepath.Dir(path), link)
		}
		path = link
	}
	return "", fmt.Errorf("more than %d symbolic links", maxSymlinks)
}

// createTemp opens a new file beside real. It is created with mode 0666, so
// that the process's umask gives it the mode any new file of the user gets;
// keep gives it an existing file's mode instead when it is renamed.
func createTemp(shown, real string, mode fs.FileMode, keep bool) (*Target, error) {
	dir, base := filepath.Dir(real), filepath.Base(real)
	for range 100 {
		var b [6]byte
		if _, err := rand.Read(b[:]); err != nil {
			return nil, fmt.Errorf("cannot write %s: %w", shown, err)
		}
		name := filepath.Join(dir, "."+base+".tmp-"+hex.EncodeToString(b[:]))
		f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o666)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		if err != nil {
			return nil, fmt.Errorf("cannot write %s: %w", shown, err)
		}
		return (&Target{w: f, tmp: f, dest: real, mode: mode, keep: keep}).buffered(), nil
	}
	return nil, fmt.Errorf("cannot write %s: no free temporary name beside it", shown)
}

// Regular reports whether the target is a regular file, written under a
// temporary name and renamed into place, beside which other files may be
// written; false for standard output, a device or a FIFO.
func (t *Target) Regular() bool { return t.tmp != nil }

// Close finishes the output: for a regular file, syncs and renames it into
// place; for a destination written in place, closes it. A Target opened
// through Files is only synced and closed under its temporary name: Commit
// renames it.
func (t *Target) Close() error {
	if t.files != nil {
		return t.files.seal(t)
	}
	if err := t.seal(); err != nil {
		return err
	}
	return t.rename()
}

// seal closes the file: a destination written in place for good, a
// temporary file after giving it its mode and syncing it. A temporary file
// that cannot be sealed is removed.
func (t *Target) seal() error {
	if t.buf != nil {
		if err := t.buf.Flush(); err != nil {
			t.Abort()
			return fmt.Errorf("writing %s: %w", t.name(), err)
		}
	}
	if t.inPos != nil {
		if err := t.inPos.Close(); err != nil {
			return fmt.Errorf("writing %s: %w", t.name(), err)
		}
		return nil
	}
	if t.tmp == nil {
		return nil
	}
	name := t.tmp.Name()
	fail := func(err error) error {
		t.tmp.Close()
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	if t.keep {
		if err := t.tmp.Chmod(t.mode); err != nil {
			return fail(err)
		}
	}
	if err := t.tmp.Sync(); err != nil {
		return fail(err)
	}
	if err := t.tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	return nil
}

// rename moves a sealed temporary file into place.
func (t *Target) rename() error {
	if t.tmp == nil {
		return nil
	}
	name := t.tmp.Name()
	if err := os.Rename(name, t.dest); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", t.dest, err)
	}
	return nil
}

// Abort discards a partly written file. A destination written in place is
// only closed: what reached a device or FIFO cannot be taken back.
func (t *Target) Abort() {
	if t.inPos != nil {
		t.inPos.Close()
	}
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
