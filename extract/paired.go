package extract

import (
	"fmt"
	"io"
	"os"
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
// coefficients inline, for files too large to hold (a million claims). It
// reuses its buffers: the cells of one row share one allocation, the two
// labels another, and a row allocates nothing else unless it has problems
// or unknown columns. What Next returns is the caller's alone: its strings
// never change and its slices (Problems, Extra) belong to no other claim
// and are never written by the reader again, so claims may be handed to
// other goroutines while the reader goes on. Within a row, the two
// coefficients' Extra is the claim's (one set of unknown columns per row).
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
	rr            rowReading
	err           error
	// labels holds the text of the rows' unique labels.
	labels TextChunks
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
	p.cols = newColumns(&p.row, Position{File: name}, pairedKnown)
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
func (p *PairedReader) Next() (pc PairedClaim, err error) {
	// pc is named so that the claim is built in the result itself rather
	// than built and then copied (it is some 1.3 kB).
	err = p.ReadInto(&pc)
	return pc, err
}

// ReadInto is Next writing the claim into *pc, which it overwrites whole:
// a caller holding many claims saves copying each. The storage of the
// unknown columns (Extra) of the claim *pc held before is reused, so that
// claim's Extra must not be kept. On an error *pc is the zero PairedClaim.
func (p *PairedReader) ReadInto(pc *PairedClaim) error {
	reuse := pc.Claim.Extra
	*pc = PairedClaim{}
	if p.err != nil {
		return p.err
	}
	for {
		if err := p.src.Next(&p.row); err != nil {
			p.err = err
			return err
		}
		if !p.row.blank() {
			break
		}
	}
	rr := &p.rr
	rr.start(p.cols, &p.row, Position{File: p.name})
	readClaimInto(rr, &p.claim, false, &pc.Claim)
	pc.Claim.Extra = rr.extraInto(reuse)
	claimProblems := rr.problems

	rr.problems = nil
	readCoefficientInto(rr, &p.first, &pc.First)
	rr.problems = nil
	readCoefficientInto(rr, &p.second, &pc.Second)
	pc.First.Study, pc.Second.Study = pc.Claim.Study, pc.Claim.Study
	pc.First.Extra, pc.Second.Extra = pc.Claim.Extra, pc.Claim.Extra
	pc.First.Label, pc.Second.Label = pairedLabels(&p.labels, pc.Claim.Claim, pc.First.Label, pc.Second.Label)
	pc.Claim.First, pc.Claim.Second = pc.First.Label, pc.Second.Label
	if pc.First.Label == pc.Second.Label {
		rr.problems = claimProblems
		rr.failNamed("second_label", fmt.Errorf("first_label and second_label are both %q: %w", pc.First.Label, ErrDuplicate))
		claimProblems = rr.problems
	}
	pc.Claim.Problems = claimProblems
	return nil
}

// pairedLabels makes the two labels of a claim unique per claim,
// "<claim>/<label>" with "first" and "second" for blank labels, as the two
// halves of one string that text makes (a nil text allocates it).
func pairedLabels(text *TextChunks, claim, first, second string) (string, string) {
	if first == "" {
		first = "first"
	}
	if second == "" {
		second = "second"
	}
	var buf [128]byte
	b := append(append(append(buf[:0], claim...), '/'), first...)
	n := len(b)
	b = append(append(append(b, claim...), '/'), second...)
	both := text.String(b)
	return both[:n], both[n:]
}

// readPairedFile reads a whole paired CSV into an Input, checking claim
// keys for duplicates.
func readPairedFile(path string) (*Input, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	pr, err := NewPairedReader(f, path)
	if err != nil {
		return nil, err
	}
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
		in.Problems = append(in.Problems, &CellError{Position: Position{File: path},
			Err: fmt.Errorf("the file has a header but no claims: %w", ErrMissingValue)})
	}
	checkDuplicateClaims(in.Claims)
	return in, nil
}
