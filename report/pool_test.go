package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/pool"
)

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
			files, leftOut := PoolPlotFiles(rep, PoolPlotOptions{Out: tt.out, Dir: tt.dir})
			if leftOut != 0 {
				t.Errorf("PoolPlotFiles() left %d topics out, want 0", leftOut)
			}
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

// TestPoolPlotFilesLimit: at most MaxTopics pooled topics are drawn,
// DefaultMaxPlotTopics by default; topics not pooled have no plot and do
// not count.
func TestPoolPlotFilesLimit(t *testing.T) {
	rep := &pool.Report{}
	for i := range 2*DefaultMaxPlotTopics + 1 {
		tp := pool.Topic{Slug: fmt.Sprintf("t%d", i)}
		if i%2 == 0 { // the odd topics are not pooled
			tp.Random = &pool.Estimate{}
		}
		rep.Topics = append(rep.Topics, tp)
	}
	pooled := DefaultMaxPlotTopics + 1
	tests := []struct {
		max, wantFiles, wantLeftOut int
	}{
		{0, 2 * DefaultMaxPlotTopics, pooled - DefaultMaxPlotTopics},
		{2, 4, pooled - 2},
		{pooled, 2 * pooled, 0},
	}
	for _, tt := range tests {
		files, leftOut := PoolPlotFiles(rep, PoolPlotOptions{Dir: "figs", MaxTopics: tt.max})
		if len(files) != tt.wantFiles || leftOut != tt.wantLeftOut {
			t.Errorf("PoolPlotFiles(MaxTopics %d) = %d files, %d left out; want %d, %d", tt.max, len(files), leftOut, tt.wantFiles, tt.wantLeftOut)
		}
		for _, f := range files {
			if f.Topic%2 != 0 || f.Topic > 2*DefaultMaxPlotTopics {
				t.Errorf("PoolPlotFiles(MaxTopics %d) drew topic %d, which is not pooled", tt.max, f.Topic)
			}
		}
	}
}

// TestWritePoolPlotsNote: every format carries the note on the plots not
// written.
func TestWritePoolPlotsNote(t *testing.T) {
	doc := PoolDocument{Report: writersReport(t), PlotsNote: "Forest plots were drawn for the first 1 pooled topics; 3 more were left out."}
	for _, tt := range []struct {
		name  string
		write func(io.Writer, PoolDocument) error
		want  string
	}{
		{"table", WritePoolTable, doc.PlotsNote},
		{"markdown", WritePoolMarkdown, doc.PlotsNote},
		{"json", WritePoolJSON, `"plots_note": "` + doc.PlotsNote + `"`},
	} {
		var buf bytes.Buffer
		if err := tt.write(&buf, doc); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(buf.String(), tt.want) {
			t.Errorf("%s lacks %q:\n%s", tt.name, tt.want, buf.String())
		}
	}
}

// writersReport has a pooled topic of three ratio-measure claims on the
// log scale with a fourth left out (incomplete), a topic with one claim
// and a claim without topic. The numbers are invented: the writers' tests
// check what is shown, the pooling's own tests the arithmetic.
func writersReport(t *testing.T) *pool.Report {
	t.Helper()
	nan := audit.Number(math.NaN())
	claims := []audit.ClaimResult{
		{Study: "trial 1", Row: 2, Measure: extract.MeasureRR, PoolScale: extract.ScaleLog, PoolEstimate: -0.9, PoolSE: 0.57},
		{Study: "trial 2", Row: 3, Measure: extract.MeasureRR, PoolScale: extract.ScaleLog, PoolEstimate: -1.6, PoolSE: 0.44},
		{Study: "trial 3", Row: 4, Measure: extract.MeasureRR, PoolScale: extract.ScaleLog, PoolEstimate: -1.3, PoolSE: 0.64},
		{Study: "X", Row: 30, Measure: extract.MeasureRR, PoolEstimate: nan, PoolSE: nan, Outcome: audit.Incomplete},
		{Study: "Y", Row: 31, Measure: extract.MeasureB, PoolScale: extract.ScaleAsPrinted, PoolEstimate: 1, PoolSE: 0.5, Topic: "lonely"},
		{Study: "Q", Row: 32, Measure: extract.MeasureB, PoolScale: extract.ScaleAsPrinted, PoolEstimate: 1, PoolSE: 0.5},
	}
	for i := range claims {
		c := &claims[i]
		c.Claim, c.First.Label, c.Second.Label = "c", "vaccinated", "unvaccinated"
		if c.Outcome == "" {
			c.Outcome = audit.Consistent
		}
		if i < 4 {
			c.Topic = "BCG | vaccine"
		}
	}
	rep, err := pool.Run(&audit.Report{Claims: claims, Source: "review.xlsx"}, pool.Options{Method: pool.DL})
	if err != nil {
		t.Fatal(err)
	}
	rep.Plots = []string{"results/pool-bcg-vaccine.svg"}
	return rep
}

func TestWritePoolJSON(t *testing.T) {
	rep := writersReport(t)
	var buf bytes.Buffer
	if err := WritePoolJSON(&buf, PoolDocument{Report: rep}); err != nil {
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
		write func(*bytes.Buffer, *pool.Report) error
		want  []string
	}{
		{"table", func(b *bytes.Buffer, r *pool.Report) error {
			return WritePoolTable(b, PoolDocument{Report: r})
		},
			[]string{"TOPIC BCG | vaccine", "first − second", "Random effects (DL), HKSJ", "t(2) =", "Prediction interval",
				"Ratio of ratios", "Between-study variance τ² =", "Cochran's Q =", "WITHOUT ROW", "row 30 (X, c): its outcome is incomplete",
				"TOPIC lonely", "Only 1 claim(s)", "results/pool-bcg-vaccine.svg", "1 claim(s) have no topic"}},
		{"markdown", func(b *bytes.Buffer, r *pool.Report) error {
			return WritePoolMarkdown(b, PoolDocument{Report: r})
		},
			[]string{"# Pooled differences", `## BCG \| vaccine`, "| Row | Study |", "### Pooled results", "### Heterogeneity",
				"### Leave one out", "### Left out", "- Row 30 (X, c):", "## lonely", "## Forest plots", "- results/pool-bcg-vaccine.svg"}},
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
			if err := WritePoolPlot(&buf, rep.Topics[0], rep.Level, PoolPlotFile{Format: tt.format}); err != nil {
				t.Fatal(err)
			}
			if !bytes.HasPrefix(buf.Bytes(), []byte(tt.magic)) {
				t.Errorf("WritePoolPlot(%s) starts %q, want %q", tt.format, buf.Bytes()[:8], tt.magic)
			}
		})
	}
	if err := WritePoolPlot(&bytes.Buffer{}, rep.Topics[0], rep.Level, PoolPlotFile{Format: "pdf"}); err == nil {
		t.Error("WritePoolPlot(pdf) error = nil, want an error")
	}
	p := PoolPlot(rep.Topics[0], rep.Level, PlotPages(rep.Topics[0])[0])
	if len(p.Rows) != 3 || p.Pooled == nil || !p.Pooled.HasPrediction || !p.Pooled.HasHKSJ || !strings.Contains(p.Scale, "log") {
		t.Errorf("PoolPlot() rows %d, pooled %v, scale %q", len(p.Rows), p.Pooled, p.Scale)
	}
}
