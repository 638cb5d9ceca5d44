package audit

// studyTally is one study's claims counted by outcome, for the summaries
// of the HTML page and the workbook.
type studyTally struct {
	Study  string
	Counts map[string]int
	Total  int
}

// tallyClaims counts the report's claims by outcome, and by study and
// outcome with the studies in the order they first appear.
func tallyClaims(rep *Report) (counts map[string]int, studies []studyTally) {
	counts = map[string]int{}
	index := map[string]int{}
	for _, c := range rep.Claims {
		counts[c.Outcome]++
		i, ok := index[c.Study]
		if !ok {
			i = len(studies)
			index[c.Study] = i
			studies = append(studies, studyTally{Study: c.Study, Counts: map[string]int{}})
		}
		studies[i].Counts[c.Outcome]++
		studies[i].Total++
	}
	return counts, studies
}
