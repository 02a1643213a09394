// Package units reads "number unit" strings from plant files and converts them
// to SI, and formats SI values back into SI or US customary units for output.
//
// The field being read decides the dimension: a flow field accepts "10000 L/h"
// or "44 gpm" but refuses "72 °C", and a temperature field refuses a bare
// number, so a °C/°F mix-up cannot pass silently.
//
//	v, err := units.Parse("161 °F", units.Temperature)   // v.SI == 71.666… (°C)
//	v, err = units.Parse("0.35 Pa*s^0.7", units.ConsistencyKind(0.7))
//
// Conventions: temperature points are returned in °C (the project's internal
// temperature scale); every other quantity in coherent SI (kg, m, s, K, W, Pa).
// Inside compound units (J/(kg*K), Btu/(lb*°F)) a temperature symbol is a
// difference: 1 °F = 5/9 K. In a temperature-difference field "°C" and "°F"
// read as differences too.
package units

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"pasval/internal/oneline"
)

// Dim holds the exponents of mass, length, time and temperature.
type Dim [4]float64

// System is the unit system a quantity was written in.
type System int

const (
	SI System = iota // metric units (also the zero value)
	US               // US customary units (°F, ft, gal, lb, psi, Btu)
)

func (s System) String() string {
	if s == US {
		return "us"
	}
	return "si"
}

// Kind names what a field holds; it fixes the dimension a unit must have and
// the units the tool writes it in. Every kind is made by newKind, which takes
// all of them, so a new kind cannot be added half-wired: its SI unit (records)
// and its display units in each system (tables) are part of its definition,
// and TestEveryKindIsWired converts with each of them.
type Kind struct {
	Name    string // what the field holds, as used in messages
	Dim     Dim
	Example string    // a valid entry, shown in error messages
	SIUnit  string    // the coherent SI unit, as the record's inputs table prints it
	display [2]string // display units for SI and US output; "" for plain numbers
	point   bool      // temperature point (offset scale)
	angle   bool      // plane angle: dimensionless, read only with an angle unit (angleUnits)
}

// all holds every fixed kind, in definition order (see Kinds).
var all []Kind

// newKind defines a fixed kind: siDisplay and usDisplay are the units the
// tool prints it in (each must convert with FromSI; a test checks them).
func newKind(name string, dim Dim, example, siUnit, siDisplay, usDisplay string) Kind {
	return define(Kind{Name: name, Dim: dim, Example: example, SIUnit: siUnit, display: [2]string{siDisplay, usDisplay}})
}

// newPointKind is newKind for a temperature point (an offset scale).
func newPointKind(name string, dim Dim, example, siUnit, siDisplay, usDisplay string) Kind {
	return define(Kind{Name: name, Dim: dim, Example: example, SIUnit: siUnit, display: [2]string{siDisplay, usDisplay}, point: true})
}

// newAngleKind is newKind for a plane angle. An angle is dimensionless, but
// a bare number or any other unit is refused in its field: "60" could be
// degrees or radians, and "60 °C" is a temperature.
func newAngleKind(name, example, siUnit, siDisplay, usDisplay string) Kind {
	return define(Kind{Name: name, Example: example, SIUnit: siUnit, display: [2]string{siDisplay, usDisplay}, angle: true})
}

func define(k Kind) Kind {
	all = append(all, k)
	return k
}

