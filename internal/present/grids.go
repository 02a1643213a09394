package present

import (
	"fmt"
	"math"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/regen"
)

// Grid is a table's content: the terminal and the record lay it out their own way.
type Grid struct {
	Headers []string
	Right   []bool // right-aligned (numeric) columns
	Rows    [][]string
}

func grid(headers ...string) Grid {
	g := Grid{Right: make([]bool, len(headers))}
	for i, h := range headers {
		if strings.HasPrefix(h, ">") {
			g.Right[i], h = true, h[1:]
		}
		g.Headers = append(g.Headers, h)
	}
	return g
}

func (g *Grid) add(cells ...string) { g.Rows = append(g.Rows, cells) }

// SectionLabel names a section: "regeneration", "cooling: chilled water".
func SectionLabel(s assess.Section) string {
	if s.Stage != "" {
		return s.Name + ": " + s.Stage
	}
	return s.Name
}

// OtherStream names the stream on a section's other side.
func OtherStream(p *plantfile.Plant, s assess.Section) string {
	switch s.Kind {
	case regen.RegenerationSection:
		return "pasteurized product"
	case regen.HeatingSection:
		if p.Heating != nil {
			return p.Heating.Medium.Name
		}
		return ""
	case regen.CoolingSection:
		for _, c := range p.Cooling {
			if c.Name == s.Stage {
				return c.Medium.Name
			}
		}
		return ""
	}
	panic(fmt.Sprintf("%sno other stream for section kind %v", panicPrefix, int(s.Kind)))
}

// DutyUnit is kW in SI and Btu/h in US units.
func (d Display) DutyUnit() string {
	if d.Sys == units.US {
		return "Btu/h"
	}
	return "kW"
}

// Sections is the duty-and-size table of the heat-exchange sections.
func Sections(res *assess.Result, d Display) Grid {
	area := d.Unit(units.Area)
	g := grid("section", "mode", "arrangement", ">duty "+d.DutyUnit(), ">LMTD "+d.Unit(units.TemperatureDifference),
		">NTU", ">ε", ">required "+area, ">installed "+area, ">plates")
	for _, s := range res.Sections {
		g.add(SectionLabel(s), s.Mode, s.Arrangement, d.Power(s.DutyKW*1e3), d.Num(s.LMTDK, units.TemperatureDifference, 2),
			fmt.Sprintf("%.2f", s.NTU), fmt.Sprintf("%.3f", s.Effectiveness),
			d.Num(s.RequiredAreaM2, units.Area, 2), d.Num(s.InstalledAreaM2, units.Area, 2), fmt.Sprintf("%d", s.Plates))
	}
	return g
}

// Temperatures is the four temperatures of each section.
func Temperatures(res *assess.Result, d Display) Grid {
	g := grid("section", ">product in", ">product out", ">other in", ">other out", "other stream")
	for _, s := range res.Sections {
		other := OtherStream(res.Plant, s)
		if s.MediumAvailableC != nil {
			other += fmt.Sprintf(" (in: required; %s available)", d.With(*s.MediumAvailableC, units.Temperature, 2))
		}
		g.add(SectionLabel(s), d.Num(s.ProductInC, units.Temperature, 2), d.Num(s.ProductOutC, units.Temperature, 2),
			d.Num(s.OtherInC, units.Temperature, 2), d.Num(s.OtherOutC, units.Temperature, 2), other)
	}
	return g
}

// CheckLabel is a check's id, with the organism for log-reduction checks.
func CheckLabel(c assess.Check) string {
	switch {
	case c.Organism != "":
		return string(c.ID) + " (" + c.Organism + ")"
	case c.Section != "":
		return string(c.ID) + " (" + c.Section + ")"
	case c.Name != "":
		return string(c.ID) + " (" + c.Name + ")"
	}
	return string(c.ID)
}

// Checks is the checks table: verdict, required (with ≥ or ≤), actual, margin, note.
func Checks(res *assess.Result, d Display) Grid {
	g := grid("check", "result", ">required", ">actual", ">margin", "note")
	for _, c := range res.Checks {
		verdict := "PASS"
		if !c.Pass {
			verdict = "FAIL"
		}
		op := "≥ "
		switch {
		case c.Unit == "pass":
			op = ""
		case c.Limit == "max":
			op = "≤ "
		}
		req, act := CheckValues(c, d)
		g.add(CheckLabel(c), verdict, op+req, act, CheckMargin(c, d), CheckNote(c, d))
	}
	return g
}

