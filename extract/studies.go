package extract

import (
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"iter"
	"os"
	"slices"
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
// studies' rows stand together, growing with how far they interleave.
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
// folder read whole, or one built by a caller). It takes the input over: it
// numbers its claims (Index) and reads its rows as the studies are yielded,
// building each study only when its turn comes, so that no more than one
// study is copied at a time.
func FromInput(in *Input) *Source {
	s := &Source{Path: in.Source, problems: in.Problems}
	s.ClaimColumns = unknownClaimColumns(in.Claims)
	s.studies = func(yield func(*Study, error) bool) {
		for _, plan := range planStudies(in) {
			for _, st := range splitFamilies(plan.build(in)) {
				if !yield(st, nil) {
					return
				}
			}
		}
	}
	return s
}

// Studies returns the studies of the input, one at a time. An error ends
// the sequence: the input could not be read on (a read error, an input
// beyond the size limits). It may be ranged over once.
func (s *Source) Studies() iter.Seq2[*Study, error] { return s.studies }

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

// studyPlan lists the rows of an input that make one study, by index.
type studyPlan struct {
	name                                   string
	claims, coefs, borrowed, corrs, tables []int
	last                                   int // index of its last claims row
}

// build copies the study's rows out of the input.
func (p *studyPlan) build(in *Input) *Study {
	st := &Study{Name: p.name}
	for _, i := range p.claims {
		st.Claims = append(st.Claims, in.Claims[i])
	}
	for _, i := range p.coefs {
		st.Coefficients = append(st.Coefficients, in.Coefficients[i])
	}
	for _, i := range p.borrowed {
		st.Borrowed = append(st.Borrowed, in.Coefficients[i])
	}
	for _, i := range p.corrs {
		st.Correlations = append(st.Correlations, in.Correlations[i])
	}
	for _, i := range p.tables {
		t := in.Tables[i]
		if t.owner != p.name {
			t.Problems = nil // reported once, with the first study that has it
		}
		st.Tables = append(st.Tables, t)
	}
	return st
}

// planStudies splits an input into its studies, in the order Open states,
// numbering the claims in input order.
func planStudies(in *Input) []*studyPlan {
	byName := map[string]*studyPlan{}
	var order []*studyPlan
	get := func(name string) *studyPlan {
		p := byName[name]
		if p == nil {
			p = &studyPlan{name: name}
			byName[name] = p
			order = append(order, p)
		}
		return p
	}
	for i := range in.Claims {
		in.Claims[i].Index = i
		p := get(in.Claims[i].Study)
		p.claims = append(p.claims, i)
		p.last = i
	}
	coefs := map[[2]string]int{}
	own := map[[2]string]bool{}
	for i := range in.Coefficients {
		c := &in.Coefficients[i]
		p := get(c.Study)
		p.coefs = append(p.coefs, i)
		k := [2]string{c.Study, c.Label}
		own[k] = true
		if _, dup := coefs[k]; !dup {
			coefs[k] = i
		}
	}
	byKey := map[string][]*studyPlan{}
	for _, p := range order {
		byKey[studyKey(p.name)] = append(byKey[studyKey(p.name)], p)
	}
	matching := func(study string) []*studyPlan {
		ps := byKey[studyKey(study)]
		if len(ps) == 0 {
			ps = []*studyPlan{get(study)}
			byKey[studyKey(study)] = ps
		}
		return ps
	}
	for i := range in.Correlations {
		for _, p := range matching(in.Correlations[i].Study) {
			p.corrs = append(p.corrs, i)
		}
	}
	for i := range in.Tables {
		ps := matching(in.Tables[i].Study)
		in.Tables[i].owner = ps[0].name
		for _, p := range ps {
			p.tables = append(p.tables, i)
		}
	}
	// A label written "study:label" that is not a label of the claim's own
	// study borrows the other study's coefficient.
	for _, p := range order {
		borrowed := map[int]bool{}
		for _, ci := range p.claims {
			cl := &in.Claims[ci]
			for _, label := range []string{cl.First, cl.Second} {
				if own[[2]string{p.name, label}] {
					continue
				}
				s, l, found := strings.Cut(label, ":")
				if !found {
					continue
				}
				k := [2]string{strings.TrimSpace(s), strings.TrimSpace(l)}
				if i, ok := coefs[k]; ok && !borrowed[i] && k[0] != p.name {
					borrowed[i] = true
					p.borrowed = append(p.borrowed, i)
				}
			}
		}
	}
	// Studies with claims, by their last claims row; then the others.
	var with, without []*studyPlan
	for _, p := range order {
		if len(p.claims) > 0 {
			with = append(with, p)
		} else {
			without = append(without, p)
		}
	}
	slices.SortStableFunc(with, func(a, b *studyPlan) int { return cmp.Compare(a.last, b.last) })
	return append(with, without...)
}

// splitFamilies cuts a study of more than MaxFamily claims into blocks of
// MaxFamily claims, each with the study's coefficients and tables.
func splitFamilies(st *Study) []*Study {
	if len(st.Claims) <= MaxFamily {
		return []*Study{st}
	}
	var out []*Study
	for start := 0; start < len(st.Claims); start += MaxFamily {
		end := min(start+MaxFamily, len(st.Claims))
		block := *st
		block.Claims = st.Claims[start:end]
		block.Problems = nil
		if start > 0 {
			block.Coefficients, block.Correlations = nil, nil
			block.Tables = withoutProblems(st.Tables)
			block.Borrowed = append(append([]Coefficient(nil), st.Borrowed...), st.Coefficients...)
			block.Problems = []*CellError{familyProblem(st.Claims[start], len(st.Claims))}
		}
		out = append(out, &block)
	}
	return out
}

func withoutProblems(ts []CorrelationTable) []CorrelationTable {
	out := make([]CorrelationTable, len(ts))
	for i, t := range ts {
		t.Problems = nil
		out[i] = t
	}
	return out
}

func familyProblem(first Claim, total int) *CellError {
	p := first.Position
	p.Column = "study"
	return &CellError{Position: p, Err: fmt.Errorf("study %q has %d claims; its claims from this row on are adjusted for multiplicity as a family of their own, in blocks of %d: %w",
		first.Study, total, MaxFamily, ErrInputTooLarge)}
}

// openPaired opens a paired CSV: a first pass counts each study's claims
// rows, the second (Studies) yields a study as soon as its last row is read.
// A study whose rows stand together is the only one held; studies whose rows
// interleave are held until their last row, so memory grows only with the
// interleaving, never with the length of the file.
func openPaired(path string) (*Source, error) {
	counts, extra, headerProblems, err := countPaired(path)
	if err != nil {
		return nil, err
	}
	s := &Source{Path: path, ClaimColumns: extra, problems: headerProblems}
	total := 0
	for _, n := range counts {
		total += n
	}
	if total == 0 {
		s.problems = append(s.problems, &CellError{Position: Position{File: path},
			Err: fmt.Errorf("the file has a header but no claims: %w", ErrMissingValue)})
	}
	s.studies = func(yield func(*Study, error) bool) {
		f, err := os.Open(path)
		if err != nil {
			yield(nil, err)
			return
		}
		defer f.Close()
		pr, err := NewPairedReader(f, path)
		if err != nil {
			yield(nil, err)
			return
		}
		// counts is spent as rows are read (the sequence is ranged once);
		// long studies keep their totals for the problem of each block.
		long := map[string]int{}
		for k, n := range counts {
			if n > MaxFamily {
				long[k] = n
			}
		}
		open := map[string]*Study{}
		for index := 0; ; index++ {
			pc, err := pr.Next()
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				yield(nil, err)
				return
			}
			pc.Claim.Index = index
			name := pc.Claim.Study
			st := open[name]
			if st == nil {
				// Sized from the first pass: a study's rows are copied once.
				n := min(max(counts[name], 1), MaxFamily)
				st = &Study{Name: name, Claims: make([]Claim, 0, n), Coefficients: make([]Coefficient, 0, 2*n)}
				open[name] = st
			}
			st.Claims = append(st.Claims, pc.Claim)
			st.Coefficients = append(st.Coefficients, pc.First, pc.Second)
			counts[name]--
			if counts[name] > 0 && len(st.Claims) < MaxFamily {
				continue
			}
			delete(open, name)
			if total, ok := long[name]; ok && total-counts[name] > MaxFamily {
				st.Problems = append(st.Problems, familyProblem(st.Claims[0], total))
			}
			checkDuplicateClaims(st.Claims)
			if !yield(st, nil) {
				return
			}
		}
		// Rows the first pass did not see (the file changed between the
		// passes) leave studies open: they are yielded as they are.
		for _, st := range open {
			checkDuplicateClaims(st.Claims)
			if !yield(st, nil) {
				return
			}
		}
	}
	return s, nil
}

