package main

import (
	"bytes"
	"errors"
	"io"
	"path/filepath"
	"slices"
	"testing"

	"coefaudit/audit"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/pool"
	"coefaudit/report"

	"github.com/spf13/cobra"
)

// parseOnly runs a command built with a run function that only records the
// options it is given, so that flag parsing is tested alone: no input is
// read and nothing is written.
func parseOnly[T any](t *testing.T, newCmd func(func(*T) error) *cobra.Command, args ...string) (*T, error) {
	t.Helper()
	var got *T
	cmd := newCmd(func(o *T) error { got = o; return nil })
	cmd.SetArgs(args)
	cmd.SetOut(io.Discard)
	cmd.SetErr(io.Discard)
	cmd.SilenceErrors, cmd.SilenceUsage = true, true
	err := cmd.Execute()
	if err == nil && got == nil {
		t.Fatalf("%q: the run function was not called", args)
	}
	return got, err
}

func TestNewCheckCmd(t *testing.T) {
	tests := []struct {
		name    string
		args    []string
		want    reportOptions
		wantErr bool
	}{
		{"defaults", []string{"in.xlsx"}, reportOptions{format: "table", adjust: audit.AdjustNone, failOn: defaultFailOn}, false},
		{"every flag", []string{"in.csv", "-f", "json", "-o", "out.json", "--adjust", "holm", "--fail-on", "Missed, indeterminate"},
			reportOptions{format: "json", out: "out.json", adjust: audit.AdjustHolm, failOn: []string{audit.Missed, audit.Indeterminate}}, false},
		{"fail on none", []string{"in.csv", "--fail-on", "none"}, reportOptions{format: "table", adjust: audit.AdjustNone}, false},
		{"xlsx to a file", []string{"in.csv", "--format", "xlsx", "--out", "a.xlsx"},
			reportOptions{format: "xlsx", out: "a.xlsx", adjust: audit.AdjustNone, failOn: defaultFailOn}, false},
		{"xlsx to standard output", []string{"in.csv", "--format", "xlsx"}, reportOptions{}, true},
		{"unknown format", []string{"in.csv", "--format", "pdf"}, reportOptions{}, true},
		{"unknown adjustment", []string{"in.csv", "--adjust", "bonferroni"}, reportOptions{}, true},
		{"unknown outcome", []string{"in.csv", "--fail-on", "wrong"}, reportOptions{}, true},
		{"none with an outcome", []string{"in.csv", "--fail-on", "none,missed"}, reportOptions{}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, err := parseOnly(t, newCheckCmd, tt.args...)
			if tt.wantErr {
				var fe flagError
				if !errors.As(err, &fe) {
					t.Errorf("check %q error = %v, want a flag error", tt.args, err)
				}
				return
			}
			if err != nil {
				t.Fatalf("check %q: %v", tt.args, err)
			}
			got := o.report
			if got.format != tt.want.format || got.out != tt.want.out || got.adjust != tt.want.adjust || !slices.Equal(got.failOn, tt.want.failOn) {
				t.Errorf("check %q options = %+v, want %+v", tt.args, got, tt.want)
			}
			if o.input != tt.args[0] || o.shown != tt.args[0] {
				t.Errorf("check %q input %q shown %q, want %q", tt.args, o.input, o.shown, tt.args[0])
			}
		})
	}
	if _, err := parseOnly(t, newCheckCmd); err == nil {
		t.Error("check without INPUT: no error")
	}
}

func TestNewPoolCmd(t *testing.T) {
	dir := t.TempDir()
	tests := []struct {
		name    string
		args    []string
		want    poolOptions
		wantErr bool
	}{
		{"defaults", []string{"in.xlsx"}, poolOptions{input: "in.xlsx", format: "table", maxPlots: report.DefaultMaxPlotTopics,
			method: pool.REML, level: 95, adjust: audit.AdjustNone, covariance: pool.Covariance{Mode: pool.CovarianceOmit}, covText: pool.CovarianceOmit}, false},
		{"every flag", []string{"in.xlsx", "-f", "md", "-o", "pool.md", "--plots", dir, "--max-plots", "5", "--method", "dl", "--level", "90", "--adjust", "bh", "--covariance", "0.3"},
			poolOptions{input: "in.xlsx", format: "md", out: "pool.md", plots: dir, maxPlots: 5, method: pool.DL, level: 90, adjust: audit.AdjustBH,
				covariance: pool.Covariance{Mode: pool.CovarianceCorrelation, Correlation: 0.3}, covText: "0.3"}, false},
		{"covariance bound", []string{"in.xlsx", "--covariance", "bound"}, poolOptions{input: "in.xlsx", format: "table", maxPlots: report.DefaultMaxPlotTopics,
			method: pool.REML, level: 95, adjust: audit.AdjustNone, covariance: pool.Covariance{Mode: pool.CovarianceBound, Correlation: -1}, covText: "bound"}, false},
		{"no plots", []string{"in.xlsx", "--plots", "none"}, poolOptions{input: "in.xlsx", format: "table", plots: "none", maxPlots: report.DefaultMaxPlotTopics,
			method: pool.REML, level: 95, adjust: audit.AdjustNone, covariance: pool.Covariance{Mode: pool.CovarianceOmit}, covText: pool.CovarianceOmit}, false},
		{"covariance beyond 1", []string{"in.xlsx", "--covariance", "1.2"}, poolOptions{}, true},
		{"max-plots 0", []string{"in.xlsx", "--max-plots", "0"}, poolOptions{}, true},
		{"pdf", []string{"in.xlsx", "--format", "pdf"}, poolOptions{}, true},
		{"method", []string{"in.xlsx", "--method", "pm"}, poolOptions{}, true},
		{"level 100", []string{"in.xlsx", "--level", "100"}, poolOptions{}, true},
		{"level not a number", []string{"in.xlsx", "--level", "high"}, poolOptions{}, true},
		{"plots not a folder", []string{"in.xlsx", "--plots", filepath.Join(dir, "missing")}, poolOptions{}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, err := parseOnly(t, newPoolCmd, tt.args...)
			if tt.wantErr {
				if err == nil {
					t.Errorf("pool %q: no error", tt.args)
				}
				return
			}
			if err != nil {
				t.Fatalf("pool %q: %v", tt.args, err)
			}
			got := *o
			got.stdout, got.files = nil, nil
			if got != tt.want {
				t.Errorf("pool %q options = %+v, want %+v", tt.args, got, tt.want)
			}
		})
	}
}

// TestCheckRunWritesNothingForAnUnreadableInput: check opens its output
// before the input, and a missing input leaves no file behind.
func TestCheckRunWritesNothingForAnUnreadableInput(t *testing.T) {
	dir := t.TempDir()
	var stdout bytes.Buffer
	o := &checkOptions{input: filepath.Join(dir, "missing.csv"), shown: "missing.csv", stdout: &stdout, files: output.NewFiles(),
		report: reportOptions{format: "json", out: filepath.Join(dir, "out.json"), adjust: audit.AdjustNone}}
	if err := runCheck(o); err == nil {
		t.Fatal("runCheck(missing input): no error")
	}
	if m, _ := filepath.Glob(filepath.Join(dir, "*")); len(m) != 0 || stdout.Len() != 0 {
		t.Errorf("runCheck(missing input) left %v and %d bytes on standard output, want nothing", m, stdout.Len())
	}
}
