package meta

import "math"

// rootResult is the outcome of a bracketed root search.
type rootResult struct {
	x          float64
	iterations int
	width      float64
	converged  bool
}

// bracketRoot finds x in [lo, hi] with f(x) = 0, given f(lo) and f(hi) of
// opposite signs. It uses the Illinois variant of regula falsi, which keeps
// the bracket and so cannot diverge, and falls back to a bisection step
// whenever the secant point would shrink the bracket too little. It stops
// when the bracket is narrower than tol·max(1, |x|) or f(x) is exactly 0.
func bracketRoot(f func(float64) float64, lo, hi, flo, fhi, tol float64, maxIter int) rootResult {
	side := 0
	x := lo
	for it := 1; it <= maxIter; it++ {
		width := hi - lo
		if width <= tol*math.Max(1, math.Abs(x)) {
			return rootResult{x: (lo + hi) / 2, iterations: it - 1, width: width, converged: true}
		}
		x = (lo*fhi - hi*flo) / (fhi - flo)
		// A secant point stuck near one end shrinks the bracket slowly;
		// bisection guarantees it halves.
		if !(x > lo+0.01*width && x < hi-0.01*width) {
			x = lo + width/2
		}
		fx := f(x)
		switch {
		case fx == 0:
			return rootResult{x: x, iterations: it, width: 0, converged: true}
		case math.Signbit(fx) == math.Signbit(fhi):
			hi, fhi = x, fx
			if side == -1 {
				flo /= 2
			}
			side = -1
		default:
			lo, flo = x, fx
			if side == 1 {
				fhi /= 2
			}
			side = 1
		}
	}
	width := hi - lo
	return rootResult{x: (lo + hi) / 2, iterations: maxIter, width: width,
		converged: width <= tol*math.Max(1, math.Abs((lo+hi)/2))}
}

// expandUpper doubles hi from start until f(hi) has the sign opposite to
// positive (f(hi) < 0), for a function known to be positive at the lower
// end and negative for large arguments. It gives up after 200 doublings.
func expandUpper(f func(float64) float64, start float64) (hi, fhi float64, ok bool) {
	hi = start
	for range 200 {
		fhi = f(hi)
		if fhi < 0 {
			return hi, fhi, true
		}
		if math.IsNaN(fhi) {
			return hi, fhi, false
		}
		hi *= 2
	}
	return hi, fhi, false
}
