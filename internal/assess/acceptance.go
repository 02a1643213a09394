package assess

import (
	"fmt"
	"math"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/internal/units"
	"pasval/lethality"
)

// The measured acceptance tests beside the model (docs/METHOD.md §15): each
// result judged, the latest of each kind a check, its due date and state on
// the review date.

// AcceptanceResult is one entered test result in the JSON contract (SI).
type AcceptanceResult struct {
	Index    int                `json:"index"` // in the plant file's acceptance list
	Test     plantfile.TestKind `json:"test"`
	Name     string             `json:"name,omitempty"` // an other test's name
	Date     string             `json:"date"`
	By       string             `json:"by"`
	Note     string             `json:"note,omitempty"`
	Interval string             `json:"interval,omitempty"`
	NextDue  string             `json:"next_due,omitempty"`
	// Latest is true for the latest result of its kind (of its name, for
	// other tests): the one a check judges.
	Latest bool `json:"latest"`
	// State is the due state on the review date (the latest result only:
	// "failed" when its values fail, else by its dates; "superseded" for an
	// older one; absent without a review date).
	State DueState `json:"state,omitempty"`
	// Judged is false when the plant file lacks what the result is judged
	// against (NotJudgedFor names it); Pass is then absent.
	Judged       bool   `json:"judged"`
	Pass         *bool  `json:"pass,omitempty"`
	NotJudgedFor string `json:"not_judged_for_want_of,omitempty"`
	Stale        bool   `json:"stale"` // the latest result is past its interval on the review date

	// Required and Actual are the judged values, in Unit (as the check's);
	// absent when not judged.
	Required *float64 `json:"required,omitempty"`
	Actual   *float64 `json:"actual,omitempty"`
	Unit     string   `json:"unit,omitempty"`

	// The measured values, as the kind records them (SI).
	Fluid        plantfile.Fluid `json:"fluid,omitempty"`
	FlowM3s      *float64        `json:"flow_m3_s,omitempty"`
	TemperatureC *float64        `json:"temperature_C,omitempty"`
	TimeS        *float64        `json:"time_s,omitempty"`
	SensorC      *float64        `json:"sensor_C,omitempty"`
	ReferenceC   *float64        `json:"reference_C,omitempty"`
	DifferencePa *float64        `json:"difference_Pa,omitempty"`
	PassEntered  *bool           `json:"pass_entered,omitempty"`

	// Predicted is what the plant file and the model give for the measured
	// quantity: holding-time the model's fastest time for the tested fluid
	// at the test flow (and Timing the comparison); cut-out and cut-in the
	// setpoint; valve-response diversion.response_time; sensor-check 0;
	// regenerator-pressure the entered design difference. Absent when there
	// is none.
	Predicted *float64 `json:"predicted,omitempty"`
	// cut-out and cut-in: the judged temperature, and the judged legal row's
	// temperature when it is the higher limit (the setpoint below every row).
	LimitJudgedC *float64          `json:"judged_temperature_C,omitempty"`
	LimitRowC    *float64          `json:"limit_row_temperature_C,omitempty"`
	Timing       *TimingComparison `json:"holding_time,omitempty"`

	date, nextDue time.Time
	check         *Check // the judgement (also for a superseded result)
}

// TimingComparison is a holding-time test against the model (docs/METHOD.md §15.2).
type TimingComparison struct {
	TestReynolds      float64 `json:"test_reynolds"`
	TestRegime        string  `json:"test_regime"`
	TestFastestToMean float64 `json:"test_fastest_to_mean"`
	TestDensity       float64 `json:"test_density_kg_m3"`
	TestViscosityPas  float64 `json:"test_viscosity_Pa_s,omitempty"` // Newtonian fluids
	ModelTestTimeS    float64 `json:"model_time_at_test_s"`          // the model's fastest time for the tested fluid at the test flow
	ImpliedVolumeM3   float64 `json:"implied_volume_m3"`             // V_eff = t_meas · r_test · Q_t
	ModelVolumeM3     float64 `json:"model_volume_m3"`               // the tube's hold-up as described
	// ConvertedS is the product's fastest time at the worst flow in the tube
	// as measured: the acceptance-holding-time check's actual.
	ConvertedS         float64 `json:"converted_s"`
	ConvertedFlowM3s   float64 `json:"converted_flow_m3_s"`
	ConvertedAtSeal    bool    `json:"converted_at_seal"`
	ProductRatio       float64 `json:"product_fastest_to_mean"`
	ModelS             float64 `json:"model_s"`            // the model's own fastest time at the worst flow
	DifferencePercent  float64 `json:"difference_percent"` // (converted − model)/model
	RowTemperatureC    float64 `json:"row_temperature_C,omitempty"`
	RowTimeS           float64 `json:"row_time_s,omitempty"`
	JudgedTemperatureC float64 `json:"judged_temperature_C"`
}

