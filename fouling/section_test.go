package fouling

import (
	"math"
	"testing"

	"pasval/regen"
)

// handSection is the heating section of docs/METHOD.md §6.3's check values:
// product C = 10 000 W/K (2.5 kg/s × 4000 J/(kg·K)) from 68 to 75 °C, a
// described medium of 1000 kg/m³ and 4000 J/(kg·K) at 0.01 m³/s
// (C_m = 40 000 W/K) available at 85 °C, 8 plates of 0.3 m², counterflow.
func handSection() Section {
	return Section{
		Spec: regen.MediumSpec{Surface: regen.Surface{PlateArea: 0.3, Plates: 8},
			Medium: regen.Medium{Name: "hot water", Density: 1000, SpecificHeat: 4000}, Flow: regen.Flow{Volumetric: 0.01}, Inlet: 85},
		SpecificHeat: 4000, ProductMassFlow: 2.5, ProductIn: 68, ProductOut: 75,
	}
}

func TestRateHandWorked(t *testing.T) {
	cases := []struct {
		name        string
		uClean, rf  float64
		inlet, tol  float64
		mediumOut   float64
		description string
	}{
		// docs/METHOD.md §6.3: U 4000, ε = 0.584357018273, inlet 79.978978229256 °C (computed with python3).
		{"clean", 4000, 0, 79.9789782292556, 1e-10, 79.9789782292556 - 1.75, "§6.3"},
		// U = 1/(1/4000 + 5e-5) = 3333.33: NTU 0.8, ε = 0.5229368163438396,
		// inlet 68 + 7/ε = 81.38593837959456 °C (computed with python3 from §5.2).
		{"fouled", 4000, 5e-5, 81.38593837959456, 1e-10, 81.38593837959456 - 1.75, "§5.2"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sec, err := handSection().Rate(c.uClean, c.rf)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(sec.OtherIn-c.inlet) > c.tol || math.Abs(sec.OtherOut-c.mediumOut) > c.tol {
				t.Errorf("medium %.12f → %.12f °C, want %.12f → %.12f", sec.OtherIn, sec.OtherOut, c.inlet, c.mediumOut)
			}
		})
	}
	if _, err := handSection().Rate(4000, -1/4000.0); err != ErrNoResistance {
		t.Errorf("R_f = −1/U_clean: %v, want ErrNoResistance", err)
	}
}

// TestPointInvertsTheRating: a window whose mean temperatures are those of
// a rated section gives back the U it was rated with.
func TestPointInvertsTheRating(t *testing.T) {
	s := handSection()
	for _, a := range []regen.Arrangement{regen.Counterflow, regen.Cocurrent} {
		s.Spec.Arrangement = a
		sec, err := s.Rate(4000, 5e-5)
		if err != nil {
			t.Fatal(err)
		}
		w := Window{Start: 0, End: 60, Samples: 60, Heating: 60, ProductFlowMin: 2.5, ProductFlowMax: 2.5, ProductFlowMean: 2.5,
			ProductIn: sec.ProductIn, ProductOut: sec.ProductOut, MediumIn: sec.OtherIn, MediumOut: sec.OtherOut, MediumFlow: math.NaN()}
		p, _, ok := s.point(w, false)
		want := 1 / (1/4000.0 + 5e-5) // the U of the rating
		if !ok || math.Abs(p.U-want) > 1e-9*want {
			t.Errorf("%s: U %g (ok %v), want %g", a, p.U, ok, want)
		}
		// q = 10 000 W/K × 7 K = 70 kW (by hand).
		if math.Abs(p.Duty-70000) > 1e-6 || math.Abs(p.Time-30) > 0 {
			t.Errorf("%s: duty %g W at %g s, want 70000 W at 30 s", a, p.Duty, p.Time)
		}
	}
}

func TestPointSkips(t *testing.T) {
	s := handSection()
	ok := Window{Start: 0, End: 60, Samples: 60, Heating: 60, ProductFlowMin: 2.45, ProductFlowMax: 2.55, ProductFlowMean: 2.5,
		ProductIn: 68, ProductOut: 75, MediumIn: 81, MediumOut: 79, MediumFlow: math.NaN()}
	cases := []struct {
		name string
		edit func(w *Window)
		want Skip
	}{
		{"diverted", func(w *Window) { w.Diverted = 1 }, SkipDiverted},
		// range 0.13 kg/s of 2.5: 5.2 % > 5 %.
		{"unsteady", func(w *Window) { w.ProductFlowMax = 2.58 }, SkipUnsteady},
		{"no reading", func(w *Window) { w.Heating = 0 }, SkipNoReading},
		// Medium out below product in in counterflow: ΔT₂ = 67 − 68 < 0.
		{"cross", func(w *Window) { w.MediumOut = 67 }, SkipCross},
		{"nothing heated", func(w *Window) { w.ProductOut = 68 }, SkipCross},
	}
	if _, _, good := s.point(ok, false); !good {
		t.Fatal("the steady window (range 4 %) gives no U")
	}
	for _, c := range cases {
		w := ok
		c.edit(&w)
		if _, why, good := s.point(w, false); good || why != c.want {
			t.Errorf("%s: skipped %v as %v, want %v", c.name, !good, why, c.want)
		}
	}
}

