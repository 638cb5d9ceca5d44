package extract

import (
	"fmt"
	"strings"
)

// openSheets opens a workbook or a folder for Open. Every sheet but the
// claims is read once, before the claims: the correlations and tables
// whole (a paper prints a few dozen a study), the coefficients held packed
// (heldCoefficients), since they may number twice the claims. The claims
// sheet, which can hold a literature, is read twice: once to count each
// study's claims, and once to yield each study as soon as its last claims
// row is read, with its coefficients, correlations and tables. Memory then
// holds the other sheets and the studies whose claims rows are still open,
// not the claims sheet.
func openSheets(s *inputSheets) (*Source, error) {
	in := &Input{Source: s.path, Problems: s.problems}
	held := &heldCoefficients{}
	for _, k := range s.kinds {
		var err error
		switch k.kind {
		case "claims":
			continue
		case "coefficients":
			held, err = s.holdCoefficients(in, k.name)
		default:
			err = s.readSheetInto(in, k)
		}
		if err != nil {
			s.close()
			return nil, err
		}
	}
	sheet := s.claimsSheet()
	counts, extra, problems, err := countClaims(s, sheet)
	if err != nil {
		s.close()
		return nil, err
	}
	claims := counts.total()
	src := &Source{Path: s.path, ClaimColumns: extra, problems: append(in.Problems, problems...), closer: closeFunc(s.close),
		claimRows: claims, coefficientRows: len(held.rows), counted: true}
	src.studies = func(yield func(*Study, error) bool) {
		// The sequence is ranged once: the counts are spent by the
		// assembler, and the input's other sheets by the index, which goes
		// when the sequence ends. Kept for the writer's end, they took the
		// xlsx report of BenchmarkReadWorkbook100k's workbook past its
		// memory target (/usr/bin/time -v).
		c, idx := counts, newRowIndex(in, held)
		counts, in, held = nil, nil, nil
		streamClaims(s, sheet, c, idx, yield)
	}
	return src, nil
}

// holdCoefficients reads the coefficients sheet into held rows, its
// problems into in.
func (s *inputSheets) holdCoefficients(in *Input, name string) (*heldCoefficients, error) {
	src, err := s.open(name)
	if err != nil {
		return nil, err
	}
	held, problems, err := holdCoefficientSheet(src, s.where(name))
	in.Problems = append(in.Problems, problems...)
	cerr := src.Close()
	if err != nil {
		return nil, err
	}
	if cerr != nil {
		return nil, fmt.Errorf("%s: %w", s.where(name), cerr)
	}
	return held, nil
}

type closeFunc func() error

func (f closeFunc) Close() error { return f() }

// claimRows opens a claims sheet and reads its rows (readClaimRows).
func claimRows(s *inputSheets, sheet string, each func(rr *rowReading, cc *claimColumns) bool) (*columns, error) {
	src, err := s.open(sheet)
	if err != nil {
		return nil, err
	}
	defer src.Close()
	return readClaimRows(src, s.where(sheet), each)
}

// readClaimRows reads the rows of a claims sheet after its header, calling
// each for every row that is not blank until it returns false.
func readClaimRows(src rowSource, pos Position, each func(rr *rowReading, cc *claimColumns) bool) (*columns, error) {
	var (
		cc      claimColumns
		rr      rowReading
		started bool
	)
	return readSheet(src, pos, nameSet(claimColumnNames), func(cols *columns, row *sheetRow) bool {
		if !started {
			started = true
			cols.require(claimRequired...)
			cc = lookupClaimColumns(cols)
		}
		rr.start(cols, row, pos)
		return each(&rr, &cc)
	})
}

// claimRow reads a claims sheet's row whole: the claim, its unknown
// columns and its problems.
func claimRow(rr *rowReading, cc *claimColumns) Claim {
	c := readClaim(rr, cc, true)
	c.Extra = rr.extra()
	c.Problems = rr.problems
	return c
}

// claimRequired are the columns a claims sheet must have.
var claimRequired = []string{"study", "claim", "first", "second", "published"}

// claimSheetProblems are the problems of a claims sheet as a whole, once
// its rows have been read: an empty sheet, missing columns, or a header
// with no claims under it.
func claimSheetProblems(cols *columns, pos Position, rows int) []*CellError {
	problems := sheetProblems(cols, pos, "claims")
	if cols != nil && rows == 0 {
		cols.require(claimRequired...)
		problems = append(cols.problems, &CellError{Position: pos, Err: fmt.Errorf("the claims sheet has a header but no claims: %w", ErrMissingValue)})
	}
	return problems
}

