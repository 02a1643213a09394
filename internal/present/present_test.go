package present

// Source of the expected values: the Fahrenheit scale definition (°F = °C·9/5
// + 32; a difference of 1 K = 1.8 °F), NIST SP 811 Appendix B (1 psi =
// 6894.757 Pa, 1 ft = 0.3048 m, 1 in = 0.0254 m) and the project's own
// wording of notes and warnings.

import (
	"math"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/regen"
)

var (
	si = Display{}
	us = Display{Sys: 1}
)

func TestNumbersInEachSystem(t *testing.T) {
	for _, c := range []struct{ name, got, want string }{
		{"temperature SI", si.temp(72), "72.0 °C"},
		// 72 °C = 161.6 °F (Fahrenheit definition).
		{"temperature US", us.temp(72), "161.6 °F"},
		// a 5 K difference is 9 °F.
		{"difference US", us.diff(5), "9.0 °F"},
		{"signed", Signed("-1.5"), "−1.5"},
		{"signed plus", Signed("1.5"), "+1.5"},
		// 0.0208333 = 0.25 in/ft = 2.08 cm/m.
		{"slope SI", Slope(0.25/12, si), "2.08 cm/m"},
		{"slope US", Slope(0.25/12, us), "0.250 in/ft"},
		// 6894.757 Pa = 1 psi (NIST SP 811).
		{"pressure US", CheckValue(6894.757, "Pa", us), "1.0 psi"},
		{"pressure SI", CheckValue(6894.757, "Pa", si), "6.9 kPa"},
		{"time", CheckValue(16.344, "s", us), "16.34 s"},
		{"log", CheckValue(25.6, "log", si), "25.60 log"},
		{"small US", us.Small(0.0254), "1.000 in"},
		{"small SI", si.Small(0.0475), "47.5 mm"},
		{"power US", us.Power(1055.05585262 / 3600 * 1000), "1000"},
		{"power SI", si.Power(64200), "64.2"},
	} {
		if c.got != c.want {
			t.Errorf("%s: %q, want %q", c.name, c.got, c.want)
		}
	}
	m := assess.NewCheck(assess.HeatingMedium, 70, 75)
	if got := CheckMargin(m, us); got != "+9.00 °F" {
		t.Errorf("margin of 5 K in US units: %q", got)
	}
}

func TestEveryCheckHasANote(t *testing.T) {
	for _, d := range assess.CheckDefs() {
		c := assess.NewCheck(d.ID, 1, 2)
		c.Detail = assess.CheckDetail{RowTemperatureC: 72, SetpointC: 72.5, MarginPercent: 8.9, Plates: 40, DRefS: 0.9, DTemperatureC: 71.7, ZK: 6.3,
			Test: sampleResult(), Diversion: &assess.Diversion{SensorToValveM: 3, InnerDiameterM: 0.0475, AtSeal: true, Regime: "turbulent"}}
		for _, d := range []Display{si, us} {
			if CheckNote(c, d) == "" {
				t.Errorf("%s: empty note", c.ID)
			}
		}
	}
	c := assess.NewCheck(assess.HoldingTime, 15, 16.34)
	c.Detail = assess.CheckDetail{RowTemperatureC: 72, MarginPercent: 8.9, AtSeal: true, RowToMeetC: math.NaN(), RiseToMeetK: math.NaN()}
	if got := CheckNote(c, us); got != "fastest particle at the sealed maximum flow against the 161.6 °F row (+8.9 %)" {
		t.Errorf("holding-time note: %q", got)
	}
	// Judged below the seal and below the setpoint, failing: the note names the
	// flow, the judged temperature, the setpoint's row and the rise that meets
	// the next row (85.5 °C = 185.9 °F; 0.5 K = 0.9 °F; 2608 L/h = 11.48 gpm).
	c = assess.NewCheck(assess.HoldingTime, 25, 17.1)
	c.Detail = assess.CheckDetail{RowTemperatureC: 83, MarginPercent: -31.6, SetpointC: 86, JudgedC: 85.5, AccuracyK: 0.5,
		FlowM3s: 2608.0 / 3.6e6, Regime: "transitional", SealValue: 18, NominalRowC: 86, NominalMet: true, RowToMeetC: 86, RiseToMeetK: 0.5}
	want := "fastest particle at 11.5 gpm (transitional, just below Re 4000), the worst flow up to the seal against the 181.4 °F row (−31.6 %); " +
		"judged at 185.90 °F, the setpoint 186.80 °F less the sensor accuracy 0.90 °F; at the setpoint the 186.8 °F row, met; " +
		"at the sealed maximum 18.00 s; the 186.8 °F row would be met with the setpoint 0.9 °F higher"
	if got := CheckNote(c, us); got != want {
		t.Errorf("holding-time note:\n got %q\nwant %q", got, want)
	}
	mustPanic(t, func() { CheckNote(assess.Check{ID: "no-such-check"}, si) })
}

