package plantfile

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// The uncertainty block (docs/METHOD.md §14.1): a tolerance and a
// distribution for fields of the plant file, each named by the path its
// errors print (flow.max_rate, organisms[1].D). Which fields may carry one,
// and within what physical range, is the field table's Vary.

// Distribution is how a varied value is drawn.
type Distribution string

const (
	Uniform    Distribution = "uniform"    // uniform on x ± a
	Normal     Distribution = "normal"     // σ = a/2, truncated at x ± 1.5a and at the bounds
	Triangular Distribution = "triangular" // triangular on x ± a, mode x
)

// Tolerance is one entry of the uncertainty block.
type Tolerance struct {
	Path  string // concrete path as written: "organisms[1].D"
	Field Field  // the table's entry for it
	// Relative is true for "±X %": Value is then X/100 of the nominal's
	// magnitude; otherwise Value is the tolerance in SI (a temperature's in K).
	Relative     bool
	Value        float64
	ByMass       bool // a flow's tolerance written as a mass flow
	Text         string
	Distribution Distribution
	Pos          inputerr.Pos // of the path key
	ValuePos     inputerr.Pos // of the tolerance
}

// Nominal is the value a tolerance varies, in SI (temperature points in °C),
// and whether the plant file gives it.
func (p *Plant) Nominal(path string) (float64, bool) {
	for _, in := range p.Inputs {
		if in.Field == path {
			return in.SI, true
		}
	}
	return 0, false
}

// Half is the tolerance a in SI for a nominal value x: X/100·|x| or X.
func (t Tolerance) Half(x float64) float64 {
	if t.Relative {
		return t.Value * math.Abs(x)
	}
	return t.Value
}

// Extent is how far from the nominal a draw may go: a for uniform and
// triangular, 1.5a for normal (its truncation).
func (t Tolerance) Extent(x float64) float64 {
	if t.Distribution == Normal {
		return 1.5 * t.Half(x)
	}
	return t.Half(x)
}

// notVaried says why a scalar field may not carry a tolerance, when the
// reason is more than "margins do not read it".
var notVaried = map[string]string{
	"process.sensor_accuracy": "the sensor's stated accuracy is already judged at its unfavourable end (docs/METHOD.md §9.4); " +
		"to vary the temperature at which the valve cuts out, give process.hold_setpoint a tolerance",
	"organisms[].required_log_reduction": "it is a limit the plant must meet, not a measured quantity",
	"legal_minimums[].temperature":       "it is a limit the plant must meet, not a measured quantity",
	"legal_minimums[].time":              "it is a limit the plant must meet, not a measured quantity",
	"holding_tube.min_slope":             "it is a limit the plant must meet, not a measured quantity",
}

// decodeUncertainty reads the uncertainty block: each key a field path that
// may vary, each value {tolerance, distribution}.
func (d *decoder) decodeUncertainty(p *Plant, top *object) {
	if top == nil {
		return
	}
	top.field(UncertaintyKey)
	n := top.values[UncertaintyKey]
	if n == nil {
		return
	}
	if n.Kind != yaml.MappingNode {
		d.errorf(n, UncertaintyKey, "expected a mapping of field paths to {tolerance, distribution}, e.g. flow.max_rate: {tolerance: ±2 %%, distribution: uniform}; found %s", describe(n))
		return
	}
	if d.consulted != nil {
		d.consulted[uncertaintyEntry] = true
	}
	seen := map[string]int{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		path := strings.TrimSpace(k.Value)
		where := UncertaintyKey + "." + path
		if k.Kind != yaml.ScalarNode || path == "" {
			d.errorf(k, UncertaintyKey, "keys must be field paths such as flow.max_rate")
			continue
		}
		if line, dup := seen[path]; dup {
			d.errorf(k, where, "%q is given twice (first at line %d)", path, line)
			continue
		}
		seen[path] = k.Line
		f, ok := d.variedField(k, path)
		o := d.objectIn(v, where, uncertaintyEntry)
		if o == nil || !ok {
			continue
		}
		t := Tolerance{Path: path, Field: f, Pos: d.pos(k), Distribution: Distribution(o.enum("distribution"))}
		if s, vn, ok := o.scalar("tolerance", "a tolerance such as ±2 % or ±0.2 mm"); ok {
			t.ValuePos = d.pos(vn)
			d.parseTolerance(p, &t, vn, where+".tolerance", s)
		}
		p.Uncertainty = append(p.Uncertainty, t)
	}
}

