package present

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/lethality"
)

// The words of check notes and warnings: assess returns codes and SI values,
// and they are put into words here, once, in the units of the output (the
// display system for terminal and record, SI for JSON).

// temp is a temperature with one decimal, "72.0 °C"; diff a difference, "6.3 K".
func (d Display) temp(c float64) string { return d.With(c, units.Temperature, 1) }
func (d Display) diff(k float64) string { return d.With(k, units.TemperatureDifference, 1) }

// g4 is a value with four significant digits and its display unit.
func (d Display) g4(v float64, k units.Kind) string {
	return fmt.Sprintf("%.4g %s", units.FromSI(v, k, d.Unit(k)), d.Unit(k))
}

// CheckNote is a check's note in words: the registry's fixed note, or, for a
// note that carries numbers, the words made here.
func CheckNote(c assess.Check, d Display) string {
	x := c.Detail
	switch c.ID {
	case assess.HoldingTime:
		var b strings.Builder
		if x.BelowEveryRow {
			fmt.Fprintf(&b, "the judged temperature %s is below every legal row (coolest %s)", d.temp(x.JudgedC), d.temp(x.RowTemperatureC))
		} else {
			fmt.Fprintf(&b, "fastest particle %s against the %s row (%s %%)", d.flowPhrase(x), d.temp(x.RowTemperatureC),
				Signed(fmt.Sprintf("%.1f", x.MarginPercent)))
		}
		b.WriteString(d.judgedPhrase(x))
		if x.AccuracyK > 0 {
			if math.IsNaN(x.NominalRowC) {
				b.WriteString("; at the setpoint no row applies")
			} else {
				fmt.Fprintf(&b, "; at the setpoint the %s row, %s", d.temp(x.NominalRowC), map[bool]string{true: "met", false: "not met"}[x.NominalMet])
			}
		}
		if !x.AtSeal {
			fmt.Fprintf(&b, "; at the sealed maximum %.2f s", x.SealValue)
		}
		if !math.IsNaN(x.RowToMeetC) && x.RiseToMeetK > 0 {
			fmt.Fprintf(&b, "; the %s row would be met with the setpoint %s higher", d.temp(x.RowToMeetC), d.riseText(x.RiseToMeetK))
		}
		return b.String()
	case assess.LogReduction:
		basis := "tube isothermal at"
		if x.CreditHeatLoss {
			basis = "with the heat-loss credit (holding_tube.credit_heat_loss: true), outlet at"
		}
		note := fmt.Sprintf("fastest particle %s, %s %s%s", d.flowPhrase(x), basis, d.With(x.JudgedC, units.Temperature, 2), d.accuracyPhrase(x))
		if x.AccuracyK > 0 {
			note += fmt.Sprintf(" (at the setpoint %s log)", LogText(x.NominalValue))
		}
		return note + fmt.Sprintf("; D %.4g s at %s, z %s", x.DRefS, d.temp(x.DTemperatureC), d.diff(x.ZK))
	case assess.HeatingMedium:
		return fmt.Sprintf("medium inlet that %d plates need to bring the product to temperature, against the hottest available", x.Plates)
	case assess.AcceptanceHoldingTime, assess.AcceptanceCutOut, assess.AcceptanceCutIn, assess.AcceptanceValveResponse,
		assess.AcceptanceSensorCheck, assess.AcceptanceRegeneratorPressure, assess.AcceptanceOther:
		return d.acceptanceNote(c)
	case assess.DiversionTiming:
		return d.diversionNote(c)
	}
	for _, def := range assess.CheckDefs() {
		if def.ID == c.ID && def.Note != "" {
			return def.Note
		}
	}
	panic(fmt.Sprintf("%sno note for check %q", panicPrefix, c.ID))
}

const panicPrefix = "present: "

// entered is the text the plant file gives a field, as written.
func entered(p *plantfile.Plant, field string) string {
	for _, in := range p.Inputs {
		if in.Field == field {
			return in.Text
		}
	}
	return "?"
}

