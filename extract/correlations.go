package extract

import (
	"fmt"
	"math"
)

// readCorrelationSheet reads the long correlations sheet.
func readCorrelationSheet(src rowSource, pos Position) ([]Correlation, []*CellError, error) {
	var out []Correlation
	var rr rowReading
	started := false
	var study, group, a, b, rc, n, sd, mean int
	cols, err := readSheet(src, pos, nameSet(correlationColumnNames), func(cols *columns, row *sheetRow) bool {
		if !started {
			started = true
			cols.require("study", "var_a", "var_b")
			study, group, a, b = cols.col("study"), cols.col("group"), cols.col("var_a"), cols.col("var_b")
			rc, n, sd, mean = cols.col("r"), cols.col("n"), cols.col("sd"), cols.col("mean")
		}
		rr.start(cols, row, pos)
		c := Correlation{Position: rr.pos}
		c.Study = rr.requiredText(study, "study")
		c.Group = rr.text(group)
		c.VarA = rr.requiredText(a, "var_a")
		c.VarB = rr.requiredText(b, "var_b")
		c.R = rr.number(rc, kindNumber)
		c.N = rr.sampleSize(n)
		c.SD = rr.number(sd, kindLimit)
		c.Mean = rr.number(mean, kindLimit)
		if c.VarA != "" && c.VarA == c.VarB {
			if c.R.Present() && c.R.Value != 1 {
				rr.fail(rc, fmt.Errorf("a variable's correlation with itself is 1, not %s; a row with var_a = var_b gives sd and mean: %w", c.R.Text, ErrOutOfRange))
			}
			if c.SD.Present() && !(c.SD.Value > 0) {
				rr.fail(sd, fmt.Errorf("an SD must be positive (%s): %w", c.SD.Text, ErrOutOfRange))
			}
		} else {
			switch {
			case rc < 0:
				rr.failNamed("r", fmt.Errorf("no \"r\" column in the header: %w", ErrMissingColumn))
			case rr.text(rc) == "":
				rr.fail(rc, fmt.Errorf("r is blank: %w", ErrMissingValue))
			}
			if c.R.Present() && math.Abs(c.R.Value) > 1 {
				rr.fail(rc, fmt.Errorf("a correlation lies between −1 and 1 (%s): %w", c.R.Text, ErrOutOfRange))
			}
			if c.SD.Present() || c.Mean.Present() {
				col := sd
				if !c.SD.Present() {
					col = mean
				}
				rr.fail(col, fmt.Errorf("sd and mean belong on a row with var_a = var_b: %w", ErrUnknownValue))
			}
		}
		c.Problems = rr.problems
		out = append(out, c)
		return true
	})
	problems := sheetProblems(cols, pos, "correlations")
	checkDuplicateCorrelations(out)
	return out, problems, err
}

// checkDuplicateCorrelations flags a pair (in either order) given twice for
// the same study and group.
func checkDuplicateCorrelations(cs []Correlation) {
	type key struct{ study, group, a, b string }
	seen := make(map[key]int, len(cs))
	for i := range cs {
		c := &cs[i]
		a, b := c.VarA, c.VarB
		if a > b {
			a, b = b, a
		}
		k := key{c.Study, c.Group, a, b}
		if j, dup := seen[k]; dup {
			c.Problems = append(c.Problems, &CellError{Position: c.Position,
				Err: fmt.Errorf("%s and %s are given twice for study %q, group %q (first on row %d): %w", c.VarA, c.VarB, c.Study, c.Group, cs[j].Row, ErrDuplicate)})
			continue
		}
		seen[k] = i
	}
}
