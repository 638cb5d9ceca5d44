package audit

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"runtime"
	"sync"

	"golang.org/x/sync/semaphore"

	"coefaudit/extract"
)

// MaxStreamProblems is how many input problems a streamed audit keeps for
// its report; beyond it they are counted, so that a file of bad rows cannot
// exhaust memory.
const MaxStreamProblems = 10000

// MaxStreamFamily is the most claims of one study a streamed audit holds
// together for the multiplicity adjustment. A longer contiguous run of one
// study (no paper prints that many comparisons; a file whose study column
// was left constant does) is adjusted in blocks of this many claims, and a
// problem says so: holding it whole would make memory grow with the file.
const MaxStreamFamily = 1000

// streamBatchClaims is how many claims a streamed audit hands a worker at
// once (whole runs of a study, so a batch may hold more). Every hand-off
// can leave a core waiting to be woken, which on a virtual machine costs
// tens of microseconds: at 128 claims a batch the cores were busy 92% of
// the run, at 512 97%, and the run took 7% less time (measured on two
// cores with a million claims). Larger batches gained nothing more and
// held more in memory.
const streamBatchClaims = 512

// streamWorkers is how many workers a streamed audit runs: one per CPU, up
// to four. The one reader takes some 60% of the CPU time that auditing and
// encoding a claim take, so two workers already outpace it; more than four
// would only wait, each adding its batch to the memory in flight.
func streamWorkers() int {
	return min(runtime.GOMAXPROCS(0), 4)
}

// streamInFlightLimit is how many claims the workers may hold between the
// reader and the output: a batch for each and one waiting to be written.
func streamInFlightLimit(workers int) int64 {
	return int64(workers+1) * streamBatchClaims
}

// ClaimSink receives a streamed audit. Begin is called once, then the
// encoded claims are written in input order, then Finish.
type ClaimSink interface {
	// Begin is called before any claim with the input's unknown columns,
	// which follow the report's own columns.
	Begin(extra []string) error
	// AppendClaim appends the encoding of claim c, the index-th of the
	// stream counting from 0, to dst. It is called from several goroutines
	// at once and must not change the sink. c and what it holds are reused
	// for later claims once the call returns, so the sink must not keep
	// them.
	AppendClaim(dst []byte, c *ClaimResult, index int) []byte
	// Write writes encoded claims.
	Write(p []byte) (int, error)
	// Finish is called after the last claim with the summary, the
	// input's problems and how many further problems were not kept.
	Finish(s Summary, problems []Problem, omitted int) error
}

// IsPairedCSV reports whether path is a single paired CSV (one claim per
// row with both coefficients inline), the form that can be streamed.
func IsPairedCSV(path string) bool {
	st, err := os.Stat(path)
	if err != nil || st.IsDir() {
		return false
	}
	f, err := os.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	_, err = extract.NewPairedReader(f, path)
	return err == nil
}

// streamBatch is a run of consecutive claims on its way through a streamed
// audit: read, audited and encoded by a worker, written in order.
type streamBatch struct {
	seq   int // order of the batch
	first int // stream index of its first claim
	rows  []extract.PairedClaim
	// runs holds the offsets in rows where a family of the multiplicity
	// adjustment starts; the first is 0.
	runs   []int
	claims []ClaimResult
	out    []byte
	// weight is what the batch holds of the in-flight bound.
	weight int64
	counts map[string]int
	keptProblems
	// err is a read error after the batch's rows; it ends the stream.
	err error
}

// keptProblems holds the problems a streamed audit keeps, at most
// MaxStreamProblems, and counts the ones beyond.
type keptProblems struct {
	kept    []Problem
	omitted int
}

func (k *keptProblems) keep(ps []Problem) {
	for _, p := range ps {
		if len(k.kept) < MaxStreamProblems {
			k.kept = append(k.kept, p)
		} else {
			k.omitted++
		}
	}
}

// run returns the rows [s, e) of the batch's k-th family.
func (b *streamBatch) run(k int) (s, e int) {
	s, e = b.runs[k], len(b.rows)
	if k+1 < len(b.runs) {
		e = b.runs[k+1]
	}
	return s, e
}

