package assess

// Source of the expected values: hand calculations written out beside each
// case, computed from ε = NTU/(1+NTU) at C_r = 1 (docs/METHOD.md §5.2).

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"pasval/internal/plantfile"
	"pasval/regen"
)

const whatIfPlant = `product:
  name: test product
  density: 1000 kg/m3
  specific_heat: 4 kJ/(kg*K)
flow:
  rate: 3.6 m3/h
process:
  raw_inlet: 10 °C
  hold_setpoint: 70 °C
  outlet_target: 10 °C
regeneration:
  plates: 30
  plate_area: 0.2 m2
  u_value: 3000 W/(m2*K)
economics:
  currency: EUR
  operating_hours_per_year: 5000
  heat_price_per_kWh: 0.05
  cooling_price_per_kWh: 0.03
  plate_cost: 400
`

func load(t *testing.T, src string) *plantfile.Plant {
	t.Helper()
	p, err := plantfile.Parse("test.yaml", []byte(src))
	if err == nil {
		err = plantfile.Validate(p)
	}
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func TestAddPlatesHandWorked(t *testing.T) {
	// Hand-worked: C = 1 kg/s × 4000 J/(kg·K) = 4000 W/K; 30 plates × 0.2 m² × 3000 W/(m²·K)
	// = 18 000 W/K, NTU = 4.5, ratio = 4.5/5.5 = 0.818182 (ε = NTU/(1+NTU) at C_r = 1).
	// +30 plates: NTU 9, ratio 0.9. Δratio = 0.9/11 = 0.0818182;
	// heating saved = cooling saved = 4000 × 0.9/11 × (70 − 10) = 216 000/11 W = 19.636 kW.
	// Annual energy = 2 × 19.636 kW × 5000 h = 196 363.6 kWh;
	// cost = 19.636 × 5000 × (0.05 + 0.03) = 7854.55 EUR/yr;
	// payback = 30 × 400 / 7854.55 = 1.52778 years (= 132 000/86 400).
	w, err := AddPlates(load(t, whatIfPlant), []int{30}, DefaultKneeFraction, LayoutNone)
	if err != nil {
		t.Fatal(err)
	}
	o := w.Options[0]
	saved := 216000.0 / 11 / 1e3
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"baseline ratio", w.Baseline.RegenerationRatio, 4.5 / 5.5},
		{"ratio", o.RegenerationRatio, 0.9},
		{"heating saved", o.HeatingSavedKW, saved},
		{"cooling saved", o.CoolingSavedKW, saved},
		{"energy", *o.AnnualEnergySavedKWh, 2 * saved * 5000},
		{"cost", *o.AnnualCostSaved, saved * 5000 * 0.08},
		{"payback", *o.PaybackYears, 132000.0 / 86400},
	} {
		if math.Abs(c.got-c.want) > 1e-9*math.Max(1, math.Abs(c.want)) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	if w.Currency != "EUR" || o.Plates != 60 || !o.ChecksPass {
		t.Errorf("%+v", o)
	}
}

func TestAddPlatesEnergyBalance(t *testing.T) {
	// Heating saved equals cooling saved equals C·Δratio·(setpoint − raw) for every option
	// (same product both sides of the regenerator; docs/METHOD.md §6.2).
	p := load(t, whatIfPlant)
	w, err := AddPlates(p, []int{1, 7, 40, 200}, DefaultKneeFraction, LayoutNone)
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range w.Options {
		want := 4000 * (o.RegenerationRatio - w.Baseline.RegenerationRatio) * 60 / 1e3
		if math.Abs(o.HeatingSavedKW-want) > 1e-9*want || math.Abs(o.CoolingSavedKW-want) > 1e-9*want {
			t.Errorf("+%d: heating %g cooling %g want %g", o.AddedPlates, o.HeatingSavedKW, o.CoolingSavedKW, want)
		}
	}
	// Without economics: energy rates only.
	p.Economics = nil
	w, _ = AddPlates(p, []int{10}, DefaultKneeFraction, LayoutNone)
	if w.Options[0].AnnualCostSaved != nil || w.Options[0].PaybackYears != nil || w.Options[0].HeatingSavedKW <= 0 {
		t.Errorf("no economics: %+v", w.Options[0])
	}
}

