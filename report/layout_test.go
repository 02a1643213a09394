package report

// Source of the expected values: the record's layout rules (a heading keeps
// its first block, names break at their separators, a diagram's value
// labels stay inside its frame); no outside reference applies.

import (
	"fmt"
	"strings"
	"testing"
	"time"
)

func layoutDoc(sections ...Section) *Document {
	return &Document{Title: "layout", Header: "test", ShortHash: "000000000000", SHA256: strings.Repeat("0", 64),
		Date: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC), Version: "test", PageSize: "A4",
		Attachments: []Attachment{{Name: "plant.yaml", Content: []byte("x")}}, Sections: sections}
}

func TestHeadingKeepsItsFirstBlock(t *testing.T) {
	// A first section of n lines leaves the second's heading at every height
	// of the page's lower part; whatever its first block (a figure, a table
	// with a caption, a list), it starts on the heading's page.
	firsts := []Block{
		Diagram{Caption: "diagram", Unit: "°C", Setpoint: 72, Segments: []Segment{{Label: "tube", ProductIn: 72, ProductOut: 72}}},
		Table{Caption: strings.Repeat("a long caption ", 20), Columns: []Column{{Title: "a"}, {Title: "b"}},
			Rows: [][]string{{strings.Repeat("word ", 60), "x"}}},
		Bullets{Items: []string{strings.Repeat("item ", 90)}},
		Plot{Caption: "plot", XLabel: "x", YLabel: "y", Series: []Series{{Name: "s", X: []float64{0, 1}, Y: []float64{0, 1}}}},
	}
	for k, first := range firsts {
		for n := 20; n <= 48; n++ {
			trace := &layoutTrace{}
			doc := layoutDoc(Section{Heading: "One", Blocks: []Block{Paragraph{Text: strings.TrimSpace(strings.Repeat("line\n", n))}}},
				Section{Heading: "Two", Blocks: []Block{first}})
			if _, _, err := render(doc, trace); err != nil {
				t.Fatal(err)
			}
			for i, h := range trace.headings {
				if b := trace.firstBlocks[i]; b.page != h.page {
					t.Errorf("block kind %d, %d lines: heading %d on page %d at %.1f mm, its first block on page %d", k, n, i+1, h.page, h.y, b.page)
				}
			}
		}
	}
}

func TestNamesBreakAtTheirSeparators(t *testing.T) {
	// A field path too wide for its cell breaks after a '.' or '_', never
	// inside a word; words that fit keep the usual breaks at spaces.
	r, err := newRenderer(layoutDoc(), nil)
	if err != nil {
		t.Fatal(err)
	}
	r.f.AddPage()
	r.font("", bodySize)
	name := "regeneration.product_side.channels_per_pass"
	for _, w := range []float64{20, 30, 45} {
		lines := r.splitText(name, w)
		if strings.Join(lines, "") != name {
			t.Fatalf("width %g: %q do not make the name", w, lines)
		}
		for i, l := range lines {
			if r.f.GetStringWidth(l) > w {
				t.Errorf("width %g: %q is wider", w, l)
			}
			if i < len(lines)-1 && !strings.ContainsAny(l[len(l)-1:], "._") {
				t.Errorf("width %g: %q breaks inside a word (%q)", w, l, lines)
			}
		}
	}
	if got := r.splitText("the plate pack's U in service", 30); strings.Join(got, " ") != "the plate pack's U in service" {
		t.Errorf("text at spaces: %q", got)
	}
}

func TestDiagramLabelsStayInTheFrame(t *testing.T) {
	// The SI demo's temperatures: the last product value (4.0 °C) sits at
	// the foot of the frame, where the stretch names are printed below it.
	dg := Diagram{Caption: "temperatures", Unit: "°C", Setpoint: 72.5, Segments: []Segment{
		{Label: "regeneration (raw)", ProductIn: 5, ProductOut: 67.1, Other: "pasteurized product", OtherAtLeft: 10.4, OtherAtRight: 72.5, OtherLeftward: true, OtherIsHot: true, OtherIsProduct: true},
		{Label: "heating", ProductIn: 67.1, ProductOut: 72.8, Other: "water", OtherAtLeft: 74.2, OtherAtRight: 77, OtherLeftward: true, OtherIsHot: true},
		{Label: "holding tube", ProductIn: 72.8, ProductOut: 72.5},
		{Label: "regeneration (pasteurized)", ProductIn: 72.5, ProductOut: 10.4, Other: "raw product", OtherAtLeft: 67.1, OtherAtRight: 5, OtherLeftward: true, OtherIsProduct: true},
		{Label: "cooling: chilled water", ProductIn: 10.4, ProductOut: 4, Other: "water", OtherAtLeft: 3.5, OtherAtRight: 1, OtherLeftward: true},
	}}
	trace := &layoutTrace{}
	if _, _, err := render(layoutDoc(Section{Heading: "Heat", Blocks: []Block{dg}}), trace); err != nil {
		t.Fatal(err)
	}
	fr := trace.frame
	if len(trace.labels) == 0 {
		t.Fatal("no labels traced")
	}
	for _, b := range trace.labels {
		if b[0] < fr[0] || b[1] < fr[1] || b[2] > fr[2] || b[3] > fr[3] {
			t.Errorf("a label at %s lies outside the frame %s", fmt.Sprint(b), fmt.Sprint(fr))
		}
	}
}

func TestTheWidestCellOfAColumnStaysOnOneLine(t *testing.T) {
	// A column is as wide as its widest cell plus the padding; that cell
	// (a header such as "result" or "P(holds)", a number such as "16.03")
	// must come back on one line, not broken by a rounding of the width
	// (seen: "resul t", "16. 03"). And a table too wide for the page shrinks
	// its text column, not below the widest word of any column.
	r, err := newRenderer(layoutDoc(), nil)
	if err != nil {
		t.Fatal(err)
	}
	r.f.AddPage()
	for _, cell := range []string{"result", "P(holds)", "16.03", "2026-11-10", "standard error", "≥ 2.08 cm/m"} {
		for _, style := range []string{"", "B"} {
			r.font(style, bodySize)
			tab := Table{Columns: []Column{{Title: cell}}, Rows: [][]string{{cell}}}
			_, _, widths := r.tableLayout(tab)
			r.font(style, bodySize)
			if got := r.splitText(cell, widths[0]-2*cellPad); len(got) != 1 {
				t.Errorf("%q (style %q) in a column %.4f mm wide: %q", cell, style, widths[0], got)
			}
		}
	}
	long := strings.Repeat("a note that goes on and on ", 30)
	tab := Table{Columns: []Column{{Title: "check"}, {Title: "result"}, {Title: "actual"}, {Title: "note"}},
		Rows: [][]string{{"holding-time", "PASS", "16.34 s", long}}}
	r.font("", bodySize)
	_, _, widths := r.tableLayout(tab)
	for i, cell := range tab.Rows[0][:3] {
		r.font("", bodySize)
		if got := r.splitText(cell, widths[i]-2*cellPad); len(got) != 1 {
			t.Errorf("column %d, %q broken in %.4f mm: %q", i, cell, widths[i], got)
		}
	}
	if sum := widths[0] + widths[1] + widths[2] + widths[3]; sum > r.w+1e-9 {
		t.Errorf("table %.3f mm wide on a %.3f mm page", sum, r.w)
	}
}
