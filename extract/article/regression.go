package article

import (
	"fmt"
	"regexp"
	"strings"
	"unicode"
)

// slot is one model's columns: an estimate column and the columns after
// it that belong to it, up to the next estimate column.
type slot struct {
	est                     int
	se, stat, p, ci, lo, hi int // -1 when absent
	measure, paren, level   string
	group                   string // the column group's heading
	n                       string // from an n row of the table
	nPlace                  string
}

// tableContext is what a table's caption and footnotes say for all its
// rows: the study, its label, stars and their p bounds, n and outcome.
type tableContext struct {
	study, label string
	stars        map[int]string // stars count → "< .05"
	largest      string         // the largest star threshold, "≥ .05" for no star
	largestStars int            // the stars of the largest threshold
	starsFoot    map[int]string // where each count of stars is defined
	// boldP is the p bound of a bold estimate where a footnote says bold
	// marks significance, boldNot that of one in plain type.
	boldP, boldNot, boldFoot string
	n, nPlace                string
	outcome                  string
	standardized             bool
}

// readTables reads every table of an article into f: correlation tables,
// regression tables, and a line for each table that is neither.
func readTables(a *Article, f *Found) {
	for i := range a.Tables {
		t := &a.Tables[i]
		name := t.name(i)
		if readCorrelationTable(a, t, name, f) {
			continue
		}
		if !readRegressionTable(a, t, name, f) {
			f.confirm(name, "not read as a results table: no column of estimates (B, β, OR, HR, model columns) and no correlation triangle", t.Caption)
		}
	}
}

// headerRows returns how many rows at the top of a table are its header:
// those marked as header rows, else the leading rows whose cells past the
// first hold no number.
func headerRows(t *Table) int {
	k := 0
	for k < len(t.Rows) && t.Rows[k].Head {
		k++
	}
	if k > 0 {
		return k
	}
	for k < len(t.Rows) && !rowHasNumber(t.Rows[k]) {
		k++
	}
	if k == len(t.Rows) {
		return 0
	}
	return k
}

// rowHasNumber reports whether a cell past the first holds a digit.
func rowHasNumber(r Row) bool {
	for j := 1; j < len(r.Cells); j++ {
		if strings.IndexFunc(r.Cells[j].Text, unicode.IsDigit) >= 0 && !modelHeading.MatchString(r.Cells[j].Text) {
			return true
		}
	}
	return false
}

// columnsOf reads the header rows rows[from:to]: each column's role from
// its lowest non-blank header text, its group from the texts above.
func columnsOf(rows []Row, from, to, width int) []column {
	cols := make([]column, width)
	for j := 1; j < width; j++ {
		var texts []string
		for r := from; r < to; r++ {
			if j < len(rows[r].Cells) {
				if s := rows[r].Cells[j].Text; s != "" && (len(texts) == 0 || texts[len(texts)-1] != s) {
					texts = append(texts, s)
				}
			}
		}
		if len(texts) == 0 {
			continue
		}
		c := roleOf(texts[len(texts)-1])
		above := strings.Join(texts[:len(texts)-1], " ")
		if c.group == "" {
			c.group = above
		}
		if c.level == "" {
			if m := levelOf.FindStringSubmatch(above); m != nil {
				c.level = m[1]
			}
		}
		c.head = strings.Join(texts, " ")
		cols[j] = c
	}
	return cols
}

// slotsOf groups columns into models: each estimate column with the
// columns after it up to the next estimate column. Columns of one group
// share a t, p or CI column that only one of them has (the B | SE | β | t |
// p layout).
func slotsOf(cols []column) []slot {
	var out []slot
	for j, c := range cols {
		if c.role == roleEstimate {
			out = append(out, slot{est: j, se: -1, stat: -1, p: -1, ci: -1, lo: -1, hi: -1,
				measure: c.measure, paren: c.paren, level: c.level, group: c.group})
			continue
		}
		if len(out) == 0 {
			continue
		}
		s := &out[len(out)-1]
		switch c.role {
		case roleSE:
			s.se = j
		case roleStat:
			s.stat = j
		case roleP:
			s.p = j
		case roleCI:
			s.ci = j
		case roleCILow:
			s.lo = j
		case roleCIHigh:
			s.hi = j
		}
		if c.level != "" && s.level == "" {
			s.level = c.level
		}
	}
	for i := range out {
		for k := range out {
			if k == i || out[k].group != out[i].group {
				continue
			}
			a, b := &out[i], &out[k]
			for _, pair := range [][2]*int{{&a.stat, &b.stat}, {&a.p, &b.p}} {
				if *pair[0] < 0 {
					*pair[0] = *pair[1]
				}
			}
		}
	}
	return out
}

