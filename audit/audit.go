package audit

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer"
)

// Options are the settings of an audit.
type Options struct {
	// Adjust names the multiplicity adjustment whose p decides outcomes:
	// AdjustNone, AdjustHolm or AdjustBH.
	Adjust string

	// families, when set, holds the adjusted p of claims whose families
	// are audited in pieces (StudiesOf).
	families *familyPValues
}

// Multiplicity adjustments for Options.Adjust.
const (
	AdjustNone = "none"
	AdjustHolm = "holm"
	AdjustBH   = "bh"
)

// DefaultOptions are the settings used when none are given.
var DefaultOptions = Options{Adjust: AdjustNone}

// coefKey identifies a coefficient: its study and label.
type coefKey struct{ study, label string }

// auditor holds what every claim's audit of one study looks up.
type auditor struct {
	coef map[coefKey]*extract.Coefficient
	// duplicated, conflicts and rebuilt are nil until they get an entry:
	// most studies have none, and a study's maps made empty cost more than
	// its claims' statistics (BenchmarkAuditMillion in package report,
	// -benchmem).
	duplicated map[coefKey]bool
	// conflicts holds each coefficient's printed numbers that contradict
	// each other, in input order of the coefficients.
	conflicts map[*extract.Coefficient][]Problem
	// modelCoefs lists each model's coefficients in input order.
	modelCoefs map[modelKey][]*extract.Coefficient
	// rebuilt holds each coefficient's disagreements with a model rebuilt
	// from a correlation table, found while auditing claims.
	rebuilt map[*extract.Coefficient][]Problem
	// corr holds the correlation tables by sample; corrProblems the
	// problems of placing them.
	corr         map[[2]string]*corrSource
	corrProblems []Problem
}

// Audit audits every study of an input held in memory, in the order
// extract.Source gives them, and collects every problem of the input. It
// never fails: a claim that cannot be tested gets the outcome incomplete
// with notes saying why.
func Audit(in *extract.Input, opts Options) *Report {
	rep, _ := Collect(extract.FromInput(in), opts) // an input in memory cannot fail to be read
	return rep
}

// Collect audits every study of src into one report held in memory, for
// what needs every claim at once (pooling, tests). Its problems list the
// input's own first, then each study's. It fails as Run fails.
func Collect(src *extract.Source, opts Options) (*Report, error) {
	rep := &Report{Source: src.Path, Alpha: extract.DefaultAlpha, Cautions: Cautions, Claims: []ClaimResult{}}
	studies, opts, err := StudiesOf(src, opts)
	if err != nil {
		return nil, err
	}
	rep.Summary, err = Run(studies, opts, func(res StudyResult) error {
		rep.Claims = append(rep.Claims, res.Claims...)
		rep.Problems = append(rep.Problems, res.Problems...)
		return nil
	})
	if err != nil {
		return nil, err
	}
	rep.Problems = append(append([]Problem{}, cellProblems(src.Problems())...), rep.Problems...)
	return rep, nil
}

// finishClaims adjusts the claims' p within their study (one family) and
// decides their outcomes.
func finishClaims(claims []ClaimResult, opts Options) {
	if opts.families != nil {
		opts.families.apply(claims)
	} else {
		adjustFamily(claims)
	}
	for i := range claims {
		claims[i].settle(opts.Adjust)
	}
}

func newAuditor(in *extract.Input) *auditor {
	a := &auditor{}
	a.load(in)
	return a
}

// load makes the auditor look up in's coefficients.
func (a *auditor) load(in *extract.Input) {
	a.coef = make(map[coefKey]*extract.Coefficient, len(in.Coefficients))
	a.modelCoefs = map[modelKey][]*extract.Coefficient{}
	a.duplicated, a.conflicts, a.rebuilt = nil, nil, nil
	a.corr, a.corrProblems = nil, nil
	if len(in.Correlations) > 0 || len(in.Tables) > 0 {
		a.corr, a.corrProblems = correlationSources(in)
	}
	for i := range in.Coefficients {
		c := &in.Coefficients[i]
		if len(c.Problems) == 0 {
			ps := consistencyProblems(c)
			ps = append(ps, a.tableContradicts(c)...)
			if len(ps) > 0 {
				if a.conflicts == nil {
					a.conflicts = map[*extract.Coefficient][]Problem{}
				}
				a.conflicts[c] = ps
			}
		}
		k := coefKey{c.Study, c.Label}
		if _, ok := a.coef[k]; ok {
			if a.duplicated == nil {
				a.duplicated = map[coefKey]bool{}
			}
			a.duplicated[k] = true
			continue
		}
		a.coef[k] = c
		if extract.IsRegressionMeasure(c.Measure) {
			mk := modelOf(c)
			a.modelCoefs[mk] = append(a.modelCoefs[mk], c)
		}
	}
}

