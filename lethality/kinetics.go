package lethality

import (
	"fmt"
	"math"
	"sort"
)

// Profile is the product temperature along the holding tube, outlet held at
// the diversion setpoint. With heat loss to still ambient air through an outer
// coefficient h_o on the outer surface:
//
//	T(x) = T_a + (T_in − T_a) exp(−k x),  k = h_o π D_o / (ṁ c_p)
//	T_in = T_a + (T_set − T_a) exp(k L)       (so that T(L) = T_set)
//
// With k = 0 the tube is isothermal at the setpoint.
//
// References: docs/METHOD.md §8 (holding-tube heat loss); Incropera et al. (2007)
// Eq. 8.46a (constant surrounding temperature, overall coefficient).
type Profile struct {
	Outlet  float64 // °C: the diversion setpoint at the tube outlet
	Ambient float64 // °C
	Decay   float64 // k, 1/m; 0 = isothermal
	Length  float64 // m
}

// HeatLossProfile builds a profile for outer coefficient hOuter (W/(m²·K)) on
// outer diameter outerD (m), product mass flow (kg/s) and specific heat cp.
func HeatLossProfile(outlet, ambient, hOuter, outerD, massFlow, cp, length float64) Profile {
	if !(massFlow > 0 && cp > 0 && length > 0) || hOuter < 0 || outerD < 0 {
		panic(fmt.Sprintf("%sHeatLossProfile: bad arguments", panicPrefix))
	}
	return Profile{Outlet: outlet, Ambient: ambient, Decay: hOuter * math.Pi * outerD / (massFlow * cp), Length: length}
}

// Isothermal is a tube held at the setpoint throughout.
func Isothermal(setpoint, length float64) Profile {
	return Profile{Outlet: setpoint, Ambient: setpoint, Length: length}
}

// At is the temperature at distance x from the inlet, °C.
func (p Profile) At(x float64) float64 {
	return p.Ambient + (p.Outlet-p.Ambient)*math.Exp(p.Decay*(p.Length-x))
}

// Inlet is the temperature the product must have entering the tube, °C.
func (p Profile) Inlet() float64 { return p.At(0) }

// Organism is a target organism's first-order thermal death kinetics.
type Organism struct {
	Name                 string
	D                    float64 // decimal reduction time at DTemperature, s, > 0
	DTemperature         float64 // °C
	Z                    float64 // K, > 0
	RequiredLogReduction float64 // log10 reductions; 0 when none is required
}

// DAt is the D-value at temperature t (°C):
//
//	D(T) = D_ref · 10^((T_ref − T)/z)
func (o Organism) DAt(t float64) float64 { return o.D * math.Pow(10, (o.DTemperature-t)/o.Z) }

// simpsonIntervals is the number of Simpson intervals along the tube; the
// integrands are smooth (exp of an exponential), so 1024 intervals give
// a relative error far below 1e-9 for any plausible heat loss (tested
// against a 200 000-step trapezoidal sum).
const simpsonIntervals = 1024

// integrate applies composite Simpson's rule to f over [0, L].
func integrate(f func(x float64) float64, length float64) float64 {
	n := simpsonIntervals
	h := length / float64(n)
	s := f(0) + f(length)
	for i := 1; i < n; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		s += w * f(float64(i)*h)
	}
	return s * h / 3
}

// LogReduction is the fastest particle's log reduction: the particle moves at
// uMax (m/s) through the profile, so dt = dx/uMax and
//
//	LR = ∫₀ᴸ dx / (u_max D(T(x)))      (= t_min / D(T_set) when isothermal)
//
// References: Stumbo, Thermobacteriology in Food Processing, 2nd ed. (1973);
// docs/METHOD.md §9.2 (Lethality).
func LogReduction(p Profile, uMax float64, o Organism) float64 {
	if p.Decay == 0 {
		return p.Length / uMax / o.DAt(p.Outlet)
	}
	return integrate(func(x float64) float64 { return 1 / o.DAt(p.At(x)) }, p.Length) / uMax
}

