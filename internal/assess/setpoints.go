package assess

import (
	"pasval/internal/plantfile"
	"pasval/lethality"
)

// SetpointRow is the fastest particle's lethality had the diversion setpoint
// been offset by OffsetK, the tube and flow unchanged.
type SetpointRow struct {
	OffsetK       float64   `json:"offset_K"`
	SetpointC     float64   `json:"setpoint_C"`
	LogReductions []float64 `json:"log_reductions"` // per organism, in plant-file order
	LegalMet      *bool     `json:"legal_met,omitempty"`
}

// SetpointOffsets are the offsets the hold command tabulates, K.
var SetpointOffsets = []float64{-1, -0.5, 0, 0.5, 1, 1.5, 2}

// SetpointTable recomputes the log reduction of each organism for setpoints
// around the entered one. The hydraulics (viscosity at the entered setpoint)
// are held; with heat loss the profile moves with the outlet temperature.
// A row that is not finite (kinetics far from their reference) is refused
// with the entered values that cause it (finite.go).
func SetpointTable(res *Result) ([]SetpointRow, error) {
	rows := setpointTable(res)
	where, bad := nonFinite(rows)
	if !bad {
		return rows, nil
	}
	return nil, traceNonFinite(res.Plant, "setpoint_table"+where, func(q *plantfile.Plant) bool {
		r, err := run(q)
		if err != nil {
			return false
		}
		_, bad := nonFinite(setpointTable(r))
		return !bad
	})
}

func setpointTable(res *Result) []SetpointRow {
	h := res.HoldingTube
	if h == nil || h.Model == nil {
		return nil
	}
	m := h.Model
	uMax := m.Hyd.FastestToMean * m.Hyd.MeanVelocity
	var rows []lethality.LegalRow
	for _, r := range res.Plant.LegalMinimums {
		rows = append(rows, lethality.LegalRow{Temperature: r.Temperature.SI, Time: r.Time.SI})
	}
	var out []SetpointRow
	for _, off := range SetpointOffsets {
		sp := h.OutletTemperatureC + off
		prof := m.ProfileAt(sp)
		r := SetpointRow{OffsetK: off, SetpointC: sp, LogReductions: []float64{}}
		for _, o := range m.Organisms {
			r.LogReductions = append(r.LogReductions, lethality.LogReduction(prof, uMax, o))
		}
		if len(rows) > 0 {
			met := lethality.JudgeLegal(rows, sp, m.Hyd.MinResidence, Tolerance).Met
			r.LegalMet = &met
		}
		out = append(out, r)
	}
	return out
}