func TestKnee(t *testing.T) {
	// Savings per 10 plates fall as ε = NTU/(1+NTU) flattens: with a 10 % knee the
	// sweep finds a knee, and the step after it saves less than 10 % of the first step.
	w, err := AddPlates(load(t, whatIfPlant), []int{10, 20, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120, 130, 140, 150, 160, 170, 180, 190, 200}, 0.10, LayoutNone)
	if err != nil {
		t.Fatal(err)
	}
	if w.KneeAdded == nil {
		t.Fatal("no knee found")
	}
	first := w.Options[0].HeatingSavedKW
	for i, o := range w.Options {
		if o.AddedPlates == *w.KneeAdded {
			next := w.Options[i+1].HeatingSavedKW - o.HeatingSavedKW
			prev := o.HeatingSavedKW - w.Options[i-1].HeatingSavedKW
			if !(next < 0.1*first) || !(prev >= 0.1*first) {
				t.Errorf("knee at +%d: prev step %g, next %g, first %g", o.AddedPlates, prev, next, first)
			}
		}
	}
}

func TestAddPlatesNeedsRating(t *testing.T) {
	// A sized regenerator is refused; the message suggests the plates its own
	// sizing gives (what check reports), not a number from elsewhere.
	src := strings.Replace(whatIfPlant, "plates: 30", "ratio: 0.8", 1)
	res, err := Run(load(t, src))
	if err != nil {
		t.Fatal(err)
	}
	n := res.Sections[0].Plates
	_, err = AddPlates(load(t, src), []int{10}, DefaultKneeFraction, LayoutNone)
	if err == nil || !strings.Contains(err.Error(), "rating mode") || !strings.Contains(err.Error(), fmt.Sprintf("plates: %d is what this sizing gives", n)) {
		t.Errorf("sized regenerator (%d plates): %v", n, err)
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func mustReadB(b *testing.B, path string) []byte {
	b.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		b.Fatal(err)
	}
	return data
}

func TestWhatIfDutiesAreTheSections(t *testing.T) {
	// The baseline's duties are what check prints for the same file: the sum of
	// the cooling stages' duties (rated stages that reach a colder outlet than
	// the target remove more than C·(pasteurized out − target)), and the heating
	// section's duty (hand rule: the what-if and check describe one line).
	p := load(t, string(mustRead(t, "../../testdata/demo/cider-us.yaml")))
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	var heating, cooling float64
	for _, s := range res.Sections {
		switch s.Kind {
		case regen.HeatingSection:
			heating += s.DutyKW
		case regen.CoolingSection:
			cooling += s.DutyKW
		}
	}
	w, err := AddPlates(p, []int{10}, DefaultKneeFraction, LayoutNone)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(w.Baseline.CoolingDutyKW-cooling) > 1e-9*cooling || math.Abs(w.Baseline.HeatingDutyKW-heating) > 1e-9*heating {
		t.Errorf("baseline heating %g cooling %g kW, check %g and %g kW", w.Baseline.HeatingDutyKW, w.Baseline.CoolingDutyKW, heating, cooling)
	}
	// The rated stages reach a colder outlet than the target here, so the old
	// count down to the target was smaller.
	c := res.Product.ProductCapacity
	if toTarget := c * (w.Baseline.PasteurizedOutC - p.Process.OutletTarget.SI) / 1e3; !(cooling > toTarget) {
		t.Errorf("cooling %g kW is not more than the count to the target %g kW", cooling, toTarget)
	}
}

func TestWhatIfSaysWhatItDoesNotRejudge(t *testing.T) {
	// docs/METHOD.md §18: the acceptance tests always, the entered
	// regenerator pressures when there are some (the SI demo enters them;
	// whatIfPlant does not).
	demo, err := plantfile.Load("../../testdata/demo/htst-milk-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		p    *plantfile.Plant
		want []string
	}{
		{"without pressures", load(t, whatIfPlant), []string{NotRejudgedAcceptance}},
		{"SI demo", demo, []string{NotRejudgedAcceptance, NotRejudgedRegeneratorPressure}},
	} {
		layout := LayoutNone
		if c.p.Regeneration.Pack != nil {
			layout = LayoutPasses
		}
		w, err := AddPlates(c.p, []int{14}, DefaultKneeFraction, layout)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if strings.Join(w.NotRejudged, ",") != strings.Join(c.want, ",") {
			t.Errorf("%s: not rejudged %q, want %q", c.name, w.NotRejudged, c.want)
		}
	}
}
