package article

import (
	"regexp"
	"strings"
)

// groupPhrase matches a sentence's naming of a group: "for girls", "among
// older adults", "in the control group", "within the Dutch sample". The
// nouns are those results sections commonly split by (common practice, no
// source); a group, condition, arm or cohort may have any one- or
// two-word name (so may a shift, a site or a wave), but "this sample", "the whole sample" and the like name
// everyone, not a group.
var groupPhrase = regexp.MustCompile(`(?i)\b(?:for|among|in|within)\s+(?:the\s+)?(` +
	`(?:older\s+|younger\s+)?(?:girls|boys|women|men|females|males|children|adolescents|adults|students|patients|controls)` +
	`|[\p{L}\d-]+(?:\s+[\p{L}\d-]+)?\s+(?:group|condition|arm|cohort|subsample|shift|site|wave))\b`)

// notAGroup are the first words of a "… sample" or "… group" that do not
// name a group of the study.
var notAGroup = regexp.MustCompile(`(?i)^(this|that|our|each|every|either|both|whole|total|full|entire|overall|same|other|age|reference)\b`)

// modelPhrase matches a sentence's naming of a model: "Model 2", "model
// 3b", "Model II", "the adjusted model".
var modelPhrase = regexp.MustCompile(`\b(?:[Mm]odel\s+(?:\d+[a-z]?|[IVX]+)\b|(?i:(?:fully\s+)?(?:adjusted|unadjusted|crude|full|final|baseline)\s+model)\b)`)

// modelInName is a model's phrase in a result's name with the preposition
// before it: "in Model 2".
var modelInName = regexp.MustCompile(`(?:\b(?i:in|for|of|from)\s+(?:(?i:the)\s+)?)?` + modelPhrase.String())

// scope is the group and model a result is of, and where they were named.
type scope struct {
	group, model         string
	groupFrom, modelFrom string // "" (the result's own words), "sentence" or "paragraph"
}

// groupsIn lists the distinct groups s names, in the order named, each
// with the phrase that named it.
func groupsIn(s string) (groups, phrases []string) {
	for _, m := range groupPhrase.FindAllStringSubmatch(s, -1) {
		g := strings.Join(strings.Fields(m[1]), " ")
		if notAGroup.MatchString(g) {
			continue
		}
		phrases = append(phrases, m[0])
		if !containsFold(groups, g) {
			groups = append(groups, g)
		}
	}
	return groups, phrases
}

// modelsIn lists the distinct models s names, in the order named.
func modelsIn(s string) []string {
	var out []string
	if !strings.Contains(s, "odel") && !strings.Contains(s, "ODEL") {
		// Every model phrase ends in "model": the expression need not
		// run (BenchmarkReadJATS).
		return nil
	}
	for _, m := range modelPhrase.FindAllString(s, -1) {
		m = strings.Join(strings.Fields(m), " ")
		if len(m) > 6 && strings.EqualFold(m[:6], "model ") {
			m = "Model " + m[6:]
		}
		if !containsFold(out, m) {
			out = append(out, m)
		}
	}
	return out
}

func containsFold(list []string, s string) bool {
	for _, x := range list {
		if strings.EqualFold(x, s) {
			return true
		}
	}
	return false
}

// only returns the single item of list, "" when there are none or several:
// a sentence naming two groups does not say which a result is of.
func only(list []string) string {
	if len(list) == 1 {
		return list[0]
	}
	return ""
}

// scopesOf finds the group and model of each result of sentence s, from
// the nearest words that name exactly one: the result's own words (those
// between the result before it and its estimate, and the rest of its
// parenthesis), else the sentence, else the paragraph para. A result whose
// words name two groups gets none.
func scopesOf(s, para string, reps []Reported) []scope {
	out := make([]scope, len(reps))
	var sentGroups, sentModels, paraGroups, paraModels []string
	sentGroups, _ = groupsIn(s)
	sentModels = modelsIn(s)
	// Each result's own words end with its parenthesis: "(β = .10, Model 2)".
	ends := make([]int, len(reps))
	for i, r := range reps {
		next := len(s)
		if i+1 < len(reps) {
			next = reps[i+1].Start
		}
		next = max(next, r.End)
		ends[i] = r.End
		if k := strings.IndexAny(s[r.End:next], ")];"); k >= 0 {
			ends[i] += k
		}
	}
	for i := range reps {
		prevEnd := 0
		if i > 0 {
			prevEnd = ends[i-1]
		}
		own := s[prevEnd:ends[i]]
		groups, _ := groupsIn(own)
		sc := &out[i]
		sc.group, sc.model = only(groups), only(modelsIn(own))
		if sc.group == "" && len(groups) == 0 {
			if sc.group = only(sentGroups); sc.group != "" {
				sc.groupFrom = "sentence"
			} else if len(sentGroups) == 0 {
				if paraGroups == nil {
					paraGroups, _ = groupsIn(para)
				}
				if sc.group = only(paraGroups); sc.group != "" {
					sc.groupFrom = "paragraph"
				}
			}
		}
		if sc.model == "" {
			if sc.model = only(sentModels); sc.model != "" {
				sc.modelFrom = "sentence"
			} else if len(sentModels) == 0 {
				if paraModels == nil {
					paraModels = modelsIn(para)
				}
				if sc.model = only(paraModels); sc.model != "" {
					sc.modelFrom = "paragraph"
				}
			}
		}
	}
	return out
}

// withoutScope removes from a result's name the phrases naming its group
// and model ("outdoor time for girls" is the predictor "outdoor time").
func withoutScope(name string) string {
	_, phrases := groupsIn(name)
	for _, p := range phrases {
		name = strings.Replace(name, p, " ", 1)
	}
	name = modelInName.ReplaceAllString(name, " ")
	name = strings.Join(strings.Fields(name), " ")
	return strings.Trim(name, " .,;:")
}
