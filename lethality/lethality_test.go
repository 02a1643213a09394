package lethality

import (
	"math"
	"testing"
)

func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want)) }

func TestFastestToMean(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		// Laminar Newtonian: 2 (Poiseuille profile; docs/METHOD.md §7.4).
		{"laminar newtonian", LaminarFastestToMean(1), 2, 1e-15},
		// Laminar power law (3n+1)/(n+1): n = 0.5 → 2.5/1.5 (Steffe 1996; from memory; docs/METHOD.md §7.4).
		{"laminar n 0.5", LaminarFastestToMean(0.5), 2.5 / 1.5, 1e-15},
		{"laminar n 0.7", LaminarFastestToMean(0.7), 3.1 / 1.7, 1e-15},
		// Turbulent: published holding-section sizing guidance quotes 1.33 at Re 4000
		// and 1.25 at Re 20 000 (docs/METHOD.md §7.4); the formula gives 1.32608 and 1.25565
		// (computed with python3).
		{"turbulent Re 4000", TurbulentFastestToMean(4000), 1.33, 0.005},
		{"turbulent Re 20000", TurbulentFastestToMean(20000), 1.25, 0.005},
		{"turbulent Re 4000 exact", TurbulentFastestToMean(4000), 1.3260764990766958, 1e-12},
	}
	for _, tc := range tests {
		if !near(tc.got, tc.want, tc.tol) {
			t.Errorf("%s: %.12g, want %.12g ± %g", tc.name, tc.got, tc.want, tc.tol)
		}
	}
}

func TestPetukhovAgainstColebrook(t *testing.T) {
	// The Petukhov factor (0.790 ln Re − 1.64)⁻² against the smooth-pipe Colebrook
	// factor from Debian's python3-fluids 1.0.22, fluids.friction_factor(Re, eD=0):
	// 4000: 0.03990701405563491; 20000: 0.02588307853809607; 1e5: 0.01798977308427384.
	// Petukhov is within 4 % at Re 4000 and 0.1 % at 1e5.
	for _, c := range []struct{ re, colebrook, tol float64 }{
		{4000, 0.03990701405563491, 0.04}, {20000, 0.02588307853809607, 0.011}, {1e5, 0.01798977308427384, 0.001},
	} {
		f := math.Pow(0.790*math.Log(c.re)-1.64, -2)
		if math.Abs(f/c.colebrook-1) > c.tol {
			t.Errorf("Re %g: Petukhov %g vs Colebrook %g", c.re, f, c.colebrook)
		}
	}
}

func TestMetznerReedReducesToNewtonian(t *testing.T) {
	// At n = 1 the Metzner–Reed number is ρvD/μ (Metzner and Reed 1955).
	pl := PowerLaw{N: 1, K: 0.8e-3}
	nw := Newtonian{Viscosity: 0.8e-3}
	if a, b := pl.Reynolds(1015, 1.7, 0.0475), nw.Reynolds(1015, 1.7, 0.0475); !near(a, b, 1e-12) {
		t.Errorf("Metzner–Reed %g vs Newtonian %g", a, b)
	}
	// n = 0.5, K = 2 Pa·s^0.5, ρ 1000, v 1, D 0.05: Re = 1000·1·0.05^0.5/(2·8^-0.5·1.25^0.5)
	// = 223.607/(2·0.353553·1.118034) = 282.843 (computed by hand).
	if got := (PowerLaw{N: 0.5, K: 2}).Reynolds(1000, 1, 0.05); !near(got, 282.842712474619, 1e-9) {
		t.Errorf("Metzner–Reed n 0.5: %.12g", got)
	}
}

func TestRegimes(t *testing.T) {
	// docs/METHOD.md §7.3: < 2100 laminar, 2100–4000 transitional (treated as laminar), ≥ 4000 turbulent.
	for re, want := range map[float64]Regime{100: Laminar, 2099: Laminar, 2100: Transitional, 3999: Transitional, 4000: Turbulent} {
		if got := RegimeOf(re); got != want {
			t.Errorf("Re %g: %v, want %v", re, got, want)
		}
	}
	tube := Tube{InnerDiameter: 0.0475, Length: 20}
	// Transitional is timed with the laminar ratio.
	mu := 1015 * 1.0 * 0.0475 / 3000 // Re = 3000 at v = 1 m/s
	h := tube.Hydraulics(Flow{Volumetric: tube.CrossSection(), Density: 1015}, Newtonian{mu}, 0)
	if h.Regime != Transitional || h.FastestToMean != 2 || !near(h.MinResidence, 10, 1e-12) {
		t.Errorf("transitional: %+v", h)
	}
	h = tube.Hydraulics(Flow{Volumetric: tube.CrossSection(), Density: 1015}, Newtonian{mu}, 1.5)
	if !h.Overridden || h.FastestToMean != 1.5 {
		t.Errorf("override: %+v", h)
	}
}