// countPaired is the first pass over a paired CSV: the claims rows of each
// study, the claims' unknown columns and the header's problems. It reads
// the study cell of each row and parses nothing else.
func countPaired(path string) (map[string]int, []string, []*CellError, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, nil, err
	}
	defer f.Close()
	pr, err := NewPairedReader(f, path)
	if err != nil {
		return nil, nil, nil, err
	}
	counts := map[string]int{}
	for {
		study, err := pr.nextStudy()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, nil, nil, err
		}
		if _, seen := counts[study]; !seen {
			// A cell is cut from its whole input line, which a key would
			// keep alive for the rest of the run.
			study = strings.Clone(study)
		}
		counts[study]++
	}
	return counts, slices.Clone(pr.cols.extraNames), pr.Problems(), nil
}

// nextStudy returns the study of the next row that has one, as Next would
// read it, without copying or checking the row's cells. A row the CSV
// parser rejects counts under what could be read of it; if the second pass
// reads it otherwise, that study is yielded at the end (see openPaired).
func (p *PairedReader) nextStudy() (string, error) {
	i := p.claim.study
	for {
		rec, err := p.src.r.Read()
		p.src.lim.recordStart = p.src.r.InputOffset() // as fill does
		var pe *csv.ParseError
		switch {
		case err == io.EOF:
			return "", io.EOF
		case err != nil && !errors.As(err, &pe):
			return "", p.src.readError(err, nil, &p.row)
		}
		if i >= 0 && i < len(rec) {
			if study := trimSpace(rec[i]); study != "" {
				return study, nil
			}
		}
		if !recordIsBlank(rec) {
			return "", nil
		}
	}
}

// recordIsBlank reports whether every field of a record is blank, as a blank
// row is.
func recordIsBlank(rec []string) bool {
	for _, f := range rec {
		if trimSpace(f) != "" {
			return false
		}
	}
	return true
}
