// Package present formats results for people: SI values shown in SI or US
// customary units, check values and margins, the same way in the terminal
// tables and in the PDF record.
package present

import (
	"fmt"
	"math"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/units"
)

// Display formats SI values in the chosen unit system.
type Display struct{ Sys units.System }

// Unit is the display unit of a kind.
func (d Display) Unit(k units.Kind) string { return units.DisplayUnit(k, d.Sys) }

// Num formats a value without its unit.
func (d Display) Num(v float64, k units.Kind, prec int) string {
	return fmt.Sprintf("%.*f", prec, units.FromSI(v, k, d.Unit(k)))
}

// With formats a value followed by its unit.
func (d Display) With(v float64, k units.Kind, prec int) string {
	return d.Num(v, k, prec) + " " + d.Unit(k)
}

// Power prints a duty: kW in SI, Btu/h (no decimals) in US units.
func (d Display) Power(w float64) string {
	if d.Sys == units.US {
		return fmt.Sprintf("%.0f", units.FromSI(w, units.Power, "Btu/h"))
	}
	return fmt.Sprintf("%.1f", w/1e3)
}

// Signed puts an explicit sign on a formatted number, with a true minus sign.
func Signed(s string) string {
	if !strings.HasPrefix(s, "-") {
		return "+" + s
	}
	return "−" + s[1:]
}

// Small prints a short length: mm in SI, inches in US units.
func (d Display) Small(m float64) string {
	if d.Sys == units.US {
		return fmt.Sprintf("%.3f in", units.FromSI(m, units.Length, "in"))
	}
	return fmt.Sprintf("%.1f mm", m*1e3)
}

// CheckValue formats a check's required or actual value in display units.
func CheckValue(v float64, unit string, d Display) string { return checkValue(v, unit, d, 0) }

// checkValue formats with extra decimals beyond the usual precision.
func checkValue(v float64, unit string, d Display, extra int) string {
	switch unit {
	case "°C":
		return d.With(v, units.Temperature, 2+extra)
	case "s":
		return fmt.Sprintf("%.*f s", 2+extra, v)
	case "m":
		return d.With(v, units.Length, 2+extra)
	case "Pa":
		return d.With(v, units.Pressure, 1+extra)
	case "slope":
		return slope(v, d, extra)
	case "log":
		if v > LogCap {
			return LogText(v) + " log"
		}
		return fmt.Sprintf("%.*f log", 2+extra, v)
	case "K":
		return d.With(v, units.TemperatureDifference, 2+extra)
	case "pass":
		if v >= 0.5 {
			return "passed"
		}
		return "failed"
	case "":
		return fmt.Sprintf("%.*g", 3+extra, v)
	}
	return fmt.Sprintf("%.*g %s", 4+extra, v, unit)
}

// CheckValues formats a check's required and actual values, with more
// decimals when they would print alike but differ (15.0001 s against
// 14.9987 s is not "15.00 s" against "15.00 s").
func CheckValues(c assess.Check, d Display) (required, actual string) {
	for extra := 0; ; extra++ {
		required, actual = checkValue(c.Required, c.Unit, d, extra), checkValue(c.Actual, c.Unit, d, extra)
		if required != actual || atLimit(c) || extra >= 8 {
			return required, actual
		}
	}
}

// atLimit is a margin within the one tolerance rule of zero: the value equals
// its limit by construction.
func atLimit(c assess.Check) bool {
	return math.Abs(c.Margin) <= assess.Tolerance*math.Abs(c.Required)
}

// CheckMargin formats a check's margin with its sign, in display units, with
// enough decimals to show the sign of a small margin; a margin at the limit
// (within the tolerance rule) prints as an unsigned zero.
func CheckMargin(c assess.Check, d Display) string {
	if c.MarginUnit == "pass" {
		return "—"
	}
	if c.MarginUnit == "log" && c.Actual > LogCap {
		return "> " + Signed(fmt.Sprintf("%.2f", LogCap-c.Required)) + " log"
	}
	for extra := 0; ; extra++ {
		num, unit := marginNumber(c, d, extra)
		if atLimit(c) {
			return strings.TrimPrefix(num, "-") + unit
		}
		if strings.Trim(num, "-0.") != "" || extra >= 8 {
			return Signed(num) + unit
		}
	}
}

// marginNumber is a margin's number (unsigned form from %f) and its unit.
func marginNumber(c assess.Check, d Display, extra int) (string, string) {
	switch c.MarginUnit {
	case "K":
		return d.Num(c.Margin, units.TemperatureDifference, 2+extra), " " + d.Unit(units.TemperatureDifference)
	case "Pa":
		return d.Num(c.Margin, units.Pressure, 1+extra), " " + d.Unit(units.Pressure)
	case "m":
		return d.Num(c.Margin, units.Length, 2+extra), " " + d.Unit(units.Length)
	case "%":
		return fmt.Sprintf("%.*f", 1+extra, c.Margin), " %"
	case "slope":
		s := slope(c.Margin, d, extra)
		i := strings.LastIndex(s, " ")
		return s[:i], s[i:]
	case "log":
		return fmt.Sprintf("%.*f", 2+extra, c.Margin), " log"
	case "s":
		return fmt.Sprintf("%.*f", 2+extra, c.Margin), " s"
	}
	return fmt.Sprintf("%.*g", 3+extra, c.Margin), " " + c.MarginUnit
}

// Slope prints rise/length as cm/m (SI) or in/ft (US).
func Slope(v float64, d Display) string { return slope(v, d, 0) }

func slope(v float64, d Display, extra int) string {
	if d.Sys == units.US {
		return fmt.Sprintf("%.*f in/ft", 3+extra, v*12)
	}
	return fmt.Sprintf("%.*f cm/m", 2+extra, v*100)
}