var (
	Temperature           = newPointKind("temperature", Dim{0, 0, 0, 1}, "72 °C or 161.6 °F", "°C", "°C", "°F")
	TemperatureDifference = newKind("temperature difference", Dim{0, 0, 0, 1}, "6.3 °C (a difference) or 11.3 °F", "K", "K", "°F")
	Length                = newKind("length", Dim{0, 1, 0, 0}, "12.5 m or 41 ft", "m", "m", "ft")
	Area                  = newKind("area", Dim{0, 2, 0, 0}, "0.35 m2 or 3.8 ft2", "m²", "m²", "ft²")
	Volume                = newKind("volume", Dim{0, 3, 0, 0}, "25 L or 6.6 gal", "m³", "L", "gal")
	VolumeFlow            = newKind("volumetric flow", Dim{0, 3, -1, 0}, "10000 L/h or 44 gpm", "m³/s", "L/h", "gpm")
	MassFlow              = newKind("mass flow", Dim{1, 0, -1, 0}, "10300 kg/h or 22700 lb/h", "kg/s", "kg/h", "lb/h")
	Time                  = newKind("time", Dim{0, 0, 1, 0}, "15 s or 30 min", "s", "s", "s")
	Pressure              = newKind("pressure", Dim{1, -1, -2, 0}, "150 kPa or 22 psi", "Pa", "kPa", "psi")
	Density               = newKind("density", Dim{1, -3, 0, 0}, "1030 kg/m3 or 64.3 lb/ft3", "kg/m³", "kg/m³", "lb/ft³")
	SpecificHeat          = newKind("specific heat", Dim{0, 2, -2, -1}, "3.93 kJ/(kg*K) or 0.94 Btu/(lb*°F)",
		"J/(kg·K)", "kJ/(kg·K)", "Btu/(lb·°F)")
	Viscosity               = newKind("dynamic viscosity", Dim{1, -1, -1, 0}, "2.1 mPa*s or 2.1 cP", "Pa·s", "mPa·s", "cP")
	HeatTransferCoefficient = newKind("heat-transfer coefficient", Dim{1, 0, -3, -1}, "3300 W/(m2*K) or 580 Btu/(h*ft2*°F)",
		"W/(m²·K)", "W/(m²·K)", "Btu/(h·ft²·°F)")
	FoulingResistance = newKind("fouling resistance", Dim{-1, 0, 3, 1}, "0.00005 m2*K/W",
		"m²·K/W", "m²·K/W", "h·ft²·°F/Btu")
	ThermalConductivity = newKind("thermal conductivity", Dim{1, 1, -3, -1}, "0.6 W/(m*K)",
		"W/(m·K)", "W/(m·K)", "Btu/(h·ft·°F)")
	Power         = newKind("power", Dim{1, 2, -3, 0}, "150 kW or 512000 Btu/h", "W", "kW", "Btu/h")
	Dimensionless = newKind("number", Dim{}, "0.92 or 92 %", "1", "", "")
	Angle         = newAngleKind("angle", "60 deg, 60 ° or 1.047 rad", "rad", "°", "°")
)

// angleUnits are the only units an angle field reads, each in radians. They
// are kept out of the unit table, so that no other field reads them: "°"
// alone is not a temperature ("72 °" is refused where °C or °F is meant),
// and "deg" is not a dimensionless factor of a number field.
var angleUnits = map[string]float64{"deg": math.Pi / 180, "°": math.Pi / 180, "rad": 1}

// Kinds lists every fixed kind (ConsistencyKind makes the others).
func Kinds() []Kind { return append([]Kind(nil), all...) }

// ConsistencyKind is the kind of a power-law consistency index K with flow
// index n, whose SI unit is Pa·sⁿ.
func ConsistencyKind(n float64) Kind {
	unit := fmt.Sprintf("Pa*s^%g", n)
	return Kind{
		Name:    fmt.Sprintf("consistency index (Pa*s^%g)", n),
		Dim:     Dim{1, -1, n - 2, 0},
		Example: fmt.Sprintf("0.35 Pa*s^%g", n),
		SIUnit:  "Pa·sⁿ",
		display: [2]string{unit, unit},
	}
}

// Value is a parsed quantity.
type Value struct {
	SI     float64 // in SI (temperature points in °C)
	Number float64 // the number as written
	Unit   string  // the unit as written (trimmed)
	System System  // US when the unit uses a US customary symbol
}

// Error is a unit-parsing error; the plant-file reader adds file, line and field.
type Error struct {
	Input string
	Msg   string
}

