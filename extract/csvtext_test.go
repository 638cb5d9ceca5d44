package extract

import (
	"errors"
	"strings"
	"testing"
)

// TestInvalidUTF8Cell: a cell that is not UTF-8 (here Latin-1 "é", 0xE9)
// is a problem naming its row and column, read as blank; the other rows
// are read as they are. Before, the bytes passed through silently.
func TestInvalidUTF8Cell(t *testing.T) {
	path := writeFile(t, "paired.csv", pairedHeader+
		"A,c1,differ,0.5,0.1,0.2,0.1,caf\xe9\n"+
		"A,c2,differ,0.5,0.1,0.2,0.1,x\n")
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Claims) != 2 {
		t.Fatalf("got %d claims, want 2", len(in.Claims))
	}
	ps := in.Claims[0].Problems
	if len(ps) != 1 || ps[0].Row != 2 || ps[0].Column != "topic" || !errors.Is(ps[0], ErrUnsupportedInput) || !strings.Contains(ps[0].Error(), "UTF-8") {
		t.Errorf("row 2 problems %v, want one naming column topic and UTF-8", ps)
	}
	if in.Claims[0].Topic != "" {
		t.Errorf("the bad cell was read as %q, want blank", in.Claims[0].Topic)
	}
	if len(in.Claims[1].Problems) != 0 {
		t.Errorf("row 3 has problems %v", in.Claims[1].Problems)
	}
}

// TestUnclosedQuote: a quote opened on row 3 and never closed swallows the
// rows after it; the problem says that the cause is the unclosed quote on
// row 3 and which lines were lost. Rows before it are read as usual.
func TestUnclosedQuote(t *testing.T) {
	path := writeFile(t, "paired.csv", pairedHeader+
		"A,c1,differ,0.5,0.1,0.2,0.1,x\n"+
		"A,\"c2,differ,0.5,0.1,0.2,0.1,x\n"+
		"A,c3,differ,0.5,0.1,0.2,0.1,x\n"+
		"A,c4,differ,0.5,0.1,0.2,0.1,x\n")
	in, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Claims) != 2 || in.Claims[0].Claim != "c1" || in.Claims[1].Row != 3 {
		t.Fatalf("claims %+v, want c1 and the broken row 3", in.Claims)
	}
	var msg string
	for _, p := range in.Claims[1].Problems {
		if strings.Contains(p.Error(), "quote") {
			msg = p.Error()
		}
	}
	for _, want := range []string{"unclosed quote", "opened on row 3", "lines 4 to 5 are lost", "close or remove the quote on row 3"} {
		if !strings.Contains(msg, want) {
			t.Errorf("problem %q does not say %q", msg, want)
		}
	}
}
