package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"

	"github.com/xuri/excelize/v2"
	"golang.org/x/net/html"
)

// The property test writes random small paired CSVs (invented numbers:
// studies whose rows interleave, claim keys used twice, malformed cells,
// names holding CSV, Markdown, HTML and formula characters, and files with
// a header only), checks each through every format, reads back what each
// format lets a program read, and compares it with the audit collected in
// memory (Collect): the same claims in the same order with the same
// outcome in every format; JSON and CSV field by field, with p and the
// notes; the others by row and outcome, and p or the notes where they
// show them.

// propNames are study and claim names, plain and hostile.
var propNames = []string{"Lee 2019", "S*1", "a|b", "<b>x</b>", "q\"uote", "comma, name", "=SUM(1)", "@x", "-3",
	"two\nlines", "tab\there", "[link](x)", "#head", "_u_", "Ünïcode"}

// propPaired writes one random paired CSV and returns it.
func propPaired(rng *rand.Rand) []byte {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	header := []string{"study", "claim", "published", "basis", "first_label", "first_measure", "first_group", "first_estimate",
		"first_se", "first_ci_low", "first_ci_high", "first_n", "second_label", "second_measure", "second_group", "second_estimate", "second_se", "second_n"}
	extra := []string{"reviewer", "=cmd()", "notes"}[:rng.IntN(4)]
	w.Write(append(header, extra...))
	studies := propNames[:1+rng.IntN(4)]
	pick := func(xs []string) string { return xs[rng.IntN(len(xs))] }
	num := func(lo, hi float64, dec int) string {
		return strconv.FormatFloat(lo+(hi-lo)*rng.Float64(), 'f', dec, 64)
	}
	rows := rng.IntN(12)
	if rng.IntN(8) == 0 {
		rows = 0 // a header and nothing else
	}
	for i := range rows {
		study := pick(studies) // the studies' rows interleave
		claim := fmt.Sprintf("c%d", i)
		switch rng.IntN(6) {
		case 0:
			claim = "c0" // a key used twice
		case 1:
			claim = pick(propNames)
		}
		measure := pick([]string{"b", "b", "or", "r", "md"})
		est1, est2, se1, se2 := num(0.1, 0.9, 2), num(0.1, 0.9, 2), num(0.05, 0.2, 2), num(0.05, 0.2, 2)
		lo, hi := "", ""
		if measure == "or" {
			est1, est2 = num(1.1, 3, 2), num(1.1, 3, 2)
			lo, hi, se1 = "1.05", num(3.1, 5, 2), ""
		}
		if measure == "r" {
			se1, se2 = "", ""
		}
		switch rng.IntN(8) {
		case 0:
			est1 = "0.4.3" // unreadable
		case 1:
			se2 = "" // nothing to take an SE from
		case 2:
			est2 = "−" + est2 // a Unicode minus
		}
		group := pick([]string{"g", "h"}) // one group: same sample; two: independent
		rec := []string{study, claim, pick([]string{"differ", "no-difference", "first-larger", "second-larger", "maybe"}),
			pick([]string{"test", "overlap", "significance-split", ""}), pick([]string{"x", "y", propNames[rng.IntN(len(propNames))]}),
			measure, "g", est1, se1, lo, hi, strconv.Itoa(20 + rng.IntN(200)), "z", measure, group, est2, se2, strconv.Itoa(20 + rng.IntN(200))}
		for range extra {
			rec = append(rec, pick(propNames))
		}
		w.Write(rec)
	}
	w.Flush()
	return b.Bytes()
}

