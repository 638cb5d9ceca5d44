package article

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
)

// numberedName matches a numbered variable name: "1. Sleep", "2) Stress",
// "3 Anxiety".
var numberedName = regexp.MustCompile(`^(\d{1,3})(?:[.):]\s*|\s+)(\S.*)$`)

// readCorrelationTable reads a variables × variables table, with optional
// n, M, SD or "M (SD)" columns, into a "table …" sheet, and reports
// whether the table was one: at least two variable columns, each headed
// by a number that numbers a row ("1. Sleep") or by a row's name.
func readCorrelationTable(a *Article, t *Table, name string, f *Found) bool {
	h := headerRows(t)
	if h == 0 || h >= len(t.Rows) {
		return false
	}
	width := 0
	for _, r := range t.Rows {
		width = max(width, len(r.Cells))
	}
	cols := columnsOf(t.Rows, 0, h, width)
	var body []Row
	numbers, names := map[string]bool{}, map[string]bool{}
	for _, r := range t.Rows[h:] {
		first := cell(r, 0)
		if first == "" {
			continue
		}
		body = append(body, r)
		names[fold(first)] = true
		if m := numberedName.FindStringSubmatch(first); m != nil {
			numbers[m[1]] = true
			names[fold(m[2])] = true
		}
	}
	var vars, stats []int
	for j := 1; j < width; j++ {
		head := strings.TrimSpace(cols[j].head)
		switch {
		case cols[j].role == roleMean || cols[j].role == roleSD || cols[j].role == roleMeanSD || cols[j].role == roleN:
			stats = append(stats, j)
		case numbers[strings.TrimRight(head, ".")] || names[fold(head)]:
			vars = append(vars, j)
		case head == "":
		default:
			return false
		}
	}
	if len(vars) < 2 || len(body) < 2 {
		return false
	}
	ctx := contextOf(a, t, name, f)
	rows := [][]string{{"study", a.Study}}
	if ctx.n != "" {
		rows = append(rows, []string{"n", ctx.n})
	}
	head := []string{"variable"}
	for _, j := range stats {
		switch cols[j].role {
		case roleMeanSD:
			head = append(head, "mean", "sd")
		case roleMean:
			head = append(head, "mean")
		case roleSD:
			head = append(head, "sd")
		case roleN:
			head = append(head, "n")
		}
	}
	for _, j := range vars {
		head = append(head, strings.TrimRight(strings.TrimSpace(cols[j].head), "."))
	}
	rows = append(rows, head)
	for _, r := range body {
		out := []string{cell(r, 0)}
		for _, j := range stats {
			v := cell(r, j)
			if cols[j].role == roleMeanSD {
				m, sd := splitEstimate(v)
				out = append(out, m, unwrap(sd))
				continue
			}
			out = append(out, v)
		}
		for _, j := range vars {
			out = append(out, cell(r, j))
		}
		rows = append(rows, out)
	}
	f.Tables = append(f.Tables, CorrelationSheet{Name: name, Source: name + ": " + strconv.Itoa(len(body)) + " variables", Rows: rows})
	if ctx.n == "" {
		f.confirm(name, "a correlation table without n in its caption or footnotes: add n", t.Caption)
	}
	if len(ctx.stars) == 0 && strings.Contains(rowsText(body), "*") {
		f.confirm(name, fmt.Sprintf("stars in a correlation table with no footnote defining them"), t.Caption)
	}
	return true
}

// rowsText joins the text of rows, for a search.
func rowsText(rows []Row) string {
	var b strings.Builder
	for _, r := range rows {
		b.WriteString(rowText(r))
	}
	return b.String()
}