func (e *Error) Error() string { return e.Msg }

func errorf(input, format string, args ...any) *Error {
	return &Error{Input: input, Msg: fmt.Sprintf(format, args...)}
}

type unitDef struct {
	factor float64
	dim    Dim
	us     bool
	temp   int // 0: not a temperature symbol; 1: K; 2: °C; 3: °F
}

const (
	tempK = 1 + iota
	tempC
	tempF
)

// Exact conversion factors (NIST SP 811, Appendix B; the international yard and
// pound of 1959, the US gallon of 231 in³, the IT British thermal unit).
const (
	inch   = 0.0254
	foot   = 0.3048
	pound  = 0.45359237
	gallon = 3.785411784e-3
	btu    = 1055.05585262
	psi    = 6894.757293168361 // lbf/in² = 0.45359237 kg × 9.80665 m/s² / (0.0254 m)²
)

var (
	dMass   = Dim{1, 0, 0, 0}
	dLength = Dim{0, 1, 0, 0}
	dTime   = Dim{0, 0, 1, 0}
	dTemp   = Dim{0, 0, 0, 1}
	dVolume = Dim{0, 3, 0, 0}
	dPress  = Dim{1, -1, -2, 0}
	dEnergy = Dim{1, 2, -2, 0}
	dPower  = Dim{1, 2, -3, 0}
	dVisc   = Dim{1, -1, -1, 0}
)

var table = map[string]unitDef{
	"kg": {1, dMass, false, 0}, "g": {1e-3, dMass, false, 0}, "lb": {pound, dMass, true, 0}, "lbm": {pound, dMass, true, 0},
	"m": {1, dLength, false, 0}, "cm": {1e-2, dLength, false, 0}, "mm": {1e-3, dLength, false, 0},
	"um": {1e-6, dLength, false, 0}, "µm": {1e-6, dLength, false, 0}, "km": {1e3, dLength, false, 0},
	"in": {inch, dLength, true, 0}, "ft": {foot, dLength, true, 0},
	"s": {1, dTime, false, 0}, "min": {60, dTime, false, 0}, "h": {3600, dTime, false, 0}, "hr": {3600, dTime, false, 0},
	"L": {1e-3, dVolume, false, 0}, "l": {1e-3, dVolume, false, 0}, "mL": {1e-6, dVolume, false, 0}, "hL": {0.1, dVolume, false, 0},
	"gal": {gallon, dVolume, true, 0},
	"gpm": {gallon / 60, Dim{0, 3, -1, 0}, true, 0}, "gph": {gallon / 3600, Dim{0, 3, -1, 0}, true, 0},
	"Pa": {1, dPress, false, 0}, "kPa": {1e3, dPress, false, 0}, "MPa": {1e6, dPress, false, 0},
	"bar": {1e5, dPress, false, 0}, "mbar": {100, dPress, false, 0}, "psi": {psi, dPress, true, 0},
	"N": {1, Dim{1, 1, -2, 0}, false, 0},
	"J": {1, dEnergy, false, 0}, "kJ": {1e3, dEnergy, false, 0}, "MJ": {1e6, dEnergy, false, 0},
	"Wh": {3600, dEnergy, false, 0}, "kWh": {3.6e6, dEnergy, false, 0},
	"Btu": {btu, dEnergy, true, 0}, "BTU": {btu, dEnergy, true, 0},
	"kcal": {4186.8, dEnergy, false, 0},
	"W":    {1, dPower, false, 0}, "kW": {1e3, dPower, false, 0}, "MW": {1e6, dPower, false, 0},
	"cP": {1e-3, dVisc, false, 0}, "cp": {1e-3, dVisc, false, 0},
	"K":  {1, dTemp, false, tempK},
	"°C": {1, dTemp, false, tempC}, "degC": {1, dTemp, false, tempC}, "℃": {1, dTemp, false, tempC},
	"°F": {5.0 / 9.0, dTemp, true, tempF}, "degF": {5.0 / 9.0, dTemp, true, tempF}, "℉": {5.0 / 9.0, dTemp, true, tempF},
}

