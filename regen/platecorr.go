package regen

import (
	"fmt"
	"math"
)

// Ranges of Martin's plate correlation and the project's warning band around
// its branch switch (docs/METHOD.md §12, plate packs).
const (
	// MartinReynoldsMin and MartinReynoldsMax bound the Reynolds numbers
	// the correlation was checked against (200–10 000, as the documentation
	// of python3-fluids 1.0.22 states for friction_plate_Martin_1999 and
	// friction_plate_Martin_VDI).
	MartinReynoldsMin = 200.0
	MartinReynoldsMax = 10000.0
	// MartinAngleMax is the largest chevron angle of those data, 80°.
	MartinAngleMax = 80 * math.Pi / 180
	// MartinBranchReynolds is where ξ₀ and ξ₁ switch from their laminar to
	// their turbulent forms. ξ jumps there: +5.3 % at φ = 60° (+6.7 % at
	// 30°, +5.5 % at 80°), so Nu jumps by about 2 % (ξ^0.374); computed
	// from the formulas in DarcyMartinVDI.
	MartinBranchReynolds = 2000.0
	// BranchBandLow and BranchBandHigh bound the band, ±25 % around the
	// switch, in which a rating is flagged: a modest change of flow or
	// temperature there moves the result across the jump. The width is the
	// project's choice; the real transition in chevron channels is gradual,
	// not a step (as the python3-fluids 1.0.22 documentation of these
	// correlations notes).
	BranchBandLow  = 1500.0
	BranchBandHigh = 2500.0
	// PortLossCoefficient is the number of velocity heads lost per pass in
	// the ports (Kakaç and Liu 2002, ch. 10).
	PortLossCoefficient = 1.4
)

func checkReynoldsAngle(fn string, re, phi float64) {
	if !(re > 0) || math.IsInf(re, 0) || !(phi > 0 && phi < math.Pi/2) {
		panic(fmt.Sprintf("%s%s(Re=%g, φ=%g rad) out of range", panicPrefix, fn, re, phi))
	}
}

// DarcyMartinVDI is the Darcy friction factor of a chevron-plate channel by
// Martin's correlation in the form of the VDI Heat Atlas:
//
//	1/√ξ = cos φ / √(0.18 tan φ + 0.36 sin φ + ξ₀/cos φ) + (1 − cos φ) / √(3.8 ξ₁)
//	Re < 2000:  ξ₀ = 64/Re,                    ξ₁ = 597/Re + 3.85
//	Re ≥ 2000:  ξ₀ = (1.8 log₁₀ Re − 1.5)⁻²,   ξ₁ = 39 Re^(−0.289)
//
// Re on the hydraulic diameter 2b/Φ; φ, rad, from the main flow direction,
// 0 < φ < π/2 (else it panics, as for Re ≤ 0). The first term is flow along
// the furrows (φ → 0), the second flow across them; 0.18 = 4 × 0.045 is
// Martin's Fanning coefficient in Darcy form. ξ is discontinuous at
// Re = 2000 (see MartinBranchReynolds).
//
// References: Martin, H. (1996), A theoretical approach to predict the
// performance of chevron-type plate heat exchangers, Chem. Eng. Process.
// 35:301–310; VDI Heat Atlas, 2nd ed. (Springer, 2010), the chapter on
// plate heat exchangers by Martin (N6, from memory); docs/METHOD.md §12
// (plate packs).
func DarcyMartinVDI(re, phi float64) float64 {
	checkReynoldsAngle("DarcyMartinVDI", re, phi)
	var xi0, xi1 float64
	if re < MartinBranchReynolds {
		xi0, xi1 = 64/re, 597/re+3.85
	} else {
		d := 1.8*math.Log10(re) - 1.5
		xi0, xi1 = 1/(d*d), 39*math.Pow(re, -0.289)
	}
	return martinCombine(phi, 0.18, 0.36, xi0, xi1, 1)
}

