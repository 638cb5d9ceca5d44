package audit

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
)

// Recomputed verdict when the p range leaves the test undecided.
const undetermined = "undetermined"

// dependent audits a claim whose two estimates come from one sample. In
// order of preference it uses: for correlations, the comparison of
// dependent correlations with the cross correlations of the paper's table;
// for two coefficients of one regression, the covariance rebuilt from the
// paper's correlation table; the printed sampling correlation of the two
// estimates (estimate_corr); and otherwise the range over every admissible
// correlation.
//
// missingSE holds the notes of a coefficient whose SE the printed numbers
// do not give: the table may still test the claim, and otherwise it is
// incomplete with those notes.
func (a *auditor) dependent(r *ClaimResult, cl *extract.Claim, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed, missingSE []string) {
	src := a.corrOf(c1.Study, c1.Group)
	if msg := src.contradictionFor(r); msg != "" {
		r.Notes = append(r.Notes, msg)
		r.conflict = true
	}
	if r.Measure == extract.MeasureR && src != nil {
		if a.dependentCorrelations(r, c1, c2, src) {
			return
		}
	}
	if r.Relation == SameModel && extract.IsRegressionMeasure(r.Measure) && src != nil {
		if a.regressionFromTable(r, c1, c2, rc1, rc2, src) {
			return
		}
	}
	if len(missingSE) > 0 {
		r.Notes = append(r.Notes, missingSE...)
		r.Outcome = Incomplete
		return
	}
	if cl.EstimateCorr.IsExact() {
		a.withEstimateCorr(r, cl.EstimateCorr, rc1, rc2)
		return
	}
	a.admissible(r, c1, c2, rc1, rc2)
}

// tableMayTest reports whether the sample's correlations may test a claim
// of one sample whatever its printed SEs: dependent correlations, or two
// coefficients of one regression rebuilt from the table.
func (a *auditor) tableMayTest(r *ClaimResult, c1, c2 *extract.Coefficient) bool {
	if r.Relation == Independent || a.corrOf(c1.Study, c1.Group) == nil ||
		!c1.Estimate.IsExact() || !c2.Estimate.IsExact() {
		return false
	}
	return r.Measure == extract.MeasureR || (r.Relation == SameModel && extract.IsRegressionMeasure(r.Measure))
}

// commonDF returns the residual df two coefficients of one model share, or
// NaN when they do not share one.
func commonDF(r *ClaimResult, rc1, rc2 *extract.Reconstructed) float64 {
	if r.Relation == SameModel && rc1.DF == rc2.DF {
		return rc1.DF
	}
	return math.NaN()
}

// withEstimateCorr tests the difference with the printed sampling
// correlation ρ of the two estimates: Var(d) = SE1² + SE2² − 2ρ SE1 SE2.
func (a *auditor) withEstimateCorr(r *ClaimResult, rho extract.Printed, rc1, rc2 *extract.Reconstructed) {
	df := commonDF(r, rc1, rc2)
	if r.reflected {
		rho = negated(rho)
	}
	d, err := infer.CorrelatedDifference(rc1.Estimate, rc1.SE, rc2.Estimate, rc2.SE, rho.Value, df, 1-r.Alpha)
	if err != nil {
		r.Notes = append(r.Notes, "The difference could not be tested with the printed estimate_corr: "+err.Error()+".")
		r.Outcome = Incomplete
		return
	}
	r.Method = "z-with-estimate-corr"
	if !math.IsNaN(df) {
		r.Method = "t-with-estimate-corr"
	}
	r.setDifference(d)
	rlo, rhi := rho.RoundingInterval()
	rlo, rhi = math.Max(rlo, -1), math.Min(rhi, 1)
	s1, s2 := rc1.SERange, rc2.SERange
	var vLo, vHi float64
	how := rangeSafe
	if s1.Lo > rhi*s2.Hi && s2.Lo > rhi*s1.Hi {
		// Var = s1² + s2² − 2ρ s1 s2 rises with s1 (∂/∂s1 = 2(s1 − ρ s2) > 0)
		// and with s2 throughout the box, and falls with ρ: its extremes are
		// at the corners.
		vLo = s1.Lo*s1.Lo + s2.Lo*s2.Lo - 2*rhi*s1.Lo*s2.Lo
		vHi = s1.Hi*s1.Hi + s2.Hi*s2.Hi - 2*rlo*s1.Hi*s2.Hi
		if rc1.SEExactRange && rc2.SEExactRange {
			how = rangeExact
		}
	} else {
		// Otherwise a safe outer bound: Var = (s1 − s2)² + 2(1 − ρ) s1 s2.
		gap := seGap(s1, s2)
		vLo = gap*gap + 2*(1-rhi)*s1.Lo*s2.Lo
		spread := math.Max(s1.Hi-s2.Lo, s2.Hi-s1.Lo)
		vHi = spread*spread + 2*(1-rlo)*s1.Hi*s2.Hi
	}
	r.Notes = append(r.Notes, "The two estimates' sampling correlation "+rho.Text+", as printed, enters the SE of the difference.")
	a.finishRange(r, rc1, rc2, infer.Range{Lo: math.Sqrt(math.Max(vLo, 0)), Hi: math.Sqrt(vHi)}, df, how)
}

