package main

// End-to-end tests of how the holding tube is judged (docs/METHOD.md §7.7,
// §9.4, §9.5, §10, §19.2), each on an invented plant of testdata/judging
// written for the purpose. Every expected value is worked here from the
// method's formulas and the exact unit factors (NIST SP 811: 1 in = 0.0254 m,
// 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 US gal = 3.785411784 L).

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/record"
)

const judgingDir = "../../testdata/judging"

const (
	inch   = 0.0254
	foot   = 0.3048
	pound  = 0.45359237
	gallon = 3.785411784e-3
)

// lbft3 is a density in lb/ft³ in kg/m³.
func lbft3(v float64) float64 { return v * pound / (foot * foot * foot) }

// fahrenheit is a temperature point in °F in °C.
func fahrenheit(f float64) float64 { return (f - 32) * 5 / 9 }

// turbulentRatio is docs/METHOD.md §7.4: n_p = 0.790 ln Re − 1.64,
// r = (n_p + 1)(2 n_p + 1)/(2 n_p²).
func turbulentRatio(re float64) float64 {
	np := 0.790*math.Log(re) - 1.64
	return (np + 1) * (2*np + 1) / (2 * np * np)
}

// judgedJSON is the part of check --json these tests read.
type judgedJSON struct {
	HoldingTube struct {
		MaxFlow            float64    `json:"max_flow_m3_s"`
		Reynolds           float64    `json:"reynolds"`
		MinResidence       float64    `json:"min_residence_s"`
		WorstFlow          float64    `json:"worst_flow_m3_s"`
		WorstRegime        string     `json:"worst_flow_regime"`
		WorstAtSeal        bool       `json:"worst_flow_at_seal"`
		WorstMinResidence  float64    `json:"worst_min_residence_s"`
		JudgedTemperatureC float64    `json:"judged_temperature_C"`
		CreditHeatLoss     bool       `json:"credit_heat_loss"`
		RequiredLength     *float64   `json:"required_length_m"`
		RequiredLengthSeal *float64   `json:"required_length_at_seal_m"`
		Legal              *legalJSON `json:"legal"`
		LegalAtSetpoint    *legalJSON `json:"legal_at_setpoint"`
	} `json:"holding_tube"`
	Lethality []struct {
		LogReduction float64  `json:"log_reduction"`
		AtSetpoint   float64  `json:"log_reduction_at_setpoint"`
		Credit       *float64 `json:"log_reduction_with_heat_loss_credit"`
	} `json:"lethality"`
	Checks []struct {
		ID       string  `json:"id"`
		Pass     bool    `json:"pass"`
		Required float64 `json:"required"`
		Actual   float64 `json:"actual"`
		Note     string  `json:"note"`
	} `json:"checks"`
	Warnings []struct {
		Code   string             `json:"code"`
		Values map[string]float64 `json:"values"`
	} `json:"warnings"`
}

// legalJSON is a reading of the legal table in check --json.
type legalJSON struct {
	Met          bool    `json:"met"`
	RowIndex     int     `json:"row_index"`
	TemperatureC float64 `json:"row_temperature_C"`
	TimeS        float64 `json:"row_time_s"`
	MarginS      float64 `json:"margin_s"`
}

func judged(t *testing.T, path string) (judgedJSON, int) {
	t.Helper()
	out, errs, code := runBinary(t, "check", "--json", path)
	var r judgedJSON
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%s: %v\nstdout %q\nstderr %q", path, err, out, errs)
	}
	return r, code
}

func (r judgedJSON) check(t *testing.T, id string) (pass bool, required, actual float64) {
	t.Helper()
	for _, c := range r.Checks {
		if c.ID == id {
			return c.Pass, c.Required, c.Actual
		}
	}
	t.Fatalf("no %s check in %+v", id, r.Checks)
	return
}

func (r judgedJSON) warned(code string) (map[string]float64, bool) {
	for _, w := range r.Warnings {
		if w.Code == code {
			return w.Values, true
		}
	}
	return nil, false
}

func closeTo(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if !(math.Abs(got-want) <= rel*math.Abs(want)) {
		t.Errorf("%s = %.12g, want %.12g (±%g relative)", what, got, want, rel)
	}
}

