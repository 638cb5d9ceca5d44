// Package progress draws a one-line progress bar on a terminal's standard
// error, and nothing at all when standard error is not a terminal (a pipe,
// a file, CI), so that reports and logs stay clean.
package progress

import (
	"fmt"
	"io"
	"os"
	"strings"
	"time"

	"golang.org/x/term"
)

// Bar is a progress bar. The zero value and a nil *Bar draw nothing.
type Bar struct {
	w       io.Writer
	label   string
	start   time.Time
	last    time.Time
	drawn   bool
	minWait time.Duration
}

// New returns a bar writing to w when w is a terminal, or nil otherwise.
// It stays invisible until the work has run for a moment, so quick runs
// show nothing.
func New(w io.Writer, label string) *Bar {
	f, ok := w.(*os.File)
	if !ok || !term.IsTerminal(int(f.Fd())) {
		return nil
	}
	now := time.Now()
	return &Bar{w: w, label: label, start: now, minWait: 500 * time.Millisecond}
}

// Update shows done of total.
func (b *Bar) Update(done, total int) {
	if b == nil || total <= 0 {
		return
	}
	now := time.Now()
	if now.Sub(b.start) < b.minWait || (now.Sub(b.last) < 100*time.Millisecond && done < total) {
		return
	}
	b.last = now
	const width = 30
	fill := width * done / total
	fmt.Fprintf(b.w, "\r%s [%s%s] %3d%%", b.label, strings.Repeat("=", fill), strings.Repeat(" ", width-fill), 100*done/total)
	b.drawn = true
}

// Done clears the bar's line.
func (b *Bar) Done() {
	if b == nil || !b.drawn {
		return
	}
	fmt.Fprintf(b.w, "\r%s\r", strings.Repeat(" ", len(b.label)+40))
}