// seGap is the smallest |s1 − s2| over the two SE ranges.
func seGap(a, b infer.Range) float64 {
	switch {
	case a.Hi < b.Lo:
		return b.Lo - a.Hi
	case b.Hi < a.Lo:
		return a.Lo - b.Hi
	}
	return 0
}

// MethodAdmissibleRange is the Method of a claim whose two estimates share
// a sample whose covariance was not printed: it is tested over every
// admissible sampling correlation of the two, so the SE of its difference
// is known only to lie between |SE1 − SE2| and SE1 + SE2.
const MethodAdmissibleRange = "admissible-range"

// admissible gives the range of p over every admissible sampling
// correlation of the two estimates, −1 to 1: Var(d) runs from (SE1 − SE2)²
// to (SE1 + SE2)².
func (a *auditor) admissible(r *ClaimResult, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed) {
	df := commonDF(r, rc1, rc2)
	r.Method = MethodAdmissibleRange
	r.Difference = Number(rc1.Estimate - rc2.Estimate)
	gap := seGap(rc1.SERange, rc2.SERange)
	ser := infer.Range{Lo: gap, Hi: rc1.SERange.Hi + rc2.SERange.Hi}
	// Said briefly: a literature of same-sample claims carries it on
	// every row.
	need := "their sampling correlation"
	switch {
	case r.Measure == extract.MeasureR:
		need = "their sampling correlation, or all the correlations among the variables with n"
	case r.Relation == SameModel:
		need = "their sampling correlation, or the correlation table of the model's variables with SDs and n"
	}
	// What would settle it, short of the closing " would settle it" that
	// the note adds: the usual settle is then need itself, not a string
	// built for each claim (BenchmarkAuditMillion in package report, on
	// same-sample claims).
	settle := need
	if src := a.corrOf(c1.Study, c1.Group); src != nil {
		settle = fmt.Sprintf("%s is printed but could not be used for this claim (see above); %s", src.what(), need)
	} else if others := a.otherSamples(c1.Study); len(others) > 0 {
		settle = fmt.Sprintf("the study's correlations (%s) describe another sample; %s for group %q", strings.Join(others, "; "), need, c1.Group)
	}
	// The study is on the claim's row in every report; the group is not.
	sample := "One sample"
	if c1.Group != "" {
		sample = "One sample (group " + strconv.Quote(c1.Group) + ")" // as %q writes it
	}
	r.Notes = append(r.Notes, sample+", covariance not printed: p is taken over every admissible correlation of the two estimates; "+settle+" would settle it.")
	if c1.Group == "" && c1.Sheet != "" {
		r.Notes = append(r.Notes, "The group column is blank for both estimates, which reads as one sample; if they come from different samples, give them different groups.")
	}
	a.finishRange(r, rc1, rc2, ser, df, rangeAdmissible)
	r.tip, r.hasTip = a.tippingOf(r, c1, c2, rc1, rc2, df)
}

// otherSamples names the correlation sources of a study, each with its
// group, in a fixed order.
func (a *auditor) otherSamples(study string) []string {
	var out []string
	for k, s := range a.corr {
		if k[0] == sampleKey(study, "")[0] {
			out = append(out, fmt.Sprintf("%s, group %q", s.name, s.group))
		}
	}
	slices.Sort(out)
	return out
}

func diffRange(rc1, rc2 *extract.Reconstructed) infer.Range {
	return infer.Range{Lo: rc1.EstimateRange.Lo - rc2.EstimateRange.Hi, Hi: rc1.EstimateRange.Hi - rc2.EstimateRange.Lo}
}

// finishRange sets p_range from the range of the difference's SE and
// classifies the claim.
func (a *auditor) finishRange(r *ClaimResult, rc1, rc2 *extract.Reconstructed, ser infer.Range, df float64, how rangeKind) {
	dr := diffRange(rc1, rc2)
	pr, err := infer.DifferencePRange(dr, ser, df)
	if err != nil {
		r.Notes = append(r.Notes, "The range of p could not be computed: "+err.Error()+".")
		r.Outcome = Incomplete
		return
	}
	r.PRange = [2]Number{Number(pr.Lo), Number(pr.Hi)}
	r.classify(rc1.Estimate, rc2.Estimate, dr, pr, how)
}
