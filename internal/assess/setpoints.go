package assess

import (
	"pasval/internal/plantfile"
	"pasval/lethality"
)

// SetpointRow is the fastest particle's lethality had the diversion setpoint
// been offset by OffsetK, the tube and flow unchanged.
type SetpointRow struct {
	OffsetK   float64 `json:"offset_K"`
	SetpointC float64 `json:"setpoint_C"`
	// JudgedC is the temperature judged for this setpoint: the setpoint less
	// the sensor accuracy (docs/METHOD.md §9.4).
	JudgedC       float64   `json:"judged_temperature_C"`
	LogReductions []float64 `json:"log_reductions"` // per organism, in plant-file order
	LegalMet      *bool     `json:"legal_met,omitempty"`
}

// SetpointOffsets are the offsets the hold command tabulates, K.
var SetpointOffsets = []float64{-1, -0.5, 0, 0.5, 1, 1.5, 2}

// SetpointOffsetsUS are the offsets in US units: whole °F.
var SetpointOffsetsUS = []float64{-2 * 5.0 / 9, -1 * 5.0 / 9, 0, 1 * 5.0 / 9, 2 * 5.0 / 9, 3 * 5.0 / 9, 4 * 5.0 / 9}

// SetpointTable recomputes the judged log reduction of each organism and the
// legal table for setpoints offset by offsets (K) from the entered one, each
// judged as the check judges the entered one: at the setpoint less the
// sensor accuracy, at the worst flow, isothermal unless the heat-loss credit
// is taken (then the profile at the sealed maximum, moved with the outlet
// temperature, docs/METHOD.md §9.4). The hydraulics (viscosity at the entered
// setpoint) are held. A row that is not finite (kinetics far from their
// reference) is refused with the entered values that cause it (finite.go).
func SetpointTable(res *Result, offsets []float64) ([]SetpointRow, error) {
	rows := setpointTable(res, offsets)
	where, bad := nonFinite(rows)
	if !bad {
		return rows, nil
	}
	return nil, traceNonFinite(res.Plant, "setpoint_table"+where, func(q *plantfile.Plant) bool {
		r, err := run(q)
		if err != nil {
			return false
		}
		_, bad := nonFinite(setpointTable(r, offsets))
		return !bad
	})
}

func setpointTable(res *Result, offsets []float64) []SetpointRow {
	h := res.HoldingTube
	if h == nil || h.Model == nil {
		return nil
	}
	in, ev := h.Model.Inputs, h.Model.Eval
	arr, n := ev.passages()
	ps := arr[:n]
	credit := in.CreditHeatLoss && in.HeatLoss
	var out []SetpointRow
	for _, off := range offsets {
		sp := in.Setpoint + off
		tj := sp - in.SensorAccuracy
		r := SetpointRow{OffsetK: off, SetpointC: sp, JudgedC: tj, LogReductions: []float64{}}
		for _, o := range in.Organisms {
			lr, _ := in.lowest(tj, ps, credit, o)
			r.LogReductions = append(r.LogReductions, lr)
		}
		if len(in.Legal) > 0 {
			met := lethality.JudgeLegal(in.Legal, tj, ev.Worst.MinResidence, Tolerance).Met
			r.LegalMet = &met
		}
		out = append(out, r)
	}
	return out
}