// Diversion is the diversion timing in the JSON contract (docs/METHOD.md §15.4).
type Diversion struct {
	SensorToValveM float64 `json:"sensor_to_valve_length_m"`
	InnerDiameterM float64 `json:"inner_diameter_m"`
	FlowM3s        float64 `json:"worst_flow_m3_s"`
	AtSeal         bool    `json:"worst_flow_at_seal"`
	Reynolds       float64 `json:"reynolds"`
	Regime         string  `json:"regime"`
	FastestToMean  float64 `json:"fastest_to_mean"`
	TravelTimeS    float64 `json:"travel_time_s"`
	ResponseTimeS  float64 `json:"response_time_s"`
	// ResponseFromTest is the index of the valve-response result whose time
	// is used (the latest; it wins over diversion.response_time), and
	// ResponseTestDate its date; absent: diversion.response_time.
	ResponseFromTest *int   `json:"response_from_test,omitempty"`
	ResponseTestDate string `json:"response_test_date,omitempty"`
	Pass             bool   `json:"pass"`
}

// testKey identifies the results one check follows: the kind, and an other
// test's name.
type testKey struct {
	kind plantfile.TestKind
	name string
}

func keyOf(t plantfile.AcceptanceTest) testKey {
	k := testKey{kind: t.Kind}
	if t.Kind == plantfile.TestOther {
		k.name = t.Name
	}
	return k
}

// TimingTestTolerance is how far a measured holding time may lie from the
// model's prediction for the test before a warning, as a fraction either
// way: further apart, the tube as described or the test is wrong
// (docs/METHOD.md §15.2). The project's choice: a timing test repeats to a
// few per cent, and the model's inputs (length, diameter, flow) are known
// better than that.
const TimingTestTolerance = 0.20

// TestFlowBelowSeal is how far below the sealed maximum (volumetric, as
// entered) a holding-time test's flow may lie before a warning, as a
// fraction: the regulator's test is timed at the sealed maximum, so a test
// at a lower flow (a seal raised since) is carried to the seal by the model,
// not measured there (docs/METHOD.md §15.2). The project's choice: 0.1 %, so
// that only the same flow written alike passes silently.
const TestFlowBelowSeal = 0.001

// RefuseFutureTests refuses a result dated after the review date on (none
// when on is zero).
func RefuseFutureTests(p *plantfile.Plant, on time.Time) error {
	if on.IsZero() {
		return nil
	}
	var errs inputerr.List
	for i, t := range p.Acceptance {
		if t.Date.After(on) {
			errs = append(errs, inputerr.At(t.Given["date"], fmt.Sprintf("acceptance[%d].date", i),
				"%s is after the review date %s: a test result cannot be dated in the future", t.Date.Format(units.DateLayout), on.Format(units.DateLayout)))
		}
	}
	if len(errs) > 0 {
		return errs
	}
	return nil
}

