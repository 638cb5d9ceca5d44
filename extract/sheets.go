package extract

import (
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Known columns of each sheet, by canonical name.
var (
	coefficientColumnNames = []string{"study", "label", "measure", "outcome", "predictor", "group", "model",
		"estimate", "ci_low", "ci_high", "ci", "ci_level", "se", "stat", "p", "df", "n"}
	claimColumnNames       = []string{"study", "claim", "first", "second", "published", "published_p", "basis", "alpha", "estimate_corr", "topic"}
	correlationColumnNames = []string{"study", "group", "var_a", "var_b", "r", "n", "sd", "mean"}
)

func nameSet(names ...[]string) map[string]bool {
	m := make(map[string]bool)
	for _, list := range names {
		for _, n := range list {
			m[n] = true
		}
	}
	return m
}

// readSheet streams a sheet: the first non-blank row is the header, every
// later non-blank row goes to each, until each returns false. It returns the header (nil for an empty
// sheet) and a fatal error from the source.
func readSheet(src rowSource, pos Position, known map[string]bool, each func(cols *columns, row *sheetRow) bool) (*columns, error) {
	var row sheetRow
	var cols *columns
	for {
		err := src.Next(&row)
		if err == io.EOF {
			return cols, nil
		}
		if err != nil {
			return cols, err
		}
		if row.blank() {
			continue
		}
		if cols == nil {
			cols = newColumns(&row, pos, known)
			continue
		}
		if !each(cols, &row) {
			return cols, nil
		}
	}
}

// coefficientColumns locates the columns of one coefficient: the
// coefficients sheet's own, or one side ("first_", "second_") of a paired
// CSV, where measure, group, model and outcome may also be shared by both
// sides (the shared* fields, −1 when absent).
type coefficientColumns struct {
	prefix                                                   string
	study, label, measure, outcome, predictor, group, model  int
	estimate, ciLow, ciHigh, ci, ciLevel, se, stat, p, df, n int
	sharedMeasure, sharedGroup, sharedModel, sharedOutcome   int
}

func lookupCoefficientColumns(c *columns, prefix string) coefficientColumns {
	col := func(n string) int { return c.col(prefix + n) }
	cc := coefficientColumns{prefix: prefix,
		study: col("study"), label: col("label"), measure: col("measure"), outcome: col("outcome"),
		predictor: col("predictor"), group: col("group"), model: col("model"),
		estimate: col("estimate"), ciLow: col("ci_low"), ciHigh: col("ci_high"), ci: col("ci"),
		ciLevel: col("ci_level"), se: col("se"), stat: col("stat"), p: col("p"), df: col("df"), n: col("n"),
		sharedMeasure: -1, sharedGroup: -1, sharedModel: -1, sharedOutcome: -1}
	if prefix != "" {
		cc.study = c.col("study")
		cc.sharedMeasure, cc.sharedGroup = c.col("measure"), c.col("group")
		cc.sharedModel, cc.sharedOutcome = c.col("model"), c.col("outcome")
	}
	return cc
}

// requiredText returns the text of a required column, recording
// ErrMissingValue for a blank cell and ErrMissingColumn when the header
// lacks the column.
func (r *rowReading) requiredText(i int, name string) string {
	if i < 0 {
		r.failNamed(name, fmt.Errorf("no %q column in the header: %w", name, ErrMissingColumn))
		return ""
	}
	t := r.text(i)
	if t == "" {
		r.fail(i, fmt.Errorf("%s is blank: %w", name, ErrMissingValue))
	}
	return t
}

// textOr returns column i's text, or column j's when i is absent or blank.
func (r *rowReading) textOr(i, j int) string {
	if t := r.text(i); t != "" {
		return t
	}
	return r.text(j)
}

// extra collects the unknown columns of the row. Names and Values share
// one allocation of their own, so that no two rows (which other goroutines
// may hold) share a slice; Names is full, so that appending to it copies.
func (r *rowReading) extra() Extra { return r.extraInto(Extra{}) }

// extraInto is extra writing into the storage of reuse when it has the
// row's number of columns: a streamed reader fills the same rows again.
func (r *rowReading) extraInto(reuse Extra) Extra {
	n := len(r.cols.extra)
	if n == 0 {
		return Extra{}
	}
	names, values := reuse.Names, reuse.Values
	if len(names) != n || len(values) != n {
		both := make([]string, 2*n)
		names, values = both[:n:n], both[n:]
	}
	copy(names, r.cols.extraNames)
	for k, i := range r.cols.extra {
		values[k] = r.text(i)
	}
	return Extra{Names: names, Values: values}
}

// readCoefficient reads one coefficient from the row. It validates what is
// about the input (allowed values, ranges, an interval given twice) and
// leaves what is about the statistics (an estimate outside its own CI) to
// the audit.
func readCoefficient(r *rowReading, cc *coefficientColumns) Coefficient {
	var c Coefficient
	readCoefficientInto(r, cc, &c)
	return c
}

// readCoefficientInto is readCoefficient writing into c, which must be the
// zero Coefficient: a paired row fills its result in place, without copying
// the coefficients.
func readCoefficientInto(r *rowReading, cc *coefficientColumns, c *Coefficient) {
	c.Position = r.pos
	if cc.prefix == "" {
		c.Study = r.requiredText(cc.study, "study")
		c.Label = r.requiredText(cc.label, "label")
	} else {
		// A side of a paired CSV: the study belongs to the claim, and the
		// label is optional (the reader makes it unique per claim).
		c.Study = r.text(cc.study)
		c.Label = r.text(cc.label)
	}
	c.Outcome = r.textOr(cc.outcome, cc.sharedOutcome)
	c.Predictor = r.text(cc.predictor)
	c.Group = r.textOr(cc.group, cc.sharedGroup)
	c.Model = r.textOr(cc.model, cc.sharedModel)

	c.Measure = MeasureOther
	mi, t := cc.measure, r.text(cc.measure)
	if t == "" {
		mi = cc.sharedMeasure
		t = r.text(mi)
	}
	if t != "" {
		if m, err := allowedValue("measure", t); err != nil {
			r.fail(mi, err)
		} else {
			c.Measure = m
		}
	}

	if cc.estimate < 0 {
		r.failNamed(cc.prefix+"estimate", fmt.Errorf("no %q column in the header: %w", cc.prefix+"estimate", ErrMissingColumn))
	} else if r.text(cc.estimate) == "" {
		r.fail(cc.estimate, fmt.Errorf("%s is blank: %w", cc.prefix+"estimate", ErrMissingValue))
	}
	r.numberInto(&c.Estimate, cc.estimate, kindNumber)
	c.CILevel = readInterval(r, cc, &c.CI)
	r.numberInto(&c.SE, cc.se, kindLimit)
	if c.SE.Present() && c.SE.Value < 0 {
		r.fail(cc.se, fmt.Errorf("a standard error cannot be negative (%s): %w", c.SE.Text, ErrOutOfRange))
	}
	r.numberInto(&c.Stat, cc.stat, kindNumber)
	r.numberInto(&c.P, cc.p, kindP)
	r.numberInto(&c.DF, cc.df, kindCount)
	if c.DF.Present() && !(c.DF.Value > 0) {
		// Refused, as a number that does not parse is: not kept.
		r.fail(cc.df, fmt.Errorf("degrees of freedom must be positive (%s): %w", c.DF.Text, ErrOutOfRange))
		c.DF = Printed{Bound: Absent}
	}
	r.sampleSizeInto(&c.N, cc.n)
	checkMeasureRange(r, cc, c)
	if cc.prefix == "" {
		// A paired row's unknown columns are its claim's; the reader
		// gives both sides the claim's Extra.
		c.Extra = r.extra()
	}
	c.Problems = r.problems
}

// sampleSize reads an n column: a positive whole number. Since n cannot be
// fractional, a dot grouping thousands ("1.234", as printed in much of
// Europe) is read as 1234 here, though not in df, whose decimals are real.
func (r *rowReading) sampleSize(i int) Printed {
	var p Printed
	r.sampleSizeInto(&p, i)
	return p
}

// sampleSizeInto is sampleSize writing into dst.
func (r *rowReading) sampleSizeInto(dst *Printed, i int) {
	r.numberInto(dst, i, kindCount)
	if !dst.Present() || (dst.Value > 0 && dst.Value == math.Trunc(dst.Value)) {
		// Nothing for checkSampleSize to read or refuse.
		return
	}
	p, err := checkSampleSize(*dst)
	if err != nil {
		r.fail(i, err)
		p = Printed{Bound: Absent}
	}
	*dst = p
}

// checkSampleSize validates n, reading a dot-grouped count.
func checkSampleSize(p Printed) (Printed, error) {
	if !p.Present() {
		return p, nil
	}
	if p.Value != math.Trunc(p.Value) && grouped(p.Text, '.') {
		if v, err := strconv.ParseFloat(strings.ReplaceAll(p.Text, ".", ""), 64); err == nil {
			p.Value, p.Decimals = v, 0
		}
	}
	if !(p.Value > 0) || p.Value != math.Trunc(p.Value) {
		return p, fmt.Errorf("n must be a positive whole number (%s): %w", p.Text, ErrOutOfRange)
	}
	return p, nil
}

// minCorrelationN is the smallest n of a correlation: the SE of Fisher's z,
// 1/√(n − 3), needs n ≥ 4 [1].
//
//	[1] Fisher RA (1921). On the "probable error" of a coefficient of
//	    correlation deduced from a small sample. Metron 1:3–32 (from memory).
const minCorrelationN = 4

// checkMeasureRange checks what the measure implies: a ratio and its limits
// are positive, a correlation lies in [−1, 1] and has n ≥ 4.
func checkMeasureRange(r *rowReading, cc *coefficientColumns, c *Coefficient) {
	switch {
	case IsRatioMeasure(c.Measure):
		ciCol := intervalColumn(r, cc)
		if c.Estimate.Present() && !(c.Estimate.Value > 0) {
			r.fail(cc.estimate, fmt.Errorf("a ratio measure (%s) must be positive, as printed, not on the log scale (%s): %w", c.Measure, c.Estimate.Text, ErrOutOfRange))
		}
		if c.CI.Present() && !(c.CI.Low.Value > 0) {
			r.fail(ciCol, fmt.Errorf("the interval of a ratio measure (%s) must be positive (lower limit %s): %w", c.Measure, c.CI.Low.Text, ErrOutOfRange))
		}
	case c.Measure == MeasureR:
		ciCol := intervalColumn(r, cc)
		if c.Estimate.Present() && math.Abs(c.Estimate.Value) > 1 {
			r.fail(cc.estimate, fmt.Errorf("a correlation lies between −1 and 1 (%s): %w", c.Estimate.Text, ErrOutOfRange))
		}
		if c.CI.Present() && (c.CI.Low.Value < -1 || c.CI.High.Value > 1) {
			r.fail(ciCol, fmt.Errorf("the interval of a correlation lies within [−1, 1]: %w", ErrOutOfRange))
		}
		if c.N.Present() && c.N.Value < minCorrelationN {
			r.fail(cc.n, fmt.Errorf("a correlation needs n of at least %d, since the SE of Fisher's z is 1/√(n − 3) (n is %s): %w", minCorrelationN, c.N.Text, ErrOutOfRange))
		}
	}
}

// intervalColumn is the column a problem with the interval is reported
// in: ci_low when it was filled, else ci.
func intervalColumn(r *rowReading, cc *coefficientColumns) int {
	if r.text(cc.ciLow) != "" {
		return cc.ciLow
	}
	return cc.ci
}

// readInterval reads ci, ci_low, ci_high and ci_level into iv, which must be
// the zero Interval, and returns the level. When both forms are
// given they must agree; ci_low and ci_high are kept. A level printed in the
// ci cell ("90% CI …") is used when ci_level is blank and must agree with it
// otherwise.
func readInterval(r *rowReading, cc *coefficientColumns, iv *Interval) float64 {
	printedLevel := 0.0
	if r.text(cc.ci) != "" {
		c := r.cell(cc.ci)
		text := c.Text
		if c.Numeric {
			text = c.Display
		}
		v, lv, err := ParseIntervalLevel(text)
		if err != nil {
			r.fail(cc.ci, err)
		} else {
			*iv, printedLevel = v, lv
			iv.OneCell = true
		}
	}
	var low, high Printed
	r.numberInto(&low, cc.ciLow, kindLimit)
	r.numberInto(&high, cc.ciHigh, kindLimit)
	switch {
	case low.Present() && high.Present():
		if low.Value > high.Value {
			r.fail(cc.ciLow, fmt.Errorf("limits reversed: ci_low %s is above ci_high %s: %w", low.Text, high.Text, ErrMalformedInterval))
			break
		}
		if iv.Present() && (iv.Low.Value != low.Value || iv.High.Value != high.Value) {
			r.fail(cc.ci, fmt.Errorf("the interval is given twice and the two disagree (ci %s, ci_low %s, ci_high %s); ci_low and ci_high are used: %w",
				r.text(cc.ci), low.Text, high.Text, ErrDuplicate))
		}
		iv.Low, iv.High, iv.OneCell = low, high, false
	case low.Present():
		r.fail(cc.ciLow, fmt.Errorf("ci_low is given without ci_high: %w", ErrMissingValue))
	case high.Present():
		r.fail(cc.ciHigh, fmt.Errorf("ci_high is given without ci_low: %w", ErrMissingValue))
	}

	level := DefaultCILevel
	if t := r.text(cc.ciLevel); t != "" {
		lv, err := parseLevel(r.cell(cc.ciLevel))
		if err != nil {
			r.fail(cc.ciLevel, err)
		} else {
			level = lv
			if printedLevel != 0 && printedLevel != lv {
				r.fail(cc.ciLevel, fmt.Errorf("ci_level %v%% disagrees with the %v%% printed in the ci cell: %w", lv, printedLevel, ErrDuplicate))
			}
		}
	} else if printedLevel != 0 {
		level = printedLevel
	}
	return level
}

// parseLevel reads a confidence level: "95", "95%", "99.9" in percent, or a
// proportion such as 0.95, which is read as 95%. Levels of 1 (1% or 100%?)
// and anything outside (0, 100) are refused.
func parseLevel(c sheetCell) (float64, error) {
	if !c.Numeric {
		c.Text = strings.TrimSuffix(trimSpace(c.Text), "%")
	}
	p, err := cellNumber(c, kindLimit)
	if err != nil {
		return 0, err
	}
	v := p.Value
	switch {
	case v > 0 && v < 1:
		return v * 100, nil
	case v > 1 && v < 100:
		return v, nil
	}
	return 0, fmt.Errorf("a confidence level is a percent between 0 and 100 (95) or a proportion (0.95), not %s: %w", p.Text, ErrOutOfRange)
}

// coefficientChunk is how many coefficients readCoefficientSheet reads
// into one block before it starts another. A slice grown one row at a time
// allocates some five times its final size as it grows (by a quarter each
// time, past 256 elements), which for 200,000 coefficients of half a KiB
// is half a GB: BenchmarkReadWorkbook100k.
const coefficientChunk = 4096

// readCoefficientSheet reads the coefficients sheet. It returns the rows in
// order, the sheet-level problems, and a fatal error from the source.
func readCoefficientSheet(src rowSource, pos Position) ([]Coefficient, []*CellError, error) {
	var chunks [][]Coefficient
	var rr rowReading
	var cc coefficientColumns
	cols, err := readSheet(src, pos, nameSet(coefficientColumnNames), func(cols *columns, row *sheetRow) bool {
		if chunks == nil {
			cols.require("study", "label", "estimate")
			cc = lookupCoefficientColumns(cols, "")
		}
		if len(chunks) == 0 || len(chunks[len(chunks)-1]) == coefficientChunk {
			chunks = append(chunks, make([]Coefficient, 0, coefficientChunk))
		}
		last := &chunks[len(chunks)-1]
		*last = append(*last, Coefficient{})
		rr.start(cols, row, pos)
		readCoefficientInto(&rr, &cc, &(*last)[len(*last)-1])
		return true
	})
	if cols != nil && chunks == nil {
		cols.require("study", "label", "estimate")
	}
	out := slices.Concat(chunks...)
	problems := sheetProblems(cols, pos, "coefficients")
	checkDuplicateLabels(out)
	return out, problems, err
}

// sheetProblems returns the header's problems, or one problem for a sheet
// with no header at all.
func sheetProblems(cols *columns, pos Position, what string) []*CellError {
	if cols == nil {
		return []*CellError{{Position: pos, Err: fmt.Errorf("the %s sheet is empty: %w", what, ErrMissingValue)}}
	}
	return cols.problems
}

// checkDuplicateLabels flags a label used twice within a study.
func checkDuplicateLabels(cs []Coefficient) {
	type key struct{ study, label string }
	seen := make(map[key]int, len(cs))
	for i := range cs {
		c := &cs[i]
		if c.Label == "" {
			continue
		}
		k := key{c.Study, c.Label}
		if j, dup := seen[k]; dup {
			p := c.Position
			p.Column = "label"
			c.Problems = append(c.Problems, &CellError{Position: p,
				Err: fmt.Errorf("label %q is used twice in study %q (first on row %d): %w", c.Label, c.Study, cs[j].Row, ErrDuplicate)})
			continue
		}
		seen[k] = i
	}
}
