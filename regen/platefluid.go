package regen

import "pasval/internal/props"

// Fluid gives a stream's properties as functions of temperature (°C) for a
// plate-pack rating. Water media, a described medium and the product (its
// entered or Choi–Okos properties, a viscosity curve or a power law) all
// implement it. Errors are data errors (a temperature outside a property's
// range), returned to the caller unchanged.
type Fluid interface {
	Density(tempC float64) (float64, error)      // kg/m³
	SpecificHeat(tempC float64) (float64, error) // J/(kg·K)
	Conductivity(tempC float64) (float64, error) // W/(m·K)
	// Viscosity is the (apparent) viscosity at tempC when sheared at
	// wallShearRate (1/s), Pa·s; a Newtonian fluid ignores the shear rate,
	// a power-law fluid returns PowerLawViscosity(K, n, wallShearRate).
	Viscosity(tempC, wallShearRate float64) (float64, error)
	// FlowIndex is the power-law index n > 0; 1 for a Newtonian fluid.
	FlowIndex() float64
}

// WaterFluid is liquid water at MediumPressure: density and cp by
// IAPWS-IF97 region 1, viscosity by IAPWS R12-08, thermal conductivity by
// IAPWS R15-11 (docs/METHOD.md §3, water properties).
type WaterFluid struct{}

func (WaterFluid) Density(tempC float64) (float64, error) {
	w, err := props.Water(tempC)
	return w.Density, err
}

func (WaterFluid) SpecificHeat(tempC float64) (float64, error) {
	w, err := props.Water(tempC)
	return w.Cp, err
}

func (WaterFluid) Conductivity(tempC float64) (float64, error) {
	return props.WaterConductivity(tempC)
}

func (WaterFluid) Viscosity(tempC, _ float64) (float64, error) {
	return props.WaterViscosity(tempC)
}

func (WaterFluid) FlowIndex() float64 { return 1 }
