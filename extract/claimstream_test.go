package extract

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// studyShape is what a study holds, by keys, for comparing two readings.
func studyShape(st *Study) string {
	var b strings.Builder
	fmt.Fprintf(&b, "study %q:", st.Name)
	for _, c := range st.Claims {
		fmt.Fprintf(&b, " claim#%d(%s,%d problems)", c.Index, c.Claim, len(c.Problems))
	}
	for _, c := range st.Coefficients {
		fmt.Fprintf(&b, " coef(%s/%s,%d)", c.Study, c.Label, len(c.Problems))
	}
	for _, c := range st.Borrowed {
		fmt.Fprintf(&b, " borrowed(%s/%s)", c.Study, c.Label)
	}
	for _, c := range st.Correlations {
		fmt.Fprintf(&b, " corr(%s-%s,%d)", c.VarA, c.VarB, len(c.Problems))
	}
	for _, t := range st.Tables {
		fmt.Fprintf(&b, " table(%s,%d)", t.Name, len(t.Problems))
	}
	fmt.Fprintf(&b, " problems %d", len(st.Problems))
	return b.String()
}

func shapes(t *testing.T, src *Source) (out []string) {
	t.Helper()
	for st, err := range src.Studies() {
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, studyShape(st))
	}
	return out
}

// TestOpenSheetsAsReadWhole: a workbook or a folder opened as a stream (the
// claims sheet read twice, the other sheets whole) yields the studies that
// reading it whole and splitting it yields, with the same rows and
// problems, in the same order. Cases: the demo workbook, the test folder,
// a folder whose studies interleave, borrow a coefficient by
// "study:label", and leave a study with coefficients but no claims, and a
// claims sheet of a header alone that lacks a required column.
func TestOpenSheetsAsReadWhole(t *testing.T) {
	folder := t.TempDir()
	files := map[string]string{
		"coefficients.csv": "study,label,measure,group,estimate,se\nA,a1,b,g,0.5,0.1\nA,a2,b,h,0.2,0.1\nB,b1,b,g,0.4,0.1\nB,b2,b,h,0.1,0.1\nC,c1,b,g,abc,0.1\n",
		"claims.csv":       "study,claim,first,second,published\nA,1,a1,a2,differ\nB,1,b1,b2,differ\nA,2,a1,B:b2,differ\nB,1,b1,a2,differ\n",
		"correlations.csv": "study,group,var_a,var_b,r,n\na,g,x,y,0.3,100\n",
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(folder, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	// A study longer than MaxFamily (its later block borrows its
	// coefficients), a label used twice, a study whose claims borrow from
	// the long one, a coefficient with no study and a study with
	// coefficients but no claims: the held coefficients are read as
	// Read reads them.
	long := t.TempDir()
	claims := "study,claim,first,second,published\n"
	for i := 0; i <= MaxFamily; i++ {
		claims += fmt.Sprintf("L,%d,l1,l2,differ\n", i)
	}
	claims += "M,1,m1,L:l2,differ\nM,2,m1, L : l1 ,differ\n"
	os.WriteFile(filepath.Join(long, "claims.csv"), []byte(claims), 0o644)
	os.WriteFile(filepath.Join(long, "coefficients.csv"), []byte("study,label,estimate,se\n L ,l1,0.5,0.1\nM,m1,0.3,0.1\nL,l2,0.2,x\nL,l1,0.4,0.1\n,l9,0.1,0.1\nN,n1,0.1\n"), 0o644)
	headerOnly := t.TempDir()
	os.WriteFile(filepath.Join(headerOnly, "claims.csv"), []byte("study,claim,first,second\n"), 0o644)
	os.WriteFile(filepath.Join(headerOnly, "coefficients.csv"), []byte("study,label,estimate,se\nA,a,0.5,0.1\n"), 0o644)
	for _, path := range []string{filepath.Join("..", "fixtures", "demo-review.xlsx"), filepath.Join("testdata", "folder"),
		headerOnly, filepath.Join("testdata", "folder-missing-column"), filepath.Join("testdata", "folder-european"), folder, long} {
		t.Run(filepath.Base(path), func(t *testing.T) {
			src, err := Open(path)
			if err != nil {
				t.Fatal(err)
			}
			defer src.Close()
			streamed := shapes(t, src)
			in, err := Read(path)
			if err != nil {
				t.Fatal(err)
			}
			whole := FromInput(in)
			want := shapes(t, whole)
			if !reflect.DeepEqual(streamed, want) {
				t.Errorf("streamed studies:\n%s\nread whole:\n%s", strings.Join(streamed, "\n"), strings.Join(want, "\n"))
			}
			if got, want := fmt.Sprint(src.Problems()), fmt.Sprint(whole.Problems()); got != want {
				t.Errorf("input problems streamed %s, read whole %s", got, want)
			}
			if !reflect.DeepEqual(src.ClaimColumns, whole.ClaimColumns) {
				t.Errorf("claim columns streamed %v, read whole %v", src.ClaimColumns, whole.ClaimColumns)
			}
		})
	}
}
