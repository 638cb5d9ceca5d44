package extract

import (
	"fmt"
	"strings"
)

// openSheets opens a workbook or a folder for Open. Every sheet but the
// claims is read whole (a paper prints a few dozen coefficients a study);
// the claims sheet, which can hold a literature, is read twice: once to
// count each study's claims, and once to yield each study as soon as its
// last claims row is read, with its coefficients, correlations and tables.
// Memory then holds the other sheets and the studies whose claims rows are
// still open, not the claims sheet.
func openSheets(s *inputSheets) (*Source, error) {
	in, err := s.read("claims")
	if err != nil {
		s.close()
		return nil, err
	}
	sheet := s.claimsSheet()
	counts, extra, problems, err := countClaims(s, sheet)
	if err != nil {
		s.close()
		return nil, err
	}
	src := &Source{Path: s.path, ClaimColumns: extra, problems: append(in.Problems, problems...), closer: closeFunc(s.close)}
	src.studies = func(yield func(*Study, error) bool) {
		streamClaims(s, sheet, counts, newRowIndex(in), yield)
	}
	return src, nil
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
func countClaims(s *inputSheets, sheet string) (map[string]int, []string, []*CellError, error) {
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
	return counts.totals(), extra, problems, nil
}

// streamClaims is the second pass: it reads the claims rows and yields each
// study when its last row is read (studyAssembler), then the studies that
// have rows on the other sheets but no claims.
func streamClaims(s *inputSheets, sheet string, counts map[string]int, idx *rowIndex, yield func(*Study, error) bool) {
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
	in      *Input
	coefs   map[string][]int  // by study name
	byLabel map[[2]string]int // the first coefficient of a study and label
	corrs   map[string][]int  // by studyKey
	tables  map[string][]int  // by studyKey
	given   map[string]bool   // study names whose coefficients were given
	keyed   map[string]bool   // study keys whose correlations and tables were given
}

func newRowIndex(in *Input) *rowIndex {
	x := &rowIndex{in: in, coefs: map[string][]int{}, byLabel: map[[2]string]int{},
		corrs: map[string][]int{}, tables: map[string][]int{}, given: map[string]bool{}, keyed: map[string]bool{}}
	for i := range in.Coefficients {
		c := &in.Coefficients[i]
		x.coefs[c.Study] = append(x.coefs[c.Study], i)
		if _, dup := x.byLabel[[2]string{c.Study, c.Label}]; !dup {
			x.byLabel[[2]string{c.Study, c.Label}] = i
		}
	}
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
	if !x.given[st.Name] {
		x.given[st.Name] = true
		for _, i := range x.coefs[st.Name] {
			st.Coefficients = append(st.Coefficients, x.in.Coefficients[i])
		}
	} else {
		// A later block of a long study: its coefficients, without their
		// problems, which the first block reported.
		for _, i := range x.coefs[st.Name] {
			st.Borrowed = append(st.Borrowed, x.in.Coefficients[i])
		}
	}
	x.borrow(st)
	k := studyKey(st.Name)
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
// name as "study:label" where no label of their own study matches.
func (x *rowIndex) borrow(st *Study) {
	seen := map[int]bool{}
	for _, cl := range st.Claims {
		for _, label := range []string{cl.First, cl.Second} {
			if _, own := x.byLabel[[2]string{st.Name, label}]; own {
				continue
			}
			s, l, found := strings.Cut(label, ":")
			if !found {
				continue
			}
			k := [2]string{strings.TrimSpace(s), strings.TrimSpace(l)}
			if i, ok := x.byLabel[k]; ok && !seen[i] && k[0] != st.Name {
				seen[i] = true
				st.Borrowed = append(st.Borrowed, x.in.Coefficients[i])
			}
		}
	}
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
	for i := range x.in.Coefficients {
		c := x.in.Coefficients[i]
		if !x.given[c.Study] {
			get(c.Study).Coefficients = append(get(c.Study).Coefficients, c)
		}
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
