package report

import (
	"fmt"
	"math"
	"strconv"

	"codeberg.org/go-pdf/fpdf"
)

// Charts of the record, drawn as vector graphics: the temperature diagram of
// the whole pasteurizer and x–y plots, with their axes, grids and legends.

// axisRange picks a rounded range and tick step that contain lo..hi.
func axisRange(lo, hi float64) (float64, float64, float64) {
	if hi-lo < 1e-9 {
		lo, hi = lo-1, hi+1
	}
	raw := (hi - lo) / 8
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := mag
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*mag >= raw {
			step = m * mag
			break
		}
	}
	return math.Floor(lo/step) * step, math.Ceil(hi/step) * step, step
}

// tick formats an axis value with as many decimals as the step needs.
func tick(v, step float64) string {
	dec := 0
	for s := step; s < 0.999999 && dec < 6; s *= 10 {
		dec++
	}
	if math.Abs(step*math.Pow(10, float64(dec))-math.Round(step*math.Pow(10, float64(dec)))) > 1e-6 {
		dec++ // steps such as 2.5
	}
	return strconv.FormatFloat(v, 'f', dec, 64)
}

func (r *renderer) setDraw(c [3]int) { r.f.SetDrawColor(c[0], c[1], c[2]) }

// figure keeps a figure of height h on one page, prints its caption and
// returns the top of the drawing area. Automatic page breaks are off until the
// caller restores them, so that no label starts a page of its own.
func (r *renderer) figure(h float64, caption string) float64 {
	f := r.f
	r.ensure(h)
	f.SetAutoPageBreak(false, 0)
	r.font("", smallSize)
	f.MultiCell(r.w, lineH*smallSize/bodySize, printable(caption), "", "L", false)
	return f.GetY() + 8
}

// yGrid draws horizontal grid lines with their values from lo to hi.
func (r *renderer) yGrid(left, width, lo, hi, step float64, Y func(float64) float64) {
	f := r.f
	f.SetLineWidth(0.1)
	r.setDraw(colGrid)
	r.font("", smallSize)
	for i := 0; lo+float64(i)*step <= hi+step/2; i++ {
		v := lo + float64(i)*step
		f.Line(left, Y(v), left+width, Y(v))
		f.SetXY(margin, Y(v)-1.8)
		f.CellFormat(12, 3.6, tick(v, step), "", 0, "R", false, 0, "")
	}
}

