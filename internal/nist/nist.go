// Package nist reads the NIST StRD linear-regression reference files
// (Statistical Reference Datasets, NIST Information Technology Laboratory;
// certified values computed in 500-digit arithmetic) for the tests of the
// packages that fit or read regressions. It keeps the data as printed text,
// so that a test can pass it through the project's own readers.
package nist

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
)

// Dataset is what one StRD .dat file holds.
type Dataset struct {
	// Rows are the data lines split into fields as printed ("760."), the
	// response first.
	Rows [][]string
	// First is the index of the first certified parameter: 0 (B0) or 1 for
	// the files without an intercept.
	First int
	// Coef and SE are the certified parameters and their standard
	// deviations; ResidualSD and RSquared the certified residual SD and R².
	Coef, SE             []float64
	ResidualSD, RSquared float64
}

var (
	certifiedLines = regexp.MustCompile(`Certified Values\s*\(lines (\d+) to (\d+)\)`)
	dataLines      = regexp.MustCompile(`Data\s*\(lines (\d+) to (\d+)\)`)
	parameterLine  = regexp.MustCompile(`^\s*B(\d+)\s+(\S+)\s+(\S+)\s*$`)
	residualSDLine = regexp.MustCompile(`^\s*Standard Deviation\s+(\S+)\s*$`)
	rSquaredLine   = regexp.MustCompile(`^\s*R-Squared\s+(\S+)\s*$`)
)

// ReferenceDir walks up from dir to the directory holding go.mod and
// returns ../shared/reference/nist-strd from there, or "" when it does not
// exist (the tests then skip).
func ReferenceDir(dir string) string {
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			ref := filepath.Join(dir, "..", "shared", "reference", "nist-strd")
			if st, err := os.Stat(ref); err == nil && st.IsDir() {
				return ref
			}
			return ""
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return ""
		}
		dir = parent
	}
}

// Read parses a StRD file by the line ranges its header states (Norris has
// a trailing blank line, so the ranges, not the file's end, decide).
func Read(path string) (*Dataset, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var lines []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		lines = append(lines, strings.TrimRight(sc.Text(), "\r"))
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	header := strings.Join(lines[:min(12, len(lines))], "\n")
	rangeOf := func(re *regexp.Regexp) (int, int, error) {
		m := re.FindStringSubmatch(header)
		if m == nil {
			return 0, 0, fmt.Errorf("%s: no %v in the header", path, re)
		}
		a, _ := strconv.Atoi(m[1])
		b, _ := strconv.Atoi(m[2])
		if a < 1 || b > len(lines) || a > b {
			return 0, 0, fmt.Errorf("%s: lines %d to %d are not in the file", path, a, b)
		}
		return a, b, nil
	}
	var d Dataset
	var perr error
	parse := func(s string) float64 {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil && perr == nil {
			perr = fmt.Errorf("%s: %w", path, err)
		}
		return v
	}
	c0, c1, err := rangeOf(certifiedLines)
	if err != nil {
		return nil, err
	}
	for _, line := range lines[c0-1 : c1] {
		if m := parameterLine.FindStringSubmatch(line); m != nil {
			k, _ := strconv.Atoi(m[1])
			if len(d.Coef) == 0 {
				d.First = k
			} else if k != d.First+len(d.Coef) {
				return nil, fmt.Errorf("%s: parameter B%d out of order", path, k)
			}
			d.Coef = append(d.Coef, parse(m[2]))
			d.SE = append(d.SE, parse(m[3]))
		} else if m := residualSDLine.FindStringSubmatch(line); m != nil {
			d.ResidualSD = parse(m[1])
		} else if m := rSquaredLine.FindStringSubmatch(line); m != nil {
			d.RSquared = parse(m[1])
		}
	}
	d0, d1, err := rangeOf(dataLines)
	if err != nil {
		return nil, err
	}
	for _, line := range lines[d0-1 : d1] {
		fields := strings.Fields(line)
		if len(fields) < 2 {
			return nil, fmt.Errorf("%s: data line %q", path, line)
		}
		d.Rows = append(d.Rows, fields)
	}
	return &d, perr
}

