package bootstrap

import (
	"math"
	"math/rand/v2"
	"runtime"
	"testing"
)

// benchData is n rows of an outcome and k correlated predictors (invented
// for the benchmark; the values do not matter for timing).
func benchData(n, k int, seed uint64) [][]float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	data := make([][]float64, k+1)
	for c := range data {
		data[c] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		f := rng.NormFloat64()
		y := 0.0
		for j := 1; j <= k; j++ {
			data[j][i] = 10*float64(j) + 0.6*f + 0.8*rng.NormFloat64()
			y += 0.3 * float64(j%3) * data[j][i]
		}
		data[0][i] = y + rng.NormFloat64()
	}
	return data
}

// BenchmarkBootstrap10k is the speed target: n = 10,000 rows, 5
// predictors, 10,000 resamples plus the jackknife, all workers.
func BenchmarkBootstrap10k(b *testing.B) {
	data := benchData(10000, 5, 42)
	opts := Options{Outcome: 0, Predictors: []int{1, 2, 3, 4, 5}, Compare: [2]int{1, 2}, Resamples: 10000, Seed: 7}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := CompareCoefficients(data, opts); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkResampleKernel times one worker's resampling loop only, to
// compare the accumulation strategies (per resample of n = 10,000 rows,
// 6 variables). "indices, unrolled" is what CompareCoefficients uses for 5
// predictors; "indices, general" the loop for other sizes; "counts" draws
// multinomial counts into an n-vector first and then sweeps the rows once —
// measured and not used: it needs O(n) memory per worker and was slower.
func BenchmarkResampleKernel(b *testing.B) {
	data := benchData(10000, 5, 42)
	mean := make([]float64, len(data))
	for c, col := range data {
		for _, v := range col {
			mean[c] += v
		}
		mean[c] /= float64(len(col))
	}
	kn := newKernel(data, mean, 1, 2, true)
	pcg := rand.NewPCG(1, 0)
	rng := rand.New(pcg)
	b.Run("indices, unrolled", func(b *testing.B) {
		i := uint64(0)
		for b.Loop() {
			pcg.Seed(1, i)
			i++
			kn.resample(rng)
			kn.statistic(kn.cross, kn.sum, float64(kn.n))
		}
	})
	b.Run("indices, general", func(b *testing.B) {
		i := uint64(0)
		for b.Loop() {
			pcg.Seed(1, i)
			i++
			clear(kn.sum)
			clear(kn.cross)
			kn.resampleAny(rng)
			kn.statistic(kn.cross, kn.sum, float64(kn.n))
		}
	})
	b.Run("counts", func(b *testing.B) {
		counts := make([]int32, kn.n)
		i := uint64(0)
		for b.Loop() {
			pcg.Seed(1, i)
			i++
			clear(counts)
			for range kn.n {
				counts[rng.IntN(kn.n)]++
			}
			resampleCounts(kn, counts)
			kn.statistic(kn.cross, kn.sum, float64(kn.n))
		}
	})
	b.Run("random draws only", func(b *testing.B) {
		i := uint64(0)
		s := 0
		for b.Loop() {
			pcg.Seed(1, i)
			i++
			for range kn.n {
				s += rng.IntN(kn.n)
			}
		}
		runtime.KeepAlive(s)
	})
}

// resampleCounts accumulates weighted sums over all rows with multinomial
// counts (the alternative measured in BenchmarkResampleKernel).
func resampleCounts(kn *kernel, counts []int32) {
	q := kn.q
	clear(kn.sum)
	clear(kn.cross)
	z := kn.z
	for i, w := range counts {
		if w == 0 {
			continue
		}
		fw := float64(w)
		for v, col := range kn.cols {
			z[v] = col[i] - kn.mean[v]
		}
		pos := 0
		for a := 0; a < q; a++ {
			wa := fw * z[a]
			kn.sum[a] += wa
			for c := a; c < q; c++ {
				kn.cross[pos] += wa * z[c]
				pos++
			}
		}
	}
	_ = math.Abs
}
