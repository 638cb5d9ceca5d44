package audit

import "coefaudit/extract"

// Undetermined is the recomputed verdict of a claim whose test cannot say
// whether the two estimates differ (its p range straddles α).
const Undetermined = undetermined

// VerdictNote returns the index in Notes of the sentence stating the
// claim's verdict, and false when no verdict was reached (the claim could
// not be tested). A report that states the verdict itself leaves that
// note out.
func (r *ClaimResult) VerdictNote() (int, bool) {
	if !r.decided {
		return 0, false
	}
	return r.dec.verdictNote, true
}

// InputProblems turns the problems of an input that belong to no study
// (extract.Source.Problems) into report problems.
func InputProblems(errs []*extract.CellError) []Problem { return cellProblems(errs) }
