package extract

import (
	"errors"
	"fmt"
	"path/filepath"
)

// Measure values of the coefficients sheet's measure column.
const (
	MeasureB     = "b"     // regression coefficient
	MeasureBeta  = "beta"  // standardized regression coefficient
	MeasureR     = "r"     // correlation
	MeasureOR    = "or"    // odds ratio, analysed on the log scale
	MeasureRR    = "rr"    // risk ratio, analysed on the log scale
	MeasureHR    = "hr"    // hazard ratio, analysed on the log scale
	MeasureMD    = "md"    // mean difference
	MeasureOther = "other" // anything else on an additive scale
)

// Measures lists the valid measure values in the order the template offers them.
var Measures = []string{MeasureB, MeasureBeta, MeasureR, MeasureOR, MeasureRR, MeasureHR, MeasureMD, MeasureOther}

// IsRatioMeasure reports whether a measure is analysed on the log scale.
func IsRatioMeasure(m string) bool { return m == MeasureOR || m == MeasureRR || m == MeasureHR }

// IsRegressionMeasure reports whether a measure is a regression coefficient
// (unstandardized or standardized), one of a model's listed coefficients.
func IsRegressionMeasure(m string) bool { return m == MeasureB || m == MeasureBeta }

// Published verdicts of the claims sheet's published column. "Larger" is
// signed (the first estimate is above the second); "stronger" is about
// magnitude (|estimate|, and for ratio measures the distance from 1 on the
// log scale).
const (
	PublishedDiffer         = "differ"
	PublishedNoDifference   = "no-difference"
	PublishedFirstLarger    = "first-larger"
	PublishedSecondLarger   = "second-larger"
	PublishedFirstStronger  = "first-stronger"
	PublishedSecondStronger = "second-stronger"
)

// Verdicts lists the valid published values.
var Verdicts = []string{PublishedDiffer, PublishedNoDifference, PublishedFirstLarger, PublishedSecondLarger,
	PublishedFirstStronger, PublishedSecondStronger}

// IsMagnitudeVerdict reports whether a published verdict is about the
// magnitude of the estimates (first-stronger, second-stronger).
func IsMagnitudeVerdict(v string) bool {
	return v == PublishedFirstStronger || v == PublishedSecondStronger
}

// Bases of the claims sheet's basis column: how the paper reached its verdict.
const (
	BasisTest              = "test"
	BasisOverlap           = "overlap"
	BasisSignificanceSplit = "significance-split"
	BasisUnstated          = "unstated"
)

// Bases lists the valid basis values.
var Bases = []string{BasisTest, BasisOverlap, BasisSignificanceSplit, BasisUnstated}

// DefaultCILevel is the confidence level, in percent, assumed when ci_level is blank.
const DefaultCILevel = 95.0

// DefaultAlpha is the significance level assumed when a claim's alpha is blank.
const DefaultAlpha = 0.05

// Position locates a cell or a row in an input. Row is the sheet's own row
// number (header = row 1); Column is the header name as written (for a key
// row of a correlation table, its key, such as "n"), empty for a whole row.
type Position struct {
	File   string
	Sheet  string
	Row    int
	Column string
}

// csvPosition is the position of a CSV file: its Sheet is the file's name,
// so that a problem of a CSV folder or a paired CSV names the file the way
// a workbook's names its sheet.
func csvPosition(path string) Position {
	return Position{File: path, Sheet: filepath.Base(path)}
}

// String writes the position as "file, sheet "x", row 4, column "se"",
// leaving out the parts that are empty, and the sheet when it is the
// file's own name (a CSV).
func (p Position) String() string {
	s := p.File
	add := func(part string) {
		if s != "" {
			s += ", "
		}
		s += part
	}
	if p.Sheet != "" && p.Sheet != filepath.Base(p.File) {
		add(fmt.Sprintf("sheet %q", p.Sheet))
	}
	if p.Row > 0 {
		add(fmt.Sprintf("row %d", p.Row))
	}
	if p.Column != "" {
		add(fmt.Sprintf("column %q", p.Column))
	}
	return s
}

// CellError is a problem with one cell, row or sheet of an input.
type CellError struct {
	Position
	Err error
	// Text is the cell as typed (as displayed, for a numeric cell of a
	// workbook) when the problem is with one cell's content, so that a
	// report can show the cell as it was; "" otherwise.
	Text string
}

