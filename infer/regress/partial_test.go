package regress

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

func TestCoefficientCorrelation(t *testing.T) {
	// Two predictors: corr(b1, b2) = −r12 (the 2×2 inverse of [[1, r], [r, 1]]
	// is [[1, −r], [−r, 1]]/(1 − r²)).
	two := mat.NewSymDense(2, []float64{1, 0.4, 0.4, 1})
	if got, err := CoefficientCorrelation(two, 0, 1); err != nil || math.Abs(got+0.4) > 1e-12 {
		t.Errorf("CoefficientCorrelation(r12 = 0.4) = %v, %v; want −0.4", got, err)
	}

	// Three predictors against the raw OLS covariance σ²(X'X)⁻¹ of simulated
	// data (intercept included), computed here with gonum's QR.
	const n = 400
	rng := rand.New(rand.NewPCG(3, 5))
	x := mat.NewDense(n, 4, nil)
	cols := make([][]float64, 3)
	for k := range cols {
		cols[k] = make([]float64, n)
	}
	for i := range n {
		z := rng.NormFloat64()
		v := []float64{z + rng.NormFloat64(), 0.7*z + rng.NormFloat64(), rng.NormFloat64() - 0.3*z}
		x.Set(i, 0, 1)
		for k := range v {
			x.Set(i, k+1, v[k])
			cols[k][i] = v[k]
		}
	}
	var xtx mat.SymDense
	xtx.SymOuterK(1, x.T())
	var inv mat.Dense
	if err := inv.Inverse(&xtx); err != nil {
		t.Fatal(err)
	}
	rxx := mat.NewSymDense(3, nil)
	for a := range 3 {
		for b := a; b < 3; b++ {
			rxx.SetSym(a, b, stat.Correlation(cols[a], cols[b], nil))
		}
	}
	for _, pair := range [][2]int{{0, 1}, {0, 2}, {1, 2}} {
		a, b := pair[0]+1, pair[1]+1
		want := inv.At(a, b) / math.Sqrt(inv.At(a, a)*inv.At(b, b))
		got, err := CoefficientCorrelation(rxx, pair[0], pair[1])
		if err != nil || math.Abs(got-want) > 1e-10 {
			t.Errorf("CoefficientCorrelation(%v) = %v, %v; raw fit %v", pair, got, err, want)
		}
	}

	// r12 = r13 = .9 with r23 = −.9 has smallest eigenvalue −0.8.
	bad := mat.NewSymDense(3, []float64{1, .9, .9, .9, 1, -.9, .9, -.9, 1})
	var npd *NotPositiveDefiniteError
	if _, err := CoefficientCorrelation(bad, 0, 1); !errors.As(err, &npd) {
		t.Errorf("not positive definite: err %v", err)
	}
	if _, err := CoefficientCorrelation(two, 0, 0); !errors.Is(err, ErrIndex) {
		t.Errorf("i = j: err %v, want ErrIndex", err)
	}
}