func TestJudgedAtTheWorstFlowBelowTheSeal(t *testing.T) {
	// Liquid egg, 2.5 in sanitary tube (ID 2.370 in), 390 ft, 4.5 cP, 64.3 lb/ft³,
	// sealed at 19 gpm; row 140 °F / 3.5 min = 210 s (9 CFR 590.570 Table I).
	d, l, mu, rho := 2.370*inch, 390*foot, 4.5e-3, lbft3(64.3)
	area := math.Pi * d * d / 4
	q := 19 * gallon / 60
	v := q / area
	re := rho * v * d / mu
	tSeal := l / (turbulentRatio(re) * v) // turbulent at the seal (Re ≈ 5 700): about 216 s, passes
	v4000 := 4000 * mu / (rho * d)
	tWorst := l / (2 * v4000) // just below Re 4000, laminar ratio 2: about 204.7 s, short of 210 s
	if !(re > 4000 && tSeal > 210 && tWorst < 210) {
		t.Fatalf("the plant no longer shows the case: Re %g, seal %g s, worst %g s", re, tSeal, tWorst)
	}
	path := filepath.Join(judgingDir, "egg-transition-us.yaml")
	r, code := judged(t, path)
	h := r.HoldingTube
	closeTo(t, "seal time", h.MinResidence, tSeal, 1e-9)
	closeTo(t, "worst flow", h.WorstFlow, v4000*area, 1e-9)
	closeTo(t, "worst time", h.WorstMinResidence, tWorst, 1e-9)
	if h.WorstRegime != "transitional" || h.WorstAtSeal {
		t.Errorf("worst flow regime %q, at seal %v", h.WorstRegime, h.WorstAtSeal)
	}
	pass, req, act := r.check(t, "holding-time")
	closeTo(t, "holding-time actual", act, tWorst, 1e-9)
	if pass || code != 1 || math.Abs(req-210) > 1e-9 {
		t.Errorf("holding-time pass %v required %g, exit %d; want a failure against 210 s, exit 1", pass, req, code)
	}
	// The length the 210 s row needs, L = t·r·v (docs/METHOD.md §7.5): at the
	// worst flow 210·2·v₄₀₀₀, and beside it at the seal 210·r(Re)·v.
	if h.RequiredLength == nil || h.RequiredLengthSeal == nil {
		t.Fatalf("required lengths %v %v", h.RequiredLength, h.RequiredLengthSeal)
	}
	closeTo(t, "length needed at the worst flow", *h.RequiredLength, 210*2*v4000, 1e-9)
	closeTo(t, "length needed at the seal", *h.RequiredLengthSeal, 210*turbulentRatio(re)*v, 1e-9)
	// The text names the worst flow (v₄₀₀₀·A = 13.1 gpm) and still shows the seal's time.
	out, _, _ := runBinary(t, "check", path)
	for _, want := range []string{"judged at 13.1 gpm, the worst flow below it", "fastest particle 204.73 s", "at the sealed maximum 216.02 s"} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q", want)
		}
	}
}

func TestSensorAccuracyIsJudged(t *testing.T) {
	// Dessert base at 86 °C with a ±0.5 °C sensor: judged at 85.5 °C. Laminar
	// (Re = 1100·v·D/0.05 ≈ 491), ratio 2: t = L/(2v) = 16.1/(2·0.4703) = 17.12 s.
	// At 86 °C the 86 °C/15 s row is met; at 85.5 °C the applicable row is
	// 83 °C/25 s, which is not.
	d := 1.870 * inch
	v := (3000 / 3.6e6) / (math.Pi * d * d / 4)
	tMin := 16.1 / (2 * v)
	path := filepath.Join(judgingDir, "dessert-accuracy-si.yaml")
	r, code := judged(t, path)
	h := r.HoldingTube
	closeTo(t, "judged temperature", h.JudgedTemperatureC, 85.5, 1e-12)
	pass, req, act := r.check(t, "holding-time")
	closeTo(t, "holding-time actual", act, tMin, 1e-9)
	if pass || code != 1 || math.Abs(req-25) > 1e-12 || h.Legal == nil || math.Abs(h.Legal.TemperatureC-83) > 1e-12 || h.Legal.Met {
		t.Errorf("pass %v required %g exit %d legal %+v; want the 83 °C/25 s row failed, exit 1", pass, req, code, h.Legal)
	}
	if n := h.LegalAtSetpoint; n == nil || !n.Met || math.Abs(n.TemperatureC-86) > 1e-12 {
		t.Errorf("at the setpoint: %+v, want the 86 °C row met", n)
	}
	// hold agrees with check: the entered setpoint's row of its table is "not met".
	out, _, hcode := runBinary(t, "hold", path)
	if hcode != 1 || !regexp.MustCompile(`86\.0 °C \(entered\)\s+not met`).MatchString(out) ||
		!strings.Contains(out, "judged at 85.50 °C, the setpoint 86.00 °C less the sensor accuracy 0.50 K") {
		t.Errorf("hold exit %d:\n%s", hcode, out)
	}
}

