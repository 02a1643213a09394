package regen

import (
	"errors"
	"math"
	"testing"

	"pasval/internal/props"
)

// packLine is a line of regeneration, heating and one cooling stage whose
// sections all have plate packs: milk-like product at 2.8 kg/s, water media.
func packLine(regenPack, heatPack, coolPack *SectionPack, regen RegenSpec) LineInput {
	const c = 2.8 * 3900
	heat := MediumSpec{Surface: Surface{PlateArea: 0.42}, Medium: Medium{Name: "hot water", Water: true},
		Flow: Flow{Volumetric: 18.0 / 3600}, Inlet: 80, Pack: heatPack}
	cool := CoolingSpec{MediumSpec: MediumSpec{Surface: Surface{PlateArea: 0.42}, Medium: Medium{Name: "chilled water", Water: true},
		Flow: Flow{Volumetric: 20.0 / 3600}, Inlet: 1, Pack: coolPack}, Stage: "chilled water", ProductOut: math.NaN()}
	regen.Pack = regenPack
	return LineInput{ProductCapacity: c, RawInlet: 4, Setpoint: 72, HeatingOutlet: 72, OutletTarget: 4,
		Regeneration: &regen, Heating: &heat, Cooling: []CoolingSpec{cool}}
}

func TestLineWithPacks(t *testing.T) {
	// Every section takes its U from its pack. The line's regenerator
	// (rating, 8 × 7 channels a side = 111 plates) is the one SolveWithPack
	// computes alone (two paths to one answer, 1e-12); the heating and
	// cooling stages are sized, so their passes are the fewest that give
	// the required area (FewestPasses), with the plates that pack has.
	product := PackFlows{Product: milkLike, Other: milkLike, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	medium := PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}
	sized := demoPack()
	sized.Product.Passes, sized.Other.Passes = 0, 0
	pack := demoPack()
	in := packLine(&SectionPack{Pack: pack, Flows: product}, &SectionPack{Pack: sized, Flows: medium}, &SectionPack{Pack: sized, Flows: medium},
		RegenSpec{Surface: Surface{PlateArea: 0.42, Plates: pack.ThermalPlates()}})
	res, err := Line(in)
	if err != nil {
		t.Fatal(err)
	}
	alone, rating, err := SolveWithPack(pack, product, func(u float64) (Section, error) {
		return Regeneration(RegenSpec{Surface: Surface{U: u, PlateArea: 0.42, Plates: 111}}, 2.8*3900, 4, 72)
	})
	if err != nil {
		t.Fatal(err)
	}
	rg := res.Sections[0]
	if rg.Pack == nil || rg.Pack.EnteredU || !within(rg.U, alone.U, 1e-12) || !within(rg.ProductOut, alone.ProductOut, 1e-12) ||
		!within(rg.Pack.Rating.Product.PressureDrop, rating.Product.PressureDrop, 1e-12) {
		t.Errorf("line regenerator U %g, raw out %g; alone U %g, raw out %g", rg.U, rg.ProductOut, alone.U, alone.ProductOut)
	}
	for _, s := range res.Sections[1:] {
		t.Run(s.Label(), func(t *testing.T) {
			if s.Mode != Sizing || s.Pack == nil {
				t.Fatalf("mode %v, pack %v", s.Mode, s.Pack)
			}
			p := s.Pack.Pack
			if p.Product.Passes < 1 || p.Product.Passes != p.Other.Passes {
				t.Fatalf("passes %d and %d", p.Product.Passes, p.Other.Passes)
			}
			// The plates reported are the found pack's, which cover the
			// required area, and one pass fewer would not.
			if s.Plates != p.ThermalPlates() || !within(s.InstalledArea, float64(s.Plates)*0.42, 1e-15) || s.InstalledArea < s.RequiredArea {
				t.Errorf("%d plates (%g m²) for %g m², pack %d plates", s.Plates, s.InstalledArea, s.RequiredArea, p.ThermalPlates())
			}
			if fewer := 2*(p.Product.Passes-1)*7 - 1; p.Product.Passes > 1 && float64(fewer)*0.42 >= s.RequiredArea {
				t.Errorf("%d passes would do", p.Product.Passes-1)
			}
			if !within(s.U, s.Pack.Rating.UService, 1e-10) || !(s.Pack.Rating.Product.PressureDrop > 0) {
				t.Errorf("U %g, pack U_service %g, Δp %g", s.U, s.Pack.Rating.UService, s.Pack.Rating.Product.PressureDrop)
			}
		})
	}
}