func TestEveryWarningHasWords(t *testing.T) {
	p := &plantfile.Plant{Inputs: []plantfile.Input{{Field: "regeneration.u_value", Text: "33000 W/(m2*K)"}}}
	values := map[string]float64{"reynolds": 425, "fastest_to_mean": 1.788, "setpoint_C": 80.5, "accuracy_K": 0.5, "row_temperature_C": 80}
	for _, code := range assess.WarningCodes {
		w := assess.Warning{Code: code, Field: "regeneration.u_value", Values: values}
		if text := WarningText(w, p, si); text == "" || strings.Contains(text, "%!") {
			t.Errorf("%s: %q", code, text)
		}
	}
	// The laminar warning names the regime from the Reynolds number (Re 425 < 2100).
	got := WarningText(assess.Warning{Code: assess.WarnLaminarFlow, Values: values}, p, si)
	if !strings.HasPrefix(got, "flow in the holding tube is laminar (Re 425), so the fastest particle moves at 1.79×") {
		t.Errorf("laminar: %q", got)
	}
	// Entered text is quoted as written; ranges in the display units.
	got = WarningText(assess.Warning{Code: assess.WarnUValue, Field: "regeneration.u_value",
		Values: map[string]float64{"low_W_m2K": 300, "high_W_m2K": 10000}}, p, si)
	if !strings.HasPrefix(got, "regeneration.u_value 33000 W/(m2*K) is outside") || !strings.Contains(got, "300 W/(m²·K) to 1e+04 W/(m²·K)") {
		t.Errorf("u-value: %q", got)
	}
	// Kinetics far from their data name the organism and the distance in the
	// display units (195 °F = 90.56 °C, 125.6 °F = 52 °C: 38.56 K = 69.4 °F).
	p.Organisms = []plantfile.Organism{{Name: "E. coli O157:H7"}}
	got = WarningText(assess.Warning{Code: assess.WarnKineticsExtrapolated, Values: map[string]float64{"organism_index": 0,
		"distance_K": 38.5556, "used_at_C": 90.5556, "D_temperature_C": 52, "log_reduction": 3242657}}, p, us)
	if !strings.Contains(got, "the kinetics of E. coli O157:H7 are used at 195.0 °F, 69.4 °F from their D_temperature 125.6 °F") ||
		!strings.Contains(got, "(> 50 log)") {
		t.Errorf("kinetics: %q", got)
	}
	mustPanic(t, func() { WarningText(assess.Warning{Code: "no-such-warning"}, p, si) })
}

func TestOtherStreamOfEveryKind(t *testing.T) {
	p := &plantfile.Plant{Heating: &plantfile.Heating{}, Cooling: []plantfile.CoolingStage{{Name: "glycol"}}}
	p.Heating.Medium.Name = "water"
	p.Cooling[0].Medium.Name = "glycol 30 %"
	want := map[regen.SectionKind]string{regen.RegenerationSection: "pasteurized product", regen.HeatingSection: "water",
		regen.CoolingSection: "glycol 30 %"}
	for _, k := range regen.SectionKinds {
		if got := OtherStream(p, assess.Section{Kind: k, Stage: "glycol"}); got != want[k] {
			t.Errorf("%v: %q", k, got)
		}
	}
	mustPanic(t, func() { OtherStream(p, assess.Section{}) })
}

func mustPanic(t *testing.T, f func()) {
	t.Helper()
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), panicPrefix) {
			t.Errorf("no %q panic: %v", panicPrefix, r)
		}
	}()
	f()
}

func TestPackWarningWords(t *testing.T) {
	// A plate-pack warning begins with its section and names the side's stream.
	p := &plantfile.Plant{Cooling: []plantfile.CoolingStage{{Name: "glycol"}}}
	p.Cooling[0].Medium.Name = "glycol 30 %"
	w := assess.Warning{Code: assess.WarnPackBranch, Section: `cooling stage "glycol"`, Field: "cooling[0].other_side",
		Values: map[string]float64{"reynolds": 1900, "switch": 2000, "low": 1500, "high": 2500}}
	got := WarningText(w, p, si)
	if !strings.HasPrefix(got, `cooling stage "glycol": Re 1900 on the glycol 30 % side lies within 1500–2500, around Re 2000`) {
		t.Errorf("branch: %q", got)
	}
	for field, want := range map[string]string{"regeneration.product_side": "raw-product side", "regeneration.other_side": "pasteurized-product side",
		"heating.product_side": "product side", "cooling[0].product_side": "product side"} {
		if got := PackSideName(assess.Warning{Field: field}, p); got != want {
			t.Errorf("%s: %q, want %q", field, got, want)
		}
	}
	// −35 % with a true minus sign; 5845 W/(m²·K) is 1029 Btu/(h·ft²·°F) (NIST SP 811 factor 5.678263).
	w = assess.Warning{Code: assess.WarnPackUDiffers, Section: "heating", Field: "heating.u_value",
		Values: map[string]float64{"entered_W_m2K": 3800, "computed_clean_W_m2K": 5845, "difference": -0.35}}
	if got := WarningText(w, p, us); !strings.Contains(got, "clean U 1029 Btu/(h·ft²·°F) by −35 %") {
		t.Errorf("u differs: %q", got)
	}
}

