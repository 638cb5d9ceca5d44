package meta

import "math"

// nearTerms is the restricted likelihood of all studies but one, evaluated
// near a fixed τ²₀ in O(1) time instead of O(k). With a_j = v_j + τ²₀ and
// δ = τ² − τ²₀, every sum the REML iteration needs is a power series in δ
// whose coefficients are moments of all the studies,
//
//	Σ_j e_j^q/(a_j + δ)^m = Σ_n C(m+n−1, n) (−δ)^n Σ_j e_j^q a_j^−(m+n),
//	Σ_j log(a_j + δ)      = Σ_j log a_j + Σ_(n≥1) (−1)^(n+1) δ^n/n Σ_j a_j^−n,
//
// for m = 1, 2, 3 and q = 0, 1, 2, with e_j = y_j − c about a centre c
// near the weighted mean. The moments are summed once; the study left out
// is then subtracted term by term, exactly. The series are cut after
// nearOrder terms and used only where |δ| ≤ nearRadius · min_j a_j, where
// what is cut is below (nearRadius)^(nearOrder+1) times a binomial factor
// under 100, about 1e-20 of the sum: below the rounding of the sums
// themselves. Farther from τ²₀ the terms are summed directly.
type nearTerms struct {
	d     data
	tau2  float64 // τ²₀
	c     float64 // the centre of the effects
	reach float64 // the largest |δ| the series is used for
	// mom[p][q] = Σ_j e_j^q a_j^−p for p = 0 … nearOrder+3.
	mom  [nearOrder + 4][3]float64
	logA float64 // Σ_j log a_j
}

const (
	nearOrder  = 8
	nearRadius = 0.01
)

func newNearTerms(d data, tau2, centre float64) *nearTerms {
	n := &nearTerms{d: d, tau2: tau2, c: centre, reach: math.Inf(1)}
	for j, v := range d.v {
		a := v + tau2
		e := d.y[j] - centre
		n.reach = math.Min(n.reach, nearRadius*a)
		n.logA += math.Log(a)
		ap := 1.0 // a^−p
		for p := range n.mom {
			n.mom[p][0] += ap
			n.mom[p][1] += ap * e
			n.mom[p][2] += ap * e * e
			ap /= a
		}
	}
	return n
}

// at evaluates ℓ_R, U and I of the data without study skip at tau2: by the
// series when tau2 is within reach of τ²₀, by direct sums otherwise.
func (n *nearTerms) at(skip int, tau2 float64) remlPoint {
	delta := tau2 - n.tau2
	if !(math.Abs(delta) <= n.reach) {
		return remlTerms(n.d.without(skip), tau2)
	}
	// s[m-1][q] = Σ_j e_j^q w_j^m over all studies, w_j = 1/(a_j + δ).
	var s [3][3]float64
	for m := 1; m <= 3; m++ {
		coef := 1.0 // C(m+n−1, n) (−δ)^n
		for k := 0; k <= nearOrder; k++ {
			for q := range 3 {
				s[m-1][q] += coef * n.mom[m+k][q]
			}
			coef *= -delta * float64(m+k) / float64(k+1)
		}
	}
	logV := n.logA
	pow := 1.0
	for k := 1; k <= nearOrder; k++ {
		pow *= delta
		term := pow / float64(k) * n.mom[k][0]
		if k%2 == 0 {
			term = -term
		}
		logV += term
	}
	// The study left out, subtracted exactly.
	a := n.d.v[skip] + tau2
	e := n.d.y[skip] - n.c
	w := 1 / a
	for m := range 3 {
		wm := math.Pow(w, float64(m+1))
		s[m][0] -= wm
		s[m][1] -= wm * e
		s[m][2] -= wm * e * e
	}
	logV -= math.Log(a)
	sw := s[0][0]
	mu := s[0][1] / sw // in the centred coordinates
	rss := s[0][2] - mu*s[0][1]
	sw2 := s[1][0]
	wr2 := s[1][2] - 2*mu*s[1][1] + mu*mu*sw2
	sw3 := s[2][0]
	return remlPoint{tau2: tau2, mu: n.c + mu, sw: sw,
		ll:    -0.5 * (logV + math.Log(sw) + rss),
		score: 0.5 * (wr2 - sw + sw2/sw),
		info:  0.5 * (sw2 - 2*sw3/sw + sw2*sw2/(sw*sw))}
}
