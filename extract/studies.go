package extract

import (
	"cmp"
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
// the one place where the form of an input is decided. It fails only as
// Read fails, when nothing can be read.
//
// Studies come in the order in which their last claims row stands: for the
// usual file, whose rows of a study stand together, that is input order.
// Studies that have coefficients, correlations or tables but no claims
// follow. A paired CSV is read twice, once to count each study's claims
// and once to yield each study as soon as its last row is read, so that
// memory holds the studies whose rows are still open, not the file.
func Open(path string) (*Source, error) {
	f, err := formOf(path)
	if err != nil {
		return nil, err
	}
	if f == formPaired {
		return openPaired(path)
	}
	in, err := Read(path)
	if err != nil {
		return nil, err
	}
	return FromInput(in), nil
}

// FromInput makes a Source of an input already in memory (a workbook or a
// folder read whole, or one built by a caller).
func FromInput(in *Input) *Source {
	s := &Source{Path: in.Source, problems: in.Problems}
	s.ClaimColumns = unknownClaimColumns(in.Claims)
	s.studies = func(yield func(*Study, error) bool) {
		for _, st := range groupStudies(in) {
			if !yield(st, nil) {
				return
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

// groupStudies splits an input into its studies, in the order Open states.
func groupStudies(in *Input) []*Study {
	byName := map[string]*Study{}
	var order []*Study
	last := map[string]int{}
	get := func(name string) *Study {
		st := byName[name]
		if st == nil {
			st = &Study{Name: name}
			byName[name] = st
			order = append(order, st)
		}
		return st
	}
	for i := range in.Claims {
		c := in.Claims[i]
		c.Index = i
		get(c.Study).Claims = append(get(c.Study).Claims, c)
		last[c.Study] = i
	}
	coefs := map[[2]string]int{}
	for i := range in.Coefficients {
		c := in.Coefficients[i]
		get(c.Study).Coefficients = append(get(c.Study).Coefficients, c)
		if _, dup := coefs[[2]string{c.Study, c.Label}]; !dup {
			coefs[[2]string{c.Study, c.Label}] = i
		}
	}
	byKey := map[string][]*Study{}
	for _, st := range order {
		byKey[studyKey(st.Name)] = append(byKey[studyKey(st.Name)], st)
	}
	for i := range in.Correlations {
		c := in.Correlations[i]
		sts := byKey[studyKey(c.Study)]
		if len(sts) == 0 {
			st := get(c.Study)
			byKey[studyKey(c.Study)] = []*Study{st}
			sts = byKey[studyKey(c.Study)]
		}
		for _, st := range sts {
			st.Correlations = append(st.Correlations, c)
		}
	}
	for i := range in.Tables {
		t := in.Tables[i]
		sts := byKey[studyKey(t.Study)]
		if len(sts) == 0 {
			st := get(t.Study)
			byKey[studyKey(t.Study)] = []*Study{st}
			sts = byKey[studyKey(t.Study)]
		}
		for k, st := range sts {
			if k > 0 {
				t.Problems = nil // reported once, with the first study
			}
			st.Tables = append(st.Tables, t)
		}
	}
	// A label written "study:label" that is not a label of the claim's own
	// study borrows the other study's coefficient.
	for _, st := range order {
		own := map[string]bool{}
		for _, c := range st.Coefficients {
			own[c.Label] = true
		}
		borrowed := map[[2]string]bool{}
		for _, cl := range st.Claims {
			for _, label := range []string{cl.First, cl.Second} {
				if own[label] {
					continue
				}
				s, l, found := strings.Cut(label, ":")
				if !found {
					continue
				}
				k := [2]string{strings.TrimSpace(s), strings.TrimSpace(l)}
				if i, ok := coefs[k]; ok && !borrowed[k] && k[0] != st.Name {
					borrowed[k] = true
					st.Borrowed = append(st.Borrowed, in.Coefficients[i])
				}
			}
		}
	}
	// Studies with claims, by their last claims row; then the others.
	var with, without []*Study
	for _, st := range order {
		if len(st.Claims) > 0 {
			with = append(with, st)
		} else {
			without = append(without, st)
		}
	}
	slices.SortStableFunc(with, func(a, b *Study) int { return cmp.Compare(last[a.Name], last[b.Name]) })
	var out []*Study
	for _, st := range append(with, without...) {
		out = append(out, splitFamilies(st)...)
	}
	return out
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
		counts[study]++
	}
	return counts, slices.Clone(pr.cols.extraNames), pr.Problems(), nil
}

// nextStudy skips to the next non-blank row and returns its study, as Next
// would read it.
func (p *PairedReader) nextStudy() (string, error) {
	for {
		if err := p.src.Next(&p.row); err != nil {
			return "", err
		}
		if !p.row.blank() {
			break
		}
	}
	p.rr.start(p.cols, &p.row, Position{File: p.name})
	return p.rr.text(p.claim.study), nil
}