// NotJudged is the result of a plant no check applies to: never PASS.
const NotJudged = "NOT JUDGED: no check applies"

// VerdictWord is a result's verdict in one word: PASS, FAIL, or NOT JUDGED
// when no check applies.
func VerdictWord(res *assess.Result) string {
	switch {
	case !res.Judged:
		return "NOT JUDGED"
	case res.Pass:
		return "PASS"
	}
	return "FAIL"
}

// FlowText is the product rates as entered: a rate the file leaves out is
// said to be the other one, and no rate at all is "not entered".
func FlowText(res *assess.Result, d Display) string {
	f, pp := res.Plant.Flow, res.Product
	normal, seal := d.With(pp.MassFlow/pp.Density, units.VolumeFlow, 0), d.With(pp.MaxMassFlow/pp.Density, units.VolumeFlow, 0)
	switch {
	case f.Rate.Set && f.MaxRate.Set:
		return normal + " normal, " + seal + " sealed maximum"
	case f.Rate.Set:
		return normal + " normal, taken as the sealed maximum (flow.max_rate not entered)"
	case f.MaxRate.Set:
		return seal + " sealed maximum, taken as the normal rate (flow.rate not entered)"
	}
	return "not entered (nothing here needs it: no heat-exchange section or holding tube)"
}

// Overall is the one-line result of the checks.
func Overall(res *assess.Result) string {
	failed := 0
	for _, c := range res.Checks {
		if !c.Pass {
			failed++
		}
	}
	switch {
	case len(res.Checks) == 0:
		return NotJudged
	case failed == 0:
		return fmt.Sprintf("PASS, all %d checks pass", len(res.Checks))
	}
	return fmt.Sprintf("FAIL, %d of %d checks fail", failed, len(res.Checks))
}

// HoldingOverall is the one-line result of hold, whose checks are the
// holding tube's alone (res holds only those): it says so, and names the
// command that judges every check.
func HoldingOverall(res *assess.Result) string {
	failed := 0
	for _, c := range res.Checks {
		if !c.Pass {
			failed++
		}
	}
	const only = "; hold judges the holding tube only: 'pasval check' judges every check"
	switch {
	case len(res.Checks) == 0:
		return "NOT JUDGED: no check of the holding tube applies" + only
	case failed == 0:
		return fmt.Sprintf("PASS, all %d checks of the holding tube pass", len(res.Checks)) + only
	}
	return fmt.Sprintf("FAIL, %d of %d checks of the holding tube fail", failed, len(res.Checks)) + only
}

