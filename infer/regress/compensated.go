package regress

import "math"

// twiceFloat is a float64 with a second float64 carrying the rounding error of
// the first: sums and dot products accumulated in it are as accurate as if
// they had been computed in twice the working precision and rounded once [1].
// The least-squares refinement needs residuals that accurate: a residual
// computed in plain float64 has an error as large as the correction it is
// meant to find.
//
// [1] Ogita T, Rump SM, Oishi S (2005). Accurate sum and dot product. SIAM
// Journal on Scientific Computing 26(6):1955–1988.
type twiceFloat struct{ hi, lo float64 }

// add accumulates x with Knuth's error-free TwoSum.
func (a *twiceFloat) add(x float64) {
	s := a.hi + x
	bp := s - a.hi
	a.lo += (a.hi - (s - bp)) + (x - bp)
	a.hi = s
}

// addProduct accumulates x·y; the fused multiply-add recovers the rounding
// error of the product exactly (TwoProduct).
func (a *twiceFloat) addProduct(x, y float64) {
	p := x * y
	pe := math.FMA(x, y, -p)
	s := a.hi + p
	bp := s - a.hi
	a.lo += (a.hi - (s - bp)) + (p - bp) + pe
	a.hi = s
}

// value rounds the accumulated sum to float64.
func (a twiceFloat) value() float64 { return a.hi + a.lo }

// accurateSum returns Σ x_i accumulated in twiceFloat.
func accurateSum(x []float64) float64 {
	var acc twiceFloat
	for _, v := range x {
		acc.add(v)
	}
	return acc.value()
}

// accurateMean returns Σ x_i / n accumulated in twiceFloat.
func accurateMean(x []float64) float64 {
	return accurateSum(x) / float64(len(x))
}

// centredSumOfSquares returns Σ (x_i − m)² with the deviations formed
// before squaring (the two-pass formula, which does not cancel).
func centredSumOfSquares(x []float64, m float64) float64 {
	var acc twiceFloat
	for _, v := range x {
		d := v - m
		acc.addProduct(d, d)
	}
	return acc.value()
}