// find returns the coefficient with key k, the first when it repeats.
func (a *auditor) find(k coefKey) (*extract.Coefficient, bool) {
	c, ok := a.coef[k]
	return c, ok
}

func (a *auditor) isDuplicated(k coefKey) bool { return a.duplicated[k] }

// modelSizeOf is the number of regression coefficients listed for c's
// model in the study.
func (a *auditor) modelSizeOf(c *extract.Coefficient) int {
	if !extract.DerivesDFFromModelSize(c) {
		return 0 // Reconstruct does not use it
	}
	return len(a.modelCoefs[modelOf(c)])
}

// conflictsOf lists the problems of c's printed numbers that contradict
// each other.
func (a *auditor) conflictsOf(c *extract.Coefficient) []Problem { return a.conflicts[c] }

// predictorsOf lists a model's predictors in input order, each once.
func (a *auditor) predictorsOf(k modelKey) []string {
	var preds []string
	for _, c := range a.modelCoefs[k] {
		if c.Predictor != "" && indexOf(preds, c.Predictor) < 0 {
			preds = append(preds, c.Predictor)
		}
	}
	return preds
}

// lookup finds a claim's coefficient by label in the claim's study, or in
// another study when written "study:label" and no such label exists in the
// claim's own study.
func (a *auditor) lookup(study, label string) (*extract.Coefficient, error) {
	k := coefKey{study, label}
	c, ok := a.find(k)
	if !ok {
		if s, l, found := strings.Cut(label, ":"); found {
			k = coefKey{strings.TrimSpace(s), strings.TrimSpace(l)}
			c, ok = a.find(k)
		}
	}
	if !ok {
		return nil, fmt.Errorf("no coefficient labelled %q in study %q", label, study)
	}
	if a.isDuplicated(k) {
		return nil, fmt.Errorf("the label %q appears more than once in study %q, so the claim is ambiguous", k.label, k.study)
	}
	return c, nil
}

func relationOf(c1, c2 *extract.Coefficient) string {
	switch {
	case c1.Study != c2.Study || c1.Group != c2.Group:
		return Independent
	case c1.Model == c2.Model:
		return SameModel
	default:
		return SameSample
	}
}

// claim audits one claims row into r, a zero ClaimResult, whose notes
// start in notes (empty, with room for a claim's usual few). The fields
// are set one by one: a composite literal assigned through r is built
// aside and copied whole, which costs more than setting the few that are
// not zero (BenchmarkAuditMillion in package report).
func (a *auditor) claim(r *ClaimResult, cl *extract.Claim, notes []string) {
	r.Study, r.Claim, r.Row, r.Index = cl.Study, cl.Claim, cl.Row, cl.Index
	r.Published, r.Alpha, r.Basis, r.Topic = cl.Published, cl.Alpha, cl.Basis, cl.Topic
	r.First = Side{Label: cl.First, Estimate: nan, SE: nan}
	r.Second = Side{Label: cl.Second, Estimate: nan, SE: nan}
	r.Difference, r.DifferenceSE, r.Statistic, r.DF, r.P = nan, nan, nan, nan, nan
	r.DifferenceCI, r.PRange = [2]Number{nan, nan}, [2]Number{nan, nan}
	r.PoolEstimate, r.PoolSE = nan, nan
	r.ExtraNames, r.ExtraValues, r.Notes = cl.Extra.Names, cl.Extra.Values, notes
	a.audit(r, cl)
}

