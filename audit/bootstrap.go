package audit

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"coefaudit/extract"
	"coefaudit/infer/bootstrap"
	"coefaudit/infer/regress"
)

// BootstrapOptions are the settings of a bootstrap comparison of two
// coefficients fitted to raw data.
type BootstrapOptions struct {
	// Data is the CSV or xlsx file; Sheet the xlsx sheet (first when empty).
	Data, Sheet string
	// Outcome, Predictors and Compare are column names; Compare holds the two
	// predictors whose coefficients are compared (first − second).
	Outcome    string
	Predictors []string
	Compare    [2]string
	// Resamples, Level (a proportion), Seed and Unstandardized as in
	// bootstrap.Options; Workers 0 means every core.
	Resamples      int
	Level          float64
	Seed           uint64
	Unstandardized bool
	Workers        int
	// Progress, if set, is told how many resamples are done.
	Progress func(done, total int)
}

// DefaultBootstrapOptions are the command's defaults.
var DefaultBootstrapOptions = BootstrapOptions{Resamples: bootstrap.DefaultResamples, Level: bootstrap.DefaultLevel, Seed: 1}

// BootstrapReport is the result of a bootstrap comparison, ready to write.
type BootstrapReport struct {
	Options BootstrapOptions
	// Rows is the number of data rows, Dropped those left out for a
	// missing value in a column of the model (listwise deletion).
	Rows, Dropped int
	Result        *bootstrap.Result
}

// Bootstrap reads the data and bootstraps the difference between the two
// compared coefficients. Errors name the file and the column.
func Bootstrap(o BootstrapOptions) (*BootstrapReport, error) {
	if o.Outcome == "" || len(o.Predictors) < 2 {
		return nil, errors.New("an outcome and at least two predictors are needed")
	}
	data, err := extract.ReadData(o.Data, o.Sheet)
	if err != nil {
		return nil, err
	}
	names := append([]string{o.Outcome}, o.Predictors...)
	cmp := [2]int{-1, -1}
	for k, c := range o.Compare {
		for j, p := range o.Predictors {
			if strings.EqualFold(strings.TrimSpace(p), strings.TrimSpace(c)) {
				cmp[k] = j + 1
			}
		}
		if cmp[k] < 0 {
			return nil, fmt.Errorf("--compare %q is not among the predictors %s", c, strings.Join(o.Predictors, ", "))
		}
	}
	cols, dropped, err := modelColumns(data, names)
	if err != nil {
		return nil, err
	}
	preds := make([]int, len(o.Predictors))
	for j := range preds {
		preds[j] = j + 1
	}
	res, err := bootstrap.CompareCoefficients(cols, bootstrap.Options{Outcome: 0, Predictors: preds, Compare: cmp,
		Resamples: o.Resamples, Level: o.Level, Seed: o.Seed, Unstandardized: o.Unstandardized,
		Workers: o.Workers, Progress: o.Progress})
	if err != nil {
		return nil, nameColumn(err, names, o.Data)
	}
	return &BootstrapReport{Options: o, Rows: data.Rows, Dropped: dropped, Result: res}, nil
}

// modelColumns returns the model's columns without copying them when no row
// has a missing value, and with listwise deletion otherwise.
func modelColumns(data *extract.DataTable, names []string) ([][]float64, int, error) {
	cols := make([][]float64, len(names))
	complete := true
	for k, n := range names {
		c, ok := data.Column(n)
		if !ok {
			complete = false
			break
		}
		cols[k] = c
		for _, x := range c {
			if math.IsNaN(x) {
				complete = false
				break
			}
		}
	}
	if complete {
		return cols, 0, nil
	}
	return data.Complete(names)
}

// nameColumn turns a column index in a bootstrap error into its name.
func nameColumn(err error, names []string, file string) error {
	var ce *bootstrap.ColumnError
	if errors.As(err, &ce) && ce.Column >= 0 && ce.Column < len(names) {
		var pe *regress.PredictorError
		what := ce.Err.Error()
		if errors.As(ce.Err, &pe) {
			what = pe.Err.Error()
		}
		return fmt.Errorf("%s, column %q: %s", file, names[ce.Column], what)
	}
	return fmt.Errorf("%s: %w", file, err)
}

