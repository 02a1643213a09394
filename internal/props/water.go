// Package props gives the thermophysical properties the calculations need:
// liquid water from IAPWS-IF97 region 1, foods from their composition by the
// Choi–Okos correlations, and product viscosity interpolated from measured points.
//
//	rho, _ := props.WaterDensity(80)     // kg/m³ at 80 °C and the default pressure
//	cp, _ := props.WaterCp(80)           // J/(kg·K)
//	milk := props.Composition{Water: 0.878, Protein: 0.032, Fat: 0.035, Carbohydrate: 0.048, Ash: 0.007}
//	cp = milk.SpecificHeat(72)           // ≈ 3913 J/(kg·K)
//
// Water media are evaluated at 101.325 kPa, or just above the saturation
// pressure where the water is hotter than 100 °C (a pressurized loop), which
// keeps region 1 (compressed liquid) valid. Liquid cp and density change by
// less than 0.05 % per MPa here, so the loop pressure need not be entered.
package props

import (
	"fmt"
	"math"
)

// IF97 region 1 constants (IAPWS R7-97(2012), Eq. 7 and Table 2).
const (
	if97R     = 0.461526e3 // specific gas constant of water, J/(kg·K)
	if97Pstar = 16.53e6    // Pa
	if97Tstar = 1386.0     // K
)

var (
	if97I = [34]float64{0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4,
		4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32}
	if97J = [34]float64{-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0,
		6, -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41}
	if97N = [34]float64{0.14632971213167, -0.84548187169114, -0.37563603672040e1,
		0.33855169168385e1, -0.95791963387872, 0.15772038513228,
		-0.16616417199501e-1, 0.81214629983568e-3, 0.28319080123804e-3,
		-0.60706301565874e-3, -0.18990068218419e-1, -0.32529748770505e-1,
		-0.21841717175414e-1, -0.52838357969930e-4, -0.47184321073267e-3,
		-0.30001780793026e-3, 0.47661393906987e-4, -0.44141845330846e-5,
		-0.72694996297594e-15, -0.31679644845054e-4, -0.28270797985312e-5,
		-0.85205128120103e-9, -0.22425281908000e-5, -0.65171222895601e-6,
		-0.14341729937924e-12, -0.40516996860117e-6, -0.12734301741641e-8,
		-0.17424871230634e-9, -0.68762131295531e-18, 0.14478307828521e-19,
		0.26335781662795e-22, -0.11947622640071e-22, 0.18228094581404e-23,
		-0.93537087292458e-25}
)

// WaterState is liquid water at one temperature and pressure.
type WaterState struct {
	SpecificVolume float64 // m³/kg
	Density        float64 // kg/m³
	Enthalpy       float64 // J/kg
	Cp             float64 // J/(kg·K)
}

// ErrWaterRange reports a water state outside IF97 region 1.
type ErrWaterRange struct {
	TempK, PressurePa float64
}

func (e *ErrWaterRange) Error() string {
	return fmt.Sprintf("water at %.2f °C and %.0f kPa is outside IAPWS-IF97 region 1 (liquid, 0–350 °C)",
		e.TempK-273.15, e.PressurePa/1e3)
}

// IF97Region1 evaluates the IAPWS-IF97 region 1 Gibbs free-energy equation:
//
//	γ(π, τ) = Σ nᵢ (7.1 − π)^Iᵢ (τ − 1.222)^Jᵢ,  π = p/16.53 MPa,  τ = 1386 K / T
//	v  = (R T / p) π γ_π
//	h  = R T τ γ_τ
//	cp = −R τ² γ_ττ
//
// T in K, p in Pa. Valid for 273.15 K ≤ T ≤ 623.15 K and p_sat(T) ≤ p ≤ 100 MPa.
//
// References: IAPWS R7-97(2012), Revised Release on the IAPWS Industrial
// Formulation 1997, Eq. 7, Tables 2–4.
func IF97Region1(tempK, pressurePa float64) (WaterState, error) {
	if !(tempK >= 273.15 && tempK <= 623.15) || !(pressurePa > 0 && pressurePa <= 100e6) ||
		(tempK > 373.15 && pressurePa < SaturationPressure(tempK)*(1-1e-9)) {
		return WaterState{}, &ErrWaterRange{tempK, pressurePa}
	}
	pi := pressurePa / if97Pstar
	tau := if97Tstar / tempK
	a, b := 7.1-pi, tau-1.222
	var gp, gt, gtt float64
	for i := range if97N {
		I, J, n := if97I[i], if97J[i], if97N[i]
		aI := math.Pow(a, I)
		gp -= n * I * math.Pow(a, I-1) * math.Pow(b, J)
		gt += n * J * aI * math.Pow(b, J-1)
		gtt += n * J * (J - 1) * aI * math.Pow(b, J-2)
	}
	v := pi * gp * if97R * tempK / pressurePa
	return WaterState{
		SpecificVolume: v,
		Density:        1 / v,
		Enthalpy:       tau * gt * if97R * tempK,
		Cp:             -if97R * tau * tau * gtt,
	}, nil
}