// StreamPaired audits a paired CSV as a stream and writes it to sink, in
// memory that does not grow with the number of claims. One goroutine reads
// the rows; a worker per CPU (up to four) audits and encodes batches of
// them; the calling goroutine writes the batches in input order, so the
// output is what a one-by-one audit writes. A study's claims are held
// together while they are contiguous (up to MaxStreamFamily), so that the
// multiplicity adjustment can run over them; a study whose rows are not
// contiguous is adjusted per run of rows (documented in the help). The
// claims carry no methods paragraph: the streamed reports (CSV, JSON) do
// not show it. It returns the summary of outcomes.
func StreamPaired(path string, opts Options, sink ClaimSink) (Summary, error) {
	f, err := os.Open(path)
	if err != nil {
		return Summary{}, fmt.Errorf("reading %s: %w", path, err)
	}
	defer f.Close()
	defer relaxCollector()()
	pr, err := extract.NewPairedReader(bufio.NewReaderSize(f, 1<<16), path)
	if err != nil {
		return Summary{}, err
	}
	// The first row names the unknown columns, which the sink needs before
	// any claim is encoded.
	first, err := pr.Next()
	atEnd := errors.Is(err, io.EOF)
	if err != nil && !atEnd {
		return Summary{}, err
	}
	var extra []string
	if !atEnd {
		extra = appendUnseen(nil, first.Claim.Extra.Names, reportColumnSet())
	}
	if err := sink.Begin(extra); err != nil {
		return Summary{}, err
	}
	// The header's problems come first; they are taken before the reader
	// goroutine owns pr.
	var problems keptProblems
	problems.keep(cellProblems(pr.Problems()))
	workers := streamWorkers()
	showAdjusted := showsAdjustedP(sink)
	// What is in flight is bounded in claims, not in batches: a batch holds
	// whole runs of a study, and in a file whose study column was left
	// constant every batch is MaxStreamFamily claims long (bounding the
	// batches let such a file take 300 MB). A batch longer than half the
	// bound counts as half, so that two workers can audit such blocks at
	// once; the one being filled is outside it.
	limit := streamInFlightLimit(workers)
	ctx, quit := context.WithCancel(context.Background())
	defer quit()
	var (
		todo     = make(chan *streamBatch, workers)
		done     = make(chan *streamBatch, workers)
		inFlight = semaphore.NewWeighted(limit)
		free     = sync.Pool{New: func() any { return new(streamBatch) }}
		wg       sync.WaitGroup
	)
	go readBatches(ctx, pr, &first, atEnd, todo, inFlight, limit, &free)
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := &streamWorker{auditor: &auditor{}, showAdjusted: showAdjusted}
			for b := range todo {
				w.audit(b, opts, sink)
				select {
				case done <- b:
				case <-ctx.Done():
				}
			}
		}()
	}
	go func() { wg.Wait(); close(done) }()

	summary := Summary{Counts: map[string]int{}}
	pending := map[int]*streamBatch{}
	var spare []byte
	next := 0
	var failure error
	for b := range done {
		if failure != nil {
			continue // draining, so that every goroutine ends
		}
		pending[b.seq] = b
		for b := pending[next]; b != nil; b = pending[next] {
			delete(pending, next)
			next++
			summary.Claims += len(b.rows)
			for o, n := range b.counts {
				summary.Counts[o] += n
			}
			problems.keep(b.kept)
			problems.omitted += b.omitted
			readErr := b.err
			// The batch's rows and results go back before its output is
			// written, which takes a while for a file, so that the reader
			// and the workers go on meanwhile; the output is kept in the
			// writer's own buffer, traded for the batch's.
			out := b.out
			b.out = spare
			inFlight.Release(b.weight)
			b.recycle()
			free.Put(b)
			_, failure = sink.Write(out)
			spare = out[:0]
			if failure == nil && readErr != nil {
				failure = readErr
			}
			if failure != nil {
				quit()
				break
			}
		}
	}
	if failure != nil {
		return summary, failure
	}
	return summary, sink.Finish(summary, problems.kept, problems.omitted)
}

