package audit_test

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"coefaudit/audit"
	"coefaudit/extract"
)

// The property test builds a few hundred random folders of CSV files
// (invented data: good rows mixed with malformed cells, labels that are
// missing or used twice, blank lines, extra columns, quoted fields over two
// lines and every kind of line end) and checks what the output contract
// promises whatever the input: every claims row appears exactly once, in
// order, with its own row number; an incomplete claim says why; and the
// input is never written to.

// propClaim is what the generator knows of one claims row it wrote.
type propClaim struct {
	row          int
	study, claim string
	keyKnown     bool   // false when a stray quote leaves the cells unknown
	wellFormed   bool   // every cell of the row is valid
	missing      string // a label the row names that no coefficient has
	duplicated   string // a label the row names that two coefficients share
}

// propInput is a generated folder's two files and its claims rows.
type propInput struct {
	coefficients, claims []byte
	rows                 []propClaim
}

// propLineEnd writes a line end: \n, \r\n or a lone \r, but never a \n
// right after a lone \r, which would make one \r\n of two line ends.
func propLineEnd(b *strings.Builder, rng *rand.Rand) {
	end := []string{"\n", "\r\n", "\r"}[rng.IntN(3)]
	if end == "\n" && strings.HasSuffix(b.String(), "\r") {
		end = "\r\n"
	}
	b.WriteString(end)
}

// propGenerate writes one random input. Labels l0…l5 of study s are good
// coefficients of measure b; d0 is used twice; bad has a malformed
// estimate; rr is a ratio measure (comparing it with a b coefficient
// compares different measures); m0…m2 name nothing.
func propGenerate(rng *rand.Rand) propInput {
	var coef strings.Builder
	extraCol := rng.IntN(2) == 0
	coef.WriteString("study,label,measure,estimate,se,n")
	if extraCol {
		coef.WriteString(",source")
	}
	propLineEnd(&coef, rng)
	type coefRow struct{ label, measure, est, se string }
	rows := []coefRow{{"d0", "b", "0.30", "0.10"}, {"bad", "b", "0.4.3", "0.10"}, {"rr", "rr", "1.50", "0.20"}, {"d0", "b", "0.35", "0.12"}}
	for i := 0; i < 6; i++ {
		rows = append(rows, coefRow{fmt.Sprintf("l%d", i), "b", fmt.Sprintf("0.%02d", 10+rng.IntN(80)), fmt.Sprintf("0.%02d", 5+rng.IntN(20))})
	}
	rng.Shuffle(len(rows), func(i, j int) { rows[i], rows[j] = rows[j], rows[i] })
	for _, r := range rows {
		if rng.IntN(6) == 0 {
			propLineEnd(&coef, rng) // a blank line
		}
		fmt.Fprintf(&coef, "s,%s,%s,%s,%s,%d", r.label, r.measure, r.est, r.se, 50+rng.IntN(200))
		if extraCol {
			coef.WriteString(",Table 2")
		}
		propLineEnd(&coef, rng)
	}

	var cl strings.Builder
	line := 1
	for rng.IntN(4) == 0 {
		propLineEnd(&cl, rng) // blank lines before the header
		line++
	}
	cl.WriteString("study,claim,first,second,published,basis,alpha,topic")
	if extraCol {
		cl.WriteString(",reviewer")
	}
	propLineEnd(&cl, rng)
	line++
	good := []string{"l0", "l1", "l2", "l3", "l4", "l5"}
	var out []propClaim
	n := 1 + rng.IntN(14)
	for i := 0; i < n; i++ {
		for rng.IntN(5) == 0 {
			if rng.IntN(2) == 0 {
				propLineEnd(&cl, rng)
			} else {
				cl.WriteString(",,,,") // blank cells are a blank row
				propLineEnd(&cl, rng)
			}
			line++
		}
		pc := propClaim{row: line, study: "s", claim: fmt.Sprintf("c%d", i), keyKnown: true, wellFormed: true}
		first, second := good[rng.IntN(6)], good[rng.IntN(6)]
		for second == first {
			second = good[rng.IntN(6)]
		}
		published, alpha, topic := []string{"differ", "no-difference", "first-larger", "second-larger"}[rng.IntN(4)], "", "t"
		switch rng.IntN(18) { // cases 10 to 17: a good row
		case 0:
			pc.missing = fmt.Sprintf("m%d", rng.IntN(3))
			second = pc.missing
		case 1:
			pc.duplicated = "d0"
			first = "d0"
		case 2:
			second = "bad"
		case 3:
			second = "rr"
		case 4:
			published, pc.wellFormed = "maybe", false
		case 5:
			alpha, pc.wellFormed = "2", false
		case 6:
			pc.claim, pc.wellFormed = "", false // the key left blank
		case 7:
			pc.study, pc.wellFormed = "", false
		case 8:
			pc.claim, pc.keyKnown, pc.wellFormed = `c"`+fmt.Sprint(i), false, false // a stray quote
		case 9:
			topic = "\"two\nlines\"" // one record over two lines
		}
		fmt.Fprintf(&cl, "%s,%s,%s,%s,%s,test,%s,%s", pc.study, pc.claim, first, second, published, alpha, topic)
		if extraCol {
			cl.WriteString(",R1")
		}
		if rng.IntN(10) == 0 {
			cl.WriteString(",surplus") // more fields than the header
			pc.wellFormed = false
		}
		if i < n-1 || rng.IntN(2) == 0 {
			propLineEnd(&cl, rng)
		}
		line += 1 + strings.Count(topic, "\n")
		out = append(out, pc)
	}
	return propInput{coefficients: []byte(coef.String()), claims: []byte(cl.String()), rows: out}
}