// Columns returns the response and the predictor columns as numbers
// (strconv's reading of the printed text).
func (d *Dataset) Columns() (y []float64, x [][]float64, err error) {
	if y, err = d.Column(0); err != nil {
		return nil, nil, err
	}
	for j := 1; j < len(d.Rows[0]); j++ {
		c, err := d.Column(j)
		if err != nil {
			return nil, nil, err
		}
		x = append(x, c)
	}
	return y, x, nil
}

// Compare checks a fit against the certified values at m.MinDigits correct
// significant digits: it lists every value that falls short, and sums up
// the worst digits of each kind.
func (d *Dataset) Compare(m Model, coef, se []float64, residualSD, rSquared float64) (short []string, summary string) {
	if len(coef) != len(d.Coef) || len(se) != len(d.SE) {
		return []string{fmt.Sprintf("%d coefficients, want %d", len(coef), len(d.Coef))}, ""
	}
	worstB, worstSE := 15.0, 15.0
	check := func(what string, got, want float64) float64 {
		lre := LRE(got, want)
		if lre < m.MinDigits {
			short = append(short, fmt.Sprintf("%s = %.15g, want %.15g (LRE %.1f < %.0f)", what, got, want, lre, m.MinDigits))
		}
		return lre
	}
	for j := range d.Coef {
		worstB = math.Min(worstB, check(fmt.Sprintf("B%d", d.First+j), coef[j], d.Coef[j]))
		worstSE = math.Min(worstSE, check(fmt.Sprintf("SE(B%d)", d.First+j), se[j], d.SE[j]))
	}
	lsd := check("residual SD", residualSD, d.ResidualSD)
	lr2 := check("R²", rSquared, d.RSquared)
	return short, fmt.Sprintf("%-8s min LRE: coefficients %.1f, SEs %.1f, residual SD %.1f, R² %.1f", m.Name, worstB, worstSE, lsd, lr2)
}

// Column returns column j of the data as numbers (strconv's reading of the
// printed text).
func (d *Dataset) Column(j int) ([]float64, error) {
	out := make([]float64, len(d.Rows))
	for i, r := range d.Rows {
		v, err := strconv.ParseFloat(r[j], 64)
		if err != nil {
			return nil, err
		}
		out[i] = v
	}
	return out, nil
}

// LRE is the number of correct significant digits,
//
//	LRE = −log10(|est − cert|/|cert|), or −log10|est| when cert = 0,
//
// capped at 15, the digits NIST certifies [1].
//
//	[1] McCullough BD (1998). Assessing the reliability of statistical
//	    software: Part I. The American Statistician 52(4):358–366.
func LRE(est, cert float64) float64 {
	var lre float64
	if cert == 0 {
		lre = -math.Log10(math.Abs(est))
	} else {
		lre = -math.Log10(math.Abs(est-cert) / math.Abs(cert))
	}
	if math.IsNaN(lre) {
		return 0
	}
	return math.Min(lre, 15)
}

// Powers returns x, x², …, x^d as predictor columns.
func Powers(x []float64, d int) [][]float64 {
	cols := make([][]float64, d)
	for k := range cols {
		cols[k] = make([]float64, len(x))
		for i, v := range x {
			p := v
			if k > 0 {
				p = cols[k-1][i] * v
			}
			cols[k][i] = p
		}
	}
	return cols
}

// Model is how a StRD file's certified values were fitted, as its header
// states: a polynomial of Degree in the second column, or (Degree 0) the
// file's columns as they are; NoIntercept for the NoInt files. MinDigits is
// the LRE a fit must reach here: 9, and 6 for the two hardest files
// (common practice, no source).
type Model struct {
	Name        string
	Degree      int
	NoIntercept bool
	MinDigits   float64
}

// Models lists the eleven linear-regression files and their models.
var Models = []Model{
	{"Norris", 1, false, 9},
	{"Pontius", 2, false, 9},
	{"NoInt1", 1, true, 9},
	{"NoInt2", 1, true, 9},
	{"Filip", 10, false, 6},
	{"Longley", 0, false, 9},
	{"Wampler1", 5, false, 9},
	{"Wampler2", 5, false, 9},
	{"Wampler3", 5, false, 9},
	{"Wampler4", 5, false, 9},
	{"Wampler5", 5, false, 6},
}
