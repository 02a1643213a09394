package units

// Source of the expected values: NIST SP 811 (2008) Appendix B conversion
// factors, cited beside each case.

import (
	"math"
	"strings"
	"testing"
)

func TestParse(t *testing.T) {
	// Conversion factors: NIST SP 811 (2008), Appendix B, exact definitions of
	// the inch, foot, pound, US gallon and IT Btu; psi from lbf = 9.80665 N.
	tests := []struct {
		name string
		in   string
		kind Kind
		want float64
		tol  float64
		sys  System
	}{
		{"celsius", "72.5 °C", Temperature, 72.5, 1e-12, SI},
		{"celsius no space", "72.5°C", Temperature, 72.5, 1e-12, SI},
		{"degC", "72 degC", Temperature, 72, 1e-12, SI},
		// 161 °F = 71.666… °C by definition of the Fahrenheit scale.
		{"fahrenheit", "161 °F", Temperature, 71.66666666666667, 1e-12, US},
		{"kelvin", "300 K", Temperature, 26.85, 1e-12, SI},
		{"diff F", "9 °F", TemperatureDifference, 5, 1e-12, US},
		{"diff C", "6.3 °C", TemperatureDifference, 6.3, 1e-12, SI},
		{"L/h", "10000 L/h", VolumeFlow, 10.0 / 3600, 1e-15, SI},
		{"m3/h", "36 m3/h", VolumeFlow, 0.01, 1e-15, SI},
		{"m3/s", "0.01 m3/s", VolumeFlow, 0.01, 1e-15, SI},
		{"L/min", "60 L/min", VolumeFlow, 1e-3, 1e-15, SI},
		// 1 gal = 231 in³ = 3.785411784 L (NIST SP 811).
		{"gpm", "1 gpm", VolumeFlow, 3.785411784e-3 / 60, 1e-18, US},
		{"gal/h", "3600 gal/h", VolumeFlow, 3.785411784e-3, 1e-15, US},
		{"kg/h", "3600 kg/h", MassFlow, 1, 1e-12, SI},
		{"lb/h", "3600 lb/h", MassFlow, 0.45359237, 1e-12, US},
		{"kg/s", "2 kg/s", MassFlow, 2, 1e-12, SI},
		{"min", "30 min", Time, 1800, 1e-9, SI},
		{"h", "1.5 h", Time, 5400, 1e-9, SI},
		{"psi", "1 psi", Pressure, 6894.757293168361, 1e-9, US},
		{"bar", "1.2 bar", Pressure, 1.2e5, 1e-6, SI},
		{"kPa", "6.9 kPa", Pressure, 6900, 1e-9, SI},
		{"g/cm3", "1.03 g/cm3", Density, 1030, 1e-9, SI},
		// 1 lb/ft³ = 16.01846337 kg/m³ (NIST SP 811).
		{"lb/ft3", "1 lb/ft3", Density, 16.018463373960138, 1e-9, US},
		{"kJ/(kg*K)", "3.93 kJ/(kg*K)", SpecificHeat, 3930, 1e-9, SI},
		// 1 Btu/(lb·°F) = 4186.8 J/(kg·K) exactly (IT Btu, NIST SP 811).
		{"Btu/(lb*°F)", "1 Btu/(lb*°F)", SpecificHeat, 4186.8, 1e-6, US},
		{"mPa*s", "2.9 mPa*s", Viscosity, 2.9e-3, 1e-15, SI},
		{"cP", "1 cP", Viscosity, 1e-3, 1e-15, SI},
		{"W/(m2*K)", "3300 W/(m2*K)", HeatTransferCoefficient, 3300, 1e-9, SI},
		{"W/m2/K", "3300 W/m2/K", HeatTransferCoefficient, 3300, 1e-9, SI},
		{"W/(m²·K)", "3300 W/(m²·K)", HeatTransferCoefficient, 3300, 1e-9, SI},
		{"kW/(m2*K)", "3.3 kW/(m2*K)", HeatTransferCoefficient, 3300, 1e-9, SI},
		// 1 Btu/(h·ft²·°F) = 5.678263 W/(m²·K) (NIST SP 811).
		{"Btu/(h*ft2*°F)", "1 Btu/(h*ft2*°F)", HeatTransferCoefficient, 5.678263340863113, 1e-9, US},
		{"fouling", "0.0001 m2*K/W", FoulingResistance, 1e-4, 1e-15, SI},
		{"conductivity", "0.6 W/(m*K)", ThermalConductivity, 0.6, 1e-12, SI},
		{"kW", "150 kW", Power, 150e3, 1e-9, SI},
		{"Btu/h", "3412.14163312794 Btu/h", Power, 1000, 1e-9, US},
		{"in", "2 in", Length, 0.0508, 1e-15, US},
		{"ft2", "1 ft2", Area, 0.09290304, 1e-15, US},
		{"m²", "0.35 m²", Area, 0.35, 1e-15, SI},
		{"consistency", "0.35 Pa*s^0.7", ConsistencyKind(0.7), 0.35, 1e-15, SI},
		{"juxtaposed", "3.93 kJ/(kg K)", SpecificHeat, 3930, 1e-9, SI},
		{"ratio", "0.92", Dimensionless, 0.92, 1e-15, SI},
		{"percent", "92 %", Dimensionless, 0.92, 1e-15, SI},
		{"exponent", "1e4 L/h", VolumeFlow, 10.0 / 3600, 1e-15, SI},
		{"negative", "-2 °C", Temperature, -2, 1e-15, SI},
		// 1° = π/180 rad (definition of the degree, NIST SP 811 Appendix B).
		{"angle deg", "60 deg", Angle, math.Pi / 3, 1e-15, SI},
		{"angle °", "60 °", Angle, math.Pi / 3, 1e-15, SI},
		{"angle ° no space", "45°", Angle, math.Pi / 4, 1e-15, SI},
		{"angle rad", "1.047 rad", Angle, 1.047, 1e-15, SI},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			v, err := Parse(tc.in, tc.kind)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tc.in, err)
			}
			if math.Abs(v.SI-tc.want) > tc.tol*math.Max(1, math.Abs(tc.want)) {
				t.Errorf("Parse(%q) = %.15g, want %.15g", tc.in, v.SI, tc.want)
			}
			if v.System != tc.sys {
				t.Errorf("Parse(%q) system = %v, want %v", tc.in, v.System, tc.sys)
			}
		})
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in, frag string
		kind     Kind
	}{
		{"72", "has no unit", Temperature},
		{"72", "has no unit", VolumeFlow},
		{"", "empty value", Temperature},
		{"72 C", "not a temperature unit", Temperature},
		{"10000 L/h", "not a temperature unit", Temperature},
		{"72 °C", "wrong dimension", VolumeFlow},
		{"10000 L", "wrong dimension", VolumeFlow},
		{"NaN °C", "not a number", Temperature},
		{"Inf L/h", "not a number", VolumeFlow},
		{"1e999 L/h", "not a number", VolumeFlow},
		{"0x10 L/h", "unknown unit", VolumeFlow},
		{"1,000 L/h", "not a number", VolumeFlow},
		{"3 furlongs/h", "unknown unit", VolumeFlow},
		{"3 kJ/(kg*K", "missing ')'", SpecificHeat},
		{"3 kJ/", "ends too early", SpecificHeat},
		{"2 mPas", "write mPa*s", Viscosity},
		{"-500 °C", "below absolute zero", Temperature},
		{"92 %", "percentage", VolumeFlow},
		{"15 sec", "write s", Time},
		{"1 m^x", "bad exponent", Length},
		// An angle needs its unit, and the degree sign alone is an angle,
		// never a temperature: neither field takes the other's unit.
		{"60", "has no unit", Angle},
		{"60 °C", "is a temperature, not an angle", Angle},
		{"60 degF", "is a temperature, not an angle", Angle},
		{"60 grad", "not an angle unit", Angle},
		{"1 deg*m", "not an angle unit", Angle},
		{"72 °", "not a temperature unit", Temperature},
		{"72°", "not a temperature unit", Temperature},
		{"6 °", "unknown unit", TemperatureDifference},
		{"3300 W/(m2*°)", "unknown unit", HeatTransferCoefficient},
		{"60 deg", "unknown unit", Dimensionless},
		{"1 rad", "unknown unit", Dimensionless},
		// Entered text is echoed in outputs: the free-text rule holds for
		// quantities too, Unicode white space or not (internal/oneline).
		{"2 \u2028in", "line or paragraph separator", Length},
		{"72\u2029 °C", "line or paragraph separator", Temperature},
		{"72 °C\n", "a line break", Temperature},
		{"\u202e72 °C", "bidirectional", Temperature},
		{"10000 L/h\u0085", "line or paragraph separator", VolumeFlow},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			_, err := Parse(tc.in, tc.kind)
			if err == nil {
				t.Fatalf("Parse(%q) gave no error", tc.in)
			}
			if !strings.Contains(err.Error(), tc.frag) {
				t.Errorf("Parse(%q) error %q lacks %q", tc.in, err, tc.frag)
			}
		})
	}
}

