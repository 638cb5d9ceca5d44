package extract

import (
	"fmt"
	"io"
	"strings"
)

// Columns of a paired CSV: the claim-level ones, those both sides may share,
// and those of each side, written with the prefix "first_" or "second_".
var (
	pairedClaimColumns  = []string{"study", "claim", "published", "published_p", "basis", "alpha", "estimate_corr", "topic"}
	pairedSharedColumns = []string{"measure", "group", "model", "outcome"}
	pairedSideColumns   = []string{"label", "measure", "group", "model", "outcome", "predictor", "estimate",
		"ci_low", "ci_high", "ci", "ci_level", "se", "stat", "p", "df", "n"}
)

// pairedKnown is the set of canonical column names of a paired CSV.
var pairedKnown = func() map[string]bool {
	m := nameSet(pairedClaimColumns, pairedSharedColumns)
	for _, side := range []string{"first_", "second_"} {
		for _, c := range pairedSideColumns {
			m[side+c] = true
		}
	}
	return m
}()

// PairedClaim is one row of a paired CSV: a claim and its two coefficients.
type PairedClaim struct {
	Claim         Claim
	First, Second Coefficient
}

// PairedReader streams a paired CSV, one claim per row with both
// coefficients inline, for files too large to hold (a million claims).
// What Next returns is the caller's alone: its strings never change and its
// slices (Problems, Extra) belong to no other claim and are never written
// by the reader again, so claims may be handed to other goroutines while
// the reader goes on. Within a row, the two coefficients' Extra is the
// claim's (one set of unknown columns per row).
//
// The coefficients' labels are "<claim>/<label>", where label is the
// first_label (second_label) cell or, when blank, "first" ("second"); so
// claim c2 yields coefficients "c2/first" and "c2/second", unique within the
// study as long as the claim keys are. A side takes measure, group, model
// and outcome from its own column (first_measure), or from the shared one
// (measure) when its own is blank. The study is the claim's.
//
// Row problems stay with the row: the claim's in Claim.Problems, each
// side's in its Coefficient's Problems. Duplicate claim keys are not
// detected while streaming (that needs every key in memory); Read does it.
type PairedReader struct {
	src           *csvSource
	name          string
	cols          *columns
	claim         claimColumns
	first, second coefficientColumns
	row           sheetRow
	err           error
}

// NewPairedReader reads the header of a paired CSV from r; name is the file
// name used in positions. It fails when r has no header row, when the
// header has no first_ or second_ column (not a paired CSV:
// ErrUnsupportedInput), or when the input is beyond the CSV limits. Missing
// required columns (study, claim, published, first_estimate,
// second_estimate) are reported by Problems, and every row then carries a
// problem too.
func NewPairedReader(r io.Reader, name string) (*PairedReader, error) {
	src, err := newCSVSource(r, name, nil)
	if err != nil {
		return nil, err
	}
	p := &PairedReader{src: src, name: name}
	for {
		err := src.Next(&p.row)
		if err == io.EOF {
			return nil, fmt.Errorf("%s has no header row: %w", name, ErrMissingColumn)
		}
		if err != nil {
			return nil, err
		}
		if !p.row.blank() {
			break
		}
	}
	p.cols = newColumns(&p.row, csvPosition(name), pairedKnown)
	paired := false
	for k := range p.cols.index {
		if strings.HasPrefix(k, "first_") || strings.HasPrefix(k, "second_") {
			paired = true
			break
		}
	}
	if !paired {
		return nil, fmt.Errorf("%s is not a paired CSV: its header has no first_… or second_… columns (or give a workbook or a folder of CSV files): %w", name, ErrUnsupportedInput)
	}
	p.cols.require("study", "claim", "published", "first_estimate", "second_estimate")
	p.claim = lookupClaimColumns(p.cols)
	p.first = lookupCoefficientColumns(p.cols, "first_")
	p.second = lookupCoefficientColumns(p.cols, "second_")
	return p, nil
}

// Problems returns the problems of the header (missing or duplicated
// columns).
func (p *PairedReader) Problems() []*CellError { return p.cols.problems }

// Next returns the next claim with its two coefficients, skipping blank
// rows, and io.EOF after the last. Any other error (an input beyond the
// limits, a read error) is returned again by every later call.
func (p *PairedReader) Next() (PairedClaim, error) {
	if p.err != nil {
		return PairedClaim{}, p.err
	}
	for {
		if err := p.src.Next(&p.row); err != nil {
			p.err = err
			return PairedClaim{}, err
		}
		if !p.row.blank() {
			break
		}
	}
	var rr rowReading
	rr.start(p.cols, &p.row, csvPosition(p.name))
	pc := PairedClaim{Claim: readClaim(&rr, &p.claim, false)}
	pc.Claim.Extra = rr.extra()
	claimProblems := rr.problems

	rr.problems = nil
	pc.First = readCoefficient(&rr, &p.first)
	rr.problems = nil
	pc.Second = readCoefficient(&rr, &p.second)
	pc.First.Study, pc.Second.Study = pc.Claim.Study, pc.Claim.Study
	pc.First.Extra, pc.Second.Extra = pc.Claim.Extra, pc.Claim.Extra
	pc.First.Label, pc.Second.Label = pairedLabels(pc.Claim.Claim, pc.First.Label, pc.Second.Label)
	pc.Claim.First, pc.Claim.Second = pc.First.Label, pc.Second.Label
	if pc.First.Label == pc.Second.Label {
		rr.problems = claimProblems
		rr.failNamed("second_label", fmt.Errorf("first_label and second_label are both %q: %w", pc.First.Label, ErrDuplicate))
		claimProblems = rr.problems
	}
	pc.Claim.Problems = claimProblems
	return pc, nil
}

// pairedLabels makes the two labels of a claim unique per claim,
// "<claim>/<label>", with "first" and "second" for blank labels.
func pairedLabels(claim, first, second string) (string, string) {
	if first == "" {
		first = "first"
	}
	if second == "" {
		second = "second"
	}
	return claim + "/" + first, claim + "/" + second
}

// readPairedFile reads a whole paired CSV into an Input, checking claim
// keys for duplicates.
func readPairedFile(path string) (*Input, error) {
	pr, f, err := openPairedReader(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	in := &Input{Source: path, Problems: pr.Problems()}
	for {
		pc, err := pr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		in.Claims = append(in.Claims, pc.Claim)
		in.Coefficients = append(in.Coefficients, pc.First, pc.Second)
	}
	if len(in.Claims) == 0 {
		in.Problems = append(in.Problems, &CellError{Position: csvPosition(path),
			Err: fmt.Errorf("the file has a header but no claims: %w", ErrMissingValue)})
	}
	make(duplicateClaims, len(in.Claims)).checkPaired(in.Claims, in.Coefficients, nil)
	return in, nil
}
