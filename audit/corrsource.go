package audit

import (
	"errors"
	"fmt"
	"math"
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
}

func sampleKey(study, group string) [2]string {
	return [2]string{strings.ToLower(strings.TrimSpace(study)), strings.ToLower(strings.TrimSpace(group))}
}

func varKey(v string) string { return strings.ToLower(strings.TrimSpace(v)) }

// correlationSources gathers the correlation tables of an input by sample.
// A table sheet wins over the long sheet for the same sample.
func correlationSources(in *extract.Input) map[[2]string]*corrSource {
	out := map[[2]string]*corrSource{}
	long := map[[2]string]*corrSource{}
	for _, c := range in.Correlations {
		if len(c.Problems) > 0 {
			continue
		}
		k := sampleKey(c.Study, c.Group)
		s := long[k]
		if s == nil {
			s = &corrSource{name: "the correlations sheet", index: map[string]int{}, n: math.NaN()}
			long[k] = s
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
	for k, s := range long {
		out[k] = s
	}
	for i := range in.Tables {
		t := &in.Tables[i]
		if len(t.Problems) > 0 {
			continue
		}
		s := &corrSource{name: fmt.Sprintf("sheet %q", t.Sheet), index: map[string]int{}, n: math.NaN(), vars: t.Variables}
		for j, v := range t.Variables {
			s.index[varKey(v)] = j
		}
		s.r, s.sd, s.mean = t.R, t.SD, t.Mean
		for _, n := range t.N {
			if n.IsExact() && (math.IsNaN(s.n) || n.Value < s.n) {
				s.n = n.Value
			}
		}
		out[sampleKey(t.Study, t.Group)] = s
	}
	return out
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
			out = append(out, Problem{Sheet: t.Sheet, Message: fmt.Sprintf("the correlation table %q is not positive definite (smallest eigenvalue %.3g): no sample can have all these correlations; check the printed values, or pairwise deletion in the paper", t.Name, npd.MinEigenvalue)})
		}
	}
	return out
}
