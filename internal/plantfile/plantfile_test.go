package plantfile

// Source of the expected values: the Fahrenheit scale definition for the
// conversions, and the project's reader specification for positions and hints.

import (
	"math"
	"strings"
	"testing"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

const good = `record:
  site: Test site
product:
  name: test milk
  density: 1030 kg/m3
  specific_heat: 3.93 kJ/(kg*K)
flow:
  rate: 36 m3/h
process:
  raw_inlet: 41 °F
  hold_setpoint: 161.6 °F
  outlet_target: 4 °C
regeneration:
  arrangement: cocurrent
  ratio: 45 %
  plate_area: 0.35 m2
  u_value: 3300 W/(m2*K)
  fouling: 0.0001 m2*K/W
`

func TestParseGood(t *testing.T) {
	// Unit conversions: the Fahrenheit scale definition (161.6 °F = 72 °C exactly).
	p, err := Parse("good.yaml", []byte(good))
	if err != nil {
		t.Fatal(err)
	}
	if err := Validate(p); err != nil {
		t.Fatal(err)
	}
	if p.System != units.US {
		t.Errorf("system %v, want us (setpoint in °F)", p.System)
	}
	if math.Abs(p.Process.HoldSetpoint.SI-72) > 1e-12 || math.Abs(p.Process.RawInlet.SI-5) > 1e-12 {
		t.Errorf("setpoint %g raw %g", p.Process.HoldSetpoint.SI, p.Process.RawInlet.SI)
	}
	if p.Flow.Rate.SI != 0.01 || p.Flow.Rate.ByMass || p.Flow.MaxRate.Set {
		t.Errorf("flow %+v", p.Flow)
	}
	r := p.Regeneration
	if r == nil || r.Arrangement != Cocurrent || math.Abs(r.Ratio-0.45) > 1e-15 || r.Fouling.SI != 1e-4 {
		t.Errorf("regeneration %+v", r)
	}
	if p.RecordValue("site") != "Test site" || p.RecordValue("line") != "" {
		t.Errorf("record %+v", p.Record)
	}
	if len(p.SHA256) != 64 {
		t.Errorf("sha %q", p.SHA256)
	}
	// Every entered quantity is listed for the record, in file order, as entered and in SI.
	if len(p.Inputs) != 10 || p.Inputs[0].Field != "product.density" || p.Inputs[3].Text != "41 °F" || p.Inputs[3].SIUnit != "°C" {
		t.Errorf("inputs %+v", p.Inputs)
	}
	if pos := p.Process.HoldSetpoint.Pos; pos.Line != 11 || pos.Column != 18 || pos.File != "good.yaml" {
		t.Errorf("setpoint position %v", pos)
	}
}

func TestErrorsAreCollectedInFileOrder(t *testing.T) {
	bad := strings.Replace(strings.Replace(good, "rate: 36 m3/h", "rate: 36", 1), "density: 1030 kg/m3", "densty: 1030 kg/m3", 1)
	_, err := Parse("bad.yaml", []byte(bad))
	list, ok := err.(inputerr.List)
	if !ok || len(list) != 2 {
		t.Fatalf("got %v", err)
	}
	if list[0].Pos.Line != 5 || !strings.Contains(list[0].Error(), `did you mean "density"`) ||
		list[1].Pos.Line != 8 || list[1].Field != "flow.rate" {
		t.Errorf("errors: %v", list)
	}
}

func TestDidYouMean(t *testing.T) {
	allowed := []string{"raw_inlet", "hold_setpoint", "outlet_target"}
	for in, want := range map[string]string{"hold_setpiont": "hold_setpoint", "Raw_Inlet": "raw_inlet", "outlet": "outlet_target"} {
		if got := didYouMean(in, allowed); !strings.Contains(got, want) {
			t.Errorf("didYouMean(%q) = %q", in, got)
		}
	}
	if got := didYouMean("banana", allowed); got != "" {
		t.Errorf("didYouMean(banana) = %q", got)
	}
}

func TestPlatePackLayout(t *testing.T) {
	// The SI demo's regenerator gives both sides' passes: rating mode with
	// 8·7 + 8·7 − 1 = 111 plates (docs/METHOD.md §12.1), the count placed at
	// the product side's passes; its heating gives none: sizing mode. The
	// chevron angle is read in radians (60° = π/3).
	p, err := Load("../../testdata/demo/htst-milk-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	r := p.Regeneration
	if r.Pack == nil || r.Plates.Plates != 111 || !r.PlatesFromLayout || r.PlatesEntered || r.PlatesPos != r.Pack.Product.PassesPos {
		t.Errorf("regeneration: %d plates, from layout %v", r.Plates.Plates, r.PlatesFromLayout)
	}
	if math.Abs(r.Pack.ChevronAngle.SI-math.Pi/3) > 1e-15 || r.Pack.EnlargementFactor.SI != 1.17 || r.Pack.Product.MaxPressureDrop.SI != 150e3 {
		t.Errorf("pack %+v", r.Pack)
	}
	if h := p.Heating; h.Pack == nil || h.Plates.Plates != 0 || h.Pack.Product.ChannelsPerPass != 5 || h.Pack.Other.ChannelsPerPass != 6 || !h.UValue.Set {
		t.Errorf("heating: %d plates, pack %+v", h.Plates.Plates, h.Pack)
	}
	if p.Cooling[0].Pack != nil {
		t.Error("cooling has no pack")
	}
}
