package regen

import (
	"fmt"
	"math"
)

// PackFlows are the two streams through a section's plate pack.
type PackFlows struct {
	Product         Fluid   // the product side's fluid (regeneration: the raw product)
	Other           Fluid   // the other side's fluid
	ProductMassFlow float64 // kg/s, > 0
	// OtherMassFlow is the other side's mass flow, kg/s. 0 takes the
	// section's MediumMassFlow: a medium given by volume is converted at its
	// inlet temperature, which a heating rating only finds as it goes.
	OtherMassFlow float64
}

const (
	// packStartU is the U, W/(m²·K), at which SolveWithPack first calls the
	// section: a middling clean plate U for water-like liquids (common
	// practice). The converged U does not depend on it.
	packStartU = 3000.0
	// packUTolerance is the relative change of U at which the coupled
	// iteration stops.
	packUTolerance = 1e-10
)

// SolveWithPack couples a section's calculation with its plate pack. section
// computes the section at a given U (Regeneration, Heating or Cooling with
// the spec's U set to u, or any rating of the same shape); its temperatures
// feed the pack, whose U_service feeds the next call:
//
//	U₀ = 3000 W/(m²·K)
//	section(U_k) → T_product,in/out, T_other,in/out
//	U_{k+1} = RatePlatePack(pack, streams at those temperatures).UService
//
// until |U_{k+1} − U_k| ≤ 1e-10 U_k. It returns the section computed with
// the converged U and the pack rated at that section's temperatures, so
// that the two agree to that tolerance. In rating mode the section's plates
// must equal pack.ThermalPlates() (a caller bug otherwise: it panics).
//
// Errors: those of pack.Validate, of section (at any U of the iteration,
// the first one included), of the fluids' properties, and ErrNoConvergence
// (wrapped) after maxIterations. The iteration contracts fast: U depends on
// the temperatures only through the properties (four calls of section for
// the demo regenerator).
//
// References: docs/METHOD.md §12 (plate packs).
func SolveWithPack(pack PlatePack, flows PackFlows, section func(u float64) (Section, error)) (Section, PackRating, error) {
	if err := pack.Validate(); err != nil {
		return Section{}, PackRating{}, err
	}
	return solveWithPack(pack, flows, section)
}

func solveWithPack(pack PlatePack, flows PackFlows, section func(u float64) (Section, error)) (Section, PackRating, error) {
	u := packStartU
	plates := pack.ThermalPlates()
	for range maxIterations {
		sec, err := section(u)
		if err != nil {
			return sec, PackRating{}, err
		}
		if sec.Mode == Rating && sec.Plates != plates {
			panic(fmt.Sprintf("%sSolveWithPack: the section has %d plates, its pack %d", panicPrefix, sec.Plates, plates))
		}
		otherMass := flows.OtherMassFlow
		if otherMass == 0 {
			otherMass = sec.MediumMassFlow
		}
		r, err := ratePack(pack,
			PackStream{Fluid: flows.Product, MassFlow: flows.ProductMassFlow, In: sec.ProductIn, Out: sec.ProductOut},
			PackStream{Fluid: flows.Other, MassFlow: otherMass, In: sec.OtherIn, Out: sec.OtherOut})
		if err != nil {
			return sec, PackRating{}, sectionErrorf(sec.Label(), "%w", err)
		}
		if math.Abs(r.UService-u) <= packUTolerance*u {
			return sec, r, nil
		}
		u = r.UService
	}
	return Section{}, PackRating{}, fmt.Errorf("the U-value from the plate pack: %w", ErrNoConvergence)
}

// PackExchange is a section rated from its two inlets with constant
// capacity rates, its U from a plate pack.
type PackExchange struct {
	Kind            SectionKind // what the section does (names it in messages)
	Stage           string      // cooling stage name, "" otherwise
	Pack            PlatePack
	PlateArea       float64 // effective heat-transfer area per thermal plate, m², > 0
	Arrangement     Arrangement
	Flows           PackFlows // OtherMassFlow must be given (> 0)
	ProductCapacity float64   // W/K, > 0: ṁ·cp of the product as the section takes it
	OtherCapacity   float64   // W/K, > 0
	ProductIn       float64   // °C
	OtherIn         float64   // °C; the hotter of the two inlets gives heat
}

