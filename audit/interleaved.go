package audit

import (
	"fmt"
	"iter"
	"math"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
)

// StudiesOf returns what Run should audit for src, and the options to
// audit it with, so that results come in input order of the claims and a
// study's claims are one family. For the usual input that is src's
// studies. When the studies of src interleave (extract.Source.Interleaved),
// Run would hold the results of every study audited before the claims
// ahead of them were emitted: for a shuffled file, nearly all of them.
// Such an input is read twice in pieces instead, holding a few numbers a
// claim: StudiesOf audits each run of rows alone and keeps each claim's p
// and family (its study, or its block of extract.MaxFamily claims), and
// adjusts every family whole; Run then audits the pieces again with their
// family's adjusted p and emits them as they come, with the same outcomes
// as when the study's rows stand together, at the cost of auditing every
// claim twice. StudiesOf fails when that first pass cannot read src.
func StudiesOf(src *extract.Source, opts Options) (iter.Seq2[*extract.Study, error], Options, error) {
	if !src.Interleaved() {
		return src.Studies(), opts, nil
	}
	fam := &familyPValues{study: map[string]int32{}, index: map[familyKey]int32{}}
	if _, err := Run(src.Pieces(), opts, fam.record); err != nil {
		return nil, opts, err
	}
	fam.adjust()
	opts.families = fam
	return src.Pieces(), opts, nil
}

// familyKey names a family: a study (by its number in familyPValues.study),
// or a block of a long one.
type familyKey struct{ study, block int32 }

// familyPValues holds, by claim Index, what the multiplicity adjustment of
// a claim takes from the rest of its family.
type familyPValues struct {
	study map[string]int32    // the number of each study
	read  []int32             // the claims of each study recorded so far
	index map[familyKey]int32 // the number of each family
	of    []int32             // each claim's family
	// p is each claim's raw p (NaN when none is adjusted) until adjust,
	// which puts the Holm-adjusted p in its place: memory holds the
	// least it can a claim, as a shuffled file has a million of them.
	p    []float64
	bh   []float64 // each claim's Benjamini–Hochberg-adjusted p, after adjust
	size []int32   // the claims with a p in each family
}

// record keeps the p and family of the claims of one piece, which come in
// order of their Index.
func (f *familyPValues) record(res StudyResult) error {
	for i := range res.Claims {
		c := &res.Claims[i]
		if c.Index != len(f.of) {
			return fmt.Errorf("claim %d came after claim %d: the pieces of the input are out of order", c.Index, len(f.of)-1)
		}
		sid, ok := f.study[c.Study]
		if !ok {
			// A claim's strings are cut from its whole input line, which
			// a key would keep alive for the rest of the run.
			sid = int32(len(f.read))
			f.study[strings.Clone(c.Study)] = sid
			f.read = append(f.read, 0)
		}
		k := familyKey{sid, f.read[sid] / extract.MaxFamily}
		f.read[sid]++
		id, ok := f.index[k]
		if !ok {
			id = int32(len(f.size))
			f.index[k] = id
			f.size = append(f.size, 0)
		}
		p := math.NaN()
		if c.P.Known() && c.decided { // the claims adjustFamily adjusts
			p = float64(c.P)
			f.size[id]++
		}
		f.of = append(f.of, id)
		f.p = append(f.p, p)
	}
	return nil
}

// adjust computes the adjusted p of every claim that has one, family by
// family, as adjustFamily does for a study held whole.
func (f *familyPValues) adjust() {
	// The claims of each family, in input order, by a counting sort.
	start := make([]int32, len(f.size)+1)
	for i, id := range f.of {
		if !math.IsNaN(f.p[i]) {
			start[id+1]++
		}
	}
	for id := range f.size {
		start[id+1] += start[id]
	}
	order := make([]int32, start[len(f.size)])
	next := append([]int32(nil), start[:len(f.size)]...)
	for i, id := range f.of {
		if !math.IsNaN(f.p[i]) {
			order[next[id]] = int32(i)
			next[id]++
		}
	}
	f.bh = make([]float64, len(f.of))
	var p []float64
	for id := range f.size {
		claims := order[start[id]:start[id+1]]
		p = p[:0]
		for _, i := range claims {
			p = append(p, f.p[i])
		}
		holm, bh := infer.HolmAdjust(p), infer.BenjaminiHochbergAdjust(p)
		for k, i := range claims {
			f.p[i], f.bh[i] = holm[k], bh[k]
		}
	}
	f.study, f.read, f.index = nil, nil, nil
}

// apply gives the claims of one piece their family's adjusted p.
func (f *familyPValues) apply(claims []ClaimResult) {
	for i := range claims {
		c := &claims[i]
		if c.Index < len(f.of) && c.P.Known() && c.decided {
			c.AdjustedP = &AdjustedPValues{Holm: Number(f.p[c.Index]), BH: Number(f.bh[c.Index])}
			c.family = int(f.size[f.of[c.Index]])
		}
	}
}