func TestParseEither(t *testing.T) {
	_, k, err := ParseEither("3600 kg/h", VolumeFlow, MassFlow)
	if err != nil || k.Name != MassFlow.Name {
		t.Fatalf("got %v %v", k.Name, err)
	}
	_, _, err = ParseEither("5 °C", VolumeFlow, MassFlow)
	if err == nil || !strings.Contains(err.Error(), "volumetric flow or mass flow") {
		t.Fatalf("got %v", err)
	}
}

func TestRoundTrip(t *testing.T) {
	// Display conversions invert the parse: SI → display → SI.
	kinds := []Kind{Temperature, TemperatureDifference, Area, VolumeFlow, MassFlow, Pressure, Density,
		SpecificHeat, Viscosity, HeatTransferCoefficient, Power, Length, Angle}
	for _, k := range kinds {
		for _, sys := range []System{SI, US} {
			u := DisplayUnit(k, sys)
			for _, v := range []float64{-3.5, 0, 1, 72.5, 12345.678} {
				got := ToSI(FromSI(v, k, u), k, u)
				if math.Abs(got-v) > 1e-12*math.Max(1, math.Abs(v)) {
					t.Errorf("%s in %s: %g → %g", k.Name, u, v, got)
				}
			}
		}
	}
	// 60° is π/3 rad (definition of the degree).
	if got := FromSI(math.Pi/3, Angle, "°"); math.Abs(got-60) > 1e-12 {
		t.Errorf("π/3 rad = %g°, want 60", got)
	}
	// 72 °C is 161.6 °F (definition of the Fahrenheit scale).
	if got := FromSI(72, Temperature, "°F"); math.Abs(got-161.6) > 1e-12 {
		t.Errorf("72 °C = %g °F, want 161.6", got)
	}
}

