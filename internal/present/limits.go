package present

import (
	"fmt"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// The critical-limit table of the HACCP plan (docs/METHOD.md §15.6): the
// numbers come from assess, the words from here — the haccp: block's own
// where it gives them, plain defaults in the trade's words otherwise.

// limitParameter names what each critical limit holds.
var limitParameter = map[plantfile.CriticalLimitID]string{
	plantfile.LimitSetpoint:            "Product temperature at the holding-tube outlet (diversion setpoint)",
	plantfile.LimitMaxFlow:             "Product flow through the holding tube (timing pump or flow control, sealed)",
	plantfile.LimitHoldingTime:         "Fastest-particle holding time in the holding tube",
	plantfile.LimitRegeneratorPressure: "Pressure of the pasteurized side above the raw side in the regenerator",
	plantfile.LimitCoolingOutlet:       "Product temperature leaving the cooling section",
}

// defaultTexts are the plan's four columns when the haccp: block is silent.
var defaultTexts = map[plantfile.CriticalLimitID]plantfile.HACCPTexts{
	plantfile.LimitSetpoint: {
		Monitoring: "The recorder-controller records the holding-tube outlet temperature without a break; the operator compares the " +
			"indicating and recording thermometers at start-up and reads and initials the record every shift.",
		CorrectiveAction: "Below the setpoint the flow-diversion device turns the product back automatically. Keep it diverted until the " +
			"temperature is above the setpoint again; hold the product made since the last good reading for evaluation; find and " +
			"correct the cause before forward flow; record the event and what was done.",
		Verification: "Cut-out and cut-in temperatures, the diversion sensor against a reference thermometer and the valve's response, " +
			"tested when due; the supervisor reviews the temperature records every day.",
		Records: "Recorder charts or electronic temperature records, diversion events, test results and corrective actions, signed and kept " +
			"as long as the regulator requires.",
	},
	plantfile.LimitMaxFlow: {
		Monitoring: "The timing pump or flow control stays sealed at the maximum rate; the operator checks the seal at every start-up; a flow " +
			"recorder, where fitted, records the flow without a break.",
		CorrectiveAction: "A broken seal or a flow above the maximum: divert or stop, hold the product made since the last good check, have " +
			"the rate sealed again and the holding time tested again before production resumes.",
		Verification: "The holding-time test at the sealed maximum flow, when due and after any seal break or change to the pump, " +
			"its drive or the tube.",
		Records: "Seal checks, flow records and holding-time tests.",
	},
	plantfile.LimitHoldingTime: {
		Monitoring: "Held by the sealed maximum flow and the unchanged tube: the operator checks that the holding tube, its slope and its " +
			"supports are as validated, and that the product is the one validated.",
		CorrectiveAction: "Any change to the tube, the flow, the product or its viscosity: no forward flow until the schedule is validated " +
			"and the holding time tested again.",
		Verification: "The holding-time test on the installed tube, converted to the product when it was timed with water (pasval check), " +
			"when due.",
		Records: "Holding-time tests, validation records and records of changes to the line.",
	},
	plantfile.LimitRegeneratorPressure: {
		Monitoring: "Pressure gauges or a differential-pressure recorder on both sides of the regenerator; a booster pump runs only while the " +
			"pasteurized side is above the raw side by the margin.",
		CorrectiveAction: "When the margin is lost: divert, stop the booster pump, hold the product made since the last good reading, find " +
			"the cause (a leak, a pump, a valve) and correct it before restarting.",
		Verification: "Regenerator pressure tests and plate leak tests when due.",
		Records:      "Pressure records, interlock tests and leak tests.",
	},
	plantfile.LimitCoolingOutlet: {
		Monitoring:       "The thermometer at the cooler outlet (or in the storage tank) read and recorded every shift.",
		CorrectiveAction: "Above the limit: correct the cooling medium or the flow, hold and evaluate the product that left warmer, record it.",
		Verification:     "The outlet thermometer against a reference thermometer; the supervisor reviews the records.",
		Records:          "Outlet temperature records and corrective actions.",
	},
}

// CriticalLimits is the result's critical-limit table with its words in
// display units.
func CriticalLimits(res *assess.Result, d Display) []assess.CriticalLimit {
	out := make([]assess.CriticalLimit, len(res.CriticalLimits))
	for i, c := range res.CriticalLimits {
		def, ok := defaultTexts[c.ID]
		if !ok {
			panic(fmt.Sprintf("%sno words for critical limit %q", panicPrefix, c.ID))
		}
		pick := func(entered, dflt string) string {
			if entered != "" {
				return entered
			}
			return dflt
		}
		c.Parameter = limitParameter[c.ID]
		c.LimitText = d.limitText(c, res)
		c.Monitoring = pick(c.Entered.Monitoring, def.Monitoring)
		c.CorrectiveAction = pick(c.Entered.CorrectiveAction, def.CorrectiveAction)
		c.Verification = pick(c.Entered.Verification, def.Verification) + testsWords(c.Tests)
		c.Records = pick(c.Entered.Records, def.Records)
		out[i] = c
	}
	return out
}

// limitText is a critical limit in words.
func (d Display) limitText(c assess.CriticalLimit, res *assess.Result) string {
	switch c.ID {
	case plantfile.LimitSetpoint:
		s := fmt.Sprintf("≥ %s at the diversion sensor", d.With(c.Value, units.Temperature, 2))
		if c.JudgedTemperatureC != nil && *c.JudgedTemperatureC < c.Value {
			s += fmt.Sprintf("; validated at %s, the setpoint less the sensor's stated accuracy", d.With(*c.JudgedTemperatureC, units.Temperature, 2))
		}
		return s
	case plantfile.LimitMaxFlow:
		return fmt.Sprintf("≤ %s, the sealed maximum", d.flow(c.Value))
	case plantfile.LimitHoldingTime:
		if c.RowTemperatureC != nil {
			return fmt.Sprintf("≥ %s for the fastest particle (the %s legal row) at every flow up to the seal; the tube holds %s at its worst flow",
				timeS(c.Value), d.temp(*c.RowTemperatureC), timeS(*c.Basis))
		}
		return fmt.Sprintf("≥ %s for the fastest particle, the time the tube holds at its worst flow (no legal rows entered)", timeS(c.Value))
	case plantfile.LimitRegeneratorPressure:
		s := fmt.Sprintf("≥ %s at all times", d.With(c.Value, units.Pressure, 1))
		if c.Basis != nil {
			s += fmt.Sprintf("; design difference %s", d.With(*c.Basis, units.Pressure, 1))
		}
		return s
	case plantfile.LimitCoolingOutlet:
		s := fmt.Sprintf("≤ %s", d.With(c.Value, units.Temperature, 1))
		if c.Basis != nil {
			s += fmt.Sprintf("; the line reaches %s at the normal rate", d.With(*c.Basis, units.Temperature, 2))
		}
		return s
	}
	panic(fmt.Sprintf("%sno words for critical limit %q", panicPrefix, c.ID))
}

// testsWords lists a limit's acceptance tests with their due state.
func testsWords(tests []assess.LimitTest) string {
	if len(tests) == 0 {
		return ""
	}
	var parts []string
	for _, t := range tests {
		switch {
		case t.LastDate == nil:
			parts = append(parts, fmt.Sprintf("%s never done", t.Test))
		case t.NextDue == nil:
			parts = append(parts, fmt.Sprintf("%s done %s, no interval entered", t.Test, *t.LastDate))
		default:
			parts = append(parts, fmt.Sprintf("%s done %s, next due %s (%s)", t.Test, *t.LastDate, *t.NextDue, stateWords(t.State)))
		}
	}
	return " Tests: " + strings.Join(parts, "; ") + "."
}

// CriticalLimitsGrid is the critical-limit table for the record.
func CriticalLimitsGrid(res *assess.Result, d Display) Grid {
	g := grid("what", "critical limit", "monitoring", "corrective action", "verification", "records")
	for _, c := range CriticalLimits(res, d) {
		g.add(c.Parameter, c.LimitText, c.Monitoring, c.CorrectiveAction, c.Verification, c.Records)
	}
	return g
}