// variedField checks a path of the uncertainty block: a field of the table,
// a single value, indexed where it sits in a list, and one that may vary.
func (d *decoder) variedField(k *yaml.Node, path string) (Field, bool) {
	where := UncertaintyKey + "." + path
	f, ok := Lookup(path)
	if !ok || strings.HasPrefix(path, UncertaintyKey) {
		var scalars []string
		for _, g := range fields {
			if !g.Container() && !strings.HasPrefix(g.Path, UncertaintyKey) {
				scalars = append(scalars, g.Path)
			}
		}
		hint := ""
		if s := suggestion(listIndex.ReplaceAllString(path, "[]"), scalars); s != "" {
			hint = fmt.Sprintf(" (did you mean %q?)", withIndices(s, path))
		}
		d.errorf(k, where, "unknown field path %q%s; give the path of a plant-file value as its errors print it, e.g. flow.max_rate or organisms[0].D", path, hint)
		return f, false
	}
	if f.Container() {
		example := ""
		for _, c := range Children(strings.TrimSuffix(f.Path, "[]")) {
			if c.Vary != nil {
				example = fmt.Sprintf("; give one of its values, e.g. %s", withIndices(c.Path, path+"[0]"))
				break
			}
		}
		d.errorf(k, where, "%s is a %s, not a single value%s", path, strings.TrimPrefix(valueText(f), "a "), example)
		return f, false
	}
	if strings.Contains(path, "[]") || strings.Count(path, "[") != strings.Count(f.Path, "[]") {
		d.errorf(k, where, "give the list entry's index, e.g. %s", withIndices(f.Path, ""))
		return f, false
	}
	if f.Vary == nil {
		why, ok := notVaried[f.Path]
		switch {
		case ok:
		case f.Value == KindText || f.Value == KindBoolean || f.Value == KindEnum || f.Value == KindInteger:
			why = fmt.Sprintf("it is %s, not a quantity", valueText(f))
		default:
			why = "margins vary only what the holding tube and lethality read (the README lists the fields, under Margins)"
		}
		d.errorf(k, where, "%s cannot carry a tolerance: %s", path, why)
		return f, false
	}
	return f, true
}

// withIndices writes a table path with the indices of a concrete path (0
// where it has none): "organisms[].D" with "organisms[3].d" → "organisms[3].D".
func withIndices(table, concrete string) string {
	idx := listIndex.FindAllString(concrete, -1)
	out := table
	for strings.Contains(out, "[]") {
		i := "[0]"
		if len(idx) > 0 {
			i, idx = idx[0], idx[1:]
		}
		out = strings.Replace(out, "[]", i, 1)
	}
	return out
}

