package regen

import (
	"errors"
	"strings"
	"testing"
)

// milkLike is a Newtonian product of constant density, cp and conductivity
// whose viscosity falls from 2 mPa·s at 20 °C (invented test values).
var milkLike = testFluid{rho: 1030, cp: 3900, k: 0.58, mu20: 2e-3}

func TestRateWithPackAgainstReference(t *testing.T) {
	// testdata/reference/plate-pack-water.csv, coupled-* cases: a counterflow
	// section with constant capacity rates rated from its inlets, U iterated
	// with the pack (plate_pack.py; its loop stops at 1e-12, this one at
	// 1e-10 of U): 1e-8 relative.
	cases := referenceCases(t)
	n := 0
	for name, c := range cases {
		if !strings.HasPrefix(name, "coupled-") {
			continue
		}
		n++
		t.Run(name, func(t *testing.T) {
			sec, r, err := RateWithPack(PackExchange{
				Kind: RegenerationSection, Pack: referencePack(c), PlateArea: c["plate_area"], Arrangement: Counterflow,
				Flows:           PackFlows{Product: WaterFluid{}, Other: WaterFluid{}, ProductMassFlow: c["m_p"], OtherMassFlow: c["m_o"]},
				ProductCapacity: c["C_p"], OtherCapacity: c["C_o"], ProductIn: c["tin_p"], OtherIn: c["tin_o"],
			})
			if err != nil {
				t.Fatal(err)
			}
			compareReference(t, c, r, map[string]float64{"T_out_p": sec.ProductOut, "T_out_o": sec.OtherOut, "duty": sec.Duty}, 1e-8)
			if sec.Mode != Rating || sec.Plates != referencePack(c).ThermalPlates() || !within(sec.U, r.UService, 1e-10) {
				t.Errorf("section %v with %d plates at U %g; pack U_service %g", sec.Mode, sec.Plates, sec.U, r.UService)
			}
		})
	}
	if n < 2 {
		t.Errorf("%d coupled cases in the reference file, want 2", n)
	}
}

// checkCoupled asserts that a coupled result is self-consistent: the section
// was computed with the pack's U_service, and the pack rated at the
// section's temperatures gives that U back.
func checkCoupled(t *testing.T, pack PlatePack, flows PackFlows, sec Section, r PackRating) {
	t.Helper()
	if !within(sec.U, r.UService, 1e-10) {
		t.Errorf("section U %.12g, pack U_service %.12g", sec.U, r.UService)
	}
	other := flows.OtherMassFlow
	if other == 0 {
		other = sec.MediumMassFlow
	}
	again, err := RatePlatePack(pack,
		PackStream{Fluid: flows.Product, MassFlow: flows.ProductMassFlow, In: sec.ProductIn, Out: sec.ProductOut},
		PackStream{Fluid: flows.Other, MassFlow: other, In: sec.OtherIn, Out: sec.OtherOut})
	if err != nil {
		t.Fatal(err)
	}
	if !within(again.UService, r.UService, 1e-14) || !within(again.Product.PressureDrop, r.Product.PressureDrop, 1e-14) {
		t.Errorf("re-rating at the section's temperatures: U %.12g against %.12g", again.UService, r.UService)
	}
}

func TestSolveWithPackRegeneration(t *testing.T) {
	// The regeneration section through SolveWithPack agrees with RateWithPack
	// for the same streams (two paths to one answer) and with the
	// independent reference case coupled-regenerator: water both sides,
	// C = 2.8 × 4180 W/K, 5 and 72 °C inlets, 8 × 7 channels, 0.42 m² plates.
	c := referenceCases(t)["coupled-regenerator"]
	pack := referencePack(c)
	flows := PackFlows{Product: WaterFluid{}, Other: WaterFluid{}, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	spec := RegenSpec{Surface: Surface{Arrangement: Counterflow, PlateArea: 0.42, Plates: pack.ThermalPlates()}}
	sec, r, err := SolveWithPack(pack, flows, func(u float64) (Section, error) {
		spec.U = u
		return Regeneration(spec, 2.8*4180, 5, 72)
	})
	if err != nil {
		t.Fatal(err)
	}
	checkCoupled(t, pack, flows, sec, r)
	if !within(sec.ProductOut, c["out.T_out_p"], 1e-8) || !within(r.UService, c["out.U_service"], 1e-8) {
		t.Errorf("raw out %.9g °C, U %.9g; reference %.9g, %.9g", sec.ProductOut, r.UService, c["out.T_out_p"], c["out.U_service"])
	}
}

func TestSolveWithPackMediumSections(t *testing.T) {
	pack := demoPack()
	pack.Product, pack.Other = SideLayout{4, 7}, SideLayout{4, 7}
	plates := pack.ThermalPlates()
	hotWater := Medium{Name: "hot water", Water: true}
	const c = 2.8 * 3900 // milkLike at 2.8 kg/s
	tests := []struct {
		name    string
		flows   PackFlows
		section func(u float64) (Section, error)
	}{
		// Heating, rating mode: the medium's volumetric rate is converted at
		// the required inlet, which the section finds: OtherMassFlow 0 takes
		// the section's MediumMassFlow.
		{"heating rating", PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}, func(u float64) (Section, error) {
			spec := MediumSpec{Surface: Surface{U: u, PlateArea: 0.42, Plates: plates}, Medium: hotWater,
				Flow: Flow{Volumetric: 18.0 / 3600}, Inlet: 82}
			return Heating(spec, c, 63, 72.5)
		}},
		{"heating sizing", PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}, func(u float64) (Section, error) {
			spec := MediumSpec{Surface: Surface{U: u, PlateArea: 0.42}, Medium: hotWater, Flow: Flow{Volumetric: 18.0 / 3600}, Inlet: 80}
			return Heating(spec, c, 63, 72.5)
		}},
		{"cooling rating", PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}, func(u float64) (Section, error) {
			spec := CoolingSpec{MediumSpec: MediumSpec{Surface: Surface{U: u, PlateArea: 0.42, Plates: plates},
				Medium: Medium{Name: "chilled water", Water: true}, Flow: Flow{Volumetric: 20.0 / 3600}, Inlet: 1}}
			return Cooling(spec, c, 12)
		}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sec, r, err := SolveWithPack(pack, tc.flows, tc.section)
			if err != nil {
				t.Fatal(err)
			}
			checkCoupled(t, pack, tc.flows, sec, r)
			if !(sec.MediumMassFlow > 0) {
				t.Errorf("medium mass flow %g", sec.MediumMassFlow)
			}
		})
	}
}

