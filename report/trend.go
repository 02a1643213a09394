package report

import (
	"fmt"
	"math"
	"strings"
)

// Trend is a recorded quantity against time, drawn from buckets that each
// carry the least and greatest value of their samples: the renderer joins
// the buckets that fall in one pixel column and draws the column from its
// least to its greatest value, so no excursion disappears however long the
// run. Shaded bands mark intervals (events); a strip under the axis shows
// which columns held forward samples, diverted ones, or both.
type Trend struct {
	Caption string
	YLabel  string // with its unit
	Buckets []TrendBucket
	// Limit is a horizontal line (a setpoint, a maximum), in Y units; NaN
	// draws none.
	Limit      float64
	LimitLabel string
	Start, End float64 // the time axis, s (End > Start)
	Ticks      []Tick  // labelled times on the axis
	Bands      []Band
	// StateLabels name the strip's two states (e.g. forward, diverted).
	StateLabels [2]string
}

// TrendBucket is a stretch of samples: their times, extremes and states.
type TrendBucket struct {
	Start, End float64 // s
	Min, Max   float64 // Y units
	First      int     // samples in the first state (forward)
	Second     int     // samples in the second state (diverted)
}

// Tick is a labelled time on a trend's axis.
type Tick struct {
	At    float64 // s
	Label string
}

// Band is a shaded interval of a trend, named in its legend.
type Band struct {
	Start, End float64 // s
	Shade      Shade
	Name       string // legend text of its shade
}

// Shade is a band's colour: bands of different shades are told apart.
type Shade int

const (
	ShadeAlert   Shade = iota + 1 // red
	ShadeNotice                   // amber
	ShadeUnknown                  // grey
)

// Shades lists every shade (the renderer has a colour for each).
var Shades = []Shade{ShadeAlert, ShadeNotice, ShadeUnknown}

func (Trend) Kind() BlockKind { return TrendBlock }

// trend geometry, mm
const (
	trendH      = 52.0 // drawing area
	trendColumn = 0.3  // width of one column
	bandMinW    = 0.6  // a band is drawn at least this wide
	stripH      = 2.2  // the state strip under the axis
)

func shadeColour(s Shade) [3]int {
	switch s {
	case ShadeAlert:
		return [3]int{245, 190, 185}
	case ShadeNotice:
		return [3]int{250, 225, 160}
	case ShadeUnknown:
		return [3]int{205, 205, 205}
	}
	panic(fmt.Sprintf("report: no colour for shade %d", int(s)))
}

var (
	colFirst  = [3]int{0, 110, 40}    // the strip's first state (forward)
	colSecond = [3]int{170, 170, 170} // the second (diverted)
	colTrace  = [3]int{20, 40, 110}
)

// column is the samples of one pixel column.
type column struct {
	min, max      float64
	first, second int
	used          bool
}

