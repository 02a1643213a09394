package report

// Source of the expectations: the document model (model.go); the renderer
// must lay out every kind of block.

import (
	"strings"
	"testing"
	"time"
)

// sampleBlock is one block of each kind.
func sampleBlock(k BlockKind) Block {
	switch k {
	case ParagraphBlock:
		return Paragraph{Text: "text"}
	case BulletsBlock:
		return Bullets{Items: []string{"a", "b"}}
	case KeyValuesBlock:
		return KeyValues{Pairs: [][2]string{{"key", "value"}}}
	case TableBlock:
		return Table{Caption: "t", Columns: []Column{{Title: "a"}, {Title: "b", Right: true}}, Rows: [][]string{{"x", "1"}}}
	case DiagramBlock:
		return Diagram{Unit: "°C", Setpoint: 72, Segments: []Segment{{Label: "heating", ProductIn: 60, ProductOut: 72, Other: "water",
			OtherAtLeft: 74, OtherAtRight: 77, OtherLeftward: true, OtherIsHot: true}}}
	case PlotBlock:
		return Plot{XLabel: "x", YLabel: "y", Series: []Series{{Name: "s", X: []float64{0, 1}, Y: []float64{0, 1}},
			{Name: "points", X: []float64{0.2, 0.7}, Y: []float64{0.3, 0.6}, Markers: true}}}
	case SignOffBlock:
		return SignOff{Roles: []string{"Prepared by"}}
	case BarChartBlock:
		return BarChart{Caption: "c", Unit: "s", Bars: []Bar{{Label: "a", Value: 1}, {Label: "b", Value: 0}}}
	case TrendBlock:
		return Trend{YLabel: "°C", Limit: 72.5, LimitLabel: "setpoint", Start: 0, End: 100, Ticks: []Tick{{At: 50, Label: "00:50"}},
			Buckets: []TrendBucket{{Start: 0, End: 40, Min: 72.9, Max: 73.1, First: 40}, {Start: 41, End: 100, Min: 70, Max: 73, Second: 60}},
			Bands:   []Band{{Start: 41, End: 45, Shade: ShadeAlert, Name: "at risk"}}, StateLabels: [2]string{"forward", "diverted"}}
	}
	return nil
}

func TestEveryBlockKindRenders(t *testing.T) {
	var blocks []Block
	for _, k := range BlockKinds {
		b := sampleBlock(k)
		if b == nil || b.Kind() != k {
			t.Fatalf("no sample of kind %d", k)
		}
		blocks = append(blocks, b)
	}
	doc := &Document{Title: "t", PageSize: "A4", Date: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), SHA256: strings.Repeat("0", 64),
		ShortHash: strings.Repeat("0", 12), Attachments: []Attachment{{Name: "x.yaml", Content: []byte("x")}}, Sections: []Section{{Heading: "All", Blocks: blocks}}}
	if _, pages, err := Render(doc); err != nil || pages < 1 {
		t.Fatalf("render: %d pages, %v", pages, err)
	}
	doc.Sections = []Section{{Heading: "Bad", Blocks: []Block{unknownBlock{}}}}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "report: ") {
			t.Errorf("unknown block: %v", r)
		}
	}()
	Render(doc)
}

type unknownBlock struct{}

func (unknownBlock) Kind() BlockKind { return 0 }