func TestSmallMarginsShowTheirSign(t *testing.T) {
	// Values that round alike get more decimals (15.0001 s against 14.9987 s
	// is not "15.00 s" twice); a margin within the tolerance rule is an
	// unsigned zero; any other small margin shows its sign (rule of
	// docs/METHOD.md §1.5; the numbers are chosen to round alike).
	c := assess.NewCheck(assess.HoldingTime, 15.0001, 14.9987)
	req, act := CheckValues(c, si)
	if req == act || req != "15.000 s" || act != "14.999 s" {
		t.Errorf("values %q %q", req, act)
	}
	if m := CheckMargin(c, si); m != "−0.001 s" {
		t.Errorf("margin %q", m)
	}
	// A pressure margin exactly at the limit (rounding below it by 1e-12 Pa).
	p := assess.NewCheck(assess.RegeneratorPressure, 6894.757293168, 6894.757293168-1e-12)
	if m := CheckMargin(p, us); !p.Pass || m != "0.0 psi" {
		t.Errorf("at the limit: pass %v margin %q", p.Pass, m)
	}
	// A small positive margin: +0.003 K, not "+0.00 K".
	o := assess.NewCheck(assess.CoolingOutlet, 4, 3.997)
	if m := CheckMargin(o, si); m != "+0.003 K" {
		t.Errorf("small margin %q", m)
	}
	// Log reductions above 50 in text: "> 50 log", margin a lower bound.
	l := assess.NewCheck(assess.LogReduction, 5, 3242657)
	if req, act := CheckValues(l, si); act != "> 50 log" || req != "5.00 log" || CheckMargin(l, si) != "> +45.00 log" {
		t.Errorf("huge log reduction: %q %q %q", req, act, CheckMargin(l, si))
	}
}

func TestSci(t *testing.T) {
	cases := []struct {
		v    float64
		want string
	}{
		{2.2076689e-5, "2.21×10⁻⁵"}, // three significant digits, exponent in superscript (by hand)
		{1.8938e-4, "1.89×10⁻⁴"},
		{-3.5e-7, "−3.50×10⁻⁷"},
		{4.2, "4.20"},
		{1234, "1.23×10³"},
		{0, "0"},
	}
	for _, c := range cases {
		if got := Sci(c.v); got != c.want {
			t.Errorf("Sci(%g) = %q, want %q", c.v, got, c.want)
		}
	}
}

func TestFailingCheckShowsNoPositiveMargin(t *testing.T) {
	// A check can fail while its time or temperature is above the limit:
	// the holding time when no legal row applies at the judged temperature
	// (docs/METHOD.md §10.1), and an acceptance result past its interval
	// (§15.5). Such a FAIL never shows a positive margin; a failing check
	// with a shortfall shows it, signed.
	for _, c := range []struct {
		name  string
		check assess.Check
		want  string
	}{
		{"no row applies", func() assess.Check {
			c := assess.NewCheck(assess.HoldingTime, 15, 17.54)
			c.Pass, c.Detail.BelowEveryRow = false, true
			return c
		}(), "no row applies"},
		{"stale", func() assess.Check {
			c := assess.NewCheck(assess.AcceptanceHoldingTime, 15, 16.24)
			c.Pass, c.Stale = false, true
			return c
		}(), "stale: past due"},
		{"no row applies and short", func() assess.Check {
			c := assess.NewCheck(assess.HoldingTime, 15, 14)
			c.Pass, c.Detail.BelowEveryRow = false, true
			return c
		}(), "−1.00 s"},
		{"passing", assess.NewCheck(assess.HoldingTime, 15, 16.34), "+1.34 s"},
	} {
		if got := CheckMargin(c.check, si); got != c.want {
			t.Errorf("%s: margin %q, want %q", c.name, got, c.want)
		}
	}
}
