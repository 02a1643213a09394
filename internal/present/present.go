// Package present formats results for people: SI values shown in SI or US
// customary units, check values and margins, the same way in the terminal
// tables and in the PDF record.
package present

import (
	"fmt"
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
func CheckValue(v float64, unit string, d Display) string {
	switch unit {
	case "°C":
		return d.With(v, units.Temperature, 2)
	case "s":
		return fmt.Sprintf("%.2f s", v)
	case "m":
		return d.With(v, units.Length, 2)
	case "Pa":
		return d.With(v, units.Pressure, 1)
	case "slope":
		return Slope(v, d)
	case "log":
		return fmt.Sprintf("%.2f log", v)
	case "":
		return fmt.Sprintf("%.3g", v)
	}
	return fmt.Sprintf("%.4g %s", v, unit)
}

// CheckMargin formats a check's margin with its sign, in display units.
func CheckMargin(c assess.Check, d Display) string {
	switch c.MarginUnit {
	case "K":
		return Signed(d.Num(c.Margin, units.TemperatureDifference, 2)) + " " + d.Unit(units.TemperatureDifference)
	case "Pa":
		return Signed(d.Num(c.Margin, units.Pressure, 1)) + " " + d.Unit(units.Pressure)
	case "m":
		return Signed(d.Num(c.Margin, units.Length, 2)) + " " + d.Unit(units.Length)
	case "%":
		return Signed(fmt.Sprintf("%.1f", c.Margin)) + " %"
	case "slope":
		return Signed(Slope(c.Margin, d))
	case "log":
		return Signed(fmt.Sprintf("%.2f", c.Margin)) + " log"
	case "s":
		return Signed(fmt.Sprintf("%.2f", c.Margin)) + " s"
	}
	return Signed(fmt.Sprintf("%.3g", c.Margin)) + " " + c.MarginUnit
}

// Slope prints rise/length as cm/m (SI) or in/ft (US).
func Slope(v float64, d Display) string {
	if d.Sys == units.US {
		return fmt.Sprintf("%.3f in/ft", v*12)
	}
	return fmt.Sprintf("%.2f cm/m", v*100)
}
