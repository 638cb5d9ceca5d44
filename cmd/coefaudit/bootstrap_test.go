package main

import (
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeBootstrapData writes simulated data whose truth is set here:
// y = 0.5a + 0.2b − 0.1c + e, with a few missing values.
func writeBootstrapData(t *testing.T) string {
	t.Helper()
	rng := rand.New(rand.NewPCG(3, 5))
	var b strings.Builder
	b.WriteString("id,y,a,b,c\n")
	for i := range 300 {
		a := rng.NormFloat64()
		bb := 0.4*a + rng.NormFloat64()
		c := rng.NormFloat64()
		y := 0.5*a + 0.2*bb - 0.1*c + rng.NormFloat64()
		bs := fmt.Sprintf("%.5f", bb)
		if i%50 == 7 {
			bs = "NA"
		}
		fmt.Fprintf(&b, "p%d,%.5f,%.5f,%s,%.5f\n", i, y, a, bs, c)
	}
	path := filepath.Join(t.TempDir(), "data.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestBootstrapCommand(t *testing.T) {
	data := writeBootstrapData(t)
	args := []string{"bootstrap", data, "--outcome", "y", "--predictors", "a,b,c", "--compare", "a,b", "--resamples", "999", "--format", "json", "--seed", "4"}
	out1, stderr, code := runCLI(t, append(args, "--workers", "1")...)
	if code != exitOK {
		t.Fatalf("bootstrap: code %d, %s", code, stderr)
	}
	out2, _, _ := runCLI(t, append(args, "--workers", "3")...)
	if out1 != out2 {
		t.Error("the result depends on the number of workers")
	}
	var doc struct {
		N, Dropped, Resamples int
		Difference            float64
		BCa                   [2]float64 `json:"bca_ci"`
		Delta                 map[string]any
	}
	if err := json.Unmarshal([]byte(out1), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Dropped != 6 || doc.N != 294 || doc.Resamples != 999 {
		t.Errorf("n %d dropped %d resamples %d, want 294, 6, 999", doc.N, doc.Dropped, doc.Resamples)
	}
	if !(doc.BCa[0] < doc.Difference && doc.Difference < doc.BCa[1]) || doc.Delta == nil {
		t.Errorf("BCa %v around %v, delta %v", doc.BCa, doc.Difference, doc.Delta)
	}
	table, _, code := runCLI(t, "bootstrap", data, "--outcome", "y", "--predictors", "a,b,c", "--compare", "a,b", "--resamples", "200")
	if code != exitOK || !strings.Contains(table, "BCa interval") || !strings.Contains(table, "6 dropped") {
		t.Errorf("table output %q", table)
	}
}

func TestBootstrapCommandErrors(t *testing.T) {
	data := writeBootstrapData(t)
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"text column", []string{"--outcome", "y", "--predictors", "a,id", "--compare", "a,id"}, `"id"`},
		{"missing column", []string{"--outcome", "y", "--predictors", "a,zz", "--compare", "a,zz"}, `"zz"`},
		{"compare not a predictor", []string{"--outcome", "y", "--predictors", "a,b", "--compare", "a,c"}, `"c"`},
		{"one predictor", []string{"--outcome", "y", "--predictors", "a", "--compare", "a,a"}, "two"},
		{"bad level", []string{"--outcome", "y", "--predictors", "a,b", "--compare", "a,b", "--level", "0"}, "--level"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, stderr, code := runCLI(t, append([]string{"bootstrap", data}, tt.args...)...)
			if code != exitError || !strings.Contains(stderr, tt.want) {
				t.Errorf("code %d, stderr %q, want exit 2 and %q", code, stderr, tt.want)
			}
		})
	}
	// A collinear predictor is named.
	dir := t.TempDir()
	path := filepath.Join(dir, "col.csv")
	var b strings.Builder
	b.WriteString("y,a,b,twice_a\n")
	for i := range 50 {
		fmt.Fprintf(&b, "%d,%d,%d,%d\n", i%7, i%5, (i*i)%11, 2*(i%5))
	}
	os.WriteFile(path, []byte(b.String()), 0o644)
	_, stderr, code := runCLI(t, "bootstrap", path, "--outcome", "y", "--predictors", "a,b,twice_a", "--compare", "a,b", "--resamples", "100")
	if code != exitError || !strings.Contains(stderr, "twice_a") && !strings.Contains(stderr, `"a"`) {
		t.Errorf("collinear predictor: code %d, stderr %q", code, stderr)
	}
}
