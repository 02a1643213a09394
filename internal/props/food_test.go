package props

import (
	"math"
	"testing"
)

func TestChoiOkosMilk(t *testing.T) {
	// Check values from docs/METHOD.md §2.2, computed from the Choi–Okos table:
	// milk of 87.8 % water, 3.2 % protein, 3.5 % fat, 4.8 % carbohydrate,
	// 0.7 % ash at 72 °C → cp ≈ 3.913 kJ/(kg·K), ρ ≈ 1005.0 kg/m³, k ≈ 0.6207 W/(m·K).
	milk := Composition{Water: 0.878, Protein: 0.032, Fat: 0.035, Carbohydrate: 0.048, Ash: 0.007}
	if s := milk.Sum(); s < 0.9999 || s > 1.0001 {
		t.Fatalf("fractions sum to %g", s)
	}
	tests := []struct {
		what      string
		got, want float64
		tol       float64
	}{
		{"cp", milk.SpecificHeat(72), 3913, 0.6},
		{"rho", milk.Density(72), 1005.0, 0.06},
		{"k", milk.Conductivity(72), 0.6207, 0.00006},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > tc.tol {
			t.Errorf("%s = %.5f, want %.5f ± %g", tc.what, tc.got, tc.want, tc.tol)
		}
	}
	// Pure water at 20 °C (computed from the table: 4.1762 − 9.0864e-5·20 + 5.4731e-6·400
	// = 4.17657 kJ/(kg·K)), close to real water's 4.18;
	// IF97 gives 4.1848 at 1 atm, see water_test.go).
	if cp := (Composition{Water: 1}).SpecificHeat(20); math.Abs(cp-4176.57) > 0.01 {
		t.Errorf("water cp at 20 °C = %.1f", cp)
	}
}

func TestViscosityCurve(t *testing.T) {
	// ln μ linear in T (docs/METHOD.md §4.1): midway between 4 °C/2.9 mPa·s and
	// 72 °C/0.7 mPa·s the value is the geometric mean √(2.9·0.7) = 1.42478 mPa·s (computed).
	c, err := NewViscosityCurve([]ViscosityPoint{{72, 0.7e-3}, {4, 2.9e-3}})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		T    float64
		want float64
		ext  bool
	}{
		{38, math.Sqrt(2.9e-3 * 0.7e-3), false},
		{4, 2.9e-3, false},
		{72, 0.7e-3, false},
		{80, 0.7e-3, true},
		{0, 2.9e-3, true},
	}
	for _, tc := range tests {
		mu, ext := c.At(tc.T)
		if math.Abs(mu-tc.want) > 1e-12 || ext != tc.ext {
			t.Errorf("At(%g) = %g %v, want %g %v", tc.T, mu, ext, tc.want, tc.ext)
		}
	}
	if _, err := NewViscosityCurve([]ViscosityPoint{{4, 1e-3}, {4, 2e-3}}); err == nil {
		t.Error("duplicate temperature accepted")
	}
	// One rule for the same temperature (units.SameTemperature, 1e-6 K): 20.1 °C
	// and 293.25 K − 273.15 differ by 2e-14 K (computed) and are one temperature.
	if _, err := NewViscosityCurve([]ViscosityPoint{{20.1, 1.1e-3}, {293.25 - 273.15, 1e-3}}); err == nil {
		t.Error("20.1 °C and 293.25 K accepted as two temperatures")
	}
	if _, err := NewViscosityCurve([]ViscosityPoint{{20.1, 1.1e-3}, {20.1 + 2e-6, 1e-3}}); err != nil {
		t.Errorf("points 2 µK apart refused: %v", err)
	}
	if _, err := NewViscosityCurve(nil); err == nil {
		t.Error("empty curve accepted")
	}
}