// WarningText is a warning in words.
func WarningText(w assess.Warning, p *plantfile.Plant, d Display) string {
	v := w.Values
	switch w.Code {
	case assess.WarnLaminarFlow:
		return fmt.Sprintf("flow in the holding tube is %s (Re %.0f), so the fastest particle moves at %.2f× the mean velocity: "+
			"a holding-time test timed with water (turbulent) overstates this product's holding time (Dickerson et al. 1968: "+
			"a tube timed at 26 s with water held ice-cream mix 21.9–23.5 s); time the tube with the product or as the regulator directs",
			lethality.RegimeOf(v["reynolds"]), v["reynolds"], v["fastest_to_mean"])
	case assess.WarnViscosityExtrapolated:
		return fmt.Sprintf("the setpoint %s lies outside the entered viscosity points (%s to %s): the nearest point's viscosity is held; "+
			"measure it at the holding temperature", d.temp(v["setpoint_C"]), d.temp(v["lowest_C"]), d.temp(v["highest_C"]))
	case assess.WarnNoRise:
		return "holding_tube.rise is not given, so the tube's upward slope is not checked"
	case assess.WarnUValue:
		return fmt.Sprintf("%s %s is outside what plate heat exchangers reach in this service (typically %s to %s); check the value and its unit",
			w.Field, entered(p, w.Field), d.g4(v["low_W_m2K"], units.HeatTransferCoefficient), d.g4(v["high_W_m2K"], units.HeatTransferCoefficient))
	case assess.WarnPlateArea:
		return fmt.Sprintf("%s %s per plate is outside the usual %s to %s; check the value and its unit",
			w.Field, entered(p, w.Field), d.g4(v["low_m2"], units.Area), d.g4(v["high_m2"], units.Area))
	case assess.WarnFouling:
		return fmt.Sprintf("%s %s is far above the usual fouling resistances of plate heat exchangers (below 0.001 m²·K/W)", w.Field, entered(p, w.Field))
	case assess.WarnRatioHigh:
		return fmt.Sprintf("a regeneration ratio of %.1f %% is unusually high (plate regenerators commonly reach 80–94 %%); "+
			"the plate count grows steeply near 100 %%", v["ratio"]*100)
	case assess.WarnDensity:
		return fmt.Sprintf("the product density %s is outside the usual %s to %s for liquid foods; check the value and its unit",
			d.g4(v["value_kg_m3"], units.Density), d.g4(v["low_kg_m3"], units.Density), d.g4(v["high_kg_m3"], units.Density))
	case assess.WarnSpecificHeat:
		return fmt.Sprintf("the product specific heat %s is outside the usual %s to %s for liquid foods; check the value and its unit",
			d.g4(v["value_J_kgK"], units.SpecificHeat), d.g4(v["low_J_kgK"], units.SpecificHeat), d.g4(v["high_J_kgK"], units.SpecificHeat))
	case assess.WarnViscosityBelowWater:
		point := strings.TrimSuffix(w.Field, ".value")
		return fmt.Sprintf("%s: %s at %s is below water's %s at that temperature (IAPWS 2008); a liquid food is at least as viscous as water: "+
			"check the value and its unit", point, entered(p, w.Field), entered(p, point+".at"), d.g4(v["water_Pa_s"], units.Viscosity))
	case assess.WarnHoldingTimeLong:
		return fmt.Sprintf("a fastest-particle holding time of %.0f s (%.1f min) is beyond what a continuous line holds (30 min is a vat hold); "+
			"check the tube length, diameter and flow", v["min_residence_s"], v["min_residence_s"]/60)
	case assess.WarnTubeVelocity:
		return fmt.Sprintf("the mean velocity in the holding tube, %s/s, is outside the usual %s/s to %s/s; check the tube diameter and the flow",
			d.g4(v["value_m_s"], units.Length), d.g4(v["low_m_s"], units.Length), d.g4(v["high_m_s"], units.Length))
	case assess.WarnOuterCoefficient:
		return fmt.Sprintf("holding_tube.outer_coefficient %s is above what still air gives a bare tube (typically 5–15 W/(m²·K)); "+
			"check the value and its unit", entered(p, w.Field))
	case assess.WarnKineticsExtrapolated:
		name := "?"
		if i := int(v["organism_index"]); i >= 0 && i < len(p.Organisms) {
			name = p.Organisms[i].Name
		}
		return fmt.Sprintf("the kinetics of %s are used at %s, %s from their D_temperature %s: beyond %s they are an extrapolation, "+
			"and the log reduction (%s) rests on it; use kinetics measured near the holding temperature",
			name, d.temp(v["used_at_C"]), d.diff(v["distance_K"]), d.temp(v["D_temperature_C"]), d.diff(assess.KineticsRange), LogText(v["log_reduction"])+" log")
	case assess.WarnProductFrozen:
		limit := "0 °C, where water freezes"
		if v["freezing_point_entered"] == 1 {
			limit = "its freezing point " + d.temp(v["limit_C"]) + " (product.freezing_point)"
		} else if d.Sys == units.US {
			limit = "32 °F, where water freezes"
		}
		stage := w.Field
		if i := int(v["stage_index"]); i >= 0 && i < len(p.Cooling) {
			stage = fmt.Sprintf("the cooling stage %q", p.Cooling[i].Name)
		}
		return fmt.Sprintf("%s cools the product to %s, below %s: the product would freeze in the plates; check the medium inlet and the plates",
			stage, d.With(v["product_out_C"], units.Temperature, 2), limit)
	case assess.WarnMediumPressurised:
		return fmt.Sprintf("the heating medium must enter at %s, above %s: a water medium that hot must be pressurised (or the plates need more area)",
			d.temp(v["medium_in_C"]), d.temp(v["boiling_C"]))
	case assess.WarnOutletWarm:
		return fmt.Sprintf("the product leaves the pasteurizer at %s, above the %s many codes set for pasteurized milk (PMO); "+
			"cool it further, or set process.outlet_target to the temperature your product's code allows", d.temp(v["outlet_C"]), d.coldLimit(v["limit_C"]))
	case assess.NoteOutletWarm:
		return fmt.Sprintf("the product leaves the pasteurizer at %s, above the %s many codes set for pasteurized milk, as process.outlet_target "+
			"(%s) allows on purpose", d.temp(v["outlet_C"]), d.coldLimit(v["limit_C"]), d.temp(v["target_C"]))
	case assess.WarnAcceptanceNotJudged:
		return notJudgedText(w, p, d)
	case assess.WarnHoldingTimeNotJudged:
		return "no legal time–temperature rows are entered (legal_minimums, or legal_table with its line's legal_tables): the holding " +
			"time is shown but NOT JUDGED against a legal minimum; enter the rows your regulator applies (a schedule judged by its " +
			"log reduction alone has none)"
	case assess.WarnLegalRowCool:
		inF := false
		if i := int(v["row_index"]); i >= 0 && i < len(p.LegalMinimums) {
			inF = p.LegalMinimums[i].Temperature.System == units.US
		}
		return fmt.Sprintf("%s %s (%s) is below %s, below any pasteurization temperature the trade uses (the coolest published row is "+
			"liquid egg white's 132 °F, 55.6 °C, for 6.2 min: 9 CFR 590.570): a temperature meant in the other scale? check the row's unit",
			w.Field, entered(p, w.Field), otherScale(v["temperature_C"], inF), d.With(v["floor_C"], units.Temperature, 0))
	case assess.WarnScalesMixed:
		celsius, fahrenheit := assess.TemperatureFields(p)
		return fmt.Sprintf("temperatures are written in both °C (%s) and °F (%s): each is converted as written, but a mix often means "+
			"a value typed in the wrong scale; check each", fieldList(celsius), fieldList(fahrenheit))
	case assess.WarnTimingTestDiffers:
		return timingDiffersText(w, p, d)
	case assess.WarnTimingTestBelowSeal:
		what := "a holding-time test"
		if i := int(v["test_index"]); i >= 0 && i < len(p.Acceptance) {
			what = fmt.Sprintf("the holding-time test of %s (acceptance[%d])", p.Acceptance[i].Date.Format(units.DateLayout), i)
		}
		return fmt.Sprintf("%s was timed at %s, below the sealed maximum %s: its time at the seal is the model's scaling of it, "+
			"not a measurement; the regulator's holding-time test is timed at the sealed maximum, so repeat it at the seal now in force",
			what, d.With(v["test_flow_m3_s"], units.VolumeFlow, d.flowPrec()), d.With(v["seal_m3_s"], units.VolumeFlow, d.flowPrec()))
	case assess.WarnViscosityRises:
		point := strings.TrimSuffix(w.Field, ".value")
		return fmt.Sprintf("%s: %s at %s is above %s at %s: liquid foods thin as they warm (unless starch or egg proteins set), "+
			"so a rise is most often a typo; check the points", point, d.g4(v["value_Pa_s"], units.Viscosity), d.temp(v["at_C"]),
			d.g4(v["below_value_Pa_s"], units.Viscosity), d.temp(v["below_at_C"]))
	case assess.WarnLineProductBlock:
		blocks := assess.LineBlocks(p)
		what := "a block of a product"
		if len(blocks) > 1 {
			what = "blocks of a product"
		}
		return fmt.Sprintf("%s gives %s, %s, not of the line's equipment: a product file that leaves one out inherits the line's, "+
			"whole (%.0f of the products here do); give each product file its own", filepath.Base(p.File), strings.Join(blocks, ", "), what,
			v["inheriting"])
	case assess.NoteExactSensor:
		return "process.sensor_accuracy is not given: the holding time, the legal row and the log reductions are judged at the setpoint " +
			"itself, which assumes an exact diversion sensor; enter the sensor's stated accuracy to judge them at the lowest temperature " +
			"that may go forward"
	case assess.NoteSealFromRate:
		return fmt.Sprintf("flow.max_rate is not entered: the normal rate %s is taken as the sealed maximum, at which the holding tube is judged", d.flow(v["rate_m3_s"]))
	case assess.NoteRateFromSeal:
		return fmt.Sprintf("flow.rate is not entered: the sealed maximum %s is taken as the normal rate, at which the sections are computed", d.flow(v["rate_m3_s"]))
	case assess.WarnRunTemperatureUnit, assess.WarnRunFlowUnit:
		return runUnitText(w, d)
	}
	if text, ok := packWarningText(w, p, d); ok {
		return text
	}
	panic(fmt.Sprintf("%sno words for warning %q", panicPrefix, w.Code))
}

