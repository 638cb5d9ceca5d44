package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
)

// pooled builds a claim as the audit leaves it for pooling.
func pooled(study string, row int, measure, scale string, est, se float64, outcome, topic string) audit.ClaimResult {
	return audit.ClaimResult{Study: study, Claim: "c", Row: row, Measure: measure, PoolScale: scale,
		PoolEstimate: audit.Number(est), PoolSE: audit.Number(se), Outcome: outcome, Topic: topic,
		First: audit.Side{Label: "vaccinated"}, Second: audit.Side{Label: "unvaccinated"}}
}

// bcgClaims are the first three BCG vaccine trials as (a, n1, c, n2): TB
// cases among the vaccinated, number vaccinated, TB cases among the
// unvaccinated, number unvaccinated; Colditz GA et al. (1994), JAMA
// 271(9):698-702. Each claim's difference is the log risk ratio,
// ln(a/n1) − ln(c/n2), with variance 1/a − 1/n1 + 1/c − 1/n2.
func bcgClaims(topic string) []audit.ClaimResult {
	var out []audit.ClaimResult
	for i, t := range [][4]float64{{4, 123, 11, 139}, {6, 306, 29, 303}, {3, 231, 11, 220}} {
		a, n1, c, n2 := t[0], t[1], t[2], t[3]
		out = append(out, pooled(fmt.Sprintf("trial %d", i+1), i+2, extract.MeasureRR, extract.ScaleLog,
			math.Log(a/n1)-math.Log(c/n2), math.Sqrt(1/a-1/n1+1/c-1/n2), audit.Consistent, topic))
	}
	return out
}

func TestPoolPlotFiles(t *testing.T) {
	rep := writersReport(t) // topic "BCG | vaccine" is pooled, "lonely" is not
	res := filepath.Join("results", "pool-bcg-vaccine")
	tests := []struct {
		name, out, dir string
		want           []string
	}{
		{"beside out", filepath.Join("results", "pool.md"), "", []string{res + ".svg", res + ".png"}},
		{"plots dir", "", "figs", []string{filepath.Join("figs", "pool-bcg-vaccine.svg"), filepath.Join("figs", "pool-bcg-vaccine.png")}},
		{"both", "pool.json", "figs", []string{filepath.Join("figs", "pool-bcg-vaccine.svg"), filepath.Join("figs", "pool-bcg-vaccine.png")}},
		{"neither", "", "", nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			files := PoolPlotFiles(rep, tt.out, tt.dir)
			var got []string
			for _, f := range files {
				got = append(got, f.Path)
				if f.Topic != 0 {
					t.Errorf("PoolPlotFiles() topic %d, want 0 (the unpooled topic has no plot)", f.Topic)
				}
			}
			if strings.Join(got, " ") != strings.Join(tt.want, " ") {
				t.Errorf("PoolPlotFiles(%q, %q) = %q, want %q", tt.out, tt.dir, got, tt.want)
			}
		})
	}
}

// writersReport has a pooled topic with a claim left out, a topic with one
// claim and a claim without topic.
func writersReport(t *testing.T) *audit.PoolReport {
	t.Helper()
	claims := append(bcgClaims("BCG | vaccine"),
		pooled("X", 30, extract.MeasureRR, "", math.NaN(), math.NaN(), audit.Incomplete, "BCG | vaccine"),
		pooled("Y", 31, extract.MeasureB, extract.ScaleAsPrinted, 1, 0.5, audit.Consistent, "lonely"),
		pooled("Q", 32, extract.MeasureB, extract.ScaleAsPrinted, 1, 0.5, audit.Consistent, ""))
	rep, err := audit.Pool(&audit.Report{Claims: claims, Source: "review.xlsx"}, audit.PoolOptions{Method: audit.PoolDL})
	if err != nil {
		t.Fatal(err)
	}
	rep.Plots = []string{"results/pool-bcg-vaccine.svg"}
	return rep
}

