package assess

// Source of the expectations: the one rule for "the same temperature"
// (units.SameTemperature); 20.1 °C and 293.25 K differ by 2e-14 K after
// conversion (the IEEE 754 rounding of 293.25 − 273.15, computed).

import (
	"fmt"
	"strings"
	"testing"

	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/lethality"
)

// TestSameTemperatureOneRule: validation refuses two viscosity points exactly
// when the curve builder would, so an accepted plant always has a curve.
func TestSameTemperatureOneRule(t *testing.T) {
	for _, second := range []string{"20.1 °C", "293.25 K", "68.18 °F", "20.1000001 °C", "20.1000009 °C", "20.100001 °C",
		"20.1000011 °C", "20.101 °C", "21 °C", "-252.05 °C"} {
		src := fmt.Sprintf(`product:
  name: test milk
  density: 1030 kg/m3
  specific_heat: 3.93 kJ/(kg*K)
  viscosity:
    - {at: 20.1 °C, value: 1.1 mPa*s}
    - {at: %s, value: 1.0 mPa*s}
flow:
  rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72.5 °C
holding_tube:
  sanitary_tube: 2 in
  length: 34 m
`, second)
		p, err := plantfile.Parse("p.yaml", []byte(src))
		if err != nil {
			t.Fatalf("%s: %v", second, err)
		}
		verr := plantfile.Validate(p)
		var pts []props.ViscosityPoint
		for _, v := range p.Product.Viscosity {
			pts = append(pts, props.ViscosityPoint{TempC: v.At.SI, Viscosity: v.Value.SI})
		}
		_, cerr := props.NewViscosityCurve(pts)
		if (verr != nil) != (cerr != nil) {
			t.Errorf("%s: validation %v, curve %v: the two disagree", second, verr, cerr)
		}
		if verr != nil && !strings.HasPrefix(verr.Error(), "p.yaml:7:") || verr != nil && !strings.Contains(verr.Error(), "product.viscosity[1].at") {
			t.Errorf("%s: %v; want the second point, line 7", second, verr)
		}
		if verr == nil {
			if _, err := Run(p); err != nil {
				t.Errorf("%s: accepted but not computed: %v", second, err)
			}
		}
	}
}

// TestEvaluateHoldingReportsCurveErrors: a curve the builder refuses is an
// error from EvaluateHolding, never an empty curve.
func TestEvaluateHoldingReportsCurveErrors(t *testing.T) {
	in := HoldingInputs{MaxMassFlow: 3, MassFlow: 3, Density: 1030, SpecificHeat: 3900, InnerDiameter: 0.0475, Length: 34,
		MinSlope: lethality.DefaultMinSlope, Setpoint: 72.5,
		Viscosity: []props.ViscosityPoint{{TempC: 20.1, Viscosity: 1.1e-3}, {TempC: 293.25 - 273.15, Viscosity: 1e-3}}}
	if _, err := EvaluateHolding(in); err == nil || !strings.Contains(err.Error(), "viscosity") {
		t.Fatalf("err %v; want the curve's refusal", err)
	}
}
