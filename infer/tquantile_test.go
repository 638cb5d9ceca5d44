package infer

import "testing"

// BenchmarkStudentTQuantile asks for the t quantiles an audit of a
// literature asks for: the 95% critical value (two-sided p = 1 − 0.95) and
// the quantiles of a printed p (0.032) and of a bound ("< .001"), at the
// df of samples of 30 to 1,000 (df = n − 3), each pair many times over as
// rows repeat them ("repeated"); and pairs never asked for before, a new
// fractional df each call ("distinct").
func BenchmarkStudentTQuantile(b *testing.B) {
	ps := []float64{1 - 0.95, 0.032, 0.001}
	b.Run("repeated", func(b *testing.B) {
		i := 0
		for b.Loop() {
			df := float64(27 + i%971)
			if _, err := StudentTFromTwoSidedP(ps[i%len(ps)], df); err != nil {
				b.Fatal(err)
			}
			i++
		}
	})
	b.Run("distinct", func(b *testing.B) {
		i := 0
		for b.Loop() {
			df := 27.5 + float64(i)*1e-6
			if _, err := StudentTFromTwoSidedP(ps[i%len(ps)], df); err != nil {
				b.Fatal(err)
			}
			i++
		}
	})
}