func TestWritePoolJSON(t *testing.T) {
	rep := writersReport(t)
	var buf bytes.Buffer
	if err := WritePoolJSON(&buf, rep); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Level  float64 `json:"level"`
		Topics []struct {
			Topic   string `json:"topic"`
			Scale   string `json:"scale"`
			Studies []struct {
				Study        string   `json:"study"`
				Row          int      `json:"row"`
				Estimate     *float64 `json:"estimate"`
				WeightRandom *float64 `json:"weight_random"`
			} `json:"studies"`
			Fixed         *struct{ Estimate float64 }   `json:"fixed"`
			HKSJ          *struct{ DF float64 }         `json:"hksj"`
			Random        *struct{ DF *float64 }        `json:"random"`
			Heterogeneity *struct{ Tau2CI [2]*float64 } `json:"heterogeneity"`
			Prediction    *struct{ CI [2]float64 }      `json:"prediction"`
			LeaveOneOut   []struct{ Row int }           `json:"leave_one_out"`
			LeftOut       []struct {
				Row    int
				Reason string
			} `json:"left_out"`
		} `json:"topics"`
		Plots    []string `json:"plots"`
		Cautions []string `json:"cautions"`
	}
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatalf("WritePoolJSON() is not JSON: %v\n%s", err, buf.String())
	}
	if doc.Level != 0.95 || len(doc.Topics) != 2 || len(doc.Plots) != 1 || len(doc.Cautions) != len(audit.Cautions) {
		t.Fatalf("WritePoolJSON() level %v, %d topics, %d plots, %d cautions", doc.Level, len(doc.Topics), len(doc.Plots), len(doc.Cautions))
	}
	b := doc.Topics[0]
	if b.Topic != "BCG | vaccine" || b.Scale != "log" || len(b.Studies) != 3 || b.Fixed == nil || b.HKSJ == nil || b.HKSJ.DF != 2 ||
		b.Random == nil || b.Random.DF != nil || b.Prediction == nil || len(b.LeaveOneOut) != 3 || len(b.LeftOut) != 1 || b.LeftOut[0].Row != 30 {
		t.Errorf("WritePoolJSON() first topic = %+v", b)
	}
	l := doc.Topics[1]
	if l.Fixed != nil || l.Random != nil || l.Heterogeneity != nil || l.Prediction != nil || len(l.Studies) != 1 ||
		l.Studies[0].WeightRandom != nil || l.Studies[0].Estimate == nil || l.LeaveOneOut == nil || l.LeftOut == nil {
		t.Errorf("WritePoolJSON() unpooled topic = %+v; want null results and weights, empty lists", l)
	}
}

func TestWritePoolText(t *testing.T) {
	rep := writersReport(t)
	tests := []struct {
		name  string
		write func(*bytes.Buffer, *audit.PoolReport) error
		want  []string
	}{
		{"table", func(b *bytes.Buffer, r *audit.PoolReport) error { return WritePoolTable(b, r) },
			[]string{"TOPIC BCG | vaccine", "first − second", "Random effects (DL), HKSJ", "t(2) =", "Prediction interval",
				"Ratio of ratios", "Heterogeneity: Q =", "WITHOUT ROW", "row 30 (X, c): its outcome is incomplete",
				"TOPIC lonely", "Only 1 claim(s)", "results/pool-bcg-vaccine.svg", "1 claim(s) have no topic"}},
		{"markdown", func(b *bytes.Buffer, r *audit.PoolReport) error { return WritePoolMarkdown(b, r) },
			[]string{"# Pooled differences", `## BCG \| vaccine`, "| Row | Study |", "### Pooled results", "### Heterogeneity",
				"### Leave one out", "### Left out", "- Row 30 (X, c):", "## lonely", "## Forest plots", "`results/pool-bcg-vaccine.svg`"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := tt.write(&buf, rep); err != nil {
				t.Fatal(err)
			}
			s := buf.String()
			for _, w := range tt.want {
				if !strings.Contains(s, w) {
					t.Errorf("%s output lacks %q:\n%s", tt.name, w, s)
				}
			}
			last := audit.Cautions[len(audit.Cautions)-1]
			if !strings.HasSuffix(strings.TrimSpace(s), last) {
				t.Errorf("%s output does not end with the cautions:\n%s", tt.name, s)
			}
		})
	}
}

func TestWritePoolPlot(t *testing.T) {
	rep := writersReport(t)
	tests := []struct {
		format string
		magic  string
	}{{PlotSVG, "<?xml"}, {PlotPNG, "\x89PNG\r\n\x1a\n"}}
	for _, tt := range tests {
		t.Run(tt.format, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WritePoolPlot(&buf, rep.Topics[0], rep.Level, tt.format); err != nil {
				t.Fatal(err)
			}
			if !bytes.HasPrefix(buf.Bytes(), []byte(tt.magic)) {
				t.Errorf("WritePoolPlot(%s) starts %q, want %q", tt.format, buf.Bytes()[:8], tt.magic)
			}
		})
	}
	if err := WritePoolPlot(&bytes.Buffer{}, rep.Topics[0], rep.Level, "pdf"); err == nil {
		t.Error("WritePoolPlot(pdf) error = nil, want an error")
	}
	p := PoolPlot(rep.Topics[0], rep.Level)
	if len(p.Rows) != 3 || p.Pooled == nil || !p.Pooled.HasPrediction || !strings.Contains(p.Scale, "log") {
		t.Errorf("PoolPlot() rows %d, pooled %v, scale %q", len(p.Rows), p.Pooled, p.Scale)
	}
}
