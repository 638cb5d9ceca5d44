package audit

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"coefaudit/extract"
	"coefaudit/infer/regress"
)

// corrSource is what an input printed about the correlations of one
// sample: a "table ..." sheet or the rows of the long correlations sheet
// for one study and group.
type corrSource struct {
	name  string
	index map[string]int
	r     [][]extract.Printed
	n     float64 // NaN when not printed
	sd    []extract.Printed
	mean  []extract.Printed
	vars  []string
	// pos places the source for problems (a table sheet's, or the first
	// row of the sample in the long sheet); study and group are as
	// printed, group after the rule for a table without one.
	pos          extract.Position
	study, group string
	// used is set when a claim's test used the source; why holds the
	// first reason a claim that tried it could not.
	used bool
	why  string
	// minEigen is the smallest eigenvalue of a complete table that is not
	// positive definite, NaN otherwise (set by checkDefinite).
	minEigen float64
}

// checkDefinite sets minEigen when the source's correlations are all
// printed and form a matrix that no sample can have.
func (s *corrSource) checkDefinite() {
	s.minEigen = math.NaN()
	if len(s.r) < 2 {
		return
	}
	for i, row := range s.r {
		for j, v := range row {
			if i != j && !v.IsExact() {
				return
			}
		}
	}
	var npd *regress.NotPositiveDefiniteError
	if err := regress.CheckCorrelationMatrix((&modelTable{r: s.r}).point().r); errors.As(err, &npd) {
		s.minEigen = npd.MinEigenvalue
	}
}

// contradictionFor is contradiction for a claim that would use the source
// (dependent correlations, or two coefficients of one regression), "" for
// others and for no source.
func (s *corrSource) contradictionFor(r *ClaimResult) string {
	if s == nil || !(r.Measure == extract.MeasureR || (r.Relation == SameModel && extract.IsRegressionMeasure(r.Measure))) {
		return ""
	}
	msg := s.contradiction()
	if msg != "" {
		s.used = true // its problem is listed; it is not also "unused"
	}
	return msg
}

// contradiction says, for a claim that uses the source, that its
// correlations contradict each other; "" when they do not.
func (s *corrSource) contradiction() string {
	if math.IsNaN(s.minEigen) {
		return ""
	}
	return fmt.Sprintf("The correlations in %s are not positive definite (smallest eigenvalue %.3g): no sample can have them all, so the printed numbers contradict each other and no verdict is drawn from them.", s.name, s.minEigen)
}

// corrOf is the correlation source of a sample, nil when there is none.
// Most studies print no correlations: their sample's key, which lowers the
// case of the study's name anew each time, is then not made at all
// (BenchmarkAuditMillion in package report).
func (a *auditor) corrOf(study, group string) *corrSource {
	if len(a.corr) == 0 {
		return nil
	}
	return a.corr[sampleKey(study, group)]
}

func sampleKey(study, group string) [2]string {
	return [2]string{strings.ToLower(strings.TrimSpace(study)), strings.ToLower(strings.TrimSpace(group))}
}

func varKey(v string) string { return strings.ToLower(strings.TrimSpace(v)) }

// studyGroups lists, by study key, the distinct groups of the input's
// coefficients in input order, as printed.
func studyGroups(in *extract.Input) map[string][]string {
	out := map[string][]string{}
	seen := map[[2]string]bool{}
	for i := range in.Coefficients {
		c := &in.Coefficients[i]
		k := sampleKey(c.Study, c.Group)
		if !seen[k] {
			seen[k] = true
			out[k[0]] = append(out[k[0]], strings.TrimSpace(c.Group))
		}
	}
	return out
}

// sampleOf places the correlations of a study printed without a group. A
// study whose coefficients all come from one sample has only that sample
// for them to describe; a study with several leaves them unplaced, with a
// problem naming the groups they could belong to (the message, "" when
// placed).
func sampleOf(groups map[string][]string, study, group, what string) (string, string) {
	if strings.TrimSpace(group) != "" {
		return group, ""
	}
	gs := groups[sampleKey(study, "")[0]]
	switch {
	case len(gs) == 1:
		return gs[0], ""
	case len(gs) > 1:
		return group, fmt.Sprintf("%s of study %q has no group, and the study has %d samples (groups %s): add a group row naming the one it describes; it is not used",
			what, study, len(gs), quotedList(gs))
	}
	return group, ""
}

func quotedList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}