// countClaims is the first pass over the claims sheet: the claims rows of
// each study, the claims' unknown columns and the sheet's problems.
func countClaims(s *inputSheets, sheet string) (rowCounts, []string, []*CellError, error) {
	counts := rowCounts{}
	rows := 0
	cols, err := claimRows(s, sheet, func(rr *rowReading, cc *claimColumns) bool {
		counts.add(rr.text(cc.study))
		rows++
		return true
	})
	if err != nil {
		return nil, nil, nil, err
	}
	var extra []string
	if cols != nil {
		extra = append(extra, cols.extraNames...)
	}
	problems := claimSheetProblems(cols, s.where(sheet), rows)
	return counts, extra, problems, nil
}

// streamClaims is the second pass: it reads the claims rows and yields each
// study when its last row is read (studyAssembler), then the studies that
// have rows on the other sheets but no claims.
func streamClaims(s *inputSheets, sheet string, counts rowCounts, idx *rowIndex, yield func(*Study, error) bool) {
	a := newStudyAssembler(counts)
	stopped := false
	_, err := claimRows(s, sheet, func(rr *rowReading, cc *claimColumns) bool {
		if st := a.add(claimRow(rr, cc)); st != nil {
			stopped = !yieldChecked(idx.complete(st), yield)
		}
		return !stopped
	})
	if stopped {
		return
	}
	if err != nil {
		yield(nil, err)
		return
	}
	for _, st := range a.unfinished() {
		if !yieldChecked(idx.complete(st), yield) {
			return
		}
	}
	for _, st := range idx.rest() {
		if !yield(st, nil) {
			return
		}
	}
}

// rowIndex finds the rows of the other sheets that belong to a study.
type rowIndex struct {
	in     *Input // its correlations and tables
	coefs  coefficientsByStudy
	corrs  map[string][]int // by studyKey
	tables map[string][]int // by studyKey
	// keyed are the study keys whose correlations and tables were given;
	// only those that have any, since there may be as many studies as
	// claims (the coefficients keep their own mark: coefficientsByStudy).
	keyed map[string]bool
	// lenders are the studies whose coefficients other studies' claims
	// have named as "study:label", read once.
	lenders map[string]*lender
}

// inputCoefficients are the coefficients of an input read whole, by study.
type inputCoefficients struct {
	all     []Coefficient
	byStudy map[string][]int
	order   []string
	taken   map[string]bool
}

func newInputCoefficients(cs []Coefficient) *inputCoefficients {
	x := &inputCoefficients{all: cs, byStudy: map[string][]int{}, taken: map[string]bool{}}
	for i := range cs {
		name := cs[i].Study
		if _, seen := x.byStudy[name]; !seen {
			x.order = append(x.order, name)
		}
		x.byStudy[name] = append(x.byStudy[name], i)
	}
	return x
}

func (x *inputCoefficients) of(study string) []Coefficient {
	var out []Coefficient
	for _, i := range x.byStudy[study] {
		out = append(out, x.all[i])
	}
	return out
}

func (x *inputCoefficients) take(study string) ([]Coefficient, bool) {
	before := x.taken[study]
	x.taken[study] = true
	return x.of(study), before
}

func (x *inputCoefficients) untaken() []string {
	var out []string
	for _, name := range x.order {
		if !x.taken[name] {
			out = append(out, name)
		}
	}
	return out
}

// coefficientsByStudy gives rowIndex the coefficients of a study: from an
// input read whole (inputCoefficients) or from rows held packed
// (heldCoefficients).
type coefficientsByStudy interface {
	// of returns the study's coefficients in input order, a copy the
	// caller may keep.
	of(study string) []Coefficient
	// take is of for a study of claims, and reports whether the study's
	// coefficients were taken before (by an earlier block of it).
	take(study string) (cs []Coefficient, before bool)
	// untaken lists the studies whose coefficients were never taken, in
	// the order of their first row.
	untaken() []string
}

// lender is a study whose coefficients other studies borrow, with the
// first coefficient of each label.
type lender struct {
	coefs []Coefficient
	first map[string]int
}