// HoldingFacts are the holding tube's labelled values.
func HoldingFacts(res *assess.Result, d Display) [][2]string {
	h := res.HoldingTube
	p := res.Plant
	var kv [][2]string
	add := func(k, v string) { kv = append(kv, [2]string{k, v}) }
	geom := fmt.Sprintf("inner diameter %s, length %s, hold-up %s", d.Small(h.InnerDiameterM), d.With(h.LengthM, units.Length, 2),
		d.With(h.VolumeL/1e3, units.Volume, 1))
	if p.HoldingTube.SanitaryTube.Set {
		geom = p.HoldingTube.SanitaryTube.Text + " sanitary tube, " + geom
	}
	add("tube", geom)
	if h.Slope != nil {
		add("slope", fmt.Sprintf("rise %s = %s (minimum %s)", d.Small(p.HoldingTube.Rise.SI), Slope(*h.Slope, d), Slope(h.MinSlope, d)))
	}
	rheo := fmt.Sprintf("viscosity %s at the setpoint", d.With(h.ViscosityPas, units.Viscosity, 3))
	if p.Product.PowerLaw != nil {
		rheo = fmt.Sprintf("power law n = %.3g, K = %s", h.FlowIndex, p.Product.PowerLaw.Consistency.Text)
	}
	add("product", fmt.Sprintf("density %s, %s", d.With(h.DensityKgM3, units.Density, 1), rheo))
	ratio := fmt.Sprintf("%.3f", h.FastestToMean)
	if h.FastestToMeanOverridden {
		ratio += " (entered)"
	}
	add("flow", fmt.Sprintf("mean velocity %s/s, Re %.0f (%s), fastest/mean %s at the sealed maximum", d.With(h.MeanVelocity, units.Length, 3), h.Reynolds, h.Regime, ratio))
	add("residence", fmt.Sprintf("fastest particle %.2f s, mean %.2f s at the sealed maximum", h.MinResidenceS, h.MeanResidenceS))
	if h.WorstFlowAtSeal {
		add("worst flow", "the sealed maximum: no lower flow gives the fastest particle less time")
	} else {
		add("worst flow", fmt.Sprintf("%s (%s, just below Re 4000): fastest/mean %.3f, fastest particle %.2f s; the holding time and log reductions are judged here",
			d.Flow(h.WorstFlowM3s), h.WorstFlowRegime, h.WorstFastestToMean, h.WorstMinResidenceS))
	}
	judged := fmt.Sprintf("the setpoint %s", d.With(h.SetpointC, units.Temperature, 2))
	if h.SensorAccuracyK > 0 {
		judged = fmt.Sprintf("%s, the setpoint %s less the sensor accuracy %s", d.With(h.JudgedTemperatureC, units.Temperature, 2),
			d.With(h.SetpointC, units.Temperature, 2), d.With(h.SensorAccuracyK, units.TemperatureDifference, 2))
	}
	switch {
	case h.CreditHeatLoss:
		judged += "; log reductions with the heat-loss profile (credit taken: holding_tube.credit_heat_loss: true)"
	case h.InletTemperatureC != h.OutletTemperatureC:
		judged += "; log reductions with the tube isothermal there (the heat-loss credit is shown, not taken)"
	}
	add("judged at", judged)
	if h.InletTemperatureC != h.OutletTemperatureC {
		add("temperature", fmt.Sprintf("inlet %s → outlet %s with heat loss; the heater delivers %s at the normal rate",
			d.With(h.InletTemperatureC, units.Temperature, 2), d.With(h.OutletTemperatureC, units.Temperature, 2), d.With(h.HeatingOutletC, units.Temperature, 2)))
	} else {
		add("temperature", fmt.Sprintf("%s throughout (no heat loss entered)", d.With(h.OutletTemperatureC, units.Temperature, 2)))
	}
	if h.PasteurizationUnits != nil {
		add("PU", fmt.Sprintf("%.2f pasteurization units (1 PU = 1 min at 60 °C, z = 7 °C)", *h.PasteurizationUnits))
	}
	return kv
}

// LegalRows is the legal table as entered, with the judged row marked and
// what length or flow would meet each row.
func LegalRows(res *assess.Result, d Display) Grid {
	h := res.HoldingTube
	g := grid("row", ">temperature", ">time", "applies", ">length needed", ">max flow")
	for i, r := range h.Rows {
		applies := "no (above setpoint)"
		if r.AppliesAtSet && !r.Applies {
			applies = "no (above judged temperature)"
		}
		if r.Applies {
			applies = "yes"
			if h.Legal != nil && h.Legal.RowIndex == i {
				applies = "yes: judged"
			}
		}
		maxFlow := d.Flow(r.MaxFlowM3s)
		if r.MaxFlowCapped {
			maxFlow = "≥ " + maxFlow
		}
		g.add(fmt.Sprintf("%d", i+1), d.With(r.TemperatureC, units.Temperature, 1), fmt.Sprintf("%g s", r.TimeS), applies,
			d.With(r.RequiredLengthM, units.Length, 2), maxFlow)
	}
	return g
}

// Lethality is each organism's result: the judged log reduction and, beside
// it, the values at the seal, at the setpoint and with or without the
// heat-loss credit where they differ.
func Lethality(res *assess.Result, d Display) Grid {
	h := res.HoldingTube
	atSeal, atSet := !h.WorstFlowAtSeal, h.SensorAccuracyK > 0
	heatLoss := len(res.Lethality) > 0 && res.Lethality[0].LogReductionCredit != nil
	headers := []string{"organism", ">D at " + d.With(h.JudgedTemperatureC, units.Temperature, 2), ">log reduction"}
	if atSeal {
		headers = append(headers, ">at the seal")
	}
	if atSet {
		headers = append(headers, ">at the setpoint")
	}
	if heatLoss && h.CreditHeatLoss {
		headers = append(headers, ">isothermal")
	} else if heatLoss {
		headers = append(headers, ">with heat-loss credit")
	}
	headers = append(headers, ">required", ">equivalent time at D temperature")
	g := grid(headers...)
	for _, l := range res.Lethality {
		req := "—"
		if l.RequiredLogReduction != nil {
			req = fmt.Sprintf("%.2f", *l.RequiredLogReduction)
		}
		cells := []string{l.Organism, fmt.Sprintf("%.4g s", l.DAtJudgedS), LogText(l.LogReduction)}
		if atSeal {
			cells = append(cells, LogText(l.LogReductionAtSeal))
		}
		if atSet {
			cells = append(cells, LogText(l.LogReductionAtSet))
		}
		if heatLoss && h.CreditHeatLoss {
			cells = append(cells, LogText(l.LogReductionIso))
		} else if heatLoss {
			cells = append(cells, LogText(*l.LogReductionCredit))
		}
		eq := fmt.Sprintf("%.2f s", l.EquivalentTimeS)
		if l.EquivalentTimeS >= 1e6 {
			eq = fmt.Sprintf("%.3g s", l.EquivalentTimeS)
		}
		g.add(append(cells, req, eq)...)
	}
	return g
}

