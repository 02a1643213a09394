package props

import (
	"fmt"
	"math"
	"sort"

	"pasval/internal/units"
)

// ViscosityPoint is one measured Newtonian viscosity.
type ViscosityPoint struct {
	TempC     float64 // °C
	Viscosity float64 // Pa·s, > 0
}

// ViscosityCurve interpolates ln μ linearly in temperature between measured
// points and holds the nearest end value outside them.
type ViscosityCurve struct {
	points []ViscosityPoint // sorted by temperature, distinct
}

// NewViscosityCurve sorts the points; it refuses none, non-positive values or
// two points at the same temperature (units.SameTemperature, the rule the
// plant-file validation applies too).
func NewViscosityCurve(pts []ViscosityPoint) (ViscosityCurve, error) {
	if len(pts) == 0 {
		return ViscosityCurve{}, fmt.Errorf("at least one viscosity point is needed")
	}
	p := append([]ViscosityPoint(nil), pts...)
	sort.Slice(p, func(i, j int) bool { return p[i].TempC < p[j].TempC })
	for i := range p {
		if !(p[i].Viscosity > 0) {
			return ViscosityCurve{}, fmt.Errorf("viscosity must be positive")
		}
		if i > 0 && units.SameTemperature(p[i].TempC, p[i-1].TempC) {
			return ViscosityCurve{}, fmt.Errorf("two viscosity points at %.2f °C", p[i].TempC)
		}
	}
	return ViscosityCurve{points: p}, nil
}

// At returns μ(T) in Pa·s and whether T lies outside the measured points
// (the nearest end value is then held):
//
//	ln μ(T) = ln μ₁ + (T − T₁)/(T₂ − T₁) · (ln μ₂ − ln μ₁),  T₁ ≤ T ≤ T₂
func (c ViscosityCurve) At(tempC float64) (mu float64, extrapolated bool) {
	p := c.points
	if len(p) == 0 {
		panic("props: empty ViscosityCurve")
	}
	if tempC <= p[0].TempC {
		return p[0].Viscosity, !units.SameTemperature(tempC, p[0].TempC)
	}
	if tempC >= p[len(p)-1].TempC {
		return p[len(p)-1].Viscosity, !units.SameTemperature(tempC, p[len(p)-1].TempC)
	}
	i := sort.Search(len(p), func(i int) bool { return p[i].TempC >= tempC })
	a, b := p[i-1], p[i]
	f := (tempC - a.TempC) / (b.TempC - a.TempC)
	return math.Exp(math.Log(a.Viscosity) + f*(math.Log(b.Viscosity)-math.Log(a.Viscosity))), false
}

// Range is the span of the measured points, °C.
func (c ViscosityCurve) Range() (lo, hi float64) {
	return c.points[0].TempC, c.points[len(c.points)-1].TempC
}