// runAcceptance judges every result, adds the checks of the latest of each
// kind and the diversion-timing check, and fills res.Acceptance and
// res.Diversion.
func runAcceptance(p *plantfile.Plant, res *Result, on time.Time) {
	res.Acceptance = []AcceptanceResult{}
	latest := map[testKey]int{}
	for i, t := range p.Acceptance {
		if j, ok := latest[keyOf(t)]; !ok || !t.Date.Before(p.Acceptance[j].Date) {
			latest[keyOf(t)] = i
		}
	}
	var div *Diversion
	if p.Diversion != nil && res.HoldingTube != nil {
		div = diversionTiming(p, res)
	}
	for i, t := range p.Acceptance {
		a := acceptanceResult(p, res, i, t, div)
		a.Latest = latest[keyOf(t)] == i
		if t.Interval != nil {
			a.nextDue = t.Interval.After(a.date)
			a.Interval, a.NextDue = t.Interval.String(), a.nextDue.Format(units.DateLayout)
		}
		switch {
		case on.IsZero():
		case !a.Latest:
			a.State = DueSuperseded
		default:
			a.State = dueState(a.nextDue, t.Interval != nil, on)
			a.Stale = a.State == DueOverdue
			if a.Pass != nil && !*a.Pass {
				a.State = DueFailed // to be repeated, whatever its dates
			}
		}
		res.Acceptance = append(res.Acceptance, a)
	}
	for _, d := range plantfile.TestKinds() {
		for i := range res.Acceptance {
			a := &res.Acceptance[i]
			if a.Test != d.Kind || !a.Latest {
				continue
			}
			if m := a.Timing; m != nil {
				in := res.HoldingTube.Model.Inputs
				if seal := in.MaxMassFlow / in.FlowDensity; a.FlowM3s != nil && *a.FlowM3s < seal*(1-TestFlowBelowSeal) {
					res.warn(WarnTimingTestBelowSeal, fmt.Sprintf("acceptance[%d].flow", a.Index), map[string]float64{"test_index": float64(a.Index),
						"test_flow_m3_s": *a.FlowM3s, "seal_m3_s": seal})
				}
				if diff := *a.TimeS/m.ModelTestTimeS - 1; math.Abs(diff) > TimingTestTolerance {
					res.warn(WarnTimingTestDiffers, fmt.Sprintf("acceptance[%d].time", a.Index), map[string]float64{"test_index": float64(a.Index),
						"measured_s": *a.TimeS, "model_s": m.ModelTestTimeS, "difference": diff})
				}
			}
			if !a.Judged {
				res.warn(WarnAcceptanceNotJudged, a.NotJudgedFor, map[string]float64{"test_index": float64(a.Index)})
				continue
			}
			c := *a.check
			c.Detail.Test = a
			if a.Stale {
				c.Pass = false // judged, but no longer current
			}
			c.Stale = a.Stale
			c.Name = a.Name
			res.Checks = append(res.Checks, c)
		}
	}
	if div != nil {
		c := NewCheck(DiversionTiming, div.ResponseTimeS, div.TravelTimeS)
		c.Detail.Diversion = div
		div.Pass = c.Pass
		res.Checks = append(res.Checks, c)
		res.Diversion = div
	}
}

