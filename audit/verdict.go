package audit

import (
	"math"
	"strconv"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
)

// direction returns +1 when the test favours the first estimate at
// difference d = e1 − e2, −1 when it favours the second, 0 for no
// difference. For a signed claim (first-larger, second-larger, differ) that
// is the sign of d. For a claim about magnitude (first-stronger,
// second-stronger) the two estimates have the same sign by then (one of
// opposite sign is reflected before the test, see reflectForMagnitude), so
// |e1| − |e2| has the sign of d times the sign of the estimates.
func direction(published string, e1, e2, d float64) int {
	if extract.IsMagnitudeVerdict(published) && e1+e2 < 0 {
		d = -d
	}
	switch {
	case d > 0:
		return 1
	case d < 0:
		return -1
	}
	return 0
}

// wantedDirection is the direction a directional verdict asserts, and 0
// for differ and no-difference.
func wantedDirection(published string) int {
	switch published {
	case extract.PublishedFirstLarger, extract.PublishedFirstStronger:
		return 1
	case extract.PublishedSecondLarger, extract.PublishedSecondStronger:
		return -1
	}
	return 0
}

// outcomeAt classifies a published verdict against a test that is
// significant or not, with the estimates pointing in direction dir. A
// directional verdict is reversed only when the test shows the opposite
// direction at α; an opposite point estimate without a significant
// difference leaves the verdict unsupported.
func outcomeAt(published string, significant bool, dir int) string {
	switch published {
	case extract.PublishedDiffer:
		if significant {
			return Consistent
		}
		return Unsupported
	case extract.PublishedNoDifference:
		if significant {
			return Missed
		}
		return Consistent
	}
	want := wantedDirection(published)
	switch {
	case want == 0:
		return Incomplete
	case significant && dir == want:
		return Consistent
	case significant && dir == -want:
		return Reversed
	}
	return Unsupported
}

// recomputedVerdict is the verdict the test supports, in the words of the
// published one: signed (first-larger) or about magnitude (first-stronger).
func recomputedVerdict(published string, significant bool, dir int) string {
	magnitude := extract.IsMagnitudeVerdict(published)
	switch {
	case !significant || dir == 0:
		return extract.PublishedNoDifference
	case dir > 0 && magnitude:
		return extract.PublishedFirstStronger
	case dir > 0:
		return extract.PublishedFirstLarger
	case magnitude:
		return extract.PublishedSecondStronger
	}
	return extract.PublishedSecondLarger
}

// rangeKind says how a p range was obtained, for the notes.
type rangeKind int

const (
	rangeExact      rangeKind = iota // exact over the rounding box
	rangeSafe                        // a safe outer bound over the rounding box
	rangeGrid                        // evaluated on a grid over the rounding box
	rangeAdmissible                  // over every admissible correlation and the rounding
)

func (k rangeKind) phrase() string {
	switch k {
	case rangeSafe:
		return "Within the rounding of the printed numbers (a safe outer bound) p"
	case rangeGrid:
		return "Within the rounding of the printed numbers (evaluated on a grid of their extremes and midpoints) p"
	case rangeAdmissible:
		return "Over every admissible correlation and the rounding, p"
	}
	return "Within the rounding of the printed numbers p"
}

// decision holds what a claim's outcome is decided from, once every claim
// of the input has been tested and the multiplicity adjustment is known.
type decision struct {
	e1, e2 float64
	dr, pr infer.Range
	how    rangeKind
	// verdictNote is the index in Notes of the sentence giving the verdict,
	// written for direction dir and p range used.
	verdictNote int
	dir         int
	used        infer.Range
}

// classify records the test's result for the claim; decide turns it into
// the recomputed verdict and the outcome.
func (r *ClaimResult) classify(e1, e2 float64, dr, pr infer.Range, how rangeKind) {
	r.dec, r.decided = decision{e1: e1, e2: e2, dr: dr, pr: pr, how: how}, true
}

// decide sets the recomputed verdict and the outcome. p and pr are the
// p-value and its range that decide (raw, or adjusted for multiplicity).
// The outcome turns indeterminate when the verdict could both stand and
// fall for p inside pr (rounding, or an unknown covariance) with the
// difference anywhere in dr. A claim without a point p (NaN) is decided
// only when the whole range lies on one side of α.
func (r *ClaimResult) decide(p float64, pr infer.Range) {
	dc := &r.dec
	dir := direction(r.Published, dc.e1, dc.e2, float64(r.Difference))
	dirs := [2]int{dir, dir}
	if dc.dr.Contains(0) {
		dirs = [2]int{1, -1}
	}
	// The outcomes the verdict could take, at most four.
	var seen outcomeSet
	for _, s := range [2]bool{pr.Lo < r.Alpha, pr.Hi < r.Alpha} {
		for _, dd := range dirs {
			seen.add(outcomeAt(r.Published, s, dd))
		}
	}
	if math.IsNaN(p) {
		switch {
		case pr.Hi < r.Alpha:
			p = pr.Hi
		case pr.Lo >= r.Alpha:
			p = pr.Lo
		}
	}
	if math.IsNaN(p) {
		r.Recomputed = undetermined
		r.Outcome = Indeterminate
		switch {
		case seen.n == 1:
			r.Outcome = seen.o[0]
		case !seen.has(Consistent) && seen.has(Unsupported):
			// The verdict falls whatever was not printed: the test shows
			// the opposite direction or nothing. The milder word holds.
			r.Outcome = Unsupported
		}
	} else {
		sig := p < r.Alpha
		r.Recomputed = recomputedVerdict(r.Published, sig, dir)
		r.Outcome = outcomeAt(r.Published, sig, dir)
	}
	dc.verdictNote, dc.dir, dc.used = len(r.Notes), dir, pr
	r.Notes = append(r.Notes, r.outcomeNote(dir, pr))
	if want := wantedDirection(r.Published); want != 0 && dir == -want && r.Outcome != Reversed && !math.IsNaN(p) {
		r.Notes = append(r.Notes, "The point estimates point the other way ("+
			strings.TrimSuffix(r.directionWords(-want), ".")+"), but the difference is not significant: the paper's direction is not supported, not shown reversed.")
	}
	if seen.n > 1 && seen.has(Consistent) {
		if r.Outcome == Indeterminate {
			// The verdict note gave p's range already: said once, as
			// a literature of same-sample claims carries it on every
			// row.
			r.Notes = append(r.Notes, dc.how.phrase()+" lies on both sides of α = "+FormatAlpha(r.Alpha)+".")
		} else {
			r.Notes = append(r.Notes, dc.how.phrase()+" ranges "+PSpan(pr.Lo, pr.Hi)+", on both sides of α = "+FormatAlpha(r.Alpha)+": the verdict turns on what was not printed.")
		}
		r.Outcome = Indeterminate
		if r.hasTip {
			r.TippingCorr = []Number{Number(r.tip.rho)}
			r.Notes = append(r.Notes, r.tip.note(r))
		}
	}
}

