package article

import (
	"fmt"
	"regexp"
	"strings"
	"unicode"
	"unicode/utf8"

	"coefaudit/extract"
)

// comparison is a phrase by which a sentence compares two effects, and the
// verdict and basis it implies.
type comparison struct {
	re        *regexp.Regexp
	published string
	basis     string
	// swap is true when the phrase names the smaller effect first
	// ("weaker than").
	swap bool
	note string
}

// comparisons are the phrases read as candidate claims, most specific first.
var comparisons = []comparison{
	{re: regexp.MustCompile(`(?i)\b(confidence )?intervals?\b[^;]{0,60}\b(did not|do not|didn't) overlap|\bnon-?overlapping (confidence )?intervals`), published: extract.PublishedDiffer, basis: extract.BasisOverlap},
	{re: regexp.MustCompile(`(?i)\b(confidence )?intervals?\b[^;]{0,60}\boverlapp?(ed)?\b`), published: extract.PublishedNoDifference, basis: extract.BasisOverlap},
	{re: regexp.MustCompile(`(?i)\bsignificant (for|in|among) [^;]{1,100}?\bbut not (for|in|among)\b`), published: extract.PublishedDiffer, basis: extract.BasisSignificanceSplit},
	{re: regexp.MustCompile(`(?i)\b(did not|do not|does not|didn't) differ|\bno (significant )?difference|\bdid not differ significantly|\bsimilar in (size|magnitude|strength)`), published: extract.PublishedNoDifference},
	{re: regexp.MustCompile(`(?i)\bweaker\b[^.;]{0,60}\bthan\b|\bless strongly (associated|related|predicted|linked)`), published: extract.PublishedSecondStronger, swap: true,
		note: "\"weaker\" read as a comparison of magnitudes (second-stronger); if the paper compares signed values, use second-larger"},
	{re: regexp.MustCompile(`(?i)\b(smaller|lower)\b[^.;]{0,60}\bthan\b`), published: extract.PublishedSecondLarger, swap: true,
		note: "\"smaller\" or \"lower\" read as signed (second-larger); if the paper compares magnitudes, use second-stronger"},
	{re: regexp.MustCompile(`(?i)\bstronger\b[^.;]{0,60}\bthan\b|\bmore strongly (associated|related|predicted|linked)|\bstronger (association|effect|predictor)`), published: extract.PublishedFirstStronger,
		note: "\"stronger\" read as a comparison of magnitudes (first-stronger); if the paper compares signed values, use first-larger"},
	{re: regexp.MustCompile(`(?i)\b(larger|greater|bigger|higher)\b[^.;]{0,60}\bthan\b`), published: extract.PublishedFirstLarger,
		note: "\"larger\" read as signed (first-larger); if the paper compares magnitudes, use first-stronger"},
	{re: regexp.MustCompile(`(?i)\b(differed|differ) (significantly )?(between|from|across)|\bsignificantly different\b`), published: extract.PublishedDiffer},
}

// testWords say a sentence rests on a test of the difference.
var testWords = regexp.MustCompile(`(?i)\b(test of (the )?difference|difference test|interaction|z = |Wald test|p for (the )?difference|χ2 test of equality|equality constraint)`)

// readClaims reads every sentence that compares two effects. Where its two
// coefficients can be matched (the two results the sentence itself reports,
// or the two coefficients whose predictor or group it names) it is a claims
// row; otherwise it is listed to confirm, never guessed.
func readClaims(a *Article, f *Found) {
	n := 0
	var names []named
	for _, para := range a.Paragraphs {
		for k, s := range Sentences(para.Text) {
			place := fmt.Sprintf("%s, sentence %d", para.Place, k+1)
			cmp, ok := comparisonOf(s)
			if !ok {
				continue
			}
			basis := cmp.basis
			if basis == "" {
				basis = extract.BasisUnstated
				if testWords.MatchString(s) {
					basis = extract.BasisTest
				}
			}
			if names == nil {
				names = namesOf(f)
			}
			first, second, ok := matchPair(names, s, place)
			if !ok {
				f.confirm(place, fmt.Sprintf("a sentence comparing two effects (%s, basis %s) whose two coefficients could not be matched: add the claim by hand", cmp.published, basis), s)
				continue
			}
			if cmp.swap { // "A weaker than B" is "B stronger than A"
				first, second = second, first
				cmp.published = map[string]string{extract.PublishedSecondStronger: extract.PublishedFirstStronger,
					extract.PublishedSecondLarger: extract.PublishedFirstLarger}[cmp.published]
			}
			n++
			f.Claims = append(f.Claims, ClaimRow{Study: a.Study, Claim: fmt.Sprintf("C%d", n), First: first, Second: second,
				Published: cmp.published, Basis: basis, Sentence: s, Source: place})
			f.confirm(place, "a claim read from a sentence: confirm the two coefficients, the verdict and the basis", s)
			if cmp.note != "" {
				f.confirm(place, cmp.note, s)
			}
		}
	}
}

