package bootstrap

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"coefaudit/infer/regress"
	"gonum.org/v1/gonum/stat/distuv"
)

// simulateData returns columns (y, x1..xk) of n rows: predictors with
// pairwise correlation rho, y = Σ b_j x_j + e with unit error variance,
// then shifted and scaled per column. Truth set here.
func simulateData(seed uint64, n int, b []float64, rho float64) [][]float64 {
	rng := rand.New(rand.NewPCG(seed, 3))
	k := len(b)
	data := make([][]float64, k+1)
	for c := range data {
		data[c] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		f := rng.NormFloat64()
		for j := 1; j <= k; j++ {
			data[j][i] = math.Sqrt(rho)*f + math.Sqrt(1-rho)*rng.NormFloat64()
			data[0][i] += b[j-1] * data[j][i]
		}
		data[0][i] += rng.NormFloat64()
	}
	for c := range data {
		for i := range data[c] {
			data[c][i] = 5*float64(c) + (1+float64(c))*data[c][i]
		}
	}
	return data
}

// slowReference recomputes everything the plain way: each resample is a
// copy of the rows drawn with the documented stream (rand.NewPCG(seed, b),
// IntN(n) n times), refitted with regress.OLS; the jackknife refits the
// data with each row removed; the intervals are then read from these
// replicates with the formulas written out again here (Efron 1987;
// DiCiccio & Efron 1996; quantile definition 6 of Hyndman & Fan 1996).
type slowReference struct {
	replicates, jack []float64
	z0, a            float64
	pct, bc, bca     [2]float64
	p                float64
}

func referenceStatistic(t *testing.T, data [][]float64, opts Options) float64 {
	t.Helper()
	x := make([][]float64, len(opts.Predictors))
	for j, c := range opts.Predictors {
		x[j] = data[c]
	}
	fit, err := regress.OLS(data[opts.Outcome], x, regress.Options{})
	if err != nil {
		t.Fatalf("reference OLS: %v", err)
	}
	ia, ib := slices.Index(opts.Predictors, opts.Compare[0]), slices.Index(opts.Predictors, opts.Compare[1])
	if opts.Unstandardized {
		return fit.Coefficients[ia+1] - fit.Coefficients[ib+1]
	}
	return fit.Standardized[ia] - fit.Standardized[ib]
}

func computeSlowReference(t *testing.T, data [][]float64, opts Options) slowReference {
	t.Helper()
	n := len(data[0])
	var ref slowReference
	estimate := referenceStatistic(t, data, opts)
	rows := func(pick []int) [][]float64 {
		out := make([][]float64, len(data))
		for c := range data {
			out[c] = make([]float64, len(pick))
			for i, r := range pick {
				out[c][i] = data[c][r]
			}
		}
		return out
	}
	pick := make([]int, n)
	for b := 0; b < opts.Resamples; b++ {
		rng := rand.New(rand.NewPCG(opts.Seed, uint64(b)))
		for i := range pick {
			pick[i] = rng.IntN(n)
		}
		ref.replicates = append(ref.replicates, referenceStatistic(t, rows(pick), opts))
	}
	for i := 0; i < n; i++ {
		keep := make([]int, 0, n-1)
		for r := 0; r < n; r++ {
			if r != i {
				keep = append(keep, r)
			}
		}
		ref.jack = append(ref.jack, referenceStatistic(t, rows(keep), opts))
	}
	if opts.Resamples == 0 {
		return ref
	}
	sorted := slices.Sorted(slices.Values(ref.replicates))
	B := float64(len(sorted))
	quantile := func(u float64) float64 {
		h := (B + 1) * u
		lo := math.Floor(h)
		return sorted[int(lo)-1] + (h-lo)*(sorted[int(lo)]-sorted[int(lo)-1])
	}
	norm := distuv.Normal{Mu: 0, Sigma: 1}
	below := 0.0
	for _, v := range sorted {
		if v < estimate {
			below++
		} else if v == estimate {
			below += 0.5
		}
	}
	ref.z0 = norm.Quantile(below / B)
	mean := 0.0
	for _, v := range ref.jack {
		mean += v / float64(n)
	}
	var s2, s3 float64
	for _, v := range ref.jack {
		s2 += (mean - v) * (mean - v)
		s3 += (mean - v) * (mean - v) * (mean - v)
	}
	ref.a = s3 / (6 * math.Pow(s2, 1.5))
	alpha := 1 - opts.Level
	zl, zu := norm.Quantile(alpha/2), norm.Quantile(1-alpha/2)
	ref.pct = [2]float64{quantile(alpha / 2), quantile(1 - alpha/2)}
	ref.bc = [2]float64{quantile(norm.CDF(2*ref.z0 + zl)), quantile(norm.CDF(2*ref.z0 + zu))}
	adj := func(z float64) float64 {
		return norm.CDF(ref.z0 + (ref.z0+z)/(1-ref.a*(ref.z0+z)))
	}
	ref.bca = [2]float64{quantile(adj(zl)), quantile(adj(zu))}
	le, ge := 0.0, 0.0
	for _, v := range sorted {
		if v <= 0 {
			le++
		}
		if v >= 0 {
			ge++
		}
	}
	ref.p = math.Min(1, 2*(1+math.Min(le, ge))/(B+1))
	return ref
}

