package extract

import (
	"fmt"
	"math"
	"strings"
)

// claimColumns locates the claim-level columns.
type claimColumns struct {
	study, claim, first, second, published, publishedP, basis, alpha, estimateCorr, topic int
}

func lookupClaimColumns(c *columns) claimColumns {
	return claimColumns{study: c.col("study"), claim: c.col("claim"), first: c.col("first"), second: c.col("second"),
		published: c.col("published"), publishedP: c.col("published_p"), basis: c.col("basis"),
		alpha: c.col("alpha"), estimateCorr: c.col("estimate_corr"), topic: c.col("topic")}
}

// readClaim reads the claim-level fields of a row. withLabels is false for a
// paired CSV, whose labels are made by the reader.
func readClaim(r *rowReading, cc *claimColumns, withLabels bool) Claim {
	var c Claim
	readClaimInto(r, cc, withLabels, &c)
	return c
}

// readClaimInto is readClaim writing into c, which must be the zero Claim.
func readClaimInto(r *rowReading, cc *claimColumns, withLabels bool, c *Claim) {
	c.Position = r.pos
	c.Study = r.requiredText(cc.study, "study")
	c.Claim = r.requiredText(cc.claim, "claim")
	if withLabels {
		c.First = r.requiredText(cc.first, "first")
		c.Second = r.requiredText(cc.second, "second")
		if c.First != "" && c.First == c.Second {
			r.fail(cc.second, fmt.Errorf("first and second name the same coefficient %q: %w", c.First, ErrDuplicate))
		}
	}
	if t := r.requiredText(cc.published, "published"); t != "" {
		if v, err := allowedValue("published", t); err != nil {
			r.fail(cc.published, err)
		} else {
			c.Published = v
		}
	}
	r.numberInto(&c.PublishedP, cc.publishedP, kindP)
	c.Basis = BasisUnstated
	if t := r.text(cc.basis); t != "" {
		if v, err := allowedValue("basis", t); err != nil {
			r.fail(cc.basis, err)
		} else {
			c.Basis = v
		}
	}
	c.Alpha = DefaultAlpha
	if t := r.text(cc.alpha); t != "" {
		a, err := parseAlpha(r.cell(cc.alpha))
		if err != nil {
			r.fail(cc.alpha, err)
		} else {
			c.Alpha = a
		}
	}
	r.numberInto(&c.EstimateCorr, cc.estimateCorr, kindLimit)
	if c.EstimateCorr.Present() && math.Abs(c.EstimateCorr.Value) > 1 {
		r.fail(cc.estimateCorr, fmt.Errorf("a correlation lies between −1 and 1 (%s): %w", c.EstimateCorr.Text, ErrOutOfRange))
		c.EstimateCorr = Printed{Bound: Absent}
	}
	c.Topic = r.text(cc.topic)
}

// parseAlpha reads a significance level in (0, 1); "5%" is read as 0.05. A
// malformed alpha leaves the claim at DefaultAlpha with a problem.
func parseAlpha(c sheetCell) (float64, error) {
	scale := 1.0
	if !c.Numeric {
		t := trimSpace(c.Text)
		if strings.HasSuffix(t, "%") {
			scale, c.Text = 0.01, strings.TrimSuffix(t, "%")
		}
	}
	p, err := cellNumber(c, kindLimit)
	if err != nil {
		return 0, err
	}
	a := p.Value * scale
	if !(a > 0 && a < 1) {
		return 0, fmt.Errorf("alpha must lie strictly between 0 and 1, not %s: %w", p.Text, ErrOutOfRange)
	}
	return a, nil
}

// readClaimSheet reads the claims sheet: every non-blank row gives exactly
// one Claim, in order, however malformed.
func readClaimSheet(src rowSource, pos Position) ([]Claim, []*CellError, error) {
	var out []Claim
	cols, err := readClaimRows(src, pos, func(rr *rowReading, cc *claimColumns) bool {
		out = append(out, claimRow(rr, cc))
		return true
	})
	problems := claimSheetProblems(cols, pos, len(out))
	checkDuplicateClaims(out)
	return out, problems, err
}

// checkDuplicateClaims flags a claim key used twice within a study.
func checkDuplicateClaims(cs []Claim) {
	make(duplicateClaims, len(cs)).check(cs, nil)
}

// duplicateClaims remembers the row of each claim key (study, claim) seen,
// so that claims read in several pieces are checked against each other.
type duplicateClaims map[claimKey]int

type claimKey struct{ study, claim string }

// check flags each claim of cs whose key was seen before, in cs or in an
// earlier call, remembers the keys that are new, and returns the indexes
// in cs of the claims flagged. When may is not nil, only the claims whose
// key may be used twice by its word are checked, and their keys alone
// remembered.
func (seen duplicateClaims) check(cs []Claim, may func(study, claim string) bool) []int {
	var dups []int
	for i := range cs {
		c := &cs[i]
		if c.Claim == "" || may != nil && !may(c.Study, c.Claim) {
			continue
		}
		k := claimKey{c.Study, c.Claim}
		if row, dup := seen[k]; dup {
			p := c.Position
			p.Column = "claim"
			c.Problems = append(c.Problems, &CellError{Position: p,
				Err: fmt.Errorf("claim %q appears twice in study %q (first on row %d): %w", c.Claim, c.Study, row, ErrDuplicate)})
			dups = append(dups, i)
			continue
		}
		seen[k] = c.Row
	}
	return dups
}

// checkPaired checks the claim keys of rows of a paired CSV, whose
// coefficients are two a claim in the same order (2i and 2i+1 for claim
// i). A row whose key was used before cannot be read; its coefficients'
// labels ("<claim>/first") get its row added, so that they do not make the
// first row's ambiguous: the first row is audited and the later one is
// not, wherever they stand in the file. may is as for check.
func (seen duplicateClaims) checkPaired(cs []Claim, coefs []Coefficient, may func(study, claim string) bool) {
	if len(coefs) != 2*len(cs) {
		return
	}
	for _, i := range seen.check(cs, may) {
		c := &cs[i]
		suffix := fmt.Sprintf(" (row %d)", c.Row)
		c.First += suffix
		c.Second += suffix
		coefs[2*i].Label, coefs[2*i+1].Label = c.First, c.Second
	}
}
