package regen

import (
	"fmt"
	"math"

	"pasval/internal/props"
)

// Medium is a heating or cooling medium.
type Medium struct {
	Name         string
	Water        bool    // properties from IAPWS-IF97 region 1; Density and SpecificHeat unused
	Density      float64 // kg/m³, > 0, for a medium that is not water
	SpecificHeat float64 // J/(kg·K), > 0, for a medium that is not water
}

// Flow is a medium's rate: exactly one of the two is positive.
type Flow struct {
	Volumetric float64 // m³/s
	Mass       float64 // kg/s
}

// capacity is the medium's stream: mass flow, mean cp and C = ṁ·cp.
type capacity struct {
	mass, cp, c float64
}

// massFlow converts the medium's rate to kg/s, volumetric rates at the
// medium's inlet temperature.
func (m Medium) massFlow(f Flow, inletC float64) (float64, error) {
	if f.Mass > 0 {
		return f.Mass, nil
	}
	if m.Water {
		w, err := props.Water(inletC)
		if err != nil {
			return 0, err
		}
		return f.Volumetric * w.Density, nil
	}
	return f.Volumetric * m.Density, nil
}

func (m Medium) cp(meanC float64) (float64, error) {
	if !m.Water {
		return m.SpecificHeat, nil
	}
	// A starved or oversized duty can drive the provisional outlet out of the
	// liquid range while iterating; cp is then taken at the nearest liquid
	// temperature so that the caller sees the impossible outlet and reports
	// it as a temperature cross rather than a property-range error.
	w, err := props.Water(min(max(meanC, 0.5), 300))
	if err != nil {
		return 0, err
	}
	return w.Cp, nil
}

const (
	maxIterations = 200
	tempTolerance = 1e-11 // K
)

// ErrNoConvergence is returned when a fixed-point solve does not settle.
var ErrNoConvergence = fmt.Errorf("the calculation did not settle in %d iterations; check the flows, U-values and temperatures for a typo", maxIterations)

// outletForDuty finds the medium outlet for a duty q (W, positive when the
// medium gives heat): T_out = T_in − q / (ṁ cp(T̄)), with cp at the mean of
// T_in and T_out, iterated until T_out settles.
func (m Medium) outletForDuty(f Flow, inletC, q float64) (float64, capacity, error) {
	mass, err := m.massFlow(f, inletC)
	if err != nil {
		return 0, capacity{}, err
	}
	var cp float64
	out, err := settle(inletC, func(out float64) (float64, error) {
		cp, err = m.cp((inletC + out) / 2)
		return inletC - q/(mass*cp), err
	})
	if err != nil {
		return 0, capacity{}, err
	}
	return out, capacity{mass, cp, mass * cp}, nil
}

// settle is the fixed-point iteration the sections share: x ← next(x) from
// x0 until two successive values differ by less than tempTolerance (K), at
// most maxIterations times (then ErrNoConvergence). An error from next stops
// it. It returns the last value next gave.
func settle(x0 float64, next func(x float64) (float64, error)) (float64, error) {
	x := x0
	for range maxIterations {
		n, err := next(x)
		if err != nil {
			return 0, err
		}
		if math.Abs(n-x) < tempTolerance {
			return n, nil
		}
		x = n
	}
	return 0, ErrNoConvergence
}