// HoldingHeading is the holding tube's heading: the sealed maximum, at the
// setpoint's density, and the worst flow when it lies below the seal.
func HoldingHeading(res *assess.Result, d Display) string {
	h, pp := res.HoldingTube, res.Product
	seal := d.Flow(h.MaxFlowM3s)
	if entered := pp.MaxMassFlow / pp.Density; math.Abs(entered/h.MaxFlowM3s-1) > 1e-9 {
		seal += fmt.Sprintf(" at the setpoint density (%s at %s)", d.Flow(entered), d.With(pp.Density, units.Density, 1))
	}
	if f := res.Plant.Flow; f.Rate.Set && !f.MaxRate.Set {
		seal += ", the normal rate: flow.max_rate is not entered"
	}
	if h.WorstFlowAtSeal {
		return fmt.Sprintf("judged at the sealed maximum, %s", seal)
	}
	return fmt.Sprintf("sealed maximum %s; judged at %s, the worst flow below it", seal, d.Flow(h.WorstFlowM3s))
}

// AddedLabel is "baseline" or "+N".
func AddedLabel(o assess.PlatesOption) string {
	if o.AddedPlates == 0 {
		return "baseline"
	}
	return fmt.Sprintf("+%d", o.AddedPlates)
}

// ChecksText says whether an option's line still passes every check.
func ChecksText(o assess.PlatesOption) string {
	if o.ChecksPass {
		return "all pass"
	}
	ids := make([]string, len(o.FailedChecks))
	for i, id := range o.FailedChecks {
		ids[i] = string(id)
	}
	return "FAIL: " + strings.Join(ids, ", ")
}

// SectionDetail is one section's full table: every quantity with its unit,
// in two pairs of columns.
func SectionDetail(res *assess.Result, s assess.Section, d Display) Grid {
	raw := s.Raw()
	tu := units.Temperature
	pairs := [][2]string{
		{"mode", s.Mode}, {"arrangement", s.Arrangement},
		{"duty", d.Power(s.DutyKW*1e3) + " " + d.DutyUnit()}, {"LMTD", d.With(s.LMTDK, units.TemperatureDifference, 2)},
		{"NTU", fmt.Sprintf("%.3f", s.NTU)}, {"effectiveness", fmt.Sprintf("%.4f", s.Effectiveness)},
		{"capacity ratio C_min/C_max", fmt.Sprintf("%.4f", raw.CapacityRatio)}, {"U", d.With(s.UWm2K, units.HeatTransferCoefficient, 0)},
		{"area per plate", d.With(s.PlateAreaM2, units.Area, 3)}, {"plates", fmt.Sprintf("%d", s.Plates)},
		{"required area", d.With(s.RequiredAreaM2, units.Area, 2)}, {"installed area", d.With(s.InstalledAreaM2, units.Area, 2)},
		{"product in", d.With(s.ProductInC, tu, 2)}, {"product out", d.With(s.ProductOutC, tu, 2)},
		{OtherStream(res.Plant, s) + " in", d.With(s.OtherInC, tu, 2)}, {OtherStream(res.Plant, s) + " out", d.With(s.OtherOutC, tu, 2)},
	}
	if s.MediumMassFlowKgS > 0 {
		pairs = append(pairs,
			[2]string{"medium mass flow", d.With(s.MediumMassFlowKgS, units.MassFlow, 0)},
			[2]string{"medium specific heat", d.With(raw.MediumSpecificHeat, units.SpecificHeat, 3)})
	}
	if s.MediumAvailableC != nil {
		pairs = append(pairs, [2]string{"medium inlet available", d.With(*s.MediumAvailableC, tu, 2)},
			[2]string{"medium inlet required", d.With(s.OtherInC, tu, 2)})
	}
	pairs = append(pairs, packPairs(res, s, d)...)
	if len(pairs)%2 == 1 {
		pairs = append(pairs, [2]string{"", ""})
	}
	g := grid("quantity", ">value", "quantity", ">value")
	for i := 0; i+1 < len(pairs); i += 2 {
		g.add(pairs[i][0], pairs[i][1], pairs[i+1][0], pairs[i+1][1])
	}
	return g
}

