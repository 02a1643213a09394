package report

import (
	"bytes"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"codeberg.org/go-pdf/fpdf"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"
)

// KeywordPrefix marks the plant file's hash in the PDF's Keywords entry.
const KeywordPrefix = "pasval-input-sha256:"

// page geometry, mm
const (
	margin     = 18.0
	lineH      = 4.6
	bodySize   = 9.0
	smallSize  = 7.5
	headSize   = 13.0
	titleSize  = 20.0
	cellPad    = 1.4
	diagramH   = 95.0
	plotH      = 70.0
	fontFamily = "go"
	monoFamily = "gomono"
)

// colours (RGB) used for drawing; text is black.
var (
	colProduct = [3]int{20, 40, 110}
	colHot     = [3]int{190, 40, 30}
	colCold    = [3]int{20, 120, 170}
	colRegen   = [3]int{110, 110, 110}
	colGrid    = [3]int{210, 210, 210}
	colPass    = [3]int{0, 110, 40}
	colFail    = [3]int{180, 0, 0}
	seriesCols = [][3]int{{20, 40, 110}, {190, 40, 30}, {0, 120, 60}, {140, 80, 0}, {110, 0, 140}}
)

type renderer struct {
	f    *fpdf.Fpdf
	doc  *Document
	w    float64 // usable width
	secN int
}

// Render lays the document out as PDF bytes. The same document gives the
// same bytes (the page count is returned too): the creation date is the record date, catalog entries are
// sorted and no random identifier is written.
func Render(doc *Document) (pdf []byte, pages int, err error) {
	f := fpdf.New("P", "mm", doc.PageSize, "")
	f.SetCatalogSort(true)
	f.SetCompression(true)
	day := time.Date(doc.Date.Year(), doc.Date.Month(), doc.Date.Day(), 0, 0, 0, 0, time.UTC)
	f.SetCreationDate(day)
	f.SetModificationDate(day)
	// gofpdf writes into the font bytes it is given (checksum fields), so each
	// render gets its own copy: the package globals stay pristine and a second
	// render in the same process gives the same bytes.
	f.AddUTF8FontFromBytes(fontFamily, "", bytes.Clone(goregular.TTF))
	f.AddUTF8FontFromBytes(fontFamily, "B", bytes.Clone(gobold.TTF))
	f.AddUTF8FontFromBytes(monoFamily, "", bytes.Clone(gomono.TTF))
	f.SetTitle(doc.Title+" — "+doc.Header, true)
	f.SetSubject("pasval validation record; plant file SHA-256 "+doc.SHA256, true)
	f.SetKeywords(KeywordPrefix+doc.SHA256, false)
	f.SetCreator("pasval "+doc.Version, true)
	f.SetAuthor("pasval "+doc.Version, true)
	f.SetMargins(margin, margin+6, margin)
	f.SetCellMargin(0) // tables pad their cells themselves (cellPad)
	f.SetAutoPageBreak(true, margin+4)
	f.AliasNbPages("{nb}")
	f.SetAttachments([]fpdf.Attachment{{Content: doc.PlantBytes, Filename: doc.PlantName,
		Description: "plant file, SHA-256 " + doc.SHA256}})
	pw, _ := f.GetPageSize()
	r := &renderer{f: f, doc: doc, w: pw - 2*margin}
	f.SetHeaderFunc(r.header)
	f.SetFooterFunc(r.footer)

	r.cover()
	for _, s := range doc.Sections {
		r.section(s)
	}
	if err := f.Error(); err != nil {
		return nil, 0, fmt.Errorf("report: %w", err)
	}
	pages = f.PageNo()
	var buf bytes.Buffer
	if err := f.Output(&buf); err != nil {
		return nil, 0, fmt.Errorf("report: %w", err)
	}
	return buf.Bytes(), pages, nil
}

func (r *renderer) font(style string, size float64) { r.f.SetFont(fontFamily, style, size) }

func (r *renderer) header() {
	f := r.f
	f.SetY(margin - 4)
	r.font("", smallSize)
	f.SetTextColor(60, 60, 60)
	f.CellFormat(r.w/2, 4, printable(r.doc.Header), "", 0, "L", false, 0, "")
	f.CellFormat(r.w/2, 4, printable(r.doc.Title), "", 1, "R", false, 0, "")
	f.SetDrawColor(150, 150, 150)
	f.SetLineWidth(0.2)
	f.Line(margin, margin+0.5, margin+r.w, margin+0.5)
	f.SetTextColor(0, 0, 0)
	f.SetY(margin + 6)
}