// correlationSources gathers the correlation tables of an input by sample,
// and the problems of placing them. A table sheet wins over the long sheet
// for the same sample.
func correlationSources(in *extract.Input) (map[[2]string]*corrSource, []Problem) {
	out := map[[2]string]*corrSource{}
	long := map[[2]string]*corrSource{}
	var order [][2]string
	var problems []Problem
	groups := studyGroups(in)
	for _, c := range in.Correlations {
		if len(c.Problems) > 0 {
			continue
		}
		group, _ := sampleOf(groups, c.Study, c.Group, "")
		k := sampleKey(c.Study, group)
		s := long[k]
		if s == nil {
			name := "the correlations sheet"
			if c.Sheet == "" {
				name = "the correlations given" // typed, not read from a workbook
			}
			s = &corrSource{name: name, index: map[string]int{}, n: math.NaN(),
				pos: c.Position, study: c.Study, group: group}
			if _, msg := sampleOf(groups, c.Study, c.Group, fmt.Sprintf("the correlations sheet (from row %d)", c.Row)); msg != "" {
				problems = append(problems, problemAt(c.Position, "group", msg))
				s.used = true // its problem is said; not again as unused
			}
			long[k] = s
			order = append(order, k)
		}
		ia, ib := s.variable(c.VarA), s.variable(c.VarB)
		if ia == ib {
			s.sd[ia], s.mean[ia] = c.SD, c.Mean
		} else {
			s.r[ia][ib], s.r[ib][ia] = c.R, c.R
		}
		if c.N.IsExact() && (math.IsNaN(s.n) || c.N.Value < s.n) {
			// With pairwise n the smallest is the cautious one.
			s.n = c.N.Value
		}
	}
	for _, k := range order {
		s := long[k]
		if s.checkDefinite(); !math.IsNaN(s.minEigen) {
			problems = append(problems, problemAt(s.pos, "", fmt.Sprintf(
				"the correlations of study %q, group %q are not positive definite (smallest eigenvalue %.3g): no sample can have all these correlations; check the printed values, or pairwise deletion in the paper",
				s.study, s.group, s.minEigen)))
		}
		out[k] = s
	}
	for i := range in.Tables {
		t := &in.Tables[i]
		if len(t.Problems) > 0 {
			continue
		}
		group, msg := sampleOf(groups, t.Study, t.Group, fmt.Sprintf("the correlation table %q", t.Name))
		if msg != "" {
			problems = append(problems, problemAt(t.Position, "group", msg))
			continue
		}
		s := &corrSource{name: fmt.Sprintf("sheet %q", t.Sheet), index: map[string]int{}, n: math.NaN(), vars: t.Variables,
			pos: t.Position, study: t.Study, group: group}
		for j, v := range t.Variables {
			s.index[varKey(v)] = j
		}
		s.r, s.sd, s.mean = t.R, t.SD, t.Mean
		s.checkDefinite()
		for _, n := range t.N {
			if n.IsExact() && (math.IsNaN(s.n) || n.Value < s.n) {
				s.n = n.Value
			}
		}
		if old := out[sampleKey(t.Study, group)]; old != nil && old.name != "the correlations sheet" {
			problems = append(problems, problemAt(t.Position, "group",
				fmt.Sprintf("the correlation table %q describes the same sample (study %q, group %q) as %s, which is used instead", t.Name, t.Study, group, old.name)))
			continue
		} else if old != nil {
			old.used = true // the table wins; the rows are not "unused"
		}
		out[sampleKey(t.Study, group)] = s
	}
	return out, problems
}

// tried records that a claim tried the source and could not use it.
func (s *corrSource) tried(why string) {
	if s.why == "" {
		s.why = why
	}
}

// unusedProblems lists the correlation sources no claim used, each with
// the reason: the first failure of a claim that tried it, or that no claim
// compares two estimates of the sample it describes.
func unusedProblems(srcs map[[2]string]*corrSource, study string) []Problem {
	var out []Problem
	for _, s := range srcs {
		if s.used || sampleKey(s.study, "")[0] != sampleKey(study, "")[0] {
			continue
		}
		why := s.why
		if why == "" {
			why = fmt.Sprintf("no claim compares two estimates from its sample (study %q, group %q)", s.study, s.group)
		}
		out = append(out, problemAt(s.pos, "", fmt.Sprintf("%s was not used: %s, because %s", s.what(), s.summary(), strings.TrimSuffix(why, "."))))
	}
	slices.SortFunc(out, func(a, b Problem) int {
		return cmp.Or(cmp.Compare(a.File, b.File), cmp.Compare(a.Sheet, b.Sheet), cmp.Compare(a.Row, b.Row))
	})
	return out
}

