package extract

import (
	"fmt"
	"os"
	"strings"
)

// Read reads an input in any of its three forms, chosen by what path is:
//
//   - an .xlsx workbook (recognized by its content, not its name) with the
//     sheets coefficients, claims, optionally correlations, and any number
//     of "table …" sheets, names case-insensitive; other sheets (such as the
//     template's instructions) are ignored;
//   - a folder with coefficients.csv, claims.csv, optionally
//     correlations.csv and "table *.csv" files;
//   - a single paired CSV, one claim per row with both coefficients inline
//     (see PairedReader for its columns and how labels are made).
//
// Every record keeps its file, sheet and row. Read fails only when nothing
// can be read: a missing file, a file that is not a workbook or a CSV (a
// 0-byte workbook, a UTF-16 or binary CSV, a sheet whose XML is damaged,
// which would lose the rows after the damage: ErrUnsupportedInput), no claims
// sheet (ErrMissingSheet), or an input beyond the size limits
// (ErrInputTooLarge; see MaxUnzippedBytes and MaxLineBytes). Everything else
// is a problem: of a row, in that record's Problems, or of a sheet (a
// missing coefficients sheet, a missing column, an empty claims sheet), in
// Input.Problems. Every non-blank claims row yields exactly one Claim, in
// order, however malformed; entirely blank rows are skipped.
//
// Header names are matched case-insensitively after trimming, with a space
// or hyphen read as an underscore; unknown columns are kept in Extra. Row
// numbers are the sheet's own (header = row 1; for a CSV, the line on which
// the record starts). The input file is opened read-only and never changed.
//
// References:
//
//	[1] ECMA International (2016). ECMA-376 Office Open XML File Formats,
//	    5th ed., Part 1 (SpreadsheetML) and Part 2 (Open Packaging
//	    Conventions).
//	[2] Shafranovich Y (2005). Common Format and MIME Type for
//	    Comma-Separated Values (CSV) Files. RFC 4180.
func Read(path string) (*Input, error) {
	f, err := formOf(path)
	if err != nil {
		return nil, err
	}
	switch f {
	case formFolder:
		return readSheets(folderSheets(path))
	case formWorkbook:
		return readSheets(workbookSheets(path))
	}
	return readPairedFile(path)
}

// form is the form of an input.
type form int

const (
	formWorkbook form = iota
	formFolder
	formPaired
)

// formOf decides the form of an input, the one place that does: a folder
// is a folder of CSV files; a file is a workbook when it is a zip archive
// (recognized by its content) or named .xlsx, .xlsm or .xls, and a paired
// CSV otherwise.
func formOf(path string) (form, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return 0, err
	}
	if fi.IsDir() {
		return formFolder, nil
	}
	zipLike, err := isZipFile(path)
	if err != nil {
		return 0, err
	}
	lower := strings.ToLower(path)
	if zipLike || strings.HasSuffix(lower, ".xlsx") || strings.HasSuffix(lower, ".xlsm") || strings.HasSuffix(lower, ".xls") {
		return formWorkbook, nil
	}
	return formPaired, nil
}

// readInto reads one sheet of the given kind into in. It returns only a
// fatal error of the source.
func readInto(in *Input, src rowSource, kind string, pos Position, sheetName string) error {
	switch kind {
	case "coefficients":
		cs, probs, err := readCoefficientSheet(src, pos)
		in.Coefficients = appendRows(in.Coefficients, cs)
		in.Problems = append(in.Problems, probs...)
		return err
	case "claims":
		cs, probs, err := readClaimSheet(src, pos)
		in.Claims = appendRows(in.Claims, cs)
		in.Problems = append(in.Problems, probs...)
		return err
	case "correlations":
		cs, probs, err := readCorrelationSheet(src, pos)
		in.Correlations = appendRows(in.Correlations, cs)
		in.Problems = append(in.Problems, probs...)
		return err
	case "table":
		name, _ := tableName(sheetName)
		t, err := readTableSheet(src, pos, name)
		in.Tables = append(in.Tables, t)
		return err
	}
	return fmt.Errorf("unknown sheet kind %q", kind)
}

func quoteAll(names []string) []string {
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = fmt.Sprintf("%q", n)
	}
	return out
}

// appendRows appends a sheet's rows, taking the slice over when there is
// nothing before it: a sheet is read once, and copying its rows would hold
// them twice.
func appendRows[T any](dst, rows []T) []T {
	if len(dst) == 0 {
		return rows
	}
	return append(dst, rows...)
}
