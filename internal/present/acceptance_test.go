package present

// Source of the expected values: the project's own wording of acceptance
// tests (docs/METHOD.md §15) and the Fahrenheit scale (°F = °C·9/5 + 32).

import (
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
)

// sampleResult is a result with every measured value set, so that any
// kind's words can be made from it.
func sampleResult() *assess.AcceptanceResult {
	f := func(v float64) *float64 { return &v }
	pass := true
	return &assess.AcceptanceResult{Test: plantfile.TestHoldingTime, Date: "2026-05-12", By: "inspector", Fluid: plantfile.FluidWater,
		FlowM3s: f(3.3 / 3600), TemperatureC: f(80), TimeS: f(26.3), SensorC: f(72.5), ReferenceC: f(72.4), DifferencePa: f(28000),
		PassEntered: &pass, Predicted: f(80.5), LimitJudgedC: f(80), Judged: true, Pass: &pass, NextDue: "2026-11-12", Interval: "6 months",
		Timing: &assess.TimingComparison{ConvertedS: 17.94, ModelS: 17.95, DifferencePercent: -0.06, ConvertedAtSeal: true,
			RowTemperatureC: 80, RowTimeS: 25, JudgedTemperatureC: 80, ModelTestTimeS: 26.31, TestRegime: "turbulent", TestFastestToMean: 1.22,
			ProductRatio: 2.95 / 1.65}}
}

func TestAcceptanceNotes(t *testing.T) {
	a := sampleResult()
	c := assess.NewCheck(assess.AcceptanceHoldingTime, 25, 17.94)
	c.Detail.Test = a
	want := "2026-05-12, 26.30 s measured with water at 3300 L/h and 80.0 °C, as the product at the sealed maximum: 17.94 s " +
		"(model 17.95 s, −0.1 %) against the 80.0 °C row at the judged temperature 80.00 °C; the water time alone would meet the row, " +
		"but the product's fastest particle moves at 1.788× its mean velocity against water's 1.220×; by inspector; due again 2026-11-12"
	if got := CheckNote(c, si); got != want {
		t.Errorf("holding-time:\n got %q\nwant %q", got, want)
	}
	// A stale result says so and why it fails.
	a.Stale = true
	if got := CheckNote(c, si); !strings.HasSuffix(got, "; STALE: due again 2026-11-12 (every 6 months), so it fails whatever its values") {
		t.Errorf("stale: %q", got)
	}
	// A cut-out in US units: 72.3 °C = 162.14 °F, the setpoint 72.5 °C = 162.50 °F,
	// judged at 72.25 °C: 0.25 K = 0.45 °F.
	a = sampleResult()
	a.Test, a.TemperatureC, a.Predicted, a.LimitJudgedC, a.NextDue = plantfile.TestCutOut, ptr(72.3), ptr(72.5), ptr(72.25), ""
	c = assess.NewCheck(assess.AcceptanceCutOut, 72.25, 72.3)
	c.Detail.Test = a
	want = "2026-05-12, diverted at 162.14 °F; the least allowed is the judged temperature, the setpoint 162.50 °F less the sensor accuracy 0.45 °F; " +
		"by inspector; no interval entered"
	if got := CheckNote(c, us); got != want {
		t.Errorf("cut-out:\n got %q\nwant %q", got, want)
	}
}

func ptr(v float64) *float64 { return &v }

func TestEveryDueStateHasWords(t *testing.T) {
	for _, s := range assess.DueStates {
		if stateWords(s) == "" {
			t.Errorf("%s: no words", s)
		}
	}
	mustPanic(t, func() { stateWords("no-such-state") })
}

func TestEveryCriticalLimitHasWords(t *testing.T) {
	for _, id := range plantfile.CriticalLimitIDs {
		res := &assess.Result{CriticalLimits: []assess.CriticalLimit{{ID: id, Value: 1, Basis: ptr(1), RowTemperatureC: ptr(72), JudgedTemperatureC: ptr(0.5)}}}
		for _, d := range []Display{si, us} {
			c := CriticalLimits(res, d)[0]
			if c.Parameter == "" || c.LimitText == "" || c.Monitoring == "" || c.CorrectiveAction == "" || c.Verification == "" || c.Records == "" {
				t.Errorf("%s: %+v", id, c)
			}
		}
	}
	// The plan's own words replace the default, column by column.
	res := &assess.Result{CriticalLimits: []assess.CriticalLimit{{ID: plantfile.LimitSetpoint, Value: 72.5,
		Entered: plantfile.HACCPTexts{Monitoring: "chart read hourly"}}}}
	c := CriticalLimits(res, si)[0]
	if c.Monitoring != "chart read hourly" || c.Records != defaultTexts[plantfile.LimitSetpoint].Records {
		t.Errorf("entered words: %+v", c)
	}
}

func TestEveryTestKindHasACheckAndWords(t *testing.T) {
	// Every kind of the plant file's table is judged by a registered check and
	// put into words; a kind added to the table alone fails here.
	for _, k := range plantfile.TestKinds() {
		id := checkOf(k.Kind)
		if assess.DefOf(id).ID != id {
			t.Errorf("%s: check %s", k.Kind, id)
		}
		a := sampleResult()
		a.Test = k.Kind
		a.Required, a.Unit = ptr(1), assess.DefOf(id).Unit
		if si.measuredWords(*a) == "" || si.modelWords(*a) == "" || limitWords(*a, us) == "" {
			t.Errorf("%s: no words", k.Kind)
		}
		c := assess.NewCheck(id, 1, 1)
		c.Detail.Test = a
		if CheckNote(c, si) == "" {
			t.Errorf("%s: no note", id)
		}
	}
	mustPanic(t, func() { checkOf("no-such-kind") })
}
