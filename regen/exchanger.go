// Package regen sizes and rates the heat-exchange sections of a continuous
// plate pasteurizer: product-to-product regeneration, heating with a hot medium
// and one or more cooling stages, by the log-mean temperature difference and the
// effectiveness–NTU method, for counterflow and co-current arrangements.
//
// All quantities are SI; temperatures are in °C (differences in K), capacity
// rates C = ṁ·cp in W/K, areas in m², duties in W.
//
// A whole line is computed by Line:
//
//	res, err := regen.Line(regen.LineInput{
//		ProductCapacity: 11245, RawInlet: 5, Setpoint: 72.5, HeatingOutlet: 72.5, OutletTarget: 4,
//		Regeneration: &regen.RegenSpec{Surface: regen.Surface{U: 3300, PlateArea: 0.35}, Ratio: 0.92},
//	})
//
// Conventions (docs/METHOD.md §6.2): the pasteurized side enters regeneration at
// the diversion setpoint; the same product flows on both sides, so C_r = 1 and
// the regeneration ratio equals the effectiveness. Water media convert a
// volumetric rate to mass at their inlet temperature and take cp at the mean of
// inlet and outlet, iterated to convergence. Plates = ceil(area / plate area).
//
// References: Incropera, DeWitt, Bergman and Lavine, Fundamentals of Heat and
// Mass Transfer, 6th ed. (2007), §11.3 (LMTD) and §11.4 (ε–NTU, Table 11.3);
// Kakaç and Liu, Heat Exchangers: Selection, Rating and Thermal Design (2002), ch. 2.
package regen

import (
	"errors"
	"fmt"
	"math"
)

const panicPrefix = "regen: "

// Arrangement is the relative direction of the two streams.
type Arrangement int

const (
	Counterflow Arrangement = iota // streams in opposite directions (the zero value)
	Cocurrent                      // streams in the same direction (parallel flow)
)

func (a Arrangement) String() string {
	if a == Cocurrent {
		return "cocurrent"
	}
	return "counterflow"
}

// Mode says whether a section's size is found (sizing) or given (rating).
type Mode int

const (
	Sizing Mode = iota // duty or ratio given, area found
	Rating             // plates given, temperatures found
)

func (m Mode) String() string {
	if m == Rating {
		return "rating"
	}
	return "sizing"
}

// ErrInfeasible is wrapped by errors for duties no exchanger of the given
// arrangement can deliver, however large.
var ErrInfeasible = errors.New("infeasible duty")

// CrossError is a temperature cross: a terminal temperature difference of
// the arrangement is zero or negative, so no area can do the duty.
type CrossError struct {
	Section     string
	Arrangement Arrangement
	HotIn       float64 // °C
	HotOut      float64 // °C
	ColdIn      float64 // °C
	ColdOut     float64 // °C
	Hot, Cold   string  // names of the two streams, e.g. "medium", "product"
}

func (e *CrossError) Error() string { return e.Section + ": " + e.Detail() }

// Detail is the message without the section name.
func (e *CrossError) Detail() string {
	d1, d2 := TerminalDifferences(e.Arrangement, e.HotIn, e.HotOut, e.ColdIn, e.ColdOut)
	return fmt.Sprintf("temperature cross: %s %.2f → %.2f °C, %s %.2f → %.2f °C; the %s terminal differences are %.2f K and %.2f K and both must be positive",
		e.Hot, e.HotIn, e.HotOut, e.Cold, e.ColdIn, e.ColdOut, e.Arrangement, d1, d2)
}

// TerminalDifferences returns the temperature differences at the two ends
// of an exchanger of arrangement a, K:
//
//	counterflow: ΔT₁ = T_h,in − T_c,out,  ΔT₂ = T_h,out − T_c,in
//	co-current:  ΔT₁ = T_h,in − T_c,in,   ΔT₂ = T_h,out − T_c,out
//
// Both must be positive for LMTD; either ≤ 0 is a temperature cross.
//
// References: Incropera et al. (2007), §11.3; docs/METHOD.md §5.1 (LMTD).
func TerminalDifferences(a Arrangement, hotIn, hotOut, coldIn, coldOut float64) (float64, float64) {
	if a == Cocurrent {
		return hotIn - coldIn, hotOut - coldOut
	}
	return hotIn - coldOut, hotOut - coldIn
}