// TestFormatsAgree checks 150 random inputs in every format.
func TestFormatsAgree(t *testing.T) {
	rng := rand.New(rand.NewPCG(2026, 12))
	dir := t.TempDir()
	var empty, interleaved, duplicated, flagged, claims, tested int
	defer func() {
		// What the inputs covered, so that a generator that stopped making
		// a case fails the test rather than passing it untested.
		if empty == 0 || interleaved == 0 || duplicated == 0 || flagged == 0 || claims < 500 || tested < claims/5 {
			t.Errorf("the inputs held %d claims, %d with a p: %d inputs without claims, %d with interleaved studies, %d with a key used twice, %d flagged claims; want some of each",
				claims, tested, empty, interleaved, duplicated, flagged)
		}
	}()
	for k := range 150 {
		data := propPaired(rng)
		path := filepath.Join(dir, fmt.Sprintf("input-%d.csv", k))
		if err := os.WriteFile(path, data, 0o600); err != nil {
			t.Fatal(err)
		}
		want, err := Collect(path, Options{})
		if err != nil {
			t.Fatalf("input %d: Collect: %v\n%s", k, err, data)
		}
		claims += len(want.Claims)
		empty += propCount(len(want.Claims) == 0)
		interleaved += propCount(propInterleaved(want))
		duplicated += propCount(propDuplicated(want))
		flagged += len(flaggedClaims(want))
		for _, c := range want.Claims {
			tested += propCount(c.P.Known())
		}
		out := map[string][]byte{}
		for _, format := range Formats() {
			var buf bytes.Buffer
			sum, err := Check(path, &buf, format, Options{})
			if err != nil {
				t.Fatalf("input %d: Check(%s): %v\n%s", k, format, err, data)
			}
			if sum.Claims != len(want.Claims) {
				t.Fatalf("input %d: Check(%s) counts %d claims, want %d", k, format, sum.Claims, len(want.Claims))
			}
			out[format] = buf.Bytes()
		}
		fail := func(format, msg string, args ...any) {
			t.Helper()
			t.Fatalf("input %d, %s: %s\ninput:\n%s", k, format, fmt.Sprintf(msg, args...), data)
		}
		propJSON(want, out["json"], fail)
		propCSV(want, out["csv"], fail)
		propMarkdown(want, out["md"], fail)
		propTable(want, out["table"], fail)
		propHTML(want, out["html"], fail)
		propXLSX(want, out["xlsx"], fail)
		if len(want.Claims) == 0 {
			for _, format := range []string{"md", "html", "table"} {
				if !bytes.Contains(out[format], []byte("Problems in the input")) {
					fail(format, "an input without claims and its problems %v is reported with no problem", want.Problems)
				}
			}
		}
	}
}

type failFunc func(format, msg string, args ...any)

func propCount(b bool) int {
	if b {
		return 1
	}
	return 0
}

// propInterleaved reports whether a study's claims stand apart, with
// another study's between them.
func propInterleaved(rep *audit.Report) bool {
	done := map[string]bool{}
	for i, c := range rep.Claims {
		if done[c.Study] {
			return true
		}
		if i+1 < len(rep.Claims) && rep.Claims[i+1].Study != c.Study {
			done[c.Study] = true
		}
	}
	return false
}

// propDuplicated reports whether two claims share a study and claim key.
func propDuplicated(rep *audit.Report) bool {
	seen := map[[2]string]bool{}
	for _, c := range rep.Claims {
		k := [2]string{c.Study, c.Claim}
		if seen[k] {
			return true
		}
		seen[k] = true
	}
	return false
}

// sameNumber compares a number read back with the audit's: both unknown,
// or equal to rel (0 for exact).
func sameNumber(got *float64, want audit.Number, rel float64) bool {
	if !want.Known() {
		return got == nil
	}
	if got == nil {
		return false
	}
	w := float64(want)
	return *got == w || math.Abs(*got-w) <= rel*math.Abs(w)
}

func propJSON(want *audit.Report, doc []byte, fail failFunc) {
	type side struct {
		Label    string
		Estimate *float64
		SE       *float64
		SEFrom   string `json:"se_from"`
	}
	var got struct {
		Alpha  float64
		Claims []struct {
			Study, Claim                   string
			Row                            int
			First, Second                  side
			Relation, Method               string
			Difference                     *float64
			DifferenceSE                   *float64    `json:"difference_se"`
			DifferenceCI                   [2]*float64 `json:"difference_ci"`
			Statistic, DF, P               *float64
			PRange                         [2]*float64 `json:"p_range"`
			Published, Recomputed, Outcome string
			Notes                          []string
			Overlap                        *struct {
				Proportion *float64
				ImpliedP   *float64 `json:"implied_p"`
			}
			PAdjusted *struct{ BH, Holm *float64 } `json:"p_adjusted"`
		}
		Summary  map[string]int
		Problems []audit.Problem
	}
	if err := json.Unmarshal(doc, &got); err != nil {
		fail("json", "not JSON: %v\n%s", err, doc)
	}
	if len(got.Claims) != len(want.Claims) || got.Summary["claims"] != want.Summary.Claims || len(got.Problems) != len(want.Problems) {
		fail("json", "%d claims (summary %d), %d problems; want %d, %d", len(got.Claims), got.Summary["claims"], len(got.Problems), len(want.Claims), len(want.Problems))
	}
	for o, n := range want.Summary.Counts {
		if got.Summary[o] != n {
			fail("json", "summary %s = %d, want %d", o, got.Summary[o], n)
		}
	}
	for i, g := range got.Claims {
		w := &want.Claims[i]
		texts := [][2]string{{g.Study, w.Study}, {g.Claim, w.Claim}, {g.First.Label, w.First.Label}, {g.Second.Label, w.Second.Label},
			{g.First.SEFrom, w.First.SEFrom}, {g.Relation, w.Relation}, {g.Method, w.Method}, {g.Published, w.Published},
			{g.Recomputed, w.Recomputed}, {g.Outcome, w.Outcome}, {strings.Join(g.Notes, "\n"), strings.Join(w.Notes, "\n")}}
		for _, tx := range texts {
			if tx[0] != tx[1] {
				fail("json", "claim %d: %q, want %q", i, tx[0], tx[1])
			}
		}
		nums := []struct {
			got  *float64
			want audit.Number
		}{{g.First.Estimate, w.First.Estimate}, {g.First.SE, w.First.SE}, {g.Second.Estimate, w.Second.Estimate}, {g.Second.SE, w.Second.SE},
			{g.Difference, w.Difference}, {g.DifferenceSE, w.DifferenceSE}, {g.DifferenceCI[0], w.DifferenceCI[0]}, {g.DifferenceCI[1], w.DifferenceCI[1]},
			{g.Statistic, w.Statistic}, {g.DF, w.DF}, {g.P, w.P}, {g.PRange[0], w.PRange[0]}, {g.PRange[1], w.PRange[1]}}
		for j, n := range nums {
			if !sameNumber(n.got, n.want, 0) {
				fail("json", "claim %d number %d = %v, want %v", i, j, n.got, n.want)
			}
		}
		if g.Row != w.Row || (g.Overlap == nil) != (w.Overlap == nil) || (g.PAdjusted == nil) != (w.AdjustedP == nil) {
			fail("json", "claim %d: row %d, overlap %v, adjusted %v; want row %d", i, g.Row, g.Overlap, g.PAdjusted, w.Row)
		}
	}
}

