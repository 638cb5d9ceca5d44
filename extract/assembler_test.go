package extract

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

// TestStudyAssembler feeds claims rows to the assembler with the counts of
// a first pass and checks which studies come out, when, and in what order:
// a study when its last row has come, a study the first pass did not see
// (the file changed between the passes) at once, one claim at a time, and
// the rest at the end.
func TestStudyAssembler(t *testing.T) {
	tests := []struct {
		name   string
		counts map[string]int
		rows   string // the studies of the claims rows, in order
		want   string // each row's yield ("-" for none), then the unfinished
	}{
		{"contiguous", map[string]int{"A": 2, "B": 1}, "A A B", "- A:0,1 B:2 |"},
		{"interleaved", map[string]int{"A": 2, "B": 2}, "A B A B", "- - A:0,2 B:1,3 |"},
		{"unseen study", map[string]int{"A": 1}, "X A", "X:0 A:1 |"},
		{"a row after its study was complete", map[string]int{"A": 1}, "A A", "A:0 A:1 |"},
		{"fewer rows than counted", map[string]int{"A": 3, "B": 1}, "A B A", "- B:1 - | A:0,2"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			counts := rowCounts{}
			for k, n := range tt.counts {
				for range n {
					counts.add(k)
				}
			}
			a := newStudyAssembler(counts)
			var got []string
			for _, s := range strings.Fields(tt.rows) {
				if st := a.add(Claim{Study: s}); st != nil {
					got = append(got, studyIndexes(st))
				} else {
					got = append(got, "-")
				}
			}
			got = append(got, "|")
			for _, st := range a.unfinished() {
				got = append(got, studyIndexes(st))
			}
			if g := strings.Join(got, " "); g != tt.want {
				t.Errorf("got %q, want %q", g, tt.want)
			}
			for k := range a.left {
				if n := tt.counts[k]; n == 0 {
					t.Errorf("study %q, not in the first pass, is still counted", k)
				}
			}
		})
	}
}

// TestStudyAssemblerLongStudy checks that a study longer than MaxFamily
// comes in blocks of MaxFamily claims, each block after the first with a
// problem that says so.
func TestStudyAssemblerLongStudy(t *testing.T) {
	counts := rowCounts{}
	total := 2*MaxFamily + 3
	for range total {
		counts.add("L")
	}
	a := newStudyAssembler(counts)
	var sizes []string
	for range total {
		if st := a.add(Claim{Study: "L"}); st != nil {
			sizes = append(sizes, fmt.Sprintf("%d/%d", len(st.Claims), len(st.Problems)))
			for _, p := range st.Problems {
				if !errors.Is(p, ErrInputTooLarge) {
					t.Errorf("block problem %v is not ErrInputTooLarge", p)
				}
			}
		}
	}
	want := fmt.Sprintf("%d/0 %d/1 3/1", MaxFamily, MaxFamily)
	if g := strings.Join(sizes, " "); g != want {
		t.Errorf("blocks (claims/problems) %q, want %q", g, want)
	}
	if len(a.left) != 0 || len(a.unfinished()) != 0 {
		t.Errorf("the long study is still held: %d counts, %d open", len(a.left), len(a.unfinished()))
	}
}

// studyIndexes writes a study as its name and its claims' Index.
func studyIndexes(st *Study) string {
	idx := make([]string, len(st.Claims))
	for i, c := range st.Claims {
		idx[i] = fmt.Sprint(c.Index)
	}
	return st.Name + ":" + strings.Join(idx, ",")
}