func TestSolveWithPackPlatesMismatch(t *testing.T) {
	// A rating section whose plates are not the pack's is a caller bug.
	defer func() {
		if r, ok := recover().(string); !ok || !strings.HasPrefix(r, panicPrefix) {
			t.Errorf("recovered %v", r)
		}
	}()
	flows := PackFlows{Product: WaterFluid{}, Other: WaterFluid{}, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	_, _, _ = SolveWithPack(demoPack(), flows, func(u float64) (Section, error) {
		return Regeneration(RegenSpec{Surface: Surface{U: u, PlateArea: 0.42, Plates: 40}}, 2.8*4180, 5, 72)
	})
}

func TestRateWithPackEqualInlets(t *testing.T) {
	flows := PackFlows{Product: WaterFluid{}, Other: WaterFluid{}, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	_, _, err := RateWithPack(PackExchange{Kind: RegenerationSection, Pack: demoPack(), PlateArea: 0.42, Flows: flows,
		ProductCapacity: 11700, OtherCapacity: 11700, ProductIn: 40, OtherIn: 40})
	var se *SectionError
	if !errors.As(err, &se) || se.Section != "regeneration" {
		t.Errorf("equal inlets: %v", err)
	}
}

func TestFewestPasses(t *testing.T) {
	pack := demoPack()
	tests := []struct {
		name           string
		product, other int // channels per pass
		area           float64
		passes         int
	}{
		// 30 m² / 0.42 m² = 71.4 → 72 plates; 7 + 7 channels per pass:
		// P = ⌈73/14⌉ = 6 → 83 plates (5 passes give 69).
		{"30 m², 7 and 7", 7, 7, 30, 6},
		// 69 plates exactly: 5 passes, 69 × 0.42 = 28.98 m².
		{"28.98 m², 7 and 7", 7, 7, 28.98, 5},
		{"no area", 7, 7, 0, 1},
		// 7 and 6 channels per pass: one pass gives 12 plates.
		{"5 m², 7 and 6", 7, 6, 5, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := pack
			p.Product.ChannelsPerPass, p.Other.ChannelsPerPass = tc.product, tc.other
			got, err := FewestPasses(p, tc.area, 0.42)
			if err != nil {
				t.Fatal(err)
			}
			if got.Product.Passes != tc.passes || got.Other.Passes != tc.passes {
				t.Errorf("passes %d and %d, want %d", got.Product.Passes, got.Other.Passes, tc.passes)
			}
			if float64(got.ThermalPlates())*0.42 < tc.area-1e-9 {
				t.Errorf("%d plates give less than %g m²", got.ThermalPlates(), tc.area)
			}
			if err := got.Validate(); err != nil {
				t.Errorf("result invalid: %v", err)
			}
		})
	}
	// 7 and 6 channels per pass cannot take two passes (14 against 12 channels).
	p := pack
	p.Other.ChannelsPerPass = 6
	var pe *PassesError
	if _, err := FewestPasses(p, 6, 0.42); !errors.As(err, &pe) || pe.PlatesNeeded != 15 || pe.Product.Passes != 2 {
		t.Errorf("unequal channels: %v", err)
	}
	// A negative area is a caller bug.
	defer func() {
		if r, ok := recover().(string); !ok || !strings.HasPrefix(r, panicPrefix) {
			t.Errorf("negative area: recovered %v", r)
		}
	}()
	_, _ = FewestPasses(pack, -1, 0.42)
}

func TestSizeWithPack(t *testing.T) {
	// Regeneration sized for a ratio of 0.9 with 7 channels per pass on
	// each side; the passes found are the fewest whose plates give the
	// required area, and the pressure drops are those of that pack.
	pack := demoPack()
	pack.Product.Passes, pack.Other.Passes = 0, 0 // found by the sizing
	flows := PackFlows{Product: milkLike, Other: milkLike, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	spec := RegenSpec{Surface: Surface{PlateArea: 0.42}, Ratio: 0.9}
	got, err := SizeWithPack(pack, 0.42, flows, func(u float64) (Section, error) {
		spec.U = u
		return Regeneration(spec, 2.8*3900, 4, 72)
	})
	if err != nil {
		t.Fatal(err)
	}
	p := got.Pack.Product.Passes
	if p < 1 || float64(got.Pack.ThermalPlates())*0.42 < got.Section.RequiredArea {
		t.Fatalf("%d passes, %d plates for %g m²", p, got.Pack.ThermalPlates(), got.Section.RequiredArea)
	}
	if fewer := 2*(p-1)*7 - 1; p > 1 && float64(fewer)*0.42 >= got.Section.RequiredArea {
		t.Errorf("%d passes would do: %d plates", p-1, fewer)
	}
	rated, err := RatePlatePack(got.Pack,
		PackStream{Fluid: milkLike, MassFlow: 2.8, In: got.Section.ProductIn, Out: got.Section.ProductOut},
		PackStream{Fluid: milkLike, MassFlow: 2.8, In: got.Section.OtherIn, Out: got.Section.OtherOut})
	if err != nil {
		t.Fatal(err)
	}
	if !within(rated.UService, got.Section.U, 1e-10) || !within(rated.Product.PressureDrop, got.Rating.Product.PressureDrop, 1e-14) ||
		!within(rated.Other.PressureDrop, got.Rating.Other.PressureDrop, 1e-14) {
		t.Errorf("sizing U %g Δp %g; the found pack rates U %g Δp %g", got.Section.U, got.Rating.Product.PressureDrop,
			rated.UService, rated.Product.PressureDrop)
	}
	// Ratio 0.9, C_r = 1: NTU = 9 (docs/METHOD.md §2), A = 9 C/U.
	if !within(got.Section.RequiredArea, 9*2.8*3900/got.Section.U, 1e-9) {
		t.Errorf("required area %g", got.Section.RequiredArea)
	}
}

// benchmarkRegenerator is the demo regenerator with a milk-like product on
// both sides, rated from its inlets: the calculation the plates what-if
// repeats for each option.
func BenchmarkRateWithPackRegenerator(b *testing.B) {
	x := PackExchange{Kind: RegenerationSection, Pack: demoPack(), PlateArea: 0.42,
		Flows:           PackFlows{Product: milkLike, Other: milkLike, ProductMassFlow: 2.8, OtherMassFlow: 2.8},
		ProductCapacity: 2.8 * 3900, OtherCapacity: 2.8 * 3900, ProductIn: 4, OtherIn: 72}
	for b.Loop() {
		if _, _, err := RateWithPack(x); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSolveWithPackRegenerationWater(b *testing.B) {
	pack := demoPack()
	flows := PackFlows{Product: WaterFluid{}, Other: WaterFluid{}, ProductMassFlow: 2.8, OtherMassFlow: 2.8}
	spec := RegenSpec{Surface: Surface{PlateArea: 0.42, Plates: pack.ThermalPlates()}}
	for b.Loop() {
		if _, _, err := SolveWithPack(pack, flows, func(u float64) (Section, error) {
			spec.U = u
			return Regeneration(spec, 2.8*4180, 5, 72)
		}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSolveWithPackHeatingRating(b *testing.B) {
	pack := demoPack()
	pack.Product, pack.Other = SideLayout{4, 7}, SideLayout{4, 7}
	flows := PackFlows{Product: milkLike, Other: WaterFluid{}, ProductMassFlow: 2.8}
	spec := MediumSpec{Surface: Surface{PlateArea: 0.42, Plates: pack.ThermalPlates()},
		Medium: Medium{Name: "hot water", Water: true}, Flow: Flow{Volumetric: 18.0 / 3600}, Inlet: 82}
	for b.Loop() {
		if _, _, err := SolveWithPack(pack, flows, func(u float64) (Section, error) {
			spec.U = u
			return Heating(spec, 2.8*3900, 63, 72.5)
		}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkRatePlatePackWater(b *testing.B) {
	p, o := regeneratorStreams()
	pack := demoPack()
	for b.Loop() {
		if _, err := RatePlatePack(pack, p, o); err != nil {
			b.Fatal(err)
		}
	}
}