// parseTolerance reads "±X %" or "±X unit" (also "+-" or "+/-") for the
// field of t; a temperature's tolerance is a difference.
func (d *decoder) parseTolerance(p *Plant, t *Tolerance, n *yaml.Node, where, s string) {
	t.Text = strings.TrimSpace(s)
	rest, ok := "", false
	for _, sign := range []string{"±", "+/-", "+-"} {
		if r, found := strings.CutPrefix(t.Text, sign); found {
			rest, ok = strings.TrimSpace(r), true
			break
		}
	}
	if !ok {
		d.errorf(n, where, "expected ±X %% or ±X with a unit, e.g. ±2 %% or ±0.2 mm; found %q", s)
		return
	}
	if num, found := strings.CutSuffix(rest, "%"); found {
		x, err := strconv.ParseFloat(strings.TrimSpace(num), 64)
		switch {
		case err != nil || math.IsInf(x, 0) || math.IsNaN(x):
			d.errorf(n, where, "expected ±X %% with X a number, found %q", s)
		case x < 0:
			d.errorf(n, where, "a tolerance cannot be negative, found %q", s)
		case t.Field.Unit.Name == units.Temperature.Name:
			d.errorf(n, where, "a percentage of a temperature depends on its scale; give the tolerance in kelvin or degrees, e.g. ±0.5 °C")
		default:
			t.Relative, t.Value = true, x/100
			d.inputs = append(d.inputs, Input{Field: where, Text: t.Text, SI: t.Value, SIUnit: "1"})
		}
		return
	}
	var kinds []units.Kind
	switch t.Field.Value {
	case KindQuantity:
		k := t.Field.Unit
		if k.Name == units.Temperature.Name {
			k = units.TemperatureDifference
		}
		kinds = []units.Kind{k}
	case KindFlow:
		kinds = []units.Kind{units.VolumeFlow, units.MassFlow}
	case KindNumber:
		kinds = []units.Kind{units.Dimensionless}
	case KindConsistency:
		if p.Product.PowerLaw == nil || !(p.Product.PowerLaw.FlowIndex > 0) {
			return // Validate says the field is not given
		}
		kinds = []units.Kind{units.ConsistencyKind(p.Product.PowerLaw.FlowIndex)}
	default:
		panic(panicPrefix + "a varied field of kind " + t.Field.Value.String())
	}
	v, k, err := units.ParseEither(rest, kinds...)
	if err != nil {
		d.errorf(n, where, "the tolerance of %s: %v", t.Path, err)
		return
	}
	if v.SI < 0 {
		d.errorf(n, where, "a tolerance cannot be negative, found %q", s)
		return
	}
	t.Value, t.ByMass = v.SI, k.Name == units.MassFlow.Name
	d.inputs = append(d.inputs, Input{Field: where, Text: t.Text, SI: t.Value, SIUnit: k.SIUnit})
}

