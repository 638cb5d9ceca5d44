package meta_test

import (
	"fmt"

	"coefaudit/infer/meta"
)

// The interlaboratory example of Kacker (2004, Metrologia 41:132-136;
// citation from memory), y and v as given in statsmodels'
// statsmodels/stats/tests/results/results_meta.py (SECONDARY). The fixed,
// DL and DL/HKSJ lines agree to the digits shown with R metafor's output
// recorded there (see TestFixedEffect, TestHartungKnapp); the REML,
// prediction, Q-profile and leave-one-out lines have no outside source and
// record this package's output.
func ExampleAnalyze() {
	a, err := meta.Analyze(kackerStudies(), meta.Options{})
	if err != nil {
		fmt.Println("error:", err)
		return
	}
	h := a.Heterogeneity
	fmt.Printf("fixed effect %.4f [%.4f, %.4f]\n", a.Fixed.Estimate, a.Fixed.Low, a.Fixed.High)
	fmt.Printf("Q = %.3f (df %d, p = %.5f), I2 = %.1f%%, H2 = %.3f\n", h.Q, h.DF, h.P, 100*h.I2, h.H2)
	for _, re := range []meta.RandomEffects{a.DerSimonianLaird, a.REML} {
		fmt.Printf("%-4v tau2 = %.4f  Wald [%.4f, %.4f]  HKSJ [%.4f, %.4f]  prediction [%.3f, %.3f]\n",
			re.Method, re.Tau2, re.Wald.Low, re.Wald.High, re.HartungKnapp.Low, re.HartungKnapp.High,
			re.Prediction.Low, re.Prediction.High)
	}
	fmt.Printf("tau2 95%% CI (Q-profile) [%.4f, %.4f]\n", a.Tau2Interval.Low, a.Tau2Interval.High)
	last := a.LeaveOneOut[len(a.LeaveOneOut)-1]
	fmt.Printf("without %s: %.4f, I2 = %.1f%%\n", last.Label, last.Pooled.Estimate, 100*last.I2)
	// Output:
	// fixed effect 62.5834 [62.3720, 62.7948]
	// Q = 24.802 (df 8, p = 0.00168), I2 = 67.7%, H2 = 3.100
	// DL   tau2 = 0.2880  Wald [61.9085, 62.8718]  HKSJ [61.7104, 63.0699]  prediction [60.994, 63.786]
	// REML tau2 = 0.2943  Wald [61.9050, 62.8752]  HKSJ [61.7081, 63.0720]  prediction [60.980, 63.800]
	// tau2 95% CI (Q-profile) [0.0688, 5.5916]
	// without lab 9: 62.2997, I2 = 62.6%
}

// A study with an unusable variance is named by its index.
func ExampleStudyError() {
	studies := []meta.Study{
		{Label: "Smith 2019", Effect: 0.12, Variance: 0.004},
		{Label: "Jones 2021", Effect: 0.30, Variance: 0},
	}
	_, err := meta.Analyze(studies, meta.Options{})
	fmt.Println(err)
	// Output:
	// meta-analysis: study at index 1 ("Jones 2021") has value 0: variance must be positive and finite
}
