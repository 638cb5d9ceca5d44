package article

import (
	"cmp"
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"coefaudit/extract"
)

// abbreviations end in a period without ending a sentence.
var abbreviations = []string{"e.g.", "i.e.", "et al.", "vs.", "Fig.", "Figs.", "cf.", "approx.", "No.", "Tab.", "ca.", "resp."}

// Sentences splits a paragraph into sentences: after ".", "!" or "?"
// followed by space and an upper-case letter or a digit, unless the period
// ends a common abbreviation.
func Sentences(p string) []string {
	var out []string
	start := 0
	for i := 0; i < len(p); {
		r, size := utf8.DecodeRuneInString(p[i:])
		i += size
		if r != '.' && r != '!' && r != '?' {
			continue
		}
		j := i
		for j < len(p) && p[j] == ' ' {
			j++
		}
		if j == i || j >= len(p) {
			continue
		}
		next, _ := utf8.DecodeRuneInString(p[j:])
		if !unicode.IsUpper(next) && !unicode.IsDigit(next) {
			continue
		}
		if endsAbbreviation(p[start:i]) {
			continue
		}
		out = append(out, strings.TrimSpace(p[start:i]))
		start = j
	}
	if rest := strings.TrimSpace(p[start:]); rest != "" {
		out = append(out, rest)
	}
	return out
}

func endsAbbreviation(s string) bool {
	for _, a := range abbreviations {
		if strings.HasSuffix(s, " "+a) || s == a {
			return true
		}
	}
	return false
}

// readSentences reads the results every sentence of the article reports
// into coefficients rows named from the sentence, which the reviewer is
// asked to confirm; a t, z or p with no estimate is listed to confirm.
// Each result's group and model are those its words, else its sentence,
// else its paragraph name (scopesOf); two results of one paragraph left
// with the same predictor, measure, group and model are listed to
// confirm, since check could not tell them apart.
func readSentences(a *Article, f *Found) {
	for _, para := range a.Paragraphs {
		var seen map[string]*firstResult
		for k, s := range Sentences(para.Text) {
			place := fmt.Sprintf("%s, sentence %d", para.Place, k+1)
			reps, orphans := ParseReported(s)
			for _, o := range orphans {
				f.confirm(place, "a statistic with no estimate before it in the sentence: not read", o)
			}
			if len(reps) == 0 {
				continue
			}
			scopes := scopesOf(s, para.Text, reps)
			prevName := ""
			for i, r := range reps {
				rplace := place
				if len(reps) > 1 {
					rplace = fmt.Sprintf("%s, result %d", place, i+1)
				}
				sc := scopes[i]
				name := withoutScope(r.Name)
				if name == "" && r.Name != "" && prevName != "" {
					// "outdoor time for girls (β = .34) and for boys (β = .12)"
					name = prevName
					f.confirm(rplace, fmt.Sprintf("the words before the estimate name only its group or model: predictor %q taken from the result before it", name), s)
				}
				r.Name, prevName = name, cmp.Or(name, prevName)
				c := sentenceCoefficient(a, f, r, sc, rplace)
				f.Coefficients = append(f.Coefficients, c)
				if r.Name == "" {
					f.confirm(rplace, "the sentence does not name what the estimate is of: predictor left blank", s)
				}
				if sc.groupFrom != "" {
					f.confirm(rplace, fmt.Sprintf("group %q taken from the %s, not from the result's own words", sc.group, sc.groupFrom), s)
				}
				if sc.modelFrom != "" {
					f.confirm(rplace, fmt.Sprintf("model %q taken from the %s, not from the result's own words", sc.model, sc.modelFrom), s)
				}
				seen = sameKey(f, seen, c, s)
			}
			f.confirm(place, fmt.Sprintf("%d result(s) read from a sentence: confirm each one's predictor, group and model", len(reps)), s)
		}
	}
}

// firstResult is the first result of a paragraph with a key, and whether
// it has been listed as sharing it.
type firstResult struct {
	place, sentence, predictor string
	listed                     bool
}

// sameKey lists to confirm a result of a paragraph whose predictor,
// measure, group and model are those of a result before it, and that
// result once; seen holds the paragraph's keys so far.
func sameKey(f *Found, seen map[string]*firstResult, c CoefficientRow, sentence string) map[string]*firstResult {
	key := strings.ToLower(c.Predictor) + "\x00" + c.Measure + "\x00" + strings.ToLower(c.Group) + "\x00" + strings.ToLower(c.Model)
	if seen == nil {
		seen = map[string]*firstResult{}
	}
	first, dup := seen[key]
	if !dup {
		seen[key] = &firstResult{place: c.Source, sentence: sentence, predictor: c.Predictor}
		return seen
	}
	why := fmt.Sprintf("results of one paragraph with the same predictor %q, measure, group %q and model %q (%s and %s): say which group or model each is of",
		first.predictor, c.Group, c.Model, first.place, c.Source)
	if !first.listed {
		first.listed = true
		f.confirm(first.place, why, first.sentence)
	}
	f.confirm(c.Source, why, sentence)
	return seen
}

// sentenceCoefficient makes a coefficients row of a result a sentence reports.
func sentenceCoefficient(a *Article, f *Found, r Reported, sc scope, place string) CoefficientRow {
	c := CoefficientRow{Study: a.Study, Measure: r.Measure, Predictor: r.Name, Group: sc.group, Model: sc.model, Estimate: r.Estimate, SE: r.SE, CI: r.CI,
		Stat: r.Stat, P: r.P, Source: place, Places: map[string]string{"estimate": place}}
	for name, v := range map[string]string{"se": r.SE, "ci": r.CI, "stat": r.Stat, "p": r.P} {
		if v != "" {
			c.Places[name] = place
		}
	}
	if c.CI != "" {
		c.CILevel = r.CILevel
	}
	switch {
	case r.DF != "":
		c.DF, c.Places["df"] = r.DF, place
		// A correlation printed as r(df) has df = n − 2: its n is what the
		// test of a correlation needs (Fisher's z), so it is written, and
		// listed to confirm as a number the sentence implies, not prints.
		if df, err := strconv.Atoi(r.DF); err == nil && df > 0 && r.Measure == extract.MeasureR {
			c.N, c.Places["n"] = strconv.Itoa(df+2), place
			f.confirm(place, fmt.Sprintf("n = %d taken as df + 2 from r(%s)", df+2, r.DF), r.Symbol+"("+r.DF+") = "+r.Estimate)
		}
	case r.StatDF != "":
		c.DF, c.Places["df"] = r.StatDF, place
	}
	name := r.Name
	if name == "" {
		name = r.Symbol
	}
	c.Label = uniqueLabel(f, name, place, cmp.Or(sc.model, place), sc.group)
	return c
}
