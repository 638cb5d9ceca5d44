package extract

import (
	"errors"
	"fmt"
	"io"
	"iter"
	"os"
	"strings"
)

// MaxFamily is the most claims of one study that are audited together, as
// one family of the multiplicity adjustment. No paper prints that many
// comparisons; a file whose study column was left constant does, and
// holding it whole would make memory grow with the file. A longer study is
// yielded in blocks of this many claims, and each block after the first
// carries a problem saying so (common practice, no source).
const MaxFamily = 1000

// Study is everything an input printed about one study: its coefficients,
// the claims that compare them, and its correlations and correlation
// tables. A study's claims are one family wherever their rows stand in the
// input.
type Study struct {
	// Name is the study key as written in the claims rows.
	Name string
	// Claims are the study's claims rows, in input order.
	Claims []Claim
	// Coefficients are the study's own coefficients, in input order.
	Coefficients []Coefficient
	// Borrowed are coefficients of other studies that a claim of this one
	// names as "study:label". Their problems belong to their own study.
	Borrowed []Coefficient
	// Correlations and Tables are what the study printed of its samples'
	// correlations, matched by study name (trimmed, case-insensitive).
	Correlations []Correlation
	Tables       []CorrelationTable
	// Problems are the study's problems that belong to no single row (a
	// block of a study too long to audit at once).
	Problems []*CellError
}

// Source is an open input whose studies are read one at a time.
type Source struct {
	// Path is the input as given.
	Path string
	// ClaimColumns are the unknown columns of the claims rows, in header
	// order: they pass through to the reports.
	ClaimColumns []string

	problems []*CellError
	studies  func(yield func(*Study, error) bool)
	closer   io.Closer
	// pieces, for an input whose studies interleave, yields its claims
	// rows in runs of one study (Pieces).
	pieces func(yield func(*Study, error) bool)
	// claimRows and coefficientRows are the rows counted when the input
	// was opened; counted is false when they were not (Rows).
	claimRows, coefficientRows int
	counted                    bool
}

// Open opens an input in any of its forms, chosen by what path is (see
// Read): a workbook, a folder of CSV files, or a single paired CSV. This is
// the one place where the form of an input is decided (formOf). It fails
// only as Read fails, when nothing can be read.
//
// Studies come in the order in which their last claims row stands: for the
// usual file, whose rows of a study stand together, that is input order.
// Studies that have coefficients, correlations or tables but no claims
// follow. The claims are read twice, once to count each study's claims
// rows and once to yield each study as soon as its last row is read: the
// rows of a paired CSV (openPaired), the claims sheet of a workbook or a
// folder, whose other sheets are read whole (openSheets). Memory holds the
// studies whose rows are still open, not the claims: flat for a file whose
// studies' rows stand together, growing with how far they interleave. A
// paired CSV whose studies interleave, the one form without a size limit,
// is read in pieces instead (Interleaved, Pieces), in flat memory.
func Open(path string) (*Source, error) {
	f, err := formOf(path)
	if err != nil {
		return nil, err
	}
	switch f {
	case formPaired:
		return openPaired(path)
	case formFolder:
		s, err := folderSheets(path)
		if err != nil {
			return nil, err
		}
		return openSheets(s)
	}
	s, err := workbookSheets(path)
	if err != nil {
		return nil, err
	}
	return openSheets(s)
}

// FromInput makes a Source of an input already in memory (a workbook or a
// folder read whole, or one built by a caller), whose studies come as Open
// gives them: each study is copied out of the input when its last claims
// row has come, with the rows of the other sheets that belong to it.
func FromInput(in *Input) *Source {
	s := &Source{Path: in.Source, problems: in.Problems,
		claimRows: len(in.Claims), coefficientRows: len(in.Coefficients), counted: true}
	s.ClaimColumns = unknownClaimColumns(in.Claims)
	s.studies = func(yield func(*Study, error) bool) {
		counts := rowCounts{}
		for i := range in.Claims {
			counts.add(in.Claims[i].Study)
		}
		a, idx := newStudyAssembler(counts), newRowIndex(in, newInputCoefficients(in.Coefficients))
		for i := range in.Claims {
			if st := a.add(in.Claims[i]); st != nil && !yield(idx.complete(st), nil) {
				return
			}
		}
		for _, st := range idx.rest() {
			if !yield(st, nil) {
				return
			}
		}
	}
	return s
}

// Rows returns the number of claims rows and of coefficients rows of the
// input, as counted when it was opened (a paired CSV's row carries two
// coefficients), so that a writer that holds at most so many rows can
// refuse an input before it is audited; ok is false when they were not
// counted beforehand (a source of articles, read one at a time).
func (s *Source) Rows() (claims, coefficients int, ok bool) {
	return s.claimRows, s.coefficientRows, s.counted
}

// Studies returns the studies of the input, one at a time. An error ends
// the sequence: the input could not be read on (a read error, an input
// beyond the size limits). It may be ranged over once.
func (s *Source) Studies() iter.Seq2[*Study, error] { return s.studies }

// Interleaved reports whether the input's studies interleave so far that
// Studies would hold them in memory, and Pieces should be read instead.
// Only a paired CSV, the one form without a size limit, says so: the
// first pass finds a study whose rows resume after another study's.
func (s *Source) Interleaved() bool { return s.pieces != nil }

// Pieces returns the claims rows of an input whose studies interleave
// (Interleaved) in input order, as runs of consecutive rows of one study,
// each run a Study of its own with the coefficients its rows carry and at
// most MaxFamily claims. Claim keys are checked for duplicates across the
// whole study, and the run that holds the first claim of a study's second
// or later block of MaxFamily claims carries the problem saying so, as
// Studies would. The claims keep their Index. A caller that wants a
// study's claims to be one family (audit.RunSource) reads the pieces
// twice: once to learn each family's p-values and once to report. Unlike
// Studies, Pieces may be ranged over more than once. It is nil when the
// input does not interleave.
func (s *Source) Pieces() iter.Seq2[*Study, error] { return s.pieces }