// acceptanceResult judges one result by its kind (docs/METHOD.md §15.2–15.3).
func acceptanceResult(p *plantfile.Plant, res *Result, i int, t plantfile.AcceptanceTest, div *Diversion) AcceptanceResult {
	a := AcceptanceResult{Index: i, Test: t.Kind, Name: t.Name, Date: t.Date.Format(units.DateLayout), By: t.By, Note: t.Note, date: t.Date}
	if t.Kind != plantfile.TestOther {
		a.Name = ""
	}
	ptr := func(q plantfile.Quantity) *float64 {
		if !q.Set {
			return nil
		}
		v := q.SI
		return &v
	}
	judge := func(c Check) {
		a.Judged, a.check = true, &c
		a.Required, a.Actual, a.Unit = &c.Required, &c.Actual, c.Unit
		pass := c.Pass
		a.Pass = &pass
	}
	setpoint := p.Process.HoldSetpoint.SI
	judgedC := setpoint - p.Process.SensorAccuracy.SI // 0 when not given
	switch t.Kind {
	case plantfile.TestHoldingTime:
		a.Fluid, a.TimeS = t.Fluid, ptr(t.Time)
		temp := setpoint
		if t.Temperature.Set {
			temp = t.Temperature.SI
		}
		a.TemperatureC = &temp
		cmp, q, err := compareTiming(res, t, temp)
		if err != nil {
			a.NotJudgedFor = fmt.Sprintf("acceptance[%d].temperature", i)
			return a
		}
		a.FlowM3s = &q
		a.Timing = cmp
		pred := cmp.ModelTestTimeS
		a.Predicted = &pred
		ev := res.HoldingTube.Model
		if len(ev.Inputs.Legal) == 0 {
			a.NotJudgedFor = "legal_minimums"
			return a
		}
		v := lethality.JudgeLegal(ev.Inputs.Legal, ev.Eval.JudgedC, cmp.ConvertedS, Tolerance)
		var c Check
		if v.RowIndex < 0 {
			coolest := ev.Inputs.Legal[0]
			for _, r := range ev.Inputs.Legal {
				if r.Temperature < coolest.Temperature {
					coolest = r
				}
			}
			c = NewCheck(AcceptanceHoldingTime, coolest.Time, cmp.ConvertedS)
			c.Pass = false // no row applies at the judged temperature
			c.Detail.BelowEveryRow = true
			cmp.RowTemperatureC, cmp.RowTimeS = coolest.Temperature, coolest.Time
		} else {
			c = NewCheck(AcceptanceHoldingTime, v.Row.Time, cmp.ConvertedS)
			cmp.RowTemperatureC, cmp.RowTimeS = v.Row.Temperature, v.Row.Time
		}
		judge(c)
	case plantfile.TestCutOut, plantfile.TestCutIn:
		a.TemperatureC = ptr(t.Temperature)
		pred := setpoint
		a.Predicted = &pred
		id := AcceptanceCutOut
		if t.Kind == plantfile.TestCutIn {
			id = AcceptanceCutIn
		}
		limit := judgedC
		a.LimitJudgedC = &judgedC
		if h := res.HoldingTube; h != nil && h.Legal != nil && h.Legal.TemperatureC > judgedC {
			limit = h.Legal.TemperatureC
			a.LimitRowC = &limit
		}
		judge(NewCheck(id, limit, t.Temperature.SI))
	case plantfile.TestValveResponse:
		a.TimeS = ptr(t.Time)
		if rt := p.Diversion; rt != nil && rt.ResponseTime.Set {
			pred := rt.ResponseTime.SI
			a.Predicted = &pred
		}
		if div == nil {
			a.NotJudgedFor = "diversion"
			return a
		}
		judge(NewCheck(AcceptanceValveResponse, div.TravelTimeS, t.Time.SI))
	case plantfile.TestSensorCheck:
		a.SensorC, a.ReferenceC = ptr(t.Sensor), ptr(t.Reference)
		zero := 0.0
		a.Predicted = &zero
		if !p.Process.SensorAccuracy.Set {
			a.NotJudgedFor = "process.sensor_accuracy"
			return a
		}
		judge(NewCheck(AcceptanceSensorCheck, p.Process.SensorAccuracy.SI, math.Abs(t.Sensor.SI-t.Reference.SI)))
	case plantfile.TestRegeneratorPressure:
		a.DifferencePa = ptr(t.Difference)
		margin := units.ToSI(1, units.Pressure, "psi")
		if r := p.Regeneration; r != nil && r.Pressure != nil {
			if r.Pressure.RequiredMargin.Set {
				margin = r.Pressure.RequiredMargin.SI
			}
			design := r.Pressure.PasteurizedMin.SI - r.Pressure.RawMax.SI
			a.Predicted = &design
		}
		judge(NewCheck(AcceptanceRegeneratorPressure, margin, t.Difference.SI))
	case plantfile.TestOther:
		pass := t.Pass
		a.PassEntered = &pass
		actual := 0.0
		if pass {
			actual = 1
		}
		judge(NewCheck(AcceptanceOther, 1, actual))
	default:
		panic(fmt.Sprintf("%sno judgement for acceptance-test kind %q", panicPrefix, t.Kind))
	}
	return a
}