// readBatches reads the paired rows into batches of whole study runs and
// sends them to todo, each taking its claims (at most limit) from inFlight
// so that only so many are in flight; it closes todo after the last or
// when ctx is cancelled.
func readBatches(ctx context.Context, pr *extract.PairedReader, first *extract.PairedClaim, atEnd bool,
	todo chan<- *streamBatch, inFlight *semaphore.Weighted, limit int64, free *sync.Pool) {
	defer close(todo)
	var (
		seq, index, runLen int
		lastStudy          string
		b                  *streamBatch
	)
	send := func() bool {
		b.weight = min(int64(len(b.rows)), limit/2)
		if inFlight.Acquire(ctx, b.weight) != nil {
			return false
		}
		select {
		case todo <- b:
			b = nil
			return true
		case <-ctx.Done():
			return false
		}
	}
	start := func() bool {
		if ctx.Err() != nil {
			return false
		}
		b = free.Get().(*streamBatch)
		b.seq, b.first = seq, index
		seq++
		return true
	}
	if !start() {
		return
	}
	for !atEnd {
		// The row is read into its place in the batch, saving a copy of
		// some 1.3 kB; it moves only when it starts the next batch.
		// The slot is overwritten whole below, so a recycled one is not
		// cleared first.
		if len(b.rows) < cap(b.rows) {
			b.rows = b.rows[:len(b.rows)+1]
		} else {
			b.rows = append(b.rows, extract.PairedClaim{})
		}
		pc := &b.rows[len(b.rows)-1]
		if index == 0 {
			*pc = *first
		} else if err := pr.ReadInto(pc); err != nil {
			b.rows = b.rows[:len(b.rows)-1]
			if !errors.Is(err, io.EOF) {
				b.err = err
			}
			break
		}
		split := runLen == MaxStreamFamily && pc.Claim.Study == lastStudy
		if len(b.rows) == 1 || pc.Claim.Study != lastStudy || split {
			if len(b.rows)-1 >= streamBatchClaims || split {
				last := b.rows[len(b.rows)-1]
				b.rows[len(b.rows)-1] = extract.PairedClaim{}
				b.rows = b.rows[:len(b.rows)-1]
				if !send() || !start() {
					return
				}
				b.rows = append(b.rows, last)
				pc = &b.rows[0]
			}
			if split {
				b.keep([]Problem{{Row: pc.Claim.Row, Column: "study", Message: fmt.Sprintf(
					"study %q has more than %d claims in a row; a streamed audit adjusts for multiplicity over blocks of %d claims, and a new block starts here",
					pc.Claim.Study, MaxStreamFamily, MaxStreamFamily)}})
			}
			b.runs = append(b.runs, len(b.rows)-1)
			runLen = 0
		}
		lastStudy = pc.Claim.Study
		runLen++
		index++
	}
	send()
}

// streamWorker audits batches, one claim's pair at a time.
type streamWorker struct {
	auditor *auditor
	// showAdjusted is set when the sink shows the adjusted p-values.
	showAdjusted bool
}

func (w *streamWorker) audit(b *streamBatch, opts Options, sink ClaimSink) {
	a := w.auditor
	for k := range b.runs {
		s, e := b.run(k)
		// A derived df counts the regression coefficients listed for the
		// model over the study's rows, as the whole-file audit does.
		a.pairRun, a.sizesOf = b.rows[s:e], nil
		for i := s; i < e; i++ {
			pc := &b.rows[i]
			a.loadPair(&pc.First, &pc.Second)
			// A recycled batch's results are filled again in place (see
			// claimInto); they are not cleared.
			if len(b.claims) < cap(b.claims) {
				b.claims = b.claims[:len(b.claims)+1]
			} else {
				b.claims = append(b.claims, ClaimResult{})
			}
			a.claimInto(&b.claims[len(b.claims)-1], &pc.Claim)
			// The problems in the order auditor.problems gives them.
			b.keep(cellProblems(pc.First.Problems))
			b.keep(cellProblems(pc.Second.Problems))
			b.keep(cellProblems(pc.Claim.Problems))
			b.keep(a.pairConflicts[0])
			b.keep(a.pairConflicts[1])
		}
		finishClaims(b.claims[s:e], opts, false, w.showAdjusted)
	}
	if b.counts == nil {
		b.counts = map[string]int{}
	}
	for i := range b.claims {
		b.counts[b.claims[i].Outcome]++
		b.out = sink.AppendClaim(b.out, &b.claims[i], b.first+i)
	}
}

