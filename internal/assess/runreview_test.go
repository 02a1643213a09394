package assess

import (
	"math"
	"os"
	"strings"
	"testing"

	"pasval/internal/plantfile"
	"pasval/lethality"
)

func loadText(t *testing.T, name, text string) *plantfile.Plant {
	t.Helper()
	p, err := plantfile.Parse(name, []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func demoText(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("../../testdata/demo/htst-milk-si.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestRunModelOfTheDemo: the run model carries the plant file's tube,
// product, limits and criteria (values as entered in
// testdata/demo/htst-milk-si.yaml), and the viscosity at each recorded
// temperature from the entered points (docs/METHOD.md §4: ln μ linear in T).
func TestRunModelOfTheDemo(t *testing.T) {
	rm, err := NewRunModel(loadText(t, "demo.yaml", demoText(t)))
	if err != nil {
		t.Fatal(err)
	}
	m := rm.Model
	mu := func(temp float64) float64 { return m.RheologyAt(temp).(lethality.Newtonian).Viscosity }
	cases := []struct {
		what      string
		got, want float64
	}{
		{"inner diameter, m", m.Tube.InnerDiameter, 1.870 * 0.0254}, // 2 in sanitary tube, 0.065 in wall (docs/METHOD.md §7.1, from memory)
		{"length, m", m.Tube.Length, 34},
		{"density, kg/m³", m.Density, 1031},
		{"sealed maximum, m³/s", m.MaxFlow, 11000.0 / 3.6e6},
		{"setpoint, °C", m.Setpoint, 72.5},
		{"μ at 40 °C, Pa·s", mu(40), 1.35e-3},
		{"μ at 72.5 °C, Pa·s", mu(72.5), 0.72e-3},
		// Half-way in ln μ between 40 and 72.5 °C: √(1.35 × 0.72) mPa·s.
		{"μ at 56.25 °C, Pa·s", mu(56.25), math.Sqrt(1.35e-3 * 0.72e-3)},
		{"μ at 80 °C, Pa·s", mu(80), 0.64e-3},
		{"μ at 90 °C (held), Pa·s", mu(90), 0.64e-3},
		{"Listeria required", m.Organisms[1].RequiredLogReduction, 5},
		{"first legal row, s", m.Legal[0].Time, 15},
	}
	for _, c := range cases {
		if math.Abs(c.got-c.want) > 1e-9*math.Abs(c.want) {
			t.Errorf("%s = %.12g, want %.12g", c.what, c.got, c.want)
		}
	}
	if m.FastestToMean != 0 || len(m.Organisms) != 2 || m.Organisms[0].RequiredLogReduction != 0 {
		t.Errorf("override %g, organisms %+v", m.FastestToMean, m.Organisms)
	}
	// Density as entered: the same at the raw inlet and in the tube, so
	// recorded flows pass unchanged.
	if rm.TubeFlow(0.003, false) != 0.003 || rm.Recorded(0.003) != 0.003 {
		t.Errorf("flows changed: %g, %g", rm.TubeFlow(0.003, false), rm.Recorded(0.003))
	}
}

// TestRunModelFromComposition: with the density from the composition, a
// recorded volumetric flow is taken at the raw inlet (as flow.max_rate) and
// becomes the tube's flow over the density at the setpoint; a mass flow
// over the tube's density; volumes go back to the recorded terms.
func TestRunModelFromComposition(t *testing.T) {
	text := strings.Replace(demoText(t), "  density: 1031 kg/m3\n",
		"  composition: {water: 0.878, protein: 0.032, fat: 0.035, carbohydrate: 0.048, ash: 0.007}\n", 1)
	text = strings.Replace(text, "hold_setpoint: 72.5 °C", "hold_setpoint: 72 °C", 1)
	rm, err := NewRunModel(loadText(t, "composition.yaml", text))
	if err != nil {
		t.Fatal(err)
	}
	// Choi–Okos milk (87.8 % water, 3.2 % protein, 3.5 % fat, 4.8 %
	// carbohydrate, 0.7 % ash) at 72 °C: ρ ≈ 1005.0 kg/m³ (docs/METHOD.md §2,
	// computed from the table).
	if math.Abs(rm.HoldDensity-1005.0) > 0.1 || !(rm.ProductDensity > rm.HoldDensity) {
		t.Fatalf("densities: product %g, tube %g", rm.ProductDensity, rm.HoldDensity)
	}
	q := 10000.0 / 3.6e6
	if got, want := rm.TubeFlow(q, false), q*rm.ProductDensity/rm.HoldDensity; math.Abs(got-want) > 1e-15 {
		t.Errorf("tube flow %g, want %g", got, want)
	}
	if got, want := rm.TubeFlow(3, true), 3/rm.HoldDensity; math.Abs(got-want) > 1e-15 {
		t.Errorf("tube flow of 3 kg/s %g, want %g", got, want)
	}
	if got := rm.Recorded(rm.TubeFlow(q, false)); math.Abs(got-q) > 1e-15 {
		t.Errorf("round trip %g, want %g", got, q)
	}
	// The seal in the tube is its mass over the tube's density, like any
	// recorded flow: an 11 000 L/h reading is exactly at it.
	if got := rm.TubeFlow(11000/3.6e6, false); math.Abs(got-rm.Model.MaxFlow) > 1e-12*got {
		t.Errorf("seal %g, recorded seal in the tube %g", rm.Model.MaxFlow, got)
	}
}
