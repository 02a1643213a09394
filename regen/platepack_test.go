package regen

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// referenceCases reads testdata/reference/plate-pack-water.csv (written by
// plate_pack.py: an independent Python implementation of the relations in
// docs/METHOD.md §12 with python3-iapws water) into case → key → value.
func referenceCases(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	header, rows := readReference(t, "plate-pack-water.csv")
	if strings.Join(header, ",") != "case,key,value" {
		t.Fatalf("header %q", header)
	}
	cases := map[string]map[string]float64{}
	for _, row := range rows {
		if cases[row[0]] == nil {
			cases[row[0]] = map[string]float64{}
		}
		cases[row[0]][row[1]] = parseFloat(t, row[2])
	}
	return cases
}

// referencePack builds the pack a reference case describes.
func referencePack(c map[string]float64) PlatePack {
	return PlatePack{
		Plate: PlateGeometry{
			ChevronAngle: c["phi_deg"] * deg, PressingDepth: c["b_mm"] / 1000, EnlargementFactor: c["Phi"],
			ChannelWidth: c["w_m"], PortToPortLength: c["Lp_m"], Thickness: c["t_mm"] / 1000,
			WallConductivity: c["kw"], PortDiameter: c["dport_mm"] / 1000,
		},
		Product: SideLayout{int(c["passes_p"]), int(c["cpp_p"])},
		Other:   SideLayout{int(c["passes_o"]), int(c["cpp_o"])},
		Fouling: c["fouling"],
	}
}

// compareReference checks every "out." key of a reference case that the
// rating reports, relative tolerance tol.
func compareReference(t *testing.T, c map[string]float64, r PackRating, extra map[string]float64, tol float64) {
	t.Helper()
	got := map[string]float64{"U_clean": r.UClean, "U_service": r.UService}
	for _, s := range []struct {
		tag string
		s   SideRating
	}{{"p", r.Product}, {"o", r.Other}} {
		got["v_"+s.tag], got["Re_"+s.tag], got["Pr_"+s.tag] = s.s.Velocity, s.s.Reynolds, s.s.Prandtl
		got["xi_"+s.tag], got["Nu_"+s.tag], got["h_"+s.tag] = s.s.Darcy, s.s.Nusselt, s.s.H
		got["Tw_"+s.tag], got["dp_"+s.tag] = s.s.WallTemp, s.s.PressureDrop
	}
	for k, v := range extra {
		got[k] = v
	}
	n := 0
	for key, want := range c {
		name, ok := strings.CutPrefix(key, "out.")
		if !ok {
			continue
		}
		g, ok := got[name]
		if !ok {
			t.Errorf("reference key %s has no counterpart", key)
			continue
		}
		n++
		if !within(g, want, tol) {
			t.Errorf("%s = %.10g, reference %.10g (relative %.2g)", name, g, want, g/want-1)
		}
	}
	if n < 18 {
		t.Errorf("only %d reference values compared", n)
	}
}

func TestRatePlatePackAgainstReference(t *testing.T) {
	// Same relations and the same water formulations on both sides; the
	// Python wall iteration stops at 1e-13, this one at 1e-12: 1e-9 relative.
	cases := referenceCases(t)
	n := 0
	for name, c := range cases {
		if !strings.HasPrefix(name, "pack-") {
			continue
		}
		n++
		t.Run(name, func(t *testing.T) {
			r, err := RatePlatePack(referencePack(c),
				PackStream{Fluid: WaterFluid{}, MassFlow: c["m_p"], In: c["tin_p"], Out: c["tout_p"]},
				PackStream{Fluid: WaterFluid{}, MassFlow: c["m_o"], In: c["tin_o"], Out: c["tout_o"]})
			if err != nil {
				t.Fatal(err)
			}
			compareReference(t, c, r, nil, 1e-9)
		})
	}
	if n < 4 {
		t.Errorf("%d pack cases in the reference file, want 4", n)
	}
}

func regeneratorStreams() (PackStream, PackStream) {
	return PackStream{Fluid: WaterFluid{}, MassFlow: 2.8, In: 5, Out: 66},
		PackStream{Fluid: WaterFluid{}, MassFlow: 2.8, In: 72, Out: 11}
}

