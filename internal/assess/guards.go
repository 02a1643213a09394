package assess

import (
	"fmt"

	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/regen"
)

// Guard rails on the line (docs/METHOD.md §19.2): results a careful reviewer
// would question even when every check passes.
const (
	// BoilingC is where a water heating medium must be pressurised, °C (at
	// atmospheric pressure).
	BoilingC = 100.0
	// ColdLimitC and ColdLimitUSF are the outlet temperature many codes set
	// for pasteurized milk: 7 °C, or 45 °F for a plant written in US units
	// (PMO standard as reproduced in Chandan and Kilara 2011, Table 15.4).
	ColdLimitC   = 7.0
	ColdLimitUSF = 45.0
)

// ColdLimit is the outlet limit for a plant, °C: 45 °F for a plant whose
// setpoint is written in °F, else 7 °C.
func ColdLimit(p *plantfile.Plant) float64 {
	if p.System == units.US {
		return (ColdLimitUSF - 32) * 5 / 9
	}
	return ColdLimitC
}

// lineWarnings flags a product cooled below freezing, a heating medium above
// boiling and a warm pasteurizer outlet.
func lineWarnings(p *plantfile.Plant, res *Result, line regen.LineResult) {
	freeze, entered := 0.0, 0.0
	if fp := p.Product.FreezingPoint; fp.Set {
		freeze, entered = fp.SI, 1
	}
	stage := 0
	for _, s := range line.Sections {
		switch s.Kind {
		case regen.HeatingSection:
			if s.OtherIn > BoilingC {
				res.warn(WarnMediumPressurised, "heating.medium_inlet", map[string]float64{"medium_in_C": s.OtherIn, "boiling_C": BoilingC})
			}
		case regen.CoolingSection:
			if s.ProductOut < freeze-1e-9 {
				res.warn(WarnProductFrozen, fmt.Sprintf("cooling[%d]", stage),
					map[string]float64{"product_out_C": s.ProductOut, "limit_C": freeze, "freezing_point_entered": entered, "stage_index": float64(stage)})
			}
			stage++
		}
	}
	limit, out := ColdLimit(p), line.FinalProductOut
	if out <= limit+1e-9 {
		return
	}
	if t := p.Process.OutletTarget; t.Set && t.SI > limit+1e-9 && out <= t.SI+1e-9 {
		res.Warnings = append(res.Warnings, Warning{Code: NoteOutletWarm, Field: "process.outlet_target", Note: true,
			Values: map[string]float64{"outlet_C": out, "limit_C": limit, "target_C": t.SI}})
		return
	}
	res.warn(WarnOutletWarm, "process.outlet_target", map[string]float64{"outlet_C": out, "limit_C": limit})
}
