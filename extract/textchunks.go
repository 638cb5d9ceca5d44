package extract

import "unsafe"

// TextChunks makes strings by copying them one after another into shared
// chunks, so that the many short strings a large input makes (the labels
// of a paired row, an audit's notes) do not cost an allocation each. A
// chunk is never written again where a string is and never reused, so a
// string made here is an ordinary immutable string that keeps its chunk
// alive; the garbage collector frees the chunk once no string points into
// it. A nil *TextChunks makes plain strings. A TextChunks is not safe for
// use by several goroutines at once.
type TextChunks struct {
	chunk []byte
}

// textChunkSize is the size of a chunk: some forty claims' notes, or a
// thousand rows' labels.
const textChunkSize = 16 << 10

// String returns b as a string, copied into the current chunk; a string
// longer than a quarter of a chunk is allocated on its own.
func (t *TextChunks) String(b []byte) string {
	if t == nil || len(b) == 0 || len(b) > textChunkSize/4 {
		return string(b)
	}
	if len(t.chunk)+len(b) > cap(t.chunk) {
		t.chunk = make([]byte, 0, textChunkSize)
	}
	start := len(t.chunk)
	t.chunk = append(t.chunk, b...)
	return unsafe.String(&t.chunk[start], len(b))
}
