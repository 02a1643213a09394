package assess

// Source of the expected values: hand calculations from docs/METHOD.md §7
// and §15 (each written out beside its case), water properties from Debian's
// python3-iapws 1.5.2, and the Gregorian calendar for due dates.

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

func date(s string) time.Time {
	d, err := time.Parse("2006-01-02", s)
	if err != nil {
		panic(err)
	}
	return d
}

// basePlant is a Newtonian product in a 2 in tube (docs/METHOD.md §7.7's
// worked example): ρ 1030 kg/m³, μ 5 mPa·s, 20 m, sealed at 3000 L/h, Re 4601.7
// at the seal, the worst flow Q₄₀₀₀ = 2607.717 L/h just below it (24.46 s).
const basePlant = `product:
  name: test product
  density: 1030 kg/m3
  specific_heat: 3.9 kJ/(kg*K)
  viscosity:
    - {at: 72 °C, value: 5 mPa*s}
flow:
  max_rate: 3000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72.5 °C
  sensor_accuracy: 0.25 °C
holding_tube:
  sanitary_tube: 2 in
  length: 20 m
legal_minimums:
  - {temperature: 72 °C, time: 15 s}
`

func runPlant(t *testing.T, yaml string, on time.Time) *Result {
	t.Helper()
	p, err := plantfile.Parse("test.yaml", []byte(yaml))
	if err != nil {
		t.Fatal(err)
	}
	if err := plantfile.Validate(p); err != nil {
		t.Fatal(err)
	}
	res, err := RunWith(p, Options{On: on})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func check(res *Result, id CheckID) (Check, bool) {
	for _, c := range res.Checks {
		if c.ID == id {
			return c, true
		}
	}
	return Check{}, false
}

func TestWaterTestOfTheFrozenDessertDemo(t *testing.T) {
	// The frozen-dessert demo (docs/METHOD.md §15.2): water at 80 °C and
	// 3300 L/h, measured 26.3 s; python3-iapws 1.5.2 gives ρ = 971.8028996
	// kg/m³ (IF97 _Region1 at 101.325 kPa) and μ = 354.0581487 µPa·s
	// (_Viscosity), so Re = 67 445.01, r_w = 1.2197612 and the mix (laminar,
	// r = 2.95/1.65) has 26.3 × 1.2197612/1.7878788 = 17.942894 s (computed with
	// python3): short of the 80 °C row's 25 s that the water time passes.
	p, err := plantfile.Load("../../testdata/demo/frozen-dessert-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	res, err := RunWith(p, Options{On: date("2026-12-01")})
	if err != nil {
		t.Fatal(err)
	}
	a := res.Acceptance[0]
	m := a.Timing
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"water density", m.TestDensity, 971.8028995563232, 1e-9},
		{"water viscosity", m.TestViscosityPas, 354.0581487442565e-6, 1e-8},
		{"water Reynolds", m.TestReynolds, 67445.01116084067, 1e-8},
		{"water ratio", m.TestFastestToMean, 1.2197612252698633, 1e-9},
		{"converted", m.ConvertedS, 17.942894362910412, 1e-8},
		{"model", m.ModelS, 17.947, 1e-3}, // docs/METHOD.md §7.8: 17.95 s
	} {
		if math.Abs(c.got/c.want-1) > c.tol {
			t.Errorf("%s: %.10g, want %.10g", c.name, c.got, c.want)
		}
	}
	c, ok := check(res, AcceptanceHoldingTime)
	if !ok || c.Pass || c.Required != 25 || math.Abs(c.Actual-m.ConvertedS) > 1e-12 {
		t.Errorf("check %+v", c)
	}
	if *a.TimeS < 25 {
		t.Error("the demo's water time should pass the row by itself")
	}
}