// audit fills in the claim's result.
func (a *auditor) audit(r *ClaimResult, cl *extract.Claim) {
	if r.Alpha == 0 {
		r.Alpha = extract.DefaultAlpha
	}
	if len(cl.Problems) > 0 {
		for _, p := range cl.Problems {
			r.Notes = append(r.Notes, fmt.Sprintf("Row %d could not be read: %s.", cl.Row, cellMessage(p)))
		}
		r.Outcome, r.Unreadable = Incomplete, true
		return
	}
	c1, err1 := a.lookup(cl.Study, cl.First)
	c2, err2 := a.lookup(cl.Study, cl.Second)
	for _, err := range []error{err1, err2} {
		if err != nil {
			r.Notes = append(r.Notes, capitalize(err.Error())+".")
		}
	}
	if err1 != nil || err2 != nil {
		r.Outcome = Incomplete
		return
	}
	bad := false
	for _, c := range []*extract.Coefficient{c1, c2} {
		for _, p := range c.Problems {
			r.Notes = append(r.Notes, fmt.Sprintf("Coefficient %s (%s) has a problem: %s.", c.Label, extract.Position{File: baseName(c.File), Sheet: c.Sheet, Row: c.Row}, cellMessage(p)))
			bad = true
		}
	}
	if bad {
		r.Outcome = Incomplete
		return
	}
	r.Relation = relationOf(c1, c2)
	r.Measure = c1.Measure
	r.decimals = coefficientDecimals(c1, c2)
	if c1.Measure != c2.Measure {
		r.Notes = append(r.Notes, fmt.Sprintf("The claim compares a coefficient of measure %q with one of measure %q; estimates on different scales cannot be tested against each other.", c1.Measure, c2.Measure))
		r.Outcome = Incomplete
		return
	}
	rebuilt1, e1 := extract.Reconstruct(c1, a.modelSizeOf(c1))
	rebuilt2, e2 := extract.Reconstruct(c2, a.modelSizeOf(c2))
	rc1, rc2 := &rebuilt1, &rebuilt2
	r.First = sideOf(c1.Label, rc1, e1)
	r.Second = sideOf(c2.Label, rc2, e2)
	r.Scale = rc1.Scale
	// A coefficient without an SE can still be tested when the sample's
	// correlation table rebuilds the model (or gives the correlations):
	// the notes of what is missing wait until that has been tried.
	var missingSE []string
	for i, err := range []error{e1, e2} {
		if err != nil {
			missingSE = append(missingSE, []string{c1.Label, c2.Label}[i]+": "+err.Error()+
				"; print its SE, interval, statistic or exact p to test the claim.")
		}
	}
	if len(missingSE) > 0 && !a.tableMayTest(r, c1, c2) {
		r.Notes = append(r.Notes, missingSE...)
		r.Outcome = Incomplete
		return
	}
	// How each SE was taken from the printed numbers, unless the model is
	// rebuilt from the correlation table, which then gives the SEs.
	readNotes := len(r.Notes)
	r.Notes = append(r.Notes, rc1.Notes...)
	r.Notes = append(r.Notes, rc2.Notes...)
	readEnd := len(r.Notes)
	switch rc1.Scale {
	case extract.ScaleAsPrinted:
	case extract.ScaleFisherZ:
		r.Notes = append(r.Notes, "The correlations are analysed as Fisher's z: their SEs are on that scale (as are the estimates in the JSON and CSV).")
	case extract.ScaleLog:
		r.Notes = append(r.Notes, "The ratios are analysed on the log scale (as are the estimates, SEs and difference in the JSON and CSV); the difference of the logs is shown as the ratio of the two ratios.")
	default:
		r.Notes = append(r.Notes, "Estimates, SEs and the difference are on the "+rc1.Scale+" scale.")
	}
	if reflectsSecond(cl.Published, rc1.Estimate, rc2.Estimate) {
		r.reflected = true
		reflect(rc2)
		r.Notes = append(r.Notes, reflectedNote)
	}
	r.Overlap = overlapOf(rc1, rc2, r)
	var conflicts []string
	for _, c := range []*extract.Coefficient{c1, c2} {
		for _, p := range a.conflictsOf(c) {
			where := extract.Position{File: baseName(c.File), Sheet: p.Sheet, Row: p.Row, Column: p.Column}.String()
			if where != "" {
				where = " (" + where + ")"
			}
			conflicts = append(conflicts, fmt.Sprintf("The printed numbers contradict each other%s: %s.", where, p.Message))
		}
	}

	if r.Relation == Independent {
		a.independent(r, c1, c2, rc1, rc2)
	} else {
		a.dependent(r, cl, c1, c2, rc1, rc2, missingSE)
		if r.Outcome == Incomplete {
			return
		}
		if strings.HasSuffix(r.Method, "from-correlation-table") {
			r.Notes = append(r.Notes[:readNotes], r.Notes[readEnd:]...)
			// The basis notes speak of the rebuilt estimates too.
			rc1.Estimate, rc1.SE = float64(r.First.Estimate), float64(r.First.SE)
			rc2.Estimate, rc2.SE = float64(r.Second.Estimate), float64(r.Second.SE)
			rc1.DF, rc2.DF = float64(r.DF), float64(r.DF)
			rc1.PrintedP, rc2.PrintedP = math.NaN(), math.NaN()
		}
	}
	basisNotes(r, cl, c1, c2, rc1, rc2)
	if len(conflicts) > 0 {
		r.Notes = append(r.Notes, conflicts...)
		r.conflict = true
	}
}