// unguard undoes safeText.
func unguard(s string) string {
	if len(s) > 1 && s[0] == '\'' && strings.IndexByte("=+-@\t\r", s[1]) >= 0 {
		return s[1:]
	}
	return s
}

func propCSV(want *audit.Report, doc []byte, fail failFunc) {
	records, err := csv.NewReader(bytes.NewReader(doc)).ReadAll()
	if err != nil {
		fail("csv", "does not read back: %v", err)
	}
	if len(records) != len(want.Claims)+1 {
		fail("csv", "%d records, want a header and %d claims", len(records), len(want.Claims))
	}
	col := map[string]int{}
	for i, name := range records[0] {
		col[unguard(name)] = i
	}
	for i, rec := range records[1:] {
		w := &want.Claims[i]
		texts := map[string]string{"study": w.Study, "claim": w.Claim, "first": w.First.Label, "first_se_from": w.First.SEFrom,
			"second": w.Second.Label, "second_se_from": w.Second.SEFrom, "relation": w.Relation, "method": w.Method, "scale": w.Scale,
			"basis": w.Basis, "published": w.Published, "recomputed": w.Recomputed, "outcome": w.Outcome,
			"notes": strings.Join(w.Notes, " | "), "row": strconv.Itoa(w.Row)}
		for i, name := range w.ExtraNames {
			if _, own := texts[name]; !own {
				texts[name] = w.ExtraValues[i]
			}
		}
		for name, v := range texts {
			k, ok := col[name]
			if !ok {
				fail("csv", "no column %q in %q", name, records[0])
			}
			if got := unguard(rec[k]); got != v {
				fail("csv", "claim %d %s = %q, want %q", i, name, got, v)
			}
		}
		nums := map[string]audit.Number{"first_estimate": w.First.Estimate, "first_se": w.First.SE, "second_estimate": w.Second.Estimate,
			"second_se": w.Second.SE, "difference": w.Difference, "difference_se": w.DifferenceSE, "difference_ci_low": w.DifferenceCI[0],
			"difference_ci_high": w.DifferenceCI[1], "statistic": w.Statistic, "df": w.DF, "p": w.P, "p_low": w.PRange[0], "p_high": w.PRange[1],
			"alpha": audit.Number(w.Alpha)}
		for name, v := range nums {
			var got *float64
			if cell := rec[col[name]]; cell != "" {
				f, err := strconv.ParseFloat(cell, 64)
				if err != nil {
					fail("csv", "claim %d %s = %q, not a number", i, name, cell)
				}
				got = &f
			}
			if !sameNumber(got, v, 5e-10) { // ten significant digits
				fail("csv", "claim %d %s = %v, want %v", i, name, rec[col[name]], v)
			}
		}
	}
}

func propMarkdown(want *audit.Report, doc []byte, fail failFunc) {
	var rows, outcomes []string
	for _, line := range strings.Split(string(doc), "\n") {
		cells := strings.Split(line, " | ")
		if len(cells) < 10 || !strings.HasPrefix(line, "| ") {
			continue
		}
		if _, err := strconv.Atoi(strings.TrimPrefix(cells[0], "| ")); err != nil {
			continue // a header
		}
		rows = append(rows, strings.TrimPrefix(cells[0], "| "))
		outcomes = append(outcomes, strings.Trim(cells[len(cells)-1], "* |"))
		if p := cells[len(cells)-4]; p != pCell(want.Claims[len(rows)-1].P) {
			fail("md", "claim %d p = %q, want %q", len(rows)-1, p, pCell(want.Claims[len(rows)-1].P))
		}
	}
	sameRowsAndOutcomes(want, "md", rows, outcomes, fail)
}