// statisticsRow matches the labels of rows that give a model's statistics
// rather than a coefficient.
var statisticsRow = regexp.MustCompile(`(?i)^(r\s*2|r²|adj|adjusted|δ\s*r|Δ\s*r|f\b|f\s*\(|aic|bic|log|−2|-2|χ|chi|nagelkerke|cox|pseudo|df\b|icc|variance|random|residual|rmse|hosmer|c statistic|auc)`)

// nRow matches the label of a row giving each model's n.
var nRow = regexp.MustCompile(`(?i)^(n|observations|obs|sample size|no of observations|number of observations|participants)$`)

// readRegressionTable reads a regression table into f and reports whether
// the table had an estimate column.
func readRegressionTable(a *Article, t *Table, name string, f *Found) bool {
	width := 0
	for _, r := range t.Rows {
		width = max(width, len(r.Cells))
	}
	h := headerRows(t)
	cols := columnsOf(t.Rows, 0, h, width)
	slots := slotsOf(cols)
	if len(slots) == 0 {
		return false
	}
	ctx := contextOf(a, t, name, f)
	rr := regressionReader{a: a, t: t, name: name, f: f, ctx: ctx, cols: cols, slots: slots}
	rr.modelNames()
	rr.unreadColumns()
	rr.nRows(h)
	for i := h; i < len(t.Rows); i++ {
		i = rr.row(i)
	}
	rr.finish()
	return true
}

// regressionReader reads the body rows of one regression table.
type regressionReader struct {
	a     *Article
	t     *Table
	name  string
	f     *Found
	ctx   tableContext
	cols  []column
	slots []slot
	// models and groups name each slot's model and group.
	models, groups []string
	// section is the heading of the rows below it ("Model 2" of stacked
	// models sets the model; another heading is kept for the places).
	section string
	start   int // the first coefficient of this table in f
}

// modelNames names each slot's model and group from its column group: a
// model heading ("Model 2", "(2)") is a model of the same sample, another
// heading ("Girls") is read as a separate sample, which the reviewer is
// asked to confirm.
func (rr *regressionReader) modelNames() {
	rr.models = make([]string, len(rr.slots))
	rr.groups = make([]string, len(rr.slots))
	rr.start = len(rr.f.Coefficients)
	asked := map[string]bool{}
	for i, s := range rr.slots {
		g := strings.TrimSpace(s.group)
		switch {
		case g == "":
			rr.models[i] = rr.name
		case modelHeading.MatchString(g):
			rr.models[i] = g
		default:
			rr.models[i], rr.groups[i] = rr.name, g
			if !asked[g] {
				asked[g] = true
				rr.f.confirm(rr.name+fmt.Sprintf(", column %q", rr.cols[s.est].head),
					"column group read as a separate sample (group); if it is another model of the same sample, set group blank and model to it", g)
			}
		}
	}
}

// cell returns a row's cell j, blank beyond its end.
func cell(r Row, j int) string {
	if j < 0 || j >= len(r.Cells) {
		return ""
	}
	return r.Cells[j].Text
}

// row reads body row i and returns the index of the last row it used.
func (rr *regressionReader) row(i int) int {
	r := rr.t.Rows[i]
	first := cell(r, 0)
	if !rowHasNumber(r) {
		if rr.headerAgain(r) {
			return i
		}
		if first != "" && onlyFirst(r) {
			rr.section = first
			if modelHeading.MatchString(first) {
				for k := range rr.models {
					rr.models[k] = first
				}
			}
		}
		return i
	}
	place := fmt.Sprintf("%s, row %q", rr.name, first)
	switch {
	case first == "":
		rr.f.confirm(fmt.Sprintf("%s, row %d", rr.name, i+1), "numbers in a row without a predictor's name, not under an estimate: not read", rowText(r))
		return i
	case nRow.MatchString(fold(first)):
		rr.nRow(r, place)
		return i
	case statisticsRow.MatchString(strings.TrimSpace(first)) && !strings.HasPrefix(fold(first), "log") || fold(first) == "log likelihood":
		rr.f.confirm(place, "a model statistic, not a coefficient: not read", rowText(r))
		return i
	}
	var under Row
	used := i
	if i+1 < len(rr.t.Rows) && cell(rr.t.Rows[i+1], 0) == "" && rowHasNumber(rr.t.Rows[i+1]) && rr.underRow(rr.t.Rows[i+1]) {
		under, used = rr.t.Rows[i+1], i+1
	}
	for k := range rr.slots {
		rr.coefficient(r, under, k, first, place, i)
	}
	return used
}

