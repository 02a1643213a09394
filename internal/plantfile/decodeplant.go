package plantfile

import (
	"fmt"
	"math"
	"strings"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// The decoding of each part of the plant file. Which keys exist, their kinds
// of value and whether they are required come from the field table
// (fields.go); these functions put the values where the model wants them.

var recordKeys = []string{"site", "line", "product", "schedule", "prepared_by", "notes"}

func (d *decoder) decodePlant(p *Plant, top *object) {
	if rec := top.sub("record"); rec != nil {
		for _, k := range recordKeys {
			if v := rec.text(k); v != "" {
				p.Record = append(p.Record, RecordField{Key: k, Value: v})
			}
		}
	}
	defer d.decodeUncertainty(p, top)
	defer d.decodeAcceptance(p, top)
	defer d.decodeEconomics(p, top)
	defer d.decodeHolding(p, top)
	if prod := top.sub("product"); prod != nil {
		d.decodeProduct(&p.Product, prod)
	}
	if fl := top.sub("flow"); fl != nil {
		p.Flow.Pos = d.pos(fl.node)
		p.Flow.Rate = fl.flowRate("rate")
		p.Flow.MaxRate = fl.flowRate("max_rate")
		if !fl.has("rate") && !fl.has("max_rate") {
			d.errorf(fl.node, "flow", "give rate, max_rate or both, e.g. rate: 10000 L/h")
		}
	}
	if pr := top.sub("process"); pr != nil {
		p.Process.SensorAccuracy = pr.quantity("sensor_accuracy")
		p.Process.Pos = d.pos(pr.node)
		p.Process.RawInlet = pr.quantity("raw_inlet")
		p.Process.HoldSetpoint = pr.quantity("hold_setpoint")
		p.Process.OutletTarget = pr.quantity("outlet_target")
	}
	if rg := top.sub("regeneration"); rg != nil {
		r := &Regeneration{Pos: d.pos(rg.node)}
		r.Plates = d.decodePlates(rg)
		r.Ratio, r.RatioPos, r.RatioSet = rg.number("ratio")
		if pr := rg.sub("pressure"); pr != nil {
			r.Pressure = &Pressure{Pos: d.pos(pr.node),
				RawMax:         pr.quantity("raw_max"),
				PasteurizedMin: pr.quantity("pasteurized_min"),
				RequiredMargin: pr.quantity("required_margin"),
			}
		}
		p.Regeneration = r
	}
	if ht := top.sub("heating"); ht != nil {
		p.Heating = &Heating{Pos: d.pos(ht.node), MediumSide: d.decodeMediumSide(ht), MaxMediumToProduct: ht.quantity("max_medium_to_product")}
	}
	for i, n := range top.list("cooling") {
		st := d.object(n, fmt.Sprintf("cooling[%d]", i))
		if st == nil {
			continue
		}
		c := CoolingStage{Pos: d.pos(n), MediumSide: d.decodeMediumSide(st)}
		c.Name = st.text("name")
		if c.Name == "" {
			c.Name = fmt.Sprintf("stage %d", i+1)
		}
		c.ProductOut = st.quantity("product_out")
		p.Cooling = append(p.Cooling, c)
	}
}

func (d *decoder) decodeHolding(p *Plant, top *object) {
	if ht := top.sub("holding_tube"); ht != nil {
		h := &HoldingTube{Pos: d.pos(ht.node)}
		h.InnerDiameter = ht.quantity("inner_diameter")
		h.SanitaryTube = ht.quantity("sanitary_tube")
		h.OuterDiameter = ht.quantity("outer_diameter")
		h.Length = ht.quantity("length")
		h.Rise = ht.quantity("rise")
		h.MinSlope, _, h.MinSlopeSet = ht.number("min_slope")
		h.FastestToMean, _, _ = ht.number("fastest_to_mean")
		h.Ambient = ht.quantity("ambient")
		h.OuterCoefficient = ht.quantity("outer_coefficient")
		h.PU = ht.boolean("pu")
		h.CreditHeatLoss = ht.boolean("credit_heat_loss")
		h.resolveDiameters()
		p.HoldingTube = h
	}
	for i, n := range top.list("organisms") {
		o := d.object(n, fmt.Sprintf("organisms[%d]", i))
		if o == nil {
			continue
		}
		org := Organism{Pos: d.pos(n), Name: o.text("name"),
			D:            o.quantity("D"),
			DTemperature: o.quantity("D_temperature"),
			Z:            o.quantity("z"),
		}
		org.RequiredLogReduction, _, org.RequiredSet = o.number("required_log_reduction")
		p.Organisms = append(p.Organisms, org)
	}
	for i, n := range top.list("legal_minimums") {
		if r, ok := d.legalRow(n, fmt.Sprintf("legal_minimums[%d]", i)); ok {
			p.LegalMinimums = append(p.LegalMinimums, r)
		}
	}
	d.decodeLegalTables(p, top)
}

func (d *decoder) legalRow(n *yaml.Node, path string) (LegalRow, bool) {
	o := d.object(n, path)
	if o == nil {
		return LegalRow{}, false
	}
	return LegalRow{Pos: d.pos(n), Field: path, Temperature: o.quantity("temperature"), Time: o.quantity("time")}, true
}

// decodeLegalTables reads legal_tables and legal_table, and puts the rows
// legal_table picks in LegalMinimums (docs/METHOD.md §16.2); Validate
// refuses the combinations that leave the rows in doubt.
func (d *decoder) decodeLegalTables(p *Plant, top *object) {
	lt := top.sub("legal_tables")
	if lt != nil && len(lt.node.Content) == 0 {
		d.errorf(lt.node, "legal_tables", "no product class is given; write each class's rows, e.g. legal_tables: {milk: [{temperature: 72 °C, time: 15 s}]}")
	}
	for _, name := range lt.names() {
		t := LegalTable{Name: name, Pos: d.pos(lt.keys[name])}
		for i, n := range lt.namedList(name) {
			if r, ok := d.legalRow(n, fmt.Sprintf("legal_tables.%s[%d]", name, i)); ok {
				t.Rows = append(t.Rows, r)
			}
		}
		p.LegalTables = append(p.LegalTables, t)
	}
	p.LegalTable = top.text("legal_table")
	for key, pos := range map[string]*inputerr.Pos{"legal_minimums": &p.LegalPos.Minimums, "legal_tables": &p.LegalPos.Tables, "legal_table": &p.LegalPos.Table} {
		if k := top.keys[key]; k != nil {
			*pos = d.pos(k)
		}
	}
	if p.LegalTable == "" {
		return
	}
	p.LegalPos.Table = d.pos(top.values["legal_table"])
	for _, t := range p.LegalTables {
		if t.Name == p.LegalTable && !top.has("legal_minimums") {
			p.LegalMinimums = t.Rows
		}
	}
}

func (d *decoder) decodeEconomics(p *Plant, top *object) {
	ec := top.sub("economics")
	if ec == nil {
		return
	}
	e := &Economics{Pos: d.pos(ec.node), Currency: ec.text("currency")}
	if e.Currency == "" {
		e.Currency = ec.field("currency").Default
	}
	for _, f := range []struct {
		key string
		dst *float64
		max float64
	}{
		{"operating_hours_per_year", &e.OperatingHoursPerYear, 8784},
		{"heat_price_per_kWh", &e.HeatPricePerKWh, math.Inf(1)},
		{"cooling_price_per_kWh", &e.CoolingPricePerKWh, math.Inf(1)},
		{"plate_cost", &e.PlateCost, math.Inf(1)},
	} {
		v, pos, ok := ec.number(f.key)
		if ok && !(v >= 0 && v <= f.max) {
			what := "a price cannot be negative"
			if f.key == "operating_hours_per_year" {
				what = "expected 0 to 8784 hours a year"
			}
			d.errs = append(d.errs, inputerr.At(pos, "economics."+f.key, "%s, found %g", what, v))
		}
		*f.dst = v
	}
	p.Economics = e
}

func (d *decoder) decodeProduct(pr *Product, o *object) {
	pr.Pos = d.pos(o.node)
	pr.Name = o.text("name")
	pr.Density = o.quantity("density")
	pr.SpecificHeat = o.quantity("specific_heat")
	pr.Conductivity = o.quantity("conductivity")
	pr.FreezingPoint = o.quantity("freezing_point")
	if c := o.sub("composition"); c != nil {
		comp := &Composition{Pos: d.pos(c.node)}
		for _, f := range []struct {
			key string
			dst *float64
		}{{"water", &comp.Water}, {"protein", &comp.Protein}, {"fat", &comp.Fat}, {"carbohydrate", &comp.Carbohydrate},
			{"fiber", &comp.Fiber}, {"ash", &comp.Ash}} {
			*f.dst, _, _ = c.number(f.key)
		}
		pr.Composition = comp
	}
	for i, n := range o.list("viscosity") {
		vp := d.object(n, fmt.Sprintf("product.viscosity[%d]", i))
		if vp == nil {
			continue
		}
		pr.Viscosity = append(pr.Viscosity, ViscosityPoint{At: vp.quantity("at"), Value: vp.quantity("value")})
	}
	if pl := o.sub("power_law"); pl != nil {
		law := &PowerLaw{Pos: d.pos(pl.node)}
		var ok bool
		law.FlowIndex, _, ok = pl.number("flow_index")
		if ok && !(law.FlowIndex > 0 && law.FlowIndex <= 1.5) {
			d.errorf(pl.values["flow_index"], "product.power_law.flow_index", "the flow index n must be above 0 and at most 1.5, found %g",
				law.FlowIndex)
			ok = false
		}
		pl.field("consistency")
		if ok {
			law.Consistency = pl.quantityOf("consistency", units.ConsistencyKind(law.FlowIndex))
		}
		pr.PowerLaw = law
	}
}

func (d *decoder) decodePlates(o *object) Plates {
	var p Plates
	p.Arrangement = Arrangement(o.enum("arrangement"))
	p.Plates, p.PlatesPos, p.PlatesEntered = o.integer("plates")
	p.PlateArea = o.quantity("plate_area")
	p.UValue = o.quantity("u_value")
	p.Fouling = o.quantity("fouling")
	p.Pack = d.decodePack(o)
	if n, ok := p.Pack.LayoutPlates(); ok && !p.PlatesEntered {
		// Rating mode from the layout; Validate checks an entered count against it.
		p.Plates, p.PlatesPos, p.PlatesFromLayout = n, p.Pack.Product.PassesPos, true
	}
	return p
}

// decodePack reads a section's plate: block and its two sides' layouts;
// nil when none of the three is written (Validate wants all three).
func (d *decoder) decodePack(o *object) *PlatePack {
	pl := o.sub("plate")
	ps, other := o.sub("product_side"), o.sub("other_side")
	if pl == nil && ps == nil && other == nil && !o.has("plate") && !o.has("product_side") && !o.has("other_side") {
		return nil
	}
	pk := &PlatePack{Pos: d.pos(o.node), Geometry: o.has("plate")}
	if pl != nil {
		pk.Pos = d.pos(pl.node)
		pk.ChevronAngle = pl.quantity("chevron_angle")
		pk.PressingDepth = pl.quantity("pressing_depth")
		phi, pos, ok := pl.number("enlargement_factor")
		if ok {
			pk.EnlargementFactor = Quantity{SI: phi, Text: strings.TrimSpace(pl.values["enlargement_factor"].Value), Pos: pos, Set: true}
		}
		pk.ChannelWidth = pl.quantity("channel_width")
		pk.PortToPortLength = pl.quantity("port_to_port_length")
		pk.Thickness = pl.quantity("thickness")
		pk.Conductivity = pl.quantity("conductivity")
		pk.PortDiameter = pl.quantity("port_diameter")
	}
	side := func(s *object, product bool) SideLayout {
		if s == nil {
			return SideLayout{}
		}
		l := SideLayout{Set: true, Pos: d.pos(s.node)}
		l.Passes, l.PassesPos, _ = s.integer("passes")
		l.ChannelsPerPass, l.ChannelsPos, _ = s.integer("channels_per_pass")
		if product {
			l.MaxPressureDrop = s.quantity("max_pressure_drop")
		}
		return l
	}
	pk.Product, pk.Other = side(ps, true), side(other, false)
	return pk
}

func (d *decoder) decodeMediumSide(o *object) MediumSide {
	m := MediumSide{Plates: d.decodePlates(o)}
	m.MediumInlet = o.quantity("medium_inlet")
	m.MediumRate = o.flowRate("medium_rate")
	if word, mo := o.wordOrMapping("medium"); mo != nil {
		m.Medium.Name = mo.text("name")
		m.Medium.Density = mo.quantity("density")
		m.Medium.SpecificHeat = mo.quantity("specific_heat")
		m.Medium.Conductivity = mo.quantity("conductivity")
		m.Medium.Viscosity = mo.quantity("viscosity")
		m.Medium.Pos = d.pos(mo.node)
	} else if word == "water" {
		m.Medium = Medium{Name: "water", Water: true, Pos: d.pos(o.values["medium"])}
	}
	return m
}

// enum reads one of the table's words; absent, it is the table's default.
func (o *object) enum(key string) string {
	f := o.field(key)
	a := o.text(key)
	if a == "" {
		return f.Default
	}
	for _, v := range f.Values {
		if a == v {
			return a
		}
	}
	o.d.errorf(o.values[key], join(o.path, key), "expected %s, found %q%s", orList(f.Values), a, didYouMean(a, f.Values))
	return f.Default
}

// boolean reads true or false; absent, false.
func (o *object) boolean(key string) bool {
	s, n, ok := o.scalar(key, "true or false")
	if !ok {
		return false
	}
	switch s {
	case "true":
		return true
	case "false":
	default:
		o.d.errorf(n, join(o.path, key), "expected true or false, found %q", s)
	}
	return false
}

// wordOrMapping reads a key that is a word of the table's (water) or a
// mapping of its children: it returns the word, or the mapping.
func (o *object) wordOrMapping(key string) (string, *object) {
	f := o.field(key)
	v := o.values[key]
	expect := fmt.Sprintf("%s, or a mapping {%s}", orList(f.Values), joinKeys(allowedKeys(f.Path)))
	switch {
	case v == nil:
		o.d.errorf(o.node, join(o.path, key), "missing; expected %s", expect)
	case v.Kind == yaml.ScalarNode:
		for _, w := range f.Values {
			if v.Value == w {
				return w, nil
			}
		}
		o.d.errorf(v, join(o.path, key), "expected %s, found %q", expect, v.Value)
		// Reported; read on as the first word so that the other keys are checked.
		return f.Values[0], nil
	default:
		return "", o.d.object(v, join(o.path, key))
	}
	return "", nil
}

func orList(words []string) string {
	if len(words) == 1 {
		return words[0]
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}

func joinKeys(keys []string) string {
	out := ""
	for i, k := range keys {
		if i > 0 {
			out += ", "
		}
		out += k
	}
	return out
}
