package record

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/report"
)

var day = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

func demo(t *testing.T, name string) (*assess.Result, *report.Document) {
	t.Helper()
	p, err := plantfile.Load(filepath.Join("../../testdata/demo", name+".yaml"))
	if err != nil {
		t.Fatal(err)
	}
	res, err := assess.RunWith(p, assess.Options{On: day})
	if err != nil {
		t.Fatal(err)
	}
	doc, err := Build(res, Options{Date: day, PlantName: name + ".yaml"})
	if err != nil {
		t.Fatal(err)
	}
	return res, doc
}

var demos = []string{"htst-milk-si", "cider-us", "frozen-dessert-si"}

func TestDocumentModel(t *testing.T) {
	// The record's content is specified by the project (README, "Making and verifying a record"):
	// cover with verdicts, inputs, method, heat exchange with a diagram, holding tube
	// with a log-reduction plot, checks, cautions from SAFETY.md, sign-off.
	for _, name := range demos {
		t.Run(name, func(t *testing.T) {
			res, doc := demo(t, name)
			var headings []string
			blocks := map[report.BlockKind]int{}
			var text strings.Builder
			for _, s := range doc.Sections {
				headings = append(headings, s.Heading)
				for _, b := range s.Blocks {
					blocks[b.Kind()]++
					switch v := b.(type) {
					case report.Paragraph:
						text.WriteString(v.Text + "\n")
					case report.Bullets:
						text.WriteString(strings.Join(v.Items, "\n"))
					case report.Table:
						for _, r := range v.Rows {
							text.WriteString(strings.Join(r, " | ") + "\n")
						}
					case report.SignOff:
						text.WriteString(strings.Join(v.Roles, ",") + "\n")
					}
				}
			}
			want := []string{"Inputs", "Method"}
			if len(res.Sections) > 0 {
				want = append(want, "Heat exchange")
			}
			want = append(want, "Holding tube and lethality", "Checks")
			if len(res.Plant.Uncertainty) > 0 {
				want = append(want, "Margins under uncertainty")
			}
			if len(res.Acceptance) > 0 || res.Diversion != nil {
				want = append(want, "Acceptance tests")
			}
			want = append(want, "Critical limits (draft for the HACCP team)")
			if WantsWhatIf(res.Plant) {
				want = append(want, "What if: added regeneration plates")
			}
			want = append(want, "Cautions", "Sign-off")
			if strings.Join(headings, "/") != strings.Join(want, "/") {
				t.Errorf("sections %v, want %v", headings, want)
			}
			if len(doc.Cover.Verdicts) != len(res.Checks) || doc.Cover.Pass != res.Pass {
				t.Errorf("cover verdicts %d for %d checks", len(doc.Cover.Verdicts), len(res.Checks))
			}
			all := text.String()
			for _, c := range res.Checks {
				if !strings.Contains(all, present.CheckLabel(c)+" | ") {
					t.Errorf("check %s missing from the checks table", present.CheckLabel(c))
				}
			}
			for _, must := range append([]string{assess.Caution, "Prepared by,Reviewed by,Approved by"}, AcceptanceTests...) {
				if !strings.Contains(all, must) {
					t.Errorf("record lacks %q", must)
				}
			}
			if blocks[report.DiagramBlock] != 1 || blocks[report.PlotBlock] < 1 && len(res.Lethality) > 0 {
				t.Errorf("blocks %v", blocks)
			}
			if !strings.Contains(doc.Cover.Statement, "not a regulatory approval") {
				t.Error("cover statement lacks the disclaimer")
			}
			if len(doc.ShortHash) != 12 || doc.SHA256 != res.InputSHA256 {
				t.Errorf("hash %q", doc.ShortHash)
			}
		})
	}
}