// TestCompareCoefficientsAgainstSlowReference covers every accumulation
// loop: unrolled for 2 to 5 predictors, general for 6.
func TestCompareCoefficientsAgainstSlowReference(t *testing.T) {
	tests := []struct {
		name string
		n    int
		b    []float64
		opts Options
	}{
		{"two predictors standardized", 40, []float64{0.5, 0.2},
			Options{Outcome: 0, Predictors: []int{1, 2}, Compare: [2]int{1, 2}, Resamples: 999, Seed: 11}},
		{"three predictors unstandardized, compare reversed", 50, []float64{0.3, -0.2, 0.4},
			Options{Outcome: 0, Predictors: []int{1, 2, 3}, Compare: [2]int{3, 1}, Resamples: 999, Seed: 12, Unstandardized: true, Level: 0.9}},
		{"four predictors", 45, []float64{0.3, 0.1, 0.2, 0.2},
			Options{Outcome: 0, Predictors: []int{1, 2, 3, 4}, Compare: [2]int{2, 4}, Resamples: 999, Seed: 14}},
		{"five predictors, outcome in the last column", 60, []float64{0.1, 0.4, 0.3, -0.2, 0.2},
			Options{Outcome: 5, Predictors: []int{4, 0, 1, 2, 3}, Compare: [2]int{0, 2}, Resamples: 999, Seed: 13}},
		{"six predictors (general loop)", 70, []float64{0.1, 0.4, 0.3, -0.2, 0.2, 0.1},
			Options{Outcome: 0, Predictors: []int{1, 2, 3, 4, 5, 6}, Compare: [2]int{6, 2}, Resamples: 999, Seed: 15}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			data := simulateData(uint64(tt.n), tt.n, tt.b, 0.4)
			if tt.opts.Outcome != 0 { // move y to the stated column
				data = append(data[1:], data[0])
			}
			res, err := CompareCoefficients(data, tt.opts)
			if err != nil {
				t.Fatalf("CompareCoefficients error: %v", err)
			}
			if tt.opts.Level == 0 {
				tt.opts.Level = DefaultLevel
			}
			ref := computeSlowReference(t, data, tt.opts)
			const tol = 1e-9
			for b, want := range ref.replicates {
				if got := res.Replicates[b]; math.Abs(got-want) > tol {
					t.Fatalf("replicate %d = %.15g, want %.15g (plain refit)", b, got, want)
				}
			}
			if math.Abs(res.BiasCorrection-ref.z0) > tol || math.Abs(res.Acceleration-ref.a) > tol {
				t.Errorf("ẑ0, â = %.12g, %.12g, want %.12g, %.12g", res.BiasCorrection, res.Acceleration, ref.z0, ref.a)
			}
			for _, c := range []struct {
				name string
				got  Interval
				want [2]float64
			}{{"percentile", res.Percentile, ref.pct}, {"BC", res.BC, ref.bc}, {"BCa", res.BCa, ref.bca}} {
				if math.Abs(c.got.Lower-c.want[0]) > tol || math.Abs(c.got.Upper-c.want[1]) > tol {
					t.Errorf("%s interval = [%.12g, %.12g], want [%.12g, %.12g]", c.name, c.got.Lower, c.got.Upper, c.want[0], c.want[1])
				}
			}
			if res.P != ref.p {
				t.Errorf("P = %v, want %v", res.P, ref.p)
			}
			if res.Used != tt.opts.Resamples || res.JackknifeUsed != tt.n {
				t.Errorf("Used, JackknifeUsed = %d, %d, want %d, %d", res.Used, res.JackknifeUsed, tt.opts.Resamples, tt.n)
			}
		})
	}
}