// RateWithPack rates a section of pack.ThermalPlates() plates from its two
// inlets, iterating U with the plate pack (SolveWithPack):
//
//	A = N_thermal · A_plate,  NTU = U_service A / C_min,  C_r = C_min/C_max
//	q = ε(NTU, C_r) C_min (T_hot,in − T_cold,in)       (Effectiveness)
//	T_out = T_in ∓ q/C for each stream
//
// The returned Section is in rating mode with U = U_service; the regenerator
// (both capacities the product's) and a cooling stage with a medium of
// constant properties are such sections. Errors as SolveWithPack; equal
// inlets are refused as a *SectionError.
//
// References: Incropera et al. (2007), §11.4; docs/METHOD.md §12 (plate packs).
func RateWithPack(x PackExchange) (Section, PackRating, error) {
	if !(x.PlateArea > 0) || !(x.ProductCapacity > 0) || !(x.OtherCapacity > 0) || !(x.Flows.OtherMassFlow > 0) {
		panic(fmt.Sprintf("%sRateWithPack(%q): plate area %g, capacities %g and %g, other mass flow %g",
			panicPrefix, label(x.Kind.String(), x.Stage), x.PlateArea, x.ProductCapacity, x.OtherCapacity, x.Flows.OtherMassFlow))
	}
	if err := x.Pack.Validate(); err != nil {
		return Section{}, PackRating{}, err
	}
	if !(x.ProductIn != x.OtherIn) {
		return Section{}, PackRating{}, sectionErrorf(label(x.Kind.String(), x.Stage), "both streams enter at %.2f °C; there is no heat to exchange", x.ProductIn)
	}
	plates := x.Pack.ThermalPlates()
	area := float64(plates) * x.PlateArea
	productHot := x.ProductIn > x.OtherIn
	section := func(u float64) (Section, error) {
		surf := Surface{Arrangement: x.Arrangement, U: u, PlateArea: x.PlateArea, Plates: plates}
		sec := Section{Kind: x.Kind, Stage: x.Stage, ProductIn: x.ProductIn, OtherIn: x.OtherIn,
			ProductCapacity: x.ProductCapacity, OtherCapacity: x.OtherCapacity}
		st := streams{hotIn: x.OtherIn, coldIn: x.ProductIn, cHot: x.OtherCapacity, cCold: x.ProductCapacity, hot: "other", cold: "product"}
		if productHot {
			st = streams{hotIn: x.ProductIn, coldIn: x.OtherIn, cHot: x.ProductCapacity, cCold: x.OtherCapacity, hot: "product", cold: "other"}
		}
		q := rate(surf, area, st.cHot, st.cCold, st.hotIn, st.coldIn)
		st.hotOut, st.coldOut = st.hotIn-q/st.cHot, st.coldIn+q/st.cCold
		if productHot {
			sec.ProductOut, sec.OtherOut = st.hotOut, st.coldOut
		} else {
			sec.ProductOut, sec.OtherOut = st.coldOut, st.hotOut
		}
		err := finish(&sec, surf, st)
		return sec, err
	}
	return solveWithPack(x.Pack, x.Flows, section)
}

// PassesError is a sizing whose plate count cannot be reached by whole
// passes on both sides: with different channels per pass, the two sides'
// channel counts drift apart by one per pass and soon cannot alternate.
type PassesError struct {
	Product, Other SideLayout // the passes tried and the channels per pass
	PlatesNeeded   int        // thermal plates the required area needs
}

func (e *PassesError) Error() string {
	return fmt.Sprintf("plate pack: %d thermal plates are needed, which takes %d passes on each side; "+
		"with %d channels per pass on the product side and %d on the other the sides would have %d and %d channels, "+
		"which cannot alternate; give both sides the same channels per pass",
		e.PlatesNeeded, e.Product.Passes, e.Product.ChannelsPerPass, e.Other.ChannelsPerPass,
		e.Product.Channels(), e.Other.Channels())
}