func TestWallTemperatureHeatFlux(t *testing.T) {
	// The wall temperatures come from the clean resistances, so the same
	// heat flux crosses each of them (an identity the split must satisfy):
	// h_p (T_w,p − T̄_p) = (k_w/t)(T_w,o − T_w,p) = h_o (T̄_o − T_w,o) = U_clean (T̄_o − T̄_p).
	for _, fouling := range []float64{0, 3e-4} {
		pack := demoPack()
		pack.Fouling = fouling
		p, o := regeneratorStreams()
		r, err := RatePlatePack(pack, p, o)
		if err != nil {
			t.Fatal(err)
		}
		g := pack.Plate
		flux := r.UClean * (r.Other.MeanTemp - r.Product.MeanTemp)
		for _, c := range []struct {
			what string
			got  float64
		}{
			{"product film", r.Product.H * (r.Product.WallTemp - r.Product.MeanTemp)},
			{"plate", g.WallConductivity / g.Thickness * (r.Other.WallTemp - r.Product.WallTemp)},
			{"other film", r.Other.H * (r.Other.MeanTemp - r.Other.WallTemp)},
		} {
			if !within(c.got, flux, 1e-12) {
				t.Errorf("fouling %g: %s flux %.9g W/m², U_clean ΔT %.9g", fouling, c.what, c.got, flux)
			}
		}
		// Fouling does not enter the split: the wall temperatures are the same.
		if fouling > 0 {
			ref := demoPack()
			ref.Fouling = 0
			r0, _ := RatePlatePack(ref, p, o)
			if !within(r.Product.WallTemp, r0.Product.WallTemp, 1e-14) {
				t.Errorf("fouling moved the wall: %g against %g", r.Product.WallTemp, r0.Product.WallTemp)
			}
		}
		if !within(r.UService, 1/(1/r.UClean+fouling), 1e-14) {
			t.Errorf("U_service %g", r.UService)
		}
	}
}

// testFluid is a fluid of constant density, cp and k whose viscosity is
// μ₂₀ exp(−(T − 20)/30), or a power law K γ̇^(n−1) when n ≠ 1.
type testFluid struct {
	rho, cp, k float64
	mu20       float64 // Pa·s at 20 °C (Newtonian)
	K, n       float64 // power law when n ≠ 1
}

func (f testFluid) Density(float64) (float64, error)      { return f.rho, nil }
func (f testFluid) SpecificHeat(float64) (float64, error) { return f.cp, nil }
func (f testFluid) Conductivity(float64) (float64, error) { return f.k, nil }
func (f testFluid) FlowIndex() float64 {
	if f.n == 0 {
		return 1
	}
	return f.n
}
func (f testFluid) Viscosity(tempC, shear float64) (float64, error) {
	if f.FlowIndex() != 1 {
		return PowerLawViscosity(f.K, f.n, shear), nil
	}
	return f.mu20 * math.Exp(-(tempC-20)/30), nil
}