// outcomeSet is a set of outcomes small enough to need no map.
type outcomeSet struct {
	o [4]string
	n int
}

func (s *outcomeSet) has(o string) bool {
	for _, x := range s.o[:s.n] {
		if x == o {
			return true
		}
	}
	return false
}

func (s *outcomeSet) add(o string) {
	if !s.has(o) {
		s.o[s.n] = o
		s.n++
	}
}

func (r *ClaimResult) outcomeNote(dir int, pr infer.Range) string {
	switch r.Outcome {
	case Consistent:
		return r.testResult(pr, "The verdict stands: ", ".")
	case Unsupported:
		if !r.P.Known() && pr.Lo < r.Alpha {
			return r.testResult(pr, "The paper says "+r.directionWords(wantedDirection(r.Published))+", but ",
				": within what was not printed the test shows either no difference or the opposite direction, never the published one.")
		}
		return r.testResult(pr, "The paper reports a difference, but ", ", not below α = "+FormatAlpha(r.Alpha)+": the printed numbers do not show one.")
	case Missed:
		return r.testResult(pr, "The paper reports no difference, but ", ", below α = "+FormatAlpha(r.Alpha)+".")
	case Reversed:
		return r.testResult(pr, "The paper says "+r.directionWords(wantedDirection(r.Published))+", but the test shows the opposite direction at α = "+FormatAlpha(r.Alpha)+": ", ".")
	case Indeterminate:
		return r.testResult(pr, "The verdict cannot be decided: ", ".")
	case Conflict:
		return r.testResult(pr, "Taking the printed numbers at face value, ", "; but they contradict each other, so the verdict cannot be checked as printed.")
	}
	return capitalize(r.testResult(pr, "", "."))
}

// testResult says what the test of the difference gives, between the
// words before and after it: p, the difference and its interval, or the
// range of p when there is no point p. The sentence is one concatenation,
// so that the test's words are not first built on their own: nearly every
// claim has such a note (BenchmarkAuditMillion in package report).
func (r *ClaimResult) testResult(pr infer.Range, before, after string) string {
	if r.P.Known() {
		return before + "the test of the difference gives " + PStatement(float64(r.P)) + " (" + r.DifferenceText() + ")" + after
	}
	return before + "the " + r.DifferenceText() + " has p " + PSpan(pr.Lo, pr.Hi) + after
}

// directionWords says which estimate is ahead in direction dir, in the
// words of the claim: the larger (signed) or the stronger (magnitude).
func (r *ClaimResult) directionWords(dir int) string {
	which := "first"
	if dir < 0 {
		which = "second"
	}
	if extract.IsMagnitudeVerdict(r.Published) {
		return "the " + which + " estimate is the stronger (larger in magnitude)"
	}
	return "the " + which + " estimate is the larger"
}

// formatNum writes a number with four significant digits, as the notes
// print estimates.
func FormatNum(x float64) string {
	if s, ok := nonFinite(x); ok {
		return s
	}
	return strconv.FormatFloat(x, 'g', 4, 64)
}

// FormatP writes a p-value as journals print it: three decimals without
// the leading zero (".043"), "< .001" below that and "> .999" above
// (precision.go states the rule and its source).
func FormatP(p float64) string {
	switch {
	case math.IsNaN(p):
		return "NA"
	case p < 0.001:
		return "< .001"
	case p >= 0.9995: // would round to 1.000
		return "> .999"
	}
	return strings.TrimPrefix(strconv.FormatFloat(p, 'f', 3, 64), "0")
}

// PStatement writes "p = .043", "p < .001" or "p > .999".
func PStatement(p float64) string {
	s := FormatP(p)
	if strings.HasPrefix(s, "<") || strings.HasPrefix(s, ">") {
		return "p " + s
	}
	return "p = " + s
}

// FormatAlpha writes a significance level as given (0.05).
func FormatAlpha(a float64) string { return strconv.FormatFloat(a, 'g', -1, 64) }

// formatLevel writes the confidence level 100(1 − α).
func formatLevel(alpha float64) string { return strconv.FormatFloat(100*(1-alpha), 'g', -1, 64) }
