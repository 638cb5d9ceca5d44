package infer

import (
	"cmp"
	"math"
	"slices"
)

// HolmAdjust returns Holm's step-down adjusted p-values, in the order of p:
//
//	p̃_(i) = max_{j ≤ i} min(1, (m − j + 1) p_(j))
//
// for the p-values sorted ascending, p_(1) ≤ … ≤ p_(m). Rejecting where
// p̃ < α controls the family-wise error rate at α under any dependence.
// NaN entries are left out of the family and stay NaN.
//
// References:
//
//	[1] Holm S (1979). A simple sequentially rejective multiple test
//	    procedure. Scandinavian Journal of Statistics 6(2):65–70.
func HolmAdjust(p []float64) []float64 {
	var buf [familyOnStack]int
	idx, out := familyOrder(p, buf[:0])
	m := float64(len(idx))
	running := 0.0
	for rank, i := range idx {
		running = math.Max(running, math.Min(1, (m-float64(rank))*p[i]))
		out[i] = running
	}
	return out
}

// BenjaminiHochbergAdjust returns the Benjamini–Hochberg step-up adjusted
// p-values (q-values), in the order of p:
//
//	p̃_(i) = min_{j ≥ i} min(1, m p_(j) / j).
//
// Rejecting where p̃ ≤ q controls the false discovery rate at q for
// independent or positively dependent tests. NaN entries are left out of
// the family and stay NaN.
//
// References:
//
//	[1] Benjamini Y, Hochberg Y (1995). Controlling the false discovery
//	    rate: a practical and powerful approach to multiple testing.
//	    Journal of the Royal Statistical Society B 57(1):289–300.
func BenjaminiHochbergAdjust(p []float64) []float64 {
	var buf [familyOnStack]int
	idx, out := familyOrder(p, buf[:0])
	m := float64(len(idx))
	running := 1.0
	for rank := len(idx) - 1; rank >= 0; rank-- {
		i := idx[rank]
		running = math.Min(running, math.Min(1, m*p[i]/float64(rank+1)))
		out[i] = running
	}
	return out
}

// familyOnStack is the family size whose ordering needs no allocation: an
// audit adjusts many small families, one per study.
const familyOnStack = 64

// familyOrder returns the indices of the non-NaN p sorted ascending,
// appended to idx, and an output slice filled with NaN.
func familyOrder(p []float64, idx []int) ([]int, []float64) {
	out := make([]float64, len(p))
	for i, x := range p {
		out[i] = math.NaN()
		if !math.IsNaN(x) {
			idx = append(idx, i)
		}
	}
	slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(p[a], p[b]) })
	return idx, out
}