func (r *renderer) footer() {
	f := r.f
	_, ph := f.GetPageSize()
	f.SetY(ph - margin + 2)
	f.SetDrawColor(150, 150, 150)
	f.SetLineWidth(0.2)
	f.Line(margin, ph-margin+1, margin+r.w, ph-margin+1)
	r.font("", smallSize)
	f.SetTextColor(60, 60, 60)
	f.CellFormat(r.w/3, 4, printable("plant file "+r.doc.ShortHash+"…"), "", 0, "L", false, 0, "")
	f.CellFormat(r.w/3, 4, printable(r.doc.Date.Format("2006-01-02")), "", 0, "C", false, 0, "")
	f.CellFormat(r.w/3, 4, fmt.Sprintf("page %d of {nb}", f.PageNo()), "", 0, "R", false, 0, "")
	f.SetTextColor(0, 0, 0)
}

func (r *renderer) para(text string, size float64, style string) {
	r.font(style, size)
	r.f.MultiCell(r.w, lineH*size/bodySize, printable(text), "", "L", false)
}

func (r *renderer) cover() {
	f := r.f
	f.AddPage()
	f.Ln(8)
	r.font("B", titleSize)
	f.MultiCell(r.w, 9, printable(r.doc.Title), "", "L", false)
	f.Ln(3)
	r.keyValues(r.doc.Cover.Fields, 38)
	f.Ln(5)

	// Verdict box.
	c := r.doc.Cover
	rows := len(c.Verdicts)
	boxH := float64(rows)*5.5 + 17
	x, y := margin, f.GetY()
	if y+boxH > 260 {
		f.AddPage()
		y = f.GetY()
	}
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.5)
	f.Rect(x, y, r.w, boxH, "D")
	f.SetXY(x+4, y+3)
	r.font("B", 11)
	f.CellFormat(r.w-8, 6, printable("Verdicts"), "", 1, "L", false, 0, "")
	for _, v := range c.Verdicts {
		f.SetX(x + 4)
		r.font("", bodySize)
		f.CellFormat(r.w-40, 5.5, printable(v.Check), "", 0, "L", false, 0, "")
		r.font("B", bodySize)
		col := colPass
		word := "PASS"
		if !v.Pass {
			col, word = colFail, "FAIL"
		}
		f.SetTextColor(col[0], col[1], col[2])
		f.CellFormat(28, 5.5, printable(word), "", 1, "R", false, 0, "")
		f.SetTextColor(0, 0, 0)
	}
	f.SetX(x + 4)
	r.font("B", 10)
	f.CellFormat(r.w-8, 7, printable(c.Overall), "T", 1, "L", false, 0, "")
	f.SetY(y + boxH + 5)
	r.para(c.Statement, bodySize, "")
	f.Ln(2)
	r.para(cautionOf(r.doc), bodySize, "B")
}

// cautionOf finds the caution paragraph in the cautions section.
func cautionOf(doc *Document) string {
	for _, s := range doc.Sections {
		if s.Heading == "Cautions" {
			for _, b := range s.Blocks {
				if p, ok := b.(Paragraph); ok && p.Emphasis {
					return p.Text
				}
			}
		}
	}
	return ""
}

func (r *renderer) section(s Section) {
	f := r.f
	r.secN++
	if r.secN == 1 || s.Heading == "Inputs" {
		f.AddPage()
	} else if f.GetY() > 230 {
		f.AddPage()
	} else {
		f.Ln(4)
	}
	r.font("B", headSize)
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.CellFormat(r.w, 8, fmt.Sprintf("%d  %s", r.secN, s.Heading), "B", 1, "L", false, 0, "")
	f.Ln(2)
	for _, b := range s.Blocks {
		switch v := b.(type) {
		case Paragraph:
			style := ""
			if v.Emphasis {
				style = "B"
			}
			r.para(v.Text, bodySize, style)
			f.Ln(1.5)
		case Bullets:
			r.bullets(v.Items)
		case KeyValues:
			r.keyValues(v.Pairs, 0)
			f.Ln(2)
		case Table:
			r.table(v)
		case Diagram:
			r.diagram(v)
		case Plot:
			r.plot(v)
		case SignOff:
			r.signOff(v)
		default:
			panic(fmt.Sprintf("report: no layout for block kind %d (%T)", int(b.Kind()), b))
		}
	}
}

func (r *renderer) bullets(items []string) {
	f := r.f
	r.font("", bodySize)
	for _, it := range items {
		f.SetX(margin + 2)
		f.CellFormat(4, lineH, printable("•"), "", 0, "L", false, 0, "")
		f.MultiCell(r.w-6, lineH, printable(it), "", "L", false)
		f.Ln(0.6)
	}
	f.Ln(1.5)
}