func newRowIndex(in *Input, coefs coefficientsByStudy) *rowIndex {
	x := &rowIndex{in: in, coefs: coefs, corrs: map[string][]int{}, tables: map[string][]int{},
		keyed: map[string]bool{}, lenders: map[string]*lender{}}
	for i := range in.Correlations {
		k := studyKey(in.Correlations[i].Study)
		x.corrs[k] = append(x.corrs[k], i)
	}
	for i := range in.Tables {
		k := studyKey(in.Tables[i].Study)
		x.tables[k] = append(x.tables[k], i)
	}
	return x
}

// complete adds to a study of claims its coefficients, those of other
// studies its claims name as "study:label", and its correlations and
// tables. A row of the other sheets carries its problems with the first
// study it is given to.
func (x *rowIndex) complete(st *Study) *Study {
	own, before := x.coefs.take(st.Name)
	if !before {
		st.Coefficients = append(st.Coefficients, own...)
	} else {
		// A later block of a long study: its coefficients, without their
		// problems, which the first block reported.
		st.Borrowed = append(st.Borrowed, own...)
	}
	x.borrow(st, own)
	if len(x.corrs) == 0 && len(x.tables) == 0 {
		return st
	}
	k := studyKey(st.Name)
	if len(x.corrs[k]) == 0 && len(x.tables[k]) == 0 {
		return st
	}
	first := !x.keyed[k]
	x.keyed[k] = true
	for _, i := range x.corrs[k] {
		c := x.in.Correlations[i]
		if !first {
			c.Problems = nil
		}
		st.Correlations = append(st.Correlations, c)
	}
	for _, i := range x.tables[k] {
		t := x.in.Tables[i]
		if !first {
			t.Problems = nil
		}
		st.Tables = append(st.Tables, t)
	}
	return st
}

// borrow adds the coefficients of other studies that the study's claims
// name as "study:label" where no label of their own study (own) matches:
// the first coefficient of that study and label, once.
func (x *rowIndex) borrow(st *Study, own []Coefficient) {
	var ownLabels map[string]bool
	seen := map[[2]string]bool{}
	for _, cl := range st.Claims {
		for _, label := range []string{cl.First, cl.Second} {
			s, l, found := strings.Cut(label, ":")
			if !found {
				continue
			}
			if ownLabels == nil {
				ownLabels = map[string]bool{}
				for i := range own {
					ownLabels[own[i].Label] = true
				}
			}
			k := [2]string{strings.TrimSpace(s), strings.TrimSpace(l)}
			if ownLabels[label] || k[0] == st.Name || seen[k] {
				continue
			}
			if c, ok := x.lent(k[0], k[1]); ok {
				seen[k] = true
				st.Borrowed = append(st.Borrowed, c)
			}
		}
	}
}

// lent returns the first coefficient of a study with a label, reading the
// study's coefficients the first time another study borrows from it.
func (x *rowIndex) lent(study, label string) (Coefficient, bool) {
	l := x.lenders[study]
	if l == nil {
		cs := x.coefs.of(study)
		if len(cs) == 0 {
			return Coefficient{}, false
		}
		l = &lender{coefs: cs, first: map[string]int{}}
		for i := range cs {
			if _, dup := l.first[cs[i].Label]; !dup {
				l.first[cs[i].Label] = i
			}
		}
		// A copy: the name is cut from a claim's cell.
		x.lenders[strings.Clone(study)] = l
	}
	i, ok := l.first[label]
	if !ok {
		return Coefficient{}, false
	}
	return l.coefs[i], true
}

// rest returns the studies that have rows on the other sheets but no
// claims, in the order of their first such row, so that their problems are
// reported too.
func (x *rowIndex) rest() []*Study {
	byName := map[string]*Study{}
	var order []*Study
	get := func(name string) *Study {
		st := byName[name]
		if st == nil {
			st = &Study{Name: name}
			byName[name] = st
			order = append(order, st)
		}
		return st
	}
	for _, name := range x.coefs.untaken() {
		get(name).Coefficients = append(get(name).Coefficients, x.coefs.of(name)...)
	}
	for i := range x.in.Correlations {
		c := x.in.Correlations[i]
		if !x.keyed[studyKey(c.Study)] {
			get(c.Study).Correlations = append(get(c.Study).Correlations, c)
		}
	}
	for i := range x.in.Tables {
		t := x.in.Tables[i]
		if !x.keyed[studyKey(t.Study)] {
			get(t.Study).Tables = append(get(t.Study).Tables, t)
		}
	}
	return order
}
