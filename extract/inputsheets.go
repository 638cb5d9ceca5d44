package extract

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// inputSheets is a workbook's or a folder's sheets by kind, found but not
// yet read: the one description of such an input that Read and Open both
// follow.
type inputSheets struct {
	path string
	// kinds pairs each sheet to read with its kind, in the order they are
	// read: coefficients, claims, correlations, then the tables.
	kinds []sheetKind
	// open opens a sheet as a row source; where places its rows.
	open  func(name string) (rowSource, error)
	where func(name string) Position
	close func() error
	// problems are those of the input as a whole (a missing sheet).
	problems []*CellError
}

// sheetKind is one sheet of an input and what it holds.
type sheetKind struct{ kind, name string }

// claimsSheet returns the name of the claims sheet.
func (s *inputSheets) claimsSheet() string {
	for _, k := range s.kinds {
		if k.kind == "claims" {
			return k.name
		}
	}
	return ""
}

// readSheetInto reads one sheet of the given kind into in.
func (s *inputSheets) readSheetInto(in *Input, k sheetKind) error {
	src, err := s.open(k.name)
	if err != nil {
		return err
	}
	tableSheet := k.name
	if strings.HasSuffix(strings.ToLower(tableSheet), ".csv") {
		tableSheet = tableSheet[:len(tableSheet)-len(".csv")]
	}
	err = readInto(in, src, k.kind, s.where(k.name), tableSheet)
	cerr := src.Close()
	if err != nil {
		return err
	}
	if cerr != nil {
		return fmt.Errorf("%s: %w", s.where(k.name), cerr)
	}
	return nil
}

// read reads every sheet but those of the kinds skipped.
func (s *inputSheets) read(skip string) (*Input, error) {
	in := &Input{Source: s.path, Problems: s.problems}
	for _, k := range s.kinds {
		if k.kind == skip {
			continue
		}
		if err := s.readSheetInto(in, k); err != nil {
			return nil, err
		}
	}
	return in, nil
}

// workbookSheets finds the sheets of a workbook: coefficients, claims,
// correlations (names case-insensitive; the first of a name counts) and any
// number of "table …" sheets; other sheets, such as the template's
// instructions, are ignored.
func workbookSheets(path string) (*inputSheets, error) {
	wb, err := openWorkbook(path)
	if err != nil {
		return nil, err
	}
	found := map[string]string{}
	var tables []string
	sheets := wb.sheets()
	for _, s := range sheets {
		key := strings.ToLower(trimSpace(s))
		switch key {
		case "coefficients", "claims", "correlations":
			if _, dup := found[key]; !dup {
				found[key] = s
			}
		default:
			if _, ok := tableName(s); ok {
				tables = append(tables, s)
			}
		}
	}
	if found["claims"] == "" {
		wb.Close()
		return nil, fmt.Errorf("%s has no claims sheet (its sheets: %s; expected coefficients, claims, optionally correlations and \"table …\"): %w",
			path, strings.Join(quoteAll(sheets), ", "), ErrMissingSheet)
	}
	s := &inputSheets{path: path, close: wb.Close,
		open:  func(name string) (rowSource, error) { return wb.source(name) },
		where: func(name string) Position { return Position{File: path, Sheet: name} }}
	if found["coefficients"] == "" {
		s.problems = append(s.problems, &CellError{Position: Position{File: path},
			Err: fmt.Errorf("the workbook has no coefficients sheet: %w", ErrMissingSheet)})
	}
	s.kinds = kindsOf(found, tables)
	return s, nil
}

// folderSheets finds the CSV files of a folder: coefficients.csv,
// claims.csv, optionally correlations.csv and "table *.csv" files (names
// case-insensitive). Other files are ignored.
func folderSheets(dir string) (*inputSheets, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	found := map[string]string{}
	var tables []string
	for _, e := range entries {
		if e.IsDir() {
			continue
		}
		name := e.Name()
		lower := strings.ToLower(name)
		if !strings.HasSuffix(lower, ".csv") {
			continue
		}
		switch base := strings.TrimSuffix(lower, ".csv"); base {
		case "coefficients", "claims", "correlations":
			found[base] = name
		default:
			if _, ok := tableName(name[:len(name)-4]); ok {
				tables = append(tables, name)
			}
		}
	}
	if found["claims"] == "" {
		return nil, fmt.Errorf("%s: no claims.csv in the folder (expected coefficients.csv, claims.csv, optionally correlations.csv and table *.csv): %w", dir, ErrMissingSheet)
	}
	sort.Strings(tables)
	s := &inputSheets{path: dir, close: func() error { return nil },
		open:  func(name string) (rowSource, error) { return openCSV(filepath.Join(dir, name)) },
		where: func(name string) Position { return csvPosition(filepath.Join(dir, name)) }}
	if found["coefficients"] == "" {
		s.problems = append(s.problems, &CellError{Position: Position{File: dir, Sheet: "coefficients.csv"},
			Err: fmt.Errorf("no coefficients.csv in the folder: %w", ErrMissingSheet)})
	}
	s.kinds = kindsOf(found, tables)
	return s, nil
}

// kindsOf lists the sheets found in the order they are read.
func kindsOf(found map[string]string, tables []string) []sheetKind {
	var out []sheetKind
	for _, kind := range []string{"coefficients", "claims", "correlations"} {
		if found[kind] != "" {
			out = append(out, sheetKind{kind, found[kind]})
		}
	}
	for _, t := range tables {
		out = append(out, sheetKind{"table", t})
	}
	return out
}

// readSheets reads every sheet of a workbook or a folder.
func readSheets(s *inputSheets, err error) (*Input, error) {
	if err != nil {
		return nil, err
	}
	defer s.close()
	return s.read("")
}