// recycle empties the batch for reuse, keeping its buffers. The rows and
// claims are overwritten whole when the batch is filled again, so they are
// not cleared: what they still hold is bounded by the batches in flight.
func (b *streamBatch) recycle() {
	clear(b.counts)
	clear(b.kept)
	b.rows, b.claims, b.runs, b.out, b.kept = b.rows[:0], b.claims[:0], b.runs[:0], b.out[:0], b.kept[:0]
	b.omitted, b.err = 0, nil
}

// showsAdjustedP reports whether sink's encoding of a claim shows its
// adjusted p-values (the JSON does, the CSV does not); a sink that does not
// say is taken to.
func showsAdjustedP(sink ClaimSink) bool {
	s, ok := sink.(interface{ showsAdjustedP() bool })
	return !ok || s.showsAdjustedP()
}

// CSVSink writes a streamed audit as the CSV report, one row per claim.
type CSVSink struct {
	w     *bufio.Writer
	extra []string
}

// NewCSVSink returns a sink writing CSV to w.
func NewCSVSink(w io.Writer) *CSVSink { return &CSVSink{w: bufio.NewWriterSize(w, 1<<16)} }

// Begin writes the header.
func (s *CSVSink) Begin(extra []string) error {
	s.extra = extra
	_, err := s.w.Write(appendCSVHeader(nil, extra))
	return err
}

// The CSV rows have no column of adjusted p-values.
func (s *CSVSink) showsAdjustedP() bool { return false }

// AppendClaim appends one claim's row.
func (s *CSVSink) AppendClaim(dst []byte, c *ClaimResult, _ int) []byte {
	return appendCSVClaim(dst, c, s.extra)
}

// Write writes encoded rows.
func (s *CSVSink) Write(p []byte) (int, error) { return s.w.Write(p) }

// Finish flushes the CSV; problems go to the JSON and table reports, not
// into the rows.
func (s *CSVSink) Finish(Summary, []Problem, int) error { return s.w.Flush() }

// JSONSink writes a streamed audit in the JSON form of the output contract:
// the same keys and values as WriteJSON, with "claims" written as they come
// and "summary" and "problems" after them.
type JSONSink struct {
	w     *bufio.Writer
	alpha float64
}

// NewJSONSink returns a sink writing JSON to w.
func NewJSONSink(w io.Writer) *JSONSink {
	return &JSONSink{w: bufio.NewWriterSize(w, 1<<16), alpha: extract.DefaultAlpha}
}

// Begin opens the report and its claims array.
func (s *JSONSink) Begin([]string) error {
	_, err := fmt.Fprintf(s.w, "{\n  \"alpha\": %s,\n  \"claims\": [", formatAlpha(s.alpha))
	return err
}

// AppendClaim appends one claim, after a comma unless it is the first.
func (s *JSONSink) AppendClaim(dst []byte, c *ClaimResult, index int) []byte {
	if index > 0 {
		dst = append(dst, ',')
	}
	return appendClaimJSON(append(dst, "\n    "...), c, "    ")
}

// Write writes encoded claims.
func (s *JSONSink) Write(p []byte) (int, error) { return s.w.Write(p) }

// Finish writes the summary and the problems and flushes.
func (s *JSONSink) Finish(sum Summary, problems []Problem, omitted int) error {
	if sum.Claims > 0 {
		s.w.WriteString("\n  ")
	}
	s.w.WriteString("],\n  \"summary\": ")
	b, err := json.Marshal(sum)
	if err != nil {
		return err
	}
	s.w.Write(b)
	if problems == nil {
		problems = []Problem{}
	}
	if omitted > 0 {
		problems = append(problems, Problem{Message: fmt.Sprintf("%d further problems were found and not listed", omitted)})
	}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.SetIndent("  ", "  ")
	if err := enc.Encode(problems); err != nil {
		return err
	}
	s.w.WriteString(",\n  \"problems\": ")
	s.w.Write(bytes.TrimSuffix(buf.Bytes(), []byte("\n")))
	s.w.WriteString("\n}\n")
	return s.w.Flush()
}
