package assess

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/regen"
)

// Plate packs (docs/METHOD.md §12): the plant file's plate, product_side and
// other_side of a section become a regen.SectionPack; the line computes it;
// here its results become JSON figures, the pressure-drop check and the
// correlation's warnings.

// UDifferenceWarn is the relative difference between an entered U and the
// plate pack's clean U above which the tool warns (docs/METHOD.md §12.4).
const UDifferenceWarn = 0.30

// PackFigures are a section's plate-pack results in the JSON contract.
type PackFigures struct {
	UCleanWm2K             float64 `json:"u_clean_W_m2K"`
	UServiceWm2K           float64 `json:"u_service_W_m2K"`
	HProductWm2K           float64 `json:"h_product_W_m2K"`
	HOtherWm2K             float64 `json:"h_other_W_m2K"`
	ReynoldsProduct        float64 `json:"reynolds_product"`
	ReynoldsOther          float64 `json:"reynolds_other"`
	VelocityProductMS      float64 `json:"velocity_product_m_s"`
	VelocityOtherMS        float64 `json:"velocity_other_m_s"`
	PressureDropProductKPa float64 `json:"pressure_drop_product_kPa"`
	PressureDropOtherKPa   float64 `json:"pressure_drop_other_kPa"`
	PassesProduct          int     `json:"passes_product"`
	ChannelsPerPassProduct int     `json:"channels_per_pass_product"`
	PassesOther            int     `json:"passes_other"`
	ChannelsPerPassOther   int     `json:"channels_per_pass_other"`
}

func packFigures(r *regen.PackResult) *PackFigures {
	if r == nil {
		return nil
	}
	pr, ot := r.Rating.Product, r.Rating.Other
	return &PackFigures{
		UCleanWm2K: r.Rating.UClean, UServiceWm2K: r.Rating.UService,
		HProductWm2K: pr.H, HOtherWm2K: ot.H, ReynoldsProduct: pr.Reynolds, ReynoldsOther: ot.Reynolds,
		VelocityProductMS: pr.Velocity, VelocityOtherMS: ot.Velocity,
		PressureDropProductKPa: pr.PressureDrop / 1e3, PressureDropOtherKPa: ot.PressureDrop / 1e3,
		PassesProduct: r.Pack.Product.Passes, ChannelsPerPassProduct: r.Pack.Product.ChannelsPerPass,
		PassesOther: r.Pack.Other.Passes, ChannelsPerPassOther: r.Pack.Other.ChannelsPerPass,
	}
}

// UDifference is (u_value − U_clean)/U_clean for a section that keeps an
// entered U beside its plate pack (both before fouling), and false for any
// other section.
func (s Section) UDifference(p *plantfile.Plant) (float64, bool) {
	if s.raw.Pack == nil || !s.raw.Pack.EnteredU {
		return 0, false
	}
	_, pl := sectionPlates(p, s.raw.Label())
	if pl == nil || !pl.UValue.Set {
		return 0, false
	}
	c := s.raw.Pack.Rating.UClean
	return (pl.UValue.SI - c) / c, true
}

// enginePack is the plant file's pack in the engine's terms; passes 0 (a
// sizing pack) are kept.
func enginePack(pl plantfile.Plates) regen.PlatePack {
	pk := pl.Pack
	return regen.PlatePack{
		Plate: regen.PlateGeometry{ChevronAngle: pk.ChevronAngle.SI, PressingDepth: pk.PressingDepth.SI,
			EnlargementFactor: pk.EnlargementFactor.SI, ChannelWidth: pk.ChannelWidth.SI, PortToPortLength: pk.PortToPortLength.SI,
			Thickness: pk.Thickness.SI, WallConductivity: pk.Conductivity.SI, PortDiameter: pk.PortDiameter.SI},
		Product: regen.SideLayout{Passes: pk.Product.Passes, ChannelsPerPass: pk.Product.ChannelsPerPass},
		Other:   regen.SideLayout{Passes: pk.Other.Passes, ChannelsPerPass: pk.Other.ChannelsPerPass},
		Fouling: pl.Fouling.SI,
	}
}

// productFluid is the product as a plate pack sees it (docs/METHOD.md §12.2).
func productFluid(p *plantfile.Plant, pp ProductProps) regen.Fluid {
	pr := p.Product
	f := regen.ProductFluid{SpecificHeatValue: pp.SpecificHeat, DensityValue: pr.Density.SI, ConductivityValue: pr.Conductivity.SI}
	if c := pr.Composition; c != nil {
		comp := choiOkos(c)
		f.Composition = &comp
	}
	if pl := pr.PowerLaw; pl != nil {
		f.Consistency, f.Index = pl.Consistency.SI, pl.FlowIndex
		return f
	}
	var pts []props.ViscosityPoint
	for _, v := range pr.Viscosity {
		pts = append(pts, props.ViscosityPoint{TempC: v.At.SI, Viscosity: v.Value.SI})
	}
	curve, err := props.NewViscosityCurve(pts)
	if err != nil {
		panic(fmt.Sprintf("%sviscosity points passed validation but: %v", panicPrefix, err))
	}
	f.Curve = &curve
	return f
}