// prefixed SI units that the table spells out are enough for this trade; the
// milli-pascal second is common for viscosity.
func init() {
	table["mPa"] = unitDef{1e-3, dPress, false, 0}
	table["µPa"] = unitDef{1e-6, dPress, false, 0}
}

// Symbols lists every unit symbol the parser knows, sorted (tests swap them
// into plant files; compounds such as "L/h" are built from them).
func Symbols() []string {
	out := make([]string, 0, len(table))
	for s := range table {
		out = append(out, s)
	}
	sort.Strings(out)
	return out
}

// oneLine refuses entered text that internal/oneline refuses as free text:
// it is echoed in outputs and records.
func oneLine(s string) error {
	if i, r, bad := oneline.Find(s); bad {
		return errorf(s, "%q contains %s at character %d; write the value on one line, with plain spaces", s, oneline.Describe(r), i)
	}
	return nil
}

// Parse reads "number unit" and returns the value in SI for the given kind.
// A bare number is refused for any dimensional kind.
func Parse(s string, k Kind) (Value, error) {
	// The entered text is echoed in outputs and records, so it is held to
	// the free-text rule (internal/oneline): no control character, line or
	// paragraph separator or bidirectional formatting, even at either end.
	if err := oneLine(s); err != nil {
		return Value{}, err
	}
	in := strings.TrimSpace(s)
	if in == "" {
		return Value{}, errorf(s, "empty value: expected %s such as %s", Article(k.Name), k.Example)
	}
	num, rest, err := splitNumber(in)
	if err != nil {
		return Value{}, errorf(s, "%q is not a number followed by a unit: expected %s such as %s", s, Article(k.Name), k.Example)
	}
	unit := strings.TrimSpace(rest)
	v := Value{Number: num, Unit: unit}
	if k.angle {
		return parseAngle(s, v, k)
	}
	if unit == "" {
		if k.Dim == (Dim{}) {
			v.SI = num
			return v, nil
		}
		return Value{}, errorf(s, "%q has no unit: %s needs one, e.g. %s", s, Article(k.Name), k.Example)
	}
	if k.point {
		def, ok := table[unit]
		if !ok || def.temp == 0 {
			return Value{}, errorf(s, "%q: %q is not a temperature unit; write °C, degC, °F, degF or K, e.g. %s", s, unit, k.Example)
		}
		v.System = SI
		switch def.temp {
		case tempK:
			v.SI = num - 273.15
		case tempC:
			v.SI = num
		case tempF:
			v.SI = (num - 32) * 5 / 9
			if math.IsInf(v.SI, 0) { // 1.7e308 °F: the product overflows, the quotient does not
				v.SI = (num - 32) / 9 * 5
			}
			v.System = US
		}
		if math.IsInf(v.SI, 0) || math.IsNaN(v.SI) {
			return Value{}, errorf(s, "%q is out of range", s)
		}
		if v.SI < -273.15 {
			return Value{}, errorf(s, "%q is below absolute zero", s)
		}
		return v, nil
	}
	if unit == "%" {
		if k.Dim != (Dim{}) {
			return Value{}, errorf(s, "%q: a percentage is not a %s; expected e.g. %s", s, k.Name, k.Example)
		}
		v.SI = num / 100
		return v, nil
	}
	factor, dim, us, err := parseUnit(unit)
	if err != nil {
		return Value{}, errorf(s, "%q: %v; expected %s such as %s", s, err, Article(k.Name), k.Example)
	}
	if !sameDim(dim, k.Dim) {
		return Value{}, errorf(s, "%q has the wrong dimension for a %s (the unit %q is %s); expected e.g. %s",
			s, k.Name, unit, describeDim(dim), k.Example)
	}
	v.SI = num * factor
	if us {
		v.System = US
	}
	if math.IsInf(v.SI, 0) || math.IsNaN(v.SI) {
		return Value{}, errorf(s, "%q is out of range", s)
	}
	return v, nil
}

