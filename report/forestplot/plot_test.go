package forestplot_test

import (
	"bytes"
	"encoding/xml"
	"errors"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"strings"
	"testing"

	"coefaudit/report/forestplot"
)

// demoRows is invented data for drawing, with no statistical meaning.
func demoRows() []forestplot.Row {
	return []forestplot.Row{
		{Label: "Adams 2015", Estimate: -0.42, Low: -0.80, High: -0.04, Weight: 12},
		{Label: "Baker & Chen 2017", Estimate: -0.10, Low: -0.35, High: 0.15, Weight: 20},
		{Label: "Diaz 2019", Estimate: 0.05, Low: -0.30, High: 0.40, Weight: 15},
		{Label: "Evans et al. 2021", Estimate: -0.55, Low: -1.10, High: 0.00, Weight: 8},
	}
}

func demoPooled() *forestplot.Pooled {
	return &forestplot.Pooled{Estimate: -0.21, Low: -0.42, High: 0.00, PredLow: -0.75, PredHigh: 0.33, HasPrediction: true}
}

var longLabel = strings.Repeat("A study label far too long for any label column ", 4)

// cases are the inputs every writer must survive.
func cases() []struct {
	name   string
	plot   forestplot.Plot
	labels []string // texts the drawing must contain
} {
	return []struct {
		name   string
		plot   forestplot.Plot
		labels []string
	}{
		{name: "typical", plot: forestplot.Plot{Topic: "Sex difference in the SES slope", Scale: "difference (log ratio scale)",
			Rows: demoRows(), Pooled: demoPooled()},
			labels: []string{"Sex difference in the SES slope", "difference (log ratio scale)", "Adams 2015", "Baker &amp; Chen 2017",
				"Diaz 2019", "Evans et al. 2021", "Random-effects estimate", "Prediction interval"}},
		{name: "one study", plot: forestplot.Plot{Topic: "One", Rows: demoRows()[:1]}, labels: []string{"Adams 2015", "difference"}},
		{name: "no studies", plot: forestplot.Plot{Topic: "Empty"}, labels: []string{"Empty", "No studies to show."}},
		{name: "identical intervals", plot: forestplot.Plot{Topic: "Same",
			Rows:   []forestplot.Row{{"a", 0.3, 0.3, 0.3, 1}, {"b", 0.3, 0.3, 0.3, 1}},
			Pooled: &forestplot.Pooled{Estimate: 0.3, Low: 0.3, High: 0.3, PredLow: 0.3, PredHigh: 0.3, HasPrediction: true}},
			labels: []string{"a", "b"}},
		{name: "all zero", plot: forestplot.Plot{Topic: "Zero", Rows: []forestplot.Row{{"z", 0, 0, 0, 0}}}, labels: []string{"z"}},
		{name: "infinite and NaN bounds", plot: forestplot.Plot{Topic: "Bad numbers", Rows: []forestplot.Row{
			{"upper infinite", 0.2, 0.1, math.Inf(1), 1},
			{"lower infinite", -0.2, math.Inf(-1), 0.1, 1},
			{"estimate NaN", math.NaN(), 0.1, 0.2, 1},
			{"estimate infinite", math.Inf(1), 0, 1, 1},
			{"bound NaN", 0.1, math.NaN(), 0.3, math.NaN()},
			{"reversed", 0.1, 0.4, -0.2, -3},
			{"huge", 1e200, 1e199, 1e201, 1},
		}, Pooled: &forestplot.Pooled{Estimate: math.NaN(), Low: 0, High: 1, PredLow: math.Inf(-1), PredHigh: math.Inf(1), HasPrediction: true}},
			labels: []string{"upper infinite", "lower infinite", "estimate NaN", "estimate infinite", "bound NaN", "reversed", "huge",
				"cannot be placed on the axis", "runs beyond the axis", "bounds were reversed", "bound is missing"}},
		{name: "long and odd labels", plot: forestplot.Plot{Topic: longLabel + longLabel, Rows: []forestplot.Row{
			{longLabel, 0.1, 0, 0.2, 1}, {"tab\tnewline\nctrl\x01 <b>&amp;", 0.2, 0.1, 0.3, 1}, {"bad utf8 \xff!", 0.1, 0, 0.2, 1}, {"", 0, -1, 1, 1},
		}, Level: 0.9}, labels: []string{"A study label far too long", "tab newline ctrl &lt;b&gt;&amp;amp;", "bad utf8", "Study 4",
			"90% CI", "shortened with an ellipsis"}},
	}
}

