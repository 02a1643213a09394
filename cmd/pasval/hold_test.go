package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/units"
)

type holdJSON struct {
	HoldingTube struct {
		InnerDiameterM float64 `json:"inner_diameter_m"`
		MeanVelocity   float64 `json:"mean_velocity_m_s"`
		Reynolds       float64 `json:"reynolds"`
		Regime         string  `json:"regime"`
		FastestToMean  float64 `json:"fastest_to_mean"`
		MinResidenceS  float64 `json:"min_residence_s"`
		MeanResidenceS float64 `json:"mean_residence_s"`
		RequiredLength float64 `json:"required_length_m"`
		InletC         float64 `json:"inlet_temperature_C"`
		OutletC        float64 `json:"outlet_temperature_C"`
		Slope          *float64
		PU             *float64 `json:"pasteurization_units"`
	} `json:"holding_tube"`
	Lethality []struct {
		Organism        string
		LogReduction    float64 `json:"log_reduction"`
		EquivalentTimeS float64 `json:"equivalent_time_s"`
		Pass            bool
	}
	Checks []struct {
		ID, Organism string
		Pass         bool
		Required     float64
		Actual       float64
	}
	Warnings []struct {
		Code, Field, Message string
		Values               map[string]float64
	}
	Pass bool
}

func holdOf(t *testing.T, cmd, path string) (holdJSON, int) {
	t.Helper()
	out, errs, code := runBinary(t, cmd, "--json", path)
	var r holdJSON
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%v: %s %s", err, out, errs)
	}
	return r, code
}

func TestFrozenDessertFailsItsLegalTime(t *testing.T) {
	// Hand-worked from the plant file: 2 in sanitary tube, ID 1.870 in (docs/METHOD.md §7.1,
	// from memory) = 0.047498 m; Q = 3300 L/h; v = Q/(πD²/4) = 0.51726 m/s.
	// Power law n 0.65, K 0.28 Pa·s^0.65, ρ 1100: Metzner–Reed
	// Re = ρ v^(2−n) Dⁿ / (K 8^(n−1) ((3n+1)/(4n))ⁿ) ≈ 425 → laminar,
	// fastest/mean = (3n+1)/(n+1) = 2.95/1.65 = 1.78788; L = 16.6 m:
	// t_mean = L/v = 32.09 s, t_min = 17.95 s < 25 s (the 80 °C row): FAIL.
	path := filepath.Join(demoDir, "frozen-dessert-si.yaml")
	r, code := holdOf(t, "check", path)
	if code != 1 || r.Pass {
		t.Fatalf("exit %d pass %v; the frozen-dessert demo must fail", code, r.Pass)
	}
	d := 1.870 * 0.0254
	v := 3.3 / 3600 / (math.Pi * d * d / 4)
	n, k := 0.65, 0.28
	re := 1100 * math.Pow(v, 2-n) * math.Pow(d, n) / (k * math.Pow(8, n-1) * math.Pow((3*n+1)/(4*n), n))
	h := r.HoldingTube
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"ID", h.InnerDiameterM, d}, {"velocity", h.MeanVelocity, v}, {"Re", h.Reynolds, re},
		{"ratio", h.FastestToMean, 2.95 / 1.65}, {"t_mean", h.MeanResidenceS, 16.6 / v}, {"t_min", h.MinResidenceS, 16.6 / v / (2.95 / 1.65)},
		{"length needed", h.RequiredLength, 25 * 2.95 / 1.65 * v},
	} {
		if math.Abs(c.got-c.want) > 1e-9*math.Abs(c.want) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	if h.Regime != "laminar" || math.Abs(re-425) > 1 {
		t.Errorf("regime %s Re %g", h.Regime, re)
	}
	var holding *struct {
		ID, Organism string
		Pass         bool
		Required     float64
		Actual       float64
	}
	for i := range r.Checks {
		if r.Checks[i].ID == "holding-time" {
			holding = &r.Checks[i]
		}
	}
	if holding == nil || holding.Pass || holding.Required != 25 {
		t.Fatalf("holding-time check %+v", holding)
	}
	// Warnings are data (code, field, SI values) with their words in SI.
	if len(r.Warnings) < 1 || r.Warnings[0].Code != "laminar-flow" || !strings.Contains(r.Warnings[0].Message, "laminar") ||
		math.Abs(r.Warnings[0].Values["reynolds"]-re) > 1e-9*re {
		t.Errorf("warnings %+v", r.Warnings)
	}
	out, _, _ := runBinary(t, "check", path)
	for _, want := range []string{"holding-time  FAIL", "Result: FAIL", "Dickerson", "never replaces"} {
		if !strings.Contains(out, want) {
			t.Errorf("text output lacks %q", want)
		}
	}
}

