package units

// Source of the invariants: the parser's own contract (finite values, a
// parse → print → parse round trip); conversion factors are tested against
// NIST SP 811 in units_test.go.

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

var fuzzKinds = []Kind{Temperature, TemperatureDifference, Length, Area, VolumeFlow, MassFlow, Time, Pressure, Density,
	SpecificHeat, Viscosity, HeatTransferCoefficient, FoulingResistance, ThermalConductivity, Power, Dimensionless, Angle, ConsistencyKind(0.7)}

// FuzzParse checks the unit parser's invariants on any input: it never
// panics, a parsed value is finite, and writing the parsed number and unit
// back gives the same SI value (round trip).
func FuzzParse(f *testing.F) {
	for _, s := range []string{"72.5 °C", "161 °F", "10000 L/h", "44 gpm", "3.93 kJ/(kg*K)", "0.94 Btu/(lb*°F)",
		"3300 W/(m2*K)", "580 Btu/(h*ft2*°F)", "0.35 Pa*s^0.7", "2.9 mPa*s", "1e-4 m2*K/W", "92 %", "1.2 bar",
		"((((m))))", "1 m^1e308", "-0 K", "5 kg K", "1 W/m²/K", "0x10 L/h", "1,5 m", ".5 in", "5. ft", "1e4", "", "60 deg", "60°", "1 rad", "72 °",
		"1.7e308 °F", "-1.7e308 degF", "1.7e308 K", "1e308 kW"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, k := range fuzzKinds {
			v, err := Parse(s, k)
			if err != nil {
				if err.Error() == "" {
					t.Fatalf("empty error for %q", s)
				}
				continue
			}
			if math.IsNaN(v.SI) || math.IsInf(v.SI, 0) {
				t.Fatalf("Parse(%q, %s) = %v, not finite", s, k.Name, v.SI)
			}
			again := fmt.Sprintf("%.17g %s", v.Number, v.Unit)
			if v.Unit == "" {
				again = fmt.Sprintf("%.17g", v.Number)
			}
			w, err := Parse(again, k)
			if err != nil {
				t.Fatalf("round trip of %q as %q failed: %v", s, again, err)
			}
			if w.SI != v.SI && math.Abs(w.SI-v.SI) > 1e-12*math.Abs(v.SI) {
				t.Fatalf("round trip of %q: %v then %v", s, v.SI, w.SI)
			}
			if strings.ContainsAny(v.Unit, "\n\r") {
				t.Fatalf("unit with a line break accepted: %q", s)
			}
		}
	})
}
