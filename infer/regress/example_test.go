package regress_test

import (
	"fmt"
	"math"

	"coefaudit/infer/regress"
	"gonum.org/v1/gonum/mat"
)

// Invented demonstration data: y against two predictors.
func ExampleOLS() {
	y := []float64{3.1, 4.9, 7.2, 8.8, 11.1, 12.7, 15.2, 16.8}
	x := [][]float64{
		{1, 2, 3, 4, 5, 6, 7, 8},
		{0.5, 0.1, 0.9, 0.4, 1.0, 0.2, 0.8, 0.3},
	}
	fit, err := regress.OLS(y, x, regress.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for j := range fit.Coefficients {
		fmt.Printf("b%d = %.4f (SE %.4f)\n", j, fit.Coefficients[j], fit.StandardErrors[j])
	}
	fmt.Printf("R² = %.4f, residual df = %d\n", fit.RSquared, fit.ResidualDF)
	// Output:
	// b0 = 0.8281 (SE 0.1068)
	// b1 = 1.9750 (SE 0.0173)
	// b2 = 0.4937 (SE 0.1255)
	// R² = 0.9996, residual df = 5
}

// A correlation table as a paper might print it (invented): outcome first,
// then two predictors, n = 150. Are the two standardized coefficients
// different?
func ExampleFromSummary() {
	r := mat.NewSymDense(3, []float64{
		1, 0.45, 0.30,
		0.45, 1, 0.40,
		0.30, 0.40, 1,
	})
	fit, err := regress.FromSummary(regress.Summary{Correlation: r, N: 150})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("β = %.4f, %.4f; R² = %.4f\n", fit.Standardized[0], fit.Standardized[1], fit.RSquared)
	fmt.Printf("delta-method SEs %.4f, %.4f; standard-method SEs %.4f, %.4f\n",
		fit.StandardizedDeltaSE[0], fit.StandardizedDeltaSE[1], fit.StandardizedSE[0], fit.StandardizedSE[1])
	d, err := regress.TestDifference(fit.Standardized, fit.StandardizedDeltaCov, 0, 1, math.Inf(1), 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("β1 − β2 = %.4f, SE %.4f, z = %.3f, p = %.4f, 95%% CI [%.4f, %.4f]\n",
		d.Estimate, d.SE, d.Statistic, d.P, d.Lower, d.Upper)
	// β = (0.45 − 0.4·0.30)/0.84 = 0.3929 and (0.30 − 0.4·0.45)/0.84 = 0.1429.
	// Output:
	// β = 0.3929, 0.1429; R² = 0.2196
	// delta-method SEs 0.0735, 0.0781; standard-method SEs 0.0795, 0.0795
	// β1 − β2 = 0.2500, SE 0.1316, z = 1.900, p = 0.0574, 95% CI [-0.0079, 0.5079]
}