// TestCheckProperties reads and audits 300 generated folders.
func TestCheckProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(2024, 8))
	old := time.Now().Add(-time.Hour).Truncate(time.Second)
	for k := 0; k < 300; k++ {
		in := propGenerate(rng)
		dir := t.TempDir()
		files := map[string][]byte{"coefficients.csv": in.coefficients, "claims.csv": in.claims}
		for name, data := range files {
			p := filepath.Join(dir, name)
			if err := os.WriteFile(p, data, 0o644); err != nil {
				t.Fatal(err)
			}
			if err := os.Chtimes(p, old, old); err != nil {
				t.Fatal(err)
			}
		}
		rep, err := readAndAudit(dir)
		if err != nil {
			t.Fatalf("input %d: Check = %v\nclaims.csv:\n%q", k, err, in.claims)
		}
		propCheckClaims(t, k, in, rep)
		for name, data := range files {
			p := filepath.Join(dir, name)
			after, err := os.ReadFile(p)
			if err != nil {
				t.Fatal(err)
			}
			fi, err := os.Stat(p)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(after, data) || !fi.ModTime().Equal(old) {
				t.Fatalf("input %d: Check changed %s (bytes equal %v, modified %v)", k, name, bytes.Equal(after, data), fi.ModTime())
			}
		}
	}
}

// propCheckClaims compares the report's claims with the rows written.
func propCheckClaims(t *testing.T, k int, in propInput, rep *audit.Report) {
	t.Helper()
	fail := func(format string, args ...any) {
		t.Helper()
		t.Fatalf("input %d: %s\nclaims.csv:\n%q", k, fmt.Sprintf(format, args...), in.claims)
	}
	if len(rep.Claims) != len(in.rows) || rep.Summary.Claims != len(in.rows) {
		fail("Check gave %d claims (summary %d), want one per claims row: %d", len(rep.Claims), rep.Summary.Claims, len(in.rows))
	}
	counted := 0
	for _, n := range rep.Summary.Counts {
		counted += n
	}
	if counted != len(in.rows) {
		fail("the summary counts %d outcomes for %d claims", counted, len(in.rows))
	}
	for i, want := range in.rows {
		got := rep.Claims[i]
		if got.Row != want.row {
			fail("claim %d is on row %d, want row %d", i, got.Row, want.row)
		}
		if want.keyKnown && (got.Study != want.study || got.Claim != want.claim) {
			fail("row %d = study %q claim %q, want %q %q", want.row, got.Study, got.Claim, want.study, want.claim)
		}
		if !slices.Contains(audit.Outcomes, got.Outcome) {
			fail("row %d outcome %q is not one of %v", want.row, got.Outcome, audit.Outcomes)
		}
		if got.Outcome == audit.Incomplete && len(got.Notes) == 0 {
			fail("row %d is incomplete with no note saying why", want.row)
		}
		if !want.wellFormed && got.Outcome != audit.Incomplete {
			fail("row %d has a malformed cell but outcome %q, want incomplete", want.row, got.Outcome)
		}
		notes := strings.Join(got.Notes, " ")
		switch {
		case !want.wellFormed:
			if !strings.Contains(notes, "could not be read") {
				fail("row %d notes %q, want them to say the row could not be read", want.row, notes)
			}
		case want.missing != "":
			if got.Outcome != audit.Incomplete || !strings.Contains(notes, fmt.Sprintf("No coefficient labelled %q in study %q", want.missing, "s")) {
				fail("row %d names the missing label %s: outcome %q, notes %q", want.row, want.missing, got.Outcome, notes)
			}
		case want.duplicated != "":
			if got.Outcome != audit.Incomplete || !strings.Contains(notes, fmt.Sprintf("label %q appears more than once", want.duplicated)) {
				fail("row %d names the duplicated label %s: outcome %q, notes %q", want.row, want.duplicated, got.Outcome, notes)
			}
		}
	}
}

