package audit

import (
	"os"
	"runtime/debug"
	"sync"
)

// A streamed audit makes some 800 bytes of short-lived garbage per claim
// (row text, notes, encoded output) over a live heap of a few MB: batches
// in flight and the quantile memo. At the default GOGC of 100 the collector
// then runs about 125 times per million claims, and its marking, with the
// write barriers it turns on, takes a tenth of the run on two cores. While
// a stream runs the heap is let grow to streamGCPercent over the live one,
// under a soft limit of streamMemoryLimit, which bounds the peak whatever
// the garbage rate (the limit makes the collector run sooner, never
// later). 200 is as fast as 400 with the batches of streamBatchClaims
// (whose live heap is some 10 MB on two cores), and peaks at 57 MB
// against 73 (measured with a million claims). A user's own GOGC or
// GOMEMLIMIT is left alone.
const (
	streamGCPercent   = 200
	streamMemoryLimit = 64 << 20
)

// streamGC counts the streams running, so that concurrent streams set the
// policy once and the last to end restores what was there before.
var streamGC struct {
	sync.Mutex
	running        int
	percent, limit int64
}

// userSetCollector reports whether the environment sets the collector.
var userSetCollector = sync.OnceValue(func() bool {
	return os.Getenv("GOGC") != "" || os.Getenv("GOMEMLIMIT") != ""
})

// relaxCollector applies the streaming collector policy and returns the
// function that restores the previous one.
func relaxCollector() (restore func()) {
	if userSetCollector() {
		return func() {}
	}
	streamGC.Lock()
	defer streamGC.Unlock()
	if streamGC.running == 0 {
		streamGC.percent = int64(debug.SetGCPercent(streamGCPercent))
		streamGC.limit = debug.SetMemoryLimit(streamMemoryLimit)
	}
	streamGC.running++
	return func() {
		streamGC.Lock()
		defer streamGC.Unlock()
		streamGC.running--
		if streamGC.running == 0 {
			debug.SetGCPercent(int(streamGC.percent))
			debug.SetMemoryLimit(streamGC.limit)
		}
	}
}