// FewestPasses returns the pack with the fewest passes P, the same on both
// sides and each side keeping its channels per pass (n_p, n_o), whose
// thermal plates give at least the required area:
//
//	N_needed = PlatesFor(A_required, A_plate)
//	P = max(1, ⌈(N_needed + 1)/(n_p + n_o)⌉),  N_thermal = P (n_p + n_o) − 1
//
// The pack's passes are ignored. It returns a *PackValueError for invalid
// channels per pass and a *PassesError when the two sides' channel counts
// P n_p and P n_o would differ by more than one. requiredArea ≥ 0 and
// plateArea > 0, else it panics.
//
// References: docs/METHOD.md §12 (plate packs).
func FewestPasses(pack PlatePack, requiredArea, plateArea float64) (PlatePack, error) {
	if !(requiredArea >= 0) || !(plateArea > 0) || math.IsInf(requiredArea, 0) {
		panic(fmt.Sprintf("%sFewestPasses(area %g, plate area %g)", panicPrefix, requiredArea, plateArea))
	}
	if err := pack.validateFields(false); err != nil {
		return pack, err
	}
	np, no := pack.Product.ChannelsPerPass, pack.Other.ChannelsPerPass
	needed := PlatesFor(requiredArea, plateArea)
	passes := max(1, (needed+1+np+no-1)/(np+no))
	pack.Product.Passes, pack.Other.Passes = passes, passes
	if d := pack.Product.Channels() - pack.Other.Channels(); d > 1 || d < -1 {
		return pack, &PassesError{Product: pack.Product, Other: pack.Other, PlatesNeeded: needed}
	}
	return pack, nil
}

// PackSizing is a section sized with a plate pack.
type PackSizing struct {
	Section Section    // the sizing calculation at U_service: RequiredArea, and Plates = ⌈A/A_plate⌉
	Pack    PlatePack  // the pack with the fewest passes (FewestPasses)
	Rating  PackRating // that pack at the section's temperatures, with its pressure drops
}

// SizeWithPack sizes a section whose channels per pass are fixed. section
// computes the section in sizing mode at a given U (the spec's Plates 0);
// in sizing the temperatures follow from the duty, and U does not depend on
// the passes (each channel's velocity depends on the channels per pass
// only), so:
//
//	U = SolveWithPack(pack with one pass per side, …)
//	pack = FewestPasses(pack, A_required, A_plate)
//	Δp = the pack's pressure drops with those passes
//
// Errors as SolveWithPack and FewestPasses. A section that is not in sizing
// mode is a caller bug and panics.
//
// References: docs/METHOD.md §12 (plate packs).
func SizeWithPack(pack PlatePack, plateArea float64, flows PackFlows, section func(u float64) (Section, error)) (PackSizing, error) {
	one := pack
	one.Product.Passes, one.Other.Passes = 1, 1
	if err := one.Validate(); err != nil {
		return PackSizing{}, err
	}
	sized := func(u float64) (Section, error) {
		sec, err := section(u)
		if err == nil && sec.Mode != Sizing {
			panic(fmt.Sprintf("%sSizeWithPack: section %s is in %s mode", panicPrefix, sec.Label(), sec.Mode))
		}
		return sec, err
	}
	sec, r, err := solveWithPack(one, flows, sized)
	if err != nil {
		return PackSizing{Section: sec}, err
	}
	found, err := FewestPasses(pack, sec.RequiredArea, plateArea)
	if err != nil {
		return PackSizing{Section: sec}, err
	}
	for _, x := range []struct {
		s *SideRating
		l SideLayout
	}{{&r.Product, found.Product}, {&r.Other, found.Other}} {
		x.s.pressureDrop(found.Plate, x.l)
	}
	return PackSizing{Section: sec, Pack: found, Rating: r}, nil
}
