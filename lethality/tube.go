// Package lethality judges the holding tube of a continuous pasteurizer: the
// fastest particle's residence time at the sealed maximum flow, the flow regime,
// the temperature profile with heat loss, the log reduction of target organisms
// by their D- and z-values, and the user's table of legal time–temperature rows.
//
// All quantities are SI; temperatures in °C.
//
//	tube := lethality.Tube{InnerDiameter: 0.0475, Length: 24, Rise: 0.6}
//	h := tube.Hydraulics(lethality.Flow{Volumetric: 11.0 / 3600, Density: 1015},
//		lethality.Newtonian{Viscosity: 0.7e-3}, 0)
//	fmt.Println(h.Regime, h.FastestToMean, h.MinResidence)
//
// Conventions (docs/METHOD.md §7): holding time is judged at the sealed
// maximum flow for the fastest particle, which moves at FastestToMean times the
// mean velocity; transitional flow (2100 ≤ Re < 4000) is treated as laminar.
//
// References: Metzner and Reed (1955), AIChE J. 1:434 (generalized Reynolds
// number); Steffe, Rheological Methods in Food Process Engineering, 2nd ed.
// (1996), ch. 1 (power-law laminar profile); Petukhov (1970) smooth-tube friction
// factor as given in Incropera et al. (2007) Eq. 8.21; the power-law turbulent
// velocity profile of Bird, Stewart and Lightfoot, Transport Phenomena (2002), §5.1.
package lethality

import (
	"fmt"
	"math"
)

const panicPrefix = "lethality: "

// Tube is the holding tube's geometry.
type Tube struct {
	InnerDiameter float64 // m, > 0
	OuterDiameter float64 // m; 0 when not known (needed only for heat loss)
	Length        float64 // m, > 0: the length between the heater outlet and the diversion sensor
	Rise          float64 // m: the outlet's height above the inlet
}

// CrossSection is πD²/4, m².
func (t Tube) CrossSection() float64 { return math.Pi * t.InnerDiameter * t.InnerDiameter / 4 }

// Volume is the tube's hold-up, m³.
func (t Tube) Volume() float64 { return t.CrossSection() * t.Length }

// Slope is rise/length (dimensionless; 0.021 = 2.1 cm/m = 0.25 in/ft).
func (t Tube) Slope() float64 { return t.Rise / t.Length }

// DefaultMinSlope is 0.25 in per ft (2.083 cm/m), the minimum continuous
// upward slope of the Grade "A" PMO, Item 16p (from memory; see docs/METHOD.md §7.6).
const DefaultMinSlope = 0.25 / 12

// Rheology is the product's flow behaviour at the holding temperature.
type Rheology interface {
	// FlowIndex is n: 1 for a Newtonian fluid.
	FlowIndex() float64
	// Reynolds is the (generalized) Reynolds number for density rho, mean
	// velocity v and diameter d.
	Reynolds(rho, v, d float64) float64
	// VelocityAt is the mean velocity at which the Reynolds number equals
	// re: the inverse of Reynolds in v.
	VelocityAt(re, rho, d float64) float64
}

// Newtonian is a fluid of constant viscosity.
type Newtonian struct {
	Viscosity float64 // Pa·s, > 0
}

func (Newtonian) FlowIndex() float64 { return 1 }

// Reynolds is Re = ρ v D / μ.
func (n Newtonian) Reynolds(rho, v, d float64) float64 { return rho * v * d / n.Viscosity }

// VelocityAt is v = Re μ / (ρ D).
func (n Newtonian) VelocityAt(re, rho, d float64) float64 { return re * n.Viscosity / (rho * d) }

// PowerLaw is a fluid with τ = K γ̇ⁿ.
type PowerLaw struct {
	N float64 // flow index, > 0
	K float64 // consistency, Pa·sⁿ, > 0
}

func (p PowerLaw) FlowIndex() float64 { return p.N }

// Reynolds is the Metzner–Reed generalized Reynolds number:
//
//	Re_MR = ρ v^(2−n) Dⁿ / (K 8^(n−1) ((3n+1)/(4n))ⁿ)
//
// which reduces to ρvD/μ at n = 1, K = μ. References: Metzner and Reed (1955).
func (p PowerLaw) Reynolds(rho, v, d float64) float64 {
	n := p.N
	return rho * math.Pow(v, 2-n) * math.Pow(d, n) / (p.metznerReedScale())
}

// metznerReedScale is K 8^(n−1) ((3n+1)/(4n))ⁿ, Pa·sⁿ.
func (p PowerLaw) metznerReedScale() float64 {
	n := p.N
	return p.K * math.Pow(8, n-1) * math.Pow((3*n+1)/(4*n), n)
}

