package main

// Nothing judged must never read as PASS, and what the tool takes in place
// of an entry it lacks is said where it shows (docs/METHOD.md §19.2).

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/record"
	"pasval/report"
)

// writePlant writes a plant file into a fresh folder and returns its path.
func writePlant(t *testing.T, name, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// juice is a plant with nothing to judge: no section, no holding tube, no
// flow (invented).
const juice = `product:
  name: juice
  density: 1045 kg/m3
  specific_heat: 3.8 kJ/(kg*K)
process:
  raw_inlet: 8 °C
  hold_setpoint: 85 °C
`

func TestNothingJudgedIsNotAPass(t *testing.T) {
	path := writePlant(t, "juice.yaml", juice)
	out, _, code := runBinary(t, "check", path)
	if code != exitPass || !strings.Contains(out, "Result: NOT JUDGED: no check applies") || strings.Contains(out, "PASS") {
		t.Errorf("check: exit %d\n%s", code, out)
	}
	// No flow is entered: none is printed as if it were.
	if strings.Contains(out, "0 L/h") || !strings.Contains(out, "Flow     not entered") {
		t.Errorf("the flow of a plant without one:\n%s", out)
	}
	js, _, _ := runBinary(t, "check", "--json", path)
	var r struct {
		Pass   *bool `json:"pass"`
		Judged *bool `json:"judged"`
	}
	if err := json.Unmarshal([]byte(js), &r); err != nil {
		t.Fatal(err)
	}
	if r.Pass == nil || !*r.Pass || r.Judged == nil || *r.Judged {
		t.Errorf("JSON pass %v judged %v, want true and false", r.Pass, r.Judged)
	}

	// The record: the "wrote" line, the cover and the metadata say so, and
	// verify compares it like a verdict.
	rec := filepath.Join(t.TempDir(), "juice.pdf")
	var o, e bytes.Buffer
	if code := run([]string{"report", path, "-o", rec}, &o, &e); code != exitPass ||
		!strings.Contains(o.String(), "NOT JUDGED: no check applies") || strings.Contains(o.String(), "PASS") {
		t.Errorf("report: exit %d\n%s%s", code, o.String(), e.String())
	}
	pdf, err := os.ReadFile(rec)
	if err != nil {
		t.Fatal(err)
	}
	st, err := report.Read(pdf)
	if err != nil {
		t.Fatal(err)
	}
	if !st.HasVerdicts || !st.NotJudged || !st.Pass {
		t.Errorf("stored: verdicts %v not judged %v pass %v", st.HasVerdicts, st.NotJudged, st.Pass)
	}
	o.Reset()
	if code := run([]string{"verify", rec}, &o, &e); code != exitPass || !strings.Contains(o.String(), "stored NOT JUDGED, recomputed NOT JUDGED") {
		t.Errorf("verify: exit %d\n%s", code, o.String())
	}
	p, err := plantfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := record.Build(res, record.Options{Date: recordDay, PlantName: "juice.yaml"})
	if err != nil {
		t.Fatal(err)
	}
	if c := doc.Cover; !c.NotJudged || c.Overall != "Result: NOT JUDGED: no check applies." {
		t.Errorf("cover: not judged %v, %q", c.NotJudged, c.Overall)
	}
}

func TestHoldingTimeWithoutLegalRowsIsSaid(t *testing.T) {
	// The SI demo without its legal rows: the holding time is not judged,
	// and a warning says so.
	src, err := os.ReadFile(filepath.Join(demoDir, "htst-milk-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	i := strings.Index(text, "legal_minimums:")
	j := strings.Index(text, "uncertainty:")
	if i < 0 || j < i {
		t.Fatal("the demo's legal rows were not found")
	}
	path := writePlant(t, "no-rows.yaml", text[:i]+text[j:])
	r, _ := judged(t, path)
	if _, ok := r.warned("holding-time-not-judged"); !ok {
		t.Errorf("no holding-time-not-judged warning: %+v", r.Warnings)
	}
}

func TestOneRateStandsForTheOther(t *testing.T) {
	// The SI demo with one of its rates left out: the other is taken for
	// it (flow.rate defaults to flow.max_rate and back, README "The plant
	// file"), which a note says and the Flow line shows.
	src, err := os.ReadFile(filepath.Join(demoDir, "htst-milk-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		drop, note, flow string
	}{
		{"  max_rate: 11000 L/h\n", "sealed-maximum-from-rate", "Flow     10000 L/h normal, taken as the sealed maximum (flow.max_rate not entered)"},
		{"  rate: 10000 L/h\n", "rate-from-sealed-maximum", "Flow     11000 L/h sealed maximum, taken as the normal rate (flow.rate not entered)"},
	} {
		// (and the tolerance the demo gives the seal, which needs it entered)
		text := strings.Replace(strings.Replace(string(src), c.drop, "", 1), "  flow.max_rate: {tolerance: ±1.5 %, distribution: uniform}", "", 1)
		path := writePlant(t, "one-rate.yaml", text)
		r, _ := judged(t, path)
		if _, ok := r.warned(c.note); !ok {
			t.Errorf("no %s note: %+v", c.note, r.Warnings)
		}
		out, _, _ := runBinary(t, "check", path)
		if !strings.Contains(out, c.flow) {
			t.Errorf("no %q in\n%s", c.flow, out)
		}
	}
}

func TestHoldWithNothingToJudge(t *testing.T) {
	// A holding tube with no rise, no legal rows and no organisms: hold
	// computes it and judges nothing, and says so (JSON judged false).
	text := strings.Replace(juice, "  specific_heat: 3.8 kJ/(kg*K)\n", "  specific_heat: 3.8 kJ/(kg*K)\n  viscosity: [{at: 85 °C, value: 2 mPa*s}]\n", 1) +
		"flow: {max_rate: 5000 L/h}\nholding_tube: {sanitary_tube: 2 in, length: 20 m}\n"
	path := writePlant(t, "tube.yaml", text)
	out, errs, code := runBinary(t, "hold", path)
	if code != exitPass || !strings.Contains(out, "Result: NOT JUDGED: no check of the holding tube applies") || strings.Contains(out, "PASS") {
		t.Errorf("hold: exit %d\n%s%s", code, out, errs)
	}
	js, _, _ := runBinary(t, "hold", "--json", path)
	var r struct {
		Pass   *bool `json:"pass"`
		Judged *bool `json:"judged"`
	}
	if err := json.Unmarshal([]byte(js), &r); err != nil {
		t.Fatal(err)
	}
	if r.Pass == nil || !*r.Pass || r.Judged == nil || *r.Judged {
		t.Errorf("hold JSON pass %v judged %v", r.Pass, r.Judged)
	}
}
