package audit

import (
	"os"
	"runtime/debug"
	"testing"
)

// TestRelaxCollector checks that a stream raises GOGC and sets the soft
// memory limit while it runs, that overlapping streams restore the
// previous setting only when the last one ends, and that a user's GOGC is
// left alone.
func TestRelaxCollector(t *testing.T) {
	if os.Getenv("GOGC") != "" || os.Getenv("GOMEMLIMIT") != "" {
		t.Skip("GOGC or GOMEMLIMIT is set in the environment, which the stream leaves alone")
	}
	before := debug.SetGCPercent(73)
	defer debug.SetGCPercent(before)
	limit := debug.SetMemoryLimit(-1)
	outer := relaxCollector()
	inner := relaxCollector()
	if got := debug.SetGCPercent(streamGCPercent); got != streamGCPercent {
		t.Errorf("GOGC during a stream = %d, want %d", got, streamGCPercent)
	}
	if got := debug.SetMemoryLimit(-1); got != streamMemoryLimit {
		t.Errorf("memory limit during a stream = %d, want %d", got, streamMemoryLimit)
	}
	inner()
	if got := debug.SetGCPercent(streamGCPercent); got != streamGCPercent {
		t.Errorf("GOGC after the inner of two streams = %d, want %d still", got, streamGCPercent)
	}
	outer()
	if got := debug.SetGCPercent(73); got != 73 {
		t.Errorf("GOGC after both streams = %d, want the 73 from before", got)
	}
	if got := debug.SetMemoryLimit(-1); got != limit {
		t.Errorf("memory limit after both streams = %d, want %d from before", got, limit)
	}
}