func TestCiderLethality(t *testing.T) {
	// Isothermal tube (no heat loss entered): LR = t_min / D(T_set) with
	// D(T) = D_ref·10^((T_ref − T)/z); E. coli O157:H7 in apple juice D52 = 18 min,
	// z = 4.8 °C (Splittstoesser et al. 1996; entered as 125.6 °F and 8.64 °F).
	// PU = t_min/60 · 10^((T − 60)/7) (docs/METHOD.md §9.3).
	r, code := holdOf(t, "hold", filepath.Join(demoDir, "cider-us.yaml"))
	if code != 0 || len(r.Lethality) != 1 {
		t.Fatalf("exit %d %+v", code, r)
	}
	sp := units.ToSI(161, units.Temperature, "°F")
	tref := units.ToSI(125.6, units.Temperature, "°F")
	z := units.ToSI(8.64, units.TemperatureDifference, "°F")
	tmin := r.HoldingTube.MinResidenceS
	want := tmin / (18 * 60 * math.Pow(10, (tref-sp)/z))
	if got := r.Lethality[0].LogReduction; math.Abs(got-want) > 1e-9*want {
		t.Errorf("LR %.12g, want %.12g", got, want)
	}
	if got, want := *r.HoldingTube.PU, tmin/60*math.Pow(10, (sp-60)/7); math.Abs(got-want) > 1e-9*want {
		t.Errorf("PU %.12g, want %.12g", got, want)
	}
	// Turbulent: the ratio follows the smooth-tube formula, between 1.2 and 1.33.
	if h := r.HoldingTube; h.Regime != "turbulent" || h.FastestToMean < 1.2 || h.FastestToMean > 1.33 {
		t.Errorf("regime %s ratio %g", h.Regime, h.FastestToMean)
	}
}

func TestHeatLossFeedsTheHeater(t *testing.T) {
	// SI demo: heat loss is entered, so the tube inlet is above the setpoint, and the
	// heater's product outlet (normal rate, flatter profile at the lower flow) is above
	// the judged inlet at the sealed maximum (docs/METHOD.md §8).
	r, _ := holdOf(t, "check", filepath.Join(demoDir, "htst-milk-si.yaml"))
	h := r.HoldingTube
	if !(h.InletC > h.OutletC) || h.OutletC != 72.5 {
		t.Errorf("inlet %g outlet %g", h.InletC, h.OutletC)
	}
	out, _, _ := runBinary(t, "check", "--json", filepath.Join(demoDir, "htst-milk-si.yaml"))
	var full struct {
		Sections []struct {
			Name        string
			ProductOutC float64 `json:"product_out_C"`
		}
		HoldingTube struct {
			HeatingOutletC float64 `json:"heating_outlet_C"`
		} `json:"holding_tube"`
	}
	if err := json.Unmarshal([]byte(out), &full); err != nil {
		t.Fatal(err)
	}
	if full.Sections[1].Name != "heating" || full.Sections[1].ProductOutC != full.HoldingTube.HeatingOutletC || !(full.HoldingTube.HeatingOutletC > h.InletC) {
		t.Errorf("heating out %g, tube inlet at rate %g, judged inlet %g", full.Sections[1].ProductOutC, full.HoldingTube.HeatingOutletC, h.InletC)
	}
}

