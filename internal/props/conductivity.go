package props

import "math"

// IAPWS 2011 thermal-conductivity constants (IAPWS R15-11, Eqs. 16–17,
// Tables 1–2): reference values T* = 647.096 K, ρ* = 322 kg/m³,
// λ* = 1 mW/(m·K); Lₖ of the dilute-gas term and Lᵢⱼ (i = 0…4, j = 0…5) of
// the residual term.
var (
	condL0 = [5]float64{2.443221e-3, 1.323095e-2, 6.770357e-3, -3.454586e-3, 4.096266e-4}
	condL1 = [5][6]float64{
		{1.60397357, -0.646013523, 0.111443906, 0.102997357, -0.0504123634, 0.00609859258},
		{2.33771842, -2.78843778, 1.53616167, -0.463045512, 0.0832827019, -0.00719201245},
		{2.19650529, -4.54580785, 3.55777244, -1.40944978, 0.275418278, -0.0205938816},
		{-1.21051378, 1.60812989, -0.621178141, 0.0716373224, 0, 0},
		{-2.7203370, 4.57586331, -3.18369245, 1.1168348, -0.19268305, 0.012913842},
	}
)

// ConductivityIAPWS2011 is the thermal conductivity of water, W/(m·K),
// without the critical enhancement:
//
//	λ/λ* = λ̄₀(T̄) · λ̄₁(T̄, ρ̄),  T̄ = T/647.096 K,  ρ̄ = ρ/322 kg/m³,  λ* = 1 mW/(m·K)
//	λ̄₀ = √T̄ / Σₖ Lₖ/T̄ᵏ                                (k = 0…4)
//	λ̄₁ = exp(ρ̄ Σᵢ (1/T̄ − 1)ⁱ Σⱼ Lᵢⱼ (ρ̄ − 1)ʲ)          (i = 0…4, j = 0…5)
//
// T in K, ρ in kg/m³.
//
// The release adds a critical-enhancement term λ̄₂ that is proportional to
// a function Z(y) of the correlation length; it sets the underlying
// susceptibility difference Δχ̄ to zero wherever it comes out negative, and
// λ̄₂ is then exactly zero. For liquid water at the pressures the project
// uses (MediumPressure) that is the case from the melting point up to
// 157.1 °C (computed with python3-iapws 1.5.2, whose IAPWS97(T, P).k
// includes the release's simplified industrial λ̄₂; from 160 °C it adds
// 0.04 %, at 200 °C 0.22 %). The term is therefore left out: below 150 °C,
// where the tool uses water, it is zero, not merely small.
//
// References: IAPWS R15-11 (2011), Release on the IAPWS Formulation 2011 for
// the Thermal Conductivity of Ordinary Water Substance, Eqs. 10, 16–17,
// Tables 1–2; Huber et al. (2012), J. Phys. Chem. Ref. Data 41, 033102;
// docs/METHOD.md §3 (water properties).
func ConductivityIAPWS2011(tempK, density float64) float64 {
	tr := tempK / 647.096
	dr := density / 322.0
	var s0 float64
	for k, l := range condL0 {
		s0 += l / math.Pow(tr, float64(k))
	}
	lambda0 := math.Sqrt(tr) / s0
	x := 1/tr - 1
	var s1, xi float64 = 0, 1
	for i := range condL1 {
		var inner, yj float64 = 0, 1
		for j := range condL1[i] {
			inner += condL1[i][j] * yj
			yj *= dr - 1
		}
		s1 += xi * inner
		xi *= x
	}
	return lambda0 * math.Exp(dr*s1) * 1e-3
}

// WaterConductivity is liquid water's thermal conductivity at tempC and
// MediumPressure(tempC), W/(m·K), with the density from IF97 region 1.
//
// References: IAPWS R15-11 (2011); docs/METHOD.md §3 (water properties).
func WaterConductivity(tempC float64) (float64, error) {
	w, err := Water(tempC)
	if err != nil {
		return 0, err
	}
	return ConductivityIAPWS2011(tempC+273.15, w.Density), nil
}
