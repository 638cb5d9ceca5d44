package article

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"coefaudit/extract"
)

// coefficient reads the estimate of slot k in row r, with the numbers of
// its other columns and of the row under it, into a coefficients row.
func (rr *regressionReader) coefficient(r, under Row, k int, predictor, place string, rowIdx int) {
	s := rr.slots[k]
	raw := cell(r, s.est)
	if raw == "" || isDash(raw) {
		return
	}
	model, group := rr.models[k], rr.groups[k]
	at := func(j int) string {
		p := fmt.Sprintf("%s, column %q", place, rr.cols[j].head)
		if model != rr.name && model != rr.cols[j].head {
			p += ", " + model
		}
		return p
	}
	src := at(s.est)
	est, paren := splitEstimate(raw)
	if isReference(raw) {
		rr.f.confirm(src, "a reference category, not an estimate: not read", raw)
		return
	}
	if _, err := extract.ParseNumber(est); err != nil {
		rr.f.confirm(src, "the estimate did not parse: not read ("+err.Error()+")", raw)
		return
	}
	c := CoefficientRow{Study: rr.a.Study, Measure: rr.measure(s, src), Outcome: rr.ctx.outcome, Predictor: predictor,
		Group: group, Model: model, Estimate: est, Source: src, Places: map[string]string{"estimate": src}}
	set := func(field *string, name, value, where string) {
		if value == "" || isDash(value) {
			return
		}
		*field = value
		c.Places[name] = where
	}
	inParen := func(v, where string) {
		v = strings.TrimSpace(v)
		if v == "" {
			return
		}
		if isInterval(v) {
			set(&c.CI, "ci", v, where)
			return
		}
		if s.paren == roleCI {
			rr.f.confirm(where, "the header says a CI is in parentheses, but one number is: read as the SE", v)
		}
		set(&c.SE, "se", unwrap(v), where)
	}
	inParen(paren, src+", in parentheses")
	if v := cell(under, s.est); v != "" {
		inParen(v, fmt.Sprintf("%s, the row under %q, column %q", rr.name, predictor, rr.cols[s.est].head))
	}
	if s.se >= 0 {
		set(&c.SE, "se", unwrap(cell(r, s.se)), at(s.se))
	}
	if s.stat >= 0 {
		set(&c.Stat, "stat", cell(r, s.stat), at(s.stat))
	}
	if s.p >= 0 {
		set(&c.P, "p", cell(r, s.p), at(s.p))
	}
	if s.ci >= 0 {
		set(&c.CI, "ci", cell(r, s.ci), at(s.ci))
	}
	if s.lo >= 0 && s.hi >= 0 {
		set(&c.CILow, "ci_low", cell(r, s.lo), at(s.lo))
		set(&c.CIHigh, "ci_high", cell(r, s.hi), at(s.hi))
	}
	if c.CI != "" || c.CILow != "" {
		c.CILevel = s.level
	}
	if c.P == "" {
		rr.starsToP(&c, est, r.Cells[s.est].Bold, src)
	}
	switch {
	case s.n != "":
		set(&c.N, "n", s.n, s.nPlace)
	case rr.ctx.n != "":
		set(&c.N, "n", rr.ctx.n, rr.ctx.nPlace)
	}
	c.Label = uniqueLabel(rr.f, predictor, rr.name, model, group)
	rr.f.Coefficients = append(rr.f.Coefficients, c)
}

// measure is the slot's measure: from its header, else a standardized
// table's beta, else b, which the reviewer is asked to confirm.
func (rr *regressionReader) measure(s slot, where string) string {
	switch {
	case s.measure != "":
		return s.measure
	case rr.ctx.standardized:
		return extract.MeasureBeta
	}
	return extract.MeasureB
}

// starsToP sets p from the estimate's stars and the footnote that defines
// them: "0.21**" under "**p < .01" has p < .01, an estimate without a star
// p ≥ the largest threshold. Stars no footnote defines are to be confirmed.
// Where a footnote says bold marks p below a bound, a bold estimate has p
// below it and one in plain type p at or above it.
func (rr *regressionReader) starsToP(c *CoefficientRow, est string, bold bool, src string) {
	stars := strings.Count(est[len(strings.TrimRight(est, "*")):], "*")
	switch {
	case len(rr.ctx.stars) > 0:
		if p, ok := rr.ctx.stars[stars]; ok {
			c.P, c.Places["p"] = p, src+", its stars and "+rr.ctx.starsFoot[stars]
		} else if stars == 0 {
			c.P, c.Places["p"] = rr.ctx.largest, src+", no star under "+rr.ctx.starsFoot[rr.ctx.largestStars]
		} else {
			rr.f.confirm(src, fmt.Sprintf("%d stars, which the footnote does not define: p not set", stars), est)
		}
	case stars > 0:
		rr.f.confirm(src, "stars but no footnote defining them: p not set", est)
	case rr.ctx.boldP != "" && bold:
		c.P, c.Places["p"] = rr.ctx.boldP, src+", in bold under "+rr.ctx.boldFoot
	case rr.ctx.boldP != "":
		c.P, c.Places["p"] = rr.ctx.boldNot, src+", not in bold under "+rr.ctx.boldFoot
	}
}

// uniqueLabel makes a label unique within the study: the predictor, the
// table, and the model or group where the table has several.
func uniqueLabel(f *Found, predictor, table, model, group string) string {
	base := predictor + " (" + table
	if model != table {
		base += ", " + model
	}
	if group != "" {
		base += ", " + group
	}
	base += ")"
	if f.labels == nil {
		f.labels = map[string]int{}
	}
	label := base
	// labels counts the uses of each base, so that a table whose columns
	// repeat one heading costs one look-up per label, not a search.
	for k := f.labels[base] + 1; f.labels[label] > 0; k++ {
		label = base + " #" + strconv.Itoa(k)
	}
	f.labels[base]++
	f.labels[label]++
	return label
}

// estimateAndParen splits "0.41*** (0.12)" into the estimate and the
// parenthesised part.
var estimateAndParen = regexp.MustCompile(`^(.*?\d[^\s(\[]*)\s*([(\[].*[)\]][*†‡]*)$`)

// splitEstimate splits a cell into the estimate as printed and what
// follows it in parentheses or brackets.
func splitEstimate(v string) (est, paren string) {
	v = strings.TrimSpace(v)
	if m := estimateAndParen.FindStringSubmatch(v); m != nil {
		return strings.TrimSpace(m[1]), m[2]
	}
	return v, ""
}

// unwrap drops the parentheses or brackets around a cell: the layout, not
// the number.
func unwrap(v string) string {
	v = strings.TrimSpace(v)
	if enclosed(v) {
		end := strings.LastIndexAny(v, ")]")
		return strings.TrimSpace(v[1:end]) + v[end+1:]
	}
	return v
}

// isInterval reports whether a cell holds two numbers as an interval.
func isInterval(v string) bool {
	_, err := extract.ParseInterval(v)
	return err == nil
}

// isDash reports a cell printed as a dash: nothing printed.
func isDash(v string) bool {
	switch strings.TrimSpace(v) {
	case "-", "–", "—", "−", "―", "n/a", "NA", "na", ".":
		return true
	}
	return false
}

// isReference reports a reference category ("Ref.", "1.00 (reference)").
func isReference(v string) bool {
	l := strings.ToLower(v)
	return strings.Contains(l, "ref")
}