func TestHoldCommand(t *testing.T) {
	out, _, code := runBinary(t, "hold", filepath.Join(demoDir, "frozen-dessert-si.yaml"))
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	for _, want := range []string{"Holding tube", "laminar", "length needed", "max flow", "Caution:"} {
		if !strings.Contains(out, want) {
			t.Errorf("hold output lacks %q", want)
		}
	}
	out, _, code = runBinary(t, "hold", filepath.Join(demoDir, "htst-milk-si.yaml"))
	if code != 0 || !strings.Contains(out, "versus diversion setpoint") || !strings.Contains(out, "72.5 °C (entered)") {
		t.Errorf("exit %d\n%s", code, out)
	}
	// Without a holding tube: exit 2 naming the field.
	_, errs, code := runBinary(t, "hold", "../../testdata/equivalence/../bad/ratio-one.yaml")
	if code != 2 {
		t.Errorf("hold on a bad file: exit %d %s", code, errs)
	}
	p := filepath.Join(t.TempDir(), "no-tube.yaml")
	var b strings.Builder
	run([]string{"init"}, &b, &b)
	writeFile(t, p, strings.SplitN(b.String(), "holding_tube:", 2)[0])
	_, errs, code = runBinary(t, "hold", p)
	if code != 2 || !strings.Contains(errs, "holding_tube") {
		t.Errorf("hold without a tube: exit %d %q", code, errs)
	}
}

func TestHoldJudgesTheHoldingTubeOnly(t *testing.T) {
	// The SI demo with a valve that takes 2.0 s to divert: the fastest
	// particle needs 1.68 s from the diversion sensor to the valve (README,
	// docs/METHOD.md §15.4), so diversion-timing fails. It belongs to the
	// holding tube, whose end the diversion sensor and valve are: hold fails
	// too. Its Result line says that it judges the holding tube alone.
	src, err := os.ReadFile(filepath.Join(demoDir, "htst-milk-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	slow := strings.Replace(string(src), "time: 0.9 s", "time: 2.0 s", 1)
	if slow == string(src) {
		t.Fatal("the demo's valve-response test was not found")
	}
	path := filepath.Join(t.TempDir(), "slow-valve.yaml")
	if err := os.WriteFile(path, []byte(slow), 0o644); err != nil {
		t.Fatal(err)
	}
	r, code := holdOf(t, "hold", path)
	found := false
	for _, c := range r.Checks {
		if c.ID == "diversion-timing" {
			found = true
			closeTo(t, "travel time", c.Actual, 1.68, 0.005)
			if c.Pass {
				t.Error("diversion-timing passes with a 2.0 s valve")
			}
		}
	}
	if !found || code != exitFail || r.Pass {
		t.Errorf("hold: diversion-timing shown %v, exit %d, pass %v; want shown, 1, false", found, code, r.Pass)
	}
	// The cream on the demo line fails its regenerator's pressure drop, a
	// check of the line: hold passes it, and says what it left out.
	cream := filepath.Join(demoDir, "dairy-line-si", "cream.yaml")
	out, _, code := runBinary(t, "hold", cream)
	if code != exitPass || !strings.Contains(out, "Result: PASS, all 3 checks of the holding tube pass; hold judges the holding tube only: 'pasval check' judges every check") {
		t.Errorf("hold of the cream: exit %d\n%s", code, out)
	}
	if _, _, code := runBinary(t, "check", cream); code != exitFail {
		t.Errorf("check of the cream: exit %d, want 1", code)
	}
}

func TestHoldJudgesTheHoldingTimeTestOnItsDate(t *testing.T) {
	// The SI demo's latest holding-time test, 2026-11-10 every 2 years, is
	// due again 2028-11-10 (the demo file's dates): on 2028-11-01 it holds,
	// on 2028-12-01 it is stale and hold fails, as check does on that date.
	milk := filepath.Join(demoDir, "htst-milk-si.yaml")
	for _, c := range []struct {
		date string
		code int
	}{{"2028-11-01", exitPass}, {"2028-12-01", exitFail}} {
		out, _, code := runBinary(t, "hold", milk, "--date", c.date)
		if code != c.code {
			t.Errorf("hold --date %s: exit %d, want %d\n%s", c.date, code, c.code, out)
		}
		_, _, checkCode := runBinary(t, "check", milk, "--date", c.date)
		if checkCode != c.code {
			t.Errorf("check --date %s: exit %d, want %d", c.date, checkCode, c.code)
		}
	}
	if _, errs, code := runBinary(t, "hold", milk, "--date", "2028/12/01"); code != exitInput || !strings.Contains(errs, "--date must be a date YYYY-MM-DD") {
		t.Errorf("a date that is not one: exit %d %q", code, errs)
	}
}
