package units

import "fmt"

const panicPrefix = "units: "

// FromSI converts an SI value of kind k (temperature points in °C) to the
// given display unit. The unit is the program's own choice, so a bad unit is a
// programming error and panics.
func FromSI(v float64, k Kind, unit string) float64 {
	scale, offset := linear(k, unit)
	return v/scale + offset
}

// ToSI is the inverse of FromSI.
func ToSI(v float64, k Kind, unit string) float64 {
	scale, offset := linear(k, unit)
	return (v - offset) * scale
}

// linear gives the conversion from unit to SI as SI = (v − offset)·scale.
// The unit is the program's own choice, so a bad one panics.
func linear(k Kind, unit string) (scale, offset float64) {
	if k.point {
		def, ok := table[unit]
		if !ok || def.temp == 0 {
			panic(panicPrefix + "not a temperature unit: " + unit)
		}
		switch def.temp {
		case tempK:
			return 1, 273.15
		case tempF:
			return 5.0 / 9.0, 32
		}
		return 1, 0
	}
	if k.angle {
		f, ok := angleUnits[unit]
		if !ok {
			panic(panicPrefix + "not an angle unit: " + unit)
		}
		return f, 0
	}
	if unit == "%" {
		return 0.01, 0
	}
	if unit == "" && k.Dim == (Dim{}) {
		return 1, 0
	}
	f, d, _, err := parseUnit(unit)
	if err != nil || !sameDim(d, k.Dim) {
		panic(fmt.Sprintf("%sunit %q does not fit %s", panicPrefix, unit, k.Name))
	}
	return f, 0
}

// DisplayUnit is the unit the tool prints a kind in, for each system ("" for
// a plain number).
func DisplayUnit(k Kind, s System) string {
	if s == US {
		return k.display[1]
	}
	return k.display[0]
}