// readAndAudit reads the input at path and audits it, as a report does.
func readAndAudit(path string) (*audit.Report, error) {
	in, err := extract.Read(path)
	if err != nil {
		return nil, err
	}
	return audit.Audit(in, audit.DefaultOptions), nil
}

// propFolder writes coefficients.csv and claims.csv into a new folder.
func propFolder(t *testing.T, coefficients, claims string) string {
	t.Helper()
	dir := t.TempDir()
	for name, data := range map[string]string{"coefficients.csv": coefficients, "claims.csv": claims} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// TestCheckBrokenContent audits one claim over coefficients whose content
// is broken in one way each. The numbers are invented; only the outcome
// and the note saying why are checked.
func TestCheckBrokenContent(t *testing.T) {
	// The second coefficient is from another group, so that the two are
	// independent and a test can be run.
	const header = "study,label,measure,group,estimate,ci_low,ci_high,ci_level,se,n\n"
	const good = "s,b,b,g2,0.20,,,,0.10,100\n"
	tests := []struct {
		name    string
		coefs   string
		first   string
		outcome string
		note    string
	}{
		{"duplicate label", "s,a,b,,0.50,,,,0.10,100\ns,a,b,,0.40,,,,0.10,100\n" + good, "a", audit.Incomplete,
			`label "a" appears more than once in study "s"`},
		{"missing label", good, "zz", audit.Incomplete, `No coefficient labelled "zz" in study "s"`},
		{"different measures", "s,a,r,,0.50,,,,,100\ns,b,or,g2,1.50,1.10,2.00,,,\n", "a", audit.Incomplete,
			"estimates on different scales cannot be tested against each other"},
		{"estimate outside its interval", "s,a,b,,0.90,0.10,0.50,,,100\n" + good, "a", audit.Conflict,
			"the estimate 0.90 lies outside its own interval 0.10 to 0.50"},
		{"negative SE", "s,a,b,,0.50,,,,-0.10,100\n" + good, "a", audit.Incomplete, "a standard error cannot be negative"},
		{"correlation with n 3", "s,a,r,,0.50,,,,,3\ns,b,r,g2,0.20,,,,,100\n", "a", audit.Incomplete, "a correlation needs n of at least 4"},
		{"ci_level 100", "s,a,b,,0.50,0.30,0.70,100,,100\n" + good, "a", audit.Incomplete, "a confidence level is a percent"},
		{"ci_level 0", "s,a,b,,0.50,0.30,0.70,0,,100\n" + good, "a", audit.Incomplete, "a confidence level is a percent"},
		// 0.50 (0.30, 0.70) against 0.20 (SE 0.10): z = 0.30/√(0.102² + 0.10²) ≈ 2.1,
		// p ≈ 0.036 (normal two-sided), below 0.05 however the numbers round.
		{"nothing wrong", "s,a,b,,0.50,0.30,0.70,95,,100\n" + good, "a", audit.Consistent, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := propFolder(t, header+tt.coefs, "study,claim,first,second,published\ns,c1,"+tt.first+",b,differ\n")
			rep, err := readAndAudit(dir)
			if err != nil {
				t.Fatal(err)
			}
			if len(rep.Claims) != 1 {
				t.Fatalf("Check(%s) = %d claims, want 1", tt.name, len(rep.Claims))
			}
			c := rep.Claims[0]
			notes := strings.Join(c.Notes, " | ")
			if c.Outcome != tt.outcome || !strings.Contains(notes, tt.note) {
				t.Errorf("Check(%s) = %s with notes %q, want %s with a note saying %q", tt.name, c.Outcome, notes, tt.outcome, tt.note)
			}
		})
	}
}