// LMTD is the log-mean temperature difference of two terminal differences, K:
//
//	ΔT_lm = (ΔT₁ − ΔT₂) / ln(ΔT₁/ΔT₂)
//
// It is symmetric in its arguments and equals ΔT₁ when ΔT₁ = ΔT₂ (the limit,
// reached through a series expansion when the two are within 1e-6 relative).
// ok is false when either difference is not positive (a temperature cross).
//
// References: Incropera et al. (2007), Eq. 11.15.
func LMTD(dt1, dt2 float64) (lmtd float64, ok bool) {
	if !(dt1 > 0 && dt2 > 0) {
		return 0, false
	}
	x := dt1/dt2 - 1
	if math.Abs(x) < 1e-6 {
		// (ΔT₁ − ΔT₂)/ln(1+x) = ΔT₂ x / (x − x²/2 + x³/3) ≈ ΔT₂ (1 + x/2 − x²/12)
		return dt2 * (1 + x/2 - x*x/12), true
	}
	return (dt1 - dt2) / math.Log(dt1/dt2), true
}

// Effectiveness is ε(NTU, C_r) for the arrangement:
//
//	counterflow: ε = [1 − e^(−NTU(1−C_r))] / [1 − C_r e^(−NTU(1−C_r))];  C_r = 1: ε = NTU/(1+NTU)
//	co-current:  ε = [1 − e^(−NTU(1+C_r))] / (1 + C_r)
//
// NTU ≥ 0, 0 ≤ C_r ≤ 1; otherwise it panics (a caller bug).
//
// References: Incropera et al. (2007), Table 11.3, Eqs. 11.28a and 11.29a.
func Effectiveness(a Arrangement, ntu, cr float64) float64 {
	if !(ntu >= 0) || !(cr >= 0 && cr <= 1) {
		panic(fmt.Sprintf("%sEffectiveness(NTU=%g, Cr=%g) out of range", panicPrefix, ntu, cr))
	}
	if a == Cocurrent {
		return -math.Expm1(-ntu*(1+cr)) / (1 + cr)
	}
	if 1-cr < 1e-9 {
		return ntu / (1 + ntu)
	}
	e := math.Exp(-ntu * (1 - cr))
	return (1 - e) / (1 - cr*e)
}

// NTU inverts Effectiveness:
//
//	counterflow: NTU = ln[(1 − ε C_r)/(1 − ε)] / (1 − C_r);  C_r = 1: NTU = ε/(1 − ε)
//	co-current:  NTU = −ln[1 − ε(1 + C_r)] / (1 + C_r)
//
// It returns an error wrapping ErrInfeasible when no NTU reaches ε: ε ≥ 1 for
// counterflow, ε ≥ 1/(1 + C_r) for co-current (50 % at C_r = 1).
//
// References: Incropera et al. (2007), Table 11.4.
func NTU(a Arrangement, eps, cr float64) (float64, error) {
	if !(cr >= 0 && cr <= 1) {
		panic(fmt.Sprintf("%sNTU(Cr=%g) out of range", panicPrefix, cr))
	}
	if !(eps > 0) {
		return 0, fmt.Errorf("effectiveness %.4f must be positive: %w", eps, ErrInfeasible)
	}
	if a == Cocurrent {
		limit := 1 / (1 + cr)
		if eps >= limit {
			return 0, fmt.Errorf("co-current flow cannot reach an effectiveness of %.1f %%: its ceiling at C_r = %.3f is %.1f %% however large the area: %w",
				eps*100, cr, limit*100, ErrInfeasible)
		}
		return -math.Log1p(-eps*(1+cr)) / (1 + cr), nil
	}
	if eps >= 1 {
		return 0, fmt.Errorf("an effectiveness of %.1f %% needs infinite area: %w", eps*100, ErrInfeasible)
	}
	if 1-cr < 1e-9 {
		return eps / (1 - eps), nil
	}
	return math.Log((1-eps*cr)/(1-eps)) / (1 - cr), nil
}

// Surface is a section's plate pack.
type Surface struct {
	Arrangement Arrangement
	U           float64 // overall heat-transfer coefficient, W/(m²·K), > 0 (fouling already included)
	PlateArea   float64 // effective heat-transfer area per thermal plate, m², > 0
	Plates      int     // thermal plates; 0 means sizing mode (the plates are found)
}

// Mode is Rating when plates are given.
func (s Surface) Mode() Mode {
	if s.Plates > 0 {
		return Rating
	}
	return Sizing
}

// PlatesFor is the number of thermal plates that provide at least area:
//
//	N = ceil(A / A_plate)
//
// A relative slack of 1e-9 keeps an exact multiple from rounding up.
func PlatesFor(area, plateArea float64) int {
	return int(math.Ceil(area/plateArea - 1e-9))
}
