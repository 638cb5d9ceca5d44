package regress

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func TestCheckCorrelationMatrix(t *testing.T) {
	// Hand computation: r12 = r13 = 0.9, r23 = −0.9 cannot hold together. The
	// matrix is I + 0.9 A with A = [[0, 1, 1], [1, 0, −1], [1, −1, 0]], and
	// A(−1, 1, 1) = −2 (−1, 1, 1), so 1 − 0.9·2 = −0.8 is an eigenvalue (the
	// smallest; the other two are 1.9, the trace being 3).
	bad := mat.NewSymDense(3, []float64{1, .9, .9, .9, 1, -.9, .9, -.9, 1})
	err := CheckCorrelationMatrix(bad)
	var npd *NotPositiveDefiniteError
	if !errors.As(err, &npd) || math.Abs(npd.MinEigenvalue+0.8) > 1e-12 {
		t.Errorf("CheckCorrelationMatrix(bad) = %v, want smallest eigenvalue −0.8", err)
	}
	good := mat.NewSymDense(3, []float64{1, .5, .3, .5, 1, .4, .3, .4, 1})
	if err := CheckCorrelationMatrix(good); err != nil {
		t.Errorf("CheckCorrelationMatrix(good) = %v", err)
	}
	if err := CheckCorrelationMatrix(mat.NewSymDense(2, []float64{1, 1.2, 1.2, 1})); !errors.Is(err, ErrNotCorrelationMatrix) {
		t.Errorf("|r| > 1: %v", err)
	}
}
