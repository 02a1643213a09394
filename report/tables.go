package report

import (
	"math"
	"strings"
	"unicode"
)

// Tables of the record: columns as wide as their content, wrapped to the
// page, the header repeated after a page break, no cell split across pages.

// table lays out a grid: columns as wide as their content, the widest text
// columns wrapped when the total exceeds the page; the header repeats after
// a page break.
func (r *renderer) table(t Table) {
	f := r.f
	size, lh, widths := r.tableLayout(t)
	header := func() {
		r.font("B", size)
		f.SetFillColor(235, 235, 235)
		h := r.rowHeight(titles(t.Columns), widths, lh)
		r.drawRow(titles(t.Columns), widths, t.Columns, h, lh, true)
		r.font("", size)
	}
	// Keep the caption, the header and the first row together.
	r.ensure(r.tableLead(t))
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

// tableLayout is a table's font size, line height and column widths:
// columns as wide as their content, the widest shrunk until they fit.
func (r *renderer) tableLayout(t Table) (size, lh float64, widths []float64) {
	f := r.f
	size = bodySize
	if len(t.Columns) > 7 {
		size = smallSize
	}
	lh = lineH * size / bodySize
	n := len(t.Columns)
	widths = make([]float64, n)
	least := make([]float64, n) // the widest word of the column: no word or number is broken if it can be helped
	r.font("B", size)
	for i, c := range t.Columns {
		widths[i] = f.GetStringWidth(c.Title) + 2*cellPad
		least[i] = widestWord(c.Title, f.GetStringWidth) + 2*cellPad
	}
	r.font("", size)
	for _, row := range t.Rows {
		for i := 0; i < n && i < len(row); i++ {
			widths[i] = math.Max(widths[i], f.GetStringWidth(row[i])+2*cellPad)
			least[i] = math.Max(least[i], widestWord(row[i], f.GetStringWidth)+2*cellPad)
		}
	}
	fitWidths(widths, least, r.w)
	return size, lh, widths
}

// widestWord is the width of the widest part of a cell that splitText would
// rather not break: a word, or the part of a name between its separators
// ('.', '_', '/', '-'), or a whole number or date ("16.03", "2026-11-10",
// which have no letters, since a break inside them misreads as two values).
func widestWord(s string, width func(string) float64) float64 {
	most := 0.0
	for _, w := range strings.Fields(printable(s)) {
		parts := []string{w}
		if strings.IndexFunc(w, unicode.IsLetter) >= 0 {
			parts = atSeparators(w)
		}
		for _, p := range parts {
			most = math.Max(most, width(p))
		}
	}
	return most
}

// tableLead is the height a table keeps together: its caption, header and
// first row.
func (r *renderer) tableLead(t Table) float64 {
	size, lh, widths := r.tableLayout(t)
	r.font("B", size)
	need := r.rowHeight(titles(t.Columns), widths, lh) + 4
	if len(t.Rows) > 0 {
		r.font("", size)
		need += r.rowHeight(t.Rows[0], widths, lh)
	}
	if t.Caption != "" {
		r.font("", smallSize)
		need += float64(len(r.f.SplitText(printable(t.Caption), r.w)))*lineH*smallSize/bodySize + 0.8
	}
	return need + 8
}

func titles(cols []Column) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = c.Title
	}
	return out
}

// fitWidths shrinks the widest columns until the total fits, none below its
// least width (its widest word) while another can still give; when every
// column is at its least and the table is still too wide, all shrink in
// proportion (and long words break).
func fitWidths(w, least []float64, total float64) {
	for range 1000 {
		sum, wi := 0.0, -1
		for i, v := range w {
			sum += v
			if v > least[i] && (wi < 0 || v > w[wi]) {
				wi = i
			}
		}
		if sum > total && wi < 0 {
			for i := range w {
				w[i] *= total / sum
			}
			return
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
		w[wi] = math.Max(least[wi], w[wi]-math.Min(sum-total, w[wi]*0.1+0.5))
	}
}

func (r *renderer) rowHeight(cells []string, widths []float64, lh float64) float64 {
	lines := 1
	for i, c := range cells {
		if i < len(widths) {
			lines = max(lines, len(r.splitText(printable(c), widths[i]-2*cellPad)))
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
		for j, line := range r.splitText(printable(c), wd-2*cellPad) {
			f.SetXY(x+cellPad, y0+0.6+float64(j)*lh)
			f.CellFormat(wd-2*cellPad, lh, printable(line), "", 0, align, false, 0, "")
		}
		f.SetTextColor(0, 0, 0)
		x += wd
	}
	f.SetXY(x0, y0+h)
}

// splitText breaks a cell's text into lines no wider than w in the current
// font: at spaces, and a word too long for a line (a field path such as
// regeneration.product_side.channels_per_pass) after a '.', '_', '/' or '-'
// in it, so that it never breaks inside a name; only a part with no such
// break that is still too long is cut where it must be.
func (r *renderer) splitText(s string, w float64) []string {
	f := r.f
	// A column is exactly as wide as its widest cell plus the padding, and
	// (W + 2p) − 2p may come back a rounding below W: without this slack
	// (a millionth of a millimetre) that cell would break ("resul t").
	w += 1e-6
	width := func(t string) float64 { return f.GetStringWidth(t) }
	var lines []string
	for _, para := range strings.Split(s, "\n") {
		line := ""
		for _, word := range strings.Fields(para) {
			for i, piece := range pieces(word, w, width) {
				sep := " "
				if i > 0 || line == "" {
					sep = "" // the rest of a broken word joins it; a line starts bare
				}
				if line != "" && width(line+sep+piece) > w {
					lines = append(lines, line)
					line, sep = "", ""
				}
				line += sep + piece
			}
		}
		lines = append(lines, line)
	}
	return lines
}

// pieces splits a word wider than w after its separators ('.', '_', '/',
// '-'), and a piece still wider than w between characters; a word that fits
// stays whole.
func pieces(word string, w float64, width func(string) float64) []string {
	if width(word) <= w {
		return []string{word}
	}
	var fit []string
	for _, p := range atSeparators(word) {
		for width(p) > w {
			cut := 0
			for i := range p {
				if i > 0 && width(p[:i]) > w {
					break
				}
				cut = i
			}
			if cut == 0 {
				cut = len(string([]rune(p)[0]))
			}
			fit = append(fit, p[:cut])
			p = p[cut:]
		}
		fit = append(fit, p)
	}
	return fit
}

// atSeparators splits a word after each '.', '_', '/' or '-' in it (none
// at its end), keeping the separators.
func atSeparators(word string) []string {
	var out []string
	start := 0
	for i, c := range word {
		if strings.ContainsRune("._/-", c) && i+1 < len(word) {
			out = append(out, word[start:i+1])
			start = i + 1
		}
	}
	return append(out, word[start:])
}
