package lethality

import (
	"math"
	"testing"
)

// TestWaterTimedTubeConvertedToALaminarMix works the classic case by hand: a
// tube timed with water (turbulent) holding a laminar power-law mix
// (Dickerson et al. 1968, J. Dairy Sci. 51:1731, authors and title from
// memory: a tube timed at 26 s with water held ice-cream mix 21.9–23.5 s).
// The figures are the frozen-dessert demo's (docs/METHOD.md §7.8, §15.2).
func TestWaterTimedTubeConvertedToALaminarMix(t *testing.T) {
	// 2 in sanitary tube: ID 1.870 in = 0.047498 m (docs/METHOD.md §7.1), so
	// A = π·0.047498²/4 = 1.771884e-3 m²; 3300 L/h = 9.166667e-4 m³/s, v = 0.517334 m/s.
	tube := Tube{InnerDiameter: 0.047498, Length: 16.6}
	q := 3.3 / 3600
	// Water at 80 °C and 101.325 kPa, python3-iapws 1.5.2: IF97 region 1
	// ρ = 971.8028996 kg/m³ (_Region1), IAPWS 2008 μ = 354.0581487 µPa·s (_Viscosity).
	water := TimingTest{Flow: Flow{Volumetric: q, Density: 971.8028995563232},
		Fluid: Newtonian{Viscosity: 354.0581487442565e-6}, Time: 26.3}
	mix := PowerLaw{N: 0.65, K: 0.28}
	timed := tube.Timed(water)

	// By hand (computed with python3 from the formulas of docs/METHOD.md §7.4):
	//   Re   = 971.8029 × 0.517334 × 0.047498 / 354.0581e-6 = 67 445.0  (turbulent)
	//   n_p  = 0.790 ln 67 445.0 − 1.64 = 7.144064
	//   r_w  = (n_p + 1)(2 n_p + 1)/(2 n_p²) = 8.144064 × 15.288127 / 102.075581 = 1.219761
	//   V_eff = 26.3 s × 1.219761 × 9.166667e-4 m³/s = 0.02940641 m³
	//   the mix, laminar (Re_MR 424.7): r_p = (3·0.65 + 1)/(0.65 + 1) = 1.787879
	//   t_p  = V_eff / (r_p Q) = 26.3 × 1.219761 / 1.787879 = 17.94289 s
	seal := Flow{Volumetric: q, Density: 1100}
	worst := timed.Tube.WorstFlow(seal, mix, 0)
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"water Reynolds", timed.Test.Reynolds, 67445.01116084067, 1e-9},
		{"water ratio", timed.Test.FastestToMean, 1.2197612252698633, 1e-12},
		{"implied hold-up", timed.Volume, 0.02940641020588096, 1e-9},
		{"mix ratio", worst.FastestToMean, 2.95 / 1.65, 1e-14},
		{"mix fastest time", worst.MinResidence, 17.942894362910412, 1e-9},
		// The measured 26.3 s is within 0.03 % of the model's water time, 26.3065 s
		// (docs/METHOD.md §7.8), so the converted time is the model's own 17.95 s.
		{"model's water time", timed.Test.MinResidence, 26.306456550818528, 1e-9},
	} {
		if !near(c.got, c.want, c.tol) {
			t.Errorf("%s: %.12g, want %.12g", c.name, c.got, c.want)
		}
	}
	if !worst.AtSeal {
		t.Error("the mix is laminar at the seal: the seal is its worst flow")
	}
	if worst.MinResidence >= 25 {
		t.Errorf("the water test passes the 25 s row but the mix must not: %.3f s", worst.MinResidence)
	}
	// Against the measurements: the fully developed laminar profile is the
	// unfavourable case, so the converted time lies below the mix times
	// Dickerson et al. measured in a tube timed at 26 s with water (21.9–23.5 s).
	if scaled := worst.MinResidence * 26 / 26.3; !(scaled < 21.9) {
		t.Errorf("converted %.2f s is not below the measured 21.9 s", scaled)
	}
}

func TestProductTestScaledToTheWorstFlow(t *testing.T) {
	// docs/METHOD.md §7.7's worked example: ρ 1030 kg/m³, μ 5 mPa·s, 2 in tube,
	// seal 3000 L/h (Re 4601.7, r 1.318443): the worst flow is Q₄₀₀₀ = 2607.717 L/h,
	// laminar ratio 2. A product test at the seal measuring 31.00 s (the model
	// says 32.2545 s) implies V_eff = 31.00 × 1.318443 × 3000/3.6e6 = 0.03405978 m³,
	// so at the worst flow t = V_eff/(2 Q₄₀₀₀) = 23.51007 s (computed with python3).
	tube := Tube{InnerDiameter: 0.047498, Length: 20}
	prod := Newtonian{Viscosity: 0.005}
	seal := Flow{Volumetric: 3.0 / 3600, Density: 1030}
	timed := tube.Timed(TimingTest{Flow: seal, Fluid: prod, Time: 31.0})
	worst := timed.Tube.WorstFlow(seal, prod, 0)
	if worst.AtSeal || !near(worst.Volumetric*3600, 2.607717108236644, 1e-9) {
		t.Errorf("worst flow %v at seal %v", worst.Volumetric*3600, worst.AtSeal)
	}
	if !near(timed.Volume, 0.03405977938403981, 1e-9) || !near(worst.MinResidence, 23.510066601023404, 1e-9) {
		t.Errorf("V_eff %.10g, worst %.10g", timed.Volume, worst.MinResidence)
	}
	// At the seal the product test returns itself.
	if at := timed.Tube.Hydraulics(seal, prod, 0).MinResidence; !near(at, 31, 1e-12) {
		t.Errorf("at the seal %.12g, want the measured 31 s", at)
	}
}

func TestTimingTestOfTheModelReturnsTheModel(t *testing.T) {
	// A test that measures exactly what the model predicts for its fluid gives
	// back the model's own product time at the worst flow, whatever the fluid
	// and flow (V_eff = V): the conversion adds nothing of its own.
	tube := Tube{InnerDiameter: 0.0475, Length: 34}
	prod := Newtonian{Viscosity: 0.72e-3}
	seal := Flow{Volumetric: 11.0 / 3600, Density: 1031}
	model := tube.WorstFlow(seal, prod, 0).MinResidence
	for _, tc := range []struct {
		name  string
		fluid Rheology
		flow  Flow
	}{
		{"water at the seal", Newtonian{Viscosity: 0.39e-3}, Flow{Volumetric: 11.0 / 3600, Density: 976}},
		{"water at half the seal", Newtonian{Viscosity: 0.39e-3}, Flow{Volumetric: 5.5 / 3600, Density: 976}},
		{"laminar syrup at a low flow", Newtonian{Viscosity: 0.2}, Flow{Volumetric: 1.0 / 3600, Density: 1300}},
	} {
		predicted := tube.Hydraulics(tc.flow, tc.fluid, 0).MinResidence
		timed := tube.Timed(TimingTest{Flow: tc.flow, Fluid: tc.fluid, Time: predicted})
		got := timed.Tube.WorstFlow(seal, prod, 0).MinResidence
		if math.Abs(got/model-1) > 1e-12 {
			t.Errorf("%s: %.12g, want the model's %.12g", tc.name, got, model)
		}
	}
}