// withOuterCoefficient writes the heat-loss plant with another outer
// coefficient (and credit flag) into dir.
func withOuterCoefficient(t *testing.T, dir, coefficient string, credit bool) string {
	t.Helper()
	src, err := os.ReadFile(filepath.Join(judgingDir, "milk-heat-loss-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(src), "outer_coefficient: 12 W/(m2*K)", "outer_coefficient: "+coefficient, 1)
	if credit {
		text = strings.Replace(text, "  ambient: 20 °C\n", "  ambient: 20 °C\n  credit_heat_loss: true\n", 1)
	}
	path := filepath.Join(dir, "milk-"+strings.Fields(coefficient)[0]+map[bool]string{true: "-credit"}[credit]+".yaml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestNoLethalityCreditForHeatLoss(t *testing.T) {
	// Whole milk, 10 000 L/h in a 2 in tube (ID 1.870 in), 30 m, μ 0.75 mPa·s,
	// 1030 kg/m³: turbulent, t = L/(r v); judged isothermal at the setpoint:
	// LR = t / D(72.5 °C), D(T) = 0.9·10^((71.7 − T)/6.3) s (Bradshaw et al. 1985).
	d := 1.870 * inch
	v := (10000 / 3.6e6) / (math.Pi * d * d / 4)
	re := 1030 * v * d / 0.75e-3
	tMin := 30 / (turbulentRatio(re) * v)
	want := tMin / (0.9 * math.Pow(10, (71.7-72.5)/6.3))
	dir := t.TempDir()
	prevCredit := 0.0
	for _, h := range []string{"0 W/(m2*K)", "5 W/(m2*K)", "12 W/(m2*K)", "45 W/(m2*K)"} {
		r, code := judged(t, withOuterCoefficient(t, dir, h, false))
		if code != 0 || len(r.Lethality) != 1 || r.Lethality[0].Credit == nil {
			t.Fatalf("%s: exit %d %+v", h, code, r.Lethality)
		}
		l := r.Lethality[0]
		// A larger outer coefficient never increases the judged log reduction.
		closeTo(t, "judged log reduction at "+h, l.LogReduction, want, 1e-9)
		_, _, act := r.check(t, "log-reduction")
		closeTo(t, "log-reduction actual at "+h, act, want, 1e-9)
		// The credit it would give grows with it, and is only reported.
		if *l.Credit < prevCredit-1e-12 || *l.Credit < want-1e-9 {
			t.Errorf("%s: credit %g after %g (isothermal %g)", h, *l.Credit, prevCredit, want)
		}
		prevCredit = *l.Credit
	}
	// Opting in judges with the credit and says so in text, JSON and record.
	path := withOuterCoefficient(t, dir, "12 W/(m2*K)", true)
	r, _ := judged(t, path)
	if l := r.Lethality[0]; !r.HoldingTube.CreditHeatLoss || l.Credit == nil || math.Abs(l.LogReduction-*l.Credit) > 1e-12 || !(l.LogReduction > want) {
		t.Errorf("with credit_heat_loss: %+v, credit flag %v", r.Lethality, r.HoldingTube.CreditHeatLoss)
	}
	out, _, _ := runBinary(t, "check", path)
	if !strings.Contains(out, "credit_heat_loss: true") {
		t.Errorf("check text does not say the credit is taken:\n%s", out)
	}
	p, err := plantfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := record.Build(res, record.Options{Date: recordDay, PlantName: "milk.yaml"})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(dumpDocument(doc), "credit_heat_loss: true") {
		t.Error("the record does not say the credit is taken")
	}
}

func TestKineticsFarFromTheirData(t *testing.T) {
	// Juice at 195 °F (90.556 °C) with E. coli D = 18 min at 125.6 °F (52 °C),
	// z = 8.64 °F = 4.8 K: 38.56 K from the data. 1.5 in tube (ID 1.370 in),
	// 30 ft, 20 gpm, 0.5 cP, 65.0 lb/ft³: turbulent, t = L/(r v);
	// LR = t / (1080·10^((52 − 90.556)/4.8)), millions of logs.
	d, l := 1.370*inch, 30*foot
	v := 20 * gallon / 60 / (math.Pi * d * d / 4)
	re := lbft3(65.0) * v * d / 0.5e-3
	tMin := l / (turbulentRatio(re) * v)
	hot, ref := fahrenheit(195), fahrenheit(125.6)
	want := tMin / (1080 * math.Pow(10, (ref-hot)/(8.64*5/9)))
	path := filepath.Join(judgingDir, "juice-far-kinetics-us.yaml")
	r, _ := judged(t, path)
	closeTo(t, "log reduction (exact in JSON)", r.Lethality[0].LogReduction, want, 1e-9)
	w, ok := r.warned(string(assess.WarnKineticsExtrapolated))
	if !ok {
		t.Fatalf("no kinetics warning in %+v", r.Warnings)
	}
	closeTo(t, "distance", w["distance_K"], hot-ref, 1e-12)
	out, _, _ := runBinary(t, "check", path)
	for _, frag := range []string{"> 50 log", "the kinetics of E. coli O157:H7 are used at 195.0 °F, 69.4 °F from their"} {
		if !strings.Contains(out, frag) {
			t.Errorf("check text lacks %q:\n%s", frag, out)
		}
	}
}

func TestProductFrozenInTheCooler(t *testing.T) {
	// The rated glycol stage takes egg to 30.56 °F: the cooling-outlet check
	// (≤ 38 °F) passes, but the product is below its entered freezing point, 31 °F.
	path := filepath.Join(judgingDir, "egg-cooler-us.yaml")
	r, code := judged(t, path)
	pass, _, act := r.check(t, "cooling-outlet")
	w, ok := r.warned(string(assess.WarnProductFrozen))
	if !pass || code != 0 || !ok || !(act < fahrenheit(31)) || math.Abs(w["limit_C"]-fahrenheit(31)) > 1e-12 {
		t.Errorf("cooling-outlet pass %v outlet %g °C exit %d, warning %v %v", pass, act, code, ok, w)
	}
	out, _, _ := runBinary(t, "check", path)
	if !strings.Contains(out, `the cooling stage "glycol" cools the product to 30.56 °F, below its freezing point`) {
		t.Errorf("check text:\n%s", out)
	}
}

func TestFailingCheckNamesTheRowWithinReach(t *testing.T) {
	// Rows written in °C, the setpoint in °F: 161 °F = 71.667 °C is below the
	// 72 °C row, so only 63 °C/30 min applies and fails. The tube holds 17.12 s
	// (see TestSensorAccuracyIsJudged), enough for 72 °C/15 s: the note names
	// that row (72 °C = 161.6 °F) and the rise that reaches it,
	// 72 − 71.667 = 0.333 K = 0.6 °F.
	src, err := os.ReadFile(filepath.Join(judgingDir, "dessert-accuracy-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.NewReplacer("hold_setpoint: 86 °C", "hold_setpoint: 161 °F", "  sensor_accuracy: 0.5 °C\n", "",
		"  - {temperature: 80 °C, time: 25 s}\n  - {temperature: 83 °C, time: 25 s}\n  - {temperature: 86 °C, time: 15 s}\n",
		"  - {temperature: 63 °C, time: 30 min}\n  - {temperature: 72 °C, time: 15 s}\n").Replace(string(src))
	path := filepath.Join(t.TempDir(), "rows-in-celsius.yaml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	r, code := judged(t, path)
	pass, req, _ := r.check(t, "holding-time")
	if pass || code != 1 || math.Abs(req-1800) > 1e-9 {
		t.Fatalf("holding-time pass %v required %g exit %d", pass, req, code)
	}
	out, _, _ := runBinary(t, "check", path)
	if !strings.Contains(strings.Join(strings.Fields(out), " "), "the 161.6 °F row would be met with the setpoint 0.6 °F higher") {
		t.Errorf("the failing check does not name the row within reach:\n%s", out)
	}
}

func TestHoldMaxFlowIsExactBelowTheTurbulentJump(t *testing.T) {
	// 20 m of 2 in tube (ID 1.870 in), μ 5 mPa·s, ρ 1030 kg/m³, a 24.71 s row:
	// laminar flows meet it up to Q_a = V/(2·24.71) = 2581.5 L/h, and flows from
	// there up to Q₄₀₀₀ = 4000·μ/(ρD)·A = 2608 L/h fail it, so the largest flow
	// up to which every flow meets the row is Q_a (docs/METHOD.md §7.5).
	d := 1.870 * inch
	area := math.Pi * d * d / 4
	qa := area * 20 / (2 * 24.71)
	plant := `product:
  name: test syrup
  density: 1030 kg/m3
  specific_heat: 3.6 kJ/(kg*K)
  viscosity:
    - {at: 80 °C, value: 5 mPa*s}
flow:
  max_rate: 3000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 80 °C
holding_tube:
  sanitary_tube: 2 in
  length: 20 m
  rise: 0.5 m
legal_minimums:
  - {temperature: 80 °C, time: 24.71 s}
`
	path := filepath.Join(t.TempDir(), "syrup.yaml")
	if err := os.WriteFile(path, []byte(plant), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, _ := runBinary(t, "hold", "--json", path)
	var r struct {
		HoldingTube struct {
			Rows []struct {
				MaxFlow float64 `json:"max_flow_m3_s"`
			} `json:"rows"`
		} `json:"holding_tube"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil || len(r.HoldingTube.Rows) != 1 {
		t.Fatalf("%v\n%s", err, out)
	}
	closeTo(t, "max flow", r.HoldingTube.Rows[0].MaxFlow, qa, 1e-9)
	if text, _, _ := runBinary(t, "hold", path); !strings.Contains(text, "2581 L/h") {
		t.Errorf("hold text lacks 2581 L/h:\n%s", text)
	}
}

func TestHeadingSaysTheFlowIsAtTheSetpointDensity(t *testing.T) {
	// With the density from the composition, the rate converts to mass at the
	// raw inlet (4 °C) and back to volume at the setpoint, where the product
	// is lighter: the heading's flow is larger than the file's, and says why
	// (docs/METHOD.md §2.3, §7.2).
	plant := `product:
  name: whole milk
  composition: {water: 0.878, protein: 0.032, fat: 0.035, carbohydrate: 0.048, ash: 0.007}
  viscosity:
    - {at: 72 °C, value: 0.75 mPa*s}
flow:
  max_rate: 10000 L/h
process:
  raw_inlet: 4 °C
  hold_setpoint: 72 °C
holding_tube:
  sanitary_tube: 2 in
  length: 30 m
  rise: 0.7 m
`
	path := filepath.Join(t.TempDir(), "milk.yaml")
	if err := os.WriteFile(path, []byte(plant), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, _ := runBinary(t, "check", path)
	if !regexp.MustCompile(`Holding tube \(judged at the sealed maximum, 10[0-9]{3} L/h at the setpoint density \(10000 L/h at 10[0-9]{2}\.[0-9] kg/m³\)\)`).MatchString(out) {
		t.Errorf("heading:\n%s", out)
	}
}

func TestLegalReadingsBesideTheJudgedOne(t *testing.T) {
	// The dessert base of TestSensorAccuracyIsJudged (laminar, t_min =
	// 16.1/(2v) = 17.12 s at the seal, the worst flow) with other setpoints.
	// The table is read at the judged temperature; its reading at the setpoint
	// is always shown beside it, equal without a sensor accuracy; the length
	// needed is that of the applicable row, t·2·v, and none (null) when no row
	// is at or below the judged temperature (docs/METHOD.md §10.1).
	d := 1.870 * inch
	v := (3000 / 3.6e6) / (math.Pi * d * d / 4)
	tMin := 16.1 / (2 * v)
	src, err := os.ReadFile(filepath.Join(judgingDir, "dessert-accuracy-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	write := func(name, setpoint, accuracy string) string {
		text := strings.NewReplacer("hold_setpoint: 86 °C", "hold_setpoint: "+setpoint,
			"  sensor_accuracy: 0.5 °C\n", accuracy).Replace(string(src))
		path := filepath.Join(dir, name+".yaml")
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	for _, c := range []struct {
		name, setpoint, accuracy string
		judged, atSet            legalJSON // met, row_index, row temperature and time; margin t_min − row time
		length                   float64   // row time · 2v; 0: null
	}{
		// No accuracy: judged at 86 °C, the 86 °C/15 s row met; the setpoint's reading is the same.
		{"no-accuracy", "86 °C", "", legalJSON{true, 2, 86, 15, tMin - 15}, legalJSON{true, 2, 86, 15, tMin - 15}, 15 * 2 * v},
		// No row at or below 79 °C: −1, reported against the coolest row (80 °C/25 s), no length.
		{"below-every-row", "79 °C", "", legalJSON{false, -1, 80, 25, tMin - 25}, legalJSON{false, -1, 80, 25, tMin - 25}, 0},
		// 80.2 °C less 0.5 K: none at 79.7 °C, while at the setpoint the 80 °C row applies (and fails).
		{"row-only-at-setpoint", "80.2 °C", "  sensor_accuracy: 0.5 °C\n", legalJSON{false, -1, 80, 25, tMin - 25},
			legalJSON{false, 0, 80, 25, tMin - 25}, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			r, _ := judged(t, write(c.name, c.setpoint, c.accuracy))
			h := r.HoldingTube
			for _, g := range []struct {
				what      string
				got, want *legalJSON
			}{{"legal", h.Legal, &c.judged}, {"legal_at_setpoint", h.LegalAtSetpoint, &c.atSet}} {
				if g.got == nil {
					t.Fatalf("%s absent", g.what)
				}
				if g.got.Met != g.want.Met || g.got.RowIndex != g.want.RowIndex {
					t.Errorf("%s: %+v, want %+v", g.what, *g.got, *g.want)
				}
				closeTo(t, g.what+" row temperature", g.got.TemperatureC, g.want.TemperatureC, 1e-12)
				closeTo(t, g.what+" row time", g.got.TimeS, g.want.TimeS, 1e-12)
				closeTo(t, g.what+" margin", g.got.MarginS, g.want.MarginS, 1e-9)
			}
			switch {
			case c.length == 0 && (h.RequiredLength != nil || h.RequiredLengthSeal != nil):
				t.Errorf("no row applies, yet required lengths %s, %s", optional(h.RequiredLength), optional(h.RequiredLengthSeal))
			case c.length > 0 && (h.RequiredLength == nil || h.RequiredLengthSeal == nil):
				t.Errorf("required lengths %s, %s; want %g m", optional(h.RequiredLength), optional(h.RequiredLengthSeal), c.length)
			case c.length > 0:
				closeTo(t, "length needed", *h.RequiredLength, c.length, 1e-9)
				closeTo(t, "length needed at the seal", *h.RequiredLengthSeal, c.length, 1e-9) // the seal is the worst flow
			}
		})
	}
}

// optional prints a JSON number that may be null.
func optional(v *float64) string {
	if v == nil {
		return "null"
	}
	return strconv.FormatFloat(*v, 'g', 12, 64)
}

func TestPrintedRiseMeetsTheRow(t *testing.T) {
	// The dessert base (17.12 s in the tube, TestSensorAccuracyIsJudged) set
	// at 72.25 °C with a ±0.5 °C sensor is judged at 71.75 °C, where only the
	// 63 °C/30 min row applies and fails; the 72 °C/15 s row needs the
	// setpoint 0.25 K (0.45 °F) higher. The printed rise is rounded up at its
	// precision (0.3 K, 0.5 °F), so that the setpoint raised by exactly what
	// is printed meets the row (hand calculation; docs/METHOD.md §10.1).
	src, err := os.ReadFile(filepath.Join(judgingDir, "dessert-accuracy-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	plant := func(setpoint string) string {
		text := strings.NewReplacer("hold_setpoint: 86 °C", "hold_setpoint: "+setpoint,
			"  - {temperature: 80 °C, time: 25 s}\n  - {temperature: 83 °C, time: 25 s}\n  - {temperature: 86 °C, time: 15 s}\n",
			"  - {temperature: 63 °C, time: 30 min}\n  - {temperature: 72 °C, time: 15 s}\n").Replace(string(src))
		path := filepath.Join(t.TempDir(), "rise.yaml")
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	rise := regexp.MustCompile(`the (\S+) (°C|°F) row would be met with the setpoint (\S+) (K|°F) higher`)
	for _, c := range []struct {
		units, want string
		toK         float64
	}{{"si", "0.3", 1}, {"us", "0.5", 5.0 / 9}} {
		out, _, code := runBinary(t, "check", plant("72.25 °C"), "--units", c.units)
		m := rise.FindStringSubmatch(strings.Join(strings.Fields(out), " "))
		if code != exitFail || m == nil || m[3] != c.want {
			t.Fatalf("%s: exit %d, rise %q, want %s:\n%s", c.units, code, m, c.want, out)
		}
		printed, err := strconv.ParseFloat(m[3], 64)
		if err != nil {
			t.Fatal(err)
		}
		r, _ := judged(t, plant(fmt.Sprintf("%.6f °C", 72.25+printed*c.toK)))
		if pass, _, _ := r.check(t, "holding-time"); !pass {
			t.Errorf("%s: the setpoint raised by the printed %s %s still fails the row", c.units, m[3], m[4])
		}
	}
}
