package forestplot

import (
	"image/color"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// The palette: dark slate for studies, teal for the pooled estimate, amber
// for the prediction interval, greys for structure.
var (
	inkColor    = color.RGBA{R: 0x1f, G: 0x29, B: 0x33, A: 0xff}
	softColor   = color.RGBA{R: 0x52, G: 0x60, B: 0x6d, A: 0xff}
	ruleColor   = color.RGBA{R: 0xcb, G: 0xd2, B: 0xd9, A: 0xff}
	shadeColor  = color.RGBA{R: 0xf3, G: 0xf5, B: 0xf7, A: 0xff}
	nullColor   = color.RGBA{R: 0x7b, G: 0x87, B: 0x94, A: 0xff}
	studyColor  = color.RGBA{R: 0x24, G: 0x3b, B: 0x53, A: 0xff}
	pooledColor = color.RGBA{R: 0x0f, G: 0x76, B: 0x6e, A: 0xff}
	pooledLine  = color.RGBA{R: 0x7f, G: 0xbf, B: 0xb8, A: 0xff}
	predColor   = color.RGBA{R: 0xd9, G: 0x77, B: 0x06, A: 0xff}
	white       = color.RGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xff}
)

// Text alignments as the fraction of the width left of the anchor.
const (
	alignLeft   = 0
	alignCentre = 0.5
	alignRight  = 1
)

// draw paints the whole plot; the order sets what lies on top.
func (l *layout) draw(c vg.Canvas) {
	fillRect(c, 0, 0, l.width, l.height, white)
	for _, r := range l.rows {
		if r.shaded {
			fillRect(c, l.labelX-4, r.centre-rowHeight/2, l.weightRight+4, r.centre+rowHeight/2, shadeColor)
		}
	}
	drawText(c, titleFace, margin, l.titleY, l.title, alignLeft, inkColor)
	drawText(c, headFace, l.labelX, l.headerY, "Study", alignLeft, softColor)
	drawText(c, headFace, l.highRight, l.headerY, l.ciHeading, alignRight, softColor)
	drawText(c, headFace, l.weightRight, l.headerY, "Weight", alignRight, softColor)
	strokeLine(c, l.labelX-4, l.rowsTop, l.weightRight+4, l.rowsTop, 0.8, ruleColor, nil)

	zero := l.x(0)
	strokeLine(c, zero, l.rowsTop, zero, l.plotBottom, 0.9, nullColor, []vg.Length{4, 3})
	if l.hasPooledAt {
		var bottom vg.Length = l.plotBottom
		for _, r := range l.rows {
			if r.kind == pooledRow {
				bottom = r.centre
			}
		}
		at := l.x(l.pooledAt)
		strokeLine(c, at, l.rowsTop, at, bottom, 0.9, pooledLine, []vg.Length{1.2, 2.4})
	}

	for _, r := range l.rows {
		if r.kind == pooledRow {
			top := r.centre + pooledHeight/2 + pooledGap/2
			strokeLine(c, l.labelX-4, top, l.weightRight+4, top, 0.8, ruleColor, nil)
		}
		l.drawRowGraphic(c, r)
		l.drawRowText(c, r)
	}
	l.drawAxis(c)

	y := l.captionTop
	for _, line := range l.caption {
		drawText(c, noteFace, margin, y-noteLine/2, line, alignLeft, softColor)
		y -= noteLine
	}
	for _, line := range l.notes {
		drawText(c, noteFace, margin, y-noteLine/2, line, alignLeft, inkColor)
		y -= noteLine
	}
}

// ends returns where a row's interval starts and stops on the page; an end
// cut at the axis stops at the plot area's edge, a missing one at the
// estimate.
func (l *layout) ends(r rowLayout) (x0, x1 vg.Length) {
	x0, x1 = l.x(r.est), l.x(r.est)
	switch {
	case r.hasLow:
		x0 = l.x(r.low)
	case r.clipLow:
		x0 = l.plotX0
	}
	switch {
	case r.hasHigh:
		x1 = l.x(r.high)
	case r.clipHigh:
		x1 = l.plotX1
	}
	return x0, x1
}

