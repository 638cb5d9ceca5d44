package infer

import (
	"fmt"
	"math"
	"sync"
	"testing"
)

// BenchmarkStudentTQuantile asks for the t quantiles an audit of a
// literature asks for, at the df of samples of 30 to 1,000 (df = n − 3):
// the 95% critical value of each interval read ("critical"); the quantiles
// of a printed p (0.032) and of a bound ("< .001"), each pair many times
// over as rows repeat them ("printed p"); and pairs never asked for
// before, a new fractional df each call ("distinct").
func BenchmarkStudentTQuantile(b *testing.B) {
	b.Run("critical", func(b *testing.B) {
		b.ReportAllocs()
		i := 0
		for b.Loop() {
			if _, err := StudentTCriticalValue(0.95, float64(27+i%971)); err != nil {
				b.Fatal(err)
			}
			i++
		}
	})
	ps := []float64{0.032, 0.001}
	b.Run("printed p", func(b *testing.B) {
		b.ReportAllocs()
		i := 0
		for b.Loop() {
			if _, err := StudentTFromTwoSidedP(ps[i%len(ps)], float64(27+i%971)); err != nil {
				b.Fatal(err)
			}
			i++
		}
	})
	b.Run("distinct", func(b *testing.B) {
		b.ReportAllocs()
		i := 0
		for b.Loop() {
			if _, err := StudentTFromTwoSidedP(ps[i%len(ps)], 27.5+float64(i)*1e-6); err != nil {
				b.Fatal(err)
			}
			i++
		}
	})
}

// TestStudentTCriticalValueRemembered checks that a critical value given
// again from memory is the computed one, bit for bit, whichever goroutine
// computed it first, and that a refused level or df is refused every time.
func TestStudentTCriticalValueRemembered(t *testing.T) {
	var wg sync.WaitGroup
	errs := make(chan string, 8)
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range 300 {
				level := []float64{0.95, 0.90, 0.99, 0.8}[(i+g)%4]
				df := float64(1+(i*7+g)%120) / []float64{1, 2}[i%2]
				got, err := StudentTCriticalValue(level, df)
				want, _ := StudentTFromTwoSidedP(1-level, df)
				if err != nil || math.Float64bits(got) != math.Float64bits(want) {
					errs <- fmt.Sprintf("StudentTCriticalValue(%v, %v) = %v, %v; want %v", level, df, got, err, want)
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
	for range 2 {
		for _, c := range [][2]float64{{0.95, 0}, {0.95, math.NaN()}, {0.95, -3}, {1, 10}, {0, 10}, {math.NaN(), 10}} {
			if got, err := StudentTCriticalValue(c[0], c[1]); err == nil {
				t.Errorf("StudentTCriticalValue(%v, %v) = %v, want an error", c[0], c[1], got)
			}
		}
	}
}