func TestProductTestAtTheSealScaledToTheWorstFlow(t *testing.T) {
	// A product test at the seal measuring 25.0 s implies V_eff = 25 × 1.3184431 ×
	// 3000/3.6e6 m³; at the worst flow (2607.717 L/h, laminar ratio 2):
	// t = V_eff/(2 Q₄₀₀₀) = 25 × 1.3184431 × 3000/(2 × 2607.717) = 18.96 s
	// (computed with python3), 22.5 % short of the model's 24.46 s there but
	// above the 15 s row: it passes, judged at the worst flow, not at the seal.
	res := runPlant(t, basePlant+`acceptance:
  - {test: holding-time, date: 2026-06-01, by: QA, fluid: product, flow: 3000 L/h, time: 25 s}
`, date("2026-12-01"))
	m := res.Acceptance[0].Timing
	want := 25 * 1.3184430729305732 * 3000 / (2 * 2607.717108236644)
	if m.ConvertedAtSeal || math.Abs(m.ConvertedS/want-1) > 1e-9 || math.Abs(m.ConvertedFlowM3s*3.6e6/2607.717108236644-1) > 1e-9 {
		t.Errorf("converted %.10g at %.6g L/h (seal %v), want %.10g", m.ConvertedS, m.ConvertedFlowM3s*3.6e6, m.ConvertedAtSeal, want)
	}
	// The model's own: 24.46147 s at the worst flow; the test is 22.5 % short of it.
	if math.Abs(m.ModelS-24.461470) > 1e-5 || math.Abs(m.DifferencePercent-(want/24.46147-1)*100) > 1e-3 {
		t.Errorf("model %.6g, difference %.4g %%", m.ModelS, m.DifferencePercent)
	}
	if c, _ := check(res, AcceptanceHoldingTime); !c.Pass {
		t.Errorf("%+v", c)
	}
}

func TestDiversionTiming(t *testing.T) {
	// 2 m from the sensor to the valve, the product of basePlant at the seal
	// (3000 L/h). In the holding tube's diameter (47.498 mm) the worst flow is
	// Q₄₀₀₀ = 2607.717 L/h: v₄₀₀₀ = 4000 × 0.005/(1030 × 0.047498) = 0.408810 m/s,
	// t = 2/(2 × 0.408810) = 2.446147 s (the seal would give 3.2255 s). In a
	// 1.5 in pipe (34.798 mm) the seal is turbulent (Re 6281.2, r 1.302706, v
	// 0.876234 m/s): t = 2/(1.302706 × 0.876234) = 1.752117 s, below the 1.7921 s
	// just under Re 4000, so the seal is that pipe's worst flow (computed with python3).
	for _, c := range []struct {
		name, block string
		travel      float64
		atSeal      bool
		pass        bool
	}{
		{"tube diameter, entered response", "diversion: {sensor_to_valve_length: 2 m, response_time: 2 s}\n", 2.446147, false, true},
		{"own diameter", "diversion: {sensor_to_valve_length: 2 m, response_time: 1.8 s, inner_diameter: 34.798 mm}\n", 1.7521173428279875, true, false},
		{"measured response wins", "diversion: {sensor_to_valve_length: 2 m, response_time: 3 s}\nacceptance:\n  - {test: valve-response, date: 2026-06-01, by: QA, time: 2.4 s}\n",
			2.446147, false, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			res := runPlant(t, basePlant+c.block, date("2026-12-01"))
			d := res.Diversion
			if math.Abs(d.TravelTimeS/c.travel-1) > 1e-6 || d.AtSeal != c.atSeal {
				t.Errorf("travel %.10g s at seal %v, want %.10g %v", d.TravelTimeS, d.AtSeal, c.travel, c.atSeal)
			}
			ch, _ := check(res, DiversionTiming)
			if ch.Pass != c.pass || ch.Actual != d.TravelTimeS || ch.Required != d.ResponseTimeS {
				t.Errorf("check %+v", ch)
			}
		})
	}
}

func TestCutOutAndSensorCheck(t *testing.T) {
	// Judged temperature 72.5 − 0.25 = 72.25 °C; the 72 °C row applies there,
	// so a cut-out at 72.2 °C fails and at 72.3 °C passes. Against a 72.4 °C
	// row (above the judged temperature: the setpoint is below every row) the
	// limit is the row, 72.4 °C. Sensor 72.5 against reference 72.2 °C: 0.3 K
	// apart, more than the stated 0.25 K.
	res := runPlant(t, basePlant+`acceptance:
  - {test: cut-out, date: 2026-06-01, by: QA, temperature: 72.2 °C}
  - {test: cut-in, date: 2026-06-01, by: QA, temperature: 72.3 °C}
  - {test: sensor-check, date: 2026-06-01, by: QA, sensor: 72.5 °C, reference: 72.2 °C}
`, date("2026-12-01"))
	for _, c := range []struct {
		id               CheckID
		required, actual float64
		pass             bool
	}{{AcceptanceCutOut, 72.25, 72.2, false}, {AcceptanceCutIn, 72.25, 72.3, true}, {AcceptanceSensorCheck, 0.25, 0.3, false}} {
		ch, ok := check(res, c.id)
		if !ok || ch.Pass != c.pass || math.Abs(ch.Required-c.required) > 1e-9 || math.Abs(ch.Actual-c.actual) > 1e-9 {
			t.Errorf("%s: %+v", c.id, ch)
		}
	}
	high := strings.Replace(basePlant, "{temperature: 72 °C, time: 15 s}", "{temperature: 72.4 °C, time: 15 s}", 1)
	res = runPlant(t, high+"acceptance:\n  - {test: cut-out, date: 2026-06-01, by: QA, temperature: 72.3 °C}\n", date("2026-12-01"))
	if ch, _ := check(res, AcceptanceCutOut); ch.Pass || math.Abs(ch.Required-72.4) > 1e-9 || res.Acceptance[0].LimitRowC == nil {
		t.Errorf("cut-out below the row: %+v", ch)
	}
}

