package audit

import (
	"slices"

	"coefaudit/extract"
)

// StudyResult is the audit of one study: its claims in input order and the
// problems of its rows (unreadable cells, printed numbers that contradict
// each other, correlation tables no sample can have).
type StudyResult struct {
	Study    string
	Claims   []ClaimResult
	Problems []Problem
}

// AuditStudy audits every claim of one study and decides the outcomes. The
// study's claims are one family: the Holm and Benjamini–Hochberg adjusted p
// are computed over them, and opts.Adjust says whether the outcomes use
// them. It never fails: a claim that cannot be tested is incomplete, with
// notes saying why. It reads and writes nothing.
func AuditStudy(st *extract.Study, opts Options) StudyResult {
	coefs := st.Coefficients
	if len(st.Borrowed) > 0 {
		coefs = append(slices.Clip(coefs), st.Borrowed...)
	}
	in := &extract.Input{
		Coefficients: coefs,
		Claims:       st.Claims,
		Correlations: st.Correlations,
		Tables:       st.Tables,
	}
	a := newAuditor(in)
	res := StudyResult{Study: st.Name, Claims: make([]ClaimResult, len(st.Claims))}
	// The claims' notes start in one block, notesPerClaim each: grown one
	// by one from empty, they cost several allocations a claim
	// (BenchmarkAuditMillion in package report, -benchmem). A claim with
	// more notes moves its own to a new array.
	notes := make([]string, notesPerClaim*len(st.Claims))
	for i := range st.Claims {
		at := notesPerClaim * i
		a.claim(&res.Claims[i], &st.Claims[i], notes[at:at:at+notesPerClaim])
	}
	finishClaims(res.Claims, opts)
	res.Problems = append(res.Problems, cellProblems(st.Problems)...)
	own := &extract.Input{Coefficients: st.Coefficients, Claims: st.Claims, Correlations: st.Correlations, Tables: st.Tables}
	res.Problems = append(res.Problems, collectProblems(own)...)
	res.Problems = append(res.Problems, tableProblems(own)...)
	res.Problems = append(res.Problems, a.corrProblems...)
	res.Problems = append(res.Problems, unusedProblems(a.corr, st.Name)...)
	for i := range in.Coefficients[:len(st.Coefficients)] {
		res.Problems = append(res.Problems, a.conflictsOf(&in.Coefficients[i])...)
		res.Problems = append(res.Problems, a.rebuilt[&in.Coefficients[i]]...)
	}
	return res
}

// notesPerClaim is how many notes a claim has room for before its notes
// need an array of their own: most claims have four or fewer.
const notesPerClaim = 4

// Add counts the outcomes of claims into the summary.
func (s *Summary) Add(claims []ClaimResult) {
	if s.Counts == nil {
		s.Counts = map[string]int{}
	}
	s.Claims += len(claims)
	for i := range claims {
		s.Counts[claims[i].Outcome]++
	}
}