func (l *layout) drawRowGraphic(c vg.Canvas, r rowLayout) {
	if !r.drawn {
		return
	}
	x0, x1 := l.ends(r)
	y := r.centre
	switch r.kind {
	case studyRow:
		strokeLine(c, x0, y, x1, y, 1.2, inkColor, nil)
		drawCuts(c, r, x0, x1, y, inkColor)
		h := r.side / 2
		xe := l.x(r.est)
		fillPolygon(c, studyColor, vg.Point{X: xe - h, Y: y - h}, vg.Point{X: xe + h, Y: y - h},
			vg.Point{X: xe + h, Y: y + h}, vg.Point{X: xe - h, Y: y + h})
	case pooledRow:
		xe := l.x(r.est)
		// A zero-width interval would make the diamond vanish.
		x0, x1 = min(x0, xe-3), max(x1, xe+3)
		const h = 6.5
		fillPolygon(c, pooledColor, vg.Point{X: x0, Y: y}, vg.Point{X: xe, Y: y + h},
			vg.Point{X: x1, Y: y}, vg.Point{X: xe, Y: y - h})
		drawCuts(c, r, x0, x1, y, pooledColor)
	case barRowKind:
		strokeLine(c, x0, y, x1, y, 3, r.barColor, nil)
		if !r.clipLow {
			strokeLine(c, x0, y-4.5, x0, y+4.5, 1.5, r.barColor, nil)
		}
		if !r.clipHigh {
			strokeLine(c, x1, y-4.5, x1, y+4.5, 1.5, r.barColor, nil)
		}
		drawCuts(c, r, x0, x1, y, r.barColor)
	}
}

// drawCuts puts an arrowhead on each end that runs off the axis.
func drawCuts(c vg.Canvas, r rowLayout, x0, x1, y vg.Length, clr color.Color) {
	if r.clipLow {
		fillPolygon(c, clr, vg.Point{X: x0, Y: y}, vg.Point{X: x0 + 6, Y: y + 3.5}, vg.Point{X: x0 + 6, Y: y - 3.5})
	}
	if r.clipHigh {
		fillPolygon(c, clr, vg.Point{X: x1, Y: y}, vg.Point{X: x1 - 6, Y: y + 3.5}, vg.Point{X: x1 - 6, Y: y - 3.5})
	}
}

func (l *layout) drawRowText(c vg.Canvas, r rowLayout) {
	f := bodyFace
	var clr color.Color = inkColor
	if r.kind == pooledRow {
		f = pooledFace
	}
	label := f
	if r.kind == barRowKind {
		label, clr = bodyFace, r.barColor
	}
	drawText(c, label, l.labelX, r.centre, r.label, alignLeft, clr)
	if r.kind == barRowKind {
		clr = inkColor
	}
	estClr := clr
	if !r.drawn {
		estClr = softColor
	}
	drawText(c, f, l.estRight, r.centre, r.estText, alignRight, estClr)
	if r.drawn || r.kind == barRowKind {
		drawText(c, f, l.lowRight, r.centre, r.lowText, alignRight, clr)
		drawText(c, f, l.highRight, r.centre, r.highText, alignRight, clr)
	}
	drawText(c, f, l.weightRight, r.centre, r.weightText, alignRight, softColor)
}

func (l *layout) drawAxis(c vg.Canvas) {
	y := l.plotBottom
	strokeLine(c, l.plotX0, y, l.plotX1, y, 0.9, softColor, nil)
	for i, t := range l.ticks {
		x := l.x(t)
		strokeLine(c, x, y, x, y-4, 0.9, softColor, nil)
		drawText(c, tickFace, x, y-11, l.tickLabels[i], alignCentre, softColor)
	}
	drawText(c, bodyFace, (l.plotX0+l.plotX1)/2, l.axisLabelY, l.axisLabel, alignCentre, inkColor)
}

// drawText writes s with its visual centre line at y.
func drawText(c vg.Canvas, f font.Face, x, y vg.Length, s string, align float64, clr color.Color) {
	if s == "" {
		return
	}
	ext := f.Extents()
	x -= vg.Length(align) * f.Width(s)
	c.SetColor(clr)
	c.FillString(f, vg.Point{X: x, Y: y - (ext.Ascent-ext.Descent)/2}, s)
}

func strokeLine(c vg.Canvas, x0, y0, x1, y1, width vg.Length, clr color.Color, dashes []vg.Length) {
	c.SetLineWidth(width)
	c.SetColor(clr)
	c.SetLineDash(dashes, 0)
	var p vg.Path
	p.Move(vg.Point{X: x0, Y: y0})
	p.Line(vg.Point{X: x1, Y: y1})
	c.Stroke(p)
	c.SetLineDash(nil, 0)
}

func fillRect(c vg.Canvas, x0, y0, x1, y1 vg.Length, clr color.Color) {
	fillPolygon(c, clr, vg.Point{X: x0, Y: y0}, vg.Point{X: x1, Y: y0}, vg.Point{X: x1, Y: y1}, vg.Point{X: x0, Y: y1})
}

func fillPolygon(c vg.Canvas, clr color.Color, pts ...vg.Point) {
	c.SetColor(clr)
	var p vg.Path
	p.Move(pts[0])
	for _, pt := range pts[1:] {
		p.Line(pt)
	}
	p.Close()
	c.Fill(p)
}
