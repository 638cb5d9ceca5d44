package audit

import (
	"errors"
	"fmt"
	"math"
	"strings"

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

// Bootstrap bootstraps the difference between the two compared
// coefficients fitted to data, the table read from the file o.Data (see
// extract.ReadData). Errors name the file and the column.
func Bootstrap(data *extract.DataTable, o BootstrapOptions) (*BootstrapReport, error) {
	if o.Outcome == "" || len(o.Predictors) < 2 {
		return nil, errors.New("an outcome and at least two predictors are needed")
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
