package audit

import (
	"iter"
	"slices"

	"coefaudit/extract"
)

// Run audits studies one at a time and hands the results to emit in input
// order of the claims rows: each call holds a run of consecutive claims of
// one study, with that study's problems on its first run (a study without
// claims is one call with problems only). A study is audited whole, so its
// claims are one family wherever they stand; when studies interleave in the
// input, the results of a study audited early are held until the claims
// before them have been emitted. For the usual input, whose rows of a study
// stand together, nothing is held and emit is called once a study.
//
// Run stops at the first error of studies or of emit and returns it, with
// the summary of the claims audited until then.
func Run(studies iter.Seq2[*extract.Study, error], opts Options, emit func(StudyResult) error) (Summary, error) {
	sum := Summary{Counts: map[string]int{}}
	var (
		pending  = map[int]ClaimResult{} // audited claims not yet emitted, by Index
		problems = map[int][]Problem{}   // a study's problems, by its first claim's Index
		next     = 0                     // the Index to emit next
	)
	flush := func() error {
		for {
			c, ok := pending[next]
			if !ok {
				return nil
			}
			run := StudyResult{Study: c.Study, Problems: problems[next]}
			delete(problems, next)
			for ok && c.Study == run.Study {
				run.Claims = append(run.Claims, c)
				delete(pending, next)
				next++
				c, ok = pending[next]
			}
			if err := emit(run); err != nil {
				return err
			}
		}
	}
	for st, err := range studies {
		if err != nil {
			return sum, err
		}
		res := AuditStudy(st, opts)
		sum.Add(res.Claims)
		if len(res.Claims) == 0 {
			if err := flush(); err != nil {
				return sum, err
			}
			if err := emit(res); err != nil {
				return sum, err
			}
			continue
		}
		first := res.Claims[0].Index
		for _, c := range res.Claims {
			first = min(first, c.Index)
			pending[c.Index] = c
		}
		if len(res.Problems) > 0 {
			problems[first] = append(problems[first], res.Problems...)
		}
		if err := flush(); err != nil {
			return sum, err
		}
	}
	// Claims whose Index leaves a gap (an input built by hand) are emitted
	// in order of their Index.
	for len(pending) > 0 {
		next = slices.Min(keys(pending))
		if err := flush(); err != nil {
			return sum, err
		}
	}
	return sum, nil
}

func keys(m map[int]ClaimResult) []int {
	out := make([]int, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	return out
}