// svgTexts parses an SVG document completely and returns its root element
// name and the character data of its text elements, joined by newlines.
func svgTexts(t *testing.T, doc []byte) (root string, texts string) {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(doc))
	var b strings.Builder
	inText := 0
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if root == "" {
				root = el.Name.Local
			}
			if el.Name.Local == "text" {
				inText++
			}
		case xml.EndElement:
			if el.Name.Local == "text" {
				inText--
				b.WriteByte('\n')
			}
		case xml.CharData:
			if inText > 0 {
				b.Write(el)
			}
		}
	}
	return root, b.String()
}

func TestWriteSVG(t *testing.T) {
	for _, tt := range cases() {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := forestplot.WriteSVG(&buf, tt.plot); err != nil {
				t.Fatalf("WriteSVG(%s) error: %v", tt.name, err)
			}
			root, texts := svgTexts(t, buf.Bytes())
			if root != "svg" {
				t.Fatalf("WriteSVG(%s) root element = %q, want svg", tt.name, root)
			}
			for _, want := range tt.labels {
				// Character data comes back unescaped once; a label that
				// itself contains entity text stays escaped once.
				want = xmlUnescape(want)
				if !strings.Contains(texts, want) {
					t.Errorf("WriteSVG(%s) text lacks %q; texts:\n%s", tt.name, want, texts)
				}
			}
		})
	}
}

func xmlUnescape(s string) string {
	return strings.NewReplacer("&lt;", "<", "&gt;", ">", "&amp;", "&").Replace(s)
}

// pixels at 96 dpi of a length in points, rounded as the PNG canvas does.
func pixels(points float64) int { return int(points/72*forestplot.DPI + 0.5) }

func TestWritePNG(t *testing.T) {
	for _, tt := range cases() {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := forestplot.WritePNG(&buf, tt.plot); err != nil {
				t.Fatalf("WritePNG(%s) error: %v", tt.name, err)
			}
			img, err := png.Decode(&buf)
			if err != nil {
				t.Fatalf("WritePNG(%s) output does not decode: %v", tt.name, err)
			}
			w, h := forestplot.Size(tt.plot)
			want := image.Rect(0, 0, pixels(w.Points()), pixels(h.Points()))
			if img.Bounds() != want {
				t.Errorf("WritePNG(%s) image bounds = %v, want %v", tt.name, img.Bounds(), want)
			}
			// Issue 20: print resolution, 300 dpi at the stated 7.5 in.
			if got := img.Bounds().Dx(); got != 2250 {
				t.Errorf("WritePNG(%s) width = %d px, want 2250 (7.5 in at 300 dpi)", tt.name, got)
			}
		})
	}
}

// Each study row adds the same height, and nothing else changes the width.
func TestSizeGrowsByRow(t *testing.T) {
	rows := demoRows()
	_, h1 := forestplot.Size(forestplot.Plot{Rows: rows[:1]})
	_, h3 := forestplot.Size(forestplot.Plot{Rows: rows[:3]})
	w4, h4 := forestplot.Size(forestplot.Plot{Rows: rows[:4]})
	if step := h4 - h3; math.Abs(float64((h3-h1)/2-step)) > 1e-9 || step <= 0 {
		t.Errorf("Size() heights %v, %v, %v for 1, 3, 4 rows: want equal positive steps", h1, h3, h4)
	}
	if w4 != forestplot.Width {
		t.Errorf("Size() width = %v, want %v", w4, forestplot.Width)
	}
}

// countColour counts pixels within 12 per channel of c.
func countColour(img image.Image, c color.RGBA) int {
	n := 0
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if near(r>>8, c.R) && near(g>>8, c.G) && near(bl>>8, c.B) {
				n++
			}
		}
	}
	return n
}

func near(a uint32, b uint8) bool { return math.Abs(float64(a)-float64(b)) <= 12 }

