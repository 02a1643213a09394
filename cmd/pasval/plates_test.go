package main

// Source of the expected values: relations computed from the plant files
// (payback = added × plate cost / annual saving, docs/METHOD.md §5.2, §18 for the ε–NTU
// ceiling); the numbers themselves are checked against hand calculations in
// internal/assess/whatif_test.go.

import (
	"bytes"
	"encoding/json"
	"math"
	"pasval/internal/version"
	"path/filepath"
	"strings"
	"testing"
)

func TestPlatesCommand(t *testing.T) {
	path := filepath.Join(demoDir, "cider-us.yaml")
	out, errs, code := runBinary(t, "plates", path, "--add", "10,20,40")
	if code != 0 {
		t.Fatalf("exit %d %s", code, errs)
	}
	for _, want := range []string{"baseline", "+10", "+20", "+40", "payback years", "USD", "Caution:"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q", want)
		}
	}
	out, _, code = runBinary(t, "plates", path, "--add", "20,10,40", "--json")
	var w struct {
		Baseline struct {
			Plates            int
			RegenerationRatio float64 `json:"regeneration_ratio"`
			HeatingDutyKW     float64 `json:"heating_duty_kW"`
			CoolingDutyKW     float64 `json:"cooling_duty_kW"`
		}
		Options []struct {
			AddedPlates            int      `json:"added_plates"`
			Plates                 int      `json:"plates"`
			RegenerationRatio      float64  `json:"regeneration_ratio"`
			HeatingSavedKW         float64  `json:"heating_saved_kW"`
			CoolingSavedKW         float64  `json:"cooling_saved_kW"`
			AnnualEnergySavedKWh   *float64 `json:"annual_energy_saved_kWh"`
			AnnualCostSaved        *float64 `json:"annual_cost_saved"`
			PaybackYears           *float64 `json:"payback_years"`
			HeatingMediumRequiredC *float64 `json:"heating_medium_required_C"`
			CoolingOutletC         *float64 `json:"cooling_outlet_C"`
		}
	}
	if err := json.Unmarshal([]byte(out), &w); err != nil || code != 0 {
		t.Fatalf("%v exit %d", err, code)
	}
	if w.Baseline.Plates != 40 || len(w.Options) != 3 || w.Options[0].AddedPlates != 10 || w.Options[2].Plates != 80 {
		t.Fatalf("options %+v", w.Options)
	}
	for _, o := range w.Options {
		// ε rises with plates; savings positive; the rated cooling stages save
		// what they no longer remove, less than the heating saved, since their
		// outlet also falls; payback = added × 340 USD / annual cost (economics
		// block of the demo).
		if !(o.RegenerationRatio > w.Baseline.RegenerationRatio) || !(o.CoolingSavedKW > 0) || !(o.CoolingSavedKW < o.HeatingSavedKW) {
			t.Errorf("+%d: %+v", o.AddedPlates, o)
		}
		if o.PaybackYears == nil || math.Abs(*o.PaybackYears - float64(o.AddedPlates)*340 / *o.AnnualCostSaved) > 1e-9 {
			t.Errorf("+%d payback %v", o.AddedPlates, o.PaybackYears)
		}
		if o.HeatingMediumRequiredC == nil || o.CoolingOutletC == nil {
			t.Errorf("+%d: rated heating and cooling results missing", o.AddedPlates)
		}
	}
	// Sweep with a knee.
	out, _, code = runBinary(t, "plates", path, "--sweep", "10:150:10")
	if code != 0 || !strings.Contains(out, "◀ knee") || !strings.Contains(out, "knee: beyond +") {
		t.Errorf("sweep: exit %d\n%s", code, out)
	}
	// A sized regenerator is refused with the hint; usage errors exit 2.
	for _, args := range [][]string{
		{"plates", filepath.Join(demoDir, "frozen-dessert-si.yaml"), "--add", "10"},
		{"plates", filepath.Join(demoDir, "htst-milk-si.yaml"), "--add", "10"},
		{"plates", filepath.Join(demoDir, "htst-milk-si.yaml"), "--add", "10", "--layout", "diagonal"},
		{"plates", path, "--add", "10", "--layout", "channels"},
		{"plates", path},
		{"plates", path, "--add", "10", "--sweep", "1:2:1"},
		{"plates", path, "--add", "ten"},
		{"plates", path, "--add", "-5"},
		{"plates", path, "--sweep", "10:5:1"},
		{"plates", path, "--sweep", "1:100000:1"},
		{"plates", path, "--add", "10", "--knee-fraction", "2"},
	} {
		if _, errs, code := runBinary(t, args...); code != 2 || errs == "" {
			t.Errorf("%v: exit %d %q", args, code, errs)
		}
	}
	_, errs, _ = runBinary(t, "plates", filepath.Join(demoDir, "frozen-dessert-si.yaml"), "--add", "10")
	if !strings.Contains(errs, "rating mode") || !strings.Contains(errs, "regeneration.plates") {
		t.Errorf("hint missing: %q", errs)
	}
	_, errs, _ = runBinary(t, "plates", filepath.Join(demoDir, "htst-milk-si.yaml"), "--add", "10")
	if !strings.Contains(errs, "plate pack") || !strings.Contains(errs, "--layout passes or --layout channels") {
		t.Errorf("layout hint missing: %q", errs)
	}
}

