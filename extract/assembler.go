package extract

import (
	"cmp"
	"fmt"
	"maps"
	"slices"
	"strings"
)

// studyAssembler gathers claims rows, in input order, into their studies
// and hands a study on as soon as its last row has come (by the counts of
// a first pass) or it holds MaxFamily claims. Every input form goes
// through it, so that studies come in one order and long studies are cut
// the same way whatever the form.
type studyAssembler struct {
	// left holds the claims rows still to come, by study: the first
	// pass's counts, counted down, and a study's entry deleted when its
	// last row has come. Only the studies still to come stay in memory,
	// which the collector marks at every cycle of a million claims
	// (BenchmarkCheckMillionCSV in package report).
	left  rowCounts
	long  map[string]int // the totals of the studies longer than MaxFamily
	open  map[string]*Study
	index int // Index of the next claim
}

// newStudyAssembler takes over counts, the claims rows of each study; it
// spends them as rows come.
func newStudyAssembler(counts rowCounts) *studyAssembler {
	return &studyAssembler{left: counts, long: counts.long(), open: map[string]*Study{}}
}

// add puts the next claims row, with the coefficients the row itself
// carries (a paired CSV's two), into its study, numbering it (Index). It
// returns the study when it is complete, nil otherwise.
func (a *studyAssembler) add(c Claim, coefs ...Coefficient) *Study {
	c.Index = a.index
	a.index++
	left := a.left[c.Study]
	if left == nil { // a row the first pass did not see
		left = new(int)
		a.left[strings.Clone(c.Study)] = left
	}
	st := a.open[c.Study]
	if st == nil {
		// Sized from the first pass: a study's rows are copied once.
		n := min(max(*left, 1), MaxFamily)
		st = &Study{Name: c.Study, Claims: make([]Claim, 0, n)}
		if len(coefs) > 0 {
			st.Coefficients = make([]Coefficient, 0, len(coefs)*n)
		}
		a.open[c.Study] = st
	}
	st.Claims = append(st.Claims, c)
	st.Coefficients = append(st.Coefficients, coefs...)
	*left--
	if *left > 0 && len(st.Claims) < MaxFamily {
		return nil
	}
	delete(a.open, c.Study)
	if *left <= 0 {
		// A row of the study after this one (the file changed between
		// the passes) counts as a row the first pass did not see.
		delete(a.left, c.Study)
	}
	if total, ok := a.long[c.Study]; ok && total-*left > MaxFamily {
		st.Problems = append(st.Problems, familyProblem(st.Claims[0], total))
	}
	return st
}

// unfinished returns the studies still open, by their first claim: rows the
// first pass did not see (the file changed between the passes) leave them.
func (a *studyAssembler) unfinished() []*Study {
	sts := slices.Collect(maps.Values(a.open))
	slices.SortFunc(sts, func(x, y *Study) int { return cmp.Compare(x.Claims[0].Index, y.Claims[0].Index) })
	return sts
}

// familyProblem says that the claims from first on are a block of a study
// of total claims, adjusted as a family of their own.
func familyProblem(first Claim, total int) *CellError {
	p := first.Position
	p.Column = "study"
	return &CellError{Position: p, Err: fmt.Errorf("study %q has %d claims; its claims from this row on are adjusted for multiplicity as a family of their own, in blocks of %d: %w",
		first.Study, total, MaxFamily, ErrInputTooLarge)}
}

// rowCounts counts claims rows by study during a first pass. Its keys are
// copies, and it counts through pointers, because a key assigned to a map
// again is stored again: a study cell is cut from its whole input line,
// which would keep the last line of every study alive.
type rowCounts map[string]*int

// add counts one row of study and returns the rows of study counted so
// far, this one included.
func (c rowCounts) add(study string) int {
	n, seen := c[study]
	if !seen {
		n = new(int)
		c[strings.Clone(study)] = n
	}
	*n++
	return *n
}

// long returns the totals of the studies longer than MaxFamily, which are
// cut into blocks.
func (c rowCounts) long() map[string]int {
	out := map[string]int{}
	for k, n := range c {
		if *n > MaxFamily {
			out[k] = *n
		}
	}
	return out
}

// total is the number of rows counted.
func (c rowCounts) total() int {
	sum := 0
	for _, n := range c {
		sum += *n
	}
	return sum
}
