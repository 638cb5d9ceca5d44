package report

import (
	"strings"

	"coefaudit/audit"
)

// studyTally is one study's claims counted by outcome, for the summaries
// of the HTML page and the workbook. Counts follow audit.Outcomes; other
// counts claims of an outcome outside it.
type studyTally struct {
	Study  string
	Counts []int
	Other  int
	Total  int
}

// tallies counts claims by study and outcome as they stream past, with the
// studies in the order they first appear. It holds one small record per
// study, not the claims.
type tallies struct {
	index   map[string]int
	studies []studyTally
}

func (t *tallies) add(claims []audit.ClaimResult) {
	if t.index == nil {
		t.index = map[string]int{}
	}
	for i := range claims {
		c := &claims[i]
		k, ok := t.index[c.Study]
		if !ok {
			// A copy of the name: the claim's may share its memory with the
			// whole input line it was read from.
			name := strings.Clone(c.Study)
			k = len(t.studies)
			t.index[name] = k
			t.studies = append(t.studies, studyTally{Study: name, Counts: make([]int, len(audit.Outcomes))})
		}
		s := &t.studies[k]
		s.Total++
		if o := outcomeIndex(c.Outcome); o >= 0 {
			s.Counts[o]++
		} else {
			s.Other++
		}
	}
}

// outcomeIndex is the place of o in audit.Outcomes, -1 when it is not one.
func outcomeIndex(o string) int {
	for i, x := range audit.Outcomes {
		if x == o {
			return i
		}
	}
	return -1
}

// count returns the study's count of outcome o.
func (s *studyTally) count(o string) int {
	if i := outcomeIndex(o); i >= 0 {
		return s.Counts[i]
	}
	return s.Other
}
