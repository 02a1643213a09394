package lethality

import "math"

// The fastest particle's time over every flow up to the seal, and the largest
// flow that meets a legal row, both exact from the model's pieces
// (docs/METHOD.md §7.5 and §7.7): below the turbulent limit the ratio is the
// laminar constant, so t_min = L/(r_lam v) falls as the flow rises; from the
// limit up, r·v rises with v, so t_min keeps falling. The only place a lower
// flow can hold a particle for less time than a higher one is just below the
// limit, where the ratio jumps from about 1.33 to r_lam.

// TurbulentOnsetFlow is the volumetric flow (m³/s) at which the Reynolds
// number of r (density at the holding temperature, kg/m³) reaches the
// turbulent limit in this tube:
//
//	Q₄₀₀₀ = v₄₀₀₀ · πD²/4
//	Newtonian:  v₄₀₀₀ = 4000 μ / (ρ D)
//	power law:  v₄₀₀₀ = [ 4000 K 8^(n−1) ((3n+1)/(4n))ⁿ / (ρ Dⁿ) ]^(1/(2−n))
//
// References: docs/METHOD.md §7.7 (Worst flow below the seal); Metzner and Reed (1955).
func (t Tube) TurbulentOnsetFlow(density float64, r Rheology) float64 {
	return r.VelocityAt(TurbulentLimit, density, t.InnerDiameter) * t.CrossSection()
}

// WorstFlow is the flow at which the fastest particle spends the least time
// in the tube.
type WorstFlow struct {
	Volumetric float64 // m³/s
	// Hydraulics at that flow. Below the seal it is the limit approached from
	// just below Q₄₀₀₀: Reynolds = TurbulentLimit, Regime Transitional, the
	// laminar ratio r_lam, MinResidence = L/(r_lam v₄₀₀₀).
	Hydraulics
	AtSeal bool // the sealed maximum itself
}

// WorstFlow finds the flow in (0, seal] with the shortest fastest-particle
// time, exactly from the model:
//
//	t_worst = min( t_min(seal), L / (r_lam · v₄₀₀₀) )   when Q₄₀₀₀ ≤ Q_seal
//	t_worst = t_min(seal)                                 otherwise
//
// with r_lam = 2 (Newtonian) or (3n+1)/(n+1) (power law). With an override
// of the ratio (override > 0) the ratio is constant, t_min falls with the
// flow, and the seal is the worst flow. The product properties are those at
// the holding temperature for every flow. When both candidates give the same
// time the seal is returned.
//
// References: docs/METHOD.md §7.7 (Worst flow below the seal).
func (t Tube) WorstFlow(seal Flow, r Rheology, override float64) WorstFlow {
	atSeal := WorstFlow{Volumetric: seal.Volumetric, Hydraulics: t.Hydraulics(seal, r, override), AtSeal: true}
	if override > 0 {
		return atSeal
	}
	q4 := t.TurbulentOnsetFlow(seal.Density, r)
	if !(q4 <= seal.Volumetric) {
		return atSeal
	}
	v4 := q4 / t.CrossSection()
	lam := LaminarFastestToMean(r.FlowIndex())
	below := Hydraulics{MeanVelocity: v4, Reynolds: TurbulentLimit, Regime: Transitional, FastestToMean: lam,
		MeanResidence: t.Length / v4}
	below.MinResidence = below.MeanResidence / lam
	if below.MinResidence < atSeal.MinResidence {
		return WorstFlow{Volumetric: q4, Hydraulics: below}
	}
	return atSeal
}

// MaxFlowFor is the largest volumetric flow (m³/s) up to which every flow
// gives the fastest particle at least time seconds in the tube (density at
// the holding temperature), at most hi (returned when every flow up to hi
// meets it). Piece by piece (docs/METHOD.md §7.5):
//
//	override r_o:     Q = V / (r_o · time)
//	laminar piece:    Q_a = V / (r_lam · time); the answer when Q_a < Q₄₀₀₀
//	turbulent piece:  otherwise every laminar flow meets the row, and the answer is
//	                  the root of t_min(Q) = time on [Q₄₀₀₀, hi] (t_min falls with Q),
//	                  by bisection to 1e-12 relative
//
// V is the tube's hold-up. Exact, unlike a scan over a grid of flows, which can
// step over a failing band just below Q₄₀₀₀.
func (t Tube) MaxFlowFor(time float64, density float64, r Rheology, override, hi float64) float64 {
	vol := t.Volume()
	if override > 0 {
		return math.Min(vol/(override*time), hi)
	}
	qa := vol / (LaminarFastestToMean(r.FlowIndex()) * time)
	q4 := t.TurbulentOnsetFlow(density, r)
	if qa < q4 {
		return math.Min(qa, hi)
	}
	meets := func(q float64) bool {
		return t.Hydraulics(Flow{Volumetric: q, Density: density}, r, 0).MinResidence >= time
	}
	if q4 >= hi || meets(hi) {
		return hi
	}
	a, b := q4, hi // a meets (its time is at least the laminar one just below, which meets), b does not
	for range 400 {
		if b-a <= 1e-12*b {
			break
		}
		m := (a + b) / 2
		if meets(m) {
			a = m
		} else {
			b = m
		}
	}
	return a
}
