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

// ConstantFluid is a described medium (glycol, brine) whose density, specific
// heat, thermal conductivity and viscosity are entered as constants
// (docs/METHOD.md §3.4, described media). Every value > 0.
type ConstantFluid struct {
	Rho, Cp, K, Mu float64 // kg/m³, J/(kg·K), W/(m·K), Pa·s
}

func (f ConstantFluid) Density(float64) (float64, error)        { return f.Rho, nil }
func (f ConstantFluid) SpecificHeat(float64) (float64, error)   { return f.Cp, nil }
func (f ConstantFluid) Conductivity(float64) (float64, error)   { return f.K, nil }
func (f ConstantFluid) Viscosity(_, _ float64) (float64, error) { return f.Mu, nil }
func (ConstantFluid) FlowIndex() float64                        { return 1 }

// ProductFluid is the product in a plate pack (docs/METHOD.md §12, plate
// packs):
//
//	ρ(T)  = the entered density, or Choi–Okos at T (Composition)
//	cp    = the line's single value (the regenerator's two sides carry the same capacity)
//	k(T)  = the entered conductivity, or Choi–Okos at T
//	μ(T)  = the entered points, ln μ linear in T, the nearest end held outside
//	        (Curve); or a power law's apparent viscosity K γ̇ⁿ⁻¹ at the wall
//	        shear rate, the same at every temperature
//
// Exactly one of Curve and a power law (Consistency, Index > 0) is given; a
// density or conductivity of 0 takes Choi–Okos, which then needs Composition.
type ProductFluid struct {
	Composition       *props.Composition
	DensityValue      float64 // kg/m³; 0: Choi–Okos
	SpecificHeatValue float64 // J/(kg·K), > 0
	ConductivityValue float64 // W/(m·K); 0: Choi–Okos
	Curve             *props.ViscosityCurve
	Consistency       float64 // K, Pa·sⁿ (power law)
	Index             float64 // n (power law)
}

func (f ProductFluid) Density(tempC float64) (float64, error) {
	if f.DensityValue > 0 {
		return f.DensityValue, nil
	}
	return f.composition("density").Density(tempC), nil
}

func (f ProductFluid) SpecificHeat(float64) (float64, error) { return f.SpecificHeatValue, nil }

func (f ProductFluid) Conductivity(tempC float64) (float64, error) {
	if f.ConductivityValue > 0 {
		return f.ConductivityValue, nil
	}
	return f.composition("conductivity").Conductivity(tempC), nil
}

func (f ProductFluid) composition(what string) *props.Composition {
	if f.Composition == nil {
		panic(panicPrefix + "ProductFluid: no " + what + " and no composition")
	}
	return f.Composition
}

func (f ProductFluid) Viscosity(tempC, wallShearRate float64) (float64, error) {
	if f.Curve != nil {
		mu, _ := f.Curve.At(tempC)
		return mu, nil
	}
	return PowerLawViscosity(f.Consistency, f.Index, wallShearRate), nil
}

func (f ProductFluid) FlowIndex() float64 {
	if f.Curve != nil {
		return 1
	}
	return f.Index
}