// VelocityAt inverts the Metzner–Reed number for n < 2:
//
//	v = [ Re K 8^(n−1) ((3n+1)/(4n))ⁿ / (ρ Dⁿ) ]^(1/(2−n))
func (p PowerLaw) VelocityAt(re, rho, d float64) float64 {
	return math.Pow(re*p.metznerReedScale()/(rho*math.Pow(d, p.N)), 1/(2-p.N))
}

// Regime is the flow regime in the tube.
type Regime int

const (
	Laminar      Regime = iota // Re < 2100
	Transitional               // 2100 ≤ Re < 4000, treated as laminar
	Turbulent                  // Re ≥ 4000
)

func (r Regime) String() string {
	switch r {
	case Transitional:
		return "transitional"
	case Turbulent:
		return "turbulent"
	}
	return "laminar"
}

// Regime limits on the Reynolds number (docs/METHOD.md §7.3).
const (
	LaminarLimit   = 2100.0
	TurbulentLimit = 4000.0
)

// RegimeOf classifies a Reynolds number.
func RegimeOf(re float64) Regime {
	switch {
	case re < LaminarLimit:
		return Laminar
	case re < TurbulentLimit:
		return Transitional
	}
	return Turbulent
}

// LaminarFastestToMean is u_max/u_mean for fully developed laminar flow of a
// power-law fluid:
//
//	u_max/u_mean = (3n + 1)/(n + 1)   (= 2 for a Newtonian fluid, n = 1)
//
// References: Steffe (1996), ch. 1; Skelland, Non-Newtonian Flow and Heat
// Transfer (1967) (from memory, docs/METHOD.md §7.4).
func LaminarFastestToMean(n float64) float64 { return (3*n + 1) / (n + 1) }

// TurbulentFastestToMean is u_max/u_mean in turbulent flow from a power-law
// velocity profile whose exponent follows the smooth-tube friction factor:
//
//	f = (0.790 ln Re − 1.64)⁻²,  n_p = f^(−1/2)
//	u_max/u_mean = (n_p + 1)(2 n_p + 1) / (2 n_p²)
//
// It gives 1.33 at Re 4000 and 1.25 at Re 20 000. Re ≥ 3000 (the friction
// correlation's lower limit); it panics below 1000.
//
// References: Petukhov (1970) via Incropera et al. (2007) Eq. 8.21; Bird,
// Stewart and Lightfoot (2002) §5.1 (from memory, docs/METHOD.md §7.4).
func TurbulentFastestToMean(re float64) float64 {
	if !(re >= 1000) {
		panic(fmt.Sprintf("%sTurbulentFastestToMean(Re=%g) below the correlation's range", panicPrefix, re))
	}
	np := 0.790*math.Log(re) - 1.64 // = f^(−1/2)
	return (np + 1) * (2*np + 1) / (2 * np * np)
}

// Flow is the product stream through the tube.
type Flow struct {
	Volumetric float64 // m³/s at the holding temperature, > 0
	Density    float64 // kg/m³ at the holding temperature
}

// Hydraulics is the tube's flow state.
type Hydraulics struct {
	MeanVelocity  float64 // m/s
	Reynolds      float64
	Regime        Regime
	FastestToMean float64 // u_max/u_mean used
	Overridden    bool    // FastestToMean came from the user
	MinResidence  float64 // s, fastest particle: L/(ratio·v)
	MeanResidence float64 // s: L/v
}

// Hydraulics computes velocity, Reynolds number, regime and residence times.
// A positive override replaces the fastest-to-mean ratio.
//
//	v = Q/(πD²/4),  t_min = L/(ratio·v),  t_mean = L/v
func (t Tube) Hydraulics(f Flow, r Rheology, override float64) Hydraulics {
	if !(f.Volumetric > 0) || !(t.InnerDiameter > 0) || !(t.Length > 0) {
		panic(fmt.Sprintf("%sHydraulics needs positive flow and geometry: %+v %+v", panicPrefix, f, t))
	}
	h := Hydraulics{MeanVelocity: f.Volumetric / t.CrossSection()}
	h.Reynolds = r.Reynolds(f.Density, h.MeanVelocity, t.InnerDiameter)
	h.Regime = RegimeOf(h.Reynolds)
	switch {
	case override > 0:
		h.FastestToMean, h.Overridden = override, true
	case h.Regime == Turbulent:
		h.FastestToMean = TurbulentFastestToMean(h.Reynolds)
	default:
		h.FastestToMean = LaminarFastestToMean(r.FlowIndex())
	}
	h.MeanResidence = t.Length / h.MeanVelocity
	h.MinResidence = h.MeanResidence / h.FastestToMean
	return h
}

// RequiredLength is the tube length that gives the fastest particle time
// seconds: L = time · ratio · v.
func (h Hydraulics) RequiredLength(time float64) float64 {
	return time * h.FastestToMean * h.MeanVelocity
}