func sideOf(label string, rc *extract.Reconstructed, err error) Side {
	s := Side{Label: label, Estimate: Number(rc.Estimate), SE: nan, SEFrom: rc.SEFrom}
	if err == nil {
		s.SE = Number(rc.SE)
	}
	if math.IsNaN(rc.Estimate) {
		s.Estimate = nan
	}
	return s
}

// independent runs the z test of two estimates from independent samples
// and classifies the claim.
func (a *auditor) independent(r *ClaimResult, c1, c2 *extract.Coefficient, rc1, rc2 *extract.Reconstructed) {
	d, err := infer.IndependentDifference(rc1.Estimate, rc1.SE, rc2.Estimate, rc2.SE, 1-r.Alpha)
	if err != nil {
		r.Notes = append(r.Notes, "The difference could not be tested: "+err.Error()+".")
		r.Outcome = Incomplete
		return
	}
	r.Method = "independent-z"
	r.setDifference(d)
	if r.Measure == extract.MeasureR {
		a.independentCorrelations(r, c1, c2, rc1, rc2)
	}
	ser := infer.Range{Lo: math.Hypot(rc1.SERange.Lo, rc2.SERange.Lo), Hi: math.Hypot(rc1.SERange.Hi, rc2.SERange.Hi)}
	how := rangeSafe
	if rc1.SEExactRange && rc2.SEExactRange {
		how = rangeExact
	}
	a.finishRange(r, rc1, rc2, ser, math.NaN(), how)
}

func (r *ClaimResult) setDifference(d infer.Difference) {
	r.Difference = Number(d.Estimate)
	r.DifferenceSE = Number(d.SE)
	r.PoolEstimate, r.PoolSE, r.PoolScale = Number(d.Estimate), Number(d.SE), r.Scale
	r.DifferenceCI = [2]Number{Number(d.CI[0]), Number(d.CI[1])}
	r.Statistic = Number(d.Stat)
	r.DF = Number(d.DF)
	r.P = Number(d.P)
}

func overlapOf(rc1, rc2 *extract.Reconstructed, r *ClaimResult) *OverlapResult {
	if math.IsNaN(rc1.CI[0]) || math.IsNaN(rc2.CI[0]) {
		return nil
	}
	if rc1.Level != rc2.Level {
		r.Notes = append(r.Notes, fmt.Sprintf("The two intervals have different levels (%g%% and %g%%), so their overlap is not read.", 100*rc1.Level, 100*rc2.Level))
		return nil
	}
	o, err := infer.CIOverlap(rc1.Estimate, rc1.CI[0], rc1.CI[1], rc2.Estimate, rc2.CI[0], rc2.CI[1], rc1.Level)
	if err != nil {
		return nil
	}
	return &OverlapResult{Proportion: Number(o.Proportion), ImpliedP: Number(o.ImpliedP), marginRatio: o.MarginRatio}
}

func collectProblems(in *extract.Input) []Problem {
	ps := []Problem{}
	add := func(errs []*extract.CellError) { ps = append(ps, cellProblems(errs)...) }
	add(in.Problems)
	for _, c := range in.Coefficients {
		add(c.Problems)
	}
	for _, c := range in.Claims {
		add(c.Problems)
	}
	for _, c := range in.Correlations {
		add(c.Problems)
	}
	for _, t := range in.Tables {
		add(t.Problems)
	}
	return ps
}

// cellProblems turns the reader's cell errors into problems.
func cellProblems(errs []*extract.CellError) []Problem {
	if len(errs) == 0 {
		return nil
	}
	ps := make([]Problem, len(errs))
	for i, e := range errs {
		ps[i] = problemAt(e.Position, e.Column, e.Err.Error())
	}
	return ps
}

func cellMessage(e *extract.CellError) string {
	if e.Column != "" {
		return fmt.Sprintf("column %q: %v", e.Column, e.Err)
	}
	return e.Err.Error()
}

// problemAt places a problem at pos (its column replaced by column).
func problemAt(pos extract.Position, column, message string) Problem {
	return Problem{File: baseName(pos.File), Sheet: pos.Sheet, Row: pos.Row, Column: column, Message: message}
}

// baseName is a file's name without its folder, for notes: the reader
// knows which input it gave, and a temporary folder says nothing.
func baseName(path string) string {
	if path == "" {
		return ""
	}
	return filepath.Base(path)
}

func capitalize(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
