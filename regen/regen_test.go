package regen

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func near(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

func TestEffectiveness(t *testing.T) {
	// Check values from docs/METHOD.md §5.2, computed from the ε–NTU relations
	// (Incropera et al. 2007, Table 11.3).
	tests := []struct {
		name    string
		a       Arrangement
		ntu, cr float64
		want    float64
	}{
		{"counterflow NTU 5 Cr 0.7", Counterflow, 5, 0.7, 0.920670368605},
		{"cocurrent NTU 5 Cr 0.7", Cocurrent, 5, 0.7, 0.5881156068417585},
		{"counterflow NTU 9 Cr 1", Counterflow, 9, 1, 0.9},
		// NTU/(1+NTU) at C_r = 1: 4.5/5.5 = 0.81818… (computed).
		{"counterflow NTU 4.5 Cr 1", Counterflow, 4.5, 1, 4.5 / 5.5},
		// C_r = 0 (one side at constant temperature): ε = 1 − e^(−NTU) for both (Incropera Eq. 11.35a).
		{"counterflow Cr 0", Counterflow, 2, 0, 1 - math.Exp(-2)},
		{"cocurrent Cr 0", Cocurrent, 2, 0, 1 - math.Exp(-2)},
		// Co-current at C_r = 1 tends to 50 % (computed: (1 − e^(−200))/2).
		{"cocurrent large NTU", Cocurrent, 100, 1, 0.5},
		{"zero NTU", Counterflow, 0, 0.5, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Effectiveness(tc.a, tc.ntu, tc.cr); !near(got, tc.want, 1e-12) {
				t.Errorf("ε = %.15g, want %.15g", got, tc.want)
			}
		})
	}
	// Continuity across the C_r = 1 special case.
	if a, b := Effectiveness(Counterflow, 3, 1-2e-9), Effectiveness(Counterflow, 3, 1); !near(a, b, 1e-8) {
		t.Errorf("discontinuity near C_r = 1: %g vs %g", a, b)
	}
}

func TestNTUInverse(t *testing.T) {
	// docs/METHOD.md §6.2: 90 % regeneration (C_r = 1) needs NTU = 0.9/0.1 = 9.
	n, err := NTU(Counterflow, 0.9, 1)
	if err != nil || !near(n, 9, 1e-12) {
		t.Fatalf("NTU(0.9, 1) = %g, %v; want 9", n, err)
	}
	// Round trip over a grid (identity of the closed forms).
	for _, a := range []Arrangement{Counterflow, Cocurrent} {
		for _, cr := range []float64{0, 0.3, 0.7, 0.999, 1} {
			for _, ntu := range []float64{0.1, 1, 3, 8} {
				eps := Effectiveness(a, ntu, cr)
				back, err := NTU(a, eps, cr)
				if err != nil || !near(back, ntu, 1e-7) {
					t.Errorf("%v Cr %g NTU %g: back %g, %v", a, cr, ntu, back, err)
				}
			}
		}
	}
}

func TestCocurrentCeiling(t *testing.T) {
	// docs/METHOD.md §5.2: a co-current section with C_r = 1 can never pass 50 %.
	for _, eps := range []float64{0.5, 0.6, 0.92} {
		_, err := NTU(Cocurrent, eps, 1)
		if !errors.Is(err, ErrInfeasible) || !strings.Contains(err.Error(), "co-current flow cannot") {
			t.Errorf("ε %g: %v", eps, err)
		}
	}
	if _, err := NTU(Cocurrent, 0.49, 1); err != nil {
		t.Errorf("ε 0.49 refused: %v", err)
	}
	if _, err := NTU(Counterflow, 1, 1); !errors.Is(err, ErrInfeasible) {
		t.Errorf("counterflow ε = 1 accepted")
	}
	_, err := Regeneration(RegenSpec{Surface: Surface{Arrangement: Cocurrent, U: 3000, PlateArea: 0.3}, Ratio: 0.5}, 1e4, 4, 72)
	if !IsInfeasible(err) || !strings.Contains(err.Error(), "50.0 %") {
		t.Errorf("co-current regenerator at 50 %%: %v", err)
	}
}

