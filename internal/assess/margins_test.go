package assess

// Sources of the expected values: docs/METHOD.md §14.5 (the method's own
// checks): with every tolerance zero the margins are the nominal check; the
// closed form P = (Q_c − a)/(b − a) for t_min = V/(2Q) with Q uniform on
// [a, b] (computed by hand below); the standard error √(P(1 − P)/N) of a
// binomial proportion (common practice) for the statistical tolerances.

import (
	"encoding/json"
	"math"
	"runtime"
	"testing"

	"pasval/internal/plantfile"
)

func demoMargins(t *testing.T, opts MarginOptions, edit func(p *plantfile.Plant)) (*Result, *Margins) {
	t.Helper()
	p := load(t, string(mustRead(t, "../../testdata/demo/htst-milk-si.yaml")))
	if edit != nil {
		edit(p)
	}
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	m, err := RunMargins(p, res, opts)
	if err != nil {
		t.Fatal(err)
	}
	return res, m
}

func near(a, b, rel float64) bool { return math.Abs(a-b) <= rel*math.Max(math.Abs(b), 1e-300) }

func TestMarginsWithZeroTolerancesAreTheCheck(t *testing.T) {
	// Every tolerance zero: the worst case and every percentile equal the
	// nominal check (docs/METHOD.md §14.5); 1e-12 relative.
	res, m := demoMargins(t, MarginOptions{Samples: 3000, Seed: 1}, func(p *plantfile.Plant) {
		for i := range p.Uncertainty {
			p.Uncertainty[i].Value = 0
		}
	})
	want := res.HoldingTube.WorstMinResidenceS
	mc := m.MonteCarlo
	for what, got := range map[string]float64{"worst case": m.WorstCase.MinResidenceS, "p01": mc.MinResidenceS.P01,
		"p05": mc.MinResidenceS.P05, "p50": mc.MinResidenceS.P50, "nominal": m.Nominal.MinResidenceS} {
		if !near(got, want, 1e-12) {
			t.Errorf("fastest particle, %s: %.15g, check %.15g", what, got, want)
		}
	}
	for i, l := range res.Lethality {
		name := m.Organisms[i]
		p := mc.LogReductionByOrganism[name]
		for what, got := range map[string]float64{"worst case": m.WorstCase.LogReductionByOrganism[name], "p01": p.P01, "p05": p.P05, "p50": p.P50} {
			if !near(got, l.LogReduction, 1e-12) {
				t.Errorf("%s, %s: %.15g, check %.15g", name, what, got, l.LogReduction)
			}
		}
	}
	for k, c := range res.HoldingTube.Model.Eval.Checks {
		w := m.WorstCase.Checks[k]
		if w.Pass != c.Pass || !near(w.Actual, c.Actual, 1e-12) {
			t.Errorf("worst case %s: %v %.15g, check %v %.15g", c.ID, w.Pass, w.Actual, c.Pass, c.Actual)
		}
		if p := mc.Checks[k].Probability; p != map[bool]float64{true: 1, false: 0}[c.Pass] {
			t.Errorf("P(%s) = %g with no variation", c.ID, p)
		}
	}
	for _, s := range m.Sensitivity {
		if s.SwingS != 0 {
			t.Errorf("%s swings %g s with a zero tolerance", s.Field, s.SwingS)
		}
	}
}

// closedFormPlant has fastest_to_mean 2.0, so t_min = V/(2Q) at every flow,
// and only the sealed maximum varies, uniform on ±5 %.
const closedFormPlant = `
product:
  name: test product
  density: 1000 kg/m3
  specific_heat: 4 kJ/(kg*K)
  viscosity: [{at: 72 °C, value: 1 mPa*s}]
flow: {max_rate: 4700 L/h}
process: {raw_inlet: 5 °C, hold_setpoint: 72 °C}
holding_tube: {inner_diameter: 50 mm, length: 20 m, fastest_to_mean: 2}
legal_minimums: [{temperature: 72 °C, time: 15 s}]
uncertainty:
  flow.max_rate: {tolerance: ±5 %, distribution: uniform}
`

