package article

import (
	"regexp"
	"sort"
	"strings"

	"coefaudit/extract"
)

// num is a number as sentences print it: "0.41", ".41", "−0.41", "1,204".
const num = `[-−–]?(?:\d+(?:[.,]\d+)*|[.,]\d+)`

// Patterns of the statistics a sentence reports, in the forms of the APA
// Publication Manual (7th ed., §6.43–6.46, from memory) and of medical
// journals: "β = .34", "b = 0.41, SE = 0.12", "r(198) = .45", "OR = 1.80,
// 95% CI 1.21–2.68", "t(120) = 3.20", "p < .001".
var (
	estimateReport = regexp.MustCompile(`(?:^|[\s(\[,;:])(β|b|B|r|OR|aOR|AOR|HR|aHR|AHR|RR|IRR)\s*(?:\(\s*(\d[\d,]*)\s*\))?\s*=\s*(` + num + `)`)
	seReport       = regexp.MustCompile(`(?:^|[\s(\[,;:])SE\s*=\s*(` + num + `)`)
	ciReport       = regexp.MustCompile(`(\d{2}(?:\.\d)?)\s*%\s*(?:CI|confidence interval)\s*[:=,]?\s*([\[(]\s*` + num + `\s*[,;]\s*` + num + `\s*[\])]|` + num + `\s*(?:[–—-]|to)\s*` + num + `)`)
	pReport        = regexp.MustCompile(`(?:^|[\s(\[,;:])[pP]\s*([<>=≤≥])\s*(` + num + `)`)
	statReport     = regexp.MustCompile(`(?:^|[\s(\[,;:])(t|z)\s*(?:\(\s*(\d[\d,.]*)\s*\))?\s*=\s*(` + num + `)`)
)

// measureOfSymbol maps a printed symbol to its measure.
var measureOfSymbol = map[string]string{
	"β": extract.MeasureBeta, "b": extract.MeasureB, "B": extract.MeasureB, "r": extract.MeasureR,
	"OR": extract.MeasureOR, "aOR": extract.MeasureOR, "AOR": extract.MeasureOR,
	"HR": extract.MeasureHR, "aHR": extract.MeasureHR, "AHR": extract.MeasureHR,
	"RR": extract.MeasureRR, "IRR": extract.MeasureRR,
}

// Reported is one result a sentence reports: the estimate and what
// follows it up to the next estimate, every number as printed, with the
// byte offsets of the estimate in the sentence.
type Reported struct {
	Symbol, Measure          string
	Estimate, DF             string
	SE, CI, CILevel, Stat, P string
	StatDF                   string
	Start, End               int
	// Name is the words before the estimate that name what it is of
	// ("outdoor time (β = .34 …)" gives "outdoor time"), "" when none.
	Name string
}

// token is one statistic found in a sentence.
type token struct {
	kind       string
	start, end int
	m          []string
}

// ParseReported finds the results a sentence reports. Each estimate
// (β, b, r, OR, HR, RR and their adjusted forms) starts a result; the SE,
// CI, t or z and p after it, before the next estimate, are its own. A t, z
// or p before any estimate is returned in orphans, as printed.
func ParseReported(s string) (out []Reported, orphans []string) {
	if !strings.ContainsAny(s, "=<>≤≥") {
		// Every statistic is printed with a relation: no regular
		// expression need run over the sentence.
		return nil, nil
	}
	var toks []token
	add := func(kind string, re *regexp.Regexp) {
		for _, ix := range re.FindAllStringSubmatchIndex(s, -1) {
			m := make([]string, len(ix)/2)
			for k := range m {
				if ix[2*k] >= 0 {
					m[k] = s[ix[2*k]:ix[2*k+1]]
				}
			}
			start := ix[0] + len(m[0]) - len(strings.TrimLeft(m[0], " \t([,;:"))
			toks = append(toks, token{kind: kind, start: start, end: ix[1], m: m})
		}
	}
	add("estimate", estimateReport)
	add("se", seReport)
	add("ci", ciReport)
	add("p", pReport)
	add("stat", statReport)
	sort.SliceStable(toks, func(i, j int) bool { return toks[i].start < toks[j].start })
	prevEnd := 0
	for _, t := range toks {
		if t.kind == "estimate" {
			out = append(out, Reported{Symbol: t.m[1], Measure: measureOfSymbol[t.m[1]], DF: t.m[2], Estimate: t.m[3],
				Start: t.start, End: t.end, Name: nameBefore(s[prevEnd:t.start])})
			prevEnd = t.end
			continue
		}
		if len(out) == 0 {
			orphans = append(orphans, strings.TrimSpace(s[t.start:t.end]))
			continue
		}
		r := &out[len(out)-1]
		switch t.kind {
		case "se":
			r.SE = t.m[1]
		case "ci":
			r.CILevel, r.CI = t.m[1], t.m[2]
		case "p":
			r.P = pText(t.m[1], t.m[2])
		case "stat":
			r.Stat, r.StatDF = t.m[3], t.m[2]
		}
		r.End = max(r.End, t.end)
		prevEnd = max(prevEnd, t.end)
	}
	return out, orphans
}

// pText writes a p as printed: "< .001", ".03" for "= .03".
func pText(op, v string) string {
	if op == "=" {
		return v
	}
	return op + " " + v
}

// nameStop ends the words that name an estimate: a clause's start.
var nameStop = regexp.MustCompile(`(?i)(?:[,;:]|\band\b|\bwhile\b|\bwhereas\b|\bbut\b|\bthan\b)\s*`)

// nameBefore returns the last few words before an estimate's
// parenthesis: what the sentence says it is of.
func nameBefore(s string) string {
	s = strings.TrimRight(s, " ([,;:")
	if i := strings.LastIndexAny(s, "([)]"); i >= 0 {
		s = s[i+1:]
	}
	if locs := nameStop.FindAllStringIndex(s, -1); len(locs) > 0 {
		s = s[locs[len(locs)-1][1]:]
	}
	words := strings.Fields(s)
	if len(words) > 8 {
		words = words[len(words)-8:]
	}
	return strings.Trim(strings.Join(words, " "), " .,;:")
}
