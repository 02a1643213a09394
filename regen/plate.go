package regen

import (
	"fmt"
	"math"
)

// A plate pack computes a section's U and each side's pressure drop from the
// plates and the fluids instead of taking an entered U (docs/METHOD.md §12,
// plate packs):
//
//	pack := regen.PlatePack{
//		Plate: regen.PlateGeometry{ChevronAngle: 60 * math.Pi / 180, PressingDepth: 3e-3,
//			EnlargementFactor: 1.17, ChannelWidth: 0.45, PortToPortLength: 0.8,
//			Thickness: 0.6e-3, WallConductivity: 16, PortDiameter: 0.1},
//		Product: regen.SideLayout{Passes: 8, ChannelsPerPass: 7},
//		Other:   regen.SideLayout{Passes: 8, ChannelsPerPass: 7},
//		Fouling: 3e-5,
//	}
//	r, err := regen.RatePlatePack(pack,
//		regen.PackStream{Fluid: product, MassFlow: 2.86, In: 5, Out: 66},
//		regen.PackStream{Fluid: product, MassFlow: 2.86, In: 72, Out: 11})
//
// SolveWithPack couples such a rating with a section's ε–NTU calculation.

// PlateGeometry is one chevron plate. All lengths in m.
type PlateGeometry struct {
	// ChevronAngle φ is the corrugation angle measured from the main flow
	// direction, rad, 0 < φ < π/2: φ → π/2 is the high-friction,
	// high-transfer plate. Martin's correlation was fitted up to 80°.
	ChevronAngle float64
	// PressingDepth b is the mean channel gap, > 0 (typically 2–5 mm).
	PressingDepth float64
	// EnlargementFactor Φ is the developed over the projected plate area,
	// 1 ≤ Φ ≤ 2 (typically 1.1–1.25; a sinusoidal pressing as deep as its
	// pitch/π gives about 1.7 by Martin's approximation
	// Φ ≈ (1 + √(1+X²) + 4√(1+X²/2))/6, X = 2πb/pitch, from memory; above 2
	// is taken as a typo).
	EnlargementFactor float64
	ChannelWidth      float64 // w, inside the gasket, > 0
	PortToPortLength  float64 // L_p, port centre to port centre as entered, nothing subtracted, > 0
	Thickness         float64 // t, the plate's metal, > 0
	WallConductivity  float64 // k_w of the plate material, W/(m·K), > 0
	PortDiameter      float64 // d_port, > 0
}

// HydraulicDiameter is the channel's hydraulic diameter, m:
//
//	d_h = 2b/Φ
//
// (four times the flow area b·w over the wetted perimeter 2w·Φ of a channel
// much wider than deep).
//
// References: Martin (1996), Chem. Eng. Process. 35:301; VDI Heat Atlas,
// 2nd ed. (2010); docs/METHOD.md §12 (plate packs).
func (g PlateGeometry) HydraulicDiameter() float64 {
	return 2 * g.PressingDepth / g.EnlargementFactor
}

// PortArea is the cross-section of one port, π d_port²/4, m².
func (g PlateGeometry) PortArea() float64 {
	return math.Pi * g.PortDiameter * g.PortDiameter / 4
}

// SideLayout is how one side's channels are grouped: each pass has
// ChannelsPerPass channels in parallel and the passes follow each other.
type SideLayout struct {
	Passes          int // ≥ 1 (sizing: ignored, the passes are found)
	ChannelsPerPass int // ≥ 1
}

// Channels is the side's number of channels, passes × channels per pass.
func (l SideLayout) Channels() int { return l.Passes * l.ChannelsPerPass }

// PlatePack is a section's plates and the two sides' layouts. Product is the
// product side (in regeneration the raw product); Other is the medium, or in
// regeneration the pasteurized product.
type PlatePack struct {
	Plate   PlateGeometry
	Product SideLayout
	Other   SideLayout
	Fouling float64 // m²·K/W, ≥ 0: 1/U_service = 1/U_clean + fouling; 0 means a clean pack
}

// ThermalPlates is the number of plates that separate the two sides:
//
//	N_thermal = n_product + n_other − 1
//
// The channels alternate between the sides along the pack, so one plate
// stands between each neighbouring pair of channels; the two end plates
// touch a channel on one face only and transfer no heat. With the same
// layout on both sides this is 2·passes·channels − 1. Validate accepts only
// counts that can alternate, which differ by at most one.
func (p PlatePack) ThermalPlates() int {
	return p.Product.Channels() + p.Other.Channels() - 1
}

// PackField names one quantity of a plate pack in a PackValueError.
type PackField int

const (
	FieldChevronAngle PackField = iota + 1
	FieldPressingDepth
	FieldEnlargementFactor
	FieldChannelWidth
	FieldPortToPortLength
	FieldThickness
	FieldWallConductivity
	FieldPortDiameter
	FieldFouling
	FieldProductPasses
	FieldProductChannelsPerPass
	FieldOtherPasses
	FieldOtherChannelsPerPass
)

// packLimit is one field's accepted range: lo < v (lo ≤ v when loIncl),
// v < hi (v ≤ hi when hiIncl); what says it in words for messages.
type packLimit struct {
	name           string
	lo, hi         float64
	loIncl, hiIncl bool
	what           string
}