// underRow reports whether a row holds, under the estimates, only numbers
// in parentheses or brackets: their SEs or CIs.
func (rr *regressionReader) underRow(r Row) bool {
	any := false
	for _, s := range rr.slots {
		v := cell(r, s.est)
		if v == "" {
			continue
		}
		if !enclosed(v) {
			return false
		}
		any = true
	}
	return any
}

// enclosed reports whether a cell is wholly in parentheses or brackets.
func enclosed(v string) bool {
	v = strings.TrimRight(strings.TrimSpace(v), "*†‡§")
	return len(v) >= 2 && (v[0] == '(' && v[len(v)-1] == ')' || v[0] == '[' && v[len(v)-1] == ']')
}

// headerAgain reads a row that heads the rows below it (stacked models,
// each with its own header row): it replaces the columns when at least one
// estimate column is named.
func (rr *regressionReader) headerAgain(r Row) bool {
	cols := columnsOf([]Row{r}, 0, 1, len(rr.cols))
	slots := slotsOf(cols)
	if len(slots) == 0 {
		return false
	}
	model := rr.section
	if model == "" || !modelHeading.MatchString(model) {
		model = fmt.Sprintf("%s, part %d", rr.name, len(rr.slots)+1)
	}
	rr.cols, rr.slots = cols, slots
	rr.models, rr.groups = make([]string, len(slots)), make([]string, len(slots))
	for k := range slots {
		rr.models[k] = model
	}
	return true
}

// onlyFirst reports whether only the first cell of a row holds text.
func onlyFirst(r Row) bool {
	for j := 1; j < len(r.Cells); j++ {
		if r.Cells[j].Text != "" {
			return false
		}
	}
	return true
}

// rowText is a row's cells joined, for a to confirm line.
func rowText(r Row) string {
	var s []string
	for _, c := range r.Cells {
		s = append(s, c.Text)
	}
	return strings.Join(s, " | ")
}

// nRows reads the n rows of the body before its coefficients, since a
// table prints each model's n below them.
func (rr *regressionReader) nRows(h int) {
	for _, r := range rr.t.Rows[h:] {
		if first := cell(r, 0); nRow.MatchString(fold(first)) {
			rr.nRow(r, fmt.Sprintf("%s, row %q", rr.name, first))
		}
	}
}

// nRow sets each model's n from an n row.
func (rr *regressionReader) nRow(r Row, place string) {
	for k := range rr.slots {
		if v := cell(r, rr.slots[k].est); v != "" && !isDash(v) {
			rr.slots[k].n, rr.slots[k].nPlace = v, fmt.Sprintf("%s, column %q", place, rr.cols[rr.slots[k].est].head)
		}
	}
}

// unreadColumns lists the columns whose numbers are not read: a Wald
// statistic, a column the header does not name as anything read, and a
// column before the first estimate column.
func (rr *regressionReader) unreadColumns() {
	used := map[int]bool{}
	for _, s := range rr.slots {
		for _, j := range []int{s.est, s.se, s.stat, s.p, s.ci, s.lo, s.hi} {
			used[j] = true
		}
	}
	for j := 1; j < len(rr.cols); j++ {
		if used[j] || rr.cols[j].head == "" {
			continue
		}
		reason := "a column not read: its header names nothing the reader takes (B, SE, β, t, p, CI, OR, HR, RR)"
		if rr.cols[j].role == roleWald {
			reason = "a Wald column, not read: its statistic is the square of z, which the p column or the CI gives"
		}
		rr.f.confirm(fmt.Sprintf("%s, column %q", rr.name, rr.cols[j].head), reason, "")
	}
}
