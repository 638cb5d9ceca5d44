package report

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/infer/bootstrap"
)

// WriteBootstrapTable writes the comparison for the terminal. Control
// characters of the column names are shown escaped (EscapeControls).
func WriteBootstrapTable(w io.Writer, rep *audit.BootstrapReport) error {
	bw := bufio.NewWriter(w)
	res, o := rep.Result, rep.Options
	name := EscapeControls
	kind := "standardized"
	if !res.Standardized {
		kind = "unstandardized"
	}
	fmt.Fprintf(bw, "OLS of %s on %s: n = %d (%d rows read, %d dropped for a missing value), R² = %.4f, residual df %d.\n\n",
		name(o.Outcome), name(strings.Join(o.Predictors, ", ")), res.Fit.N, rep.Rows, rep.Dropped, res.Fit.RSquared, res.Fit.ResidualDF)
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "TERM\tB\tSE\tBETA\t")
	names := append([]string{"(intercept)"}, o.Predictors...)
	for k, b := range res.Fit.Coefficients {
		beta := "-"
		if k > 0 || !res.Fit.Intercept {
			beta = audit.FormatNum(res.Fit.Standardized[k-boolInt(res.Fit.Intercept)])
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t\n", name(names[k]), audit.FormatNum(b), audit.FormatNum(res.Fit.StandardErrors[k]), beta)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	lvl := 100 * res.Level
	fmt.Fprintf(bw, "\nDifference of the %s coefficients, %s − %s: %s (bootstrap SE %s, bias %s; %d of %d resamples usable, seed %d).\n",
		kind, name(o.Compare[0]), name(o.Compare[1]), audit.FormatNum(res.Estimate), audit.FormatNum(res.BootstrapSE), audit.FormatNum(res.BootstrapBias), res.Used, res.Resamples, o.Seed)
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  %g%% percentile interval\t%s to %s\t\n", lvl, audit.FormatNum(res.Percentile.Lower), audit.FormatNum(res.Percentile.Upper))
	fmt.Fprintf(tw, "  %g%% BC interval\t%s to %s\t\n", lvl, audit.FormatNum(res.BC.Lower), audit.FormatNum(res.BC.Upper))
	fmt.Fprintf(tw, "  %g%% BCa interval\t%s to %s\t(z0 = %.4f, a = %.4f)\n", lvl, audit.FormatNum(res.BCa.Lower), audit.FormatNum(res.BCa.Upper), res.BiasCorrection, res.Acceleration)
	fmt.Fprintf(tw, "  bootstrap p (two-sided)\t%s\t(from the BCa interval: %s)\n", audit.FormatP(res.P), audit.FormatP(res.PBCa))
	if err := tw.Flush(); err != nil {
		return err
	}
	if d := res.Delta; d != nil {
		stat := fmt.Sprintf("z = %.2f", d.Statistic)
		if !math.IsInf(d.DF, 1) {
			stat = fmt.Sprintf("t(%g) = %.2f", d.DF, d.Statistic)
		}
		fmt.Fprintf(bw, "  Beside it, the %s: %s (SE %s), %g%% CI %s to %s, %s, %s.\n", res.DeltaMethod, audit.FormatNum(d.Estimate), audit.FormatNum(d.SE),
			lvl, audit.FormatNum(d.Lower), audit.FormatNum(d.Upper), stat, audit.PStatement(d.P))
	}
	for _, iv := range []bootstrap.Interval{res.Percentile, res.BC, res.BCa} {
		if iv.Clamped {
			fmt.Fprintln(bw, "\nAn interval endpoint fell beyond the most extreme replicate: use more resamples.")
			break
		}
	}
	for _, w := range res.Warnings {
		fmt.Fprintf(bw, "Warning: %s\n", name(w))
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
	Data           string          `json:"data"`
	Outcome        string          `json:"outcome"`
	Predictors     []string        `json:"predictors"`
	Compare        [2]string       `json:"compare"`
	Standardized   bool            `json:"standardized"`
	Rows           int             `json:"rows"`
	Dropped        int             `json:"dropped"`
	N              int             `json:"n"`
	RSquared       audit.Number    `json:"r_squared"`
	Coefficients   []coefJSON      `json:"coefficients"`
	Difference     audit.Number    `json:"difference"`
	Level          audit.Number    `json:"level"`
	Resamples      int             `json:"resamples"`
	Used           int             `json:"resamples_used"`
	Seed           uint64          `json:"seed"`
	BootstrapSE    audit.Number    `json:"bootstrap_se"`
	BootstrapBias  audit.Number    `json:"bootstrap_bias"`
	Percentile     [2]audit.Number `json:"percentile_ci"`
	BC             [2]audit.Number `json:"bc_ci"`
	BCa            [2]audit.Number `json:"bca_ci"`
	BiasCorrection audit.Number    `json:"z0"`
	Acceleration   audit.Number    `json:"acceleration"`
	P              audit.Number    `json:"p"`
	PBCa           audit.Number    `json:"p_bca"`
	Delta          map[string]any  `json:"delta"`
	Warnings       []string        `json:"warnings"`
}

type coefJSON struct {
	Term         string       `json:"term"`
	B            audit.Number `json:"b"`
	SE           audit.Number `json:"se"`
	Standardized audit.Number `json:"beta"`
}

// WriteBootstrapJSON writes the comparison as JSON.
func WriteBootstrapJSON(w io.Writer, rep *audit.BootstrapReport) error {
	res, o := rep.Result, rep.Options
	j := bootstrapJSON{Data: o.Data, Outcome: o.Outcome, Predictors: o.Predictors, Compare: o.Compare,
		Standardized: res.Standardized, Rows: rep.Rows, Dropped: rep.Dropped, N: res.Fit.N,
		RSquared: audit.Number(res.Fit.RSquared), Difference: audit.Number(res.Estimate), Level: audit.Number(res.Level),
		Resamples: res.Resamples, Used: res.Used, Seed: o.Seed, BootstrapSE: audit.Number(res.BootstrapSE),
		BootstrapBias:  audit.Number(res.BootstrapBias),
		Percentile:     [2]audit.Number{audit.Number(res.Percentile.Lower), audit.Number(res.Percentile.Upper)},
		BC:             [2]audit.Number{audit.Number(res.BC.Lower), audit.Number(res.BC.Upper)},
		BCa:            [2]audit.Number{audit.Number(res.BCa.Lower), audit.Number(res.BCa.Upper)},
		BiasCorrection: audit.Number(res.BiasCorrection), Acceleration: audit.Number(res.Acceleration),
		P: audit.Number(res.P), PBCa: audit.Number(res.PBCa), Warnings: res.Warnings}
	if j.Warnings == nil {
		j.Warnings = []string{}
	}
	names := append([]string{"(intercept)"}, o.Predictors...)
	for k, b := range res.Fit.Coefficients {
		beta := audit.Number(math.NaN())
		if k > 0 || !res.Fit.Intercept {
			beta = audit.Number(res.Fit.Standardized[k-boolInt(res.Fit.Intercept)])
		}
		j.Coefficients = append(j.Coefficients, coefJSON{Term: names[k], B: audit.Number(b), SE: audit.Number(res.Fit.StandardErrors[k]), Standardized: beta})
	}
	if d := res.Delta; d != nil {
		df := audit.Number(d.DF)
		j.Delta = map[string]any{"method": res.DeltaMethod, "difference": audit.Number(d.Estimate), "se": audit.Number(d.SE),
			"statistic": audit.Number(d.Statistic), "df": df, "p": audit.Number(d.P), "ci": [2]audit.Number{audit.Number(d.Lower), audit.Number(d.Upper)}}
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(j)
}

// Bootstrap reads the raw data of o.Data (the sheet o.Sheet of a
// workbook, the first when empty) and bootstraps the difference of the
// two compared coefficients (audit.Bootstrap).
func Bootstrap(o audit.BootstrapOptions) (*audit.BootstrapReport, error) {
	data, err := extract.ReadData(o.Data, o.Sheet)
	if err != nil {
		return nil, err
	}
	return audit.Bootstrap(data, o)
}
