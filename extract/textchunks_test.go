package extract

import (
	"fmt"
	"runtime"
	"testing"
)

// TestTextChunksKeepStrings checks that strings written into shared chunks
// keep their text while many more are written after them, across chunk
// ends and garbage collections, and that a nil TextChunks and an oversized
// string make plain strings.
func TestTextChunksKeepStrings(t *testing.T) {
	var nt TextChunks
	var buf []byte
	var notes, want []string
	for i := range 5000 {
		buf = fmt.Appendf(buf[:0], "note %d: the difference has p = 0.%03d.", i, i%1000)
		want = append(want, string(buf))
		notes = append(notes, nt.String(buf))
		buf[0] = 'X' // the caller's buffer is reused; the string must not change
		if i%1000 == 0 {
			runtime.GC()
		}
	}
	for i := range notes {
		if notes[i] != want[i] {
			t.Fatalf("note %d reads %q, want %q", i, notes[i], want[i])
		}
	}
	var none *TextChunks
	if got := none.String([]byte("plain")); got != "plain" {
		t.Errorf("nil TextChunks gave %q", got)
	}
	long := make([]byte, textChunkSize)
	for i := range long {
		long[i] = 'a' + byte(i%26)
	}
	got := nt.String(long)
	long[0] = 'X'
	if len(got) != textChunkSize || got[0] != 'a' {
		t.Errorf("a string longer than a chunk was not copied whole")
	}
}