func TestNotJudgedWithoutWhatItIsJudgedAgainst(t *testing.T) {
	// A sensor check without a stated accuracy and a valve response without a
	// diversion block are reported, not judged: no check, a warning naming what
	// is missing.
	plant := strings.Replace(basePlant, "  sensor_accuracy: 0.25 °C\n", "", 1) + `acceptance:
  - {test: sensor-check, date: 2026-06-01, by: QA, sensor: 72.5 °C, reference: 72.2 °C}
  - {test: valve-response, date: 2026-06-01, by: QA, time: 1 s}
`
	res := runPlant(t, plant, date("2026-12-01"))
	if len(res.Checks) != 1 || res.Checks[0].ID != HoldingTime {
		t.Errorf("checks %v", res.Checks)
	}
	var fields []string
	for _, w := range res.Warnings {
		if w.Code == WarnAcceptanceNotJudged {
			fields = append(fields, w.Field)
		}
	}
	if strings.Join(fields, ",") != "diversion,process.sensor_accuracy" && strings.Join(fields, ",") != "process.sensor_accuracy,diversion" {
		t.Errorf("warnings for %v", fields)
	}
	for _, a := range res.Acceptance {
		if a.Judged || a.Pass != nil {
			t.Errorf("%s judged", a.Test)
		}
	}
}

func TestDueStates(t *testing.T) {
	// docs/METHOD.md §15.5: overdue when the review date is after the next due
	// date; due soon within 30 days (the due day itself included); else ok.
	next := date("2027-02-28")
	for _, c := range []struct {
		on   string
		want DueState
	}{
		{"2027-01-28", DueOK},   // 31 days away (January has 31 days)
		{"2027-01-29", DueSoon}, // 30 days away
		{"2027-01-27", DueOK},   // 32 days away
		{"2027-02-28", DueSoon}, // due today
		{"2027-03-01", DueOverdue},
	} {
		if got := dueState(next, true, date(c.on)); got != c.want {
			t.Errorf("next %s on %s: %s, want %s", next.Format("2006-01-02"), c.on, got, c.want)
		}
	}
	if got := dueState(time.Time{}, false, date("2027-03-01")); got != DueNoInterval {
		t.Errorf("no interval: %s", got)
	}
}

func TestMonthEndsAndLeapYearsThroughThePlant(t *testing.T) {
	// A cut-out tested on 31 January with a 1 month interval is due on the
	// last day of February: 28 February 2027, 29 February 2028 (a leap year).
	// On 1 March it is overdue, so stale: the check fails though 72.4 °C passes.
	for _, c := range []struct{ done, due, on string }{
		{"2027-01-31", "2027-02-28", "2027-03-01"},
		{"2028-01-31", "2028-02-29", "2028-03-01"},
	} {
		res := runPlant(t, basePlant+"acceptance:\n  - {test: cut-out, date: "+c.done+", by: QA, temperature: 72.4 °C, interval: 1 month}\n", date(c.on))
		a := res.Acceptance[0]
		ch, _ := check(res, AcceptanceCutOut)
		if a.NextDue != c.due || a.State != DueOverdue || !a.Stale || !*a.Pass || ch.Pass || !ch.Stale {
			t.Errorf("%s + 1 month: due %s state %s stale %v, check %+v", c.done, a.NextDue, a.State, a.Stale, ch)
		}
		// The day before the due date it is due soon and passes.
		res = runPlant(t, basePlant+"acceptance:\n  - {test: cut-out, date: "+c.done+", by: QA, temperature: 72.4 °C, interval: 1 month}\n",
			date(c.due).AddDate(0, 0, -1))
		if ch, _ := check(res, AcceptanceCutOut); !ch.Pass || res.Acceptance[0].State != DueSoon {
			t.Errorf("%s before its due date: %+v %s", c.done, ch, res.Acceptance[0].State)
		}
	}
}

