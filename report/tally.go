package report

import (
	"strings"

	"coefaudit/audit"
)

// tallies counts claims by study and outcome as they stream past, for the
// summaries of the HTML page and the workbook, with the studies in the
// order they first appear. It holds a name and a few counts per study, not
// the claims: some 100 bytes a study (a flat slice of counts rather than a
// record and a slice per study, which took twice that in a heap profile of
// 150,000 studies).
type tallies struct {
	index  map[string]int32
	names  []string
	counts []int32 // per study: one per audit.Outcomes, then other outcomes, then the total
}

// width is the number of counts kept per study.
func (t *tallies) width() int { return len(audit.Outcomes) + 2 }

func (t *tallies) add(claims []audit.ClaimResult) {
	if t.index == nil {
		t.index = map[string]int32{}
	}
	w := t.width()
	for i := range claims {
		c := &claims[i]
		k, ok := t.index[c.Study]
		if !ok {
			// A copy of the name: the claim's may share its memory with the
			// whole input line it was read from.
			name := strings.Clone(c.Study)
			k = int32(len(t.names))
			t.index[name] = k
			t.names = append(t.names, name)
			t.counts = append(t.counts, make([]int32, w)...)
		}
		row := t.counts[int(k)*w : int(k+1)*w]
		row[w-1]++
		if o := outcomeIndex(c.Outcome); o >= 0 {
			row[o]++
		} else {
			row[w-2]++
		}
	}
}

// len is the number of studies counted.
func (t *tallies) len() int { return len(t.names) }

// count returns study k's count of outcome o.
func (t *tallies) count(k int, o string) int {
	w := t.width()
	i := outcomeIndex(o)
	if i < 0 {
		i = w - 2
	}
	return int(t.counts[k*w+i])
}

// total returns study k's count of claims.
func (t *tallies) total(k int) int { return int(t.counts[(k+1)*t.width()-1]) }

// outcomeIndex is the place of o in audit.Outcomes, -1 when it is not one.
func outcomeIndex(o string) int {
	for i, x := range audit.Outcomes {
		if x == o {
			return i
		}
	}
	return -1
}
