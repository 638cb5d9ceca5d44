package audit

import (
	"math"
	"strconv"
)

// Outcomes of a claim, as defined in the output contract.
const (
	Consistent    = "consistent"
	Unsupported   = "unsupported"
	Missed        = "missed"
	Reversed      = "reversed"
	Indeterminate = "indeterminate"
	Conflict      = "conflict"
	Incomplete    = "incomplete"
)

// Outcomes lists every outcome in the order summaries show them.
var Outcomes = []string{Consistent, Unsupported, Missed, Reversed, Indeterminate, Conflict, Incomplete}

// Relations between the two estimates of a claim.
const (
	Independent = "independent"
	SameModel   = "same-model"
	SameSample  = "same-sample"
)

// Number is a float64 that encodes NaN and ±Inf as JSON null, since the
// report must say "not known" rather than fail.
type Number float64

// MarshalJSON writes the number, or null when it is not finite.
func (n Number) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// Known reports whether the number is finite.
func (n Number) Known() bool { return !math.IsNaN(float64(n)) && !math.IsInf(float64(n), 0) }

var nan = Number(math.NaN())

// Side is one of the two coefficients of a claim, as the report shows it.
type Side struct {
	Label    string
	Estimate Number
	SE       Number
	SEFrom   string
}

// OverlapResult is the confidence-interval overlap of the two estimates.
type OverlapResult struct {
	Proportion Number
	ImpliedP   Number
	// marginRatio is the larger facing margin of error over the smaller.
	marginRatio float64
}

// Alternative is a second method's result for the same comparison.
type Alternative struct {
	Method    string
	Statistic Number
	P         Number
}

// ClaimResult is the audit of one claims row. Package report writes it in
// every format; the JSON contract's names are report's jsonClaim.
type ClaimResult struct {
	Study string
	Claim string
	Row   int
	// Index is the claim's place among the input's claims rows, from 0.
	Index        int
	First        Side
	Second       Side
	Relation     string
	Method       string
	Difference   Number
	DifferenceSE Number
	DifferenceCI [2]Number
	Statistic    Number
	DF           Number
	P            Number
	PRange       [2]Number
	Published    string
	Recomputed   string
	Outcome      string
	Notes        []string
	Overlap      *OverlapResult
	// TippingCorr holds the sampling correlation of the two estimates at
	// which the verdict flips, for a claim indeterminate because that
	// correlation was not printed.
	TippingCorr  []Number
	Alternatives []Alternative

	// Alpha is the claim's significance level; Basis how the paper reached
	// its verdict; Measure the coefficients' measure. Shown in tables and CSV.
	Alpha   float64
	Basis   string
	Measure string
	// Scale is the scale the difference is on ("log" for ratio measures).
	Scale string
	// PoolEstimate and PoolSE are the difference and its SE on the scale
	// claims are pooled on (PoolScale): the analysis scale for coefficients
	// (log for ratio measures), Fisher's z for correlations. NaN when the
	// claim's difference has no SE (an unknown covariance, or incomplete).
	PoolEstimate, PoolSE Number
	PoolScale            string
	// AdjustedP holds the claim's p adjusted within its study; nil when the
	// claim has no p.
	AdjustedP *AdjustedPValues
	// Unreadable is true when the claims row itself could not be read.
	Unreadable bool
	// Topic is the claim's topic; claims sharing one are pooled.
	Topic string
	// ExtraNames and ExtraValues are the claims row's unknown columns,
	// passed through to the CSV output.
	ExtraNames  []string
	ExtraValues []string

	// dec is what the outcome is decided from, once the multiplicity
	// adjustment is known, when decided (held by value: it is set for
	// nearly every claim); conflict forces the outcome conflict.
	dec      decision
	decided  bool
	conflict bool
	// tip is where the verdict of a claim tested over every admissible
	// correlation turns, when it does (hasTip).
	tip    tipping
	hasTip bool
	// reflected is set when a claim about magnitude compares estimates of
	// opposite sign: the second is tested with its sign turned.
	reflected bool
	// family is the number of claims the multiplicity adjustment ran over.
	family int
	// decimals is how many decimals the claim's estimates are shown with
	// (DisplayDecimals of the coefficients' printed numbers); 0 when the
	// coefficients were not found.
	decimals int
}

// AdjustedPValues are a claim's p adjusted for multiplicity over the claims
// of its study: Holm's step-down (Holm 1979) and Benjamini–Hochberg's
// step-up (Benjamini & Hochberg 1995).
type AdjustedPValues struct {
	BH   Number
	Holm Number
}

// By returns the p adjusted by method (AdjustHolm or AdjustBH).
func (a *AdjustedPValues) By(method string) (Number, bool) {
	switch {
	case a == nil:
		return nan, false
	case method == AdjustHolm:
		return a.Holm, true
	case method == AdjustBH:
		return a.BH, true
	}
	return nan, false
}

// Problem is a problem with the input, placed by file, sheet, row and
// column. File is the base name of the input file the row stands in (an
// article of a folder, a workbook), "" when the problem is not of a row.
type Problem struct {
	File    string `json:"file,omitempty"`
	Sheet   string `json:"sheet"`
	Row     int    `json:"row"`
	Column  string `json:"column"`
	Message string `json:"message"`
}

// Summary counts the claims and each outcome.
type Summary struct {
	Claims int
	Counts map[string]int
}

// Report is the audit of one input.
type Report struct {
	Source   string        `json:"-"`
	Alpha    float64       `json:"alpha"`
	Summary  Summary       `json:"summary"`
	Claims   []ClaimResult `json:"claims"`
	Problems []Problem     `json:"problems"`
	Cautions []string      `json:"-"`
}