// SaturationPressure is the IF97 region 4 saturation-pressure equation
// (IAPWS R7-97(2012), Eq. 30), T in K (273.15–647.096), result in Pa.
func SaturationPressure(tempK float64) float64 {
	n := [11]float64{0, 0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2,
		0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2,
		-0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
		0.65017534844798e3}
	th := tempK + n[9]/(tempK-n[10])
	A := th*th + n[1]*th + n[2]
	B := n[3]*th*th + n[4]*th + n[5]
	C := n[6]*th*th + n[7]*th + n[8]
	return math.Pow(2*C/(-B+math.Sqrt(B*B-4*A*C)), 4) * 1e6
}

// MediumPressure is the pressure at which a water medium at tempC is
// evaluated: 101.325 kPa, or 1 % above saturation when that is higher.
func MediumPressure(tempC float64) float64 {
	p := 101325.0
	if tempC > 99 {
		if ps := SaturationPressure(tempC+273.15) * 1.01; ps > p {
			p = ps
		}
	}
	return p
}

// Water returns liquid water at tempC (°C) and MediumPressure(tempC).
func Water(tempC float64) (WaterState, error) {
	return IF97Region1(tempC+273.15, MediumPressure(tempC))
}

// IAPWS 2008 viscosity constants (IAPWS R12-08, Eqs. 11–12, Tables 1–2).
var (
	viscH0 = [4]float64{1.67752, 2.20462, 0.6366564, -0.241605}
	viscI  = [21]float64{0, 1, 2, 3, 0, 1, 2, 3, 5, 0, 1, 2, 3, 4, 0, 1, 0, 3, 4, 3, 5}
	viscJ  = [21]float64{0, 0, 0, 0, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 4, 4, 5, 6, 6}
	viscH1 = [21]float64{0.520094, 0.850895e-1, -0.108374e1, -0.289555, 0.222531, 0.999115,
		0.188797e1, 0.126613e1, 0.120573, -0.281378, -0.906851, -0.772479,
		-0.489837, -0.257040, 0.161913, 0.257399, -0.325372e-1, 0.698452e-1,
		0.872102e-2, -0.435673e-2, -0.593264e-3}
)

// ViscosityIAPWS2008 is the viscosity of water, Pa·s, for industrial use
// (no critical enhancement, μ₂ = 1):
//
//	μ/μ* = μ₀(T̄) · μ₁(T̄, ρ̄),  T̄ = T/647.096 K,  ρ̄ = ρ/322 kg/m³,  μ* = 1 µPa·s
//	μ₀ = 100 √T̄ / Σᵢ Hᵢ/T̄ⁱ
//	μ₁ = exp(ρ̄ Σᵢ (1/T̄ − 1)ⁱ Σⱼ Hᵢⱼ (ρ̄ − 1)ʲ)
//
// T in K, ρ in kg/m³. References: IAPWS R12-08 (2008), Eqs. 10–12.
func ViscosityIAPWS2008(tempK, density float64) float64 {
	tr := tempK / 647.096
	dr := density / 322.0
	var s0 float64
	for i, h := range viscH0 {
		s0 += h / math.Pow(tr, float64(i))
	}
	mu0 := 100 * math.Sqrt(tr) / s0
	var s1 float64
	for k := range viscH1 {
		s1 += math.Pow(1/tr-1, viscI[k]) * viscH1[k] * math.Pow(dr-1, viscJ[k])
	}
	return mu0 * math.Exp(dr*s1) * 1e-6
}

// WaterViscosity is liquid water's viscosity at tempC and MediumPressure, Pa·s.
func WaterViscosity(tempC float64) (float64, error) {
	w, err := Water(tempC)
	if err != nil {
		return 0, err
	}
	return ViscosityIAPWS2008(tempC+273.15, w.Density), nil
}
