package output

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"slices"
	"sync"
)

// ErrAborted is returned by Files whose run was aborted (interrupted).
var ErrAborted = errors.New("the run was interrupted")

// ErrCommitted is returned when Files are used after Commit.
var ErrCommitted = errors.New("the run's files were already kept")

// Files are the files one run of the program writes: the Targets opened
// through Open and Create, each kept under its temporary name until Commit
// renames them all into place, and a private folder (TempDir) for the
// temporary files of the libraries that write them (excelize's buffers).
// Abort removes all of it, from any goroutine at any moment, and no file
// is created through the Files afterwards: a run interrupted by a signal
// leaves nothing behind. A run ends with either Commit or Abort.
type Files struct {
	mu      sync.Mutex
	targets []*Target
	dirs    []string // folders Mkdir made, removed again by Abort
	tmpDir  string
	done    error // ErrCommitted or ErrAborted once the run has ended
}

// NewFiles returns the Files of a run.
func NewFiles() *Files { return &Files{} }

// Open is the package's Open for a Target of the run.
func (f *Files) Open(stdout io.Writer, out, input string) (*Target, error) {
	return f.add(func() (*Target, error) { return Open(stdout, out, input) })
}

// Create is the package's Create for a Target of the run.
func (f *Files) Create(path string) (*Target, error) {
	return f.add(func() (*Target, error) { return Create(path) })
}

// add opens a Target while holding the lock, so that Abort cannot come
// between the creation of its temporary file and its registration.
func (f *Files) add(open func() (*Target, error)) (*Target, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done != nil {
		return nil, f.done
	}
	t, err := open()
	if err != nil {
		return nil, err
	}
	t.files = f
	f.targets = append(f.targets, t)
	return t, nil
}

// Mkdir makes the folder path (not its parents) for the run's Targets when
// it does not exist. Abort removes a folder Mkdir made once the Targets in
// it are gone, and only when it is then empty, so that a failed or
// interrupted run leaves no folder of its own behind and never takes
// anything someone else put there.
func (f *Files) Mkdir(path string) error {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done != nil {
		return f.done
	}
	switch err := os.Mkdir(path, 0o755); {
	case err == nil:
		f.dirs = append(f.dirs, path)
	case errors.Is(err, fs.ErrExist):
		if fi, serr := os.Stat(path); serr != nil || !fi.IsDir() {
			return fmt.Errorf("%s: not a folder", path)
		}
	default:
		return err
	}
	return nil
}

// TempDir returns the run's private folder for temporary files, creating
// it in the system's temporary folder on first use. Commit and Abort
// remove it with whatever it holds.
func (f *Files) TempDir() (string, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done != nil {
		return "", f.done
	}
	if f.tmpDir == "" {
		dir, err := os.MkdirTemp("", "coefaudit-")
		if err != nil {
			return "", fmt.Errorf("a folder for temporary files: %w", err)
		}
		f.tmpDir = dir
	}
	return f.tmpDir, nil
}

// seal is a Target's Close: the file is synced and closed, and waits under
// its temporary name for Commit.
func (f *Files) seal(t *Target) error {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done != nil {
		return f.done
	}
	if err := t.seal(); err != nil {
		f.targets = slices.DeleteFunc(f.targets, func(u *Target) bool { return u == t })
		return err
	}
	t.sealed = true
	return nil
}

// Commit renames every Target of the run into place, in the order they
// were opened, and removes the temporary folder. Every Target must have
// been closed; one that was not is discarded and reported. A rename that
// fails discards the files not yet renamed.
func (f *Files) Commit() error {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done != nil {
		return f.done
	}
	f.done = ErrCommitted
	defer f.removeTempDir()
	var err error
	for _, t := range f.targets {
		switch {
		case err != nil:
			t.Abort()
		case !t.sealed && (t.tmp != nil || t.inPos != nil):
			t.Abort()
			err = fmt.Errorf("writing %s: the file was not finished", t.name())
		default:
			err = t.rename()
		}
	}
	f.targets = nil
	return err
}

// Abort discards the run's files: every temporary file is removed, every
// destination written in place closed, the folders Mkdir made removed when
// empty, the temporary folder removed. It returns false, and does nothing,
// when Commit has already kept them.
func (f *Files) Abort() bool {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.done == ErrCommitted {
		return false
	}
	f.done = ErrAborted
	for _, t := range f.targets {
		t.Abort()
	}
	f.targets = nil
	for _, dir := range slices.Backward(f.dirs) {
		os.Remove(dir) // only when empty
	}
	f.dirs = nil
	f.removeTempDir()
	return true
}

// removeTempDir removes the temporary folder. It is first renamed, so that
// a library still running (the run is being interrupted) can create
// nothing more in it: its next temporary file fails to open.
func (f *Files) removeTempDir() {
	if f.tmpDir == "" {
		return
	}
	dir := f.tmpDir
	if gone := dir + ".removed"; os.Rename(dir, gone) == nil {
		dir = gone
	}
	os.RemoveAll(dir)
	f.tmpDir = ""
}
