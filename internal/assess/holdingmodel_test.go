package assess

// Source of the expected values: hand calculations from the conventions of
// docs/METHOD.md (holding tube): v = Q/(πD²/4), Re = ρvD/μ, laminar ratio 2,
// t_min = L/(2v), LR = t_min/D(T_set) in an isothermal tube.

import (
	"errors"
	"math"
	"testing"

	"pasval/internal/props"
	"pasval/lethality"
)

func TestEvaluateHoldingByHand(t *testing.T) {
	// D = 0.05 m, v = 0.5 m/s → Q = 0.5·π·0.05²/4 = 9.8175e-4 m³/s; ρ = 1000, μ = 0.1 Pa·s:
	// Re = 1000·0.5·0.05/0.1 = 250, laminar, ratio 2; L = 10 m: t_min = 10/(2·0.5) = 10 s.
	// Row 72 °C / 15 s: fails by 5 s. D 1 s at 72 °C, setpoint 72 °C: LR = 10/1 = 10 ≥ 5.
	q := 0.5 * math.Pi * 0.05 * 0.05 / 4
	in := HoldingInputs{MaxMassFlow: q * 1000, MassFlow: q * 1000, Density: 1000, SpecificHeat: 4000,
		InnerDiameter: 0.05, Length: 10, Rise: 0.25, RiseGiven: true, MinSlope: lethality.DefaultMinSlope, Setpoint: 72,
		Viscosity: []props.ViscosityPoint{{TempC: 72, Viscosity: 0.1}},
		Organisms: []lethality.Organism{{Name: "test", D: 1, DTemperature: 72, Z: 5, RequiredLogReduction: 5}}, Judged: []bool{true},
		Legal: []lethality.LegalRow{{Temperature: 72, Time: 15}}}
	ev, err := EvaluateHolding(in)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"Re", ev.Hyd.Reynolds, 250}, {"ratio", ev.Hyd.FastestToMean, 2}, {"t_min", ev.Hyd.MinResidence, 10}, {"LR", ev.Organisms[0].LogReduction, 10},
	} {
		if math.Abs(c.got-c.want) > 1e-9*c.want {
			t.Errorf("%s = %.12g, want %g", c.what, c.got, c.want)
		}
	}
	ht, _ := ev.Check(HoldingTime)
	lr, _ := ev.Check(LogReduction)
	slope, _ := ev.Check(TubeSlope)
	if ht.Pass || math.Abs(ht.Margin+5) > 1e-9 || !lr.Pass || !slope.Pass || len(ev.Warnings) != 1 || ev.Warnings[0].Code != WarnLaminarFlow {
		t.Errorf("checks %+v %+v %+v warnings %+v", ht, lr, slope, ev.Warnings)
	}
	// An absurd heat loss is a typed error carrying the loss.
	in.HeatLoss, in.Ambient, in.OuterCoefficient, in.OuterDiameter = true, 20, 5000, 0.06
	var hl *HeatLossError
	if _, err := EvaluateHolding(in); !errors.As(err, &hl) || !(hl.Loss > MaxTubeHeatLoss) {
		t.Errorf("heat loss: %v", err)
	}
}