func TestLatestResultIsJudged(t *testing.T) {
	// The latest of each kind is the check; an older one is superseded; on the
	// same day the one later in the file counts.
	res := runPlant(t, basePlant+`acceptance:
  - {test: cut-out, date: 2026-06-01, by: QA, temperature: 71 °C}
  - {test: cut-out, date: 2026-03-01, by: QA, temperature: 72.3 °C}
  - {test: cut-in, date: 2026-06-01, by: QA, temperature: 72.4 °C}
  - {test: cut-in, date: 2026-06-01, by: QA, temperature: 72.1 °C}
  - {test: other, name: leak test, date: 2026-06-01, by: QA, pass: false}
  - {test: other, name: recorder pen arc, date: 2026-06-01, by: QA, pass: true}
`, date("2026-12-01"))
	latest := []bool{true, false, false, true, true, true}
	for i, a := range res.Acceptance {
		if a.Latest != latest[i] || (!a.Latest && a.State != DueSuperseded) {
			t.Errorf("result %d: latest %v state %s", i, a.Latest, a.State)
		}
	}
	var others []string
	for _, c := range res.Checks {
		if c.ID == AcceptanceOther {
			others = append(others, c.Name+map[bool]string{true: " pass", false: " fail"}[c.Pass])
		}
	}
	if strings.Join(others, ", ") != "leak test fail, recorder pen arc pass" {
		t.Errorf("other tests %v", others)
	}
	if c, _ := check(res, AcceptanceCutOut); c.Pass || c.Actual != 71 {
		t.Errorf("cut-out %+v", c)
	}
	if c, _ := check(res, AcceptanceCutIn); c.Pass || c.Actual != 72.1 {
		t.Errorf("cut-in %+v", c)
	}
}

