package fouling

import (
	"errors"
	"fmt"
	"math"

	"pasval/regen"
)

// Section is the heating section as installed, and its duty at the normal
// rate as the design check computes it.
type Section struct {
	// Spec is the section in rating mode: Surface holds the arrangement,
	// the plate area and the installed thermal plates (> 0; its U is set for
	// each rating); Medium, Flow (the plant's medium rate) and Inlet (the
	// hottest medium inlet available, °C).
	Spec regen.MediumSpec
	// Pack is the installed plate pack (passes as installed, thermal plates
	// equal to Spec.Plates; its Fouling is ignored: U_clean is wanted), nil
	// without one. ProductFluid and MediumFluid are its two streams' fluids,
	// needed with a pack.
	Pack                      *regen.PlatePack
	ProductFluid, MediumFluid regen.Fluid
	// SpecificHeat is the product's c_p, J/(kg·K), > 0: the line's single
	// value, as the design check takes it.
	SpecificHeat float64
	// ProductMassFlow is the product at the normal rate, kg/s, > 0.
	ProductMassFlow float64
	// ProductIn is the product entering the section at the normal rate
	// (the regeneration outlet), °C; ProductOut the outlet the plant model
	// requires (the setpoint, or the holding-tube inlet with heat loss), °C.
	ProductIn, ProductOut float64
	// MaxMediumToProduct is the burn-on limit on the medium inlet less the
	// product outlet, K; 0: none.
	MaxMediumToProduct float64
}

// Area is the installed area A = plates × plate area, m².
func (s Section) Area() float64 { return float64(s.Spec.Plates) * s.Spec.PlateArea }

// check panics on a caller bug.
func (s Section) check() {
	if s.Spec.Plates <= 0 || !(s.Spec.PlateArea > 0) || !(s.SpecificHeat > 0) || !(s.ProductMassFlow > 0) {
		panic(fmt.Sprintf("%sSection: plates %d, plate area %g m², c_p %g J/(kg·K), product %g kg/s", panicPrefix,
			s.Spec.Plates, s.Spec.PlateArea, s.SpecificHeat, s.ProductMassFlow))
	}
	if s.Pack != nil && (s.Pack.ThermalPlates() != s.Spec.Plates || s.ProductFluid == nil || s.MediumFluid == nil) {
		panic(fmt.Sprintf("%sSection: a pack of %d thermal plates for %d plates, or a fluid missing", panicPrefix, s.Pack.ThermalPlates(), s.Spec.Plates))
	}
}

// ErrNoResistance is the error of a rating asked for a fouling resistance
// so negative that 1/U_clean + R_f is not positive.
var ErrNoResistance = errors.New("the fouling resistance is below −1/U_clean: no overall resistance is left")

// Rate rates the section at the normal rate with the fouling resistance rf
// (m²·K/W) on top of the clean U, as the design check rates it (regen.Heating,
// and with a plate pack regen.SolveWithPack):
//
//	U_service = 1 / (1/U_clean + R_f)
//	T_m,in required: q = ε(U_service A / C_min, C_r) C_min (T_m,in − T_p,in),  q = C_p (T_p,out − T_p,in)
//
// U_clean is uClean without a pack, and with one the pack's clean U at the
// section's own temperatures, iterated with them. The returned section's
// OtherIn is the medium inlet required. Errors: regen's (regen.IsInfeasible
// when no medium temperature delivers the outlet) and ErrNoResistance.
//
// References: Incropera et al. (2007), Eq. 11.5 and §11.4; docs/METHOD.md
// §6.3 (heating), §12 (plate packs), §17.3 (forecast).
func (s Section) Rate(uClean, rf float64) (regen.Section, error) {
	s.check()
	spec := s.Spec
	c := s.ProductMassFlow * s.SpecificHeat
	at := func(u float64) (regen.Section, error) {
		r := 1/u + rf
		if !(r > 0) {
			return regen.Section{}, ErrNoResistance
		}
		spec.U = 1 / r
		return regen.Heating(spec, c, s.ProductIn, s.ProductOut)
	}
	if s.Pack == nil {
		if !(uClean > 0) {
			panic(fmt.Sprintf("%sRate: U_clean %g without a plate pack", panicPrefix, uClean))
		}
		return at(uClean)
	}
	pack := *s.Pack
	pack.Fouling = 0
	sec, _, err := regen.SolveWithPack(pack, regen.PackFlows{Product: s.ProductFluid, Other: s.MediumFluid, ProductMassFlow: s.ProductMassFlow}, at)
	return sec, err
}

// Skip says why a window gives no U.
type Skip int

