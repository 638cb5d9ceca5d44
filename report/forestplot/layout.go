package forestplot

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/font/liberation"
	"gonum.org/v1/plot/vg"
)

// fonts is a private cache so that drawing never depends on, or changes,
// the global gonum/plot font registry.
var fonts = font.NewCache(liberation.Collection())

func face(size vg.Length, bold bool) font.Face {
	f := font.Font{Typeface: "Liberation", Variant: "Sans"}
	if bold {
		f.Weight = xfont.WeightBold
	}
	return fonts.Lookup(f, size)
}

var (
	titleFace  = face(14, true)
	headFace   = face(9.5, true)
	bodyFace   = face(9.5, false)
	pooledFace = face(9.5, true)
	tickFace   = face(8.5, false)
	noteFace   = face(8.5, false)
)

// Vertical and horizontal metrics in points.
const (
	margin       vg.Length = 16
	titleHeight  vg.Length = 26
	headerHeight vg.Length = 20
	rowHeight    vg.Length = 19
	pooledGap    vg.Length = 6
	pooledHeight vg.Length = 21
	axisHeight   vg.Length = 34 // ticks, tick labels and the axis label
	noteLine     vg.Length = 11.5
	minPlotWidth vg.Length = 150
	plotInset    vg.Length = 8 // keeps markers at the range ends inside the area
	maxNoteLines           = 14
	// beyondAxis is the magnitude past which a finite value is treated like
	// an infinite one: no sensible axis holds it together with the rest.
	beyondAxis = 1e100
)

// rowLayout is a study row, or the pooled and prediction rows, ready to draw.
type rowLayout struct {
	label             string
	est, low, high    float64
	drawn             bool // something of the row goes on the axis
	hasLow, hasHigh   bool // finite bound to draw to
	clipLow, clipHigh bool // infinite bound, drawn to the axis edge
	side              vg.Length
	estText           string
	lowText, highText string
	weightText        string
	centre            vg.Length // y of the row's centre line
	shaded            bool
	kind              rowKind
	barColor          color.Color // of a bar row
}

type rowKind int

const (
	studyRow rowKind = iota
	pooledRow
	barRowKind
)

// layout is the measured, positioned content of a plot; Size and the
// writers share it so that the computed size is the drawn size.
type layout struct {
	width, height vg.Length
	title         string
	axisLabel     string
	ciHeading     string
	rows          []rowLayout
	caption       []string
	notes         []string

	xmin, xmax  float64
	ticks       []float64
	tickLabels  []string
	pooledAt    float64
	hasPooledAt bool
	labelX      vg.Length
	plotX0      vg.Length
	plotX1      vg.Length
	textX0      vg.Length
	estRight    vg.Length
	lowRight    vg.Length
	highRight   vg.Length
	weightRight vg.Length
	titleY      vg.Length
	headerY     vg.Length
	rowsTop     vg.Length
	plotBottom  vg.Length
	axisLabelY  vg.Length
	captionTop  vg.Length
	shortened   int
}