// comparisonWords are words one of which every comparison phrase holds.
var comparisonWords = []string{"than", "differ", "overlap", "significant", "similar", "strongly", "stronger"}

// comparisonOf finds the first comparison phrase in a sentence.
func comparisonOf(s string) (comparison, bool) {
	lower := strings.ToLower(s)
	any := false
	for _, w := range comparisonWords {
		any = any || strings.Contains(lower, w)
	}
	if !any {
		return comparison{}, false
	}
	for _, c := range comparisons {
		if c.re.MatchString(s) {
			return c, true
		}
	}
	return comparison{}, false
}

// named is a coefficient as matchPair looks for it: its label and place,
// its predictor and group in lower case.
type named struct {
	label, source, predictor, group string
	fromSentence                    bool
}

// namesOf lists the article's coefficients for matchPair, once.
func namesOf(f *Found) []named {
	out := make([]named, len(f.Coefficients))
	for i := range f.Coefficients {
		c := &f.Coefficients[i]
		out[i] = named{label: c.Label, source: c.Source, predictor: strings.ToLower(c.Predictor), group: strings.ToLower(c.Group),
			fromSentence: strings.Contains(c.Source, "sentence")}
	}
	return out
}

// matchPair finds the two coefficients a sentence compares: the two results
// the sentence reports itself, else the only two coefficients of the
// article's tables whose predictor (and, between groups, group) the
// sentence names, in the order it names them.
func matchPair(names []named, s, place string) (string, string, bool) {
	var own []string
	for i := range names {
		if names[i].fromSentence && strings.HasPrefix(names[i].source, place) &&
			(len(names[i].source) == len(place) || names[i].source[len(place)] == ',') {
			own = append(own, names[i].label)
		}
	}
	if len(own) == 2 {
		return own[0], own[1], true
	}
	if len(own) > 2 {
		return "", "", false
	}
	type hit struct {
		label string
		at    int
	}
	var hits []hit
	lower := strings.ToLower(s)
	for i := range names {
		c := &names[i]
		if c.predictor == "" || c.fromSentence {
			continue
		}
		at := wordIndex(lower, c.predictor)
		if c.group != "" && at >= 0 {
			// Between samples, the sentence must name the group too.
			at = wordIndex(lower, c.group)
		}
		if at >= 0 {
			if len(hits) == 2 {
				return "", "", false
			}
			hits = append(hits, hit{c.label, at})
		}
	}
	if len(hits) != 2 || hits[0].at == hits[1].at {
		return "", "", false
	}
	if hits[0].at > hits[1].at {
		hits[0], hits[1] = hits[1], hits[0]
	}
	return hits[0].label, hits[1].label, true
}

// wordIndex finds w in s as whole words (not inside a longer word), -1
// when absent.
func wordIndex(s, w string) int {
	if w == "" {
		return -1
	}
	for from := 0; from < len(s); {
		i := strings.Index(s[from:], w)
		if i < 0 {
			return -1
		}
		i += from
		before, _ := utf8.DecodeLastRuneInString(s[:i])
		after, _ := utf8.DecodeRuneInString(s[i+len(w):])
		if !isWordRune(before) && !isWordRune(after) {
			return i
		}
		from = i + 1
	}
	return -1
}

func isWordRune(r rune) bool {
	return r != utf8.RuneError && (unicode.IsLetter(r) || unicode.IsDigit(r))
}
