package regen

import (
	"fmt"
	"math"
)

// PackSide says which side of a plate pack something belongs to.
type PackSide int

const (
	WholePack   PackSide = iota // the pack as a whole (the zero value)
	ProductSide                 // the product (regeneration: raw product)
	OtherSide                   // the medium (regeneration: pasteurized product)
)

func (s PackSide) String() string {
	switch s {
	case ProductSide:
		return "product side"
	case OtherSide:
		return "other side"
	default:
		return "plate pack"
	}
}

// PlateWarningCode identifies a validity warning of a plate-pack rating.
type PlateWarningCode int

const (
	// WarnReynoldsBelowRange: Re < MartinReynoldsMin; Value is Re.
	WarnReynoldsBelowRange PlateWarningCode = iota + 1
	// WarnReynoldsAboveRange: Re > MartinReynoldsMax; Value is Re.
	WarnReynoldsAboveRange
	// WarnNearBranchSwitch: BranchBandLow ≤ Re < BranchBandHigh, where
	// Martin's ξ switches branch with a jump; Value is Re.
	WarnNearBranchSwitch
	// WarnAngleAboveRange: φ > MartinAngleMax; Value is φ in rad.
	WarnAngleAboveRange
	// WarnApparentViscosity: a power-law fluid, rated with its apparent
	// viscosity at the wall shear rate in correlations fitted to Newtonian
	// fluids; Value is the flow index n.
	WarnApparentViscosity
)

func (c PlateWarningCode) String() string {
	switch c {
	case WarnReynoldsBelowRange:
		return "reynolds-below-range"
	case WarnReynoldsAboveRange:
		return "reynolds-above-range"
	case WarnNearBranchSwitch:
		return "reynolds-near-branch-switch"
	case WarnAngleAboveRange:
		return "chevron-angle-above-range"
	case WarnApparentViscosity:
		return "apparent-viscosity"
	default:
		return fmt.Sprintf("PlateWarningCode(%d)", int(c))
	}
}

// PlateWarning is one validity warning, as data: the caller words it.
type PlateWarning struct {
	Code  PlateWarningCode
	Side  PackSide
	Value float64 // see the code
}

// PackStream is one stream through a side of the pack at known temperatures.
type PackStream struct {
	Fluid    Fluid
	MassFlow float64 // kg/s, > 0
	In, Out  float64 // °C: the stream's inlet and outlet
}

// SideRating is one side of a rated plate pack. Properties are at MeanTemp
// except WallViscosity.
type SideRating struct {
	MeanTemp      float64 // °C: (in + out)/2
	WallTemp      float64 // °C: this side's plate surface, from the clean resistances
	Density       float64 // kg/m³
	SpecificHeat  float64 // J/(kg·K)
	Conductivity  float64 // W/(m·K)
	ShearRate     float64 // 1/s: wall shear rate in a channel (SlitWallShearRate)
	Viscosity     float64 // Pa·s, apparent at ShearRate
	WallViscosity float64 // Pa·s at WallTemp and ShearRate

	Velocity     float64 // m/s in a channel: ṁ/(channels per pass · ρ b w)
	PortVelocity float64 // m/s in a port: (ṁ/ρ)/(π d_port²/4)
	Reynolds     float64 // ρ v d_h/μ
	Prandtl      float64 // cp μ/k
	Darcy        float64 // ξ, DarcyMartinVDI
	Nusselt      float64 // NusseltMartin
	H            float64 // film coefficient Nu k/d_h, W/(m²·K)

	ChannelPressureDrop float64 // Pa: ξ (passes L_p/d_h) ρv²/2
	PortPressureDrop    float64 // Pa: 1.4 passes ρ v_port²/2
	PressureDrop        float64 // Pa: the sum; elevation ignored
}

// PackRating is a plate pack rated at given stream temperatures.
type PackRating struct {
	Product, Other SideRating
	UClean         float64 // W/(m²·K): 1/(1/h_product + t/k_w + 1/h_other)
	UService       float64 // W/(m²·K): 1/(1/U_clean + fouling), the U a section is rated with
	Warnings       []PlateWarning
}

