package regen

import (
	"fmt"
	"math"
)

// LineInput is a whole pasteurizer's heat-exchange side at the normal rate.
type LineInput struct {
	ProductCapacity float64 // ṁ·cp of the product at the normal rate, W/K, > 0
	RawInlet        float64 // °C
	Setpoint        float64 // diversion setpoint: pasteurized product entering regeneration, °C
	HeatingOutlet   float64 // product leaving heating (the holding-tube inlet), °C ≥ Setpoint
	OutletTarget    float64 // final product temperature, °C

	Regeneration *RegenSpec    // nil: no regeneration section
	Heating      *MediumSpec   // nil: no heating section described
	Cooling      []CoolingSpec // in flow order; a last sizing stage with ProductOut NaN cools to OutletTarget
}

// LineResult holds each section in process order and the regeneration ratio.
type LineResult struct {
	Sections          []Section
	RegenerationRatio float64 // NaN when there is no regeneration section
	// HeatingMediumAvailable is the hottest heating medium on hand (rating
	// mode), to compare with the required inlet in the heating section.
	HeatingMediumAvailable float64
	FinalProductOut        float64 // °C, product leaving the last cooling stage (or regeneration)
}

// Line computes the sections in process order:
//
//  1. regeneration: raw product RawInlet → T_r, pasteurized Setpoint → T_p
//  2. heating: product T_r → HeatingOutlet
//  3. cooling stages: product T_p → … → OutletTarget (or what rated stages reach)
//
// Without regeneration, T_r = RawInlet and T_p = Setpoint. A section with a
// plate pack (its spec's Pack) takes U from the pack, or keeps an entered U
// and rates the pack beside it (SectionPack); its Section.Pack holds the
// pack's rating.
func Line(in LineInput) (LineResult, error) {
	if !(in.ProductCapacity > 0) {
		panic(fmt.Sprintf("%sLine: product capacity %g must be positive", panicPrefix, in.ProductCapacity))
	}
	res := LineResult{RegenerationRatio: math.NaN()}
	if !(in.RawInlet < in.Setpoint) {
		return res, fmt.Errorf("the raw inlet (%.2f °C) must be below the diversion setpoint (%.2f °C)", in.RawInlet, in.Setpoint)
	}
	rawOut, pastOut := in.RawInlet, in.Setpoint
	if in.Regeneration != nil {
		spec := *in.Regeneration
		sec, err := withPack("regeneration", spec.Pack, spec.Surface, func(s Surface) (Section, error) {
			spec.Surface = s
			return Regeneration(spec, in.ProductCapacity, in.RawInlet, in.Setpoint)
		})
		if err != nil {
			return res, err
		}
		res.Sections = append(res.Sections, sec)
		res.RegenerationRatio = (sec.ProductOut - in.RawInlet) / (in.Setpoint - in.RawInlet)
		rawOut, pastOut = sec.ProductOut, sec.OtherOut
	}
	if in.Heating != nil {
		spec := *in.Heating
		sec, err := withPack("heating", spec.Pack, spec.Surface, func(s Surface) (Section, error) {
			spec.Surface = s
			return Heating(spec, in.ProductCapacity, rawOut, in.HeatingOutlet)
		})
		if err != nil {
			return res, err
		}
		res.Sections = append(res.Sections, sec)
		res.HeatingMediumAvailable = in.Heating.Inlet
	}
	t := pastOut
	for i, st := range in.Cooling {
		if i == len(in.Cooling)-1 && st.Mode() == Sizing && math.IsNaN(st.ProductOut) {
			st.ProductOut = in.OutletTarget
		}
		sec, err := withPack(label("cooling", st.Stage), st.Pack, st.Surface, func(s Surface) (Section, error) {
			st.Surface = s
			return Cooling(st, in.ProductCapacity, t)
		})
		if err != nil {
			return res, err
		}
		res.Sections = append(res.Sections, sec)
		t = sec.ProductOut
	}
	res.FinalProductOut = t
	return res, nil
}