// Problems returns the problems of the input that belong to no study (a
// missing sheet or column, a header-only file). It is complete once the
// studies have been read.
func (s *Source) Problems() []*CellError { return s.problems }

// Close releases the input's file.
func (s *Source) Close() error {
	if s.closer == nil {
		return nil
	}
	return s.closer.Close()
}

// unknownClaimColumns lists the unknown columns of claims rows in first-seen order.
func unknownClaimColumns(cs []Claim) []string {
	var out []string
	seen := map[string]bool{}
	for i := range cs {
		for _, n := range cs[i].Extra.Names {
			if !seen[n] {
				seen[n] = true
				out = append(out, n)
			}
		}
	}
	return out
}

// studyKey is how correlations and tables are matched to a study.
func studyKey(s string) string { return strings.ToLower(strings.TrimSpace(s)) }

// openPaired opens a paired CSV: a first pass counts each study's claims
// rows, the second (Studies) yields a study as soon as its last row is read.
// A study whose rows stand together is the only one held; studies whose rows
// interleave are held until their last row, so memory grows with the
// interleaving. A file whose studies interleave is therefore read in pieces
// as well (Pieces), which hold one run of rows at a time.
func openPaired(path string) (*Source, error) {
	counts, interleaved, repeated, extra, headerProblems, err := countPaired(path)
	if err != nil {
		return nil, err
	}
	total := counts.total()
	s := &Source{Path: path, ClaimColumns: extra, problems: headerProblems,
		claimRows: total, coefficientRows: 2 * total, counted: true}
	if total == 0 {
		s.problems = append(s.problems, &CellError{Position: csvPosition(path),
			Err: fmt.Errorf("the file has a header but no claims: %w", ErrMissingValue)})
	}
	s.studies = func(yield func(*Study, error) bool) {
		a := newStudyAssembler(counts) // counts is spent: the sequence is ranged once
		for pc, err := range pairedClaims(path) {
			if err != nil {
				yield(nil, err)
				return
			}
			if st := a.add(pc.Claim, pc.First, pc.Second); st != nil && !yieldPaired(st, yield) {
				return
			}
		}
		for _, st := range a.unfinished() {
			if !yieldPaired(st, yield) {
				return
			}
		}
	}
	if interleaved {
		long := counts.long() // taken now: Studies spends counts
		s.pieces = func(yield func(*Study, error) bool) { pairedPieces(path, long, repeated, yield) }
	}
	return s, nil
}

// pairedPieces yields the rows of the paired CSV at path in runs of one
// study (Source.Pieces). long holds the claims rows of each study longer
// than MaxFamily, from the first pass, and repeated the claim keys that
// may be used twice; both are only read.
func pairedPieces(path string, long map[string]int, repeated *repeatedKeys, yield func(*Study, error) bool) {
	seen := duplicateClaims{}
	read := rowCounts{} // claims rows read so far, by long study
	var run *Study
	index := 0
	flush := func() bool {
		if run == nil {
			return true
		}
		st := run
		run = nil
		// Only the keys that may repeat are checked, and held (in seen).
		seen.checkPaired(st.Claims, st.Coefficients, repeated.may)
		return yield(st, nil)
	}
	for pc, err := range pairedClaims(path) {
		if err != nil {
			yield(nil, err)
			return
		}
		c := pc.Claim
		c.Index = index
		index++
		block := false
		if _, ok := long[c.Study]; ok { // only a long study has blocks
			n := read.add(c.Study) - 1 // the claims of the study before this one
			block = n > 0 && n%MaxFamily == 0
		}
		if run != nil && (run.Name != c.Study || block || len(run.Claims) == MaxFamily) && !flush() {
			return
		}
		if run == nil {
			run = &Study{Name: c.Study}
		}
		if block {
			run.Problems = append(run.Problems, familyProblem(c, long[c.Study]))
		}
		run.Claims = append(run.Claims, c)
		run.Coefficients = append(run.Coefficients, pc.First, pc.Second)
	}
	flush()
}

// pairedClaims reads the paired CSV at path once, a claims row at a time,
// for the passes that yield studies or pieces. An error ends it.
func pairedClaims(path string) iter.Seq2[PairedClaim, error] {
	return func(yield func(PairedClaim, error) bool) {
		pr, f, err := openPairedReader(path)
		if err != nil {
			yield(PairedClaim{}, err)
			return
		}
		defer f.Close()
		for {
			pc, err := pr.Next()
			if errors.Is(err, io.EOF) || !yield(pc, err) || err != nil {
				return
			}
		}
	}
}

// openPairedReader opens the paired CSV at path for one pass; the caller
// closes the file.
func openPairedReader(path string) (*PairedReader, *os.File, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	pr, err := NewPairedReader(f, path)
	if err != nil {
		f.Close()
		return nil, nil, err
	}
	return pr, f, nil
}

// yieldPaired yields a study of a paired CSV, its claim keys checked for
// duplicates within it (duplicateClaims.checkPaired).
func yieldPaired(st *Study, yield func(*Study, error) bool) bool {
	make(duplicateClaims, len(st.Claims)).checkPaired(st.Claims, st.Coefficients, nil)
	return yield(st, nil)
}

// yieldChecked yields a study read as a stream, its claim keys checked for
// duplicates within it (Read checks an input read whole).
func yieldChecked(st *Study, yield func(*Study, error) bool) bool {
	checkDuplicateClaims(st.Claims)
	return yield(st, nil)
}