func TestMarginsClosedForm(t *testing.T) {
	// V = π/4 · 0.05² · 20 = 0.0392699 m³; t_min = V/(2Q) ≥ 15 s ⇔ Q ≤ Q_c = V/30
	// = 1.308997e-3 m³/s = 4712.39 L/h. Q uniform on [a, b] = 4700 ± 235 L/h:
	// P = (Q_c − a)/(b − a) = (4712.39 − 4465)/470 = 0.52636 (computed by hand).
	p := load(t, closedFormPlant)
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	m, err := RunMargins(p, res, MarginOptions{Samples: 200000, Seed: DefaultSeed})
	if err != nil {
		t.Fatal(err)
	}
	vol := math.Pi / 4 * 0.05 * 0.05 * 20
	a, b := 4.7*0.95/3600, 4.7*1.05/3600 // m³/s
	qc := vol / 30
	want := (qc - a) / (b - a)
	got := m.MonteCarlo.Checks[0]
	if got.ID != HoldingTime || math.Abs(got.Probability-want) > 3*got.StandardError {
		t.Errorf("P(holding-time) = %.5f ± %.5f, closed form %.5f", got.Probability, got.StandardError, want)
	}
	w := m.WorstCase.Checks[0]
	if !near(w.Actual, vol/(2*b), 1e-12) || w.Ends["flow.max_rate"] != "high" || w.Pass {
		t.Errorf("worst case %.15g s at %v, want V/(2b) = %.15g s at the high end, failing", w.Actual, w.Ends, vol/(2*b))
	}
	if !near(m.WorstCase.MinResidenceS, vol/(2*b), 1e-12) {
		t.Errorf("worst fastest particle %.15g, want %.15g", m.WorstCase.MinResidenceS, vol/(2*b))
	}
	// Nearest-rank p50 of V/(2Q): Q's median b − (b − a)/2 within sampling error.
	if p50 := m.MonteCarlo.MinResidenceS.P50; !near(p50, vol/(2*4.7/3600), 2e-3) {
		t.Errorf("p50 %.6g, want about %.6g", p50, vol/(2*4.7/3600))
	}
}

func TestMarginsReproduce(t *testing.T) {
	// Same seed: byte-identical JSON; another seed: every probability within
	// four standard errors of the first (docs/METHOD.md §14.5).
	_, m1 := demoMargins(t, MarginOptions{Samples: 20000, Seed: 3}, nil)
	_, m2 := demoMargins(t, MarginOptions{Samples: 20000, Seed: 3}, nil)
	_, m3 := demoMargins(t, MarginOptions{Samples: 20000, Seed: 4}, nil)
	j1, _ := json.Marshal(m1)
	j2, _ := json.Marshal(m2)
	if string(j1) != string(j2) {
		t.Error("the same seed gave different results")
	}
	for k, a := range m1.MonteCarlo.Checks {
		b := m3.MonteCarlo.Checks[k]
		se := math.Hypot(a.StandardError, b.StandardError)
		if math.Abs(a.Probability-b.Probability) > 4*se+1e-12 {
			t.Errorf("%s: P %.4f (seed 3) and %.4f (seed 4) differ by more than 4 SE (%.4f)", a.ID, a.Probability, b.Probability, se)
		}
	}
	if string(j1) == func() string { j, _ := json.Marshal(m3); return string(j) }() {
		t.Error("another seed gave the same draws")
	}
}

func TestPercentilesNearestRank(t *testing.T) {
	// Nearest rank ⌈q·N⌉ of 1..200 shuffled: p01 = 2, p05 = 10, p50 = 100 (by hand).
	x := make([]float64, 200)
	for i := range x {
		x[i] = float64((i*77)%200 + 1)
	}
	if p := percentiles(x); p.P01 != 2 || p.P05 != 10 || p.P50 != 100 {
		t.Errorf("percentiles %+v, want 2, 10, 100", p)
	}
}

// BenchmarkMarginsSample is one Monte Carlo sample of the SI demo (eleven
// inputs drawn, the judged core, the counts), per core: the README's
// samples per second per core is 1e9 / (ns/op).
func BenchmarkMarginsSample(b *testing.B) {
	p := load(&testing.T{}, string(mustReadB(b, "../../testdata/demo/htst-milk-si.yaml")))
	res, err := Run(p)
	if err != nil {
		b.Fatal(err)
	}
	m, err := newMarginModel(p, res)
	if err != nil {
		b.Fatal(err)
	}
	b.SetParallelism(1)
	b.ResetTimer()
	if _, _, err := m.monteCarlo(p, MarginOptions{Samples: b.N, Seed: DefaultSeed}); err != nil {
		b.Fatal(err)
	}
	b.ReportMetric(float64(runtime.GOMAXPROCS(0)), "cores")
}
