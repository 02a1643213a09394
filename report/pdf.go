package report

import (
	"bytes"
	"fmt"
	"math"
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
	// trace records where things were laid out, for the layout tests; nil
	// when rendering a record.
	trace *layoutTrace
}

// layoutTrace is where the renderer put what the layout rules concern.
type layoutTrace struct {
	headings    []place // each section heading
	firstBlocks []place // the first block of each section, where it starts
	// diagram: the drawing frame and each value label's box (mm)
	frame  [4]float64
	labels [][4]float64
}

// place is a page and a height on it (mm from the top).
type place struct {
	page int
	y    float64
}

// Render lays the document out as PDF bytes. The same document gives the
// same bytes (the page count is returned too): the creation date is the record date, catalog entries are
// sorted and no random identifier is written.
func Render(doc *Document) (pdf []byte, pages int, err error) {
	return render(doc, nil)
}

// render is Render, recording the layout in trace when it is not nil.
func render(doc *Document, trace *layoutTrace) (pdf []byte, pages int, err error) {
	r, err := newRenderer(doc, trace)
	if err != nil {
		return nil, 0, err
	}
	f := r.f
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

// newRenderer sets up the PDF of a document: page size, fonts, metadata,
// attachments, header and footer.
func newRenderer(doc *Document, trace *layoutTrace) (*renderer, error) {
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
	subject := "pasval validation record"
	if doc.Kind == KindRunReview {
		subject = "pasval run-review record"
	}
	f.SetSubject(subject+"; "+hashedFile(doc)+" SHA-256 "+doc.SHA256, true)
	f.SetKeywords(keywords(doc), false)
	f.SetCreator("pasval "+doc.Version, true)
	f.SetAuthor("pasval "+doc.Version, true)
	f.SetMargins(margin, margin+6, margin)
	f.SetCellMargin(0) // tables pad their cells themselves (cellPad)
	f.SetAutoPageBreak(true, margin+4)
	f.AliasNbPages("{nb}")
	var atts []fpdf.Attachment
	for _, a := range doc.Attachments {
		atts = append(atts, fpdf.Attachment{Content: a.Content, Filename: a.Name, Description: a.Description})
	}
	f.SetAttachments(atts)
	pw, _ := f.GetPageSize()
	r := &renderer{f: f, doc: doc, w: pw - 2*margin, trace: trace}
	f.SetHeaderFunc(r.header)
	f.SetFooterFunc(r.footer)
	if err := f.Error(); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	return r, nil
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
	f.CellFormat(r.w/3, 4, printable(hashedFile(r.doc)+" "+r.doc.ShortHash+"…"), "", 0, "L", false, 0, "")
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
	var margins []string
	if c.Margins != "" {
		r.font("", bodySize)
		margins = r.f.SplitText(printable(c.Margins), r.w-8)
		boxH += float64(len(margins))*lineH + 1
	}
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
		switch {
		case v.NotJudged:
			col, word = [3]int{0, 0, 0}, "NOT JUDGED"
		case !v.Pass:
			col, word = colFail, "FAIL"
		}
		f.SetTextColor(col[0], col[1], col[2])
		f.CellFormat(28, 5.5, printable(word), "", 1, "R", false, 0, "")
		f.SetTextColor(0, 0, 0)
	}
	f.SetX(x + 4)
	r.font("B", 10)
	f.CellFormat(r.w-8, 7, printable(c.Overall), "T", 1, "L", false, 0, "")
	r.font("", bodySize)
	for _, l := range margins {
		f.SetX(x + 4)
		f.CellFormat(r.w-8, lineH, l, "", 1, "L", false, 0, "")
	}
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
	_, ph := f.GetPageSize()
	// A heading is never left alone at the foot of a page: it starts a new
	// one unless its first block (or the part of it that is kept whole) fits
	// below it.
	lead := 0.0
	if len(s.Blocks) > 0 {
		lead = r.leadHeight(s.Blocks[0])
	}
	if r.secN == 1 || s.Heading == "Inputs" || s.NewPage {
		f.AddPage()
	} else if f.GetY() > 230 || f.GetY()+4+10+lead > ph-margin-4 {
		f.AddPage()
	} else {
		f.Ln(4)
	}
	if r.trace != nil {
		r.trace.headings = append(r.trace.headings, place{f.PageNo(), f.GetY()})
	}
	r.font("B", headSize)
	f.SetDrawColor(0, 0, 0)
	f.SetLineWidth(0.3)
	f.CellFormat(r.w, 8, fmt.Sprintf("%d  %s", r.secN, s.Heading), "B", 1, "L", false, 0, "")
	f.Ln(2)
	for i, b := range s.Blocks {
		if i == 0 && r.trace != nil {
			r.trace.firstBlocks = append(r.trace.firstBlocks, r.blockStart(b))
		}
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
		case BarChart:
			r.barChart(v)
		case SignOff:
			r.signOff(v)
		case Trend:
			r.trend(v)
		default:
			panic(fmt.Sprintf("report: no layout for block kind %d (%T)", int(b.Kind()), b))
		}
	}
}