// DarcyMartin1999 is the Darcy friction factor by Martin's 1999 form, four
// times his Fanning factor f:
//
//	1/√f = cos φ / √(0.045 tan φ + 0.09 sin φ + f₀/cos φ) + (1 − cos φ) / √(3.8 f₁)
//	Re < 2000:  f₀ = 16/Re,                  f₁ = 149/Re + 0.9625
//	Re ≥ 2000:  f₀ = (1.56 ln Re − 3)⁻²,     f₁ = 9.75 Re^(−0.289)
//	ξ = 4 f
//
// It differs from DarcyMartinVDI only in the rounding of the constants
// (4 × 149 = 596 against 597; 1.56 ln Re − 3 against the VDI's
// 1.8 log₁₀ Re − 1.5): 0.04 % at Re 20 000, φ 45°. Preconditions as
// DarcyMartinVDI.
//
// References: Martin, H. (1999), Economic optimization of compact heat
// exchangers, EF Conference on Compact Heat Exchangers, Banff; as
// implemented in python3-fluids 1.0.22, friction_plate_Martin_1999;
// docs/METHOD.md §12 (plate packs).
func DarcyMartin1999(re, phi float64) float64 {
	checkReynoldsAngle("DarcyMartin1999", re, phi)
	var f0, f1 float64
	if re < MartinBranchReynolds {
		f0, f1 = 16/re, 149/re+0.9625
	} else {
		d := 1.56*math.Log(re) - 3
		f0, f1 = 1/(d*d), 9.75*math.Pow(re, -0.289)
	}
	return martinCombine(phi, 0.045, 0.09, f0, f1, 4)
}

// martinCombine evaluates scale × [cos φ/√(b tan φ + c sin φ + x₀/cos φ) + (1 − cos φ)/√(3.8 x₁)]⁻².
func martinCombine(phi, b, c, x0, x1, scale float64) float64 {
	cos, sin := math.Cos(phi), math.Sin(phi)
	r := cos/math.Sqrt(b*math.Tan(phi)+c*sin+x0/cos) + (1-cos)/math.Sqrt(3.8*x1)
	return scale / (r * r)
}

// NusseltMartin is the Nusselt number of a chevron-plate channel by Martin's
// generalized Lévêque analogy, VDI Heat Atlas form:
//
//	Nu = 0.122 Pr^(1/3) (μ/μ_w)^(1/6) (ξ Re² sin 2φ)^0.374
//
// with ξ the Darcy factor of DarcyMartinVDI, Re on d_h = 2b/Φ, Pr = cp μ/k
// at the bulk temperature and μ_w the viscosity at the wall temperature
// (viscosityRatio = μ/μ_w > 0). Nu is on d_h: h = Nu k/d_h.
//
// References: Martin (1996), Chem. Eng. Process. 35:301; VDI Heat Atlas,
// 2nd ed. (2010); docs/METHOD.md §12 (plate packs).
func NusseltMartin(re, pr, darcy, phi, viscosityRatio float64) float64 {
	checkReynoldsAngle("NusseltMartin", re, phi)
	if !(pr > 0) || !(darcy > 0) || !(viscosityRatio > 0) {
		panic(fmt.Sprintf("%sNusseltMartin(Pr=%g, ξ=%g, μ/μw=%g) out of range", panicPrefix, pr, darcy, viscosityRatio))
	}
	return 0.122 * math.Cbrt(pr) * math.Pow(viscosityRatio, 1.0/6) *
		math.Pow(darcy*re*re*math.Sin(2*phi), 0.374)
}

// SlitWallShearRate is the wall shear rate of a power-law fluid (flow index
// n) moving at mean velocity v through a slit of gap H, 1/s:
//
//	γ̇_w = ((2n + 1)/(3n)) · 6v/H
//
// 6v/H is the Newtonian wall shear rate between parallel plates; the factor
// is the Rabinowitsch–Mooney correction for a slit, which for a power-law
// fluid is exact: with τ = τ_w·y/(H/2) and γ̇ = (τ/K)^(1/n) the mean
// velocity is v = γ̇_w (H/2) n/(2n + 1). A plate channel is taken as a slit
// of gap H = b, the pressing depth: the channel is much wider than deep
// and the channel velocity is defined on the same cross-section b·w, while
// d_h = 2b/Φ also counts the corrugation's extra wetted surface, which does
// not set the velocity gradient. v, H, n > 0.
//
// References: Steffe, J.F. (1996), Rheological Methods in Food Process
// Engineering, 2nd ed., Freeman Press, slit viscometry (from memory);
// docs/METHOD.md §12 (plate packs).
func SlitWallShearRate(velocity, gap, flowIndex float64) float64 {
	if !(velocity > 0) || !(gap > 0) || !(flowIndex > 0) {
		panic(fmt.Sprintf("%sSlitWallShearRate(v=%g, H=%g, n=%g) out of range", panicPrefix, velocity, gap, flowIndex))
	}
	return (2*flowIndex + 1) / (3 * flowIndex) * 6 * velocity / gap
}