// otherScale is a temperature in the scale it was not written in: °C for
// one written in °F (72 °F: "22.2 °C"), °F for one in °C (72 °C: "161.6 °F").
func otherScale(c float64, writtenInF bool) string {
	if writtenInF {
		return fmt.Sprintf("%.1f °C", c)
	}
	return fmt.Sprintf("%.1f °F", units.FromSI(c, units.Temperature, "°F"))
}

// fieldList names fields: every one up to five, else the first four and
// how many more.
func fieldList(fields []string) string {
	if len(fields) <= 5 {
		return strings.Join(fields, ", ")
	}
	return strings.Join(fields[:4], ", ") + fmt.Sprintf(" and %d more", len(fields)-4)
}

// timingDiffersText words a holding-time test far from the model: which way,
// and what each way points to.
func timingDiffersText(w assess.Warning, p *plantfile.Plant, d Display) string {
	v := w.Values
	i := int(v["test_index"])
	what := "a holding-time test"
	if i >= 0 && i < len(p.Acceptance) {
		what = fmt.Sprintf("the holding-time test of %s (acceptance[%d])", p.Acceptance[i].Date.Format(units.DateLayout), i)
	}
	diff := v["difference"] * 100
	if diff > 0 {
		return fmt.Sprintf("%s measured %.2f s, %.1f %% LONGER than the %.2f s the model gives for that test: the model or the test is wrong "+
			"(a tube longer or wider than entered, a test flow other than entered, or a timing error); find which before relying on either",
			what, v["measured_s"], diff, v["model_s"])
	}
	return fmt.Sprintf("%s measured %.2f s, %.1f %% SHORTER than the %.2f s the model gives for that test: the model or the test is wrong, "+
		"and the model may overstate the holding time (a tube shorter or narrower than entered, a flow above the one entered, or a timing "+
		"error); find which before relying on either", what, v["measured_s"], -diff, v["model_s"])
}