// EquivalentTime is the time at tRef (°C) with the same lethality for z (K):
//
//	F = ∫ 10^((T − T_ref)/z) dt
func EquivalentTime(p Profile, uMax, tRef, z float64) float64 {
	if p.Decay == 0 {
		return p.Length / uMax * math.Pow(10, (p.Outlet-tRef)/z)
	}
	return integrate(func(x float64) float64 { return math.Pow(10, (p.At(x)-tRef)/z) }, p.Length) / uMax
}

// Brewing pasteurization units: 1 PU = 1 min at 60 °C with z = 7 °C.
const (
	PUReference = 60.0 // °C
	PUZ         = 7.0  // K
)

// PasteurizationUnits is PU = ∫ 10^((T − 60)/7) dt / 60 s (the z = 7 °C form;
// the older 1.393^(T−60) form corresponds to z ≈ 6.95 °C).
//
// References: docs/METHOD.md §9.3; Del Vecchio et al. (1951), Wallerstein Lab. Commun. 14:185.
func PasteurizationUnits(p Profile, uMax float64) float64 {
	return EquivalentTime(p, uMax, PUReference, PUZ) / 60
}

// ProfilePoint is one station along the tube.
type ProfilePoint struct {
	X           float64 // m from the inlet
	Temperature float64 // °C
	Time        float64 // s, fastest particle
	LogRed      float64 // accumulated log reduction to here
}

// Accumulated returns n+1 stations from inlet to outlet with the fastest
// particle's accumulated log reduction (trapezoidal between stations, exact
// when isothermal), for plots.
func Accumulated(p Profile, uMax float64, o Organism, n int) []ProfilePoint {
	if n < 1 {
		panic(panicPrefix + "Accumulated needs n ≥ 1")
	}
	pts := make([]ProfilePoint, n+1)
	dx := p.Length / float64(n)
	for i := range pts {
		x := float64(i) * dx
		pts[i] = ProfilePoint{X: x, Temperature: p.At(x), Time: x / uMax}
		if i > 0 {
			a, b := 1/o.DAt(pts[i-1].Temperature), 1/o.DAt(pts[i].Temperature)
			pts[i].LogRed = pts[i-1].LogRed + (a+b)/2*dx/uMax
		}
	}
	return pts
}

// LegalRow is one user-entered time–temperature minimum.
type LegalRow struct {
	Temperature float64 // °C
	Time        float64 // s
}

// LegalVerdict is the judgement of the fastest particle's time against the
// legal table.
type LegalVerdict struct {
	Met        bool
	Row        LegalRow // the row met (the hottest met row), or else the applicable row
	RowIndex   int      // index in the user's table; −1 when no row is at or below the setpoint
	Margin     float64  // s: fastest-particle time − row time
	MarginPct  float64  // percent of the row time
	Applicable LegalRow // the hottest row not above the setpoint
}

// JudgeLegal applies the legal-table rule: the process meets the table when
// some row has temperature ≤ setpoint and time ≤ the fastest-particle time,
// the latter within relTol of the row time (row time − t_min ≤ relTol·row
// time; the caller's one tolerance rule for every check, 0 for none).
// Rows are never interpolated: the table is not one z-line (63 °C/30 min and
// 72 °C/15 s imply z = 4.33 °C; 72 °C/15 s and 89 °C/1 s imply z = 14.45 °C).
//
// References: docs/METHOD.md §10 (Legal minimum table) and §3.
func JudgeLegal(rows []LegalRow, setpoint, minResidence, relTol float64) LegalVerdict {
	idx := make([]int, 0, len(rows))
	for i, r := range rows {
		if r.Temperature <= setpoint+1e-9 {
			idx = append(idx, i)
		}
	}
	if len(idx) == 0 {
		return LegalVerdict{RowIndex: -1}
	}
	sort.SliceStable(idx, func(a, b int) bool { return rows[idx[a]].Temperature > rows[idx[b]].Temperature })
	v := LegalVerdict{Applicable: rows[idx[0]], Row: rows[idx[0]], RowIndex: idx[0]}
	for _, i := range idx {
		if rows[i].Time-minResidence <= relTol*rows[i].Time {
			v.Met, v.Row, v.RowIndex = true, rows[i], i
			break
		}
	}
	v.Margin = minResidence - v.Row.Time
	v.MarginPct = v.Margin / v.Row.Time * 100
	return v
}
