package article

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"coefaudit/extract"
)

// ToConfirmSheet is the name of the sheet listing what the reviewer must
// confirm; the readers of the input contract ignore it.
const ToConfirmSheet = "to confirm"

// ReadAutomatically is the value of the "read" column of every row an
// import writes: the numbers were read by a program, not typed by a
// person, and a report of them says so.
const ReadAutomatically = "automatically"

var (
	coefficientHeader = []string{"study", "label", "measure", "outcome", "predictor", "group", "model", "estimate",
		"ci_low", "ci_high", "ci", "ci_level", "se", "stat", "p", "df", "n", "source", "read"}
	claimHeader   = []string{"study", "claim", "first", "second", "published", "basis", "sentence", "source", "read"}
	confirmHeader = []string{"file", "place", "reason", "text"}
)

// maxSheetName is the longest sheet name a spreadsheet program accepts.
const maxSheetName = 31

// Sheets lays the result out as the sheets of the input contract:
// coefficients and claims with their source and read columns, the "to
// confirm" sheet, which also lists the files that could not be read, and
// one "table …" sheet per correlation table (in that order, the order in
// which ImportWorkbook makes them as it streams).
func (r *Result) Sheets() []extract.TextSheet {
	var sheets []*memorySheet
	l, _ := newSheetLayout(func(name string, header []string) (sheetWriter, error) {
		s := &memorySheet{TextSheet: extract.TextSheet{Name: name}}
		if header != nil {
			s.Rows = [][]string{header}
		}
		sheets = append(sheets, s)
		return s, nil
	})
	for _, f := range r.Articles {
		l.article(f) // a sheet in memory takes every row
	}
	l.finish(r.Failed, true)
	out := make([]extract.TextSheet, len(sheets))
	for i, s := range sheets {
		out[i] = s.TextSheet
	}
	return out
}

// memorySheet is a sheet of Sheets, its rows held.
type memorySheet struct{ extract.TextSheet }

func (m *memorySheet) write(rows [][]string) error {
	m.Rows = append(m.Rows, rows...)
	return nil
}

func (m *memorySheet) close() error { return nil }

// usedSheetNames are the names of the sheets every import writes, which a
// table's sheet may not take.
func usedSheetNames() map[string]bool {
	return map[string]bool{"coefficients": true, "claims": true, ToConfirmSheet: true}
}

// coefficientRows are an article's rows of the coefficients sheet.
func coefficientRows(f *Found) [][]string {
	out := make([][]string, 0, len(f.Coefficients))
	for _, c := range f.Coefficients {
		out = append(out, []string{c.Study, c.Label, c.Measure, c.Outcome, c.Predictor, c.Group, c.Model, c.Estimate,
			c.CILow, c.CIHigh, c.CI, c.CILevel, c.SE, c.Stat, c.P, c.DF, c.N, f.File + ": " + c.Source, ReadAutomatically})
	}
	return out
}

// claimRows are an article's rows of the claims sheet.
func claimRows(f *Found) [][]string {
	out := make([][]string, 0, len(f.Claims))
	for _, c := range f.Claims {
		out = append(out, []string{c.Study, c.Claim, c.First, c.Second, c.Published, c.Basis, c.Sentence,
			f.File + ": " + c.Source, ReadAutomatically})
	}
	return out
}

// tableSheets are an article's "table …" sheets, named apart from used.
func tableSheets(f *Found, used map[string]bool) []extract.TextSheet {
	var out []extract.TextSheet
	for _, t := range f.Tables {
		out = append(out, extract.TextSheet{Name: sheetName(extract.TablePrefix+f.Study+" "+t.Name, used), Rows: t.Rows})
	}
	return out
}

// confirmRows are an article's rows of the to confirm sheet.
func confirmRows(f *Found) [][]string {
	out := make([][]string, 0, len(f.ToConfirm))
	for _, c := range f.ToConfirm {
		out = append(out, []string{c.File, c.Place, c.Reason, c.Text})
	}
	return out
}

// failedRows are the to confirm sheet's rows of the files not read.
func failedRows(failed []*Failure) [][]string {
	out := make([][]string, 0, len(failed))
	for _, fl := range failed {
		out = append(out, []string{fl.File, "", "not read: " + fl.Message, ""})
	}
	return out
}

// sheetName makes a valid, unused sheet name: without the characters a
// sheet name may not hold, cut to maxSheetName runes.
func sheetName(name string, used map[string]bool) string {
	clean := []rune(strings.Map(func(r rune) rune {
		if strings.ContainsRune(`[]:*?/\`, r) {
			return '_'
		}
		return r
	}, name))
	if len(clean) > maxSheetName {
		clean = clean[:maxSheetName]
	}
	cand := strings.TrimRight(string(clean), "' ")
	for k := 2; used[strings.ToLower(cand)]; k++ {
		suffix := fmt.Sprintf(" %d", k)
		b := clean
		if len(b)+len(suffix) > maxSheetName {
			b = b[:maxSheetName-len(suffix)]
		}
		cand = string(b) + suffix
	}
	used[strings.ToLower(cand)] = true
	return cand
}

// CSVName is the file name of a sheet in a folder of CSV files.
func CSVName(sheet string) string { return sheet + ".csv" }

// WriteCSV writes one sheet as CSV (RFC 4180) to w.
func WriteCSV(w io.Writer, s extract.TextSheet) error {
	cw := csv.NewWriter(w)
	if err := cw.WriteAll(s.Rows); err != nil {
		return err
	}
	return cw.Error()
}