// A golden-free check of the picture itself: the diamond's teal and the
// prediction bar's amber appear exactly when the input asks for them, and
// a larger weight gives a larger square (more study-coloured pixels).
func TestPNGContent(t *testing.T) {
	teal := color.RGBA{R: 0x0f, G: 0x76, B: 0x6e}
	amber := color.RGBA{R: 0xd9, G: 0x77, B: 0x06}
	slate := color.RGBA{R: 0x24, G: 0x3b, B: 0x53}
	render := func(p forestplot.Plot) image.Image {
		var buf bytes.Buffer
		if err := forestplot.WritePNG(&buf, p); err != nil {
			t.Fatalf("WritePNG error: %v", err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatalf("png.Decode error: %v", err)
		}
		return img
	}
	noPred := *demoPooled()
	noPred.HasPrediction = false
	tests := []struct {
		name              string
		pooled            *forestplot.Pooled
		wantTeal, wantAmb bool
	}{
		{"with prediction", demoPooled(), true, true},
		{"without prediction", &noPred, true, false},
		{"no pooled estimate", nil, false, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			img := render(forestplot.Plot{Topic: "t", Rows: demoRows(), Pooled: tt.pooled})
			// Thresholds: the diamond covers hundreds of pixels, the bar over
			// a hundred; anti-aliased text of other colours stays far below.
			if got := countColour(img, teal) > 200; got != tt.wantTeal {
				t.Errorf("WritePNG(%s): teal diamond present = %v, want %v", tt.name, got, tt.wantTeal)
			}
			if got := countColour(img, amber) > 100; got != tt.wantAmb {
				t.Errorf("WritePNG(%s): amber prediction bar present = %v, want %v", tt.name, got, tt.wantAmb)
			}
		})
	}
	light := render(forestplot.Plot{Rows: []forestplot.Row{{"a", 0, -1, 1, 1}, {"b", 0, -1, 1, 100}}})
	heavy := render(forestplot.Plot{Rows: []forestplot.Row{{"a", 0, -1, 1, 100}, {"b", 0, -1, 1, 100}}})
	if countColour(light, slate) >= countColour(heavy, slate) {
		t.Errorf("WritePNG: squares for weights (1, 100) cover %d pixels, for (100, 100) %d; want fewer",
			countColour(light, slate), countColour(heavy, slate))
	}
}

// The number of study squares in the SVG equals the number of drawable
// study rows.
func TestSVGMarkers(t *testing.T) {
	for _, tt := range cases() {
		t.Run(tt.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := forestplot.WriteSVG(&buf, tt.plot); err != nil {
				t.Fatalf("WriteSVG(%s) error: %v", tt.name, err)
			}
			want := 0
			for _, r := range tt.plot.Rows {
				if !math.IsNaN(r.Estimate) && math.Abs(r.Estimate) <= 1e100 {
					want++
				}
			}
			if got := strings.Count(buf.String(), "fill:#243B53"); got != want {
				t.Errorf("WriteSVG(%s) has %d study squares, want %d", tt.name, got, want)
			}
		})
	}
}

type failingWriter struct{}

var errDiskFull = errors.New("disk full")

func (failingWriter) Write([]byte) (int, error) { return 0, errDiskFull }

func TestWriteErrors(t *testing.T) {
	p := forestplot.Plot{Topic: "x", Rows: demoRows()}
	if err := forestplot.WriteSVG(failingWriter{}, p); !errors.Is(err, errDiskFull) {
		t.Errorf("WriteSVG(failing writer) error = %v, want %v", err, errDiskFull)
	}
	if err := forestplot.WritePNG(failingWriter{}, p); !errors.Is(err, errDiskFull) {
		t.Errorf("WritePNG(failing writer) error = %v, want %v", err, errDiskFull)
	}
}

// TestIssue20WeightTotal: a page of a larger plot shows each row's weight
// as a share of all rows, not of the page's; below 1% with two decimals.
func TestIssue20WeightTotal(t *testing.T) {
	rows := []forestplot.Row{{Label: "a", Estimate: 0.1, Low: 0, High: 0.2, Weight: 0.25}, {Label: "b", Estimate: 0.2, Low: 0.1, High: 0.3, Weight: 0.004}}
	for _, tt := range []struct {
		total float64
		want  []string
	}{{0, []string{"98.4%", "1.6%"}}, {1, []string{"25.0%", "0.40%"}}} {
		var buf bytes.Buffer
		if err := forestplot.WriteSVG(&buf, forestplot.Plot{Rows: rows, WeightTotal: tt.total}); err != nil {
			t.Fatal(err)
		}
		for _, w := range tt.want {
			if !strings.Contains(buf.String(), ">"+w+"<") {
				t.Errorf("WriteSVG(WeightTotal %v) lacks the weight %s", tt.total, w)
			}
		}
	}
}
