package audit

import (
	"iter"
	"maps"
	"runtime"
	"slices"

	"coefaudit/extract"
)

// Run audits studies and hands the results to emit in input order of the
// claims rows: each call holds a run of consecutive claims of one study,
// with that study's problems on its first run (a study without claims is
// one call with problems only). A study is audited whole, so its claims
// are one family wherever they stand; when studies interleave in the
// input, the results of a study audited early are held until the claims
// before them have been emitted. For the usual input, whose rows of a
// study stand together, nothing is held and emit is called once a study.
//
// Studies are read in one goroutine and audited on one worker per CPU
// (BenchmarkCheckMillionCSV in package report misses its target on one);
// emit is called from the caller's goroutine only, so a writer need not be
// safe for concurrent use. Run stops at the first error of studies or of
// emit and returns it, with the summary of the claims emitted until then.
func Run(studies iter.Seq2[*extract.Study, error], opts Options, emit func(StudyResult) error) (Summary, error) {
	workers := runtime.GOMAXPROCS(0)
	jobs := make(chan auditJob, workers)
	ordered := make(chan chan []StudyResult, 2*workers) // results in study order
	done := make(chan struct{})
	var readErr error
	go func() {
		defer close(ordered)
		defer close(jobs)
		var batch []*extract.Study
		claims := 0
		send := func() bool {
			res := make(chan []StudyResult, 1)
			select {
			case jobs <- auditJob{batch, res}:
			case <-done:
				return false
			}
			select {
			case ordered <- res:
			case <-done:
				return false
			}
			batch, claims = nil, 0
			return true
		}
		for st, err := range studies {
			if err != nil {
				readErr = err
				break
			}
			batch = append(batch, st)
			// A study without claims counts as one, so that a source of
			// such studies (articles whose claims were not matched) is
			// still handed out in batches rather than held whole; and a
			// study counts one per 16 coefficients at least, so that a
			// batch of dense articles does not hold hundreds of them at
			// once (measured with /usr/bin/time -v on `check` of 1,000
			// generated dense articles, TestWriteDenseArticles).
			if claims += max(len(st.Claims), len(st.Coefficients)/16, 1); claims >= batchClaims && !send() {
				return
			}
		}
		if len(batch) > 0 {
			send()
		}
	}()
	for range workers {
		go func() {
			for j := range jobs {
				out := make([]StudyResult, len(j.studies))
				for i, st := range j.studies {
					out[i] = AuditStudy(st, opts)
				}
				j.res <- out
			}
		}()
	}
	em := emitter{emit: emit, pending: map[int]ClaimResult{}, problems: map[int][]Problem{}, sum: Summary{Counts: map[string]int{}}}
	var err error
	for res := range ordered {
		for _, r := range <-res {
			if err == nil {
				err = em.add(r)
			}
		}
		if err != nil {
			break
		}
	}
	close(done)
	for res := range ordered { // let the reader end
		<-res
	}
	if err == nil {
		err = readErr
	}
	if err == nil {
		err = em.drain()
	}
	return em.sum, err
}

// batchClaims is about how many claims the reader hands a worker at once:
// whole studies, so that a paper's handful of claims does not cost a
// hand-off between goroutines each (BenchmarkCheckMillionCSV in package
// report).
const batchClaims = 256

// auditJob is a batch of studies on its way to a worker, and where their
// results go.
type auditJob struct {
	studies []*extract.Study
	res     chan []StudyResult
}

// emitter puts audited studies back into input order of their claims.
type emitter struct {
	emit     func(StudyResult) error
	pending  map[int]ClaimResult // audited claims not yet emitted, by Index
	problems map[int][]Problem   // a study's problems, by its first claim's Index
	next     int                 // the Index to emit next
	sum      Summary
}

// add takes a study's results and emits every claim that is now next.
func (e *emitter) add(res StudyResult) error {
	if len(res.Claims) == 0 {
		if err := e.flush(); err != nil {
			return err
		}
		return e.emit(res)
	}
	if len(e.pending) == 0 && inOrderFrom(res.Claims, e.next) {
		// The usual input: the study's claims are the next ones, together.
		e.next += len(res.Claims)
		e.sum.Add(res.Claims)
		return e.emit(res)
	}
	first := res.Claims[0].Index
	for _, c := range res.Claims {
		first = min(first, c.Index)
		e.pending[c.Index] = c
	}
	if len(res.Problems) > 0 {
		e.problems[first] = append(e.problems[first], res.Problems...)
	}
	return e.flush()
}

// inOrderFrom reports whether claims hold the Indexes next, next+1, ….
func inOrderFrom(claims []ClaimResult, next int) bool {
	for i := range claims {
		if claims[i].Index != next+i {
			return false
		}
	}
	return true
}

// flush emits the pending claims from e.next on, in runs of one study.
func (e *emitter) flush() error {
	for {
		c, ok := e.pending[e.next]
		if !ok {
			return nil
		}
		run := StudyResult{Study: c.Study, Problems: e.problems[e.next]}
		delete(e.problems, e.next)
		for ok && c.Study == run.Study {
			run.Claims = append(run.Claims, c)
			delete(e.pending, e.next)
			e.next++
			c, ok = e.pending[e.next]
		}
		e.sum.Add(run.Claims)
		if err := e.emit(run); err != nil {
			return err
		}
	}
}

// drain emits what is left after the last study: claims whose Index leaves
// a gap (an input built by hand), in order of their Index.
func (e *emitter) drain() error {
	for len(e.pending) > 0 {
		e.next = slices.Min(slices.Collect(maps.Keys(e.pending)))
		if err := e.flush(); err != nil {
			return err
		}
	}
	return nil
}