// TestJackknifeDowndate checks the leave-one-out statistics themselves
// against plain refits without the row.
func TestJackknifeDowndate(t *testing.T) {
	for _, k := range []int{2, 4, 5} {
		data := simulateData(uint64(100+k), 30, make([]float64, k), 0.5)
		opts := Options{Outcome: 0, Predictors: []int{1, 2}, Compare: [2]int{1, 2}}
		for j := 3; j <= k; j++ {
			opts.Predictors = append(opts.Predictors, j)
		}
		for _, unstd := range []bool{false, true} {
			opts.Unstandardized = unstd
			mean := make([]float64, k+1)
			for c := range mean {
				for _, v := range data[c] {
					mean[c] += v / float64(len(data[c]))
				}
			}
			got := jackknife(newKernel(data, mean, 1, 2, !unstd), 3)
			ref := computeSlowReference(t, data, Options{Outcome: 0, Predictors: opts.Predictors, Compare: opts.Compare,
				Resamples: 0, Unstandardized: unstd, Level: 0.95})
			for i, want := range ref.jack {
				if math.Abs(got[i]-want) > 1e-11 {
					t.Errorf("k = %d unstandardized %v: θ_(%d) = %.15g, want %.15g (refit without the row)", k, unstd, i, got[i], want)
				}
			}
		}
	}
}

// TestDeterministicAcrossWorkers: for a seed the results are bit-identical
// whatever the number of workers; another seed gives other replicates.
func TestDeterministicAcrossWorkers(t *testing.T) {
	data := simulateData(21, 80, []float64{0.4, 0.1, 0.3, 0.2, -0.1}, 0.3)
	opts := Options{Outcome: 0, Predictors: []int{1, 2, 3, 4, 5}, Compare: [2]int{1, 3}, Resamples: 2000, Seed: 99}
	var results []*Result
	for _, w := range []int{1, 4, 7} {
		opts.Workers = w
		res, err := CompareCoefficients(data, opts)
		if err != nil {
			t.Fatalf("CompareCoefficients(workers %d) error: %v", w, err)
		}
		results = append(results, res)
	}
	for i, res := range results[1:] {
		if !slices.Equal(res.Replicates, results[0].Replicates) {
			t.Errorf("workers %d: replicates differ from workers 1", []int{4, 7}[i])
		}
		if res.BCa != results[0].BCa || res.BC != results[0].BC || res.Percentile != results[0].Percentile ||
			res.Acceleration != results[0].Acceleration || res.P != results[0].P {
			t.Errorf("workers %d: BCa %+v, want %+v (workers 1)", []int{4, 7}[i], res.BCa, results[0].BCa)
		}
	}
	opts.Seed = 100
	other, err := CompareCoefficients(data, opts)
	if err != nil {
		t.Fatalf("CompareCoefficients(seed 100) error: %v", err)
	}
	if slices.Equal(other.Replicates, results[0].Replicates) {
		t.Error("seeds 99 and 100 gave the same replicates")
	}
}

func TestProgress(t *testing.T) {
	data := simulateData(5, 50, []float64{0.2, 0.3}, 0.2)
	var calls, last int
	opts := Options{Outcome: 0, Predictors: []int{1, 2}, Compare: [2]int{1, 2}, Resamples: 10000, Seed: 1, Workers: 2,
		Progress: func(done, total int) {
			calls++
			if done < last || total != 10000 {
				t.Errorf("Progress(%d, %d) after %d", done, total, last)
			}
			last = done
		}}
	if _, err := CompareCoefficients(data, opts); err != nil {
		t.Fatalf("CompareCoefficients error: %v", err)
	}
	if calls > 101 || last != 10000 || calls < 10 {
		t.Errorf("Progress called %d times, last done %d; want 10 to 101 calls ending at 10000", calls, last)
	}
}