// keyValues prints labelled lines; labelW 0 sizes the label column to fit.
func (r *renderer) keyValues(pairs [][2]string, labelW float64) {
	f := r.f
	r.font("B", bodySize)
	if labelW == 0 {
		for _, p := range pairs {
			labelW = math.Max(labelW, f.GetStringWidth(p[0])+4)
		}
		labelW = math.Min(labelW, r.w*0.4)
	}
	for _, p := range pairs {
		r.font("", bodySize)
		r.ensure(float64(len(f.SplitText(printable(p[1]), r.w-labelW)))*lineH + 1)
		r.font("B", bodySize)
		y := f.GetY()
		f.MultiCell(labelW, lineH, printable(p[0]), "", "L", false)
		y2 := f.GetY()
		f.SetXY(margin+labelW, y)
		r.font("", bodySize)
		if strings.HasPrefix(p[0], "Plant file SHA") {
			f.SetFont(monoFamily, "", smallSize+0.5)
		}
		f.MultiCell(r.w-labelW, lineH, printable(p[1]), "", "L", false)
		if f.GetY() < y2 {
			f.SetY(y2)
		}
	}
}

// table lays out a grid: columns as wide as their content, the widest text
// columns wrapped when the total exceeds the page; the header repeats after
// a page break.
func (r *renderer) table(t Table) {
	f := r.f
	size := bodySize
	if len(t.Columns) > 7 {
		size = smallSize
	}
	lh := lineH * size / bodySize
	n := len(t.Columns)
	widths := make([]float64, n)
	r.font("B", size)
	for i, c := range t.Columns {
		widths[i] = f.GetStringWidth(c.Title) + 2*cellPad
	}
	r.font("", size)
	for _, row := range t.Rows {
		for i := 0; i < n && i < len(row); i++ {
			widths[i] = math.Max(widths[i], f.GetStringWidth(row[i])+2*cellPad)
		}
	}
	fitWidths(widths, r.w)
	header := func() {
		r.font("B", size)
		f.SetFillColor(235, 235, 235)
		h := r.rowHeight(titles(t.Columns), widths, lh)
		r.drawRow(titles(t.Columns), widths, t.Columns, h, lh, true)
		r.font("", size)
	}
	// Keep the caption, the header and the first row together.
	r.font("B", size)
	need := r.rowHeight(titles(t.Columns), widths, lh) + 4
	if len(t.Rows) > 0 {
		r.font("", size)
		need += r.rowHeight(t.Rows[0], widths, lh)
	}
	r.ensure(need + 8)
	if t.Caption != "" {
		r.font("", smallSize)
		f.MultiCell(r.w, lineH*smallSize/bodySize, printable(t.Caption), "", "L", false)
		f.Ln(0.8)
	}
	_, ph := f.GetPageSize()
	// Page breaks are managed here, row by row, so that no cell splits.
	f.SetAutoPageBreak(false, 0)
	defer f.SetAutoPageBreak(true, margin+4)
	header()
	for _, row := range t.Rows {
		r.font("", size)
		h := r.rowHeight(row, widths, lh)
		if f.GetY()+h > ph-margin-4 {
			f.AddPage()
			header()
		}
		r.drawRow(row, widths, t.Columns, h, lh, false)
	}
	f.Ln(3)
}

func titles(cols []Column) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = c.Title
	}
	return out
}

// fitWidths shrinks the widest columns until the total fits.
func fitWidths(w []float64, total float64) {
	for range 200 {
		sum, wi := 0.0, 0
		for i, v := range w {
			sum += v
			if v > w[wi] {
				wi = i
			}
		}
		if sum <= total {
			// spread the spare width over the columns
			extra := (total - sum) / float64(len(w))
			if extra > 0 && sum > total*0.75 {
				for i := range w {
					w[i] += extra
				}
			}
			return
		}
		w[wi] -= math.Min(sum-total, w[wi]*0.1+0.5)
	}
}

func (r *renderer) rowHeight(cells []string, widths []float64, lh float64) float64 {
	lines := 1
	for i, c := range cells {
		if i < len(widths) {
			lines = max(lines, len(r.f.SplitText(printable(c), widths[i]-2*cellPad)))
		}
	}
	return float64(lines)*lh + 1.2
}

