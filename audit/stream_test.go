package audit

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"coefaudit/extract"
)

// writePaired writes n invented paired claims, four per study, to a file
// in dir: estimates and 95% intervals printed to two decimals.
func writePaired(tb testing.TB, dir string, n int) string {
	tb.Helper()
	rng := rand.New(rand.NewPCG(8, 13))
	path := filepath.Join(dir, "paired.csv")
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	w := csv.NewWriter(f)
	w.Write([]string{"study", "claim", "published", "basis", "first_label", "first_measure", "first_group",
		"first_estimate", "first_ci_low", "first_ci_high", "first_n", "second_label", "second_measure", "second_group",
		"second_estimate", "second_ci_low", "second_ci_high", "second_n", "page"})
	pubs := []string{"differ", "no-difference", "first-larger", "second-larger"}
	f2 := func(x float64) string { return fmt.Sprintf("%.2f", x) }
	for i := range n {
		e1, s1 := 0.3+0.2*rng.NormFloat64(), 0.03+0.12*rng.Float64()
		e2, s2 := 0.2+0.2*rng.NormFloat64(), 0.03+0.12*rng.Float64()
		w.Write([]string{fmt.Sprintf("S%d", i/4), fmt.Sprintf("c%d", i), pubs[i%4], "test", "a", "or", "g1",
			f2(1 + e1*e1), f2((1 + e1*e1) * 0.7), f2((1 + e1*e1) * 1.4), fmt.Sprint(50 + rng.IntN(900)), "b", "or", "g2",
			f2(1 + e2*e2), f2((1 + e2*e2) * (1 - s2)), f2((1 + e2*e2) * (1 + 2*s1)), fmt.Sprint(50 + rng.IntN(900)), "p. 3"})
	}
	w.Flush()
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
	return path
}

// TestStreamMatchesWholeAudit checks that a streamed audit of a paired CSV
// writes exactly what the audit of the whole file writes, with and without
// the multiplicity adjustment (whose family, a study, is contiguous here).
func TestStreamMatchesWholeAudit(t *testing.T) {
	path := writePaired(t, t.TempDir(), 400)
	for _, adj := range []string{AdjustNone, AdjustHolm} {
		opts := Options{Adjust: adj}
		var streamed, whole bytes.Buffer
		if _, err := StreamPaired(path, opts, NewCSVSink(&streamed)); err != nil {
			t.Fatal(err)
		}
		in, err := extract.Read(path)
		if err != nil {
			t.Fatal(err)
		}
		if err := WriteCSV(&whole, Audit(in, opts)); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(streamed.Bytes(), whole.Bytes()) {
			t.Errorf("adjust %s: the streamed CSV differs from the whole-file CSV", adj)
		}
	}
	if !IsPairedCSV(path) || IsPairedCSV(filepath.Dir(path)) {
		t.Error("IsPairedCSV misjudges a paired CSV or a folder")
	}
}

// BenchmarkStreamPaired audits 100,000 paired claims to CSV as a stream;
// BenchmarkReadSplitPaired only reads and splits the same file with
// encoding/csv, the baseline of the speed target.
func BenchmarkStreamPaired(b *testing.B) {
	path := writePaired(b, b.TempDir(), 100000)
	b.ResetTimer()
	for range b.N {
		if _, err := StreamPaired(path, DefaultOptions, NewCSVSink(io.Discard)); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkReadSplitPaired(b *testing.B) {
	path := writePaired(b, b.TempDir(), 100000)
	b.ResetTimer()
	for range b.N {
		f, _ := os.Open(path)
		r := csv.NewReader(f)
		r.ReuseRecord = true
		for {
			if _, err := r.Read(); err != nil {
				break
			}
		}
		f.Close()
	}
}
