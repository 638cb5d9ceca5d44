package report

import (
	"strings"
	"testing"

	"coefaudit/audit"
)

// TestHeldProblemsBounded: a report holds at most MaxProblems problems of
// its studies until its end and says how many more there were; the
// input's own problems always come first.
func TestHeldProblemsBounded(t *testing.T) {
	var h heldProblems
	batch := make([]audit.Problem, 3000)
	for range 4 {
		h.add(batch)
	}
	all := h.all(Footer{Problems: []audit.Problem{{Message: "no coefficients sheet"}}})
	if len(all) != 1+MaxProblems+1 {
		t.Fatalf("got %d problems, want the input's 1, %d kept and 1 counting the rest", len(all), MaxProblems)
	}
	if all[0].Message != "no coefficients sheet" || !strings.HasPrefix(all[len(all)-1].Message, "2000 more problems") {
		t.Errorf("first %q, last %q", all[0].Message, all[len(all)-1].Message)
	}
}