func TestLMTD(t *testing.T) {
	// Symmetry and the equal-difference limit (docs/METHOD.md §5.1, Incropera Eq. 11.15).
	a, _ := LMTD(10, 4)
	b, _ := LMTD(4, 10)
	// (10 − 4)/ln(2.5) = 6.548089… (computed).
	if !near(a, 6/math.Log(2.5), 1e-14) || !near(a, b, 1e-15) {
		t.Errorf("LMTD(10,4) = %g, LMTD(4,10) = %g", a, b)
	}
	if v, ok := LMTD(7, 7); !ok || v != 7 {
		t.Errorf("LMTD(7,7) = %g, %v; want 7 (limit)", v, ok)
	}
	// Near-equal differences: no 0/0 and continuous with the closed form.
	v1, _ := LMTD(7*(1+1e-7), 7)
	v2, _ := LMTD(7*(1+2e-6), 7)
	if !near(v1, 7*(1+0.5e-7), 1e-12) || !near(v2, 7*2e-6/math.Log1p(2e-6), 1e-9) {
		t.Errorf("near-equal LMTD: %.15g %.15g", v1, v2)
	}
	for _, d := range [][2]float64{{0, 5}, {5, 0}, {-1, 5}, {5, -1}, {math.NaN(), 1}} {
		if _, ok := LMTD(d[0], d[1]); ok {
			t.Errorf("LMTD(%g, %g) accepted a cross", d[0], d[1])
		}
	}
}

func TestRegenerationSizingAndRating(t *testing.T) {
	// docs/METHOD.md §6.2 check: raw 4 → 65 °C with pasteurized product entering at 72 °C
	// is (65 − 4)/(72 − 4) = 89.7 % regeneration (computed).
	spec := RegenSpec{Surface: Surface{U: 3000, PlateArea: 0.3}, Ratio: 61.0 / 68.0}
	sec, err := Regeneration(spec, 10000, 4, 72)
	if err != nil {
		t.Fatal(err)
	}
	if !near(sec.ProductOut, 65, 1e-12) || !near(sec.Effectiveness, 0.8970588235294118, 1e-12) {
		t.Errorf("raw out %g ε %g", sec.ProductOut, sec.Effectiveness)
	}

	// Hand-worked: C = 10 000 W/K, raw 5 °C, pasteurized in 75 °C, ratio 0.9:
	// raw out 5 + 0.9·70 = 68 °C, pasteurized out 75 − 63 = 12 °C, q = 630 kW,
	// both terminal differences 7 K so LMTD = 7 K; NTU = 0.9/0.1 = 9,
	// A = 9·10 000/3000 = 30 m² = 630 000/(3000·7); plates = 30/0.3 = 100.
	spec.Ratio = 0.9
	sec, err = Regeneration(spec, 10000, 5, 75)
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		what      string
		got, want float64
	}{
		{"raw out", sec.ProductOut, 68}, {"past out", sec.OtherOut, 12}, {"duty", sec.Duty, 630e3},
		{"LMTD", sec.LMTD, 7}, {"NTU", sec.NTU, 9}, {"area", sec.RequiredArea, 30}, {"plates", float64(sec.Plates), 100},
	}
	for _, c := range checks {
		if !near(c.got, c.want, 1e-9) {
			t.Errorf("%s = %.12g, want %g", c.what, c.got, c.want)
		}
	}
	// Rating the same 100 plates gives back ratio 0.9.
	rated, err := Regeneration(RegenSpec{Surface: Surface{U: 3000, PlateArea: 0.3, Plates: 100}}, 10000, 5, 75)
	if err != nil || !near(rated.Effectiveness, 0.9, 1e-12) || !near(rated.ProductOut, 68, 1e-12) {
		t.Errorf("rated: %+v %v", rated, err)
	}
	// Issue check: doubling plates from NTU 4.5 gives 0.818 → 0.9 (ε = NTU/(1+NTU)).
	half, _ := Regeneration(RegenSpec{Surface: Surface{U: 3000, PlateArea: 0.3, Plates: 50}}, 10000, 5, 75)
	if !near(half.Effectiveness, 4.5/5.5, 1e-12) {
		t.Errorf("50 plates: ε %g, want 0.818", half.Effectiveness)
	}
}

// fixedMedium has constant properties so that the hand calculations are exact.
var fixedMedium = Medium{Name: "test fluid", Density: 1000, SpecificHeat: 4000}

func TestHeatingSizingHandWorked(t *testing.T) {
	// Hand-worked: product C = 10 000 W/K from 68 to 75 °C → q = 70 kW.
	// Medium 0.01 m³/s × 1000 kg/m³ × 4000 J/(kg·K) = 40 000 W/K entering at 80 °C
	// leaves at 80 − 70 000/40 000 = 78.25 °C. Counterflow ΔT₁ = 5 K, ΔT₂ = 10.25 K,
	// LMTD = 5.25/ln 2.05 = 7.313609596592 K; A = 70 000/(4000·LMTD) = 2.392799310501 m²;
	// ε = 70 000/(10 000·12) = 0.583333 (computed with python3).
	spec := MediumSpec{Surface: Surface{U: 4000, PlateArea: 0.3}, Medium: fixedMedium, Flow: Flow{Volumetric: 0.01}, Inlet: 80}
	sec, err := Heating(spec, 10000, 68, 75)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"medium out", sec.OtherOut, 78.25}, {"LMTD", sec.LMTD, 7.313609596592316},
		{"area", sec.RequiredArea, 2.392799310501056}, {"ε", sec.Effectiveness, 7.0 / 12}, {"plates", float64(sec.Plates), 8},
	} {
		if !near(c.got, c.want, 1e-9) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
}