// RatePlatePack rates a plate pack for two streams at known inlet and outlet
// temperatures (in a section, those of its ε–NTU rating):
//
//	T̄ = (T_in + T_out)/2 for each stream; ρ, cp, k at T̄
//	v = ṁ/(n_pass ρ b w),  γ̇_w = SlitWallShearRate(v, b, n),  μ = μ(T̄, γ̇_w)
//	Re = ρ v d_h/μ,  Pr = cp μ/k,  ξ = DarcyMartinVDI(Re, φ)
//	Nu = NusseltMartin(Re, Pr, ξ, φ, μ/μ_w),  h = Nu k/d_h
//	U_clean = CleanU(h_product, h_other, t, k_w),  U_service = ServiceU(U_clean, R_f)
//	T_w,s = T̄_s − U_clean (T̄_s − T̄_o)/h_s   (each side's wall, fouling excluded)
//	μ_w,s = μ_s(T_w,s, γ̇_w,s), iterated with h until μ_w settles
//	Δp = ξ (N_pass L_p/d_h) ρv²/2 + 1.4 N_pass ρ v_port²/2
//
// It returns a *PackValueError or *LayoutError for an invalid pack, a
// property error from a Fluid, or ErrNoConvergence (wrapped). A nil fluid
// or a mass flow that is not positive is a caller bug and panics.
//
// References: Martin (1996); VDI Heat Atlas, 2nd ed. (2010); Kakaç and Liu
// (2002), ch. 10; docs/METHOD.md §12 (plate packs).
func RatePlatePack(pack PlatePack, product, other PackStream) (PackRating, error) {
	if err := pack.Validate(); err != nil {
		return PackRating{}, err
	}
	return ratePack(pack, product, other)
}

// wallTolerance is the relative change of the wall viscosities at which the
// wall-temperature iteration stops.
const wallTolerance = 1e-12

// ratePack is RatePlatePack for a pack already validated.
func ratePack(pack PlatePack, product, other PackStream) (PackRating, error) {
	product.check(ProductSide)
	other.check(OtherSide)
	g := pack.Plate
	var r PackRating
	sides := [2]struct {
		s      *SideRating
		stream PackStream
		layout SideLayout
	}{{&r.Product, product, pack.Product}, {&r.Other, other, pack.Other}}
	for _, x := range sides {
		if err := x.s.bulk(g, x.layout, x.stream); err != nil {
			return PackRating{}, err
		}
	}
	p, o := &r.Product, &r.Other
	converged := false
	for range maxIterations {
		p.transfer(g)
		o.transfer(g)
		r.UClean = CleanU(p.H, o.H, g.Thickness, g.WallConductivity)
		p.WallTemp = p.MeanTemp - r.UClean*(p.MeanTemp-o.MeanTemp)/p.H
		o.WallTemp = o.MeanTemp - r.UClean*(o.MeanTemp-p.MeanTemp)/o.H
		muP, err := product.Fluid.Viscosity(p.WallTemp, p.ShearRate)
		if err != nil {
			return PackRating{}, err
		}
		muO, err := other.Fluid.Viscosity(o.WallTemp, o.ShearRate)
		if err != nil {
			return PackRating{}, err
		}
		if math.Abs(muP/p.WallViscosity-1) < wallTolerance && math.Abs(muO/o.WallViscosity-1) < wallTolerance {
			// Keep the wall viscosities h was computed with, so that the
			// reported Nu, h and U agree with them exactly.
			converged = true
			break
		}
		p.WallViscosity, o.WallViscosity = muP, muO
	}
	if !converged {
		return PackRating{}, fmt.Errorf("plate pack wall temperatures: %w", ErrNoConvergence)
	}
	r.UService = ServiceU(r.UClean, pack.Fouling)
	for _, x := range sides {
		x.s.pressureDrop(g, x.layout)
	}
	r.Warnings = packWarnings(g, r, product, other)
	return r, nil
}