// mediumFluid is a heating or cooling medium as a plate pack sees it.
func mediumFluid(m plantfile.Medium) regen.Fluid {
	if m.Water {
		return regen.WaterFluid{}
	}
	return regen.ConstantFluid{Rho: m.Density.SI, Cp: m.SpecificHeat.SI, K: m.Conductivity.SI, Mu: m.Viscosity.SI}
}

// sectionPack is the SectionPack of a section with a plate pack (nil
// without one), its values checked against the engine's ranges first so
// that a bad value is reported at its line. other is the other side's
// fluid (nil: the product, in regeneration).
func sectionPack(p *plantfile.Plant, pp ProductProps, field string, pl plantfile.Plates, other regen.Fluid) (*regen.SectionPack, error) {
	if pl.Pack == nil {
		return nil, nil
	}
	pack := enginePack(pl)
	check := pack
	if check.Product.Passes == 0 { // sizing: the passes are found
		check.Product.Passes, check.Other.Passes = 1, 1
	}
	if err := check.Validate(); err != nil {
		if e := packInputError(field, pl, err); e != nil {
			return nil, e
		}
		return nil, err
	}
	product := productFluid(p, pp)
	flows := regen.PackFlows{Product: product, Other: other, ProductMassFlow: pp.MassFlow}
	if other == nil {
		flows.Other, flows.OtherMassFlow = product, pp.MassFlow
	}
	return &regen.SectionPack{Pack: pack, Flows: flows, EnteredU: pl.UValue.Set}, nil
}

// packInputError points an engine error about a pack's values or layout at
// the plant-file field concerned; field is the section's path. It is nil
// for any other error.
func packInputError(field string, pl plantfile.Plates, err error) inputerr.List {
	pk := pl.Pack
	var pos inputerr.Pos
	var key string
	var ve *regen.PackValueError
	var le *regen.LayoutError
	var pe *regen.PassesError
	switch {
	case errors.As(err, &ve):
		at := map[regen.PackField]struct {
			key string
			pos inputerr.Pos
		}{
			regen.FieldChevronAngle: {"plate.chevron_angle", pk.ChevronAngle.Pos}, regen.FieldPressingDepth: {"plate.pressing_depth", pk.PressingDepth.Pos},
			regen.FieldEnlargementFactor: {"plate.enlargement_factor", pk.EnlargementFactor.Pos},
			regen.FieldChannelWidth:      {"plate.channel_width", pk.ChannelWidth.Pos}, regen.FieldPortToPortLength: {"plate.port_to_port_length", pk.PortToPortLength.Pos},
			regen.FieldThickness: {"plate.thickness", pk.Thickness.Pos}, regen.FieldWallConductivity: {"plate.conductivity", pk.Conductivity.Pos},
			regen.FieldPortDiameter: {"plate.port_diameter", pk.PortDiameter.Pos}, regen.FieldFouling: {"fouling", pl.Fouling.Pos},
			regen.FieldProductPasses: {"product_side.passes", pk.Product.PassesPos}, regen.FieldProductChannelsPerPass: {"product_side.channels_per_pass", pk.Product.ChannelsPos},
			regen.FieldOtherPasses: {"other_side.passes", pk.Other.PassesPos}, regen.FieldOtherChannelsPerPass: {"other_side.channels_per_pass", pk.Other.ChannelsPos},
		}[ve.Field]
		if at.key == "" {
			panic(fmt.Sprintf("%sno plant-file field for plate-pack field %v", panicPrefix, ve.Field))
		}
		key, pos = at.key, at.pos
	case errors.As(err, &le), errors.As(err, &pe):
		key, pos = "other_side.channels_per_pass", pk.Other.ChannelsPos
	default:
		return nil
	}
	return inputerr.List{{Pos: pos, Field: field + "." + key, Msg: strings.TrimPrefix(err.Error(), "plate pack: ")}}
}

// sectionPlates finds a section of the plant by its label (regen's
// Section.Label): its path and its plates; "" and nil when there is none.
func sectionPlates(p *plantfile.Plant, label string) (string, *plantfile.Plates) {
	switch {
	case label == "regeneration" && p.Regeneration != nil:
		return "regeneration", &p.Regeneration.Plates
	case label == "heating" && p.Heating != nil:
		return "heating", &p.Heating.Plates
	}
	for i := range p.Cooling {
		if label == (regen.Section{Kind: regen.CoolingSection, Stage: p.Cooling[i].Name}).Label() {
			return fmt.Sprintf("cooling[%d]", i), &p.Cooling[i].Plates
		}
	}
	return "", nil
}