// leadHeight is the height a block needs on the page it starts on: what it
// keeps together before it may break (a table's caption, header and first
// row; a figure whole; a paragraph's first lines; a list's first item).
func (r *renderer) leadHeight(b Block) float64 {
	f := r.f
	switch v := b.(type) {
	case Paragraph:
		r.font("", bodySize)
		return float64(min(len(f.SplitText(printable(v.Text), r.w)), 3))*lineH + 1.5
	case Bullets:
		if len(v.Items) == 0 {
			return 0
		}
		r.font("", bodySize)
		return float64(len(f.SplitText(printable(v.Items[0]), r.w-6)))*lineH + 0.6
	case KeyValues:
		if len(v.Pairs) == 0 {
			return 0
		}
		return lineH * 2
	case Table:
		return r.tableLead(v)
	case Diagram:
		return diagramH + 26
	case Plot:
		return plotH + 24
	case BarChart:
		return float64(len(v.Bars))*(4.2+1.6) + 1.6 + 14
	case Trend:
		return trendH + 36
	case SignOff:
		return float64(len(v.Roles))*28 + 5
	}
	panic(fmt.Sprintf("report: no lead height for block kind %d (%T)", int(b.Kind()), b))
}

// blockStart is where a block will start: the page it is pushed to when its
// lead does not fit, and the height there (for the layout tests).
func (r *renderer) blockStart(b Block) place {
	_, ph := r.f.GetPageSize()
	if r.f.GetY()+r.leadHeight(b) > ph-margin-4 {
		return place{r.f.PageNo() + 1, margin + 6}
	}
	return place{r.f.PageNo(), r.f.GetY()}
}

func (r *renderer) bullets(items []string) {
	f := r.f
	r.font("", bodySize)
	for _, it := range items {
		// An item is never split across pages.
		r.ensure(float64(len(f.SplitText(printable(it), r.w-6)))*lineH + 0.6)
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
		// A labelled line is never split across pages: room for the taller of
		// its label and its value.
		r.font("", bodySize)
		lines := len(f.SplitText(printable(p[1]), r.w-labelW))
		r.font("B", bodySize)
		lines = max(lines, len(f.SplitText(printable(p[0]), labelW)))
		r.ensure(float64(lines)*lineH + 1)
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

func (r *renderer) ensure(h float64) {
	_, ph := r.f.GetPageSize()
	if r.f.GetY()+h > ph-margin-4 {
		r.f.AddPage()
	}
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

// hashedFile names the file whose hash a document carries (SHA256): the
// plant file, or the line file of a matrix.
func hashedFile(doc *Document) string {
	if doc.Kind == KindMatrix {
		return "line file"
	}
	return "plant file"
}