func TestLineWithPackEnteredU(t *testing.T) {
	// An entered U is kept: the section is the one computed without a pack,
	// and the pack is rated at that section's temperatures beside it.
	product := PackFlows{Product: milkLike, Other: milkLike, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	medium := PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}
	pack, sized := demoPack(), demoPack()
	sized.Product.Passes, sized.Other.Passes = 0, 0
	withU := func(s Surface) Surface { s.U = 3300; return s }
	in := packLine(&SectionPack{Pack: pack, Flows: product, EnteredU: true}, &SectionPack{Pack: sized, Flows: medium, EnteredU: true}, nil,
		RegenSpec{Surface: Surface{PlateArea: 0.42, Plates: 111}})
	in.Regeneration.Surface = withU(in.Regeneration.Surface)
	in.Heating.Surface = withU(in.Heating.Surface)
	in.Cooling[0].Surface = withU(in.Cooling[0].Surface)
	res, err := Line(in)
	if err != nil {
		t.Fatal(err)
	}
	plain := in
	r, h := *in.Regeneration, *in.Heating
	r.Pack, h.Pack = nil, nil
	plain.Regeneration, plain.Heating = &r, &h
	want, err := Line(plain)
	if err != nil {
		t.Fatal(err)
	}
	for i, s := range res.Sections[:2] {
		w := want.Sections[i]
		if !within(s.U, 3300, 1e-15) || !within(s.ProductOut, w.ProductOut, 1e-15) || !within(s.Duty, w.Duty, 1e-15) {
			t.Errorf("%s: U %g, product out %g; without the pack %g, %g", s.Label(), s.U, s.ProductOut, w.U, w.ProductOut)
		}
		if s.Pack == nil || !s.Pack.EnteredU {
			t.Fatalf("%s: pack %+v", s.Label(), s.Pack)
		}
		p, o := (&SectionPack{Flows: []PackFlows{product, medium}[i]}).streams(s)
		again, err := RatePlatePack(s.Pack.Pack, p, o)
		if err != nil {
			t.Fatal(err)
		}
		if !within(again.UService, s.Pack.Rating.UService, 1e-14) || math.Abs(again.UService-3300) < 1 {
			t.Errorf("%s: pack U %g, re-rated %g", s.Label(), s.Pack.Rating.UService, again.UService)
		}
	}
	// The sized heating section with an entered U still finds its passes.
	if h := res.Sections[1]; h.Pack.Pack.Product.Passes < 1 || h.Plates != h.Pack.Pack.ThermalPlates() {
		t.Errorf("heating: %d passes, %d plates", h.Pack.Pack.Product.Passes, h.Plates)
	}
	if res.Sections[2].Pack != nil {
		t.Error("a section without a pack has a pack result")
	}
}