// PlatesLayout is the what-if's regenerator plate pack per option: the
// layout of each side, the raw side's channel velocity, U and the raw side's
// pressure drop (and the pack's own U when the line keeps an entered one).
func PlatesLayout(w *assess.WhatIf, d Display) Grid {
	entered := w.Baseline.OptionPack != nil && w.Baseline.UEntered
	hu := d.Unit(units.HeatTransferCoefficient)
	headers := []string{">added", ">plates", ">raw side", ">pasteurized side", ">raw velocity " + d.Unit(units.Length) + "/s", ">U " + hu}
	if entered {
		headers = append(headers, ">pack U "+hu)
	}
	g := grid(append(headers, ">raw Δp "+d.Unit(units.Pressure))...)
	for _, o := range append([]assess.PlatesOption{w.Baseline}, w.Options...) {
		x := o.OptionPack
		if x == nil {
			continue
		}
		row := []string{AddedLabel(o), fmt.Sprint(o.Plates), fmt.Sprintf("%d × %d", x.PassesProduct, x.ChannelsPerPassProduct),
			fmt.Sprintf("%d × %d", x.PassesOther, x.ChannelsPerPassOther), d.Num(x.VelocityProductMS, units.Length, 3),
			d.Num(x.UWm2K, units.HeatTransferCoefficient, 0)}
		if entered {
			row = append(row, d.Num(x.UServiceWm2K, units.HeatTransferCoefficient, 0))
		}
		g.add(append(row, d.Num(x.PressureDropProductKPa*1e3, units.Pressure, 1))...)
	}
	return g
}

// NotRejudgedNotes say what the options take as the plant file states it
// rather than judge anew (assess.WhatIf.NotRejudged).
func NotRejudgedNotes(w *assess.WhatIf) []string {
	var notes []string
	for _, what := range w.NotRejudged {
		switch what {
		case assess.NotRejudgedAcceptance:
			notes = append(notes, "The checks column judges the line as computed, not the acceptance tests on record: those were measured "+
				"on the installed equipment (check and due judge them), and a change of plates makes the tests the regulator requires "+
				"after a change due again.")
		case assess.NotRejudgedRegeneratorPressure:
			notes = append(notes, "regenerator-pressure is judged with the pressures entered for the installed plates; more plates change "+
				"the pressure drops on both sides, so measure the pressures again after the change.")
		}
	}
	return notes
}

// LayoutNotes explain how a what-if laid out the added plates: the step of
// the layout, the options rounded to it, and an entered U that the line kept.
func LayoutNotes(w *assess.WhatIf) []string {
	b := w.Baseline.OptionPack
	if w.Layout == assess.LayoutNone || b == nil {
		return nil
	}
	var notes []string
	switch w.Layout {
	case assess.LayoutChannels:
		notes = append(notes, fmt.Sprintf("Plates are added as channels per pass (passes × channels per pass on each side): one more channel per pass on both sides "+
			"adds %d plates (%d + %d passes), lowering the channel velocity and with it U and the pressure drop.", w.LayoutStep, b.PassesProduct, b.PassesOther))
	case assess.LayoutPasses:
		notes = append(notes, fmt.Sprintf("Plates are added as whole passes (passes × channels per pass on each side): one more pass on both sides "+
			"adds %d plates (%d + %d channels per pass); the channel velocity and U stay, the pressure drop grows with the passes.",
			w.LayoutStep, b.ChannelsPerPassProduct, b.ChannelsPerPassOther))
	}
	var rounded []string
	for _, r := range w.Rounded {
		rounded = append(rounded, fmt.Sprintf("+%d → +%d", r.Requested, r.Added))
	}
	if len(rounded) > 0 {
		notes = append(notes, "Rounded to whole steps: "+strings.Join(rounded, ", ")+"; requests that round alike are shown once.")
	}
	if b.UEntered {
		notes = append(notes, "The line keeps the regenerator's entered u_value (column U); pack U is what the plate pack itself gives.")
	}
	return notes
}