// linePacks sets each section's SectionPack in the line's input.
func linePacks(p *plantfile.Plant, pp ProductProps, in *regen.LineInput) error {
	var err error
	if r := p.Regeneration; r != nil {
		if in.Regeneration.Pack, err = sectionPack(p, pp, "regeneration", r.Plates, nil); err != nil {
			return err
		}
	}
	if h := p.Heating; h != nil {
		if in.Heating.Pack, err = sectionPack(p, pp, "heating", h.Plates, mediumFluid(h.Medium)); err != nil {
			return err
		}
	}
	for i, c := range p.Cooling {
		if in.Cooling[i].Pack, err = sectionPack(p, pp, fmt.Sprintf("cooling[%d]", i), c.Plates, mediumFluid(c.Medium)); err != nil {
			return err
		}
	}
	return nil
}

// packResults adds, for each section with a plate pack, the pressure-drop
// check (when product_side.max_pressure_drop is given) and the warnings:
// the correlation's validity, an entered U far from the computed one, and
// product viscosities held beyond the entered points.
func packResults(p *plantfile.Plant, res *Result, s Section) {
	pr := s.raw.Pack
	if pr == nil {
		return
	}
	label := s.raw.Label()
	field, pl := sectionPlates(p, label)
	if max := pl.Pack.Product.MaxPressureDrop; max.Set {
		c := NewCheck(PressureDrop, max.SI, pr.Rating.Product.PressureDrop)
		c.Section = label
		res.Checks = append(res.Checks, c)
	}
	side := func(s regen.PackSide) string {
		if s == regen.ProductSide {
			return field + ".product_side"
		}
		return field + ".other_side"
	}
	for _, w := range pr.Rating.Warnings {
		switch w.Code {
		case regen.WarnReynoldsBelowRange, regen.WarnReynoldsAboveRange:
			res.warnSection(WarnPackReynolds, label, side(w.Side),
				map[string]float64{"reynolds": w.Value, "low": regen.MartinReynoldsMin, "high": regen.MartinReynoldsMax})
		case regen.WarnNearBranchSwitch:
			res.warnSection(WarnPackBranch, label, side(w.Side),
				map[string]float64{"reynolds": w.Value, "switch": regen.MartinBranchReynolds, "low": regen.BranchBandLow, "high": regen.BranchBandHigh})
		case regen.WarnAngleAboveRange:
			res.warnSection(WarnPackAngle, label, field+".plate.chevron_angle", map[string]float64{"angle_rad": w.Value, "high_rad": regen.MartinAngleMax})
		case regen.WarnApparentViscosity:
			res.warnSection(WarnPackApparentViscosity, label, side(w.Side), map[string]float64{"flow_index": w.Value})
		default:
			panic(fmt.Sprintf("%sno warning for plate-pack warning %v", panicPrefix, w.Code))
		}
	}
	if d, ok := s.UDifference(p); ok && math.Abs(d) > UDifferenceWarn {
		res.warnSection(WarnPackUDiffers, label, field+".u_value",
			map[string]float64{"entered_W_m2K": pl.UValue.SI, "computed_clean_W_m2K": pr.Rating.UClean, "difference": d})
	}
	packViscosityRange(p, res, label, pr)
}

// packViscosityRange warns when a product stream's mean or wall temperature
// in the pack lies outside the entered viscosity points, where the nearest
// point's viscosity is held (docs/METHOD.md §4.1).
func packViscosityRange(p *plantfile.Plant, res *Result, label string, pr *regen.PackResult) {
	pts := p.Product.Viscosity
	if len(pts) == 0 {
		return
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range pts {
		lo, hi = math.Min(lo, v.At.SI), math.Max(hi, v.At.SI)
	}
	temps := []float64{pr.Rating.Product.MeanTemp, pr.Rating.Product.WallTemp}
	if label == "regeneration" { // the product on both sides
		temps = append(temps, pr.Rating.Other.MeanTemp, pr.Rating.Other.WallTemp)
	}
	worst, out := 0.0, 0.0
	for _, t := range temps {
		if d := math.Max(lo-t, t-hi); d > 1e-9 && d > out {
			worst, out = t, d
		}
	}
	if out > 0 {
		res.warnSection(WarnPackViscosityExtrapolated, label, "product.viscosity", map[string]float64{"at_C": worst, "lowest_C": lo, "highest_C": hi})
	}
}
