package output

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// openWritten opens out through f, writes text and closes it.
func openWritten(t *testing.T, f *Files, out, text string) {
	t.Helper()
	tg, err := f.Open(&bytes.Buffer{}, out, "input.xlsx")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := tg.Write([]byte(text)); err != nil {
		t.Fatal(err)
	}
	if err := tg.Close(); err != nil {
		t.Fatal(err)
	}
}

func names(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range entries {
		out = append(out, e.Name())
	}
	return out
}

// filesWithBuffer returns the Files of a run that has a file in its
// temporary folder (as excelize's buffer would be), the system's temporary
// folder being a test folder, and a folder for the run's files.
func filesWithBuffer(t *testing.T) (*Files, string) {
	t.Helper()
	t.Setenv("TMPDIR", t.TempDir())
	f := NewFiles()
	tmp, err := f.TempDir()
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(tmp, "excelize-1"), []byte("x"), 0o600); err != nil {
		t.Fatal(err)
	}
	return f, t.TempDir()
}

// TestFilesCommit: closed Targets wait under their temporary names and
// Commit puts every one in place and removes the temporary folder.
func TestFilesCommit(t *testing.T) {
	f, dir := filesWithBuffer(t)
	openWritten(t, f, filepath.Join(dir, "report.md"), "report")
	openWritten(t, f, filepath.Join(dir, "plot.svg"), "plot")
	for _, n := range names(t, dir) {
		if n == "report.md" || n == "plot.svg" {
			t.Fatalf("%s is in place before Commit", n)
		}
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := names(t, dir); !slices.Equal(got, []string{"plot.svg", "report.md"}) {
		t.Errorf("after Commit the folder holds %q, want plot.svg and report.md", got)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "report.md")); string(b) != "report" {
		t.Errorf("report.md holds %q", b)
	}
	if got := names(t, os.TempDir()); len(got) != 0 {
		t.Errorf("the temporary folder is left: %q", got)
	}
	if f.Abort() {
		t.Error("Abort after Commit = true, want false: the files are kept")
	}
	if got := names(t, dir); len(got) != 2 {
		t.Errorf("Abort after Commit removed files: %q", got)
	}
}

// TestFilesAbort: Abort removes every file of the run, closed or not, and
// the temporary folder with what it holds; nothing opens afterwards.
func TestFilesAbort(t *testing.T) {
	f, dir := filesWithBuffer(t)
	openWritten(t, f, filepath.Join(dir, "plot.svg"), "plot")
	half, err := f.Open(&bytes.Buffer{}, filepath.Join(dir, "report.md"), "input.xlsx")
	if err != nil {
		t.Fatal(err)
	}
	half.Write([]byte("half a report"))
	if !f.Abort() {
		t.Fatal("Abort = false, want true")
	}
	if got := names(t, dir); len(got) != 0 {
		t.Errorf("after Abort the folder holds %q, want nothing", got)
	}
	if got := names(t, os.TempDir()); len(got) != 0 {
		t.Errorf("after Abort the system's temporary folder holds %q, want nothing", got)
	}
	if _, err := f.Open(&bytes.Buffer{}, filepath.Join(dir, "late.md"), "input.xlsx"); !errors.Is(err, ErrAborted) {
		t.Errorf("Open after Abort: %v, want ErrAborted", err)
	}
	if _, err := f.TempDir(); !errors.Is(err, ErrAborted) {
		t.Errorf("TempDir after Abort: %v, want ErrAborted", err)
	}
	if err := half.Close(); !errors.Is(err, ErrAborted) {
		t.Errorf("Close after Abort: %v, want ErrAborted", err)
	}
	if err := f.Commit(); !errors.Is(err, ErrAborted) {
		t.Errorf("Commit after Abort: %v, want ErrAborted", err)
	}
	if got := names(t, dir); len(got) != 0 {
		t.Errorf("the folder holds %q, want nothing", got)
	}
}

