package audit

import (
	"fmt"
	"runtime"
	"testing"
)

// TestNoteTextKeepsNotes checks that notes written into shared chunks keep
// their text while many more are written after them, across chunk ends and
// garbage collections, and that a nil noteText and an oversized note make
// plain strings.
func TestNoteTextKeepsNotes(t *testing.T) {
	var nt noteText
	var buf []byte
	var notes, want []string
	for i := range 5000 {
		buf = fmt.Appendf(buf[:0], "note %d: the difference has p = 0.%03d.", i, i%1000)
		want = append(want, string(buf))
		notes = append(notes, nt.text(buf))
		buf[0] = 'X' // the caller's buffer is reused; the note must not change
		if i%1000 == 0 {
			runtime.GC()
		}
	}
	for i := range notes {
		if notes[i] != want[i] {
			t.Fatalf("note %d reads %q, want %q", i, notes[i], want[i])
		}
	}
	var none *noteText
	if got := none.text([]byte("plain")); got != "plain" {
		t.Errorf("nil noteText gave %q", got)
	}
	long := make([]byte, noteChunkSize)
	for i := range long {
		long[i] = 'a' + byte(i%26)
	}
	got := nt.text(long)
	long[0] = 'X'
	if len(got) != noteChunkSize || got[0] != 'a' {
		t.Errorf("a note longer than a chunk was not copied whole")
	}
}