// Warnings are a result's warnings in words (notes left out).
func Warnings(res *assess.Result, d Display) []string { return worded(res, d, false) }

// Notes are a result's notes in words.
func Notes(res *assess.Result, d Display) []string { return worded(res, d, true) }

func worded(res *assess.Result, d Display, notes bool) []string {
	var out []string
	for _, w := range res.Warnings {
		if w.Note == notes {
			out = append(out, WarningText(w, res.Plant, d))
		}
	}
	return out
}

// flowPhrase says at which flow a holding-tube check was judged.
func (d Display) flowPhrase(x assess.CheckDetail) string {
	if x.AtSeal {
		return "at the sealed maximum flow"
	}
	return fmt.Sprintf("at %s (%s, just below Re 4000), the worst flow up to the seal", d.flow(x.FlowM3s), x.Regime)
}

// judgedPhrase says at which temperature a holding-time check was judged.
func (d Display) judgedPhrase(x assess.CheckDetail) string {
	if x.AccuracyK > 0 {
		return fmt.Sprintf("; judged at %s%s", d.With(x.JudgedC, units.Temperature, 2), d.accuracyPhrase(x))
	}
	return ""
}

// accuracyPhrase explains a judged temperature below the setpoint.
func (d Display) accuracyPhrase(x assess.CheckDetail) string {
	if x.AccuracyK > 0 {
		return fmt.Sprintf(", the setpoint %s less the sensor accuracy %s", d.With(x.SetpointC, units.Temperature, 2),
			d.With(x.AccuracyK, units.TemperatureDifference, 2))
	}
	return ""
}