func TestHeatingRatingHandWorked(t *testing.T) {
	// Hand-worked with ε–NTU: 8 plates × 0.3 m² = 2.4 m², U 4000 → NTU = 0.96 on
	// C_min = 10 000 W/K, C_r = 0.25 → ε = 0.584357018273; the required medium inlet is
	// 68 + 70 000/(ε·10 000) = 79.978978229256 °C (computed with python3).
	spec := MediumSpec{Surface: Surface{U: 4000, PlateArea: 0.3, Plates: 8}, Medium: fixedMedium, Flow: Flow{Volumetric: 0.01}, Inlet: 85}
	sec, err := Heating(spec, 10000, 68, 75)
	if err != nil {
		t.Fatal(err)
	}
	if !near(sec.OtherIn, 79.9789782292556, 1e-9) || !near(sec.Effectiveness, 0.5843570182725839, 1e-9) {
		t.Errorf("required inlet %.12g ε %.12g", sec.OtherIn, sec.Effectiveness)
	}
	if sec.Mode != Rating || !near(sec.InstalledArea, 2.4, 1e-12) {
		t.Errorf("mode %v area %g", sec.Mode, sec.InstalledArea)
	}
}

func TestCoolingHandWorked(t *testing.T) {
	// Sizing, hand-worked: product C = 10 000 W/K from 12 to 4 °C → q = 80 kW;
	// medium C = 40 000 W/K from 1 to 3 °C; ΔT₁ = 9 K, ΔT₂ = 3 K,
	// LMTD = 6/ln 3 = 5.461435359761 K; A = 80 000/(3000·LMTD) = 4.882721282969 m².
	spec := CoolingSpec{MediumSpec: MediumSpec{Surface: Surface{U: 3000, PlateArea: 0.25}, Medium: fixedMedium, Flow: Flow{Mass: 10}, Inlet: 1}, Stage: "chilled", ProductOut: 4}
	sec, err := Cooling(spec, 10000, 12)
	if err != nil {
		t.Fatal(err)
	}
	if !near(sec.OtherOut, 3, 1e-12) || !near(sec.LMTD, 5.461435359761024, 1e-9) || !near(sec.RequiredArea, 4.882721282969376, 1e-9) || sec.Plates != 20 {
		t.Errorf("sizing: %+v", sec)
	}
	// Rating, hand-worked: 20 plates × 0.25 m² = 5 m², NTU = 1.5, C_r = 0.25,
	// ε = 0.735002637594, q = ε·10 000·11 = 80 850.290135 W, product out 3.914970986465 °C,
	// medium out 3.021257253384 °C (computed with python3).
	spec.Plates = 20
	sec, err = Cooling(spec, 10000, 12)
	if err != nil {
		t.Fatal(err)
	}
	if !near(sec.ProductOut, 3.914970986464839, 1e-9) || !near(sec.OtherOut, 3.0212572533837903, 1e-9) || !near(sec.Duty, 80850.2901353516, 1e-9) {
		t.Errorf("rating: out %.12g medium %.12g duty %.12g", sec.ProductOut, sec.OtherOut, sec.Duty)
	}
}

func TestTemperatureCross(t *testing.T) {
	// Heating medium at 74 °C cannot bring product to 75 °C: cross named with both temperatures.
	spec := MediumSpec{Surface: Surface{U: 4000, PlateArea: 0.3}, Medium: fixedMedium, Flow: Flow{Volumetric: 0.01}, Inlet: 74}
	_, err := Heating(spec, 10000, 68, 75)
	var ce *CrossError
	if !errors.As(err, &ce) || !strings.Contains(err.Error(), "heating") || !strings.Contains(err.Error(), "74.00") || !strings.Contains(err.Error(), "75.00") {
		t.Fatalf("got %v", err)
	}
	// Medium too small: it would leave below the product inlet.
	spec.Inlet, spec.Flow = 80, Flow{Mass: 0.1}
	if _, err := Heating(spec, 10000, 68, 75); !errors.As(err, &ce) {
		t.Errorf("starved medium: %v", err)
	}
	// Cooling medium warmer than the product.
	cs := CoolingSpec{MediumSpec: MediumSpec{Surface: Surface{U: 3000, PlateArea: 0.25}, Medium: fixedMedium, Flow: Flow{Mass: 10}, Inlet: 15}, Stage: "x", ProductOut: 4}
	if _, err := Cooling(cs, 10000, 12); err == nil || !strings.Contains(err.Error(), "cannot cool") {
		t.Errorf("warm coolant: %v", err)
	}
	// Sizing a cooling stage below its medium inlet is a cross.
	cs.Inlet, cs.ProductOut = 1, 0.5
	if _, err := Cooling(cs, 10000, 12); !errors.As(err, &ce) {
		t.Errorf("outlet below medium inlet: %v", err)
	}
}

