package assess

import (
	"fmt"

	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/internal/units"
)

// Typical ranges for the sanity warnings. They are not limits: a value
// outside them is allowed and computed, but flagged so that a typo (a unit
// mix-up, a missing decimal point) surfaces. Sources: common practice for
// plate pasteurizers of liquid foods.
const (
	uMin, uMax             = 300.0, 10000.0 // W/(m²·K)
	plateAreaMin           = 0.02           // m² per plate
	plateAreaMax           = 4.0
	densityMin, densityMax = 950.0, 1400.0  // kg/m³, liquid foods
	cpMin, cpMax           = 2000.0, 4300.0 // J/(kg·K)
	foulingMax             = 1e-3           // m²·K/W
	outerCoefficientMax    = 50.0           // W/(m²·K), a bare or insulated tube in still air
	holdingTimeMax         = 1800.0         // s: 30 min is a vat, not a continuous line
	tubeVelocityMin        = 0.2            // m/s
	tubeVelocityMax        = 4.0
	ratioMax               = 0.95
)

// sanityWarnings flags entered or computed values outside what the trade sees.
func sanityWarnings(p *plantfile.Plant, res *Result) {
	sys := p.System
	d := func(v float64, k units.Kind) string {
		u := units.DisplayUnit(k, sys)
		return fmt.Sprintf("%.4g %s", units.FromSI(v, k, u), u)
	}
	warn := func(format string, args ...any) { res.Warnings = append(res.Warnings, fmt.Sprintf(format, args...)) }
	plates := func(name string, pl plantfile.Plates) {
		if u := pl.UValue; u.Set && (u.SI > uMax || u.SI < uMin) {
			warn("%s.u_value %s is outside what plate heat exchangers reach in this service (typically %s to %s); check the value and its unit",
				name, u.Text, d(uMin, units.HeatTransferCoefficient), d(uMax, units.HeatTransferCoefficient))
		}
		if a := pl.PlateArea; a.Set && (a.SI > plateAreaMax || a.SI < plateAreaMin) {
			warn("%s.plate_area %s per plate is outside the usual %s to %s; check the value and its unit",
				name, a.Text, d(plateAreaMin, units.Area), d(plateAreaMax, units.Area))
		}
		if f := pl.Fouling; f.Set && f.SI > foulingMax {
			warn("%s.fouling %s is far above the usual fouling resistances of plate heat exchangers (below 0.001 m²·K/W)", name, f.Text)
		}
	}
	if p.Regeneration != nil {
		plates("regeneration", p.Regeneration.Plates)
		if p.Regeneration.RatioSet && p.Regeneration.Ratio > ratioMax {
			warn("a regeneration ratio of %.1f %% is unusually high (plate regenerators commonly reach 80–94 %%); the plate count grows steeply near 100 %%",
				p.Regeneration.Ratio*100)
		}
	}
	if p.Heating != nil {
		plates("heating", p.Heating.Plates)
	}
	for i, c := range p.Cooling {
		plates(fmt.Sprintf("cooling[%d]", i), c.Plates)
	}
	pr := p.Product
	if pp := res.Product; pp.Density > 0 && (pp.Density < densityMin || pp.Density > densityMax) {
		warn("the product density %s is outside the usual %s to %s for liquid foods; check the value and its unit",
			d(pp.Density, units.Density), d(densityMin, units.Density), d(densityMax, units.Density))
	}
	if pp := res.Product; pp.SpecificHeat > 0 && (pp.SpecificHeat < cpMin || pp.SpecificHeat > cpMax) {
		warn("the product specific heat %s is outside the usual %s to %s for liquid foods; check the value and its unit",
			d(pp.SpecificHeat, units.SpecificHeat), d(cpMin, units.SpecificHeat), d(cpMax, units.SpecificHeat))
	}
	for i, v := range pr.Viscosity {
		if !v.At.Set || !v.Value.Set {
			continue
		}
		water, err := props.WaterViscosity(min(max(v.At.SI, 1), 150))
		if err == nil && v.Value.SI < 0.9*water {
			warn("product.viscosity[%d]: %s at %s is below water's %s at that temperature (IAPWS 2008); a liquid food is at least as viscous as water: check the value and its unit",
				i, v.Value.Text, v.At.Text, d(water, units.Viscosity))
		}
	}
	if h := res.HoldingTube; h != nil {
		if h.MinResidenceS > holdingTimeMax {
			warn("a fastest-particle holding time of %.0f s (%.1f min) is beyond what a continuous line holds (30 min is a vat hold); check the tube length, diameter and flow",
				h.MinResidenceS, h.MinResidenceS/60)
		}
		if h.MeanVelocity < tubeVelocityMin || h.MeanVelocity > tubeVelocityMax {
			warn("the mean velocity in the holding tube, %s/s, is outside the usual %s/s to %s/s; check the tube diameter and the flow",
				d(h.MeanVelocity, units.Length), d(tubeVelocityMin, units.Length), d(tubeVelocityMax, units.Length))
		}
		if oc := p.HoldingTube.OuterCoefficient; oc.Set && oc.SI > outerCoefficientMax {
			warn("holding_tube.outer_coefficient %s is above what still air gives a bare tube (typically 5–15 W/(m²·K)); check the value and its unit", oc.Text)
		}
	}
}
