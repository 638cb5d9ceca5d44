package output

import (
	"bytes"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

func write(t *testing.T, out, input, text string) error {
	t.Helper()
	tg, err := Open(&bytes.Buffer{}, out, input)
	if err != nil {
		return err
	}
	if _, err := tg.Write([]byte(text)); err != nil {
		tg.Abort()
		return err
	}
	return tg.Close()
}

// TestDeviceIsWrittenInPlace: /dev/null stays the character device it is;
// before the fix it was renamed over by a regular file.
func TestDeviceIsWrittenInPlace(t *testing.T) {
	before, err := os.Stat(os.DevNull)
	if err != nil {
		t.Skipf("no %s here: %v", os.DevNull, err)
	}
	if err := write(t, os.DevNull, "input.xlsx", "report\n"); err != nil {
		t.Fatalf("writing to %s: %v", os.DevNull, err)
	}
	after, err := os.Stat(os.DevNull)
	if err != nil {
		t.Fatal(err)
	}
	if after.Mode().Type() != before.Mode().Type() || after.Mode()&fs.ModeCharDevice == 0 {
		t.Fatalf("%s is now %v, was %v", os.DevNull, after.Mode(), before.Mode())
	}
	if !os.SameFile(before, after) {
		t.Fatalf("%s was replaced", os.DevNull)
	}
	matches, _ := filepath.Glob("/dev/.null.tmp-*")
	if len(matches) > 0 {
		t.Fatalf("temporary files left in /dev: %v", matches)
	}
}

// TestFIFOIsWrittenInPlace: a named pipe receives the report and stays a pipe.
func TestFIFOIsWrittenInPlace(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "report.pipe")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skipf("cannot make a FIFO here: %v", err)
	}
	got := make(chan string)
	go func() {
		b, _ := os.ReadFile(fifo)
		got <- string(b)
	}()
	if err := write(t, fifo, "input.xlsx", "through the pipe\n"); err != nil {
		t.Fatal(err)
	}
	if s := <-got; s != "through the pipe\n" {
		t.Fatalf("the reader got %q", s)
	}
	st, err := os.Lstat(fifo)
	if err != nil {
		t.Fatal(err)
	}
	if st.Mode()&fs.ModeNamedPipe == 0 {
		t.Fatalf("the FIFO is now %v", st.Mode())
	}
}

// TestSymlinkIsFollowed: the link stays a link and its target gets the report.
func TestSymlinkIsFollowed(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "real.md")
	link := filepath.Join(dir, "link.md")
	if err := os.WriteFile(target, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("real.md", link); err != nil {
		t.Skipf("no symbolic links here: %v", err)
	}
	if err := write(t, link, "input.xlsx", "new"); err != nil {
		t.Fatal(err)
	}
	st, err := os.Lstat(link)
	if err != nil || st.Mode()&fs.ModeSymlink == 0 {
		t.Fatalf("the link was replaced: %v %v", st, err)
	}
	b, _ := os.ReadFile(target)
	if string(b) != "new" {
		t.Fatalf("target holds %q", b)
	}
	// A dangling link creates its target.
	dangling := filepath.Join(dir, "dangling.md")
	if err := os.Symlink("sub-missing.md", dangling); err != nil {
		t.Fatal(err)
	}
	if err := write(t, dangling, "input.xlsx", "fresh"); err != nil {
		t.Fatal(err)
	}
	if st, err := os.Lstat(dangling); err != nil || st.Mode()&fs.ModeSymlink == 0 {
		t.Fatalf("the dangling link was replaced")
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "sub-missing.md")); string(b) != "fresh" {
		t.Fatalf("the link's target holds %q", b)
	}
}

// TestModes: an existing file keeps its mode; a new one gets the umask's.
func TestModes(t *testing.T) {
	dir := t.TempDir()
	existing := filepath.Join(dir, "kept.csv")
	if err := os.WriteFile(existing, []byte("x"), 0o640); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(existing, 0o640); err != nil {
		t.Fatal(err)
	}
	if err := write(t, existing, "input.xlsx", "y"); err != nil {
		t.Fatal(err)
	}
	if st, _ := os.Stat(existing); st.Mode().Perm() != 0o640 {
		t.Fatalf("existing file's mode became %v, want -rw-r-----", st.Mode().Perm())
	}
	old := syscall.Umask(0o027)
	defer syscall.Umask(old)
	fresh := filepath.Join(dir, "fresh.csv")
	if err := write(t, fresh, "input.xlsx", "z"); err != nil {
		t.Fatal(err)
	}
	if st, _ := os.Stat(fresh); st.Mode().Perm() != 0o640 {
		t.Fatalf("a new file under umask 027 got %v, want -rw-r-----", st.Mode().Perm())
	}
}

// TestRefusals: a directory and the input itself are refused with errors
// callers can test.
func TestRefusals(t *testing.T) {
	dir := t.TempDir()
	if err := write(t, dir, "input.xlsx", "x"); !errors.Is(err, ErrNotWritable) {
		t.Fatalf("a directory as --out: got %v, want ErrNotWritable", err)
	}
	in := filepath.Join(dir, "in.xlsx")
	os.WriteFile(in, []byte("keep"), 0o644)
	if err := write(t, in, in, "x"); !errors.Is(err, ErrOutIsInput) {
		t.Fatalf("--out the input: got %v", err)
	}
	if b, _ := os.ReadFile(in); string(b) != "keep" {
		t.Fatal("the input was modified")
	}
}

// TestDashIsStandardOutput: "-" writes to the given stdout, no file named "-".
func TestDashIsStandardOutput(t *testing.T) {
	var buf bytes.Buffer
	tg, err := Open(&buf, "-", "input.xlsx")
	if err != nil {
		t.Fatal(err)
	}
	tg.Write([]byte("to stdout"))
	if err := tg.Close(); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), "to stdout") {
		t.Fatalf("stdout got %q", buf.String())
	}
	if _, err := os.Stat("-"); err == nil {
		t.Fatal("a file named - was written")
	}
}

// TestAbortLeavesNothing: an aborted regular-file write leaves the old file
// and no temporary file.
func TestAbortLeavesNothing(t *testing.T) {
	dir := t.TempDir()
	dest := filepath.Join(dir, "r.json")
	os.WriteFile(dest, []byte("old"), 0o644)
	tg, err := Open(&bytes.Buffer{}, dest, "input.xlsx")
	if err != nil {
		t.Fatal(err)
	}
	tg.Write([]byte("half"))
	tg.Abort()
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("left behind: %v", entries)
	}
	if b, _ := os.ReadFile(dest); string(b) != "old" {
		t.Fatalf("dest holds %q", b)
	}
}
