package record

// Expected events and verdicts follow the demo shift's documented script (internal/rungen,
// computed from docs/METHOD.md §13); the page list is the record's own layout.

import (
	"strings"
	"testing"
	"time"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/rungen"
	"pasval/report"
	"pasval/runs"
)

// scriptedReview reviews the demo shift's script without noise (from second
// from to second to) against the SI demo plant, with traces, as one file.
func scriptedReview(t *testing.T, from, to int, loc *time.Location) *assess.RunReview {
	t.Helper()
	p, err := plantfile.Load("../../testdata/demo/htst-milk-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	rm, err := assess.NewRunModel(p)
	if err != nil {
		t.Fatal(err)
	}
	e, err := runs.NewEngine(rm.Model, runs.Options{Trace: TraceBuckets})
	if err != nil {
		t.Fatal(err)
	}
	t0 := runs.UnixSeconds(rungen.Start)
	for sec := from; sec < to; sec++ {
		temp, flow, fwd, skip := rungen.Script(sec)
		if skip {
			continue
		}
		if err := e.Add(runs.Sample{Time: t0 + float64(sec), Temperature: temp, Flow: flow / 3.6e6, Forward: fwd}); err != nil {
			t.Fatal(err)
		}
	}
	f := assess.RunFile{Path: "shift.csv", SHA256: strings.Repeat("5", 64), Clock: true, Result: e.Finish()}
	f.Rows = f.Result.Summary.Rows
	rev, err := assess.NewRunReview(p, rm, []assess.RunFile{f}, loc)
	if err != nil {
		t.Fatal(err)
	}
	return rev
}

func blocksOf[T report.Block](doc *report.Document) []T {
	var out []T
	for _, s := range doc.Sections {
		for _, b := range s.Blocks {
			if v, ok := b.(T); ok {
				out = append(out, v)
			}
		}
	}
	return out
}

// TestRunReviewOfTheShift: the demo shift's record names its runs, fails
// each verdict line the scenario crosses (it has every kind of event),
// shades each event after its verdict, and draws the setpoint and the seal.
func TestRunReviewOfTheShift(t *testing.T) {
	rev := scriptedReview(t, 0, rungen.ShiftLength, nil)
	doc := BuildRunReview(rev, RunOptions{Date: day, PlantName: "htst-milk-si.yaml", Options: "gap=5"})
	if doc.Kind != report.KindRunReview || doc.Options != "gap=5" || len(doc.Inputs) != 1 || doc.Inputs[0].Name != "shift.csv" ||
		doc.Attachments[0].Name != "htst-milk-si.yaml" {
		t.Errorf("kind %q options %q inputs %v attachments %v", doc.Kind, doc.Options, doc.Inputs, doc.Attachments)
	}
	c := doc.Cover
	if c.Pass || len(c.Verdicts) != 4 || !strings.Contains(c.Overall, "7 events") {
		t.Errorf("cover %+v", c)
	}
	for _, v := range c.Verdicts {
		if v.Pass {
			t.Errorf("verdict %q passes; the shift crosses every limit", v.Check)
		}
	}
	var heads []string
	for _, s := range doc.Sections {
		heads = append(heads, s.Heading)
	}
	if got := strings.Join(heads, " | "); got != "Runs reviewed | Summary | Temperature and flow | Events and diversion response | Method | Cautions | Sign-off" {
		t.Errorf("sections %s", got)
	}
	if p := blocksOf[report.Paragraph](doc); !containsText(p, assess.Caution) {
		t.Error("no caution")
	}
	trends := blocksOf[report.Trend](doc)
	if len(trends) != 2 {
		t.Fatalf("%d trends, want temperature and flow", len(trends))
	}
	// The limits in display units: 72.5 °C and 11 000 L/h (plant file).
	if !near(trends[0].Limit, 72.5) || !near(trends[1].Limit, 11000) {
		t.Errorf("limits %g and %g, want 72.5 and 11000", trends[0].Limit, trends[1].Limit)
	}
	shades := map[report.Shade]int{}
	for _, b := range trends[0].Bands {
		shades[b.Shade]++
	}
	// 3 limits met, 3 product at risk, 1 no record (the scenario's events).
	if shades[report.ShadeNotice] != 3 || shades[report.ShadeAlert] != 3 || shades[report.ShadeUnknown] != 1 {
		t.Errorf("bands by shade %v", shades)
	}
	samples := 0
	for _, b := range trends[0].Buckets {
		samples += b.First + b.Second
	}
	if samples != rungen.ShiftRows || len(trends[0].Buckets) > TraceBuckets {
		t.Errorf("%d samples in %d buckets, want %d in at most %d", samples, len(trends[0].Buckets), rungen.ShiftRows, TraceBuckets)
	}
	// Two hours: ticks every 15 minutes from 06:00 UTC (at most eight).
	want := []string{"06:00", "06:15", "06:30", "06:45", "07:00", "07:15", "07:30", "07:45"}
	var got []string
	for _, tk := range trends[0].Ticks {
		got = append(got, tk.Label)
	}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("ticks %v, want %v", got, want)
	}
	if _, _, err := report.Render(doc); err != nil {
		t.Fatal(err)
	}
}

// TestRunReviewWithoutEvents: a clean stretch of the shift passes every line.
func TestRunReviewWithoutEvents(t *testing.T) {
	berlin, err := time.LoadLocation("Europe/Berlin")
	if err != nil {
		t.Skip("no time-zone data:", err)
	}
	rev := scriptedReview(t, rungen.StartupEnd+60, rungen.SmallDip, berlin)
	doc := BuildRunReview(rev, RunOptions{Date: day, PlantName: "p.yaml"})
	if !doc.Cover.Pass {
		t.Errorf("cover %+v", doc.Cover)
	}
	for _, v := range doc.Cover.Verdicts {
		if !v.Pass {
			t.Errorf("verdict %q fails", v.Check)
		}
	}
	if p := blocksOf[report.Paragraph](doc); !containsText(p, "No event") {
		t.Error("no 'No event' paragraph")
	}
	// 06:05 to 06:25 UTC is 07:05 to 07:25 in Berlin (CET): ticks every 5 minutes there.
	ticks := blocksOf[report.Trend](doc)[0].Ticks
	if len(ticks) == 0 || ticks[0].Label != "07:05" {
		t.Errorf("ticks %v, want from 07:05", ticks)
	}
}

func containsText(ps []report.Paragraph, s string) bool {
	for _, p := range ps {
		if strings.Contains(p.Text, s) {
			return true
		}
	}
	return false
}

func near(a, b float64) bool { return a-b < 1e-9*b && b-a < 1e-9*b }