func TestFutureResultIsRefused(t *testing.T) {
	p, err := plantfile.Parse("test.yaml", []byte(basePlant+"acceptance:\n  - {test: cut-out, date: 2026-06-02, by: QA, temperature: 72.4 °C}\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = RunWith(p, Options{On: date("2026-06-01")})
	var list inputerr.List
	if !errors.As(err, &list) || list[0].Field != "acceptance[0].date" || list[0].Pos.Line != 19 ||
		!strings.Contains(list[0].Msg, "2026-06-02 is after the review date 2026-06-01") {
		t.Errorf("%v", err)
	}
	// On its own day it is not in the future; without a review date nothing is refused.
	if _, err := RunWith(p, Options{On: date("2026-06-02")}); err != nil {
		t.Error(err)
	}
	if _, err := Run(p); err != nil {
		t.Error(err)
	}
}

func TestDueList(t *testing.T) {
	// Every kind that applies to a plant with a holding tube and no
	// regeneration is listed, never done unless entered; an other test only as
	// entered; the list fails when anything is overdue or never done.
	res := runPlant(t, basePlant+"acceptance:\n  - {test: cut-out, date: 2026-06-01, by: QA, temperature: 72.4 °C, interval: 1 year}\n"+
		"  - {test: other, name: leak test, date: 2026-06-01, by: QA, pass: true}\n", date("2026-12-01"))
	items := DueList(res, date("2026-12-01"))
	var got []string
	for _, it := range items {
		got = append(got, string(it.Test)+":"+string(it.State))
	}
	want := "holding-time:never-done cut-out:ok cut-in:never-done valve-response:never-done sensor-check:never-done other:no-interval"
	if strings.Join(got, " ") != want {
		t.Errorf("due list %v\nwant %s", got, want)
	}
	if !DueFails(items) {
		t.Error("never-done tests must fail the list")
	}
	if d := items[1].DaysLeft; d == nil || *d != 182 { // 2026-12-01 to 2027-06-01: 31+31+28+31+30+31 = 182 days
		t.Errorf("days left %v", d)
	}
}

func TestCriticalLimits(t *testing.T) {
	// The validated schedule's limits with the haccp: block's own words.
	res := runPlant(t, basePlant+`acceptance:
  - {test: holding-time, date: 2026-06-01, by: QA, fluid: product, flow: 3000 L/h, time: 25 s, interval: 6 months}
haccp:
  setpoint: {monitoring: chart read hourly}
`, date("2026-12-01"))
	var ids []string
	for _, c := range res.CriticalLimits {
		ids = append(ids, string(c.ID))
	}
	if strings.Join(ids, " ") != "setpoint max_flow holding_time" {
		t.Errorf("limits %v", ids)
	}
	sp, flow, hold := res.CriticalLimits[0], res.CriticalLimits[1], res.CriticalLimits[2]
	if sp.Value != 72.5 || *sp.JudgedTemperatureC != 72.25 || sp.Entered.Monitoring != "chart read hourly" || sp.Entered.Records != "" {
		t.Errorf("setpoint %+v", sp)
	}
	if flow.Limit != AtMost || math.Abs(flow.Value*3.6e6-3000) > 1e-9 || len(flow.Tests) != 1 || *flow.Tests[0].NextDue != "2026-12-01" {
		t.Errorf("max flow %+v", flow)
	}
	// The 72 °C row's 15 s; the tube holds 24.46 s at its worst flow.
	if hold.Value != 15 || *hold.RowTemperatureC != 72 || math.Abs(*hold.Basis-24.46147) > 1e-5 {
		t.Errorf("holding time %+v", hold)
	}
}

func TestEveryTestKindIsJudged(t *testing.T) {
	// Every kind has a rule for whether it applies and a judgement; a kind
	// added to the plant file's table alone panics here.
	p, err := plantfile.Parse("test.yaml", []byte(basePlant+"regeneration: {ratio: 0.9, plate_area: 0.3 m2, u_value: 3000 W/(m2*K)}\n"+
		"diversion: {sensor_to_valve_length: 2 m, response_time: 1 s}\n"))
	if err != nil {
		t.Fatal(err)
	}
	res, err := RunWith(p, Options{On: date("2026-12-01")})
	if err != nil {
		t.Fatal(err)
	}
	f := func(v float64) plantfile.Quantity { return plantfile.Quantity{SI: v, Set: true} }
	for _, k := range plantfile.TestKinds() {
		test := plantfile.AcceptanceTest{Kind: k.Kind, Date: date("2026-06-01"), Fluid: plantfile.FluidWater,
			Flow: plantfile.FlowRate{Quantity: f(3.0 / 3600)}, Time: f(20), Temperature: f(72.4), Sensor: f(72.5), Reference: f(72.4),
			Difference: f(20000), Name: "x", Pass: true}
		_ = Applies(p, k.Kind)
		a := acceptanceResult(p, res, 0, test, res.Diversion)
		if !a.Judged || a.check == nil {
			t.Errorf("%s not judged (%s)", k.Kind, a.NotJudgedFor)
		}
	}
	defer func() {
		if r := recover(); r == nil {
			t.Error("an unknown kind did not panic")
		}
	}()
	Applies(p, "no-such-kind")
}

func TestTestBelowTheSealWarns(t *testing.T) {
	// The regulator times the tube at the sealed maximum (docs/METHOD.md
	// §15.2): a test at 2990 L/h under a 3000 L/h seal (0.33 % below, more
	// than the 0.1 % allowed) is converted to the seal by the model and
	// warns; the same test at 2998 L/h (0.067 % below) and at the seal does
	// not. The flows are the test's entries, 3000 L/h the basePlant's seal.
	for _, c := range []struct {
		flow string
		warn bool
	}{{"2990 L/h", true}, {"2998 L/h", false}, {"3000 L/h", false}, {"3100 L/h", false}} {
		res := runPlant(t, basePlant+`acceptance:
  - {test: holding-time, date: 2026-06-01, by: QA, fluid: product, flow: `+c.flow+`, time: 25 s}
`, date("2026-12-01"))
		var got *Warning
		for i, w := range res.Warnings {
			if w.Code == WarnTimingTestBelowSeal {
				got = &res.Warnings[i]
			}
		}
		if (got != nil) != c.warn {
			t.Errorf("%s: warning %v, want %v", c.flow, got, c.warn)
			continue
		}
		if got == nil {
			continue
		}
		if got.Field != "acceptance[0].flow" || math.Abs(got.Values["seal_m3_s"]*3.6e6-3000) > 1e-9 || math.Abs(got.Values["test_flow_m3_s"]*3.6e6-2990) > 1e-9 {
			t.Errorf("%s: %+v", c.flow, *got)
		}
	}
}