func TestPowerLawSide(t *testing.T) {
	// A shear-thinning product, n = 0.5, K = 0.4 Pa·s^0.5, ρ 1050, 2 kg/s in
	// 7 channels: v = 2/(7 × 1050 × 0.003 × 0.45) = 0.201562 m/s;
	// γ̇_w = (2·0.5 + 1)/(3·0.5) × 6 × 0.201562/0.003 = 4/3 × 403.124 = 537.499 1/s;
	// μ_app = 0.4 × 537.499^(−0.5) = 0.4/23.1840 = 0.0172533 Pa·s (computed).
	product := testFluid{rho: 1050, cp: 3600, k: 0.5, K: 0.4, n: 0.5}
	r, err := RatePlatePack(demoPack(),
		PackStream{Fluid: product, MassFlow: 2, In: 40, Out: 60},
		PackStream{Fluid: WaterFluid{}, MassFlow: 3, In: 80, Out: 67})
	if err != nil {
		t.Fatal(err)
	}
	s := r.Product
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"v", s.Velocity, 2 / (7 * 1050 * 0.003 * 0.45)},
		{"γ̇_w", s.ShearRate, 4.0 / 3 * 6 * 2 / (7 * 1050 * 0.003 * 0.45) / 0.003},
		{"μ_app", s.Viscosity, 0.4 / math.Sqrt(4.0/3*6*2/(7*1050*0.003*0.45)/0.003)},
		{"Re", s.Reynolds, 1050 * s.Velocity * demoPlate.HydraulicDiameter() / s.Viscosity},
		// K does not depend on temperature here, so μ_w = μ.
		{"μ_w", s.WallViscosity, s.Viscosity},
	} {
		if !within(c.got, c.want, 1e-12) {
			t.Errorf("%s = %.9g, want %.9g", c.what, c.got, c.want)
		}
	}
	if !within(s.Viscosity, 0.0172533, 3e-6) {
		t.Errorf("μ_app = %.7f, hand value 0.0172533", s.Viscosity)
	}
	if !slices.ContainsFunc(r.Warnings, func(w PlateWarning) bool {
		return w.Code == WarnApparentViscosity && w.Side == ProductSide && w.Value == 0.5
	}) {
		t.Errorf("no apparent-viscosity warning: %v", r.Warnings)
	}
}

func TestWallViscosityCorrection(t *testing.T) {
	// A product heated by hotter water has a hotter, thinner wall layer:
	// μ/μ_w > 1 raises Nu by (μ/μ_w)^(1/6); the same product cooled has
	// μ/μ_w < 1. Checked against NusseltMartin with the reported ratio.
	product := testFluid{rho: 1030, cp: 3900, k: 0.55, mu20: 3e-3}
	pack := demoPack()
	heated, err := RatePlatePack(pack,
		PackStream{Fluid: product, MassFlow: 2.8, In: 30, Out: 50},
		PackStream{Fluid: WaterFluid{}, MassFlow: 4, In: 85, Out: 70})
	if err != nil {
		t.Fatal(err)
	}
	cooled, err := RatePlatePack(pack,
		PackStream{Fluid: product, MassFlow: 2.8, In: 50, Out: 30},
		PackStream{Fluid: WaterFluid{}, MassFlow: 4, In: 2, Out: 17})
	if err != nil {
		t.Fatal(err)
	}
	if !(heated.Product.Viscosity/heated.Product.WallViscosity > 1) || !(cooled.Product.Viscosity/cooled.Product.WallViscosity < 1) {
		t.Errorf("viscosity ratios: heated %g, cooled %g", heated.Product.Viscosity/heated.Product.WallViscosity,
			cooled.Product.Viscosity/cooled.Product.WallViscosity)
	}
	for _, r := range []PackRating{heated, cooled} {
		s := r.Product
		want := NusseltMartin(s.Reynolds, s.Prandtl, s.Darcy, pack.Plate.ChevronAngle, s.Viscosity/s.WallViscosity)
		if !within(s.Nusselt, want, 1e-14) {
			t.Errorf("Nu %g, want %g", s.Nusselt, want)
		}
		// The wall viscosity is the fluid's at the reported wall temperature (converged).
		mu, _ := product.Viscosity(s.WallTemp, s.ShearRate)
		if !within(s.WallViscosity, mu, 1e-11) {
			t.Errorf("μ_w %g, μ(T_w) %g", s.WallViscosity, mu)
		}
	}
}

