package extract

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// studiesOf opens path and collects its studies.
func studiesOf(t *testing.T, path string) ([]*Study, *Source) {
	t.Helper()
	src, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	var out []*Study
	for st, err := range src.Studies() {
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, st)
	}
	return out, src
}

func writeFile(t *testing.T, name, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

const pairedHeader = "study,claim,published,first_estimate,first_se,second_estimate,second_se,topic\n"

// TestOpenPairedInterleaved: a study whose rows do not stand together is
// still one study, its claims keep their places (Index), and its duplicate
// claim keys are found although other rows stand between them.
func TestOpenPairedInterleaved(t *testing.T) {
	path := writeFile(t, "paired.csv", pairedHeader+
		"A,c1,differ,0.5,0.1,0.2,0.1,x\n"+
		"B,c1,differ,0.4,0.1,0.1,0.1,x\n"+
		"A,c2,differ,0.3,0.1,0.2,0.1,x\n"+
		"B,c2,differ,0.4,0.1,0.1,0.1,x\n"+
		"A,c1,differ,0.6,0.1,0.2,0.1,x\n")
	sts, src := studiesOf(t, path)
	if len(src.Problems()) != 0 {
		t.Errorf("input problems: %v", src.Problems())
	}
	if len(sts) != 2 || sts[0].Name != "B" || sts[1].Name != "A" {
		t.Fatalf("studies %v, want B (complete at row 5) then A (row 6)", names(sts))
	}
	var idx []int
	for _, c := range sts[1].Claims {
		idx = append(idx, c.Index)
	}
	if len(idx) != 3 || idx[0] != 0 || idx[1] != 2 || idx[2] != 4 {
		t.Errorf("study A's claim indices %v, want [0 2 4]", idx)
	}
	if len(sts[1].Coefficients) != 6 {
		t.Errorf("study A has %d coefficients, want 6 (two a row)", len(sts[1].Coefficients))
	}
	dup := sts[1].Claims[2].Problems
	if len(dup) != 1 || !errors.Is(dup[0], ErrDuplicate) || dup[0].Row != 6 || !strings.Contains(dup[0].Error(), "first on row 2") {
		t.Errorf("the repeated claim c1 of A on row 6 has problems %v, want one duplicate naming row 2", dup)
	}
}

// TestPairedPieces: a paired CSV whose studies interleave says so and
// gives its rows again as runs of one study, in input order, twice alike;
// the repeated key of A is found across the runs, and its row's labels
// get the row so that they do not collide with the first row's. A file
// whose studies stand together has no pieces.
func TestPairedPieces(t *testing.T) {
	path := writeFile(t, "paired.csv", pairedHeader+
		"A,c1,differ,0.5,0.1,0.2,0.1,x\n"+
		"A,c3,differ,0.5,0.1,0.2,0.1,x\n"+
		"B,c1,differ,0.4,0.1,0.1,0.1,x\n"+
		"A,c2,differ,0.3,0.1,0.2,0.1,x\n"+
		"A,c1,differ,0.6,0.1,0.2,0.1,x\n")
	src, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	if !src.Interleaved() {
		t.Fatal("the studies interleave, and the source does not say so")
	}
	for pass := range 2 {
		var runs []string
		var last *Study
		for st, err := range src.Pieces() {
			if err != nil {
				t.Fatal(err)
			}
			run := st.Name + ":"
			for i, c := range st.Claims {
				run += fmt.Sprintf(" %s@%d", c.Claim, c.Index)
				if st.Coefficients[2*i].Label != c.First || st.Coefficients[2*i+1].Label != c.Second {
					t.Errorf("claim %s names %s/%s, its coefficients are %s/%s", c.Claim, c.First, c.Second, st.Coefficients[2*i].Label, st.Coefficients[2*i+1].Label)
				}
			}
			runs = append(runs, run)
			last = st
		}
		if got := strings.Join(runs, " | "); got != "A: c1@0 c3@1 | B: c1@2 | A: c2@3 c1@4" {
			t.Errorf("pass %d: pieces %q", pass+1, got)
		}
		dup := last.Claims[1]
		if len(dup.Problems) != 1 || !errors.Is(dup.Problems[0], ErrDuplicate) || !strings.Contains(dup.Problems[0].Error(), "first on row 2") || dup.First != "c1/first (row 6)" {
			t.Errorf("pass %d: the repeated c1 of A is %q with problems %v, want one duplicate naming row 2, labels with row 6", pass+1, dup.First, dup.Problems)
		}
	}

	together := writeFile(t, "together.csv", pairedHeader+
		"A,c1,differ,0.5,0.1,0.2,0.1,x\n"+
		"B,c1,differ,0.4,0.1,0.1,0.1,x\n")
	src2, err := Open(together)
	if err != nil {
		t.Fatal(err)
	}
	defer src2.Close()
	if src2.Interleaved() || src2.Pieces() != nil {
		t.Error("a file whose studies stand together is read in pieces")
	}
}

// TestOpenPairedHeaderOnly: a header without claims is a problem of the
// input, as it is when the file is read whole.
func TestOpenPairedHeaderOnly(t *testing.T) {
	path := writeFile(t, "empty.csv", pairedHeader)
	sts, src := studiesOf(t, path)
	if len(sts) != 0 {
		t.Errorf("got %d studies from a header-only file", len(sts))
	}
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(src.Problems()) != 1 || len(in.Problems) != 1 || src.Problems()[0].Error() != in.Problems[0].Error() {
		t.Errorf("streamed problems %v, read whole %v: want the same one problem", src.Problems(), in.Problems)
	}
}

// TestFromInputGroupsStudies: a workbook's rows are grouped by study, a
// "study:label" reference borrows the other study's coefficient, and
// correlations join the study whatever their case and spaces.
func TestFromInputGroupsStudies(t *testing.T) {
	in := &Input{
		Coefficients: []Coefficient{{Study: "S", Label: "a"}, {Study: "T", Label: "b"}, {Study: "S", Label: "c"}},
		Claims: []Claim{
			{Study: "S", Claim: "1", First: "a", Second: "T:b"},
			{Study: "T", Claim: "1", First: "b", Second: "b"},
			{Study: "S", Claim: "2", First: "a", Second: "c"},
		},
		Correlations: []Correlation{{Study: " s ", VarA: "x", VarB: "y"}},
	}
	var sts []*Study
	for st := range FromInput(in).Studies() {
		sts = append(sts, st)
	}
	if len(sts) != 2 || sts[0].Name != "T" || sts[1].Name != "S" {
		t.Fatalf("studies %v, want T then S (by last claims row)", names(sts))
	}
	s := sts[1]
	if len(s.Claims) != 2 || s.Claims[1].Index != 2 || len(s.Coefficients) != 2 {
		t.Errorf("study S: %d claims (last index %d), %d coefficients; want 2, 2, 2", len(s.Claims), s.Claims[1].Index, len(s.Coefficients))
	}
	if len(s.Borrowed) != 1 || s.Borrowed[0].Label != "b" || s.Borrowed[0].Study != "T" {
		t.Errorf("study S borrowed %v, want T's b", s.Borrowed)
	}
	if len(s.Correlations) != 1 {
		t.Errorf("study S has %d correlations rows, want the one of \" s \"", len(s.Correlations))
	}
}

// TestLongStudyInBlocks: a study of more than MaxFamily claims comes in
// blocks of MaxFamily, the later ones saying why.
func TestLongStudyInBlocks(t *testing.T) {
	var b strings.Builder
	b.WriteString(pairedHeader)
	n := MaxFamily + 5
	for i := range n {
		b.WriteString("S,c" + strconv.Itoa(i) + ",differ,0.5,0.1,0.2,0.1,\n")
	}
	sts, _ := studiesOf(t, writeFile(t, "long.csv", b.String()))
	if len(sts) != 2 || len(sts[0].Claims) != MaxFamily || len(sts[1].Claims) != 5 {
		t.Fatalf("got %d blocks, want blocks of %d and 5", len(sts), MaxFamily)
	}
	if len(sts[0].Problems) != 0 || len(sts[1].Problems) != 1 || !errors.Is(sts[1].Problems[0], ErrInputTooLarge) {
		t.Errorf("block problems %v / %v, want none then one", sts[0].Problems, sts[1].Problems)
	}
}

func names(sts []*Study) []string {
	var out []string
	for _, s := range sts {
		out = append(out, s.Name)
	}
	return out
}

// TestSourceRows: Open counts each form's claims and coefficients rows
// before any study is read, as many as reading the input whole gives (a
// paired CSV's row carries two coefficients); a source of inputs read one
// after another has no count.
func TestSourceRows(t *testing.T) {
	for _, path := range []string{filepath.Join("..", "fixtures", "demo-review.xlsx"), filepath.Join("testdata", "folder"),
		filepath.Join("testdata", "paired.csv")} {
		in, err := Read(path)
		if err != nil {
			t.Fatal(err)
		}
		src, err := Open(path)
		if err != nil {
			t.Fatal(err)
		}
		claims, coefs, ok := src.Rows()
		src.Close()
		if !ok || claims != len(in.Claims) || coefs != len(in.Coefficients) || claims == 0 {
			t.Errorf("%s: Rows() = %d claims, %d coefficients, %v; reading it whole gives %d and %d", path, claims, coefs, ok,
				len(in.Claims), len(in.Coefficients))
		}
		if claims, coefs, ok := FromInput(in).Rows(); !ok || claims != len(in.Claims) || coefs != len(in.Coefficients) {
			t.Errorf("%s in memory: Rows() = %d, %d, %v", path, claims, coefs, ok)
		}
	}
	if _, _, ok := FromInputs("articles", nil, func(func(*Input, error) bool) {}).Rows(); ok {
		t.Error("a source of inputs read one after another says it counted its rows")
	}
}
