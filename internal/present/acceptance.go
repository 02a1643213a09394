package present

import (
	"fmt"
	"math"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// The words of the acceptance tests, the diversion timing, the due list and
// the critical-limit table (docs/METHOD.md §15).

// fluidWords names what a holding-time test was timed with.
func fluidWords(f plantfile.Fluid) string {
	if f == plantfile.FluidWater {
		return "water"
	}
	return "the product"
}

// timeS is a time in seconds with two decimals.
func timeS(s float64) string { return fmt.Sprintf("%.2f s", s) }

// acceptanceNote is an acceptance check's note.
func (d Display) acceptanceNote(c assess.Check) string {
	a := c.Detail.Test
	var b strings.Builder
	switch c.ID {
	case assess.AcceptanceHoldingTime:
		m := a.Timing
		fmt.Fprintf(&b, "%s, %s measured with %s at %s and %s, as the product %s: %s (model %s, %s %%)", a.Date, timeS(*a.TimeS),
			fluidWords(a.Fluid), d.flow(*a.FlowM3s), d.temp(*a.TemperatureC), d.convertedFlow(m), timeS(m.ConvertedS), timeS(m.ModelS),
			Signed(fmt.Sprintf("%.1f", m.DifferencePercent)))
		if c.Detail.BelowEveryRow {
			fmt.Fprintf(&b, "; the judged temperature %s is below every legal row (coolest %s)", d.temp(m.JudgedTemperatureC), d.temp(m.RowTemperatureC))
		} else {
			fmt.Fprintf(&b, " against the %s row at the judged temperature %s", d.temp(m.RowTemperatureC), d.With(m.JudgedTemperatureC, units.Temperature, 2))
		}
		if a.Fluid == plantfile.FluidWater && *a.TimeS >= m.RowTimeS && m.ConvertedS < m.RowTimeS {
			fmt.Fprintf(&b, "; the water time alone would meet the row, but the product's fastest particle moves at %.3f× its mean velocity against water's %.3f×",
				m.ProductRatio, m.TestFastestToMean)
		}
	case assess.AcceptanceCutOut, assess.AcceptanceCutIn:
		what := "diverted at"
		if c.ID == assess.AcceptanceCutIn {
			what = "returned to forward flow at"
		}
		fmt.Fprintf(&b, "%s, %s %s; ", a.Date, what, d.With(*a.TemperatureC, units.Temperature, 2))
		if a.LimitRowC != nil {
			fmt.Fprintf(&b, "the least allowed is the %s legal row, above the judged temperature %s", d.temp(*a.LimitRowC), d.With(*a.LimitJudgedC, units.Temperature, 2))
		} else {
			fmt.Fprintf(&b, "the least allowed is the judged temperature, the setpoint %s", d.With(*a.Predicted, units.Temperature, 2))
			if c.Required < *a.Predicted {
				fmt.Fprintf(&b, " less the sensor accuracy %s", d.With(*a.Predicted-c.Required, units.TemperatureDifference, 2))
			}
		}
	case assess.AcceptanceValveResponse:
		fmt.Fprintf(&b, "%s, measured from the signal to the valve fully diverted, against the fastest particle's travel from the sensor to the valve", a.Date)
	case assess.AcceptanceSensorCheck:
		fmt.Fprintf(&b, "%s, the diversion sensor read %s and the reference thermometer %s: their difference against the stated accuracy (process.sensor_accuracy)",
			a.Date, d.With(*a.SensorC, units.Temperature, 2), d.With(*a.ReferenceC, units.Temperature, 2))
	case assess.AcceptanceRegeneratorPressure:
		fmt.Fprintf(&b, "%s, the measured least pressure of the pasteurized side above the raw side, against the required margin", a.Date)
		if a.Predicted != nil {
			fmt.Fprintf(&b, " (design %s)", d.With(*a.Predicted, units.Pressure, 1))
		}
	case assess.AcceptanceOther:
		fmt.Fprintf(&b, "%s, %s as entered", a.Date, map[bool]string{true: "passed", false: "failed"}[*a.PassEntered])
		if a.Note != "" {
			b.WriteString(": " + a.Note)
		}
	}
	fmt.Fprintf(&b, "; by %s", a.By)
	b.WriteString(dueWords(a))
	return b.String()
}

// dueWords is the due part of an acceptance check's note.
func dueWords(a *assess.AcceptanceResult) string {
	switch {
	case a.Stale:
		return fmt.Sprintf("; STALE: due again %s (every %s), so it fails whatever its values", a.NextDue, a.Interval)
	case a.NextDue != "":
		return fmt.Sprintf("; due again %s", a.NextDue)
	}
	return "; no interval entered"
}

// convertedFlow says where a converted holding-time test is judged.
func (d Display) convertedFlow(m *assess.TimingComparison) string {
	if m.ConvertedAtSeal {
		return "at the sealed maximum"
	}
	return fmt.Sprintf("at %s (just below Re 4000, the worst flow)", d.flow(m.ConvertedFlowM3s))
}

// diversionNote is the diversion-timing check's note.
func (d Display) diversionNote(c assess.Check) string {
	v := c.Detail.Diversion
	at := "at the sealed maximum"
	if !v.AtSeal {
		at = fmt.Sprintf("at %s, just below Re 4000, the worst flow", d.flow(v.FlowM3s))
	}
	from := "diversion.response_time as entered"
	if v.ResponseFromTest != nil {
		from = fmt.Sprintf("the valve-response test of %s (measured; it wins over diversion.response_time)", v.ResponseTestDate)
	}
	return fmt.Sprintf("fastest particle from the diversion sensor to the valve, %s of %s pipe, %s (%s, fastest/mean %.3f), against the response time: %s",
		d.With(v.SensorToValveM, units.Length, 2), d.Small(v.InnerDiameterM), at, v.Regime, v.FastestToMean, from)
}

// notJudgedText words the acceptance-not-judged warning.
func notJudgedText(w assess.Warning, p *plantfile.Plant, d Display) string {
	i := int(w.Values["test_index"])
	if i < 0 || i >= len(p.Acceptance) {
		return "an acceptance test is not judged"
	}
	t := p.Acceptance[i]
	what := fmt.Sprintf("the %s test of %s (acceptance[%d])", t.Label(), t.Date.Format(units.DateLayout), i)
	switch {
	case w.Field == "legal_minimums":
		return what + " is compared with the model but not judged: no legal_minimums are entered"
	case w.Field == "process.sensor_accuracy":
		return fmt.Sprintf("%s is not judged: process.sensor_accuracy is not given (the sensor read %s, the reference %s: %s apart)", what,
			d.With(t.Sensor.SI, units.Temperature, 2), d.With(t.Reference.SI, units.Temperature, 2),
			d.With(math.Abs(t.Sensor.SI-t.Reference.SI), units.TemperatureDifference, 2))
	case w.Field == "diversion":
		return what + " is not judged: describe diversion (sensor_to_valve_length) to compare the response with the fastest particle's travel from the sensor to the valve"
	}
	return fmt.Sprintf("%s is not judged: %s is outside the range of the water properties", what, w.Field)
}

// stateWords are the due states as the terminal and the record print them.
func stateWords(s assess.DueState) string {
	switch s {
	case assess.DueOK:
		return "ok"
	case assess.DueSoon:
		return "due within 30 days"
	case assess.DueOverdue:
		return "OVERDUE"
	case assess.DueNever:
		return "NEVER DONE"
	case assess.DueNoInterval:
		return "no interval entered"
	case assess.DueSuperseded:
		return "superseded"
	case assess.DueFailed:
		return "FAILED — repeat the test"
	case "":
		return "—"
	}
	panic(fmt.Sprintf("%sno words for due state %q", panicPrefix, s))
}

// StateWords is a due state in words.
func StateWords(s assess.DueState) string { return stateWords(s) }

// verdictWords is a result's verdict.
func verdictWords(a assess.AcceptanceResult) string {
	switch {
	case !a.Judged:
		return "not judged"
	case a.Stale && *a.Pass:
		return "PASS, stale"
	case *a.Pass:
		return "PASS"
	}
	return "FAIL"
}

// measuredWords are a result's measured values.
func (d Display) measuredWords(a assess.AcceptanceResult) string {
	switch a.Test {
	case plantfile.TestHoldingTime:
		s := fmt.Sprintf("%s, %s, %s, %s", timeS(*a.TimeS), fluidWords(a.Fluid), d.flow(*a.FlowM3s), d.temp(*a.TemperatureC))
		if m := a.Timing; m != nil {
			s += fmt.Sprintf(" → %s as the product", timeS(m.ConvertedS))
		}
		return s
	case plantfile.TestCutOut, plantfile.TestCutIn:
		return d.With(*a.TemperatureC, units.Temperature, 2)
	case plantfile.TestValveResponse:
		return timeS(*a.TimeS)
	case plantfile.TestSensorCheck:
		return fmt.Sprintf("%s against %s (%s apart)", d.With(*a.SensorC, units.Temperature, 2), d.With(*a.ReferenceC, units.Temperature, 2),
			d.With(math.Abs(*a.SensorC-*a.ReferenceC), units.TemperatureDifference, 2))
	case plantfile.TestRegeneratorPressure:
		return d.With(*a.DifferencePa, units.Pressure, 1)
	case plantfile.TestOther:
		s := map[bool]string{true: "passed", false: "failed"}[*a.PassEntered]
		if a.Note != "" {
			s += ": " + a.Note
		}
		return s
	}
	panic(fmt.Sprintf("%sno words for acceptance-test kind %q", panicPrefix, a.Test))
}

// modelWords are what the model or the plant file gives for the measured
// quantity.
func (d Display) modelWords(a assess.AcceptanceResult) string {
	switch a.Test {
	case plantfile.TestHoldingTime:
		if m := a.Timing; m != nil {
			return fmt.Sprintf("%s (%s %%)", timeS(m.ModelS), Signed(fmt.Sprintf("%.1f", m.DifferencePercent)))
		}
	case plantfile.TestCutOut, plantfile.TestCutIn:
		return "setpoint " + d.With(*a.Predicted, units.Temperature, 2)
	case plantfile.TestValveResponse:
		if a.Predicted != nil {
			return "entered " + timeS(*a.Predicted)
		}
	case plantfile.TestRegeneratorPressure:
		if a.Predicted != nil {
			return "design " + d.With(*a.Predicted, units.Pressure, 1)
		}
	}
	return "—"
}

// limitWords is the limit a result is judged against.
func limitWords(a assess.AcceptanceResult, d Display) string {
	if !a.Judged || a.Unit == "pass" {
		return "—"
	}
	op := "≥ "
	if assess.DefOf(checkOf(a.Test)).Limit == assess.AtMost {
		op = "≤ "
	}
	return op + CheckValue(*a.Required, a.Unit, d)
}

// checkOf is the check that judges a kind of test.
func checkOf(k plantfile.TestKind) assess.CheckID {
	switch k {
	case plantfile.TestHoldingTime:
		return assess.AcceptanceHoldingTime
	case plantfile.TestCutOut:
		return assess.AcceptanceCutOut
	case plantfile.TestCutIn:
		return assess.AcceptanceCutIn
	case plantfile.TestValveResponse:
		return assess.AcceptanceValveResponse
	case plantfile.TestSensorCheck:
		return assess.AcceptanceSensorCheck
	case plantfile.TestRegeneratorPressure:
		return assess.AcceptanceRegeneratorPressure
	case plantfile.TestOther:
		return assess.AcceptanceOther
	}
	panic(fmt.Sprintf("%sno check for acceptance-test kind %q", panicPrefix, k))
}

// testLabel names a result: its kind, and an other test's name.
func testLabel(kind plantfile.TestKind, name string) string {
	if name != "" {
		return string(kind) + " (" + name + ")"
	}
	return string(kind)
}

// AcceptanceTests is the table of every entered result: measured against
// the model, its verdict, when it is due.
func AcceptanceTests(res *assess.Result, d Display) Grid {
	g := grid("test", "date", "by", "measured", "model", "limit", "verdict", "next due", "state")
	for _, a := range res.Acceptance {
		next := a.NextDue
		if next == "" {
			next = "—"
		}
		g.add(testLabel(a.Test, a.Name), a.Date, a.By, d.measuredWords(a), d.modelWords(a), limitWords(a, d), verdictWords(a), next, stateWords(a.State))
	}
	return g
}

// Due is the due list: each kind of test with its latest result.
func Due(items []assess.DueItem) Grid {
	g := grid("test", "last done", "by", "result", "interval", "next due", ">days", "state")
	for _, it := range items {
		last, result, next, days, interval := "—", "—", "—", "", it.Interval
		if it.LastDate != nil {
			last = *it.LastDate
			result = "not judged"
		}
		if it.LastPass != nil {
			result = map[bool]string{true: "PASS", false: "FAIL"}[*it.LastPass]
		}
		if it.NextDue != nil {
			next = *it.NextDue
		}
		if it.DaysLeft != nil {
			days = fmt.Sprintf("%d", *it.DaysLeft)
		}
		if interval == "" {
			interval = "—"
		}
		g.add(testLabel(it.Test, it.Name), last, it.By, result, interval, next, days, stateWords(it.State))
	}
	return g
}

// DueSummary is the due list's one-line result.
func DueSummary(items []assess.DueItem) string {
	count := map[assess.DueState]int{}
	for _, it := range items {
		count[it.State]++
	}
	if count[assess.DueOverdue]+count[assess.DueNever]+count[assess.DueFailed] == 0 {
		s := fmt.Sprintf("nothing failed, overdue or never done (%d tests", len(items))
		if n := count[assess.DueSoon]; n > 0 {
			s += fmt.Sprintf(", %d due within 30 days", n)
		}
		if n := count[assess.DueNoInterval]; n > 0 {
			s += fmt.Sprintf(", %d with no interval entered", n)
		}
		return s + ")"
	}
	s := fmt.Sprintf("%d overdue, %d never done (of %d tests)", count[assess.DueOverdue], count[assess.DueNever], len(items))
	if n := count[assess.DueFailed]; n > 0 {
		s = fmt.Sprintf("%d failed (repeat the test), ", n) + s
	}
	return s
}