// what names the source for a problem.
func (s *corrSource) what() string {
	if s.pos.Sheet == "" {
		return s.name
	}
	if s.name == "the correlations sheet" {
		return fmt.Sprintf("the correlations of study %q, group %q (correlations sheet)", s.study, s.group)
	}
	return "the correlation table in " + s.name
}

// summary lists the source's variables and n, for a problem.
func (s *corrSource) summary() string {
	n := "no n"
	if !math.IsNaN(s.n) {
		n = "n = " + strconv.FormatFloat(s.n, 'g', -1, 64)
	}
	return fmt.Sprintf("variables %s, %s", strings.Join(s.vars, ", "), n)
}

// variable returns the index of v, adding it when new.
func (s *corrSource) variable(v string) int {
	k := varKey(v)
	if i, ok := s.index[k]; ok {
		return i
	}
	i := len(s.vars)
	s.index[k] = i
	s.vars = append(s.vars, v)
	for j := range s.r {
		s.r[j] = append(s.r[j], extract.Printed{})
	}
	s.r = append(s.r, make([]extract.Printed, i+1))
	s.r[i][i] = extract.Printed{Value: 1, Bound: extract.Exact, Decimals: -1, Text: "1"}
	s.sd = append(s.sd, extract.Printed{})
	s.mean = append(s.mean, extract.Printed{})
	return i
}

// has reports whether every variable is in the source.
func (s *corrSource) has(vars ...string) bool {
	for _, v := range vars {
		if _, ok := s.index[varKey(v)]; !ok {
			return false
		}
	}
	return true
}

// corr returns the printed correlation of a and b.
func (s *corrSource) corr(a, b string) (extract.Printed, bool) {
	i, ok1 := s.index[varKey(a)]
	j, ok2 := s.index[varKey(b)]
	if !ok1 || !ok2 {
		return extract.Printed{}, false
	}
	p := s.r[i][j]
	return p, p.IsExact()
}

// tableProblems checks that each correlation table could come from real
// data: a matrix that is not positive definite is a problem naming the
// table and its smallest eigenvalue, whether or not a claim uses it.
func tableProblems(in *extract.Input) []Problem {
	var out []Problem
	for _, t := range in.Tables {
		if len(t.Problems) > 0 || len(t.R) < 2 {
			continue
		}
		complete := true
		for i, row := range t.R {
			for j, v := range row {
				complete = complete && (i == j || v.IsExact())
			}
		}
		if !complete {
			continue
		}
		m := (&modelTable{r: t.R}).point().r
		var npd *regress.NotPositiveDefiniteError
		if err := regress.CheckCorrelationMatrix(m); errors.As(err, &npd) {
			out = append(out, problemAt(t.Position, "", fmt.Sprintf("the correlation table %q is not positive definite (smallest eigenvalue %.3g): no sample can have all these correlations; check the printed values, or pairwise deletion in the paper", t.Name, npd.MinEigenvalue)))
		}
	}
	return out
}

// tableContradicts checks a printed correlation against the cell of its
// sample's table for the same pair: values whose rounding intervals do not
// meet contradict each other (a problem of the coefficient, and a conflict
// for the claims that use it).
func (a *auditor) tableContradicts(c *extract.Coefficient) []Problem {
	if c.Measure != extract.MeasureR || !c.Estimate.IsExact() || c.Outcome == "" || c.Predictor == "" {
		return nil
	}
	src := a.corrOf(c.Study, c.Group)
	if src == nil {
		return nil
	}
	cell, ok := src.corr(c.Outcome, c.Predictor)
	if !ok {
		return nil
	}
	lo1, hi1 := c.Estimate.RoundingInterval()
	lo2, hi2 := cell.RoundingInterval()
	if hi1 >= lo2-1e-12 && lo1 <= hi2+1e-12 {
		return nil
	}
	src.used = true // its contradiction is listed; it is not also "unused"
	return []Problem{problemAt(c.Position, "estimate", fmt.Sprintf(
		"coefficient %s is printed as r = %s, but %s gives %s for %s and %s: the two printed values differ beyond rounding",
		c.Label, c.Estimate.Text, src.name, cell.Text, c.Outcome, c.Predictor))}
}
