package regen

import "errors"

// SectionPack is a section's plate pack in a line (LineInput): the pack, the
// fluids on its two sides and whether the section keeps an entered U.
type SectionPack struct {
	// Pack is the geometry and the layout. In rating mode the section's
	// Plates must equal Pack.ThermalPlates(); in sizing mode the passes are
	// found (FewestPasses) and the channels per pass are kept.
	Pack  PlatePack
	Flows PackFlows // regeneration: the product on both sides, at the same mass flow
	// EnteredU: the section is computed with its Surface.U (an entered
	// u_value, fouling included) and the pack is rated at the section's
	// temperatures beside it, for comparison. Otherwise the section's U is
	// the pack's U_service, iterated with its temperatures (SolveWithPack,
	// SizeWithPack).
	EnteredU bool
}

// PackResult is a section's plate pack as computed.
type PackResult struct {
	Pack     PlatePack  // the layout; sizing: with the fewest passes found
	Rating   PackRating // at the section's temperatures: U, film coefficients, Re, pressure drops
	EnteredU bool       // the section used the entered U, not Rating.UService
}

// PackError is a plate-pack error of one section: an invalid pack
// (*PackValueError, *LayoutError), passes that cannot alternate
// (*PassesError) or a coupled iteration that did not settle.
type PackError struct {
	Section string // the section's label, as Section.Label gives it
	Err     error
}

func (e *PackError) Error() string { return e.Section + ": " + e.Err.Error() }
func (e *PackError) Unwrap() error { return e.Err }

// withPack computes a section whose plate pack is sp (nil: none) through
// compute, which computes it on a given surface:
//
//	entered U:          the section at surf.U; sizing: the fewest passes
//	                    for its required area; the pack rated at its temperatures
//	rating, pack's U:   SolveWithPack
//	sizing, pack's U:   SizeWithPack
//
// A sized section reports the found pack's thermal plates and their area as
// installed (at least ⌈A_required/A_plate⌉). Errors of the pack itself come
// as a *PackError naming the section; the section's own errors unchanged.
//
// References: docs/METHOD.md §12 (plate packs).
func withPack(label string, sp *SectionPack, surf Surface, compute func(Surface) (Section, error)) (Section, error) {
	if sp == nil {
		return compute(surf)
	}
	at := func(u float64) (Section, error) {
		s := surf
		s.U = u
		return compute(s)
	}
	var sec Section
	var res PackResult
	var err error
	switch {
	case sp.EnteredU:
		sec, err = compute(surf)
		if err != nil {
			return sec, err
		}
		res = PackResult{Pack: sp.Pack, EnteredU: true}
		if sec.Mode == Sizing {
			res.Pack, err = FewestPasses(sp.Pack, sec.RequiredArea, surf.PlateArea)
		} else {
			err = sp.Pack.Validate()
		}
		if err == nil {
			p, o := sp.streams(sec)
			res.Rating, err = ratePack(res.Pack, p, o)
		}
	case surf.Mode() == Rating:
		res.Pack = sp.Pack
		sec, res.Rating, err = SolveWithPack(sp.Pack, sp.Flows, at)
	default:
		var sz PackSizing
		sz, err = SizeWithPack(sp.Pack, surf.PlateArea, sp.Flows, at)
		sec, res.Pack, res.Rating = sz.Section, sz.Pack, sz.Rating
	}
	if err != nil {
		return sec, packError(label, err)
	}
	if sec.Mode == Sizing {
		sec.Plates = res.Pack.ThermalPlates()
		sec.InstalledArea = float64(sec.Plates) * sec.PlateArea
	}
	sec.Pack = &res
	return sec, nil
}

// streams are the pack's two streams at the section's temperatures.
func (sp *SectionPack) streams(sec Section) (PackStream, PackStream) {
	other := sp.Flows.OtherMassFlow
	if other == 0 {
		other = sec.MediumMassFlow
	}
	return PackStream{Fluid: sp.Flows.Product, MassFlow: sp.Flows.ProductMassFlow, In: sec.ProductIn, Out: sec.ProductOut},
		PackStream{Fluid: sp.Flows.Other, MassFlow: other, In: sec.OtherIn, Out: sec.OtherOut}
}

// packError names the section in an error of its pack; errors that already
// name it (a temperature cross, a *SectionError) pass unchanged.
func packError(label string, err error) error {
	var ce *CrossError
	var se *SectionError
	var pe *PackError
	if errors.As(err, &pe) || errors.As(err, &ce) || errors.As(err, &se) {
		return err
	}
	return &PackError{Section: label, Err: err}
}
