package audit

import "unsafe"

// noteText holds the text of the notes an auditor writes, appended one
// after another into shared chunks: a claim's notes were four allocations
// of their own, and a streamed audit of a million claims spent a twentieth
// of its time allocating them. A chunk is never written again once a note
// is in it and never reused, so a note is an ordinary immutable string
// that keeps its chunk alive; the garbage collector frees the chunk once no
// note points into it. A nil *noteText makes plain strings.
type noteText struct {
	chunk []byte
}

// noteChunkSize is the size of a chunk, some forty claims' notes.
const noteChunkSize = 16 << 10

// text returns b as a string, copied into the current chunk.
func (t *noteText) text(b []byte) string {
	if t == nil || len(b) == 0 || len(b) > noteChunkSize/4 {
		return string(b)
	}
	if len(t.chunk)+len(b) > cap(t.chunk) {
		t.chunk = make([]byte, 0, noteChunkSize)
	}
	start := len(t.chunk)
	t.chunk = append(t.chunk, b...)
	return unsafe.String(&t.chunk[start], len(b))
}