func TestDiagramFollowsTheProductPath(t *testing.T) {
	// SI demo: raw 5 → regeneration → heating → tube → regeneration → cooling → 4 °C;
	// each stretch starts where the previous one ended (continuity of the product line).
	_, doc := demo(t, "htst-milk-si")
	var dg report.Diagram
	for _, s := range doc.Sections {
		for _, b := range s.Blocks {
			if d, ok := b.(report.Diagram); ok {
				dg = d
			}
		}
	}
	labels := []string{}
	for i, s := range dg.Segments {
		labels = append(labels, s.Label)
		if i > 0 && abs(s.ProductIn-dg.Segments[i-1].ProductOut) > 1e-9 {
			t.Errorf("%s starts at %g, previous ends at %g", s.Label, s.ProductIn, dg.Segments[i-1].ProductOut)
		}
	}
	if strings.Join(labels, "/") != "regeneration (raw)/heating/holding tube/regeneration (pasteurized)/cooling: chilled water" {
		t.Errorf("segments %v", labels)
	}
	if dg.Segments[0].ProductIn != 5 || abs(dg.Segments[4].ProductOut-4) > 1e-9 || dg.Unit != "°C" || dg.Setpoint != 72.5 {
		t.Errorf("ends %g → %g %s", dg.Segments[0].ProductIn, dg.Segments[4].ProductOut, dg.Unit)
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func TestRenderIsDeterministicAndVerifiable(t *testing.T) {
	for _, name := range demos {
		_, doc := demo(t, name)
		a, pages, err := report.Render(doc)
		if err != nil {
			t.Fatal(err)
		}
		b, _, _ := report.Render(doc)
		if !bytes.Equal(a, b) {
			t.Errorf("%s: two renders differ", name)
		}
		if pages < 2 {
			t.Errorf("%s: %d pages", name, pages)
		}
		plant := doc.Attachments[0].Content
		v, err := report.Verify(a, plant)
		if err != nil || !v.Match || v.RecordedSHA256 != doc.SHA256 {
			t.Errorf("%s: verify %+v %v", name, v, err)
		}
		st, err := report.Read(a)
		if err != nil || len(st.Attachments) != 1 || !bytes.Equal(st.Attachments[0].Content, plant) || st.Attachments[0].Name != name+".yaml" {
			t.Errorf("%s: attachment differs (%v)", name, err)
		}
		// The metadata carries what a re-render needs and the verdicts.
		if err == nil && (st.Version != doc.Version || !st.Date.Equal(doc.Date) || st.Pass != doc.Cover.Pass ||
			!reflect.DeepEqual(st.Verdicts, doc.Cover.Verdicts) || st.Pages != pages) {
			t.Errorf("%s: stored %+v", name, st)
		}
	}
}

func TestVerifyTamper(t *testing.T) {
	_, doc := demo(t, "htst-milk-si")
	pdf, _, err := report.Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	// One byte of the plant file changed: mismatch.
	plant := append([]byte(nil), doc.Attachments[0].Content...)
	plant[len(plant)/2] ^= 0x01
	if v, err := report.Verify(pdf, plant); err != nil || v.Match {
		t.Errorf("tampered plant file: %+v %v", v, err)
	}
	// The recorded hash changed in the record: the attachment no longer matches it.
	other := "0"
	if doc.SHA256[0] == '0' {
		other = "1"
	}
	forged := bytes.Replace(pdf, []byte(report.KeywordPrefix+doc.SHA256[:1]), []byte(report.KeywordPrefix+other), 1)
	if v, err := report.Verify(forged, nil); err != nil || v.Match {
		t.Errorf("forged hash: %+v %v", v, err)
	}
	// Not a record, or a record without its attachment: unreadable.
	for _, bad := range [][]byte{[]byte("hello"), []byte("%PDF-1.3\n%%EOF"), bytes.Replace(pdf, []byte("/Type /EmbeddedFile"), []byte("/Type /EmbeddedFilX"), 1)} {
		if _, err := report.Verify(bad, nil); !errors.Is(err, report.ErrUnreadable) {
			t.Errorf("unreadable record accepted: %v", err)
		}
	}
	// A damaged attachment stream is unreadable, not a crash.
	i := bytes.Index(pdf, []byte("stream\nx"))
	damaged := append([]byte(nil), pdf...)
	for j := i + 9; j < i+40; j++ {
		damaged[j] ^= 0xff
	}
	if _, err := report.Verify(damaged, nil); !errors.Is(err, report.ErrUnreadable) {
		t.Errorf("damaged stream: %v", err)
	}
}

func TestWhatIfPage(t *testing.T) {
	// With an economics block and a rated regenerator the record gains the what-if
	// page: a table row per option and the ratio and payback plots.
	p, err := plantfile.Load("../../testdata/demo/cider-us.yaml")
	if err != nil {
		t.Fatal(err)
	}
	res, _ := assess.Run(p)
	w, err := assess.AddPlates(p, WhatIfSweep(p.Regeneration.Plates.Plates), assess.DefaultKneeFraction, WhatIfLayout(p))
	if err != nil {
		t.Fatal(err)
	}
	if !WantsWhatIf(p) || WantsWhatIf(res.Plant) != (p.Economics != nil) {
		t.Fatal("the cider demo has a rated regenerator and economics")
	}
	doc, err := Build(res, Options{Date: day})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range doc.Sections {
		if s.Heading != "What if: added regeneration plates" {
			continue
		}
		plots, rows := 0, 0
		for _, b := range s.Blocks {
			switch v := b.(type) {
			case report.Plot:
				plots++
			case report.Table:
				rows = len(v.Rows)
			}
		}
		if plots != 2 || rows != len(w.Options)+1 {
			t.Errorf("what-if page: %d plots, %d rows", plots, rows)
		}
		return
	}
	t.Error("no what-if page")
}

func TestWhatIfSweep(t *testing.T) {
	// About ten steps up to doubling the plates (the project's choice, README).
	if got := WhatIfSweep(40); len(got) != 10 || got[0] != 4 || got[9] != 40 {
		t.Errorf("WhatIfSweep(40) = %v", got)
	}
	if got := WhatIfSweep(3); got[0] != 1 || got[len(got)-1] != 10 {
		t.Errorf("WhatIfSweep(3) = %v", got)
	}
	// Never past the one plate limit: 10010 plates were accepted and then
	// failed the record's what-if; 9995 installed leave room for 5.
	for _, plates := range []int{1, 10, 4999, 5000, 5001, 9995, 9999, plantfile.MaxPlates} {
		got := WhatIfSweep(plates)
		if len(got) > 0 && plates+got[len(got)-1] > plantfile.MaxPlates || (len(got) == 0) != (plates == plantfile.MaxPlates) {
			t.Errorf("WhatIfSweep(%d) = %v", plates, got)
		}
	}
}

func TestSectionTables(t *testing.T) {
	// One detail table per section; the medium mass flow is the section's own,
	// shown in the plant's units (US demo: lb/h = kg/s × 3600 / 0.45359237, NIST SP 811).
	res, doc := demo(t, "cider-us")
	var details []report.Table
	for _, s := range doc.Sections {
		for _, b := range s.Blocks {
			if tb, ok := b.(report.Table); ok && strings.HasPrefix(tb.Caption, "Section ") {
				details = append(details, tb)
			}
		}
	}
	if len(details) != len(res.Sections) {
		t.Fatalf("%d detail tables for %d sections", len(details), len(res.Sections))
	}
	heating := res.Sections[1]
	want := fmt.Sprintf("%.0f lb/h", heating.MediumMassFlowKgS*3600/0.45359237)
	found := false
	for _, r := range details[1].Rows {
		for _, c := range r {
			found = found || c == want
		}
	}
	if !found {
		t.Errorf("heating medium flow %q not in %v", want, details[1].Rows)
	}
}

func TestPlatePacksInRecord(t *testing.T) {
	// The SI demo's plate packs: the heat-exchange page carries the two pack
	// tables, each section's detail table its pack's figures, and the
	// section warning (heating's entered U) stays with the sections.
	res, doc := demo(t, "htst-milk-si")
	var heat report.Section
	for _, s := range doc.Sections {
		if s.Heading == "Heat exchange" {
			heat = s
		}
	}
	var captions []string
	var cells []string
	warned := false
	for _, b := range heat.Blocks {
		switch v := b.(type) {
		case report.Table:
			captions = append(captions, v.Caption)
			for _, r := range v.Rows {
				cells = append(cells, r...)
			}
		case report.Bullets:
			for _, it := range v.Items {
				warned = warned || strings.HasPrefix(it, "heating: the entered u_value")
			}
		}
	}
	joined := strings.Join(captions, "\n")
	for _, want := range []string{"Plate packs at the normal rate, each side", "Plate packs: overall coefficient"} {
		if !strings.Contains(joined, want) {
			t.Errorf("no table %q in %q", want, joined)
		}
	}
	d := present.Display{Sys: res.Plant.System}
	wantU := d.With(res.Sections[0].PackFigures.UCleanWm2K, units.HeatTransferCoefficient, 0)
	if !contains(cells, "U clean (plate pack)") || !contains(cells, wantU) || !contains(cells, "raw product: pressure drop") {
		t.Errorf("regeneration detail lacks its pack figures (%s)", wantU)
	}
	if !warned {
		t.Error("the heating warning is not with the sections")
	}
}

func TestWhatIfPageWithPlatePack(t *testing.T) {
	// The SI demo with an economics block: the what-if page adds plates as
	// channels per pass (WhatIfLayout) and shows each option's layout and U.
	src, err := os.ReadFile("../../testdata/demo/htst-milk-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	src = append(src, []byte("economics:\n  operating_hours_per_year: 5000\n  heat_price_per_kWh: 0.05\n  cooling_price_per_kWh: 0.03\n  plate_cost: 300\n")...)
	p, err := plantfile.Parse("milk.yaml", src)
	if err == nil {
		err = plantfile.Validate(p)
	}
	if err != nil {
		t.Fatal(err)
	}
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := Build(res, Options{Date: day})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range doc.Sections {
		if s.Heading != "What if: added regeneration plates" {
			continue
		}
		var layout *report.Table
		notes := ""
		for _, b := range s.Blocks {
			switch v := b.(type) {
			case report.Table:
				if strings.HasPrefix(v.Caption, "The regenerator's plate pack") {
					layout = &v
				}
			case report.Bullets:
				notes = strings.Join(v.Items, " ")
			}
		}
		if layout == nil || len(layout.Rows) < 3 || layout.Rows[0][2] != "8 × 7" || layout.Rows[1][2] != "8 × 8" {
			t.Fatalf("layout table %+v", layout)
		}
		if !strings.Contains(notes, "channels per pass") {
			t.Errorf("notes %q", notes)
		}
		return
	}
	t.Error("no what-if page")
}

func contains(cells []string, want string) bool {
	for _, c := range cells {
		if c == want {
			return true
		}
	}
	return false
}

func TestAcceptanceAndCriticalLimitPages(t *testing.T) {
	// The project's specification (docs/METHOD.md §15): a page of the
	// acceptance tests, each measured against the model with its verdict and
	// due date, and the critical-limit table on a page of its own, marked as a
	// draft for the HACCP team.
	res, doc := demo(t, "htst-milk-si")
	var acc, limits *report.Section
	for i := range doc.Sections {
		switch doc.Sections[i].Heading {
		case "Acceptance tests":
			acc = &doc.Sections[i]
		case "Critical limits (draft for the HACCP team)":
			limits = &doc.Sections[i]
		}
	}
	if acc == nil || limits == nil {
		t.Fatal("the SI demo's record lacks a page")
	}
	tables := 0
	for _, b := range acc.Blocks {
		if tb, ok := b.(report.Table); ok {
			tables++
			if tables == 1 && (len(tb.Rows) != len(res.Acceptance) || !strings.Contains(strings.Join(tb.Rows[1], "|"), "16.24 s as the product")) {
				t.Errorf("results table %v", tb.Rows)
			}
			if tables == 2 && len(tb.Rows) != 7 {
				t.Errorf("due table has %d rows, want 7 kinds", len(tb.Rows))
			}
		}
	}
	if tables != 2 {
		t.Errorf("%d tables on the acceptance page", tables)
	}
	if !limits.NewPage {
		t.Error("the critical limits do not start a page")
	}
	first, ok := limits.Blocks[0].(report.Paragraph)
	if !ok || !first.Emphasis || !strings.HasPrefix(first.Text, "DRAFT for the HACCP team") {
		t.Errorf("draft marker %+v", limits.Blocks[0])
	}
	if tb, ok := limits.Blocks[1].(report.Table); !ok || len(tb.Rows) != len(res.CriticalLimits) || len(tb.Rows) != 5 {
		t.Errorf("critical-limit table %+v", limits.Blocks[1])
	}
	// A plant file without acceptance tests has no acceptance page, but its
	// critical limits still.
	_, doc = demo(t, "cider-us")
	for _, s := range doc.Sections {
		if s.Heading == "Acceptance tests" {
			t.Error("the cider demo enters no test")
		}
	}
}