// flow is a volumetric flow with enough digits to be non-zero.
func (d Display) flow(q float64) string {
	v := units.FromSI(q, units.VolumeFlow, d.Unit(units.VolumeFlow))
	if v < 100 {
		return fmt.Sprintf("%.3g %s", v, d.Unit(units.VolumeFlow))
	}
	return fmt.Sprintf("%.0f %s", v, d.Unit(units.VolumeFlow))
}

// Flow is a volumetric flow in display units, with enough digits to be
// non-zero (a small flow is not printed "0 gpm").
func (d Display) Flow(q float64) string { return d.flow(q) }

// riseText is a setpoint rise that is enough: rounded up at the printed
// precision (0.25 K prints "0.3 K", never "0.2 K", which would not reach the
// row), with enough digits to be non-zero.
func (d Display) riseText(k float64) string {
	prec := 1
	for ; prec < 6; prec++ {
		if strings.Trim(d.Num(k, units.TemperatureDifference, prec), "0.") != "" {
			break
		}
	}
	unit := d.Unit(units.TemperatureDifference)
	scale := math.Pow(10, float64(prec))
	// Up, but not past a value that is whole at this precision by the last
	// bits of rounding (3.0000000001 K stays "3.0 K").
	v := math.Ceil(units.FromSI(k, units.TemperatureDifference, unit)*scale-1e-6) / scale
	return fmt.Sprintf("%.*f %s", prec, v, unit)
}

// coldLimit is the cold outlet limit: 7 °C, or 45 °F in US units.
func (d Display) coldLimit(c float64) string {
	if d.Sys == units.US {
		return fmt.Sprintf("%.0f °F", units.FromSI(c, units.Temperature, "°F"))
	}
	return fmt.Sprintf("%.0f °C", c)
}

// LogCap is the largest log reduction printed in text; above it the text says
// "> 50" (JSON keeps the exact value): so many logs mean kinetics used far
// outside their data, not a real count.
const LogCap = 50.0

// LogText is a log reduction with two decimals, or "> 50" above LogCap.
func LogText(lr float64) string {
	if lr > LogCap {
		return fmt.Sprintf("> %.0f", LogCap)
	}
	return fmt.Sprintf("%.2f", lr)
}