// diagram draws the temperature diagram as vector graphics.
func (r *renderer) diagram(dg Diagram) {
	f := r.f
	top := r.figure(diagramH+26, dg.Caption)
	defer f.SetAutoPageBreak(true, margin+4)
	left := margin + 14
	width := r.w - 16
	height := diagramH - 18
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, s := range dg.Segments {
		for _, v := range []float64{s.ProductIn, s.ProductOut, s.OtherAtLeft, s.OtherAtRight} {
			if s.Other == "" && (v == s.OtherAtLeft || v == s.OtherAtRight) && v == 0 {
				continue
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	pad := (hi - lo) * 0.05 // headroom for the labels, which sit above their points
	ymin, ymax, step := axisRange(lo, hi+pad)
	Y := func(v float64) float64 { return top + height - (v-ymin)/(ymax-ymin)*height }
	// grid and axis
	r.yGrid(left, width, ymin, ymax, step, Y)
	f.SetXY(margin, top-5.5)
	f.CellFormat(12, 3.6, printable(dg.Unit), "", 0, "R", false, 0, "")
	n := len(dg.Segments)
	segW := width / float64(max(n, 1))
	// setpoint line
	f.SetDashPattern([]float64{1, 1}, 0)
	r.setDraw(colHot)
	f.SetLineWidth(0.2)
	f.Line(left, Y(dg.Setpoint), left+width, Y(dg.Setpoint))
	f.SetDashPattern(nil, 0)
	f.SetTextColor(colHot[0], colHot[1], colHot[2])
	f.SetXY(left+width-42, Y(dg.Setpoint)-4)
	f.CellFormat(40, 3.6, fmt.Sprintf("diversion setpoint %.1f %s", dg.Setpoint, dg.Unit), "", 0, "R", false, 0, "")
	f.SetTextColor(0, 0, 0)
	type valueLabel struct {
		x, y, v float64
		left    bool
		col     [3]int
		bold    bool
	}
	var labels []valueLabel
	for i, s := range dg.Segments {
		x0 := left + float64(i)*segW
		x1 := x0 + segW
		// section boundary
		r.setDraw(colGrid)
		f.SetLineWidth(0.2)
		f.Line(x1, top, x1, top+height)
		// other stream
		if s.Other != "" {
			col, dash := otherStyle(s)
			r.setDraw(col)
			f.SetLineWidth(0.5)
			f.SetDashPattern(dash, 0)
			f.Line(x0+2, Y(s.OtherAtLeft), x1-2, Y(s.OtherAtRight))
			f.SetDashPattern(nil, 0)
			r.arrow(x0+2, Y(s.OtherAtLeft), x1-2, Y(s.OtherAtRight), s.OtherLeftward, col)
			labels = append(labels, valueLabel{x0 + 3, Y(s.OtherAtLeft) - 0.5, s.OtherAtLeft, true, col, false},
				valueLabel{x1 - 3, Y(s.OtherAtRight) - 0.5, s.OtherAtRight, false, col, false})
		}
		// product
		r.setDraw(colProduct)
		f.SetLineWidth(0.9)
		f.Line(x0, Y(s.ProductIn), x1, Y(s.ProductOut))
		if i == 0 {
			labels = append(labels, valueLabel{x0 + 1, Y(s.ProductIn) + 4.5, s.ProductIn, true, colProduct, true})
		}
		labels = append(labels, valueLabel{x1 - 1, Y(s.ProductOut) + 4.5, s.ProductOut, false, colProduct, true})
		// segment label under the plot
		r.font("", smallSize-0.5)
		f.SetXY(x0, top+height+1.5)
		f.MultiCell(segW, 3.2, printable(s.Label), "", "C", false)
	}
	// value labels last, on white, so that no line crosses them; a label that
	// would cover one already placed moves down (or up) a step, and none
	// leaves the frame (where the segment names and the axis are).
	type box struct{ x0, y0, x1, y1 float64 }
	var placed []box
	overlaps := func(b box) bool {
		if b.y0 < top || b.y1 > top+height || b.x0 < left || b.x1 > left+width {
			return true
		}
		for _, p := range placed {
			if b.x0 < p.x1 && p.x0 < b.x1 && b.y0 < p.y1 && p.y0 < b.y1 {
				return true
			}
		}
		return false
	}
	for _, l := range labels {
		style := ""
		if l.bold {
			style = "B"
		}
		r.font(style, smallSize-0.5)
		w := f.GetStringWidth(fmt.Sprintf("%.1f", l.v)) + 1
		at := func(y float64) box {
			if l.left {
				return box{l.x, y - 3.6, l.x + w, y - 0.4}
			}
			return box{l.x - w, y - 3.6, l.x, y - 0.4}
		}
		y := l.y
		for _, dy := range []float64{0, -3.6, 3.6, -7.2, 7.2, -4.9, -10.8, 10.8} {
			if !overlaps(at(l.y + dy)) {
				y = l.y + dy
				break
			}
		}
		placed = append(placed, at(y))
		if r.trace != nil {
			b := at(y)
			r.trace.labels = append(r.trace.labels, [4]float64{b.x0, b.y0, b.x1, b.y1})
		}
		f.SetTextColor(l.col[0], l.col[1], l.col[2])
		r.label(l.x, y, l.v, l.left)
	}
	f.SetTextColor(0, 0, 0)
	// frame
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.Rect(left, top, width, height, "D")
	if r.trace != nil {
		r.trace.frame = [4]float64{left, top, left + width, top + height}
	}
	// legend
	ly := top + height + 10
	r.legend(left, ly, []legendItem{{"product", colProduct, nil}, {"heating medium", colHot, dashHeating},
		{"pasteurized (regenerator)", colPasteurized, dashPasteurized}, {"cooling medium", colCold, dashCooling},
		{"raw (regenerator)", colRegen, dashRaw}})
	f.SetY(ly + 6)
}

type legendItem struct {
	name string
	col  [3]int
	dash []float64 // nil: solid
}

// The other stream of each kind has its own colour and dash pattern, so that
// the heating medium and the pasteurized product are told apart in print.
var (
	colPasteurized  = [3]int{200, 110, 0}
	dashHeating     = []float64{2, 1.2}
	dashPasteurized = []float64{0.6, 0.9}
	dashCooling     = []float64{2, 1.2}
	dashRaw         = []float64{3, 1, 0.6, 1}
)

// otherStyle is the colour and dash pattern of a segment's other stream.
func otherStyle(s Segment) ([3]int, []float64) {
	switch {
	case s.OtherIsProduct && s.OtherIsHot:
		return colPasteurized, dashPasteurized
	case s.OtherIsProduct:
		return colRegen, dashRaw
	case s.OtherIsHot:
		return colHot, dashHeating
	}
	return colCold, dashCooling
}

func (r *renderer) legend(x, y float64, items []legendItem) {
	f := r.f
	r.font("", smallSize)
	for _, it := range items {
		r.setDraw(it.col)
		f.SetLineWidth(0.6)
		if it.dash != nil {
			f.SetDashPattern(it.dash, 0)
		}
		f.Line(x, y+1.8, x+8, y+1.8)
		f.SetDashPattern(nil, 0)
		f.SetXY(x+9, y)
		wd := f.GetStringWidth(it.name) + 2
		f.CellFormat(wd, 3.6, printable(it.name), "", 0, "L", false, 0, "")
		x += wd + 8
	}
}

func (r *renderer) label(x, y, v float64, leftAligned bool) {
	f := r.f
	s := fmt.Sprintf("%.1f", v)
	w := f.GetStringWidth(s) + 1
	if leftAligned {
		f.SetXY(x, y-3.6)
	} else {
		f.SetXY(x-w, y-3.6)
	}
	f.CellFormat(w, 3.2, printable(s), "", 0, "L", false, 0, "")
}

// arrow draws a small head at the downstream end of a line.
func (r *renderer) arrow(x0, y0, x1, y1 float64, leftward bool, col [3]int) {
	if leftward {
		x0, y0, x1, y1 = x1, y1, x0, y0
	}
	mx, my := x0+(x1-x0)*0.55, y0+(y1-y0)*0.55
	ang := math.Atan2(y1-y0, x1-x0)
	const l, spread = 2.4, 0.45
	p := []fpdf.PointType{{X: mx, Y: my},
		{X: mx - l*math.Cos(ang-spread), Y: my - l*math.Sin(ang-spread)},
		{X: mx - l*math.Cos(ang+spread), Y: my - l*math.Sin(ang+spread)}}
	r.f.SetFillColor(col[0], col[1], col[2])
	r.f.Polygon(p, "F")
}

// plot draws x–y series with axes, grid and a legend.
func (r *renderer) plot(p Plot) {
	f := r.f
	top := r.figure(plotH+24, p.Caption)
	defer f.SetAutoPageBreak(true, margin+4)
	left := margin + 14
	width := r.w - 18
	height := plotH - 20
	xlo, xhi, ylo, yhi := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for _, s := range p.Series {
		for i := range s.X {
			xlo, xhi = math.Min(xlo, s.X[i]), math.Max(xhi, s.X[i])
			ylo, yhi = math.Min(ylo, s.Y[i]), math.Max(yhi, s.Y[i])
		}
	}
	if ylo > 0 && ylo < 0.5*yhi {
		ylo = 0 // start at zero unless the data sit far above it
	}
	x0, x1, xs := axisRange(xlo, xhi)
	y0, y1, ys := axisRange(ylo, yhi)
	X := func(v float64) float64 { return left + (v-x0)/(x1-x0)*width }
	Y := func(v float64) float64 { return top + height - (v-y0)/(y1-y0)*height }
	r.yGrid(left, width, y0, y1, ys, Y)
	for i := 0; x0+float64(i)*xs <= x1+xs/2; i++ {
		v := x0 + float64(i)*xs
		f.Line(X(v), top, X(v), top+height)
		f.SetXY(X(v)-8, top+height+0.8)
		f.CellFormat(16, 3.6, tick(v, xs), "", 0, "C", false, 0, "")
	}
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.Rect(left, top, width, height, "D")
	for i, s := range p.Series {
		if s.Markers {
			continue
		}
		col := seriesCols[i%len(seriesCols)]
		r.setDraw(col)
		f.SetLineWidth(0.6)
		for j := 1; j < len(s.X); j++ {
			f.Line(X(s.X[j-1]), Y(s.Y[j-1]), X(s.X[j]), Y(s.Y[j]))
		}
	}
	f.SetXY(left, top+height+4.5)
	f.CellFormat(width, 3.6, printable(p.XLabel), "", 0, "C", false, 0, "")
	f.SetXY(margin, top-6)
	f.CellFormat(60, 3.6, printable(p.YLabel), "", 0, "L", false, 0, "")
	items := make([]legendItem, len(p.Series))
	for i, s := range p.Series {
		items[i] = legendItem{s.Name, seriesCols[i%len(seriesCols)], nil}
		if s.Markers {
			items[i].dash = []float64{0.4, 1.2} // dotted: points, not a line
		}
	}
	r.legend(left, top+height+9, items)
	// points, so that a short series still reads
	for i, s := range p.Series {
		col := seriesCols[i%len(seriesCols)]
		f.SetFillColor(col[0], col[1], col[2])
		if len(s.X) <= 30 || s.Markers {
			for j := range s.X {
				f.Circle(X(s.X[j]), Y(s.Y[j]), 0.7, "F")
			}
		}
	}
	f.SetY(top + height + 15)
}

// barChart draws horizontal bars, one per label, from a common zero, with a
// value axis below and each value at the end of its bar.
func (r *renderer) barChart(c BarChart) {
	f := r.f
	const barH, gap = 4.2, 1.6
	height := float64(len(c.Bars))*(barH+gap) + gap
	top := r.figure(height+14, c.Caption)
	defer f.SetAutoPageBreak(true, margin+4)
	r.font("", smallSize)
	labelW := 0.0
	for _, b := range c.Bars {
		labelW = math.Max(labelW, f.GetStringWidth(printable(b.Label)))
	}
	labelW = math.Min(labelW+2, r.w*0.45)
	left := margin + labelW
	width := r.w - labelW - 16
	hi := 0.0
	for _, b := range c.Bars {
		hi = math.Max(hi, b.Value)
	}
	_, x1, step := axisRange(0, hi)
	X := func(v float64) float64 { return left + v/x1*width }
	f.SetLineWidth(0.1)
	r.setDraw(colGrid)
	for i := 0; float64(i)*step <= x1+step/2; i++ {
		v := float64(i) * step
		f.Line(X(v), top, X(v), top+height)
		f.SetXY(X(v)-8, top+height+0.8)
		f.CellFormat(16, 3.6, tick(v, step), "", 0, "C", false, 0, "")
	}
	f.SetFillColor(colProduct[0], colProduct[1], colProduct[2])
	for i, b := range c.Bars {
		y := top + gap + float64(i)*(barH+gap)
		f.SetXY(margin, y+0.3)
		f.CellFormat(labelW-2, barH-0.6, printable(b.Label), "", 0, "R", false, 0, "")
		if b.Value > 0 {
			f.Rect(left, y, X(b.Value)-left, barH, "F")
		}
		f.SetXY(X(b.Value)+1, y+0.3)
		f.CellFormat(14, barH-0.6, printable(fmt.Sprintf("%.3g", b.Value)), "", 0, "L", false, 0, "")
	}
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.Line(left, top, left, top+height)
	f.SetXY(left, top+height+5)
	f.CellFormat(width, 3.6, printable(c.Unit), "", 0, "C", false, 0, "")
	f.SetY(top + height + 10)
}