func newLayout(p Plot) *layout {
	l := &layout{width: Width}
	level := p.Level
	if !(level > 0 && level < 1) {
		level = 0.95
	}
	l.ciHeading = fmt.Sprintf("Estimate [%s%% CI]", strconv.FormatFloat(100*level, 'f', -1, 64))
	l.axisLabel = cleanText(p.Scale)
	if l.axisLabel == "" {
		l.axisLabel = "difference"
	}
	var notes []string
	l.rows, notes = studyRows(p.Rows, p.WeightTotal)
	if p.Pooled != nil {
		rows, pn := pooledRows(*p.Pooled)
		l.rows = append(l.rows, rows...)
		notes = append(notes, pn...)
		if isDrawable(p.Pooled.Estimate) {
			l.pooledAt, l.hasPooledAt = p.Pooled.Estimate, true
		}
	}
	if len(p.Rows) == 0 {
		notes = append(notes, "No studies to show.")
	}
	l.setAxis()
	l.formatNumbers(p.Decimals)
	l.setColumns()
	l.title = fitText(cleanText(p.Topic), titleFace, l.width-2*margin)
	if l.title == "" {
		l.title = "Forest plot"
	}
	if l.shortened > 0 {
		notes = append(notes, fmt.Sprintf("%d label(s) shortened with an ellipsis to fit the label column.", l.shortened))
	}
	for _, n := range p.Notes {
		if n = cleanText(n); n != "" {
			notes = append(notes, n)
		}
	}
	usable := l.width - 2*margin
	l.caption = wrapText(l.captionText(p, level), noteFace, usable)
	for _, n := range notes {
		l.notes = append(l.notes, wrapText(n, noteFace, usable)...)
	}
	if len(l.notes) > maxNoteLines {
		extra := len(l.notes) - (maxNoteLines - 1)
		l.notes = append(l.notes[:maxNoteLines-1], fmt.Sprintf("… and %d more note line(s).", extra))
	}
	l.setRowsVertically()
	return l
}

// studyRows turns the input rows into drawable rows and notes on what
// could not be drawn.
func studyRows(in []Row, total float64) ([]rowLayout, []string) {
	var notes []string
	var wmax, wsum float64
	for _, r := range in {
		if r.Weight > 0 && !math.IsInf(r.Weight, 1) {
			wmax = math.Max(wmax, r.Weight)
			wsum += r.Weight
		}
	}
	if total > 0 && !math.IsInf(total, 1) {
		wsum = total
	}
	out := make([]rowLayout, len(in))
	for i, r := range in {
		label := cleanText(r.Label)
		if label == "" {
			label = fmt.Sprintf("Study %d", i+1)
		}
		rl, rn := intervalRow(label, r.Estimate, r.Low, r.High)
		notes = append(notes, rn...)
		rl.kind = studyRow
		rl.shaded = i%2 == 1
		switch {
		case wmax == 0:
			rl.side = 7
		case r.Weight > 0 && !math.IsInf(r.Weight, 1):
			// Area proportional to weight: side ∝ √weight.
			rl.side = 4 + 8*vg.Length(math.Sqrt(r.Weight/wmax))
			// Below 1% two decimals, so that a claim among thousands does not
			// read 0.0%.
			pct := 100 * r.Weight / wsum
			rl.weightText = fmt.Sprintf("%.1f%%", pct)
			if pct < 1 {
				rl.weightText = fmt.Sprintf("%.2f%%", pct)
			}
		default:
			rl.side = 4
		}
		out[i] = rl
	}
	return out, notes
}

// pooledRows returns the diamond row and, if asked for, the HKSJ and
// prediction bars.
func pooledRows(p Pooled) ([]rowLayout, []string) {
	label := cleanText(p.Label)
	if label == "" {
		label = "Random-effects estimate"
	}
	d, notes := intervalRow(label, p.Estimate, p.Low, p.High)
	d.kind = pooledRow
	rows := []rowLayout{d}
	if p.HasHKSJ {
		r, n := barRow("HKSJ interval", p.HKSJLow, p.HKSJHigh, pooledColor)
		rows, notes = append(rows, r), append(notes, n...)
	}
	if p.HasPrediction {
		r, n := barRow("Prediction interval", p.PredLow, p.PredHigh, predColor)
		rows, notes = append(rows, r), append(notes, n...)
	}
	return rows, notes
}

// barRow is an interval drawn as a bar with no point of its own: it is
// drawn when both ends are known, even if one is cut at the axis.
func barRow(label string, low, high float64, clr color.Color) (rowLayout, []string) {
	r := rowLayout{label: label, kind: barRowKind, est: math.NaN(), barColor: clr}
	notes := classifyBounds(&r, low, high)
	r.drawn = (r.hasLow || r.clipLow) && (r.hasHigh || r.clipHigh)
	switch {
	case !r.drawn:
		notes = append(notes, label+": a bound is missing; not drawn.")
	case r.clipLow || r.clipHigh:
		notes = append(notes, label+": it runs beyond the axis (an infinite or extreme bound); the arrow marks where it is cut.")
	}
	return r, notes
}