func BenchmarkEvaluateHolding(b *testing.B) {
	// The model alone, as a Monte Carlo loop would call it: the SI demo's tube.
	p := load(&testing.T{}, string(mustReadB(b, "../../testdata/demo/htst-milk-si.yaml")))
	res, err := Run(p)
	if err != nil {
		b.Fatal(err)
	}
	in := GatherHolding(p, res.Product)
	for b.Loop() {
		if _, err := EvaluateHolding(in); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkJudgeHolding(b *testing.B) {
	// The judged core alone, with its tables prepared once and its slices
	// reused: what each Monte Carlo sample of margins costs (the SI demo).
	p := load(&testing.T{}, string(mustReadB(b, "../../testdata/demo/htst-milk-si.yaml")))
	res, err := Run(p)
	if err != nil {
		b.Fatal(err)
	}
	in := GatherHolding(p, res.Product)
	tables, err := NewHoldingTables(&in)
	if err != nil {
		b.Fatal(err)
	}
	var ev HoldingEval
	b.ReportAllocs()
	for b.Loop() {
		if err := ev.Judge(&in, tables); err != nil {
			b.Fatal(err)
		}
	}
}

// creditCase is an invented flavoured-milk tube whose worst flow lies below
// the seal and whose plant file takes the heat-loss credit: 950 kg/h sealed,
// 35 mm bore (38.1 mm outside), 15 m, ρ 1035 kg/m³, c_p 3900 J/(kg·K), μ
// ln-linear between 2.2 mPa·s at 72 °C and 1.6 mPa·s at 90 °C, setpoint 72.3 °C
// with a 0.3 K sensor (judged at 72.0 °C), 22 °C room, h_o 25 W/(m²·K);
// Listeria D₇₁.₇ = 0.9 s, z = 6.3 °C (Bradshaw et al. 1985).
func creditCase() HoldingInputs {
	m := 950 / 3600.0
	return HoldingInputs{MaxMassFlow: m, MassFlow: 800 / 3600.0, Density: 1035, SpecificHeat: 3900,
		InnerDiameter: 0.035, OuterDiameter: 0.0381, Length: 15, MinSlope: lethality.DefaultMinSlope,
		Setpoint: 72.3, SensorAccuracy: 0.3,
		Viscosity: []props.ViscosityPoint{{TempC: 10, Viscosity: 7e-3}, {TempC: 72, Viscosity: 2.2e-3}, {TempC: 90, Viscosity: 1.6e-3}},
		HeatLoss:  true, Ambient: 22, OuterCoefficient: 25, CreditHeatLoss: true,
		Organisms: []lethality.Organism{{Name: "Listeria monocytogenes", D: 0.9, DTemperature: 71.7, Z: 6.3, RequiredLogReduction: 20}},
		Judged:    []bool{true}, Legal: []lethality.LegalRow{{Temperature: 72, Time: 15}}}
}

func TestHeatLossCreditUsesTheSealProfile(t *testing.T) {
	// docs/METHOD.md §8, §9.4: the credited log reduction is the profile at
	// ṁ(max_rate) with the outlet at the judged temperature, the fastest
	// particle moving at the worst flow's speed. Expected values computed with
	// python3 (scipy.integrate.quad, relative tolerance 1e-13) from those
	// formulas: μ(72.3 °C) = 2.18835 mPa·s, Re at the seal 4387 (r = 1.32101,
	// t_min 42.848 s), v₄₀₀₀ = 4000μ/(ρD) = 0.241640 m/s (836.9 L/h), t_worst =
	// 15/(2 v₄₀₀₀) = 31.0379 s;
	//   k = h_o π D_o/(ṁ_max c_p), t(x) = 22 + (72 − 22)·exp(k (15 − x)),
	//   LR = ∫₀¹⁵ dx / (2 v₄₀₀₀ · 0.9·10^((71.7 − t(x))/6.3)).
	// The profile at the worst flow's own mass flow (836.9 L/h × 1035 kg/m³)
	// would give 62.0247208947: more credit, which the convention refuses.
	in := creditCase()
	ev, err := EvaluateHolding(in)
	if err != nil {
		t.Fatal(err)
	}
	if ev.Worst.AtSeal {
		t.Fatalf("the case no longer has its worst flow below the seal: %+v", ev.Worst)
	}
	o := ev.Organisms[0]
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"worst time", ev.Worst.MinResidence, 31.037878616849486},  // python3, above
		{"judged (credited)", o.LogReduction, 59.2705060411},       // python3, above
		{"credit", o.Credit, 59.2705060411},                        // the same value, shown
		{"at the seal, credited", o.AtSeal, 81.8233938535},         // python3: the seal's u_max = r v
		{"at the setpoint, credited", o.AtSetpoint, 66.3215346021}, // python3: outlet at 72.3 °C
		{"isothermal", o.Isothermal, 38.4829687888},                // t_worst / (0.9·10^((71.7 − 72)/6.3))
	} {
		if math.Abs(c.got-c.want) > 1e-8*c.want {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	if math.Abs(o.FlowM3s-ev.Worst.Volumetric) > 1e-12*o.FlowM3s {
		t.Errorf("judged at %g m³/s, want the worst flow %g", o.FlowM3s, ev.Worst.Volumetric)
	}
}

func TestHeatLossCreditNeverExceedsTheSealProfile(t *testing.T) {
	// Whatever the outer coefficient and the seal, the credited log reduction
	// is at most that of the profile at ṁ(max_rate) (outlet at the judged
	// temperature) with the particle at the worst flow's speed, and equal to
	// it (docs/METHOD.md §9.4); the worst flow's own, steeper profile would
	// give more. A property of the method: no outside value.
	for _, ho := range []float64{0.5, 5, 25, 60} {
		for _, kgh := range []float64{860, 950, 1200, 2000} {
			in := creditCase()
			in.OuterCoefficient, in.MaxMassFlow = ho, kgh/3600
			ev, err := EvaluateHolding(in)
			if err != nil {
				t.Fatal(err)
			}
			w := ev.Worst
			seal := lethality.HeatLossProfile(ev.JudgedC, in.Ambient, ho, in.OuterDiameter, in.MaxMassFlow, in.SpecificHeat, in.Length)
			bound := lethality.LogReduction(seal, w.FastestToMean*w.MeanVelocity, in.Organisms[0])
			own := lethality.HeatLossProfile(ev.JudgedC, in.Ambient, ho, in.OuterDiameter, w.Volumetric*in.Density, in.SpecificHeat, in.Length)
			ownLR := lethality.LogReduction(own, w.FastestToMean*w.MeanVelocity, in.Organisms[0])
			o := ev.Organisms[0]
			if !(o.LogReduction <= bound*(1+1e-12)) || math.Abs(o.LogReduction-bound) > 1e-12*bound || math.Abs(o.Credit-bound) > 1e-12*bound {
				t.Errorf("h_o %g, seal %g kg/h: judged %.12g, credit %.12g, profile at the seal %.12g", ho, kgh, o.LogReduction, o.Credit, bound)
			}
			if !w.AtSeal && !(ownLR > bound) {
				t.Errorf("h_o %g, seal %g kg/h: the worst flow's own profile gives %.12g, not above %.12g", ho, kgh, ownLR, bound)
			}
		}
	}
}

// creditPlant is creditCase as a plant file (invented), holding tube only.
const creditPlant = `product:
  name: flavoured milk
  density: 1035 kg/m3
  specific_heat: 3.9 kJ/(kg*K)
  viscosity:
    - {at: 10 °C, value: 7 mPa*s}
    - {at: 72 °C, value: 2.2 mPa*s}
    - {at: 90 °C, value: 1.6 mPa*s}
flow:
  rate: 800 kg/h
  max_rate: 950 kg/h
process:
  raw_inlet: 7 °C
  hold_setpoint: 72.3 °C
  sensor_accuracy: 0.3 °C
holding_tube:
  inner_diameter: 35 mm
  outer_diameter: 38.1 mm
  length: 15 m
  rise: 35 cm
  ambient: 22 °C
  outer_coefficient: 25 W/(m2*K)
  credit_heat_loss: true
legal_minimums:
  - {temperature: 72 °C, time: 15 s}
organisms:
  - name: Listeria monocytogenes
    D: 0.9 s
    D_temperature: 71.7 °C
    z: 6.3 °C
    required_log_reduction: 20
`

func TestSetpointTableTakesTheSealProfile(t *testing.T) {
	// hold's table judges each setpoint as check judges the entered one
	// (docs/METHOD.md §9.5): with the credit, the profile at ṁ(max_rate) moved
	// with the outlet. The entered setpoint's row is check's judged value; the
	// row 0.3 K up is judged at 72.3 °C, the value check shows at the setpoint
	// (66.3215346021, python3 as in TestHeatLossCreditUsesTheSealProfile).
	res, err := Run(load(t, creditPlant))
	if err != nil {
		t.Fatal(err)
	}
	rows, err := SetpointTable(res, []float64{0, 0.3})
	if err != nil {
		t.Fatal(err)
	}
	l := res.Lethality[0]
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"entered setpoint's row", rows[0].LogReductions[0], l.LogReduction},
		{"judged (python3)", l.LogReduction, 59.2705060411},
		{"row 0.3 K up", rows[1].LogReductions[0], 66.3215346021},
		{"at the setpoint (python3)", l.LogReductionAtSet, 66.3215346021},
	} {
		if math.Abs(c.got-c.want) > 1e-8*c.want {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
}