// uncertainty checks each tolerance against the plant: the value it varies
// is given, its ends x ± a stay within the physical range, and values that
// must keep an order (inner below outer diameter, rise within the length,
// ambient below the setpoint, viscosity points apart) cannot cross.
func (v *validator) uncertainty(p *Plant) {
	type span struct {
		x, e float64 // nominal, extent
		t    *Tolerance
	}
	spans := map[string]span{}
	for i := range p.Uncertainty {
		t := &p.Uncertainty[i]
		where := UncertaintyKey + "." + t.Path
		x, ok := p.Nominal(t.Path)
		if !ok {
			hint := ""
			if t.Path == "holding_tube.inner_diameter" && p.HoldingTube != nil && p.HoldingTube.SanitaryTube.Set {
				hint = " (the tube is given by sanitary_tube: vary holding_tube.sanitary_tube)"
			}
			v.add(t.Pos, where, "%s is not given in the plant file%s; a tolerance varies a value the file gives", t.Path, hint)
			continue
		}
		if t.Path == "process.hold_setpoint" && p.Product.Composition != nil && !(p.Product.Density.Set && p.Product.SpecificHeat.Set) {
			v.add(t.Pos, where, "with product.composition the density and specific heat follow the setpoint (Choi–Okos); "+
				"to vary the setpoint, give product.density and product.specific_heat")
			continue
		}
		if t.Field.Value == KindFlow && !t.Relative {
			byMass := p.Flow.MaxRate.ByMass
			if t.Path == "flow.rate" {
				byMass = p.Flow.Rate.ByMass
			}
			if byMass != t.ByMass {
				kind := map[bool]string{true: "by mass", false: "volumetric"}
				v.add(t.ValuePos, where+".tolerance", "the tolerance %s is %s but %s is entered %s; write both the same way (or as a percentage)",
					t.Text, kind[t.ByMass], t.Path, kind[byMass])
				continue
			}
		}
		a := t.Half(x)
		b := t.Field.Vary.Bound
		if !b.Contains(x) && v.refused(t.Path) {
			continue // the value itself is refused where it is written: once is enough
		}
		if !b.Contains(x-a) || !b.Contains(x+a) {
			unit := ""
			switch {
			case t.Field.Value == KindFlow && (t.Path == "flow.rate" && p.Flow.Rate.ByMass || t.Path != "flow.rate" && p.Flow.MaxRate.ByMass):
				unit = " kg/s"
			case t.Field.Value == KindFlow:
				unit = " m3/s"
			case t.Field.Value == KindQuantity && t.Field.Unit.SIUnit != "1" && t.Field.Unit.SIUnit != "":
				unit = " " + t.Field.Unit.SIUnit
			}
			within := b.String()
			if within != "any value" {
				within += unit
			}
			v.add(t.ValuePos, where+".tolerance", "%s %s reaches %s%s to %s%s, outside the physical range of %s (%s); a narrower tolerance is needed",
				t.Path, t.Text, g(x-a), unit, g(x+a), unit, t.Path, within)
			continue
		}
		spans[t.Path] = span{x, t.Extent(x), t}
	}
	// Pairs that must keep their order at every draw.
	fixed := func(path string) (span, bool) {
		if s, ok := spans[path]; ok {
			return s, true
		}
		x, ok := p.Nominal(path)
		return span{x: x}, ok
	}
	below := func(lo, hi, why string) {
		a, okA := fixed(lo)
		b, okB := fixed(hi)
		if !okA || !okB || (a.t == nil && b.t == nil) {
			return
		}
		if !(a.x+a.e < b.x-b.e) {
			t := a.t
			if t == nil {
				t = b.t
			}
			v.add(t.Pos, UncertaintyKey+"."+t.Path, "with these tolerances %s (up to %s) could reach %s (down to %s): %s",
				lo, g(a.x+a.e), hi, g(b.x-b.e), why)
		}
	}
	below("holding_tube.inner_diameter", "holding_tube.outer_diameter", "the inner diameter must stay below the outer")
	if h := p.HoldingTube; h != nil && h.OuterCoefficient.Set {
		below("holding_tube.ambient", "process.hold_setpoint", "the ambient must stay below the setpoint")
	}
	if _, ok := spans["holding_tube.rise"]; ok || spans["holding_tube.length"].t != nil {
		a, okA := fixed("holding_tube.rise")
		b, okB := fixed("holding_tube.length")
		if okA && okB && a.x+a.e > b.x-b.e {
			t := a.t
			if t == nil {
				t = b.t
			}
			v.add(t.Pos, UncertaintyKey+"."+t.Path, "with these tolerances the rise (up to %s m) could exceed the length (down to %s m)", g(a.x+a.e), g(b.x-b.e))
		}
	}
	// Viscosity points keep their order of temperature.
	type pt struct {
		path string
		s    span
	}
	var pts []pt
	for i := range p.Product.Viscosity {
		path := fmt.Sprintf("product.viscosity[%d].at", i)
		if s, ok := fixed(path); ok {
			pts = append(pts, pt{path, s})
		}
	}
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].s.x < pts[j].s.x })
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		if (a.s.t != nil || b.s.t != nil) && !(a.s.x+a.s.e+1e-9 < b.s.x-b.s.e) {
			t := a.s.t
			if t == nil {
				t = b.s.t
			}
			v.add(t.Pos, UncertaintyKey+"."+t.Path, "with these tolerances %s and %s could meet: viscosity points must keep their order", a.path, b.path)
		}
	}
}

func g(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