func (s PackStream) check(side PackSide) {
	if s.Fluid == nil || !(s.MassFlow > 0) || math.IsInf(s.MassFlow, 0) || math.IsNaN(s.In) || math.IsNaN(s.Out) {
		panic(fmt.Sprintf("%splate pack %s: fluid %v, mass flow %g kg/s, %g → %g °C", panicPrefix, side, s.Fluid, s.MassFlow, s.In, s.Out))
	}
	if n := s.Fluid.FlowIndex(); !(n > 0) {
		panic(fmt.Sprintf("%splate pack %s: flow index %g", panicPrefix, side, n))
	}
}

// bulk fills the properties at the mean temperature, the velocities and the
// wall shear rate; the wall viscosity starts at the bulk value.
func (s *SideRating) bulk(g PlateGeometry, l SideLayout, st PackStream) error {
	s.MeanTemp = (st.In + st.Out) / 2
	var err error
	if s.Density, err = st.Fluid.Density(s.MeanTemp); err != nil {
		return err
	}
	if s.SpecificHeat, err = st.Fluid.SpecificHeat(s.MeanTemp); err != nil {
		return err
	}
	if s.Conductivity, err = st.Fluid.Conductivity(s.MeanTemp); err != nil {
		return err
	}
	s.Velocity = st.MassFlow / (float64(l.ChannelsPerPass) * s.Density * g.PressingDepth * g.ChannelWidth)
	s.PortVelocity = st.MassFlow / s.Density / g.PortArea()
	s.ShearRate = SlitWallShearRate(s.Velocity, g.PressingDepth, st.Fluid.FlowIndex())
	if s.Viscosity, err = st.Fluid.Viscosity(s.MeanTemp, s.ShearRate); err != nil {
		return err
	}
	s.WallViscosity = s.Viscosity
	return nil
}

// transfer computes Re, Pr, ξ, Nu and h from the properties, the velocity
// and the current wall viscosity.
func (s *SideRating) transfer(g PlateGeometry) {
	dh := g.HydraulicDiameter()
	s.Reynolds = s.Density * s.Velocity * dh / s.Viscosity
	s.Prandtl = s.SpecificHeat * s.Viscosity / s.Conductivity
	s.Darcy = DarcyMartinVDI(s.Reynolds, g.ChevronAngle)
	s.Nusselt = NusseltMartin(s.Reynolds, s.Prandtl, s.Darcy, g.ChevronAngle, s.Viscosity/s.WallViscosity)
	s.H = s.Nusselt * s.Conductivity / dh
}

func (s *SideRating) pressureDrop(g PlateGeometry, l SideLayout) {
	s.ChannelPressureDrop = channelPressureDrop(s.Darcy, l.Passes, g.PortToPortLength, g.HydraulicDiameter(), s.Density, s.Velocity)
	s.PortPressureDrop = portPressureDrop(l.Passes, s.Density, s.PortVelocity)
	s.PressureDrop = s.ChannelPressureDrop + s.PortPressureDrop
}

// packWarnings lists where the rating leaves the correlation's range.
func packWarnings(g PlateGeometry, r PackRating, product, other PackStream) []PlateWarning {
	var w []PlateWarning
	if g.ChevronAngle > MartinAngleMax {
		w = append(w, PlateWarning{Code: WarnAngleAboveRange, Side: WholePack, Value: g.ChevronAngle})
	}
	for _, x := range []struct {
		side PackSide
		s    SideRating
		n    float64
	}{{ProductSide, r.Product, product.Fluid.FlowIndex()}, {OtherSide, r.Other, other.Fluid.FlowIndex()}} {
		re := x.s.Reynolds
		switch {
		case re < MartinReynoldsMin:
			w = append(w, PlateWarning{Code: WarnReynoldsBelowRange, Side: x.side, Value: re})
		case re > MartinReynoldsMax:
			w = append(w, PlateWarning{Code: WarnReynoldsAboveRange, Side: x.side, Value: re})
		}
		if re >= BranchBandLow && re < BranchBandHigh {
			w = append(w, PlateWarning{Code: WarnNearBranchSwitch, Side: x.side, Value: re})
		}
		if x.n != 1 {
			w = append(w, PlateWarning{Code: WarnApparentViscosity, Side: x.side, Value: x.n})
		}
	}
	return w
}