// ForJSON is a copy of the result with every note and warning message in
// words, in SI (the JSON contract is SI throughout).
func ForJSON(res *assess.Result) *assess.Result {
	out := *res
	si := Display{Sys: units.SI}
	out.Checks = WordedChecks(res.Checks, si)
	out.Warnings = make([]assess.Warning, len(res.Warnings))
	for i, w := range res.Warnings {
		w.Message = WarningText(w, res.Plant, si)
		out.Warnings[i] = w
	}
	out.CriticalLimits = CriticalLimits(res, si)
	return &out
}

// WordedChecks is a copy of checks with their notes in words.
func WordedChecks(checks []assess.Check, d Display) []assess.Check {
	out := make([]assess.Check, len(checks))
	for i, c := range checks {
		c.Note = CheckNote(c, d)
		out[i] = c
	}
	return out
}

// packWarningText words the plate-pack warnings (docs/METHOD.md §12.5); each
// begins with the section it concerns.
func packWarningText(w assess.Warning, p *plantfile.Plant, d Display) (string, bool) {
	v := w.Values
	section := w.Section
	if section == "" {
		section = "plate pack"
	}
	switch w.Code {
	case assess.WarnPackReynolds:
		return fmt.Sprintf("%s: Re %.0f on the %s is outside %.0f–%.0f, the range of the data behind Martin's plate correlation; "+
			"its film coefficient and pressure drop are extrapolated", section, v["reynolds"], PackSideName(w, p), v["low"], v["high"]), true
	case assess.WarnPackBranch:
		return fmt.Sprintf("%s: Re %.0f on the %s lies within %.0f–%.0f, around Re %.0f where Martin's friction factor switches branch "+
			"(ξ jumps about 5 %%, h about 2 %%): a small change of flow or temperature moves U and the pressure drop across the jump",
			section, v["reynolds"], PackSideName(w, p), v["low"], v["high"], v["switch"]), true
	case assess.WarnPackAngle:
		return fmt.Sprintf("%s: a chevron angle of %.1f° is above the %.0f° of the data behind Martin's plate correlation; U and the pressure drop are extrapolated",
			section, v["angle_rad"]*180/math.Pi, v["high_rad"]*180/math.Pi), true
	case assess.WarnPackApparentViscosity:
		return fmt.Sprintf("%s: the %s is a power-law fluid (n = %.3g), rated with its apparent viscosity at the channel wall shear rate "+
			"in correlations fitted to Newtonian fluids: treat its film coefficient and pressure drop as estimates", section, PackSideName(w, p), v["flow_index"]), true
	case assess.WarnPackUDiffers:
		return fmt.Sprintf("%s: the entered u_value %s differs from the plate pack's clean U %s by %s %% (both before fouling); "+
			"the section uses the entered value: check it against the plate data", section,
			d.g4(v["entered_W_m2K"], units.HeatTransferCoefficient), d.g4(v["computed_clean_W_m2K"], units.HeatTransferCoefficient),
			Signed(fmt.Sprintf("%.0f", v["difference"]*100))), true
	case assess.WarnPackViscosityExtrapolated:
		return fmt.Sprintf("%s: the product in the plate pack reaches %s, outside the entered viscosity points (%s to %s), where the nearest "+
			"point's viscosity is held; add a viscosity point there", section, d.temp(v["at_C"]), d.temp(v["lowest_C"]), d.temp(v["highest_C"])), true
	}
	return "", false
}

// PackSideName names the stream on one side of a section's plate pack, from
// the side's plant-file path: "raw product" and "pasteurized product" in
// regeneration, "product" and the medium's name elsewhere.
func PackSideName(w assess.Warning, p *plantfile.Plant) string {
	other := strings.HasSuffix(w.Field, ".other_side")
	switch {
	case strings.HasPrefix(w.Field, "regeneration.") && other:
		return "pasteurized-product side"
	case strings.HasPrefix(w.Field, "regeneration."):
		return "raw-product side"
	case !other:
		return "product side"
	case strings.HasPrefix(w.Field, "heating.") && p.Heating != nil:
		return p.Heating.Medium.Name + " side"
	}
	for i, c := range p.Cooling {
		if strings.HasPrefix(w.Field, fmt.Sprintf("cooling[%d].", i)) {
			return c.Medium.Name + " side"
		}
	}
	return "other side"
}
