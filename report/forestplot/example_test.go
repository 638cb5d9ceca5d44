package forestplot_test

import (
	"bytes"
	"fmt"

	"coefaudit/report/forestplot"
)

// Invented data for a demonstration.
func ExampleWriteSVG() {
	p := forestplot.Plot{
		Topic: "Difference between the effects in women and men",
		Scale: "difference (log ratio scale)",
		Rows: []forestplot.Row{
			{Label: "Study A", Estimate: -0.30, Low: -0.62, High: 0.02, Weight: 30},
			{Label: "Study B", Estimate: 0.10, Low: -0.25, High: 0.45, Weight: 25},
			{Label: "Study C", Estimate: -0.05, Low: -0.20, High: 0.10, Weight: 45},
		},
		Pooled: &forestplot.Pooled{Estimate: -0.07, Low: -0.27, High: 0.13, PredLow: -0.80, PredHigh: 0.66, HasPrediction: true},
		Notes:  []string{"DerSimonian-Laird τ² = 0.02."},
	}
	var svg bytes.Buffer
	if err := forestplot.WriteSVG(&svg, p); err != nil {
		fmt.Println("error:", err)
		return
	}
	w, h := forestplot.Size(p)
	fmt.Printf("%.0f x %.0f points, %v\n", w.Points(), h.Points(), bytes.HasPrefix(svg.Bytes(), []byte("<?xml")))
	// Output:
	// 540 x 269 points, true
}