const (
	SkipDiverted  Skip = iota // a sample of the window was diverted
	SkipUnsteady              // the product flow's range exceeds UnsteadyFraction of its mean
	SkipNoReading             // no sample of the window has all four heating temperatures
	SkipCross                 // the mean temperatures cross (ΔT_lm undefined) or the duty is not positive
	SkipPack                  // the plate pack could not be rated at the window's temperatures and flows
	skipCount
)

// Skips lists every reason, in the order a window is tested for them.
var Skips = []Skip{SkipDiverted, SkipUnsteady, SkipNoReading, SkipCross, SkipPack}

// String is the reason's key in the JSON contract.
func (s Skip) String() string {
	switch s {
	case SkipDiverted:
		return "diverted"
	case SkipUnsteady:
		return "unsteady"
	case SkipNoReading:
		return "no_reading"
	case SkipCross:
		return "temperature_cross"
	case SkipPack:
		return "pack_not_rated"
	}
	panic(fmt.Sprintf("%sno name for skip %d", panicPrefix, int(s)))
}

// UnsteadyFraction is the largest range of the product flow within a
// window, as a fraction of its mean, that still counts as steady running.
const UnsteadyFraction = 0.05

// Point is one window's U and fouling resistance.
type Point struct {
	Time   float64 // s: the window's centre
	Hours  float64 // h since the first point
	Duty   float64 // W, product side
	LMTD   float64 // K
	U      float64 // W/(m²·K)
	UClean float64 // W/(m²·K): the pack's at the window; NaN without a pack
	// Fouling is R_f = 1/U − 1/U_clean, m²·K/W (with the run's U_clean
	// without a pack).
	Fouling float64
}

// point computes one window's U, or says why it gives none:
//
//	q    = ṁ_p c_p (T_p,out − T_p,in)                      W, product side
//	ΔT_lm of the four mean temperatures in the arrangement   K
//	U    = q / (A ΔT_lm)                                    W/(m²·K)
//
// and with a pack U_clean = RatePlatePack at the window's mean temperatures,
// product flow and medium flow (recorded, else the plant's; by volume at
// the medium inlet temperature).
//
// References: Incropera et al. (2007), Eq. 11.14 and 11.15; docs/METHOD.md
// §17.1 (U from a recorded run).
func (s Section) point(w Window, mediumMass bool) (Point, Skip, bool) {
	switch {
	case w.Diverted > 0:
		return Point{}, SkipDiverted, false
	case w.ProductFlowMax-w.ProductFlowMin > UnsteadyFraction*w.ProductFlowMean:
		return Point{}, SkipUnsteady, false
	case w.Heating == 0:
		return Point{}, SkipNoReading, false
	}
	q := w.ProductFlowMean * s.SpecificHeat * (w.ProductOut - w.ProductIn)
	d1, d2 := regen.TerminalDifferences(s.Spec.Arrangement, w.MediumIn, w.MediumOut, w.ProductIn, w.ProductOut)
	lm, ok := regen.LMTD(d1, d2)
	if !ok || !(q > 0) {
		return Point{}, SkipCross, false
	}
	p := Point{Time: w.Centre(), Duty: q, LMTD: lm, U: q / (s.Area() * lm), UClean: math.NaN()}
	if s.Pack != nil {
		mass, err := s.mediumMass(w, mediumMass)
		if err != nil {
			return Point{}, SkipPack, false
		}
		pack := *s.Pack
		pack.Fouling = 0
		r, err := regen.RatePlatePack(pack,
			regen.PackStream{Fluid: s.ProductFluid, MassFlow: w.ProductFlowMean, In: w.ProductIn, Out: w.ProductOut},
			regen.PackStream{Fluid: s.MediumFluid, MassFlow: mass, In: w.MediumIn, Out: w.MediumOut})
		if err != nil || !(r.UClean > 0) {
			return Point{}, SkipPack, false
		}
		p.UClean = r.UClean
		p.Fouling = 1/p.U - 1/p.UClean
	}
	return p, 0, true
}

// mediumMass is the window's medium mass flow, kg/s: the recorded mean, or
// the plant's medium rate; a volumetric one at the window's mean medium
// inlet temperature (docs/METHOD.md §3.5).
func (s Section) mediumMass(w Window, recordedMass bool) (float64, error) {
	q, mass := w.MediumFlow, recordedMass
	if math.IsNaN(q) {
		q, mass = s.Spec.Flow.Volumetric, false
		if s.Spec.Flow.Mass > 0 {
			q, mass = s.Spec.Flow.Mass, true
		}
	}
	if !(q > 0) {
		return 0, fmt.Errorf("medium flow %g", q)
	}
	if mass {
		return q, nil
	}
	rho, err := s.MediumFluid.Density(w.MediumIn)
	return q * rho, err
}