func TestWaterEnergyBalance(t *testing.T) {
	// With water media (IF97 cp at the mean temperature, iterated), the product
	// and medium duties close to 1e-9 relative in every section and mode.
	water := Medium{Name: "water", Water: true}
	in := LineInput{ProductCapacity: 11245, RawInlet: 5, Setpoint: 72.5, HeatingOutlet: 72.5, OutletTarget: 4,
		Regeneration: &RegenSpec{Surface: Surface{U: 3300, PlateArea: 0.35}, Ratio: 0.92},
		Heating:      &MediumSpec{Surface: Surface{U: 3800, PlateArea: 0.35}, Medium: water, Flow: Flow{Volumetric: 20000e-3 / 3600}, Inlet: 77},
		Cooling: []CoolingSpec{
			{MediumSpec: MediumSpec{Surface: Surface{U: 3000, PlateArea: 0.35}, Medium: water, Flow: Flow{Volumetric: 25000e-3 / 3600}, Inlet: 1}, Stage: "chilled", ProductOut: math.NaN()},
		},
	}
	for _, rating := range []bool{false, true} {
		if rating {
			in.Regeneration.Plates, in.Heating.Plates, in.Cooling[0].Plates = 112, 8, 15
		}
		res, err := Line(in)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range res.Sections {
			qp := s.ProductCapacity * math.Abs(s.ProductOut-s.ProductIn)
			qo := s.OtherCapacity * math.Abs(s.OtherOut-s.OtherIn)
			if !near(qp, s.Duty, 1e-9) || !near(qo, s.Duty, 1e-9) {
				t.Errorf("%s (%v): product %.12g medium %.12g duty %.12g", s.Label(), s.Mode, qp, qo, s.Duty)
			}
			// ε from the temperatures equals ε(NTU, C_r) of the reported NTU.
			if e := Effectiveness(s.Arrangement, s.NTU, s.CapacityRatio); s.Mode == Rating && !near(e, s.Effectiveness, 1e-9) {
				t.Errorf("%s: ε %g vs ε(NTU) %g", s.Label(), s.Effectiveness, e)
			}
		}
		if !rating && !near(res.RegenerationRatio, 0.92, 1e-12) {
			t.Errorf("ratio %g", res.RegenerationRatio)
		}
		if !rating && !near(res.FinalProductOut, 4, 1e-12) {
			t.Errorf("final product %g", res.FinalProductOut)
		}
	}
}

func TestPlatesFor(t *testing.T) {
	// docs/METHOD.md §6.6: plates = ceil(area / plate area); an exact multiple does not round up.
	for _, c := range []struct {
		a, p float64
		want int
	}{{30, 0.3, 100}, {30.01, 0.3, 101}, {0.1, 0.35, 1}} {
		if got := PlatesFor(c.a, c.p); got != c.want {
			t.Errorf("PlatesFor(%g, %g) = %d, want %d", c.a, c.p, got, c.want)
		}
	}
}

func TestArrangementComparison(t *testing.T) {
	// Issue check, computed from the ε–NTU relations (Incropera Table 11.4): at a
	// regeneration ratio of 0.45 with C_r = 1, counterflow needs NTU = 0.45/0.55 =
	// 0.818182 and co-current NTU = −ln(1 − 0.9)/2 = 1.151293, so co-current needs
	// 1.151293/0.818182 = 1.407 times the area; at 0.5 co-current is impossible.
	sec, err := Regeneration(RegenSpec{Surface: Surface{U: 3000, PlateArea: 0.3}, Ratio: 0.45}, 10000, 5, 75)
	if err != nil {
		t.Fatal(err)
	}
	co, err := AreaInArrangement(sec, OtherArrangement(sec.Arrangement))
	if err != nil {
		t.Fatal(err)
	}
	if ratio := co / sec.RequiredArea; !near(ratio, math.Log(10)/2/(0.45/0.55), 1e-12) || !near(ratio, 1.407, 0.001) {
		t.Errorf("co-current/counterflow area %g, want 1.407", ratio)
	}
	same, _ := AreaInArrangement(sec, Counterflow)
	if !near(same, sec.RequiredArea, 1e-12) {
		t.Errorf("same arrangement area %g vs %g", same, sec.RequiredArea)
	}
	sec, _ = Regeneration(RegenSpec{Surface: Surface{U: 3000, PlateArea: 0.3}, Ratio: 0.5}, 10000, 5, 75)
	if _, err := AreaInArrangement(sec, Cocurrent); !IsInfeasible(err) {
		t.Errorf("co-current at 0.5: %v", err)
	}
}