func TestListeriaLogReduction(t *testing.T) {
	// Bradshaw et al. 1985 (J. Food Prot. 48:743): Listeria monocytogenes in whole milk,
	// D71.7 = 0.9 s, z = 6.3 °C. 15 s at 71.7 °C gives 15/0.9 = 16.7 log.
	o := Organism{Name: "L. monocytogenes", D: 0.9, DTemperature: 71.7, Z: 6.3}
	p := Isothermal(71.7, 15)
	if got := LogReduction(p, 1, o); !near(got, 16.6667, 1e-4) {
		t.Errorf("log reduction %g, want 16.7", got)
	}
	// One z above the reference the D-value is ten times smaller.
	if got := o.DAt(71.7 + 6.3); !near(got, 0.09, 1e-12) {
		t.Errorf("D at 78 °C = %g", got)
	}
	// Equivalent time at the reference temperature equals the time when isothermal there.
	if got := EquivalentTime(p, 1, 71.7, 6.3); !near(got, 15, 1e-12) {
		t.Errorf("equivalent time %g", got)
	}
	// PU: 1 min at 60 °C is 1 PU (definition, docs/METHOD.md §9.3).
	if got := PasteurizationUnits(Isothermal(60, 60), 1); !near(got, 1, 1e-12) {
		t.Errorf("PU %g", got)
	}
}

func TestHeatLossProfile(t *testing.T) {
	// Closed form (docs/METHOD.md §8): T(x) = Ta + (Tin − Ta) exp(−k x), k = h π Do /(ṁ cp),
	// outlet held at the setpoint. Hand-worked: h 10 W/(m²·K), Do 0.0508 m, ṁ 3 kg/s,
	// cp 3900 → k = 10·π·0.0508/11 700 = 1.364038e-4 1/m; L = 30 m, Ta 20 °C, setpoint 72 °C:
	// Tin = 20 + 52·exp(30k) = 72.213227 °C (computed with python3).
	p := HeatLossProfile(72, 20, 10, 0.0508, 3, 3900, 30)
	k := 10 * math.Pi * 0.0508 / (3 * 3900)
	if !near(p.Decay, k, 1e-15) || !near(p.Inlet(), 20+52*math.Exp(30*k), 1e-14) || !near(p.At(30), 72, 1e-14) {
		t.Errorf("profile %+v inlet %.9g", p, p.Inlet())
	}
	if !near(p.Inlet(), 72.2132265, 1e-8) {
		t.Errorf("inlet %.9g", p.Inlet())
	}
	// With heat loss the fastest particle gets more lethality than the isothermal tube
	// at the setpoint (it is hotter upstream), and the Simpson integral agrees with a
	// fine trapezoidal sum (independent quadrature) to 1e-8.
	o := Organism{D: 0.9, DTemperature: 71.7, Z: 6.3}
	lossy := HeatLossProfile(72, 20, 200, 0.0508, 0.5, 3900, 30)
	lr := LogReduction(lossy, 2, o)
	iso := LogReduction(Isothermal(72, 30), 2, o)
	pts := Accumulated(lossy, 2, o, 200000)
	if !(lr > iso) || !near(lr, pts[len(pts)-1].LogRed, 1e-8) {
		t.Errorf("lossy LR %.12g, isothermal %.12g, trapezoid %.12g", lr, iso, pts[len(pts)-1].LogRed)
	}
	// Isothermal integral against t/D.
	if got := LogReduction(Profile{Outlet: 72, Ambient: 72, Decay: 1e-3, Length: 30}, 2, o); !near(got, 15/o.DAt(72), 1e-12) {
		t.Errorf("isothermal via integral %g vs %g", got, 15/o.DAt(72))
	}
}

// pmo is the Grade "A" PMO continuous-flow table (docs/METHOD.md §10.2, as copied in
// Michigan Compiled Laws 288.697 and Texas 25 TAC §217.1).
var pmo = []LegalRow{{63, 1800}, {72, 15}, {89, 1}, {90, 0.5}, {94, 0.1}, {96, 0.05}, {100, 0.01}}

