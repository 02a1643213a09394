package report

// No external source applies: the checks are the chart's own definition (trend.go).

import (
	"reflect"
	"strings"
	"testing"
	"time"
)

// TestEveryShadeHasAColour walks Shades through the renderer's colours.
func TestEveryShadeHasAColour(t *testing.T) {
	seen := map[[3]int]bool{}
	for _, s := range Shades {
		c := shadeColour(s)
		if seen[c] {
			t.Errorf("shade %d shares its colour", s)
		}
		seen[c] = true
	}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "report: ") {
			t.Errorf("unknown shade: %v", r)
		}
	}()
	shadeColour(0)
}

// TestRunReviewMetadata: the kind, the inputs not carried and the reading
// options travel in the metadata and are read back as written.
func TestRunReviewMetadata(t *testing.T) {
	doc := &Document{Title: "Run review record", PageSize: "A4", Date: time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC),
		SHA256: strings.Repeat("a", 64), ShortHash: strings.Repeat("a", 12), Version: "0.1.0",
		Attachments: []Attachment{{Name: "plant.yaml", Content: []byte("x")}}, Kind: KindRunReview,
		Inputs:   []InputRef{{Name: "runs/day 1.csv", SHA256: strings.Repeat("b", 64)}, {Name: "runs/day=2.csv.gz", SHA256: strings.Repeat("c", 64)}},
		Options:  "decimal-comma=1&separator=%3B&timezone=Europe%2FBerlin",
		Sections: []Section{{Heading: "Cautions", Blocks: []Block{Paragraph{Text: "caution", Emphasis: true}}}}}
	pdf, _, err := Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	st, err := Read(pdf)
	if err != nil {
		t.Fatal(err)
	}
	if st.Kind != KindRunReview || st.Options != doc.Options || !reflect.DeepEqual(st.Inputs, doc.Inputs) {
		t.Errorf("read back kind %q options %q inputs %v; want %q %q %v", st.Kind, st.Options, st.Inputs, doc.Kind, doc.Options, doc.Inputs)
	}
}