// WriteBootstrapTable writes the comparison for the terminal.
func WriteBootstrapTable(w io.Writer, rep *BootstrapReport) error {
	bw := bufio.NewWriter(w)
	res, o := rep.Result, rep.Options
	kind := "standardized"
	if !res.Standardized {
		kind = "unstandardized"
	}
	fmt.Fprintf(bw, "OLS of %s on %s: n = %d (%d rows read, %d dropped for a missing value), R² = %.4f, residual df %d.\n\n",
		o.Outcome, strings.Join(o.Predictors, ", "), res.Fit.N, rep.Rows, rep.Dropped, res.Fit.RSquared, res.Fit.ResidualDF)
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "TERM\tB\tSE\tBETA\t")
	names := append([]string{"(intercept)"}, o.Predictors...)
	for k, b := range res.Fit.Coefficients {
		beta := "-"
		if k > 0 || !res.Fit.Intercept {
			beta = formatNum(res.Fit.Standardized[k-boolInt(res.Fit.Intercept)])
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t\n", names[k], formatNum(b), formatNum(res.Fit.StandardErrors[k]), beta)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	lvl := 100 * res.Level
	fmt.Fprintf(bw, "\nDifference of the %s coefficients, %s − %s: %s (bootstrap SE %s, bias %s; %d of %d resamples usable, seed %d).\n",
		kind, o.Compare[0], o.Compare[1], formatNum(res.Estimate), formatNum(res.BootstrapSE), formatNum(res.BootstrapBias), res.Used, res.Resamples, o.Seed)
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  %g%% percentile interval\t%s to %s\t\n", lvl, formatNum(res.Percentile.Lower), formatNum(res.Percentile.Upper))
	fmt.Fprintf(tw, "  %g%% BC interval\t%s to %s\t\n", lvl, formatNum(res.BC.Lower), formatNum(res.BC.Upper))
	fmt.Fprintf(tw, "  %g%% BCa interval\t%s to %s\t(z0 = %.4f, a = %.4f)\n", lvl, formatNum(res.BCa.Lower), formatNum(res.BCa.Upper), res.BiasCorrection, res.Acceleration)
	fmt.Fprintf(tw, "  bootstrap p (two-sided)\t%s\t(from the BCa interval: %s)\n", formatP(res.P), formatP(res.PBCa))
	if err := tw.Flush(); err != nil {
		return err
	}
	if d := res.Delta; d != nil {
		stat := fmt.Sprintf("z = %.2f", d.Statistic)
		if !math.IsInf(d.DF, 1) {
			stat = fmt.Sprintf("t(%g) = %.2f", d.DF, d.Statistic)
		}
		fmt.Fprintf(bw, "  Beside it, the %s: %s (SE %s), %g%% CI %s to %s, %s, %s.\n", res.DeltaMethod, formatNum(d.Estimate), formatNum(d.SE),
			lvl, formatNum(d.Lower), formatNum(d.Upper), stat, pStatement(d.P))
	}
	for _, iv := range []bootstrap.Interval{res.Percentile, res.BC, res.BCa} {
		if iv.Clamped {
			fmt.Fprintln(bw, "\nAn interval endpoint fell beyond the most extreme replicate: use more resamples.")
			break
		}
	}
	for _, w := range res.Warnings {
		fmt.Fprintf(bw, "Warning: %s\n", w)
	}
	if rep.Dropped > 0 {
		fmt.Fprintf(bw, "Rows with a missing value in a model column were dropped (listwise deletion): unbiased only if the data are missing completely at random.\n")
	}
	return bw.Flush()
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// bootstrapJSON is the JSON form of a bootstrap report.
type bootstrapJSON struct {
	Data           string         `json:"data"`
	Outcome        string         `json:"outcome"`
	Predictors     []string       `json:"predictors"`
	Compare        [2]string      `json:"compare"`
	Standardized   bool           `json:"standardized"`
	Rows           int            `json:"rows"`
	Dropped        int            `json:"dropped"`
	N              int            `json:"n"`
	RSquared       Number         `json:"r_squared"`
	Coefficients   []coefJSON     `json:"coefficients"`
	Difference     Number         `json:"difference"`
	Level          Number         `json:"level"`
	Resamples      int            `json:"resamples"`
	Used           int            `json:"resamples_used"`
	Seed           uint64         `json:"seed"`
	BootstrapSE    Number         `json:"bootstrap_se"`
	BootstrapBias  Number         `json:"bootstrap_bias"`
	Percentile     [2]Number      `json:"percentile_ci"`
	BC             [2]Number      `json:"bc_ci"`
	BCa            [2]Number      `json:"bca_ci"`
	BiasCorrection Number         `json:"z0"`
	Acceleration   Number         `json:"acceleration"`
	P              Number         `json:"p"`
	PBCa           Number         `json:"p_bca"`
	Delta          map[string]any `json:"delta"`
	Warnings       []string       `json:"warnings"`
}

type coefJSON struct {
	Term         string `json:"term"`
	B            Number `json:"b"`
	SE           Number `json:"se"`
	Standardized Number `json:"beta"`
}

// WriteBootstrapJSON writes the comparison as JSON.
func WriteBootstrapJSON(w io.Writer, rep *BootstrapReport) error {
	res, o := rep.Result, rep.Options
	j := bootstrapJSON{Data: o.Data, Outcome: o.Outcome, Predictors: o.Predictors, Compare: o.Compare,
		Standardized: res.Standardized, Rows: rep.Rows, Dropped: rep.Dropped, N: res.Fit.N,
		RSquared: Number(res.Fit.RSquared), Difference: Number(res.Estimate), Level: Number(res.Level),
		Resamples: res.Resamples, Used: res.Used, Seed: o.Seed, BootstrapSE: Number(res.BootstrapSE),
		BootstrapBias:  Number(res.BootstrapBias),
		Percentile:     [2]Number{Number(res.Percentile.Lower), Number(res.Percentile.Upper)},
		BC:             [2]Number{Number(res.BC.Lower), Number(res.BC.Upper)},
		BCa:            [2]Number{Number(res.BCa.Lower), Number(res.BCa.Upper)},
		BiasCorrection: Number(res.BiasCorrection), Acceleration: Number(res.Acceleration),
		P: Number(res.P), PBCa: Number(res.PBCa), Warnings: res.Warnings}
	if j.Warnings == nil {
		j.Warnings = []string{}
	}
	names := append([]string{"(intercept)"}, o.Predictors...)
	for k, b := range res.Fit.Coefficients {
		beta := nan
		if k > 0 || !res.Fit.Intercept {
			beta = Number(res.Fit.Standardized[k-boolInt(res.Fit.Intercept)])
		}
		j.Coefficients = append(j.Coefficients, coefJSON{Term: names[k], B: Number(b), SE: Number(res.Fit.StandardErrors[k]), Standardized: beta})
	}
	if d := res.Delta; d != nil {
		df := Number(d.DF)
		j.Delta = map[string]any{"method": res.DeltaMethod, "difference": Number(d.Estimate), "se": Number(d.SE),
			"statistic": Number(d.Statistic), "df": df, "p": Number(d.P), "ci": [2]Number{Number(d.Lower), Number(d.Upper)}}
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(j)
}