func TestJudgeLegal(t *testing.T) {
	tests := []struct {
		name     string
		setpoint float64
		tmin     float64
		met      bool
		row      LegalRow
	}{
		{"72.5 °C 16 s", 72.5, 16, true, LegalRow{72, 15}},
		{"72.5 °C 14 s", 72.5, 14, false, LegalRow{72, 15}},
		{"71.9 °C 20 s", 71.9, 20, false, LegalRow{63, 1800}},
		{"89.5 °C 1.2 s", 89.5, 1.2, true, LegalRow{89, 1}},
		// Never interpolate: at 80 °C a log-linear line through 72/15 and 89/1 (z = 14.45 °C)
		// would ask 15·10^(−8/14.45) = 4.19 s, and 5 s would pass; the table applies 72 °C/15 s.
		{"80 °C 5 s", 80, 5, false, LegalRow{72, 15}},
	}
	for _, tc := range tests {
		v := JudgeLegal(pmo, tc.setpoint, tc.tmin, 1e-9)
		if v.Met != tc.met || v.Row != tc.row {
			t.Errorf("%s: met %v row %+v, want %v %+v", tc.name, v.Met, v.Row, tc.met, tc.row)
		}
	}
	v := JudgeLegal(pmo, 72.5, 16.5, 1e-9)
	if !near(v.Margin, 1.5, 1e-12) || !near(v.MarginPct, 10, 1e-12) {
		t.Errorf("margin %g s %g %%", v.Margin, v.MarginPct)
	}
	if v := JudgeLegal(pmo, 60, 9999, 1e-9); v.Met || v.RowIndex != -1 {
		t.Errorf("below every row: %+v", v)
	}
	// The z-values the rows imply differ, which is why they are not one line:
	// (72 − 63)/log10(1800/15) = 4.33 °C, (89 − 72)/log10(15/1) = 14.45 °C (docs/METHOD.md §10.1).
	if z1, z2 := 9/math.Log10(120), 17/math.Log10(15); !near(z1, 4.33, 0.001) || !near(z2, 14.45, 0.001) {
		t.Errorf("implied z %g %g", z1, z2)
	}
}

func TestMaxFlowAndRequiredLength(t *testing.T) {
	// Laminar Newtonian throughout: t_min = V/(2Q), so Q_max = V/(2t) (hand-worked).
	tube := Tube{InnerDiameter: 0.0475, Length: 20}
	nw := Newtonian{Viscosity: 0.5} // very viscous: laminar at any flow here
	q := tube.MaxFlowFor(15, 1015, nw, 0, 0.01)
	if want := tube.Volume() / 30; !near(q, want, 1e-9) {
		t.Errorf("max flow %.12g, want %.12g", q, want)
	}
	h := tube.Hydraulics(Flow{Volumetric: 11.0 / 3600, Density: 1015}, nw, 0)
	if want := 15 * 2 * h.MeanVelocity; !near(h.RequiredLength(15), want, 1e-12) {
		t.Errorf("required length %g", h.RequiredLength(15))
	}
}

