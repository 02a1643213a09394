package assess_test

// Sources of the expected values: the envelope's specification
// (docs/METHOD.md §16.3) against the tool's own independent computations of
// the same model — the legal rows' max flow (lethality.Tube.MaxFlowFor, the
// exact worst-flow solution of docs/METHOD.md §7.5 and §7.7) and the
// heating-medium check — and the judged-temperature rule of docs/METHOD.md
// §9.4 (a row applies when its temperature is at most the setpoint less the
// sensor accuracy). Relative margins are worked by hand from the definitions.

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/regen"
)

func loadLineProduct(t *testing.T, name string) *plantfile.Plant {
	t.Helper()
	p, err := plantfile.Load("../../testdata/demo/dairy-line-si/" + name + ".yaml")
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func checkOf(t *testing.T, res *assess.Result, id assess.CheckID) assess.Check {
	t.Helper()
	for _, c := range res.Checks {
		if c.ID == id {
			return c
		}
	}
	t.Fatalf("no %s check", id)
	return assess.Check{}
}

func ids(cs []assess.Check) string {
	var s []string
	for _, c := range cs {
		s = append(s, string(c.ID))
	}
	return strings.Join(s, ",")
}

func TestEnvelopeTubeLimited(t *testing.T) {
	// Whole milk is limited by its holding tube: the highest seal flow that
	// passes every check is the largest flow meeting its legal row, as hold
	// prints it (the same model, solved exactly there), to 1e-6 relative.
	p := loadLineProduct(t, "whole-milk")
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	legal := res.HoldingTube.Legal
	var rowMax float64
	for _, r := range res.HoldingTube.Rows {
		if math.Abs(r.TemperatureC-legal.TemperatureC) < 1e-9 && math.Abs(r.TimeS-legal.TimeS) < 1e-9 {
			rowMax = r.MaxFlowM3s
		}
	}
	if rowMax == 0 {
		t.Fatal("the judged row has no max flow")
	}
	e := assess.FindEnvelope(p)
	b := e.MaxSeal
	if !b.Found || b.AtRangeEnd || math.Abs(b.Value-rowMax) > 1e-6*rowMax {
		t.Fatalf("highest seal flow %+v, want the row's max flow %.9g m³/s", b, rowMax)
	}
	if ids(b.LimitedBy) != "holding-time" {
		t.Errorf("limited by %s, want holding-time", ids(b.LimitedBy))
	}
	if c := checkOf(t, b.At, assess.HoldingTime); !c.Pass || math.Abs(c.Margin) > 1e-6 {
		t.Errorf("holding-time at the edge: %+v, want a margin within 1e-6 s of zero", c)
	}
	// The lowest setpoint: the 72 °C row applies once the judged temperature,
	// setpoint − 0.25 K, reaches it (docs/METHOD.md §9.4): 72.25 °C.
	if s := e.MinSetpoint; !s.Found || math.Abs(s.Value-72.25) > 2e-6 || ids(s.LimitedBy) != "holding-time" {
		t.Errorf("lowest setpoint %+v, want 72.25 °C limited by holding-time", s)
	}
	// The limiting check as entered is the holding time: +1.32 s over 15 s.
	lim, rel, ok := assess.Limiting(res)
	hold := checkOf(t, res, assess.HoldingTime)
	if !ok || lim.ID != assess.HoldingTime || math.Abs(rel-hold.Margin/15) > 1e-12 {
		t.Errorf("limiting %s %.6g, want holding-time %.6g", lim.ID, rel, hold.Margin/15)
	}
}

func TestEnvelopeHeaterLimited(t *testing.T) {
	// Chocolate milk is limited by the heating medium: at the highest seal
	// flow the medium inlet the plates need equals the hottest available
	// (margin within 1e-6 K of zero), with the tube still passing.
	p := loadLineProduct(t, "chocolate-milk")
	e := assess.FindEnvelope(p)
	b := e.MaxSeal
	if !b.Found || ids(b.LimitedBy) != "heating-medium" {
		t.Fatalf("highest seal flow %+v, want one limited by heating-medium", b)
	}
	heat := checkOf(t, b.At, assess.HeatingMedium)
	if !heat.Pass || math.Abs(heat.Margin) > 1e-6 {
		t.Errorf("heating-medium at the edge: margin %.3g K, want within 1e-6 K of zero", heat.Margin)
	}
	if c := checkOf(t, b.At, assess.HoldingTime); !c.Pass || c.Margin < 0.5 {
		t.Errorf("the tube should still hold with room at the edge: %+v", c)
	}
	res, _ := assess.Run(p)
	if b.Value <= res.HoldingTube.MaxFlowM3s {
		t.Errorf("edge %.6g m³/s not above the entered seal %.6g", b.Value, res.HoldingTube.MaxFlowM3s)
	}
	lim, rel, _ := assess.Limiting(res)
	// Relative margin of heating-medium: margin over (needed − product into the heater).
	var heaterIn float64
	for _, s := range res.Sections {
		if s.Kind == regen.HeatingSection {
			heaterIn = s.ProductInC
		}
	}
	h := checkOf(t, res, assess.HeatingMedium)
	if lim.ID != assess.HeatingMedium || math.Abs(rel-h.Margin/(h.Required-heaterIn)) > 1e-12 {
		t.Errorf("limiting %s %.6g, want heating-medium %.6g", lim.ID, rel, h.Margin/(h.Required-heaterIn))
	}
}

func TestEnvelopeOfAFailingProduct(t *testing.T) {
	// Cream fails its regenerator's pressure drop at the entered seal: the
	// limiting check is that failing one, and the highest passing seal flow
	// lies below the entered seal, where the pressure drop reaches its limit.
	p := loadLineProduct(t, "cream")
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	lim, rel, ok := assess.Limiting(res)
	pd := checkOf(t, res, assess.PressureDrop)
	if res.Pass || !ok || lim.ID != assess.PressureDrop || math.Abs(rel-pd.Margin/180e3) > 1e-12 || rel >= 0 {
		t.Fatalf("limiting %s %.6g (pass %v), want the failing pressure-drop %.6g", lim.ID, rel, res.Pass, pd.Margin/180e3)
	}
	e := assess.FindEnvelope(p)
	if b := e.MaxSeal; !b.Found || b.Value >= res.HoldingTube.MaxFlowM3s || ids(b.LimitedBy) != "pressure-drop" {
		t.Errorf("highest seal flow %+v, want one below the seal limited by pressure-drop", b)
	} else if c := checkOf(t, b.At, assess.PressureDrop); !c.Pass || math.Abs(c.Margin) > 1e-3 {
		t.Errorf("pressure drop at the edge: margin %.3g Pa, want within 1e-3 Pa of zero", c.Margin)
	}
	// No setpoint in 30–150 °C passes: below some the regenerator's pressure
	// drop fails, above some the heating medium does.
	if s := e.MinSetpoint; s.Found || len(s.LimitedBy) == 0 {
		t.Errorf("lowest setpoint %+v, want none in range", s)
	}
}

func TestEnvelopeLeavesThePlantAndReproducesCheck(t *testing.T) {
	// The envelope's trials work on copies: the plant computes the same
	// before and after, and a trial at the entered seal and setpoint is the
	// plant as entered (docs/METHOD.md §16.3: at the entered seal the envelope
	// reproduces check).
	p := loadLineProduct(t, "chocolate-milk")
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	before, _ := json.Marshal(res)
	o, err := assess.RunOnLine(p)
	if err != nil {
		t.Fatal(err)
	}
	after, _ := json.Marshal(o.Result)
	again, _ := assess.Run(p)
	third, _ := json.Marshal(again)
	if string(before) != string(after) || string(before) != string(third) {
		t.Error("the envelope search changed the plant or its result")
	}
	if p.Flow.Rate.Text != "9500 L/h" || math.Abs(p.Flow.MaxRate.SI-10000/3.6e6) > 1e-15 || math.Abs(p.Process.HoldSetpoint.SI-76.5) > 1e-12 {
		t.Errorf("the plant's flows or setpoint moved: %+v %+v", p.Flow, p.Process.HoldSetpoint)
	}
}

func TestEnvelopeSearchEnd(t *testing.T) {
	// A plant whose checks do not depend on the flow (only the tube's slope is
	// judged) passes up to the search's cap: the edge is "at least" 20 × the
	// seal. And its lowest setpoint is the first the search tries, 30 °C.
	src := `product:
  name: test water
  density: 1000 kg/m3
  specific_heat: 4.18 kJ/(kg*K)
  viscosity:
    - {at: 20 °C, value: 1 mPa*s}
flow:
  max_rate: 3600 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
holding_tube:
  inner_diameter: 50 mm
  length: 20 m
  rise: 0.5 m
`
	p, err := plantfile.Parse("flat.yaml", []byte(src))
	if err == nil {
		err = plantfile.Validate(p)
	}
	if err != nil {
		t.Fatal(err)
	}
	e := assess.FindEnvelope(p)
	// 3600 L/h = 0.001 m³/s at the setpoint (density as entered): the cap is 0.02 m³/s.
	if b := e.MaxSeal; !b.Found || !b.AtRangeEnd || math.Abs(b.Value-0.02) > 1e-12 {
		t.Errorf("highest seal flow %+v, want at least 0.02 m³/s (the search's end)", b)
	}
	if s := e.MinSetpoint; !s.Found || !s.AtRangeEnd || math.Abs(s.Value-30) > 1e-12 {
		t.Errorf("lowest setpoint %+v, want 30 °C (the search's start)", s)
	}
}

func TestRelativeMargin(t *testing.T) {
	// Worked by hand from the definitions of docs/METHOD.md §16.3.
	res := &assess.Result{Sections: []assess.Section{
		{Kind: regen.RegenerationSection, ProductInC: 5},
		{Kind: regen.HeatingSection, ProductInC: 66},
		{Kind: regen.CoolingSection, ProductInC: 12},
	}}
	tests := []struct {
		name string
		c    assess.Check
		want float64
	}{
		// 16.5 s against 15 s: +1.5/15.
		{"holding time", assess.NewCheck(assess.HoldingTime, 15, 16.5), 0.1},
		// needed 76 °C, 80 available, product in at 66: +4/(76 − 66).
		{"heating medium", assess.NewCheck(assess.HeatingMedium, 76, 80), 0.4},
		// 4 °C target, 3 °C out, 12 °C into cooling: +1/(12 − 4).
		{"cooling outlet", assess.NewCheck(assess.CoolingOutlet, 4, 3), 0.125},
		// 200 kPa through a 180 kPa allowance: −20/180.
		{"pressure drop", assess.NewCheck(assess.PressureDrop, 180e3, 200e3), -1.0 / 9},
		// a margin of zero required over nothing: +Inf.
		{"zero scale", assess.NewCheck(assess.RegeneratorPressure, 0, 1e3), math.Inf(1)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := assess.RelativeMargin(res, tc.c)
			if math.IsInf(tc.want, 0) {
				if got != tc.want {
					t.Errorf("got %v, want %v", got, tc.want)
				}
				return
			}
			if math.Abs(got-tc.want) > 1e-12 {
				t.Errorf("got %.15g, want %.15g", got, tc.want)
			}
		})
	}
	// Limiting: the failing check when one fails, else the smallest.
	res.Checks = []assess.Check{tests[0].c, tests[1].c, tests[2].c}
	res.Pass = true
	if c, _, _ := assess.Limiting(res); c.ID != assess.HoldingTime {
		t.Errorf("limiting %s, want holding-time (0.1 < 0.125 < 0.4)", c.ID)
	}
	res.Checks = append(res.Checks, tests[3].c)
	res.Pass = false
	if c, _, _ := assess.Limiting(res); c.ID != assess.PressureDrop {
		t.Errorf("limiting %s, want the failing pressure-drop", c.ID)
	}
}

// BenchmarkFindEnvelope measures one product's envelope search (both edges)
// on the demo line's whole milk: a tube-limited product whose setpoint scan
// starts at 30 °C.
func BenchmarkFindEnvelope(b *testing.B) {
	p, err := plantfile.Load("../../testdata/demo/dairy-line-si/whole-milk.yaml")
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		assess.FindEnvelope(p)
	}
}