// demoPack is the SI demo's heating plate (docs/METHOD.md §12.6) with one
// pass of 5 product and 6 water channels (10 thermal plates of 0.42 m²).
func demoPack() regen.PlatePack {
	return regen.PlatePack{
		Plate: regen.PlateGeometry{ChevronAngle: 60 * math.Pi / 180, PressingDepth: 3e-3, EnlargementFactor: 1.17, ChannelWidth: 0.45,
			PortToPortLength: 0.8, Thickness: 0.6e-3, WallConductivity: 16, PortDiameter: 0.1},
		Product: regen.SideLayout{Passes: 1, ChannelsPerPass: 5},
		Other:   regen.SideLayout{Passes: 1, ChannelsPerPass: 6},
	}
}

// milk is a product of constant properties near the demo's at 70 °C.
var milk = regen.ConstantFluid{Rho: 1031, Cp: 3930, K: 0.58, Mu: 0.75e-3}

func packSection() Section {
	pack := demoPack()
	return Section{
		Spec: regen.MediumSpec{Surface: regen.Surface{PlateArea: 0.42, Plates: pack.ThermalPlates()},
			Medium: regen.Medium{Name: "water", Water: true}, Flow: regen.Flow{Volumetric: 20000 / 3.6e6}, Inlet: 77},
		Pack: &pack, ProductFluid: milk, MediumFluid: regen.WaterFluid{},
		SpecificHeat: 3930, ProductMassFlow: 10000 / 3.6e6 * 1031, ProductIn: 67.1, ProductOut: 72.8,
	}
}

// TestRateWithPackIsTheLine: with a plate pack the forecast's rating is the
// design check's (regen.Line with the pack's fouling set to R_f), to the
// pack iteration's tolerance.
func TestRateWithPackIsTheLine(t *testing.T) {
	s := packSection()
	for _, rf := range []float64{0, 3e-5, 1.2e-4} {
		got, err := s.Rate(math.NaN(), rf)
		if err != nil {
			t.Fatal(err)
		}
		pack := *s.Pack
		pack.Fouling = rf
		spec := s.Spec
		spec.Pack = &regen.SectionPack{Pack: pack, Flows: regen.PackFlows{Product: milk, Other: regen.WaterFluid{}, ProductMassFlow: s.ProductMassFlow}}
		line, err := regen.Line(regen.LineInput{ProductCapacity: s.ProductMassFlow * s.SpecificHeat, RawInlet: s.ProductIn, Setpoint: 72.5,
			HeatingOutlet: s.ProductOut, Heating: &spec})
		if err != nil {
			t.Fatal(err)
		}
		want := line.Sections[0]
		if math.Abs(got.OtherIn-want.OtherIn) > 1e-8 || math.Abs(got.U-want.U) > 1e-8*want.U {
			t.Errorf("R_f %g: inlet %.10f °C, U %.6f; the line's %.10f °C, %.6f", rf, got.OtherIn, got.U, want.OtherIn, want.U)
		}
	}
}

// TestPackCleanUPerWindow: with a pack, a window's U_clean is the pack's
// at the window's temperatures and flows, and R_f = 1/U − 1/U_clean
// recovers the fouling the window was rated with.
func TestPackCleanUPerWindow(t *testing.T) {
	s := packSection()
	const rf = 6e-5
	sec, err := s.Rate(math.NaN(), rf)
	if err != nil {
		t.Fatal(err)
	}
	w := Window{Start: 0, End: 60, Samples: 60, Heating: 60, ProductFlowMin: s.ProductMassFlow, ProductFlowMax: s.ProductMassFlow,
		ProductFlowMean: s.ProductMassFlow, ProductIn: sec.ProductIn, ProductOut: sec.ProductOut, MediumIn: sec.OtherIn, MediumOut: sec.OtherOut,
		MediumFlow: math.NaN()}
	p, why, ok := s.point(w, false)
	if !ok {
		t.Fatalf("skipped: %v", why)
	}
	if math.Abs(p.Fouling-rf) > 1e-9*rf*1e3 { // the pack iteration's 1e-10 on U, relative to 1/U ≈ 3e-4
		t.Errorf("R_f %g, want %g (the rating's)", p.Fouling, rf)
	}
	// The medium flow recorded by mass gives the same as the plant's volume
	// converted at the inlet (docs/METHOD.md §3.5).
	w.MediumFlow = sec.MediumMassFlow
	q, _, _ := s.point(w, true)
	if math.Abs(q.UClean-p.UClean) > 1e-9*p.UClean {
		t.Errorf("U_clean %g with the mass flow recorded, %g from the plant's rate", q.UClean, p.UClean)
	}
}