func TestLineWithPackErrors(t *testing.T) {
	// An invalid pack comes back as a *PackError naming the section, with
	// the engine's typed error inside, in either mode.
	product := PackFlows{Product: milkLike, Other: milkLike, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	bad := demoPack()
	bad.Plate.EnlargementFactor = 2.5
	uneven := demoPack()
	uneven.Other.ChannelsPerPass = 6
	uneven.Product.Passes, uneven.Other.Passes = 0, 0
	tests := []struct {
		name    string
		pack    PlatePack
		spec    RegenSpec
		entered bool
		check   func(error) bool
	}{
		{"rating, Φ 2.5", bad, RegenSpec{Surface: Surface{PlateArea: 0.42, Plates: 111}}, false, func(err error) bool {
			var ve *PackValueError
			return errors.As(err, &ve) && ve.Field == FieldEnlargementFactor
		}},
		{"entered U, Φ 2.5", bad, RegenSpec{Surface: Surface{U: 3300, PlateArea: 0.42, Plates: 111}}, true, func(err error) bool {
			var ve *PackValueError
			return errors.As(err, &ve)
		}},
		// 7 and 6 channels per pass at ratio 0.9 need several passes, whose
		// channel counts drift apart (FewestPasses).
		{"sizing, 7 and 6 channels", uneven, RegenSpec{Surface: Surface{PlateArea: 0.42}, Ratio: 0.9}, false, func(err error) bool {
			var pe *PassesError
			return errors.As(err, &pe)
		}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			in := packLine(&SectionPack{Pack: tc.pack, Flows: product, EnteredU: tc.entered}, nil, nil, tc.spec)
			in.Heating, in.Cooling = nil, nil
			_, err := Line(in)
			var pe *PackError
			if !errors.As(err, &pe) || pe.Section != "regeneration" || !tc.check(err) {
				t.Errorf("got %v", err)
			}
		})
	}
}

func TestProductFluid(t *testing.T) {
	// Choi–Okos at 72 °C for milk of 87.8 % water, 3.2 % protein, 3.5 % fat,
	// 4.8 % carbohydrate, 0.7 % ash: ρ ≈ 1005.0 kg/m³, k ≈ 0.6207 W/(m·K)
	// (docs/METHOD.md §2.2 check values, computed from the table).
	milk := props.Composition{Water: 0.878, Protein: 0.032, Fat: 0.035, Carbohydrate: 0.048, Ash: 0.007}
	curve, err := props.NewViscosityCurve([]props.ViscosityPoint{{TempC: 4, Viscosity: 2.9e-3}, {TempC: 72, Viscosity: 0.7e-3}})
	if err != nil {
		t.Fatal(err)
	}
	f := ProductFluid{Composition: &milk, SpecificHeatValue: 3930, Curve: &curve}
	rho, _ := f.Density(72)
	k, _ := f.Conductivity(72)
	cp, _ := f.SpecificHeat(10)
	// ln μ linear between the points: √(2.9 × 0.7) mPa·s at 38 °C
	// (docs/METHOD.md §4.1 check value, computed).
	mu, _ := f.Viscosity(38, 1e4)
	if math.Abs(rho-1005.0) > 0.05 || math.Abs(k-0.6207) > 5e-5 || cp != 3930 || !within(mu, 1.42478e-3, 1e-5) || f.FlowIndex() != 1 {
		t.Errorf("ρ %g, k %g, cp %g, μ %g", rho, k, cp, mu)
	}
	// Entered values win over the composition.
	f.DensityValue, f.ConductivityValue = 1031, 0.58
	rho, _ = f.Density(72)
	k, _ = f.Conductivity(72)
	if rho != 1031 || k != 0.58 {
		t.Errorf("entered: ρ %g, k %g", rho, k)
	}
	// A power law: μ_app = K γ̇^(n−1) = 0.4 × 537.499^(−0.5) = 0.0172533 Pa·s
	// (the TestPowerLawSide case, computed), the same at every temperature.
	pl := ProductFluid{DensityValue: 1050, SpecificHeatValue: 3600, ConductivityValue: 0.5, Consistency: 0.4, Index: 0.5}
	a, _ := pl.Viscosity(10, 537.499)
	b, _ := pl.Viscosity(80, 537.499)
	if !within(a, 0.0172533, 1e-5) || a != b || pl.FlowIndex() != 0.5 {
		t.Errorf("power law: %g and %g, n %g", a, b, pl.FlowIndex())
	}
	c := ConstantFluid{Rho: 1040, Cp: 3700, K: 0.45, Mu: 4e-3}
	r, _ := c.Density(0)
	m, _ := c.Viscosity(90, 1)
	if r != 1040 || m != 4e-3 || c.FlowIndex() != 1 {
		t.Errorf("constant fluid: %g, %g", r, m)
	}
}