// packLimits is the one table of plate-pack fields and their ranges.
var packLimits = map[PackField]packLimit{
	FieldChevronAngle:           {"chevron angle", 0, math.Pi / 2, false, false, "above 0° and below 90° from the main flow direction"},
	FieldPressingDepth:          {"pressing depth", 0, math.Inf(1), false, false, "positive"},
	FieldEnlargementFactor:      {"enlargement factor", 1, 2, true, true, "between 1 and 2 (developed over projected area)"},
	FieldChannelWidth:           {"channel width", 0, math.Inf(1), false, false, "positive"},
	FieldPortToPortLength:       {"port-to-port length", 0, math.Inf(1), false, false, "positive"},
	FieldThickness:              {"plate thickness", 0, math.Inf(1), false, false, "positive"},
	FieldWallConductivity:       {"plate conductivity", 0, math.Inf(1), false, false, "positive"},
	FieldPortDiameter:           {"port diameter", 0, math.Inf(1), false, false, "positive"},
	FieldFouling:                {"fouling resistance", 0, math.Inf(1), true, false, "zero or positive"},
	FieldProductPasses:          {"product-side passes", 1, math.Inf(1), true, false, "a whole number of at least 1"},
	FieldProductChannelsPerPass: {"product-side channels per pass", 1, math.Inf(1), true, false, "a whole number of at least 1"},
	FieldOtherPasses:            {"other-side passes", 1, math.Inf(1), true, false, "a whole number of at least 1"},
	FieldOtherChannelsPerPass:   {"other-side channels per pass", 1, math.Inf(1), true, false, "a whole number of at least 1"},
}

func (f PackField) String() string {
	if l, ok := packLimits[f]; ok {
		return l.name
	}
	return fmt.Sprintf("PackField(%d)", int(f))
}

func (l packLimit) accepts(v float64) bool {
	aboveLo := v > l.lo || (l.loIncl && v == l.lo)
	belowHi := v < l.hi || (l.hiIncl && v == l.hi)
	return aboveLo && belowHi // false for NaN
}

// PackValueError is a plate-pack quantity outside its range. Value is in SI
// units as given (the chevron angle in rad).
type PackValueError struct {
	Field PackField
	Value float64
}

func (e *PackValueError) Error() string {
	v := fmt.Sprintf("%g", e.Value)
	if e.Field == FieldChevronAngle {
		v = fmt.Sprintf("%.4g° (%.4g rad)", e.Value*180/math.Pi, e.Value)
	}
	return fmt.Sprintf("plate pack: the %s is %s; it must be %s", e.Field, v, packLimits[e.Field].what)
}

// LayoutError is a pair of side layouts whose channels cannot alternate
// along one pack: their channel counts differ by more than one.
type LayoutError struct {
	Product, Other SideLayout
}

func (e *LayoutError) Error() string {
	return fmt.Sprintf("plate pack: the product side has %d channels (%d passes × %d) and the other side %d (%d × %d); "+
		"the channels alternate between the sides, so the counts may differ by at most one",
		e.Product.Channels(), e.Product.Passes, e.Product.ChannelsPerPass,
		e.Other.Channels(), e.Other.Passes, e.Other.ChannelsPerPass)
}

// Validate checks every field against its range and that the two layouts
// can alternate. It returns the first problem as a *PackValueError or a
// *LayoutError.
func (p PlatePack) Validate() error {
	if err := p.validateFields(true); err != nil {
		return err
	}
	if d := p.Product.Channels() - p.Other.Channels(); d > 1 || d < -1 {
		return &LayoutError{Product: p.Product, Other: p.Other}
	}
	return nil
}

type fieldValue struct {
	f PackField
	v float64
}

// validateFields checks the geometry, the fouling and the channels per pass,
// and the passes when withPasses (sizing finds them).
func (p PlatePack) validateFields(withPasses bool) error {
	g := p.Plate
	fields := []fieldValue{
		{FieldChevronAngle, g.ChevronAngle},
		{FieldPressingDepth, g.PressingDepth},
		{FieldEnlargementFactor, g.EnlargementFactor},
		{FieldChannelWidth, g.ChannelWidth},
		{FieldPortToPortLength, g.PortToPortLength},
		{FieldThickness, g.Thickness},
		{FieldWallConductivity, g.WallConductivity},
		{FieldPortDiameter, g.PortDiameter},
		{FieldFouling, p.Fouling},
		{FieldProductChannelsPerPass, float64(p.Product.ChannelsPerPass)},
		{FieldOtherChannelsPerPass, float64(p.Other.ChannelsPerPass)},
	}
	if withPasses {
		fields = append(fields,
			fieldValue{FieldProductPasses, float64(p.Product.Passes)},
			fieldValue{FieldOtherPasses, float64(p.Other.Passes)})
	}
	for _, x := range fields {
		if !packLimits[x.f].accepts(x.v) || math.IsInf(x.v, 0) {
			return &PackValueError{Field: x.f, Value: x.v}
		}
	}
	return nil
}