// trend draws a Trend block.
func (r *renderer) trend(tr Trend) {
	f := r.f
	top := r.figure(trendH+36, tr.Caption)
	defer f.SetAutoPageBreak(true, margin+4)
	left := margin + 14
	width := r.w - 16
	span := tr.End - tr.Start
	if !(span > 0) {
		span = 1
	}
	X := func(t float64) float64 { return left + (t-tr.Start)/span*width }

	// Columns: every bucket joins the column of its start, and also every
	// column up to that of its end, so a long bucket is drawn across.
	nc := max(1, int(width/trendColumn))
	cols := make([]column, nc)
	colOf := func(t float64) int { return min(nc-1, max(0, int((t-tr.Start)/span*float64(nc)))) }
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, b := range tr.Buckets {
		for c := colOf(b.Start); c <= colOf(b.End); c++ {
			cl := &cols[c]
			if !cl.used {
				cl.min, cl.max, cl.used = b.Min, b.Max, true
			}
			cl.min, cl.max = math.Min(cl.min, b.Min), math.Max(cl.max, b.Max)
			cl.first += b.First
			cl.second += b.Second
		}
		lo, hi = math.Min(lo, b.Min), math.Max(hi, b.Max)
	}
	if !math.IsNaN(tr.Limit) {
		lo, hi = math.Min(lo, tr.Limit), math.Max(hi, tr.Limit)
	}
	if math.IsInf(lo, 0) {
		lo, hi = 0, 1
	}
	pad := (hi - lo) * 0.04
	y0, y1, ys := axisRange(lo-pad, hi+pad)
	Y := func(v float64) float64 { return top + trendH - (v-y0)/(y1-y0)*trendH }

	// Bands under everything.
	for _, b := range tr.Bands {
		col := shadeColour(b.Shade)
		f.SetFillColor(col[0], col[1], col[2])
		x0, x1 := X(b.Start), X(b.End)
		if x1-x0 < bandMinW {
			mid := (x0 + x1) / 2
			x0, x1 = mid-bandMinW/2, mid+bandMinW/2
		}
		x0, x1 = math.Max(x0, left), math.Min(x1, left+width)
		f.Rect(x0, top, x1-x0, trendH, "F")
	}
	r.yGrid(left, width, y0, y1, ys, Y)
	f.SetXY(margin, top-6)
	r.font("", smallSize)
	f.CellFormat(60, 3.6, printable(tr.YLabel), "", 0, "L", false, 0, "")
	// Time ticks.
	r.setDraw(colGrid)
	f.SetLineWidth(0.1)
	for _, tk := range tr.Ticks {
		x := X(tk.At)
		if x < left-0.01 || x > left+width+0.01 {
			continue
		}
		f.Line(x, top, x, top+trendH)
		f.SetXY(x-12, top+trendH+stripH+1.2)
		f.CellFormat(24, 3.6, printable(tk.Label), "", 0, "C", false, 0, "")
	}
	// The limit.
	if !math.IsNaN(tr.Limit) {
		f.SetDashPattern([]float64{1.2, 0.8}, 0)
		r.setDraw(colHot)
		f.SetLineWidth(0.3)
		f.Line(left, Y(tr.Limit), left+width, Y(tr.Limit))
		f.SetDashPattern(nil, 0)
		f.SetTextColor(colHot[0], colHot[1], colHot[2])
		f.SetXY(left+width-71, Y(tr.Limit)+0.4) // under the line, where a trace kept within its limit is not
		f.CellFormat(70, 3.6, printable(tr.LimitLabel), "", 0, "R", false, 0, "")
		f.SetTextColor(0, 0, 0)
	}
	// The trace: each column from its least to its greatest value, and
	// the state strip under the axis.
	f.SetFillColor(colTrace[0], colTrace[1], colTrace[2])
	colW := width / float64(nc)
	for c, cl := range cols {
		if !cl.used {
			continue
		}
		x := left + float64(c)*colW
		ya, yb := Y(cl.max), Y(cl.min)
		if yb-ya < 0.25 {
			m := (ya + yb) / 2
			ya, yb = m-0.125, m+0.125
		}
		f.SetFillColor(colTrace[0], colTrace[1], colTrace[2])
		f.Rect(x, ya, colW, yb-ya, "F")
		sy := top + trendH + 0.4
		switch {
		case cl.first > 0 && cl.second > 0:
			f.SetFillColor(colFirst[0], colFirst[1], colFirst[2])
			f.Rect(x, sy, colW, stripH/2, "F")
			f.SetFillColor(colSecond[0], colSecond[1], colSecond[2])
			f.Rect(x, sy+stripH/2, colW, stripH/2, "F")
		case cl.first > 0:
			f.SetFillColor(colFirst[0], colFirst[1], colFirst[2])
			f.Rect(x, sy, colW, stripH, "F")
		default:
			f.SetFillColor(colSecond[0], colSecond[1], colSecond[2])
			f.Rect(x, sy, colW, stripH, "F")
		}
	}
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.Rect(left, top, width, trendH, "D")

	// Legend: the trace, the limit, the strip's states, the bands' shades.
	y := top + trendH + stripH + 6
	x := left
	r.font("", smallSize)
	item := func(col [3]int, box bool, name string) {
		wd := f.GetStringWidth(printable(name)) + 2
		if x+6+wd > left+width {
			x, y = left, y+4.5
		}
		if box {
			f.SetFillColor(col[0], col[1], col[2])
			f.Rect(x, y+0.6, 5, 2.4, "F")
		} else {
			r.setDraw(col)
			f.SetLineWidth(0.6)
			f.Line(x, y+1.8, x+5, y+1.8)
		}
		f.SetXY(x+6, y)
		f.CellFormat(wd, 3.6, printable(name), "", 0, "L", false, 0, "")
		x += wd + 8
	}
	item(colTrace, true, "samples (least to greatest per column)")
	for i, name := range tr.StateLabels {
		if name != "" {
			item([2][3]int{colFirst, colSecond}[i], true, name)
		}
	}
	seen := map[string]bool{}
	for _, b := range tr.Bands {
		key := fmt.Sprintf("%d/%s", b.Shade, b.Name)
		if seen[key] || strings.TrimSpace(b.Name) == "" {
			continue
		}
		seen[key] = true
		item(shadeColour(b.Shade), true, b.Name)
	}
	f.SetXY(margin, y+5)
}