// TestFilesMkdir: Abort removes a folder Mkdir made, with the run's files
// in it, and leaves one that existed, with what someone else put there;
// Commit keeps the folder made; a path that is a file is refused.
func TestFilesMkdir(t *testing.T) {
	f, dir := filesWithBuffer(t)
	made, existing := filepath.Join(dir, "review"), filepath.Join(dir, "shared")
	if err := os.Mkdir(existing, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(existing, "notes.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, d := range []string{made, existing} {
		if err := f.Mkdir(d); err != nil {
			t.Fatal(err)
		}
		openWritten(t, f, filepath.Join(d, "claims.csv"), "a,b")
	}
	f.Abort()
	if _, err := os.Stat(made); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the folder the run made is still there after Abort: %v", err)
	}
	if got := names(t, existing); !slices.Equal(got, []string{"notes.txt"}) {
		t.Errorf("the folder that existed holds %q after Abort, want notes.txt only", got)
	}

	g := NewFiles()
	if err := g.Mkdir(made); err != nil {
		t.Fatal(err)
	}
	openWritten(t, g, filepath.Join(made, "claims.csv"), "a,b")
	if err := g.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := names(t, made); !slices.Equal(got, []string{"claims.csv"}) {
		t.Errorf("after Commit the folder holds %q, want claims.csv", got)
	}
	if err := NewFiles().Mkdir(filepath.Join(existing, "notes.txt")); err == nil {
		t.Error("Mkdir of a file: no error")
	}
}

// TestFilesAbortWhileWriting: a run that goes on opening and writing files
// while it is aborted from another goroutine (a signal's) leaves nothing:
// Abort waits for an Open under way, and every later Open fails.
func TestFilesAbortWhileWriting(t *testing.T) {
	t.Setenv("TMPDIR", t.TempDir())
	dir := t.TempDir()
	f := NewFiles()
	started := make(chan struct{})
	ended := make(chan error)
	go func() {
		for i := 0; ; i++ {
			tmp, err := f.TempDir()
			if err != nil {
				ended <- err
				return
			}
			if tf, err := os.CreateTemp(tmp, "excelize-"); err == nil {
				tf.Close()
			}
			tg, err := f.Open(&bytes.Buffer{}, filepath.Join(dir, "plot.svg"), "input.xlsx")
			if err != nil {
				ended <- err
				return
			}
			tg.Write([]byte("plot"))
			tg.Close()
			if i == 0 {
				close(started)
			}
		}
	}()
	<-started
	f.Abort()
	if err := <-ended; !errors.Is(err, ErrAborted) {
		t.Fatalf("the writing goroutine ended with %v, want ErrAborted", err)
	}
	if got := names(t, dir); len(got) != 0 {
		t.Errorf("the folder holds %q, want nothing", got)
	}
	if got := names(t, os.TempDir()); len(got) != 0 {
		t.Errorf("the system's temporary folder holds %q, want nothing", got)
	}
}

// TestFilesCommitUnclosed: a Target left open is not put in place.
func TestFilesCommitUnclosed(t *testing.T) {
	dir := t.TempDir()
	f := NewFiles()
	openWritten(t, f, filepath.Join(dir, "done.md"), "done")
	if _, err := f.Open(&bytes.Buffer{}, filepath.Join(dir, "open.md"), "input.xlsx"); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err == nil {
		t.Error("Commit with a Target left open: nil error, want one")
	}
	if got := names(t, dir); !slices.Equal(got, []string{"done.md"}) {
		t.Errorf("the folder holds %q, want done.md alone", got)
	}
}

// TestRegular: only a regular file has a folder beside it.
func TestRegular(t *testing.T) {
	tests := []struct {
		out  string
		want bool
	}{
		{filepath.Join(t.TempDir(), "r.md"), true},
		{"-", false},
		{"", false},
		{os.DevNull, false},
	}
	for _, tt := range tests {
		tg, err := Open(&bytes.Buffer{}, tt.out, "input.xlsx")
		if err != nil {
			t.Fatal(err)
		}
		if got := tg.Regular(); got != tt.want {
			t.Errorf("Open(%q).Regular() = %v, want %v", tt.out, got, tt.want)
		}
		tg.Abort()
	}
}