// PowerLawViscosity is the apparent viscosity of a power-law fluid, Pa·s:
//
//	μ_app = K γ̇^(n − 1)
//
// K the consistency, Pa·sⁿ, n the flow index, γ̇ the shear rate, 1/s; all > 0.
//
// References: Steffe (1996), ch. 1; docs/METHOD.md §12 (plate packs).
func PowerLawViscosity(consistency, flowIndex, shearRate float64) float64 {
	if !(consistency > 0) || !(flowIndex > 0) || !(shearRate > 0) {
		panic(fmt.Sprintf("%sPowerLawViscosity(K=%g, n=%g, γ̇=%g) out of range", panicPrefix, consistency, flowIndex, shearRate))
	}
	return consistency * math.Pow(shearRate, flowIndex-1)
}

// CleanU is the clean overall coefficient of a plate, W/(m²·K), three
// resistances in series:
//
//	U_clean = 1 / (1/h_product + t/k_w + 1/h_other)
//
// h in W/(m²·K), plate thickness t in m, wall conductivity k_w in W/(m·K);
// all > 0.
//
// References: Incropera et al. (2007), Eq. 11.5; docs/METHOD.md §12 (plate packs).
func CleanU(hProduct, hOther, thickness, wallConductivity float64) float64 {
	if !(hProduct > 0) || !(hOther > 0) || !(thickness > 0) || !(wallConductivity > 0) {
		panic(fmt.Sprintf("%sCleanU(%g, %g, %g, %g) out of range", panicPrefix, hProduct, hOther, thickness, wallConductivity))
	}
	return 1 / (1/hProduct + thickness/wallConductivity + 1/hOther)
}

// ServiceU adds the fouling resistance R_f (m²·K/W, ≥ 0) to a clean U:
//
//	U_service = 1 / (1/U_clean + R_f)
//
// References: Incropera et al. (2007), Eq. 11.5; docs/METHOD.md §12 (plate packs).
func ServiceU(uClean, fouling float64) float64 {
	if !(uClean > 0) || !(fouling >= 0) {
		panic(fmt.Sprintf("%sServiceU(%g, %g) out of range", panicPrefix, uClean, fouling))
	}
	return 1 / (1/uClean + fouling)
}

// channelPressureDrop is the friction loss through a side's channels, Pa:
//
//	Δp_channel = ξ · (N_passes L_p / d_h) · ρ v²/2
//
// L_p port to port as entered (docs/METHOD.md §12, plate packs).
func channelPressureDrop(darcy float64, passes int, portToPort, dh, density, velocity float64) float64 {
	return darcy * float64(passes) * portToPort / dh * density * velocity * velocity / 2
}

// portPressureDrop is the loss in a side's ports, Pa:
//
//	Δp_port = 1.4 · N_passes · ρ v_port²/2,  v_port = (ṁ/ρ) / (π d_port²/4)
//
// with the side's whole volumetric flow through one port. Elevation is
// ignored: the passes run up and down in turn, and the net static head that
// remains with an odd number of passes (ρ g L_p, about 8 kPa for water and
// a 0.8 m plate) is not a loss; it belongs with the plant's piping heights.
//
// References: Kakaç, S. and Liu, H. (2002), Heat Exchangers: Selection,
// Rating, and Thermal Design, 2nd ed., CRC Press, ch. 10 (gasketed-plate
// heat exchangers; chapter and coefficient from memory); docs/METHOD.md §12
// (plate packs).
func portPressureDrop(passes int, density, portVelocity float64) float64 {
	return PortLossCoefficient * float64(passes) * density * portVelocity * portVelocity / 2
}