// intervalRow classifies an estimate and its bounds for drawing.
func intervalRow(label string, est, low, high float64) (rowLayout, []string) {
	r := rowLayout{label: label, est: est}
	notes := classifyBounds(&r, low, high)
	r.drawn = isDrawable(est)
	switch {
	case !r.drawn:
		notes = append(notes, fmt.Sprintf("%q: estimate %v cannot be placed on the axis; row not drawn.", label, est))
	case r.clipLow || r.clipHigh:
		notes = append(notes, fmt.Sprintf("%q: the interval runs beyond the axis (an infinite or extreme bound); the arrow marks where it is cut.", label))
	}
	if r.drawn && ((!r.hasLow && !r.clipLow) || (!r.hasHigh && !r.clipHigh)) {
		notes = append(notes, fmt.Sprintf("%q: an interval bound is missing; only the known part is drawn.", label))
	}
	return r, notes
}

// classifyBounds stores low and high in r, swapping reversed bounds, and
// marks each as drawable, to be cut at the axis edge (infinite or beyond
// ±1e100 on its own side), or missing.
func classifyBounds(r *rowLayout, low, high float64) []string {
	var notes []string
	if isDrawable(low) && isDrawable(high) && low > high {
		low, high = high, low
		notes = append(notes, fmt.Sprintf("%q: interval bounds were reversed; drawn from the smaller to the larger.", r.label))
	}
	r.low, r.high = low, high
	r.hasLow, r.clipLow = isDrawable(low), low < -beyondAxis
	r.hasHigh, r.clipHigh = isDrawable(high), high > beyondAxis
	return notes
}

func isDrawable(x float64) bool {
	return !math.IsNaN(x) && math.Abs(x) <= beyondAxis
}

