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
	var c ViscosityCurve
	err := c.Set(pts)
	return c, err
}

// Set makes c the curve of pts, as NewViscosityCurve does, reusing c's
// storage: a loop that varies the points (margins under uncertainty) builds
// its curve again without allocating. On error c is left empty.
func (c *ViscosityCurve) Set(pts []ViscosityPoint) error {
	if len(pts) == 0 {
		c.points = c.points[:0]
		return fmt.Errorf("at least one viscosity point is needed")
	}
	p := append(c.points[:0], pts...)
	// Insertion sort: a handful of points, stable, and no allocation.
	for i := 1; i < len(p); i++ {
		for j := i; j > 0 && p[j].TempC < p[j-1].TempC; j-- {
			p[j], p[j-1] = p[j-1], p[j]
		}
	}
	c.points = p
	for i := range p {
		if !(p[i].Viscosity > 0) {
			c.points = p[:0]
			return fmt.Errorf("viscosity must be positive")
		}
		if i > 0 && units.SameTemperature(p[i].TempC, p[i-1].TempC) {
			c.points = p[:0]
			return fmt.Errorf("two viscosity points at %.2f °C", p[i].TempC)
		}
	}
	return nil
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
	la := math.Log(a.Viscosity)
	return math.Exp(la + f*(math.Log(b.Viscosity)-la)), false
}

// Range is the span of the measured points, °C.
func (c ViscosityCurve) Range() (lo, hi float64) {
	return c.points[0].TempC, c.points[len(c.points)-1].TempC
}