func (r *renderer) drawRow(cells []string, widths []float64, cols []Column, h, lh float64, fill bool) {
	f := r.f
	x0, y0 := margin, f.GetY()
	f.SetDrawColor(170, 170, 170)
	f.SetLineWidth(0.15)
	x := x0
	for i, wd := range widths {
		c := ""
		if i < len(cells) {
			c = cells[i]
		}
		style := "D"
		if fill {
			style = "FD"
		}
		f.Rect(x, y0, wd, h, style)
		align := "L"
		if cols[i].Right && !fill {
			align = "R"
		}
		if c == "PASS" || c == "FAIL" {
			col := colPass
			if c == "FAIL" {
				col = colFail
			}
			f.SetTextColor(col[0], col[1], col[2])
		}
		for j, line := range f.SplitText(printable(c), wd-2*cellPad) {
			f.SetXY(x+cellPad, y0+0.6+float64(j)*lh)
			f.CellFormat(wd-2*cellPad, lh, printable(line), "", 0, align, false, 0, "")
		}
		f.SetTextColor(0, 0, 0)
		x += wd
	}
	f.SetXY(x0, y0+h)
}

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

func (r *renderer) ensure(h float64) {
	_, ph := r.f.GetPageSize()
	if r.f.GetY()+h > ph-margin-4 {
		r.f.AddPage()
	}
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
	f.SetXY(left+width-40, Y(dg.Setpoint)-4)
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
			col := colCold
			switch {
			case s.OtherIsHot:
				col = colHot
			case s.OtherIsProduct:
				col = colRegen
			}
			r.setDraw(col)
			f.SetLineWidth(0.5)
			f.SetDashPattern([]float64{2, 1.2}, 0)
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
	// would cover one already placed moves down (or up) a step.
	type box struct{ x0, y0, x1, y1 float64 }
	var placed []box
	overlaps := func(b box) bool {
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
		for _, dy := range []float64{0, -3.6, 3.6, -7.2, 7.2} {
			if !overlaps(at(l.y + dy)) {
				y = l.y + dy
				break
			}
		}
		placed = append(placed, at(y))
		f.SetTextColor(l.col[0], l.col[1], l.col[2])
		r.label(l.x, y, l.v, l.left)
	}
	f.SetTextColor(0, 0, 0)
	// frame
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.Rect(left, top, width, height, "D")
	// legend
	ly := top + height + 10
	r.legend(left, ly, []legendItem{{"product", colProduct, false}, {"heating medium / pasteurized product", colHot, true},
		{"cooling medium", colCold, true}, {"raw product (regenerator)", colRegen, true}})
	f.SetY(ly + 6)
}

type legendItem struct {
	name   string
	col    [3]int
	dashed bool
}

func (r *renderer) legend(x, y float64, items []legendItem) {
	f := r.f
	r.font("", smallSize)
	for _, it := range items {
		r.setDraw(it.col)
		f.SetLineWidth(0.6)
		if it.dashed {
			f.SetDashPattern([]float64{2, 1.2}, 0)
		}
		f.Line(x, y+1.8, x+8, y+1.8)
		f.SetDashPattern(nil, 0)
		f.SetXY(x+9, y)
		wd := f.GetStringWidth(it.name) + 2
		f.CellFormat(wd, 3.6, printable(it.name), "", 0, "L", false, 0, "")
		x += wd + 13
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
		items[i] = legendItem{s.Name, seriesCols[i%len(seriesCols)], false}
	}
	r.legend(left, top+height+9, items)
	// points, so that a short series still reads
	for i, s := range p.Series {
		col := seriesCols[i%len(seriesCols)]
		f.SetFillColor(col[0], col[1], col[2])
		if len(s.X) <= 30 {
			for j := range s.X {
				f.Circle(X(s.X[j]), Y(s.Y[j]), 0.7, "F")
			}
		}
	}
	f.SetY(top + height + 15)
}

func (r *renderer) signOff(s SignOff) {
	f := r.f
	r.ensure(float64(len(s.Roles))*28 + 5)
	for _, role := range s.Roles {
		f.Ln(4)
		r.font("B", bodySize)
		f.CellFormat(r.w, 5, printable(role), "", 1, "L", false, 0, "")
		f.Ln(11) // room to sign
		y := f.GetY()
		f.SetDrawColor(0, 0, 0)
		f.SetLineWidth(0.2)
		cols := []struct {
			label string
			w     float64
		}{{"name", 0.4}, {"signature", 0.38}, {"date", 0.22}}
		x := margin
		r.font("", smallSize)
		for _, c := range cols {
			wd := r.w*c.w - 4
			f.Line(x, y, x+wd, y)
			f.SetXY(x, y+0.5)
			f.CellFormat(wd, 3.6, printable(c.label), "", 0, "L", false, 0, "")
			x += r.w * c.w
		}
		f.SetY(y + 6)
	}
}