// compareTiming converts a holding-time test to the product at the worst
// flow (docs/METHOD.md §15.2); q is the test's volumetric flow, m³/s. The
// error is a water temperature outside the property range.
func compareTiming(res *Result, t plantfile.AcceptanceTest, tempC float64) (*TimingComparison, float64, error) {
	in, ev := res.HoldingTube.Model.Inputs, res.HoldingTube.Model.Eval
	test := lethality.TimingTest{Time: t.Time.SI}
	cmp := &TimingComparison{JudgedTemperatureC: ev.JudgedC, ModelVolumeM3: ev.Tube.Volume(), ModelS: ev.Worst.MinResidence}
	if t.Fluid == plantfile.FluidWater {
		w, err := props.Water(tempC)
		if err != nil {
			return nil, 0, err
		}
		mu, err := props.WaterViscosity(tempC)
		if err != nil {
			return nil, 0, err
		}
		test.Fluid, test.Flow.Density = lethality.Newtonian{Viscosity: mu}, w.Density
		cmp.TestViscosityPas = mu
	} else {
		test.Fluid, test.Flow.Density, test.Override = ev.Rheology, in.Density, in.FastestToMean
		if in.FlowIndex == 0 {
			curve, err := props.NewViscosityCurve(in.Viscosity) // the holding tube used it: an error here is a bug
			if err != nil {
				return nil, 0, err
			}
			mu, _ := curve.At(tempC) // a test temperature outside the points holds the nearest, as the tube does
			test.Fluid = lethality.Newtonian{Viscosity: mu}
			cmp.TestViscosityPas = mu
		}
	}
	test.Flow.Volumetric = t.Flow.SI
	if t.Flow.ByMass {
		test.Flow.Volumetric = t.Flow.SI / test.Flow.Density
	}
	timed := ev.Tube.Timed(test)
	worst := timed.Tube.WorstFlow(ev.Flow, ev.Rheology, in.FastestToMean)
	cmp.TestReynolds, cmp.TestRegime, cmp.TestFastestToMean = timed.Test.Reynolds, timed.Test.Regime.String(), timed.Test.FastestToMean
	cmp.TestDensity, cmp.ModelTestTimeS, cmp.ImpliedVolumeM3 = test.Flow.Density, timed.Test.MinResidence, timed.Volume
	cmp.ConvertedS, cmp.ConvertedFlowM3s, cmp.ConvertedAtSeal, cmp.ProductRatio = worst.MinResidence, worst.Volumetric, worst.AtSeal, worst.FastestToMean
	cmp.DifferencePercent = (cmp.ConvertedS - cmp.ModelS) / cmp.ModelS * 100
	return cmp, test.Flow.Volumetric, nil
}

// diversionTiming is the fastest particle's travel from the diversion sensor
// to the valve at the worst flow of that pipe (docs/METHOD.md §15.4).
func diversionTiming(p *plantfile.Plant, res *Result) *Diversion {
	in, ev := res.HoldingTube.Model.Inputs, res.HoldingTube.Model.Eval
	dv := p.Diversion
	pipe := lethality.Tube{InnerDiameter: ev.Tube.InnerDiameter, Length: dv.SensorToValve.SI}
	if dv.InnerDiameter.Set {
		pipe.InnerDiameter = dv.InnerDiameter.SI
	}
	w := pipe.WorstFlow(ev.Flow, ev.Rheology, in.FastestToMean)
	out := &Diversion{SensorToValveM: pipe.Length, InnerDiameterM: pipe.InnerDiameter, FlowM3s: w.Volumetric, AtSeal: w.AtSeal,
		Reynolds: w.Reynolds, Regime: w.Regime.String(), FastestToMean: w.FastestToMean, TravelTimeS: w.MinResidence,
		ResponseTimeS: dv.ResponseTime.SI}
	// The latest measured valve response wins over the entered one.
	var last *plantfile.AcceptanceTest
	for i := range p.Acceptance {
		t := &p.Acceptance[i]
		if t.Kind == plantfile.TestValveResponse && (last == nil || !t.Date.Before(last.Date)) {
			last = t
			idx := i
			out.ResponseFromTest = &idx
		}
	}
	if last != nil {
		out.ResponseTimeS, out.ResponseTestDate = last.Time.SI, FormatDate(last.Date)
	}
	return out
}
