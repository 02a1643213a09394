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