// parseAngle reads the unit of an angle: deg, ° or rad, nothing else.
func parseAngle(s string, v Value, k Kind) (Value, error) {
	f, ok := angleUnits[v.Unit]
	switch {
	case v.Unit == "":
		return Value{}, errorf(s, "%q has no unit: %s needs one (deg, ° or rad), e.g. %s", s, Article(k.Name), k.Example)
	case !ok:
		if def, found := table[v.Unit]; found && def.temp != 0 {
			return Value{}, errorf(s, "%q is a temperature, not an angle; write deg, ° or rad, e.g. %s", s, k.Example)
		}
		return Value{}, errorf(s, "%q: %q is not an angle unit; write deg, ° or rad, e.g. %s", s, v.Unit, k.Example)
	}
	v.SI = v.Number * f
	return v, nil
}

// ParseEither reads a value that may be any of the given kinds (a flow that is
// volumetric or by mass) and reports which one matched.
func ParseEither(s string, kinds ...Kind) (Value, Kind, error) {
	var first error
	for _, k := range kinds {
		v, err := Parse(s, k)
		if err == nil {
			return v, k, nil
		}
		if first == nil {
			first = err
		}
	}
	names := make([]string, len(kinds))
	examples := make([]string, len(kinds))
	for i, k := range kinds {
		names[i] = k.Name
		examples[i] = k.Example
	}
	if ue, ok := first.(*Error); ok && strings.Contains(ue.Msg, "wrong dimension") {
		return Value{}, Kind{}, errorf(s, "%q is not a %s; expected e.g. %s", s, strings.Join(names, " or "), strings.Join(examples, ", or "))
	}
	return Value{}, Kind{}, first
}

// Article puts "a" or "an" before a name: "an area", "a density".
func Article(name string) string {
	if name != "" && strings.ContainsRune("aeiou", rune(name[0])) {
		return "an " + name
	}
	return "a " + name
}

func sameDim(a, b Dim) bool {
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-9 {
			return false
		}
	}
	return true
}

func describeDim(d Dim) string {
	names := []string{"kg", "m", "s", "K"}
	var parts []string
	for i, e := range d {
		switch {
		case math.Abs(e) < 1e-12:
		case math.Abs(e-1) < 1e-12:
			parts = append(parts, names[i])
		default:
			parts = append(parts, fmt.Sprintf("%s^%g", names[i], e))
		}
	}
	if len(parts) == 0 {
		return "dimensionless"
	}
	return "in " + strings.Join(parts, "·")
}

// splitNumber splits a leading decimal number from the rest of the string.
// Hexadecimal, "NaN", "Inf" and digit separators are refused.
func splitNumber(s string) (float64, string, error) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return 0, "", fmt.Errorf("no number")
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j { // an exponent, not the start of a unit such as "e"
			i = k
		}
	}
	f, err := strconv.ParseFloat(s[:i], 64)
	if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
		return 0, "", fmt.Errorf("bad number")
	}
	rest := s[i:]
	if rest != "" && rest[0] != ' ' && rest[0] != '\t' && (rest[0] == '.' || rest[0] == ',' || (rest[0] >= '0' && rest[0] <= '9')) {
		return 0, "", fmt.Errorf("bad number")
	}
	return f, rest, nil
}

// TemperatureResolution is the one rule for "the same temperature", K: two
// temperatures closer than this are one. Converting between °C, K and °F
// leaves differences of about 1e-13 K (20.1 °C and 293.25 K differ by 2e-14 K
// after conversion), far below it, while no measurement resolves a
// microkelvin. The plant-file validation and the viscosity curve both use it.
const TemperatureResolution = 1e-6

// SameTemperature reports whether two temperatures (°C, or two differences in
// K) are one by TemperatureResolution.
func SameTemperature(a, b float64) bool { return math.Abs(a-b) < TemperatureResolution }