func propTable(want *audit.Report, doc []byte, fail failFunc) {
	var rows, outcomes []string
	var notes [][]string
	for _, line := range strings.Split(string(doc), "\n") {
		switch {
		case strings.HasPrefix(line, "  row "):
			rest := strings.TrimPrefix(line, "  row ")
			rows = append(rows, rest[:strings.IndexByte(rest, ' ')])
			outcomes = append(outcomes, line[strings.LastIndex(line, ": ")+2:])
			notes = append(notes, nil)
		case strings.HasPrefix(line, "    - ") && len(notes) > 0:
			notes[len(notes)-1] = append(notes[len(notes)-1], strings.TrimPrefix(line, "    - "))
		}
	}
	sameRowsAndOutcomes(want, "table", rows, outcomes, fail)
	for i, n := range notes {
		var w []string
		for _, note := range want.Claims[i].Notes {
			w = append(w, EscapeControls(note))
		}
		if strings.Join(n, "\n") != strings.Join(w, "\n") {
			fail("table", "claim %d notes %q, want %q", i, n, w)
		}
	}
}

func propHTML(want *audit.Report, doc []byte, fail failFunc) {
	page, err := html.Parse(bytes.NewReader(doc))
	if err != nil {
		fail("html", "does not parse: %v", err)
	}
	var rows, outcomes []string
	for _, tr := range claimLines(page) {
		o, _ := attr(tr, "data-outcome")
		td := findAll(tr, func(n *html.Node) bool { return n.Data == "td" })
		rows = append(rows, textOf(td[0]))
		outcomes = append(outcomes, o)
	}
	sameRowsAndOutcomes(want, "html", rows, outcomes, fail)
	cards := claimSections(page)
	flagged := flaggedClaims(want)
	if len(cards) != len(flagged) {
		fail("html", "%d cards, want %d", len(cards), len(flagged))
	}
	for i, c := range cards {
		if o, _ := attr(c, "data-outcome"); o != flagged[i].Outcome {
			fail("html", "card %d outcome %q, want %q", i, o, flagged[i].Outcome)
		}
	}
}

func propXLSX(want *audit.Report, doc []byte, fail failFunc) {
	f, err := excelize.OpenReader(bytes.NewReader(doc))
	if err != nil {
		fail("xlsx", "does not open: %v", err)
	}
	defer f.Close()
	sheet, err := f.GetRows("claims", excelize.Options{RawCellValue: true})
	if err != nil || len(sheet) == 0 {
		fail("xlsx", "no claims sheet: %v", err)
	}
	col := map[string]int{}
	for i, name := range sheet[0] {
		col[name] = i
	}
	cell := func(row []string, name string) string {
		if k := col[name]; k < len(row) {
			return row[k]
		}
		return ""
	}
	var rows, outcomes []string
	for i, row := range sheet[1:] {
		rows = append(rows, cell(row, "source_row"))
		outcomes = append(outcomes, cell(row, "outcome"))
		if i >= len(want.Claims) {
			break
		}
		w := &want.Claims[i]
		if got := cell(row, "notes"); got != strings.Join(w.Notes, " | ") {
			fail("xlsx", "claim %d notes %q, want %q", i, got, strings.Join(w.Notes, " | "))
		}
		var p *float64
		if s := cell(row, "p"); s != "" {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				fail("xlsx", "claim %d p %q", i, s)
			}
			p = &v
		}
		if !sameNumber(p, w.P, 1e-14) { // Excel's 15 significant digits
			fail("xlsx", "claim %d p = %q, want %v", i, cell(row, "p"), w.P)
		}
	}
	sameRowsAndOutcomes(want, "xlsx", rows, outcomes, fail)
}

// sameRowsAndOutcomes checks a format's claims: one per claims row of the
// audit, in its order, with its outcome.
func sameRowsAndOutcomes(want *audit.Report, format string, rows, outcomes []string, fail failFunc) {
	if len(rows) != len(want.Claims) {
		fail(format, "%d claims read back, want %d", len(rows), len(want.Claims))
	}
	for i := range rows {
		w := &want.Claims[i]
		if rows[i] != strconv.Itoa(w.Row) || outcomes[i] != w.Outcome {
			fail(format, "claim %d is row %s, %s; want row %d, %s", i, rows[i], outcomes[i], w.Row, w.Outcome)
		}
	}
}
