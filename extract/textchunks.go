package extract

import "strings"

// TextChunks makes strings by writing them one after another into shared
// chunks, so that the many short strings a large input makes (the labels
// of a paired row, an audit's notes) do not cost an allocation each. A
// chunk is a strings.Builder's buffer, which is not zeroed when it is
// made and whose written bytes are never written again: a string made here
// is an ordinary immutable string that keeps its chunk alive, and the
// garbage collector frees the chunk once no string points into it. A nil
// *TextChunks makes plain strings. A TextChunks is not safe for use by
// several goroutines at once, and is not to be copied once used.
type TextChunks struct {
	chunk strings.Builder
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
	if t.chunk.Cap()-t.chunk.Len() < len(b) {
		// A new chunk; the strings in the old one keep it.
		t.chunk = strings.Builder{}
		t.chunk.Grow(textChunkSize)
	}
	start := t.chunk.Len()
	t.chunk.Write(b)
	return t.chunk.String()[start:]
}
