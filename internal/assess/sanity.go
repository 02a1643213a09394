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
	plates := func(name string, pl plantfile.Plates) {
		if u := pl.UValue; u.Set && (u.SI > uMax || u.SI < uMin) {
			res.warn(WarnUValue, name+".u_value", map[string]float64{"value_W_m2K": u.SI, "low_W_m2K": uMin, "high_W_m2K": uMax})
		}
		if a := pl.PlateArea; a.Set && (a.SI > plateAreaMax || a.SI < plateAreaMin) {
			res.warn(WarnPlateArea, name+".plate_area", map[string]float64{"value_m2": a.SI, "low_m2": plateAreaMin, "high_m2": plateAreaMax})
		}
		if f := pl.Fouling; f.Set && f.SI > foulingMax {
			res.warn(WarnFouling, name+".fouling", map[string]float64{"value_m2K_W": f.SI, "high_m2K_W": foulingMax})
		}
	}
	if p.Regeneration != nil {
		plates("regeneration", p.Regeneration.Plates)
		if p.Regeneration.RatioSet && p.Regeneration.Ratio > ratioMax {
			res.warn(WarnRatioHigh, "regeneration.ratio", map[string]float64{"ratio": p.Regeneration.Ratio})
		}
	}
	if p.Heating != nil {
		plates("heating", p.Heating.Plates)
	}
	for i, c := range p.Cooling {
		plates(fmt.Sprintf("cooling[%d]", i), c.Plates)
	}
	productSanity(p, res)
	scaleWarnings(p, res)
	if h := res.HoldingTube; h != nil {
		if h.MinResidenceS > holdingTimeMax {
			res.warn(WarnHoldingTimeLong, "", map[string]float64{"min_residence_s": h.MinResidenceS})
		}
		if h.MeanVelocity < tubeVelocityMin || h.MeanVelocity > tubeVelocityMax {
			res.warn(WarnTubeVelocity, "", map[string]float64{"value_m_s": h.MeanVelocity, "low_m_s": tubeVelocityMin, "high_m_s": tubeVelocityMax})
		}
		if oc := p.HoldingTube.OuterCoefficient; oc.Set && oc.SI > outerCoefficientMax {
			res.warn(WarnOuterCoefficient, "holding_tube.outer_coefficient", map[string]float64{"value_W_m2K": oc.SI})
		}
	}
}

// productSanity flags product properties outside those of liquid foods.
func productSanity(p *plantfile.Plant, res *Result) {
	pp := res.Product
	field := func(entered plantfile.Quantity, name string) string {
		if entered.Set {
			return "product." + name
		}
		return "product.composition"
	}
	if pp.Density > 0 && (pp.Density < densityMin || pp.Density > densityMax) {
		res.warn(WarnDensity, field(p.Product.Density, "density"),
			map[string]float64{"value_kg_m3": pp.Density, "low_kg_m3": densityMin, "high_kg_m3": densityMax})
	}
	if pp.SpecificHeat > 0 && (pp.SpecificHeat < cpMin || pp.SpecificHeat > cpMax) {
		res.warn(WarnSpecificHeat, field(p.Product.SpecificHeat, "specific_heat"),
			map[string]float64{"value_J_kgK": pp.SpecificHeat, "low_J_kgK": cpMin, "high_J_kgK": cpMax})
	}
	viscosityRises(p, res)
	for i, v := range p.Product.Viscosity {
		if !v.At.Set || !v.Value.Set {
			continue
		}
		water, err := props.WaterViscosity(min(max(v.At.SI, 1), 150))
		if err == nil && v.Value.SI < 0.9*water {
			res.warn(WarnViscosityBelowWater, fmt.Sprintf("product.viscosity[%d].value", i),
				map[string]float64{"value_Pa_s": v.Value.SI, "at_C": v.At.SI, "water_Pa_s": water})
		}
	}
}

// viscosityRises flags each Newtonian viscosity point above the point next
// below it in temperature (the points in any order): liquid foods thin as
// they warm, so a rise is most often a typo (22 mPa·s for 0.22).
func viscosityRises(p *plantfile.Plant, res *Result) {
	pts := p.Product.Viscosity
	for i, v := range pts {
		below := -1 // the point next below v in temperature
		for j, u := range pts {
			if u.At.SI < v.At.SI && (below < 0 || u.At.SI > pts[below].At.SI) {
				below = j
			}
		}
		if below >= 0 && v.Value.SI > pts[below].Value.SI {
			res.warn(WarnViscosityRises, fmt.Sprintf("product.viscosity[%d].value", i), map[string]float64{"at_C": v.At.SI,
				"value_Pa_s": v.Value.SI, "below_at_C": pts[below].At.SI, "below_value_Pa_s": pts[below].Value.SI})
		}
	}
}

// LegalRowFloorC is the coolest legal row that is plausible, °C: below any
// pasteurization temperature the trade uses. The coolest published row is
// liquid egg white's 132 °F (55.6 °C) for 6.2 min (9 CFR 590.570, Table I;
// docs/METHOD.md §10.2); 50 °C leaves room below it for any row a regulator
// may write, while 72 °F (22.2 °C), the PMO's 72 °C row typed in °F, falls
// far below.
const LegalRowFloorC = 50.0

// scaleWarnings flag the unit mix-ups a temperature scale invites: a legal
// row below LegalRowFloorC, and temperature points written in both °C (or
// K) and °F.
func scaleWarnings(p *plantfile.Plant, res *Result) {
	for i, r := range p.LegalMinimums {
		if r.Temperature.SI < LegalRowFloorC {
			res.warn(WarnLegalRowCool, r.Field+".temperature",
				map[string]float64{"row_index": float64(i), "temperature_C": r.Temperature.SI, "floor_C": LegalRowFloorC})
		}
	}
	celsius, fahrenheit := TemperatureFields(p)
	if len(celsius) > 0 && len(fahrenheit) > 0 {
		res.warn(WarnScalesMixed, "", map[string]float64{"celsius_fields": float64(len(celsius)), "fahrenheit_fields": float64(len(fahrenheit))})
	}
}

// TemperatureFields are the fields whose temperature points (not
// differences) are written in °C or K, and in °F, in input order.
func TemperatureFields(p *plantfile.Plant) (celsius, fahrenheit []string) {
	for _, in := range p.Inputs {
		if in.SIUnit != units.Temperature.SIUnit {
			continue
		}
		if in.System == units.US {
			fahrenheit = append(fahrenheit, in.Field)
		} else {
			celsius = append(celsius, in.Field)
		}
	}
	return celsius, fahrenheit
}
