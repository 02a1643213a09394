package plantfile

import (
	"fmt"
	"strings"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// Validate checks the rules that span fields, before any computation: that
// temperatures are in the right order, that each section is in exactly one
// mode, that flows are positive and that nothing asked for is physically
// impossible by construction (a co-current regenerator above 50 %). It returns
// an inputerr.List or nil.
func Validate(p *Plant) error {
	v := &validator{}
	v.product(p)
	v.flow(p)
	v.process(p)
	if p.Regeneration != nil {
		v.regeneration(p)
	}
	if p.Heating != nil {
		v.mediumSide("heating", p.Heating.Pos, &p.Heating.MediumSide)
		v.positive(p.Heating.MaxMediumToProduct, "heating.max_medium_to_product")
		if p.Heating.Plates.Plates == 0 && p.Heating.MediumInlet.Set && p.Process.HoldSetpoint.Set &&
			!(p.Heating.MediumInlet.SI > p.Process.HoldSetpoint.SI) {
			v.add(p.Heating.MediumInlet.Pos, "heating.medium_inlet",
				"temperature cross: the medium enters at %s, not above the %s the product must reach; raise the medium inlet",
				p.Heating.MediumInlet.Text, p.Process.HoldSetpoint.Text)
		}
	}
	for i := range p.Cooling {
		v.cooling(p, i)
	}
	if len(p.Cooling) > 0 && !p.Process.OutletTarget.Set {
		v.add(p.Process.Pos, "process.outlet_target", "missing; cooling is described, so give the product outlet target, e.g. 4 °C")
	}
	if (p.Regeneration != nil || p.Heating != nil || len(p.Cooling) > 0) && !p.Flow.Rate.Set && !p.Flow.MaxRate.Set {
		v.add(inputerr.Pos{File: p.File, Line: 1, Column: 1}, "flow.rate", "missing; the heat-exchange sections need the product rate, e.g. flow: {rate: 10000 L/h}")
	}
	v.holding(p)
	v.uncertainty(p)
	v.acceptance(p)
	if len(v.errs) == 0 {
		return nil
	}
	for _, e := range v.errs {
		if e.Pos.File == "" {
			e.Pos.File = p.File
		}
	}
	sortErrors(v.errs, p.File)
	return v.errs
}

// The z-values read, K: published z-values of vegetative bacteria lie
// around 4–12 K, of spores around 10 K, of enzymes and quality factors up to
// some 50 K (common practice). Far outside this a log reduction is no longer
// a physical statement (z = 0.01 K gives 10^70 decades per kelvin), so such a
// z is refused where it is read rather than warned about.
const (
	MinZ = 1.0
	MaxZ = 100.0
)

type validator struct {
	errs inputerr.List
}

func (v *validator) add(pos inputerr.Pos, field, format string, args ...any) {
	v.errs = append(v.errs, &inputerr.Error{Pos: pos, Field: field, Msg: fmt.Sprintf(format, args...)})
}

// refused says whether an error has been found at a field already.
func (v *validator) refused(field string) bool {
	for _, e := range v.errs {
		if e.Field == field {
			return true
		}
	}
	return false
}

// positive checks an entered quantity is above zero.
func (v *validator) positive(q Quantity, field string) {
	if q.Set && !(q.SI > 0) {
		v.add(q.Pos, field, "must be greater than zero, found %s", q.Text)
	}
}

func (v *validator) product(p *Plant) {
	pr := &p.Product
	v.positive(pr.Density, "product.density")
	v.positive(pr.SpecificHeat, "product.specific_heat")
	v.positive(pr.Conductivity, "product.conductivity")
	if pr.Composition != nil {
		if err := pr.Composition.validate(); err != nil {
			v.add(pr.Composition.Pos, "product.composition", "%v", err)
		}
	} else {
		if !pr.Density.Set && pr.Name != "" {
			v.add(pr.Pos, "product.density", "missing; give density (e.g. 1030 kg/m3) or a composition")
		}
		if !pr.SpecificHeat.Set && pr.Name != "" {
			v.add(pr.Pos, "product.specific_heat", "missing; give specific_heat (e.g. 3.93 kJ/(kg*K)) or a composition")
		}
	}
	if len(pr.Viscosity) > 0 && pr.PowerLaw != nil {
		v.add(pr.PowerLaw.Pos, "product.power_law", "give either viscosity points (Newtonian) or power_law, not both")
	}
	for i, pt := range pr.Viscosity {
		f := fmt.Sprintf("product.viscosity[%d]", i)
		v.positive(pt.Value, f+".value")
		for j := range i {
			if pt.At.Set && pr.Viscosity[j].At.Set && units.SameTemperature(pt.At.SI, pr.Viscosity[j].At.SI) {
				v.add(pt.At.Pos, f+".at", "%s is the same temperature as viscosity[%d] (%s); give each temperature once",
					pt.At.Text, j, pr.Viscosity[j].At.Text)
				break
			}
		}
	}
	if pr.PowerLaw != nil {
		v.positive(pr.PowerLaw.Consistency, "product.power_law.consistency")
	}
	if section := firstPack(p); section != "" && pr.Name != "" {
		if !pr.Conductivity.Set && pr.Composition == nil {
			v.add(pr.Pos, "product.conductivity", "missing; the plate pack of %s needs the product's thermal conductivity: give conductivity (e.g. 0.6 W/(m*K)) or a composition (Choi–Okos)", section)
		}
		if len(pr.Viscosity) == 0 && pr.PowerLaw == nil {
			v.add(pr.Pos, "product.viscosity", "missing; the plate pack of %s needs the product's viscosity: give viscosity points or power_law", section)
		}
	}
}

// firstPack names the first section with a plate pack, or "".
func firstPack(p *Plant) string {
	switch {
	case p.Regeneration != nil && p.Regeneration.Pack != nil:
		return "regeneration"
	case p.Heating != nil && p.Heating.Pack != nil:
		return "heating"
	}
	for i, c := range p.Cooling {
		if c.Pack != nil {
			return fmt.Sprintf("cooling[%d]", i)
		}
	}
	return ""
}

func (v *validator) flow(p *Plant) {
	f := &p.Flow
	for _, r := range []struct {
		q     FlowRate
		field string
	}{{f.Rate, "flow.rate"}, {f.MaxRate, "flow.max_rate"}} {
		if r.q.Set && !(r.q.SI > 0) {
			v.add(r.q.Pos, r.field, "the flow must be greater than zero, found %s", r.q.Text)
		}
	}
	// The normal rate against the sealed maximum needs the density when one is
	// by mass and the other by volume: assess compares them (ratesInOrder).
}

func (v *validator) process(p *Plant) {
	pr := &p.Process
	if pr.RawInlet.Set && pr.HoldSetpoint.Set && !(pr.RawInlet.SI < pr.HoldSetpoint.SI) {
		v.add(pr.RawInlet.Pos, "process.raw_inlet", "the raw inlet %s must be below the hold setpoint %s", pr.RawInlet.Text, pr.HoldSetpoint.Text)
	}
	if pr.OutletTarget.Set && pr.HoldSetpoint.Set && !(pr.OutletTarget.SI < pr.HoldSetpoint.SI) {
		v.add(pr.OutletTarget.Pos, "process.outlet_target", "the outlet target %s must be below the hold setpoint %s", pr.OutletTarget.Text, pr.HoldSetpoint.Text)
	}
	if pr.HoldSetpoint.Set && (pr.HoldSetpoint.SI > 150 || pr.HoldSetpoint.SI < 30) {
		v.add(pr.HoldSetpoint.Pos, "process.hold_setpoint", "%s is outside 30–150 °C, the range this tool covers for continuous pasteurizers", pr.HoldSetpoint.Text)
	}
	if pr.RawInlet.Set && pr.RawInlet.SI < -5 {
		v.add(pr.RawInlet.Pos, "process.raw_inlet", "%s is below −5 °C; a liquid product is expected", pr.RawInlet.Text)
	}
}

func (v *validator) plates(section string, pos inputerr.Pos, pl *Plates) {
	v.positive(pl.PlateArea, section+".plate_area")
	v.positive(pl.UValue, section+".u_value")
	if pl.Fouling.Set && pl.Fouling.SI < 0 {
		v.add(pl.Fouling.Pos, section+".fouling", "a fouling resistance cannot be negative, found %s", pl.Fouling.Text)
	}
	if pl.Pack == nil {
		if !pl.UValue.Set {
			v.add(pos, section+".u_value", "missing; give u_value (e.g. 3300 W/(m2*K)), or describe the plate pack (plate, product_side, other_side) to compute it")
		}
		return
	}
	v.pack(section, pos, pl)
}

// pack checks a plate pack's structure: all three blocks, the passes on both
// sides or on neither, and an entered plate count that the layout gives.
// The ranges of its values are the engine's (regen.PlatePack.Validate),
// checked when the plant is computed.
func (v *validator) pack(section string, pos inputerr.Pos, pl *Plates) {
	pk := pl.Pack
	if !pk.Geometry {
		v.add(pos, section+".plate", "missing; product_side and other_side describe a plate pack's layout, which needs its plate geometry too")
	}
	for _, side := range []struct {
		l    SideLayout
		name string
	}{{pk.Product, "product_side"}, {pk.Other, "other_side"}} {
		if !side.l.Set {
			v.add(pos, section+"."+side.name, "missing; a plate pack needs the layout of both sides, e.g. %s: {passes: 8, channels_per_pass: 7}", side.name)
		}
	}
	if !pk.Product.Set || !pk.Other.Set {
		return
	}
	p, o := pk.Product, pk.Other
	switch {
	case (p.Passes == 0) != (o.Passes == 0):
		given, missing := section+".product_side.passes", section+".other_side"
		at := p.PassesPos
		if p.Passes == 0 {
			given, missing, at = section+".other_side.passes", section+".product_side", o.PassesPos
		}
		v.add(at, given, "%s gives no passes; give the passes of both sides (rating mode) or of neither (sizing mode: the fewest passes are found)", missing)
	case p.Passes == 0 && pl.PlatesEntered:
		v.add(pl.PlatesPos, section+".plates",
			"with a plate pack, rating mode takes the passes of both sides (the plates are then both sides' channels − 1); give product_side.passes and other_side.passes, or remove plates to size the pack")
	case p.Passes > 0 && pl.PlatesEntered:
		if n, _ := pk.LayoutPlates(); n != pl.Plates {
			v.add(pl.PlatesPos, section+".plates",
				"%d thermal plates, but the layout gives %d × %d + %d × %d − 1 = %d (product_side.passes at line %d, other_side.passes at line %d); make them agree or remove plates",
				pl.Plates, p.Passes, p.ChannelsPerPass, o.Passes, o.ChannelsPerPass, n, p.PassesPos.Line, o.PassesPos.Line)
		}
	}
	v.positive(p.MaxPressureDrop, section+".product_side.max_pressure_drop")
}

func (v *validator) regeneration(p *Plant) {
	r := p.Regeneration
	v.plates("regeneration", r.Pos, &r.Plates)
	switch {
	case r.RatioSet && r.Plates.PlatesFromLayout:
		v.add(r.RatioPos, "regeneration.ratio", "give either ratio (sizing: the fewest passes are found) or the passes of both sides (rating), not both")
	case r.RatioSet && r.Plates.Plates > 0:
		v.add(r.RatioPos, "regeneration.ratio", "give either ratio (sizing) or plates (rating), not both")
	case !r.RatioSet && r.Plates.Plates == 0 && r.Pack != nil:
		if r.Pack.layoutComplete() { // else the layout's own error says what is missing
			v.add(r.Pos, "regeneration.ratio", "missing; give ratio (sizing, e.g. 0.92) or the passes of both sides of the plate pack (rating)")
		}
	case !r.RatioSet && r.Plates.Plates == 0:
		v.add(r.Pos, "regeneration.ratio", "missing; give ratio (sizing, e.g. 0.92) or plates (rating, e.g. 112)")
	case r.RatioSet && !(r.Ratio > 0 && r.Ratio < 1):
		v.add(r.RatioPos, "regeneration.ratio", "the regeneration ratio must be between 0 and 1 (exclusive), found %g; 1 would need infinite area", r.Ratio)
	case r.RatioSet && r.Arrangement == Cocurrent && r.Ratio >= 0.5:
		v.add(r.RatioPos, "regeneration.ratio",
			"a co-current regenerator cannot reach %.1f %%: with the same product on both sides (C_r = 1) co-current flow never passes 50 %% however many plates; use counterflow or a ratio below 0.5",
			r.Ratio*100)
	}
}

func (v *validator) mediumSide(section string, pos inputerr.Pos, m *MediumSide) {
	v.plates(section, pos, &m.Plates)
	if m.Pack != nil && !m.Medium.Water && m.Medium.Name != "" {
		for _, q := range []struct {
			q       Quantity
			key, eg string
		}{{m.Medium.Conductivity, "conductivity", "0.45 W/(m*K)"}, {m.Medium.Viscosity, "viscosity", "4 mPa*s"}} {
			if !q.q.Set {
				v.add(m.Medium.Pos, section+".medium."+q.key, "missing; the plate pack needs the medium's %s (e.g. %s) besides its density and specific heat", q.key, q.eg)
			}
		}
	}
	v.positive(m.Medium.Conductivity, section+".medium.conductivity")
	v.positive(m.Medium.Viscosity, section+".medium.viscosity")
	if m.MediumRate.Set && !(m.MediumRate.SI > 0) {
		v.add(m.MediumRate.Pos, section+".medium_rate", "the flow must be greater than zero, found %s", m.MediumRate.Text)
	}
	v.positive(m.Medium.Density, section+".medium.density")
	v.positive(m.Medium.SpecificHeat, section+".medium.specific_heat")
	if m.Medium.Water && m.MediumInlet.Set && (m.MediumInlet.SI < 0.5 || m.MediumInlet.SI > 200) {
		v.add(m.MediumInlet.Pos, section+".medium_inlet",
			"water as a medium is taken between 0.5 and 200 °C, found %s; for glycol or brine give medium: {name, density, specific_heat}", m.MediumInlet.Text)
	}
}

func (v *validator) cooling(p *Plant, i int) {
	c := &p.Cooling[i]
	section := fmt.Sprintf("cooling[%d]", i)
	v.mediumSide(section, c.Pos, &c.MediumSide)
	last := i == len(p.Cooling)-1
	switch {
	case c.Plates.Plates > 0 && c.ProductOut.Set:
		v.add(c.ProductOut.Pos, section+".product_out", "a rated stage (plates given) computes its product outlet; remove product_out or plates")
	case c.Plates.Plates == 0 && !last && !c.ProductOut.Set:
		v.add(c.Pos, section+".product_out", "missing; a sizing stage before the last needs the product outlet it must reach, e.g. 20 °C")
	}
	if c.ProductOut.Set && p.Process.HoldSetpoint.Set && !(c.ProductOut.SI < p.Process.HoldSetpoint.SI) {
		v.add(c.ProductOut.Pos, section+".product_out", "%s is not below the hold setpoint %s", c.ProductOut.Text, p.Process.HoldSetpoint.Text)
	}
	if c.MediumInlet.Set && c.ProductOut.Set && !(c.MediumInlet.SI < c.ProductOut.SI) {
		v.add(c.MediumInlet.Pos, section+".medium_inlet",
			"temperature cross: the medium enters at %s, not below the product outlet %s it must reach", c.MediumInlet.Text, c.ProductOut.Text)
	}
	if last && c.Plates.Plates == 0 && !c.ProductOut.Set && c.MediumInlet.Set && p.Process.OutletTarget.Set &&
		!(c.MediumInlet.SI < p.Process.OutletTarget.SI) {
		v.add(c.MediumInlet.Pos, section+".medium_inlet",
			"temperature cross: the medium enters at %s, not below the outlet target %s the last stage must reach", c.MediumInlet.Text, p.Process.OutletTarget.Text)
	}
}

func (v *validator) holding(p *Plant) {
	if r := p.Regeneration; r != nil && r.Pressure != nil {
		pr := r.Pressure
		if pr.RequiredMargin.Set && pr.RequiredMargin.SI < 0 {
			v.add(pr.RequiredMargin.Pos, "regeneration.pressure.required_margin", "cannot be negative, found %s", pr.RequiredMargin.Text)
		}
	}
	if a := p.Process.SensorAccuracy; a.Set && !(a.SI >= 0 && a.SI <= 5) {
		v.add(a.Pos, "process.sensor_accuracy", "expected a temperature difference from 0 to 5 K, found %s", a.Text)
	}
	for i, o := range p.Organisms {
		f := fmt.Sprintf("organisms[%d]", i)
		v.positive(o.D, f+".D")
		v.positive(o.Z, f+".z")
		if o.Z.Set && o.Z.SI > 0 && !(o.Z.SI >= MinZ && o.Z.SI <= MaxZ) {
			v.add(o.Z.Pos, f+".z", "a z-value of %s is outside %g to %g K, the range of thermal-death kinetics; check the number and its unit",
				o.Z.Text, MinZ, MaxZ)
		}
		if o.RequiredSet && !(o.RequiredLogReduction >= 0 && o.RequiredLogReduction <= 100) {
			v.add(o.Pos, f+".required_log_reduction", "expected a number of log reductions from 0 to 100, found %g", o.RequiredLogReduction)
		}
	}
	v.legalChoice(p)
	if p.LegalTable == "" {
		for _, r := range p.LegalMinimums {
			v.positive(r.Time, r.Field+".time")
		}
	}
	for _, t := range p.LegalTables {
		for _, r := range t.Rows {
			v.positive(r.Time, r.Field+".time")
		}
	}
	h := p.HoldingTube
	if h == nil {
		if len(p.Organisms) > 0 || len(p.LegalMinimums) > 0 {
			v.add(inputerr.Pos{File: p.File, Line: 1, Column: 1}, "holding_tube", "missing; organisms and legal_minimums are judged in the holding tube, so describe it")
		}
		return
	}
	switch {
	case h.InnerDiameter.Set && h.SanitaryTube.Set:
		v.add(h.SanitaryTube.Pos, "holding_tube.sanitary_tube", "give inner_diameter or sanitary_tube, not both")
	case !h.InnerDiameter.Set && !h.SanitaryTube.Set:
		v.add(h.Pos, "holding_tube.inner_diameter", "missing; give inner_diameter (e.g. 47.5 mm) or sanitary_tube (e.g. 2 in)")
	case h.SanitaryTube.Set:
		if _, ok := LookupSanitaryTube(h.SanitaryTube.SI); !ok {
			v.add(h.SanitaryTube.Pos, "holding_tube.sanitary_tube", "%s is not a listed sanitary size; listed: 1.5, 2, 2.5, 3, 4 and 6 in (or give inner_diameter)", h.SanitaryTube.Text)
		}
	}
	v.positive(h.InnerDiameter, "holding_tube.inner_diameter")
	v.positive(h.Length, "holding_tube.length")
	v.positive(h.OuterDiameter, "holding_tube.outer_diameter")
	if h.OuterDiameter.Set && h.InnerDiameter.Set && !(h.OuterDiameter.SI > h.InnerDiameter.SI) {
		v.add(h.OuterDiameter.Pos, "holding_tube.outer_diameter", "%s is not larger than the inner diameter %s", h.OuterDiameter.Text, h.InnerDiameter.Text)
	}
	if h.Rise.Set && h.Length.Set && h.Length.SI > 0 && h.Rise.SI > h.Length.SI {
		v.add(h.Rise.Pos, "holding_tube.rise", "the rise %s is more than the tube length %s", h.Rise.Text, h.Length.Text)
	}
	if h.MinSlopeSet && !(h.MinSlope > 0 && h.MinSlope < 1) {
		v.add(h.Pos, "holding_tube.min_slope", "expected a slope between 0 and 1, e.g. 0.021 or 2.1 cm/m, found %g", h.MinSlope)
	}
	if h.FastestToMean != 0 && !(h.FastestToMean >= 1 && h.FastestToMean <= 3) {
		v.add(h.Pos, "holding_tube.fastest_to_mean", "expected a ratio from 1 to 3 (2 for laminar flow), found %g", h.FastestToMean)
	}
	if h.Ambient.Set != h.OuterCoefficient.Set {
		v.add(h.Pos, "holding_tube.ambient", "heat loss needs both ambient and outer_coefficient")
	}
	if h.OuterCoefficient.Set {
		if h.OuterCoefficient.SI < 0 {
			v.add(h.OuterCoefficient.Pos, "holding_tube.outer_coefficient", "cannot be negative, found %s", h.OuterCoefficient.Text)
		}
		if !h.OuterDiameter.Set && !h.SanitaryTube.Set {
			v.add(h.OuterCoefficient.Pos, "holding_tube.outer_diameter", "missing; heat loss needs the outer diameter (or sanitary_tube)")
		}
		if h.Ambient.Set && p.Process.HoldSetpoint.Set && h.Ambient.SI >= p.Process.HoldSetpoint.SI {
			v.add(h.Ambient.Pos, "holding_tube.ambient", "the ambient %s is not below the setpoint %s; the tube would gain heat", h.Ambient.Text, p.Process.HoldSetpoint.Text)
		}
	}
	if h.CreditHeatLoss && !h.OuterCoefficient.Set {
		v.add(h.Pos, "holding_tube.credit_heat_loss", "true needs heat loss (ambient and outer_coefficient): without it there is no credit to take")
	}
	if len(p.Product.Viscosity) == 0 && p.Product.PowerLaw == nil && p.Product.Name != "" && firstPack(p) == "" {
		v.add(p.Product.Pos, "product.viscosity", "missing; the holding tube's flow regime needs viscosity points or power_law")
	}
	if !p.Flow.Rate.Set && !p.Flow.MaxRate.Set {
		v.add(h.Pos, "flow.max_rate", "missing; the holding time is judged at the sealed maximum flow")
	}
}

// legalChoice checks that the legal rows are given one way
// (docs/METHOD.md §16.2): legal_minimums, or legal_tables with legal_table
// naming one of its classes. Both at once, a pick without tables or of an
// unknown class, and tables without a pick are refused.
func (v *validator) legalChoice(p *Plant) {
	at := p.LegalPos
	var names []string
	for _, t := range p.LegalTables {
		names = append(names, t.Name)
	}
	has := func(pos inputerr.Pos) bool { return pos.Line > 0 }
	switch {
	case p.LegalTable != "" && has(at.Minimums):
		v.add(at.Table, "legal_table", "give legal_table or legal_minimums, not both (legal_minimums at %s)", at.Minimums)
	case has(at.Minimums) && has(at.Tables):
		// Pointed at the one written in the file checked, when the other is its line file's.
		pos, field := at.Minimums, "legal_minimums"
		if at.Minimums.File != p.File && at.Tables.File == p.File {
			pos, field = at.Tables, "legal_tables"
		}
		v.add(pos, field, "give legal_minimums (one table) or legal_tables (rows by product class, picked with legal_table), not both: legal_minimums at %s, legal_tables at %s",
			at.Minimums, at.Tables)
	case p.LegalTable != "" && !has(at.Tables):
		where := "this file gives no legal_tables"
		if p.Line != nil {
			where = "neither this file nor its line file " + p.Line.File + " gives legal_tables"
		}
		v.add(at.Table, "legal_table", "%q names a class of legal_tables, but %s", p.LegalTable, where)
	case p.LegalTable != "":
		for _, n := range names {
			if n == p.LegalTable {
				return
			}
		}
		v.add(at.Table, "legal_table", "no class %q in legal_tables (at %s)%s; the classes are %s", p.LegalTable, at.Tables,
			didYouMean(p.LegalTable, names), strings.Join(names, ", "))
	case has(at.Tables) && p.Product.Name != "":
		v.add(inputerr.Pos{File: p.File, Line: 1, Column: 1}, "legal_table",
			"missing; legal_tables (at %s) gives the legal rows by product class: pick this product's with legal_table: NAME, one of %s",
			at.Tables, strings.Join(names, ", "))
	}
}
