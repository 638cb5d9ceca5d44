package report

import (
	"encoding/xml"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// unknown is a number the report does not know.
var unknown = audit.Number(math.NaN())

func chartClaim() audit.ClaimResult {
	return audit.ClaimResult{Claim: "c1", Alpha: 0.05, Measure: extract.MeasureB, Scale: extract.ScaleAsPrinted,
		First:      audit.Side{Label: "women", Estimate: 0.41, SE: 0.05},
		Second:     audit.Side{Label: "men", Estimate: 0.18, SE: 0.06},
		Difference: 0.23, DifferenceSE: unknown, DifferenceCI: [2]audit.Number{0.077, 0.383}}
}

func TestChartRows(t *testing.T) {
	// z(0.975) = 1.959964 (standard normal quantile; e.g. Abramowitz &
	// Stegun 1964, Table 26.5). Arithmetic: 0.41 ± 1.959964·0.05 =
	// 0.3120018 to 0.5079982.
	corr := chartClaim()
	corr.Measure, corr.Scale = extract.MeasureR, "correlation"
	// Fisher (1921): r = 0.5, n = 100 gives z = atanh 0.5 = 0.5493061 with
	// SE 1/√97 = 0.1015346; z ± 1.959964·SE = 0.3503020 to 0.7483103, and
	// tanh of those is 0.336643 to 0.634140 (the usual ".34 to .63" for
	// r = .50, n = 100; rounded value from memory).
	corr.First = audit.Side{Label: "r1", Estimate: audit.Number(math.Atanh(0.5)), SE: audit.Number(1 / math.Sqrt(97))}
	onlySE := chartClaim()
	onlySE.DifferenceCI = [2]audit.Number{unknown, unknown}
	onlySE.DifferenceSE = 0.078
	tests := []struct {
		name       string
		c          audit.ClaimResult
		row        int
		est, lo, h float64
		tol        float64
	}{
		{"first estimate ± 1.96 SE", chartClaim(), 0, 0.41, 0.3120018, 0.5079982, 1e-6},
		{"difference uses its CI", chartClaim(), 2, 0.23, 0.077, 0.383, 1e-12},
		{"correlation moved by tanh", corr, 0, 0.5, 0.336643, 0.634140, 1e-6},
		// 0.23 ± 1.959964·0.078 = 0.0771228 to 0.3828772.
		{"difference from its SE", onlySE, 2, 0.23, 0.0771228, 0.3828772, 1e-6},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			rows := chartRows(&tt.c)
			if len(rows) != 3 {
				t.Fatalf("chartRows() gave %d rows, want 3", len(rows))
			}
			r := rows[tt.row]
			for _, v := range []struct {
				what      string
				got, want float64
			}{{"estimate", r.est, tt.est}, {"low", r.lo, tt.lo}, {"high", r.hi, tt.h}} {
				if math.Abs(v.got-v.want) > tt.tol {
					t.Errorf("chartRows() row %d %s = %.7g, want %.7g", tt.row, v.what, v.got, v.want)
				}
			}
		})
	}
}

func TestChartRowsUnknown(t *testing.T) {
	c := audit.ClaimResult{Claim: "x", First: audit.Side{Estimate: unknown, SE: unknown}, Second: audit.Side{Estimate: unknown, SE: unknown},
		Difference: unknown, DifferenceSE: unknown, DifferenceCI: [2]audit.Number{unknown, unknown}}
	if got := intervalChartSVG(&c); got != "" {
		t.Errorf("intervalChartSVG(nothing known) = %q, want no chart", got)
	}
	c.Difference = -0.3 // the admissible range: a difference without an SE
	rows := chartRows(&c)
	if len(rows) != 1 || !math.IsNaN(rows[0].lo) || rows[0].intervalLabel != "interval not known" {
		t.Errorf("chartRows(difference only) = %+v, want the point alone", rows)
	}
}

func TestNiceStep(t *testing.T) {
	tests := []struct{ raw, want float64 }{{0.13, 0.2}, {0.7, 1}, {3, 5}, {0.04, 0.05}, {12, 20}, {0, 1}}
	for _, tt := range tests {
		if got := niceStep(tt.raw); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("niceStep(%g) = %g, want %g", tt.raw, got, tt.want)
		}
	}
}

// TestIntervalChartSVG checks that the chart is well-formed XML, escapes
// its labels, draws the zero line inside the axis and an interval per row.
func TestIntervalChartSVG(t *testing.T) {
	c := chartClaim()
	c.First.Label = `<b>&"women"`
	svg := intervalChartSVG(&c)
	if strings.Contains(svg, "<b>") {
		t.Fatal("a label reached the SVG unescaped")
	}
	dec := xml.NewDecoder(strings.NewReader(svg))
	counts := map[string]int{}
	var zeroX, axisX1, axisX2 string
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("the chart is not well-formed XML: %v\n%s", err, svg)
		}
		if se, ok := tok.(xml.StartElement); ok {
			class := ""
			attrs := map[string]string{}
			for _, a := range se.Attr {
				attrs[a.Name.Local] = a.Value
			}
			class = attrs["class"]
			counts[se.Name.Local+"."+class]++
			switch class {
			case "zero":
				zeroX = attrs["x1"]
			case "axis":
				axisX1, axisX2 = attrs["x1"], attrs["x2"]
			}
		}
	}
	if counts["line.ci"] != 3 || counts["line.zero"] != 1 || counts["circle.point"] != 2 || counts["path.point"] != 1 {
		t.Errorf("chart elements = %v, want 3 intervals, 1 zero line, 2 estimate dots and 1 difference diamond", counts)
	}
	if !(atof(zeroX) >= atof(axisX1) && atof(zeroX) <= atof(axisX2)) {
		t.Errorf("zero line at x = %s outside the axis %s to %s", zeroX, axisX1, axisX2)
	}
	if !strings.Contains(svg, "&lt;b&gt;&amp;&#34;women&#34;") {
		t.Error("the escaped label is missing from the chart")
	}
}

func atof(s string) float64 {
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return math.NaN()
	}
	return f
}
