package extract

import (
	"errors"
	"fmt"
	"testing"
)

// textInput is an input of one study with n claims, read from memory.
func textInput(t *testing.T, study string, n int) *Input {
	t.Helper()
	coefs := [][]string{{"study", "label", "estimate", "se"}, {study, "a", "0.40", "0.10"}, {study, "b", "0.10", "0.10"}}
	claims := [][]string{{"study", "claim", "first", "second", "published"}}
	for k := range n {
		claims = append(claims, []string{study, fmt.Sprintf("C%d", k+1), "a", "b", "differ"})
	}
	in, err := ReadTextSheets(study+".xml", []TextSheet{{Name: "coefficients", Rows: coefs}, {Name: "claims", Rows: claims}, {Name: "to confirm", Rows: [][]string{{"x"}}}})
	if err != nil {
		t.Fatal(err)
	}
	return in
}

// TestFromInputs yields the studies of inputs read one after another, the
// claims numbered on across them, the inputs' problems gathered as they
// are read.
func TestFromInputs(t *testing.T) {
	ins := []*Input{textInput(t, "Alder", 2), textInput(t, "Birch", 3)}
	ins[1].Problems = append(ins[1].Problems, &CellError{Position: Position{File: "scan.pdf"}, Err: ErrUnsupportedInput})
	src := FromInputs("articles", []string{"source"}, func(yield func(*Input, error) bool) {
		for _, in := range ins {
			if !yield(in, nil) {
				return
			}
		}
	})
	var got []int
	for st, err := range src.Studies() {
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range st.Claims {
			got = append(got, c.Index)
			if len(c.Problems) > 0 {
				t.Errorf("%s %s: %v", c.Study, c.Claim, c.Problems)
			}
		}
	}
	if fmt.Sprint(got) != "[0 1 2 3 4]" {
		t.Errorf("claim indexes %v, want [0 1 2 3 4]", got)
	}
	if len(src.Problems()) != 1 || src.Problems()[0].File != "scan.pdf" {
		t.Errorf("problems %v, want the one of the second input", src.Problems())
	}
	if _, err := ReadTextSheets("x", []TextSheet{{Name: "coefficients"}}); !errors.Is(err, ErrMissingSheet) {
		t.Errorf("ReadTextSheets without claims = %v, want ErrMissingSheet", err)
	}
}