func TestCompareCoefficientsErrors(t *testing.T) {
	good := simulateData(8, 30, []float64{0.3, 0.3, 0.3}, 0.2)
	constant := simulateData(8, 30, []float64{0.3, 0.3, 0.3}, 0.2)
	for i := range constant[2] {
		constant[2][i] = 4
	}
	collinear := simulateData(8, 30, []float64{0.3, 0.3, 0.3}, 0.2)
	for i := range collinear[3] {
		collinear[3][i] = 2*collinear[1][i] - collinear[2][i]
	}
	short := simulateData(8, 4, []float64{0.3, 0.3, 0.3}, 0.2) // 4 rows, need 5
	ragged := simulateData(8, 30, []float64{0.3, 0.3, 0.3}, 0.2)
	ragged[2] = ragged[2][:29]
	base := Options{Outcome: 0, Predictors: []int{1, 2, 3}, Compare: [2]int{1, 2}, Resamples: 200}
	with := func(f func(*Options)) Options {
		o := base
		o.Predictors = slices.Clone(base.Predictors)
		f(&o)
		return o
	}
	tests := []struct {
		name   string
		data   [][]float64
		opts   Options
		want   error
		column int // for *ColumnError; −1 otherwise
	}{
		{"fewer rows than predictors + 2", short, base, ErrTooFewObservations, -1},
		{"constant predictor", constant, base, regress.ErrConstantPredictor, 2},
		{"collinear predictor", collinear, base, regress.ErrCollinear, 3},
		{"compare not a predictor", good, with(func(o *Options) { o.Compare = [2]int{1, 0} }), ErrCompare, -1},
		{"compare the same predictor twice", good, with(func(o *Options) { o.Compare = [2]int{2, 2} }), ErrCompare, -1},
		{"outcome among predictors", good, with(func(o *Options) { o.Predictors = []int{0, 1, 2} }), ErrColumn, -1},
		{"predictor out of range", good, with(func(o *Options) { o.Predictors = []int{1, 2, 4} }), ErrColumn, -1},
		{"no predictors", good, with(func(o *Options) { o.Predictors = nil }), ErrColumn, -1},
		{"too few resamples", good, with(func(o *Options) { o.Resamples = 50 }), ErrOption, -1},
		{"level given in percent", good, with(func(o *Options) { o.Level = 95 }), ErrOption, -1},
		{"negative workers", good, with(func(o *Options) { o.Workers = -1 }), ErrOption, -1},
		{"columns of different lengths", ragged, base, ErrLengthMismatch, -1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := CompareCoefficients(tt.data, tt.opts)
			if !errors.Is(err, tt.want) {
				t.Fatalf("CompareCoefficients() error = %v, want %v", err, tt.want)
			}
			if tt.column >= 0 {
				var ce *ColumnError
				if !errors.As(err, &ce) || ce.Column != tt.column {
					t.Errorf("CompareCoefficients() error = %v, want a *ColumnError for column %d", err, tt.column)
				}
			}
		})
	}
}

// TestResampleAllocatesNothing: the hot loop (draw, accumulate, solve)
// allocates nothing per resample, for each accumulation loop.
func TestResampleAllocatesNothing(t *testing.T) {
	for _, k := range []int{2, 3, 4, 5, 6} {
		data := simulateData(3, 200, make([]float64, k), 0.1)
		mean := make([]float64, k+1)
		kn := newKernel(data, mean, 1, 2, true)
		pcg := rand.NewPCG(1, 0)
		rng := rand.New(pcg)
		b := uint64(0)
		allocs := testing.AllocsPerRun(20, func() {
			pcg.Seed(1, b)
			b++
			kn.resample(rng)
			kn.statistic(kn.cross, kn.sum, float64(kn.n))
		})
		if allocs != 0 {
			t.Errorf("k = %d: %v allocations per resample, want 0", k, allocs)
		}
	}
}

// TestDegenerateResamples: a binary predictor with two 1s in 30 rows is
// constant in about (28/30)^30 ≈ 13% of resamples. Those replicates must be
// NaN exactly where a plain refit of the resample fails with
// regress.ErrConstantPredictor, be left out of Used, and be reported.
func TestDegenerateResamples(t *testing.T) {
	data := simulateData(31, 30, []float64{0.4, 0.3}, 0)
	for i := range data[2] {
		data[2][i] = 0
	}
	data[2][4], data[2][17] = 1, 1
	opts := Options{Outcome: 0, Predictors: []int{1, 2}, Compare: [2]int{1, 2}, Resamples: 500, Seed: 3}
	res, err := CompareCoefficients(data, opts)
	if err != nil {
		t.Fatalf("CompareCoefficients error: %v", err)
	}
	n := len(data[0])
	degenerate := 0
	for b := 0; b < opts.Resamples; b++ {
		rng := rand.New(rand.NewPCG(opts.Seed, uint64(b)))
		x1, x2, y := make([]float64, n), make([]float64, n), make([]float64, n)
		for i := 0; i < n; i++ {
			r := rng.IntN(n)
			y[i], x1[i], x2[i] = data[0][r], data[1][r], data[2][r]
		}
		_, err := regress.OLS(y, [][]float64{x1, x2}, regress.Options{})
		failed := errors.Is(err, regress.ErrConstantPredictor)
		if failed {
			degenerate++
		}
		if failed != math.IsNaN(res.Replicates[b]) {
			t.Errorf("resample %d: replicate %v, plain refit error %v", b, res.Replicates[b], err)
		}
	}
	if degenerate == 0 || res.Used != opts.Resamples-degenerate || len(res.Warnings) == 0 {
		t.Errorf("Used = %d with %d degenerate of %d, warnings %q; want Used = %d and a warning",
			res.Used, degenerate, opts.Resamples, res.Warnings, opts.Resamples-degenerate)
	}
	t.Logf("%d of %d resamples degenerate", degenerate, opts.Resamples)
}