// packSides names the two streams of a section's plate pack.
func packSides(p *plantfile.Plant, s assess.Section) (string, string) {
	if s.Kind == regen.RegenerationSection {
		return "raw product", "pasteurized product"
	}
	return "product", OtherStream(p, s)
}

// PackSides is the plate-pack table of each side: layout, channel velocity,
// Reynolds number, film coefficient and pressure drop (docs/METHOD.md §12).
func PackSides(res *assess.Result, d Display) Grid {
	g := grid("section", "side", ">passes × channels", ">velocity "+d.Unit(units.Length)+"/s", ">Re",
		">h "+d.Unit(units.HeatTransferCoefficient), ">Δp "+d.Unit(units.Pressure))
	for _, s := range res.Sections {
		f := s.PackFigures
		if f == nil {
			continue
		}
		product, other := packSides(res.Plant, s)
		g.add(SectionLabel(s), product, fmt.Sprintf("%d × %d", f.PassesProduct, f.ChannelsPerPassProduct), d.Num(f.VelocityProductMS, units.Length, 3),
			fmt.Sprintf("%.0f", f.ReynoldsProduct), d.Num(f.HProductWm2K, units.HeatTransferCoefficient, 0), d.Num(f.PressureDropProductKPa*1e3, units.Pressure, 1))
		g.add("", other, fmt.Sprintf("%d × %d", f.PassesOther, f.ChannelsPerPassOther), d.Num(f.VelocityOtherMS, units.Length, 3),
			fmt.Sprintf("%.0f", f.ReynoldsOther), d.Num(f.HOtherWm2K, units.HeatTransferCoefficient, 0), d.Num(f.PressureDropOtherKPa*1e3, units.Pressure, 1))
	}
	return g
}

// PackU is the overall coefficient of each section with a plate pack: clean,
// in service (with fouling), the one the section used and where it came from.
func PackU(res *assess.Result, d Display) Grid {
	hu := d.Unit(units.HeatTransferCoefficient)
	g := grid("section", ">U clean "+hu, ">U service "+hu, ">U used "+hu, "U used is")
	for _, s := range res.Sections {
		f := s.PackFigures
		if f == nil {
			continue
		}
		from := "the plate pack's U in service"
		if diff, ok := s.UDifference(res.Plant); ok {
			from = fmt.Sprintf("the entered u_value, with fouling (u_value %s %% against U clean)", Signed(fmt.Sprintf("%.0f", diff*100)))
		}
		g.add(SectionLabel(s), d.Num(f.UCleanWm2K, units.HeatTransferCoefficient, 0), d.Num(f.UServiceWm2K, units.HeatTransferCoefficient, 0),
			d.Num(s.UWm2K, units.HeatTransferCoefficient, 0), from)
	}
	return g
}

// packPairs are a section's plate-pack quantities for its detail table, the
// two sides of each quantity side by side.
func packPairs(res *assess.Result, s assess.Section, d Display) [][2]string {
	f := s.PackFigures
	if f == nil {
		return nil
	}
	product, other := packSides(res.Plant, s)
	hu := units.HeatTransferCoefficient
	return [][2]string{
		{"U clean (plate pack)", d.With(f.UCleanWm2K, hu, 0)}, {"U in service (plate pack)", d.With(f.UServiceWm2K, hu, 0)},
		{product + ": passes × channels", fmt.Sprintf("%d × %d", f.PassesProduct, f.ChannelsPerPassProduct)},
		{other + ": passes × channels", fmt.Sprintf("%d × %d", f.PassesOther, f.ChannelsPerPassOther)},
		{product + ": velocity", d.With(f.VelocityProductMS, units.Length, 3) + "/s"}, {other + ": velocity", d.With(f.VelocityOtherMS, units.Length, 3) + "/s"},
		{product + ": Reynolds number", fmt.Sprintf("%.0f", f.ReynoldsProduct)}, {other + ": Reynolds number", fmt.Sprintf("%.0f", f.ReynoldsOther)},
		{product + ": film coefficient", d.With(f.HProductWm2K, hu, 0)}, {other + ": film coefficient", d.With(f.HOtherWm2K, hu, 0)},
		{product + ": pressure drop", d.With(f.PressureDropProductKPa*1e3, units.Pressure, 1)},
		{other + ": pressure drop", d.With(f.PressureDropOtherKPa*1e3, units.Pressure, 1)},
	}
}