func TestWorstFlowBelowTheSeal(t *testing.T) {
	// docs/METHOD.md §7.7 worked example (computed by hand from the formulas):
	// ρ 1030 kg/m³, μ 5 mPa·s, 2 in sanitary tube (D = 1.870 in = 0.047498 m),
	// L = 20 m, seal 3000 L/h: v = 0.4703 m/s, Re = 4602, turbulent, r = 1.3184,
	// t_min = 32.25 s; v₄₀₀₀ = 4000·0.005/(1030·0.047498) = 0.40882 m/s,
	// Q₄₀₀₀ = 2608 L/h < 3000 L/h, so t_worst = 20/(2·0.40882) = 24.46 s.
	const d, rho, mu = 0.047498, 1030.0, 5e-3
	tube := Tube{InnerDiameter: d, Length: 20}
	nw := Newtonian{Viscosity: mu}
	v4 := 4000 * mu / (rho * d)
	tests := []struct {
		name     string
		seal     float64 // m³/s
		rheology Rheology
		override float64
		atSeal   bool
		time     float64 // s
		flow     float64 // m³/s
		regime   Regime
	}{
		{"turbulent seal: just below Re 4000", 3000 / 3.6e6, nw, 0, false, 20 / (2 * v4), v4 * tube.CrossSection(), Transitional},
		// Laminar at the seal (Re 2608/3000·4000 < 4000 when sealed at 2000 L/h):
		// t = L/(2v) falls with the flow, so the seal is the worst.
		{"laminar seal", 2000 / 3.6e6, nw, 0, true, 20 / (2 * (2000 / 3.6e6) / tube.CrossSection()), 2000 / 3.6e6, Transitional},
		// With an entered ratio the ratio is constant: the seal, t = L/(r_o v).
		{"entered ratio", 3000 / 3.6e6, nw, 2, true, 20 / (2 * (3000 / 3.6e6) / tube.CrossSection()), 3000 / 3.6e6, Turbulent},
		// Far above Re 4000 the seal's ratio (≈1.2) beats the laminar jump:
		// at 20 000 L/h t_seal = 20/(r·3.135) ≈ 5.3 s < L/(2 v₄₀₀₀) = 24.46 s.
		{"fast seal", 20000 / 3.6e6, nw, 0, true, 20 / (TurbulentFastestToMean(rho*(20000/3.6e6/tube.CrossSection())*d/mu) * 20000 / 3.6e6 / tube.CrossSection()),
			20000 / 3.6e6, Turbulent},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			w := tube.WorstFlow(Flow{Volumetric: tc.seal, Density: rho}, tc.rheology, tc.override)
			if w.AtSeal != tc.atSeal || w.Regime != tc.regime || !near(w.MinResidence, tc.time, 1e-12) || !near(w.Volumetric, tc.flow, 1e-12) {
				t.Errorf("worst %+v; want at seal %v, %v, t %.6g s at %.6g m³/s", w, tc.atSeal, tc.regime, tc.time, tc.flow)
			}
		})
	}
	// The worked example's numbers, to four digits.
	w := tube.WorstFlow(Flow{Volumetric: 3000 / 3.6e6, Density: rho}, nw, 0)
	if !near(w.MinResidence, 24.46, 0.0005) || !near(w.Volumetric*3.6e6, 2608, 0.0005) {
		t.Errorf("worked example: %.4g s at %.4g L/h", w.MinResidence, w.Volumetric*3.6e6)
	}
	// A power-law product: v₄₀₀₀ from the inverted Metzner–Reed number gives Re_MR = 4000.
	pl := PowerLaw{N: 0.65, K: 0.02}
	if re := pl.Reynolds(rho, pl.VelocityAt(4000, rho, d), d); !near(re, 4000, 1e-12) {
		t.Errorf("power law: Re at v₄₀₀₀ = %.15g", re)
	}
	// Its worst flow (docs/METHOD.md §7.7, hand formula): n = 0.65, K = 0.02 Pa·s^0.65,
	// v₄₀₀₀ = [4000 K 8^(n−1) ((3n+1)/(4n))ⁿ / (ρ Dⁿ)]^(1/(2−n)), r_lam = 2.95/1.65,
	// t_worst = L/(r_lam v₄₀₀₀) = L/(1.788 v₄₀₀₀), for a seal of 1.2 v₄₀₀₀ (Re_MR = 4000·1.2^1.35 = 5119,
	// turbulent, r ≈ 1.31: t_seal = L/(1.57 v₄₀₀₀), longer).
	n := 0.65
	v4pl := math.Pow(4000*0.02*math.Pow(8, n-1)*math.Pow((3*n+1)/(4*n), n)/(rho*math.Pow(d, n)), 1/(2-n))
	w = tube.WorstFlow(Flow{Volumetric: 1.2 * v4pl * tube.CrossSection(), Density: rho}, pl, 0)
	if w.AtSeal || !near(w.MinResidence, 20/(2.95/1.65*v4pl), 1e-12) || !near(w.Volumetric, v4pl*tube.CrossSection(), 1e-12) {
		t.Errorf("power law worst flow %+v; want t %.6g s", w, 20/(2.95/1.65*v4pl))
	}
}

func TestMaxFlowOverTheTurbulentJump(t *testing.T) {
	// 20 m of 2 in tube, μ 5 mPa·s, ρ 1030, a 24.71 s row. Laminar flows meet it
	// up to Q_a = V/(2·24.71) = 2581.5 L/h; Q₄₀₀₀ = 2608 L/h; between them the
	// fastest particle has less than 24.71 s, so the answer is Q_a (a scan on a
	// grid stepped over this band and gave 3958 L/h).
	tube := Tube{InnerDiameter: 0.047498, Length: 20}
	nw := Newtonian{Viscosity: 5e-3}
	qa := tube.Volume() / (2 * 24.71)
	if q := tube.MaxFlowFor(24.71, 1030, nw, 0, 0.1); !near(q, qa, 1e-12) || !near(q*3.6e6, 2581.5, 1e-4) {
		t.Errorf("max flow %.6g L/h, want %.6g L/h", q*3.6e6, qa*3.6e6)
	}
	// A shorter row is met by every laminar flow and up to the turbulent root of
	// t_min(Q) = 20 s, found to 1e-12 relative: t_min there is 20 s.
	q := tube.MaxFlowFor(20, 1030, nw, 0, 0.1)
	h := tube.Hydraulics(Flow{Volumetric: q, Density: 1030}, nw, 0)
	if q <= tube.TurbulentOnsetFlow(1030, nw) || h.Regime != Turbulent || !near(h.MinResidence, 20, 1e-11) {
		t.Errorf("turbulent root: %.6g L/h, %v, t %.15g", q*3.6e6, h.Regime, h.MinResidence)
	}
	// With an entered ratio: V/(r_o t).
	if q := tube.MaxFlowFor(20, 1030, nw, 1.5, 0.1); !near(q, tube.Volume()/30, 1e-12) {
		t.Errorf("entered ratio: %g", q)
	}
	// Capped at hi when every flow up to it meets the row.
	if q := tube.MaxFlowFor(0.01, 1030, nw, 0, 0.001); !near(q, 0.001, 1e-15) {
		t.Errorf("capped: %g", q)
	}
}