func TestEveryKindIsWired(t *testing.T) {
	// Every kind has an SI unit for records and display units that convert:
	// 1 display unit to SI and back is 1 (up to rounding), and the display unit
	// has the kind's dimension (FromSI panics otherwise). Plain numbers print bare.
	kinds := append(Kinds(), ConsistencyKind(0.65))
	if len(kinds) < 19 {
		t.Fatalf("only %d kinds", len(kinds))
	}
	for _, k := range kinds {
		if k.SIUnit == "" || k.Example == "" || k.Name == "" {
			t.Errorf("%q: SI unit %q, example %q", k.Name, k.SIUnit, k.Example)
		}
		for _, sys := range []System{SI, US} {
			u := DisplayUnit(k, sys)
			if u == "" && k.Dim != (Dim{}) {
				t.Errorf("%s has no %v display unit", k.Name, sys)
				continue
			}
			if got := FromSI(ToSI(1, k, u), k, u); math.Abs(got-1) > 1e-12 {
				t.Errorf("%s in %q: round trip %g", k.Name, u, got)
			}
		}
		if _, err := Parse("1 "+DisplayUnit(k, SI), k); err != nil && k.Dim != (Dim{}) {
			t.Errorf("%s: its SI display unit does not parse: %v", k.Name, err)
		}
	}
}