func TestPlatesLayouts(t *testing.T) {
	// The SI demo's regenerator has 8 passes of 7 channels a side
	// (docs/METHOD.md §12.4). As channels per pass, one step adds 8 + 8 = 16
	// plates and slows every channel (v ∝ 1/channels per pass), so U and the
	// pressure drop fall while the ratio still rises. As passes, one step
	// adds 7 + 7 = 14 plates at the same velocity: U stays within 0.1 %
	// (only the stream temperatures move) and the pressure drop grows about
	// in proportion to the passes.
	path := filepath.Join(demoDir, "htst-milk-si.yaml")
	type option struct {
		Added    int     `json:"added_plates"`
		Plates   int     `json:"plates"`
		Ratio    float64 `json:"regeneration_ratio"`
		U        float64 `json:"u_W_m2K"`
		V        float64 `json:"velocity_product_m_s"`
		Dp       float64 `json:"pressure_drop_product_kPa"`
		Passes   int     `json:"passes_product"`
		Channels int     `json:"channels_per_pass_product"`
		Request  int     `json:"requested_added_plates"`
	}
	get := func(layout, add string) []option {
		t.Helper()
		out, errs, code := runBinary(t, "plates", path, "--add", add, "--layout", layout, "--json")
		var w struct {
			Baseline option   `json:"baseline"`
			Options  []option `json:"options"`
			Step     int      `json:"layout_step_plates"`
		}
		if err := json.Unmarshal([]byte(out), &w); err != nil || code > 1 {
			t.Fatalf("%s: exit %d %v %s", layout, code, err, errs)
		}
		return append([]option{w.Baseline}, w.Options...)
	}
	ch := get("channels", "16,32,48")
	if len(ch) != 4 {
		t.Fatalf("channels: %d rows", len(ch))
	}
	for i, o := range ch[1:] {
		prev := ch[i]
		if o.Plates != 111+16*(i+1) || o.Channels != 7+i+1 || o.Passes != 8 || !(o.U < prev.U) || !(o.Dp < prev.Dp) || !(o.Ratio > prev.Ratio) {
			t.Errorf("channels +%d: %+v after %+v", o.Added, o, prev)
		}
		// The channel velocity is ṁ/(channels · ρ b w): 7/channels of the baseline's.
		if math.Abs(o.V-ch[0].V*7/float64(o.Channels)) > 1e-12 {
			t.Errorf("channels +%d: velocity %g", o.Added, o.V)
		}
	}
	// +10, +20 and +40 as passes round to one, one and three passes of 14
	// plates: +14 (shown once) and +42.
	ps := get("passes", "10,20,40")
	if len(ps) != 3 || ps[1].Added != 14 || ps[1].Request != 10 || ps[2].Added != 42 || ps[2].Passes != 11 {
		t.Fatalf("passes: %+v", ps)
	}
	for _, o := range ps[1:] {
		if math.Abs(o.U/ps[0].U-1) > 1e-3 || math.Abs(o.V-ps[0].V) > 1e-12 || !(o.Dp > ps[0].Dp*float64(o.Passes)/8*0.98) {
			t.Errorf("passes +%d: %+v, baseline %+v", o.Added, o, ps[0])
		}
	}
}

func TestCompareArrangements(t *testing.T) {
	// The SI demo's 92 % regenerator cannot be co-current (ceiling 50 % at C_r = 1,
	// docs/METHOD.md §6.2); heating and cooling can, with more area.
	out, _, code := runBinary(t, "check", "--json", "--compare-arrangements", filepath.Join(demoDir, "htst-milk-si.yaml"))
	var r struct {
		Comparison []struct {
			Section     string   `json:"section"`
			Other       string   `json:"other_arrangement"`
			OtherAreaM2 *float64 `json:"other_area_m2"`
			AreaRatio   *float64 `json:"area_ratio"`
			Note        string   `json:"note"`
		} `json:"arrangement_comparison"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil || code != 0 || len(r.Comparison) != 3 {
		t.Fatalf("%v exit %d %+v", err, code, r)
	}
	if c := r.Comparison[0]; c.Section != "regeneration" || c.OtherAreaM2 != nil || !strings.Contains(c.Note, "co-current flow cannot") {
		t.Errorf("regeneration: %+v", c)
	}
	for _, c := range r.Comparison[1:] {
		if c.AreaRatio == nil || !(*c.AreaRatio > 1) || c.Other != "cocurrent" {
			t.Errorf("%s: %+v", c.Section, c)
		}
	}
	text, _, _ := runBinary(t, "check", "--compare-arrangements", filepath.Join(demoDir, "htst-milk-si.yaml"))
	if !strings.Contains(text, "Arrangement comparison") || !strings.Contains(text, "impossible") {
		t.Errorf("text output:\n%s", text)
	}
}

func BenchmarkPlatesSweep(b *testing.B) {
	// 14 options of the US demo, each the whole line recomputed.
	path := filepath.Join(demoDir, "cider-us.yaml")
	for b.Loop() {
		var out bytes.Buffer
		if code := run([]string{"plates", path, "--sweep", "10:140:10"}, &out, &out); code != 0 {
			b.Fatal(out.String())
		}
	}
}

func TestPlatesHeaderLikeTheOthers(t *testing.T) {
	// Like check, hold and margins: the tool's version and the input's hash.
	path := filepath.Join(demoDir, "cider-us.yaml")
	out, _, _ := runBinary(t, "plates", path, "--add", "10")
	js, _ := checkJSON(t, path)
	want := "pasval " + version.Version + " · added regeneration plates for " + path + "\ninput sha256 " + js.InputSHA256 + "\n"
	if !strings.HasPrefix(out, want) {
		t.Errorf("header:\n%s\nwant\n%s", out[:min(len(out), 300)], want)
	}
}
