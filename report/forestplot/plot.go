package forestplot

import (
	"fmt"
	"image/color"
	"io"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// DPI is the resolution of PNG output in dots per inch: print
// resolution, so that a PNG printed at Width is as sharp as the SVG.
const DPI = 300

// Width is the width of every plot, the size it is meant to be printed at
// (the text width of a journal page, with margins). Heights grow with the
// number of rows. Every text is set in points at this size, none below
// MinTextPoints.
const Width = 7.5 * vg.Inch

// MinTextPoints is the smallest type size used, in points at Width.
const MinTextPoints = 8

// Row is one study.
type Row struct {
	// Label names the study; long labels are shortened with an ellipsis.
	Label string
	// Estimate is the study's difference; Low and High bound its interval.
	Estimate, Low, High float64
	// Weight is the study's weight in the pooled estimate, on any positive
	// scale (it is shown as a percentage of the total). Zero, negative or
	// NaN weights draw the smallest marker and show no percentage.
	Weight float64
}

// Pooled is the pooled random-effects result drawn under the studies.
type Pooled struct {
	// Label names the diamond's row; empty means "Random-effects estimate".
	Label string
	// Estimate is the pooled difference; Low and High bound its interval.
	Estimate, Low, High float64
	// PredLow and PredHigh bound the prediction interval, drawn only when
	// HasPrediction is true.
	PredLow, PredHigh float64
	HasPrediction     bool
	// HKSJLow and HKSJHigh bound the Hartung–Knapp–Sidik–Jonkman interval
	// of the same estimate, drawn as a bar beside the diamond's Wald
	// interval when HasHKSJ is true.
	HKSJLow, HKSJHigh float64
	HasHKSJ           bool
}

// Plot is everything one forest plot shows.
type Plot struct {
	// Topic is the title.
	Topic string
	// Scale is the axis label, e.g. "difference (log ratio scale)"; empty
	// means "difference".
	Scale string
	// Level is the confidence level of the intervals as a proportion, used
	// in the column heading; 0 means 0.95.
	Level float64
	// Rows are the studies, drawn top to bottom in this order.
	Rows []Row
	// Pooled is the pooled estimate; nil draws no diamond.
	Pooled *Pooled
	// Notes are extra footnote lines (e.g. τ² and I²), printed after the
	// plot's own notes.
	Notes []string
	// WeightTotal is the total the weights are shown as percentages of; 0
	// means the sum of Rows' weights. A page of a larger plot gives the
	// total of all its rows.
	WeightTotal float64
	// Decimals is how many decimals the figures column shows; 0 chooses
	// them from the axis span.
	Decimals int
	// EmbedFonts embeds the fonts in SVG output so that it renders the same
	// everywhere, at the cost of about 0.4 MB per font used. PNG ignores it.
	EmbedFonts bool
}

// Size returns the width and height of the drawing of p, in points
// (1/72 inch). A PNG is Width/72·DPI by height/72·DPI pixels, rounded.
func Size(p Plot) (width, height vg.Length) {
	l := newLayout(p)
	return l.width, l.height
}

// WriteSVG draws p as an SVG document to w. It returns the first error of
// writing; no property of the numbers in p is an error.
func WriteSVG(w io.Writer, p Plot) (err error) {
	defer recoverDrawing(&err)
	l := newLayout(p)
	c := vgsvg.NewWith(vgsvg.UseWH(l.width, l.height), vgsvg.EmbedFonts(p.EmbedFonts))
	l.draw(c)
	if _, err := c.WriteTo(w); err != nil {
		return fmt.Errorf("forest plot %q: writing SVG: %w", l.title, err)
	}
	return nil
}

// WritePNG draws p as a PNG image at DPI dots per inch to w. It returns the
// first error of encoding or writing.
func WritePNG(w io.Writer, p Plot) (err error) {
	defer recoverDrawing(&err)
	l := newLayout(p)
	c := vgimg.NewWith(vgimg.UseWH(l.width, l.height), vgimg.UseDPI(DPI), vgimg.UseBackgroundColor(color.White))
	l.draw(c)
	if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(w); err != nil {
		return fmt.Errorf("forest plot %q: writing PNG: %w", l.title, err)
	}
	return nil
}

// recoverDrawing turns a panic inside the graphics library (which panics,
// for instance, on a corrupt font table) into an error, so that one bad
// figure cannot bring down a whole audit report.
func recoverDrawing(err *error) {
	if r := recover(); r != nil {
		*err = fmt.Errorf("forest plot: drawing failed: %v", r)
	}
}