// setAxis chooses the axis range and ticks from every drawable value and 0.
func (l *layout) setAxis() {
	lo, hi := 0.0, 0.0 // the null line is always shown
	for _, r := range l.rows {
		if !r.drawn {
			continue
		}
		for _, v := range []float64{r.est, r.low, r.high} {
			if isDrawable(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if hi-lo == 0 {
		lo, hi = -1, 1
	}
	step := niceStep((hi - lo) / 6)
	l.xmin = math.Floor(lo/step) * step
	l.xmax = math.Ceil(hi/step) * step
	decimals := max(0, int(-math.Floor(math.Log10(step)+1e-9)))
	for i := 0; ; i++ {
		v := l.xmin + float64(i)*step
		if v > l.xmax+step*1e-9 || i > 50 {
			break
		}
		l.ticks = append(l.ticks, v)
		l.tickLabels = append(l.tickLabels, formatNumber(v, decimals))
	}
}

// niceStep rounds a raw tick step to 1, 2 or 5 times a power of ten.
func niceStep(raw float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	switch m := raw / p; {
	case m < 1.5:
		return p
	case m < 3.5:
		return 2 * p
	case m < 7.5:
		return 5 * p
	default:
		return 10 * p
	}
}

// formatNumbers writes the figures of every row with the decimals asked
// for or, for 0, with decimals suited to the axis span: two for a span of
// about 1 to 10, one more per decade less.
func (l *layout) formatNumbers(decimals int) {
	if decimals <= 0 {
		span := l.xmax - l.xmin
		decimals = min(6, max(0, 2-int(math.Floor(math.Log10(span)))))
	}
	for i := range l.rows {
		r := &l.rows[i]
		if r.kind != barRowKind {
			r.estText = boundText(r.est, decimals)
			if !r.drawn {
				r.estText = "not drawn"
			}
		}
		r.lowText = "[" + boundText(r.low, decimals) + ","
		r.highText = boundText(r.high, decimals) + "]"
	}
}

// setColumns measures the text columns and gives the rest to the plot.
func (l *layout) setColumns() {
	var estW, lowW, highW vg.Length
	for _, r := range l.rows {
		f := bodyFace
		if r.kind == pooledRow {
			f = pooledFace
		}
		estW = max(estW, f.Width(r.estText))
		lowW = max(lowW, f.Width(r.lowText))
		highW = max(highW, f.Width(r.highText))
	}
	const gap = 5
	block := max(headFace.Width(l.ciHeading), estW+gap+lowW+gap+highW)
	weightW := max(headFace.Width("Weight"), bodyFace.Width("100.0%"))

	l.weightRight = l.width - margin
	l.highRight = l.weightRight - weightW - 16
	l.lowRight = l.highRight - highW - gap
	l.estRight = l.lowRight - lowW - gap
	l.textX0 = l.highRight - block
	l.plotX1 = l.textX0 - 14

	l.labelX = margin
	maxLabel := min(0.32*l.width, l.plotX1-minPlotWidth-12-l.labelX)
	var labelW vg.Length
	for i := range l.rows {
		r := &l.rows[i]
		f := bodyFace
		if r.kind != studyRow {
			f = pooledFace
		}
		if short := fitText(r.label, f, maxLabel); short != r.label {
			r.label = short
			l.shortened++
		}
		labelW = max(labelW, f.Width(r.label))
	}
	labelW = max(labelW, headFace.Width("Study"))
	l.plotX0 = l.labelX + labelW + 12
}

// setRowsVertically places everything from the top down; vg's y axis
// points up, so positions are height minus the running offset.
func (l *layout) setRowsVertically() {
	n := 0
	var extra vg.Length
	for _, r := range l.rows {
		switch r.kind {
		case studyRow:
			n++
		case pooledRow:
			extra += pooledGap + pooledHeight
		case barRowKind:
			extra += rowHeight
		}
	}
	body := headerHeight + vg.Length(n)*rowHeight + extra + axisHeight
	notes := vg.Length(len(l.caption)+len(l.notes))*noteLine + 8
	l.height = margin + titleHeight + body + notes + margin

	top := l.height - margin
	l.titleY = top - titleHeight/2
	top -= titleHeight
	l.headerY = top - headerHeight/2
	top -= headerHeight
	l.rowsTop = top
	for i := range l.rows {
		r := &l.rows[i]
		switch r.kind {
		case studyRow:
			r.centre = top - rowHeight/2
			top -= rowHeight
		case pooledRow:
			top -= pooledGap
			r.centre = top - pooledHeight/2
			top -= pooledHeight
		case barRowKind:
			r.centre = top - rowHeight/2
			top -= rowHeight
		}
	}
	l.plotBottom = top - 4
	l.axisLabelY = l.plotBottom - axisHeight + 8
	l.captionTop = l.plotBottom - axisHeight - 6
}

// captionText explains the symbols that are actually drawn.
func (l *layout) captionText(p Plot, level float64) string {
	pct := strconv.FormatFloat(100*level, 'f', -1, 64) + "%"
	parts := []string{"Squares: study estimates, area proportional to weight; lines: " + pct + " confidence intervals."}
	if p.Pooled != nil {
		parts = append(parts, "Diamond: pooled random-effects estimate, its width the "+pct+" Wald confidence interval (dotted line at the estimate).")
		if p.Pooled.HasHKSJ {
			parts = append(parts, "Teal bar: the same estimate's "+pct+" Hartung–Knapp–Sidik–Jonkman (HKSJ) interval.")
		}
		if p.Pooled.HasPrediction {
			parts = append(parts, "Amber bar: "+pct+" prediction interval for the effect in a new study.")
		}
	}
	parts = append(parts, "Dashed line: no difference (0).")
	return strings.Join(parts, " ")
}

// x maps a value on the axis to a horizontal position.
func (l *layout) x(v float64) vg.Length {
	span := l.plotX1 - l.plotX0 - 2*plotInset
	return l.plotX0 + plotInset + vg.Length((v-l.xmin)/(l.xmax-l.xmin))*span
}
