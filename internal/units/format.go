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
	if unit == "%" {
		return 0.01, 0
	}
	f, d, _, err := parseUnit(unit)
	if err != nil || !sameDim(d, k.Dim) {
		panic(fmt.Sprintf("%sunit %q does not fit %s", panicPrefix, unit, k.Name))
	}
	return f, 0
}

// DisplayUnit is the unit the tool prints a kind in, for each system.
func DisplayUnit(k Kind, s System) string {
	si, us := displayUnits(k)
	if s == US {
		return us
	}
	return si
}

func displayUnits(k Kind) (si, us string) {
	switch k.Name {
	case Temperature.Name:
		return "°C", "°F"
	case TemperatureDifference.Name:
		return "K", "°F"
	case Length.Name:
		return "m", "ft"
	case Area.Name:
		return "m²", "ft²"
	case Volume.Name:
		return "L", "gal"
	case VolumeFlow.Name:
		return "L/h", "gpm"
	case MassFlow.Name:
		return "kg/h", "lb/h"
	case Time.Name:
		return "s", "s"
	case Pressure.Name:
		return "kPa", "psi"
	case Density.Name:
		return "kg/m³", "lb/ft³"
	case SpecificHeat.Name:
		return "kJ/(kg·K)", "Btu/(lb·°F)"
	case Viscosity.Name:
		return "mPa·s", "cP"
	case HeatTransferCoefficient.Name:
		return "W/(m²·K)", "Btu/(h·ft²·°F)"
	case Power.Name:
		return "kW", "Btu/h"
	}
	panic(panicPrefix + "no display unit for " + k.Name)
}