// Error implements error.
func (e *CellError) Error() string {
	if e.Position == (Position{}) {
		return e.Err.Error()
	}
	return e.Position.String() + ": " + e.Err.Error()
}

// Unwrap returns the underlying error.
func (e *CellError) Unwrap() error { return e.Err }

// Sentinel errors a caller may need to tell apart.
var (
	// ErrMalformedNumber: a cell that should hold a number holds something else.
	ErrMalformedNumber = errors.New("not a number as printed")
	// ErrMalformedInterval: a ci cell that is not an interval.
	ErrMalformedInterval = errors.New("not a confidence interval")
	// ErrMalformedP: a p cell that is not a p-value.
	ErrMalformedP = errors.New("not a p-value")
	// ErrUnknownValue: a text cell outside its list of allowed values.
	ErrUnknownValue = errors.New("not an allowed value")
	// ErrMissingColumn: a required column is not in the header.
	ErrMissingColumn = errors.New("required column missing")
	// ErrMissingValue: a required cell is blank.
	ErrMissingValue = errors.New("required value missing")
	// ErrDuplicate: a key that must be unique appears twice.
	ErrDuplicate = errors.New("duplicate key")
	// ErrUnsupportedInput: a file or folder of a kind that cannot be read.
	ErrUnsupportedInput = errors.New("unsupported input")
	// ErrInputTooLarge: an input beyond the reader's safety limits.
	ErrInputTooLarge = errors.New("input exceeds the size limits")
	// ErrMissingSheet: a required sheet (or CSV file) is not in the input.
	ErrMissingSheet = errors.New("required sheet missing")
	// ErrOutOfRange: a number outside the values its column admits
	// (alpha, a level, a correlation, n, df, an SE).
	ErrOutOfRange = errors.New("value out of range")
)

// Extra holds the columns a sheet had beyond the known ones, in header
// order, so that they pass through to the output.
type Extra struct {
	Names  []string
	Values []string
}

// Coefficient is one row of the coefficients sheet: one reported estimate.
type Coefficient struct {
	Position // File, Sheet and Row of the row; Column empty

	Study, Label, Measure string
	Outcome, Predictor    string
	Group, Model          string

	Estimate Printed
	CI       Interval
	// CILevel is the confidence level in percent (95 when the cell is blank).
	CILevel float64
	SE      Printed
	// Stat is the printed t or z statistic.
	Stat  Printed
	P     Printed
	DF, N Printed

	Extra Extra
	// Problems lists what was wrong with this row; a row with problems is
	// still returned so that nothing is lost.
	Problems []*CellError
}

// Claim is one row of the claims sheet: one published comparison of two
// coefficients of a study.
type Claim struct {
	Position
	// Index is the claim's place among the input's claims rows, from 0, in
	// input order: reports keep that order whatever order studies are
	// audited in.
	Index int

	Study, Claim  string
	First, Second string
	Published     string
	PublishedP    Printed
	Basis         string
	// Alpha is the claim's significance level (DefaultAlpha when blank).
	Alpha        float64
	EstimateCorr Printed
	Topic        string

	Extra    Extra
	Problems []*CellError
}

// Correlation is one row of the long correlations sheet. A row with
// VarA == VarB gives that variable's SD and mean instead of a correlation.
type Correlation struct {
	Position
	Study, Group, VarA, VarB string
	R, N, SD, Mean           Printed
	Problems                 []*CellError
}

// CorrelationTable is a correlation table laid out as papers print it, from a
// sheet whose name starts with "table ". R is the full symmetric matrix with 1
// on the diagonal, filled from whichever triangle was printed.
type CorrelationTable struct {
	Position // File and Sheet; Row 0
	// Name is the sheet name after "table ".
	Name      string
	Study     string
	Group     string
	Variables []string
	R         [][]Printed
	// N, Mean and SD per variable, where printed (Absent otherwise).
	N, Mean, SD []Printed
	Problems    []*CellError
}

// Input is everything read from one input: the rows of every sheet, in
// order, and the problems found at the level of files and sheets.
type Input struct {
	Source       string
	Coefficients []Coefficient
	Claims       []Claim
	Correlations []Correlation
	Tables       []CorrelationTable
	// Problems holds problems that belong to no single row (a missing
	// sheet, a missing column, an unreadable file); row problems stay with
	// their rows.
	Problems []*CellError
}
