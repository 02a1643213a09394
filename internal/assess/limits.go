package assess

import (
	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/regen"
)

// CriticalLimit is one row of the HACCP plan's critical-limit table, taken
// from the validated schedule (docs/METHOD.md §15.6). assess fills the
// numbers and the plan's own words from the haccp: block; internal/present
// fills the words (its defaults where the block is silent).
type CriticalLimit struct {
	ID plantfile.CriticalLimitID `json:"id"`
	// Limit, Value and Unit are the critical limit: "min" (the process must
	// stay at or above Value) or "max" (at or below). Units: °C, m3/s, s, Pa.
	Limit Limit   `json:"limit"`
	Value float64 `json:"value"`
	Unit  string  `json:"unit"`
	// Basis is the validated value the limit rests on, in Unit: the judged
	// temperature (setpoint), the sealed maximum (max_flow), the model's
	// fastest time at the worst flow (holding_time), the design pressure
	// difference (regenerator_pressure, when entered), the outlet reached
	// or targeted (cooling_outlet).
	Basis *float64 `json:"basis,omitempty"`
	// holding_time: the legal row met (absent without legal rows).
	RowTemperatureC *float64 `json:"row_temperature_C,omitempty"`
	// setpoint: the judged temperature (setpoint − sensor accuracy).
	JudgedTemperatureC *float64 `json:"judged_temperature_C,omitempty"`
	// Tests are the acceptance tests that verify the limit, with their due
	// state on the review date.
	Tests []LimitTest `json:"verification_tests"`

	// The words, made by internal/present (SI in JSON): what is limited, the
	// limit in words, and the plan's four columns (the haccp: block's text,
	// or the defaults).
	Parameter        string `json:"parameter"`
	LimitText        string `json:"limit_text"`
	Monitoring       string `json:"monitoring"`
	CorrectiveAction string `json:"corrective_action"`
	Verification     string `json:"verification"`
	Records          string `json:"records"`
	// Entered are the haccp: block's words for this limit ("" where absent).
	Entered plantfile.HACCPTexts `json:"-"`
}

// LimitTest is an acceptance test that verifies a critical limit.
type LimitTest struct {
	Test     plantfile.TestKind `json:"test"`
	LastDate *string            `json:"last_date"`
	NextDue  *string            `json:"next_due"`
	State    DueState           `json:"state"`
}

// verifiedBy lists the acceptance tests behind each limit.
var verifiedBy = map[plantfile.CriticalLimitID][]plantfile.TestKind{
	plantfile.LimitSetpoint:            {plantfile.TestCutOut, plantfile.TestCutIn, plantfile.TestSensorCheck, plantfile.TestValveResponse},
	plantfile.LimitMaxFlow:             {plantfile.TestHoldingTime},
	plantfile.LimitHoldingTime:         {plantfile.TestHoldingTime},
	plantfile.LimitRegeneratorPressure: {plantfile.TestRegeneratorPressure},
	plantfile.LimitCoolingOutlet:       nil,
}

// criticalLimits makes the table from the validated schedule: the setpoint,
// the seal and the holding time with a holding tube, the regenerator margin
// with a regeneration section, the cooling outlet with an outlet target and
// cooling.
func criticalLimits(p *plantfile.Plant, res *Result, due []DueItem) []CriticalLimit {
	out := []CriticalLimit{}
	add := func(c CriticalLimit) {
		for _, k := range verifiedBy[c.ID] {
			for _, it := range due {
				if it.Test == k {
					c.Tests = append(c.Tests, LimitTest{Test: k, LastDate: it.LastDate, NextDue: it.NextDue, State: it.State})
				}
			}
		}
		if c.Tests == nil {
			c.Tests = []LimitTest{}
		}
		if p.HACCP != nil {
			c.Entered = p.HACCP.Limits[c.ID]
		}
		out = append(out, c)
	}
	f := func(v float64) *float64 { return &v }
	if h := res.HoldingTube; h != nil {
		add(CriticalLimit{ID: plantfile.LimitSetpoint, Limit: AtLeast, Value: h.SetpointC, Unit: "°C", JudgedTemperatureC: f(h.JudgedTemperatureC),
			Basis: f(h.JudgedTemperatureC)})
		add(CriticalLimit{ID: plantfile.LimitMaxFlow, Limit: AtMost, Value: h.MaxFlowM3s, Unit: "m3/s", Basis: f(h.MaxFlowM3s)})
		c := CriticalLimit{ID: plantfile.LimitHoldingTime, Limit: AtLeast, Value: h.WorstMinResidenceS, Unit: "s", Basis: f(h.WorstMinResidenceS)}
		if l := h.Legal; l != nil {
			c.Value, c.RowTemperatureC = l.TimeS, f(l.TemperatureC)
		}
		add(c)
	} else {
		add(CriticalLimit{ID: plantfile.LimitSetpoint, Limit: AtLeast, Value: p.Process.HoldSetpoint.SI, Unit: "°C"})
	}
	if r := p.Regeneration; r != nil {
		c := CriticalLimit{ID: plantfile.LimitRegeneratorPressure, Limit: AtLeast, Value: units.ToSI(1, units.Pressure, "psi"), Unit: "Pa"}
		if pr := r.Pressure; pr != nil {
			if pr.RequiredMargin.Set {
				c.Value = pr.RequiredMargin.SI
			}
			c.Basis = f(pr.PasteurizedMin.SI - pr.RawMax.SI)
		}
		add(c)
	}
	if len(p.Cooling) > 0 && p.Process.OutletTarget.Set {
		c := CriticalLimit{ID: plantfile.LimitCoolingOutlet, Limit: AtMost, Value: p.Process.OutletTarget.SI, Unit: "°C"}
		for _, s := range res.Sections {
			if s.Kind == regen.CoolingSection {
				c.Basis = f(s.ProductOutC) // the last stage's, in flow order
			}
		}
		add(c)
	}
	return out
}
