package article

import (
	"fmt"
	"regexp"
	"strings"
)

var (
	// starFootnote matches "*p < .05", "** p < 0.01", "***P<.001".
	starFootnote = regexp.MustCompile(`(\*{1,4})\s*[pP]\s*([<≤])\s*(0?\.\d+|0|1)`)
	// nStatement matches "N = 1,204", "n = 412".
	nStatement = regexp.MustCompile(`\b[Nn]\s*=\s*(\d[\d,]*)`)
	// outcomeStatements find a model's outcome in a caption or footnote.
	outcomeStatements = []*regexp.Regexp{
		regexp.MustCompile(`(?i)\bpredicting\s+([^.,;:()]+)`),
		regexp.MustCompile(`(?i)\bregressions?\s+of\s+([^.,;:()]+?)\s+on\b`),
		regexp.MustCompile(`(?i)\b(?:dependent variable|outcome)\s*(?:is|was|=|:)\s*([^.,;:()]+)`),
	}
	// boldFootnote matches "Bold estimates are significant at p < .05" and
	// "p < .05 in bold".
	boldFootnote      = regexp.MustCompile(`(?i)\bbold\b[^.;]*?\bp\s*([<≤])\s*(0?\.\d+)|\bp\s*([<≤])\s*(0?\.\d+)[^.;]*?\bbold\b`)
	standardizedWords = regexp.MustCompile(`(?i)\bstandardi[sz]ed\s+(regression\s+)?(coefficients?|estimates?|betas?)`)
)

// contextOf reads what a table's caption and footnotes say of all its
// rows: the p bound of each number of stars, the sample size, the outcome
// and whether its estimates are standardized. Conflicting sample sizes and
// a missing outcome are to be confirmed.
func contextOf(a *Article, t *Table, name string, f *Found) tableContext {
	ctx := tableContext{study: a.Study, label: name, stars: map[int]string{}, starsFoot: map[int]string{}}
	texts := append([]string{t.Caption}, t.Foot...)
	where := func(i int) string {
		if i == 0 {
			return name + ", caption"
		}
		return fmt.Sprintf("%s, footnote %d", name, i)
	}
	largest := -1.0
	for i, s := range texts {
		for _, m := range starFootnote.FindAllStringSubmatch(s, -1) {
			k := len(m[1])
			if _, dup := ctx.stars[k]; dup {
				continue
			}
			ctx.stars[k] = m[2] + " " + m[3]
			ctx.starsFoot[k] = where(i) + fmt.Sprintf(" (%q)", s)
			var v float64
			fmt.Sscan("0"+strings.TrimPrefix(m[3], "0"), &v)
			if v > largest {
				largest, ctx.largest, ctx.largestStars = v, "≥ "+m[3], k
			}
		}
		for _, m := range nStatement.FindAllStringSubmatch(s, -1) {
			switch {
			case ctx.n == "":
				ctx.n, ctx.nPlace = m[1], where(i)
			case ctx.n != m[1]:
				f.confirm(where(i), "more than one n in the caption and footnotes: the first, "+ctx.n+", is used", s)
			}
		}
		if ctx.outcome == "" {
			for _, re := range outcomeStatements {
				if m := re.FindStringSubmatch(s); m != nil {
					ctx.outcome = strings.TrimPrefix(strings.TrimSpace(m[1]), "the ")
					break
				}
			}
		}
		ctx.standardized = ctx.standardized || standardizedWords.MatchString(s)
		if m := boldFootnote.FindStringSubmatch(s); m != nil && ctx.boldP == "" && a.Format == FormatText {
			// Plain text shows no bold: no estimate can be read as in it.
			f.confirm(where(i), "the note marks significance in bold, which plain text does not show: p not read from it", s)
		} else if m != nil && ctx.boldP == "" {
			op, v := m[1], m[2]
			if op == "" {
				op, v = m[3], m[4]
			}
			ctx.boldP, ctx.boldNot, ctx.boldFoot = op+" "+v, "≥ "+v, where(i)+fmt.Sprintf(" (%q)", s)
		}
	}
	return ctx
}

// finish asks the reviewer to confirm what the table left to a guess.
func (rr *regressionReader) finish() {
	if len(rr.f.Coefficients) == rr.start {
		rr.f.confirm(rr.name, "a table with estimate columns, but no coefficient was read from it", rr.t.Caption)
		return
	}
	if rr.ctx.outcome == "" {
		rr.f.confirm(rr.name, "the outcome was not found in the caption or footnotes: outcome left blank", rr.t.Caption)
	}
	for _, s := range rr.slots {
		if s.measure == "" && !rr.ctx.standardized {
			rr.f.confirm(rr.name, "model columns whose header names no measure: read as b (unstandardized)", rr.t.Caption)
			break
		}
	}
}