func TestPackWarnings(t *testing.T) {
	water := WaterFluid{}
	tests := []struct {
		name string
		pack func() PlatePack
		mass float64 // kg/s on both sides, 60 → 40 against 20 → 40 °C
		want []PlateWarning
	}{
		{"in range", demoPack, 4.5, nil},
		{"laminar", demoPack, 0.2, []PlateWarning{{WarnReynoldsBelowRange, ProductSide, 0}, {WarnReynoldsBelowRange, OtherSide, 0}}},
		{"near the switch", demoPack, 2.35, []PlateWarning{{WarnNearBranchSwitch, ProductSide, 0}, {WarnNearBranchSwitch, OtherSide, 0}}},
		{"above range", demoPack, 25, []PlateWarning{{WarnReynoldsAboveRange, ProductSide, 0}, {WarnReynoldsAboveRange, OtherSide, 0}}},
		{"angle 85°", func() PlatePack { p := demoPack(); p.Plate.ChevronAngle = 85 * deg; return p }, 4.5,
			[]PlateWarning{{WarnAngleAboveRange, WholePack, 85 * deg}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, err := RatePlatePack(tc.pack(),
				PackStream{Fluid: water, MassFlow: tc.mass, In: 20, Out: 40},
				PackStream{Fluid: water, MassFlow: tc.mass, In: 60, Out: 40})
			if err != nil {
				t.Fatal(err)
			}
			if len(r.Warnings) != len(tc.want) {
				t.Fatalf("warnings %v (Re %.0f and %.0f), want %v", r.Warnings, r.Product.Reynolds, r.Other.Reynolds, tc.want)
			}
			for i, w := range tc.want {
				got := r.Warnings[i]
				value := w.Value
				switch w.Code {
				case WarnReynoldsBelowRange, WarnReynoldsAboveRange, WarnNearBranchSwitch:
					value = map[PackSide]float64{ProductSide: r.Product.Reynolds, OtherSide: r.Other.Reynolds}[w.Side]
				}
				if got.Code != w.Code || got.Side != w.Side || !within(got.Value, value, 1e-15) {
					t.Errorf("warning %d: %v %v %g, want %v %v %g", i, got.Code, got.Side, got.Value, w.Code, w.Side, value)
				}
			}
		})
	}
}

func TestLayoutLevers(t *testing.T) {
	// The physics the plate pack exists for: more channels per pass slow
	// each channel, lowering U and the pressure drop; more passes keep the
	// channel velocity, so U, and raise the pressure drop in proportion.
	p, o := regeneratorStreams()
	base, err := RatePlatePack(demoPack(), p, o)
	if err != nil {
		t.Fatal(err)
	}
	wider := demoPack()
	wider.Product.ChannelsPerPass, wider.Other.ChannelsPerPass = 9, 9
	w, err := RatePlatePack(wider, p, o)
	if err != nil {
		t.Fatal(err)
	}
	if !(w.UService < base.UService) || !(w.Product.PressureDrop < base.Product.PressureDrop) {
		t.Errorf("9 channels per pass: U %g (7: %g), Δp %g (7: %g)", w.UService, base.UService, w.Product.PressureDrop, base.Product.PressureDrop)
	}
	longer := demoPack()
	longer.Product.Passes, longer.Other.Passes = 10, 10
	l, err := RatePlatePack(longer, p, o)
	if err != nil {
		t.Fatal(err)
	}
	if !within(l.UService, base.UService, 1e-14) || !within(l.Product.PressureDrop, base.Product.PressureDrop*10/8, 1e-12) {
		t.Errorf("10 passes: U %g (8: %g), Δp %g (8: %g)", l.UService, base.UService, l.Product.PressureDrop, base.Product.PressureDrop)
	}
}

func TestRatePlatePackErrors(t *testing.T) {
	p, o := regeneratorStreams()
	bad := demoPack()
	bad.Plate.PressingDepth = 0
	var ve *PackValueError
	if _, err := RatePlatePack(bad, p, o); !errors.As(err, &ve) || ve.Field != FieldPressingDepth {
		t.Errorf("invalid pack: %v", err)
	}
	// A property out of range is returned, not hidden: water at −15 °C.
	p.In, p.Out = -20, -10
	if _, err := RatePlatePack(demoPack(), p, o); err == nil || !strings.Contains(err.Error(), "IAPWS-IF97") {
		t.Errorf("ice accepted: %v", err)
	}
	defer func() {
		if r, ok := recover().(string); !ok || !strings.HasPrefix(r, panicPrefix) {
			t.Errorf("zero mass flow: recovered %v", r)
		}
	}()
	o.MassFlow = 0
	_, _ = RatePlatePack(demoPack(), PackStream{Fluid: WaterFluid{}, MassFlow: 1, In: 5, Out: 6}, o)
}
