package correlation_test

import (
	"fmt"

	"coefaudit/infer/correlation"
)

// A paper reports that variable j correlates .50 with k and .30 with h in
// one sample of 100, with r(k,h) = .40, and claims the first association is
// stronger. (Invented numbers; the printed values are derived here, not
// published: see TestOverlappingMethods.)
func ExampleCompareOverlapping() {
	c, err := correlation.CompareOverlapping(0.50, 0.30, 0.40, 100, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	p := c.Primary
	fmt.Printf("%s: t(%.0f) = %.3f, p = %.4f\n", p.Method, p.DF, p.Stat, p.P)
	for _, a := range c.Alternatives[:2] {
		fmt.Printf("%s: z = %.3f, p = %.4f\n", a.Method, a.Stat, a.P)
	}
	fmt.Printf("r1 - r2 = %.2f, 95%% CI (%.4f, %.4f)\n", c.Difference, c.CI[0], c.CI[1])
	// Output:
	// williams-t: t(97) = 2.065, p = 0.0416
	// steiger-z: z = 2.035, p = 0.0419
	// mrr-z: z = 2.027, p = 0.0426
	// r1 - r2 = 0.20, 95% CI (0.0080, 0.3928)
}

// Two correlations of one sample of 100 that share no variable, with the
// four cross correlations printed in the same table (invented numbers; the
// printed values are derived here, not published: see
// TestNonOverlappingMethods).
func ExampleCompareNonOverlapping() {
	s := correlation.NonOverlapping{JK: 0.50, HM: 0.30, JH: 0.40, JM: 0.20, KH: 0.25, KM: 0.35}
	c, err := correlation.CompareNonOverlapping(s, 100, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s: z = %.3f, p = %.4f\n", c.Primary.Method, c.Primary.Stat, c.Primary.P)
	pf := c.Alternatives[1]
	fmt.Printf("%s: z = %.3f, p = %.4f (%d warning)\n", pf.Method, pf.Stat, pf.P, len(pf.Warnings))
	fmt.Printf("95%% CI for the difference (%.4f, %.4f)\n", c.CI[0], c.CI[1])
	// Output:
	// zpf: z = 1.783, p = 0.0745
	// pearson-filon-z: z = 1.809, p = 0.0705 (1 warning)
	// 95% CI for the difference (-0.0200, 0.4186)
}

// The same association measured in women (r = .55, n = 80) and in men
// (r = .42, n = 75), the example of Lane DM, HyperStat Online; the printed
// values are derived here, not published (see TestFisherZTest and
// TestZouIndependentCI).
func ExampleCompareIndependent() {
	c, err := correlation.CompareIndependent(0.55, 80, 0.42, 75, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s: z = %.3f, p = %.4f\n", c.Primary.Method, c.Primary.Stat, c.Primary.P)
	fmt.Printf("r1 - r2 = %.2f, 95%% CI (%.4f, %.4f)\n", c.Difference, c.CI[0], c.CI[1])
	// Output:
	// fisher-z: z = 1.041, p = 0.2978
	// r1 - r2 = 0.13, 95% CI (-0.1139, 0.3778)
}

func ExampleFisherCI() {
	ci, err := correlation.FisherCI(0.55, 80, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("(%.4f, %.4f)\n", ci[0], ci[1])
	// Output:
	// (0.3757, 0.6867)
}
