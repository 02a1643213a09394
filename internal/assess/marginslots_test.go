package assess

// Source of the expectations: the plant-file reader itself. A varied value
// must reach the model exactly as re-reading the plant file with that value
// changed would (GatherHolding), so the table of slots cannot drift from
// the reader; and every field the holding model reads must be either
// variable or a limit (so a new holding-tube field is not forgotten).

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"

	"pasval/internal/plantfile"
)

func TestSlotsAreTheFieldTablesVariedFields(t *testing.T) {
	varied := map[string]bool{}
	for _, f := range plantfile.Fields() {
		if f.Vary != nil {
			varied[f.Path] = true
			if _, ok := holdingSlots[f.Path]; !ok {
				t.Errorf("%s may vary (field table) but has no slot in HoldingInputs (holdingSlots)", f.Path)
			}
		}
	}
	for path := range holdingSlots {
		if !varied[path] {
			t.Errorf("holdingSlots has %s, which the field table does not let vary", path)
		}
	}
}

// limits are fields the holding model reads that are limits to meet, not
// measured values, so they carry no tolerance.
var limits = map[string]bool{"process.sensor_accuracy": true, "holding_tube.min_slope": true,
	"legal_minimums[].temperature": true, "legal_minimums[].time": true, "organisms[].required_log_reduction": true}

// slotPlant varies what the demos do not: diameters entered, a rate by
// mass with no sealed maximum, an entered ratio, an entered minimum slope.
const slotPlant = `
product:
  name: test product
  density: 1030 kg/m3
  specific_heat: 3.9 kJ/(kg*K)
  viscosity: [{at: 60 °C, value: 1.2 mPa*s}, {at: 80 °C, value: 0.9 mPa*s}]
flow: {rate: 9000 kg/h}
process: {raw_inlet: 5 °C, hold_setpoint: 72 °C, sensor_accuracy: 0.3 °C}
holding_tube: {inner_diameter: 47.5 mm, outer_diameter: 50.8 mm, length: 30 m, rise: 0.7 m, fastest_to_mean: 1.5,
  ambient: 20 °C, outer_coefficient: 10 W/(m2*K), min_slope: 0.02}
organisms: [{name: a, D: 1 s, D_temperature: 70 °C, z: 6 °C, required_log_reduction: 5}]
legal_minimums: [{temperature: 72 °C, time: 15 s}]
`

func TestSlotsAgreeWithTheReader(t *testing.T) {
	sources := map[string]string{"slot plant": slotPlant, "closed-form plant": closedFormPlant,
		"SI demo":             string(mustRead(t, "../../testdata/demo/htst-milk-si.yaml")),
		"frozen-dessert demo": string(mustRead(t, "../../testdata/demo/frozen-dessert-si.yaml"))}
	tested := map[string]bool{}
	for name, src := range sources {
		p := load(t, src)
		nominal := GatherHolding(p, productProps(p))
		for _, in := range p.Inputs {
			f, _ := plantfile.Lookup(in.Field)
			if strings.HasPrefix(in.Field, plantfile.UncertaintyKey) {
				continue
			}
			changed, ok := reread(t, src, in.Field)
			if !ok {
				continue // the file does not load with the value moved (a fraction of a composition)
			}
			moved := GatherHolding(changed, productProps(changed))
			differs := inputsDiffer(nominal, moved, 0) != ""
			switch {
			case f.Vary == nil && differs && !limits[f.Path]:
				t.Errorf("%s: the holding model reads %s, which neither may vary nor is a limit", name, in.Field)
			case f.Vary != nil:
				v, _ := changed.Nominal(in.Field)
				got := copyInputs(nominal)
				holdingSlots[f.Path](slotContext{index: listIndexOf(in.Field), nominal: &nominal, plant: p})(&got, v)
				got.MassFlows()
				if d := inputsDiffer(got, moved, 1e-12); d != "" {
					t.Errorf("%s: %s varied through its slot differs from the file re-read: %s", name, in.Field, d)
				}
				tested[f.Path] = true
			}
		}
	}
	// A sanitary size is not re-read at another value (only listed sizes
	// exist): varied, it is the outer diameter and the wall is kept.
	p := load(t, sources["SI demo"])
	nominal := GatherHolding(p, productProps(p))
	got := copyInputs(nominal)
	holdingSlots["holding_tube.sanitary_tube"](slotContext{nominal: &nominal, plant: p})(&got, 0.0508+1e-4)
	if !near(got.InnerDiameter, nominal.InnerDiameter+1e-4, 1e-12) || !near(got.OuterDiameter, 0.0508+1e-4, 1e-12) {
		t.Errorf("sanitary tube varied by 0.1 mm: ID %g, OD %g", got.InnerDiameter, got.OuterDiameter)
	}
	tested["holding_tube.sanitary_tube"] = true
	for path := range holdingSlots {
		if !tested[path] {
			t.Errorf("no plant of the test varies %s", path)
		}
	}
}

var leadingNumber = regexp.MustCompile(`^\s*([+-]?[0-9]*\.?[0-9]+(?:[eE][+-]?[0-9]+)?)(.*)$`)

// reread loads src with the value at a concrete path moved by 1 % (a
// temperature point by 0.7 K) and reports whether it loads.
func reread(t *testing.T, src, path string) (*plantfile.Plant, bool) {
	t.Helper()
	var doc yaml.Node
	if err := yaml.Unmarshal([]byte(src), &doc); err != nil {
		t.Fatal(err)
	}
	n := doc.Content[0]
	var parent *yaml.Node
	for _, part := range strings.Split(path, ".") {
		key, idx := part, -1
		if i := strings.IndexByte(part, '['); i >= 0 {
			key = part[:i]
			idx, _ = strconv.Atoi(strings.Trim(part[i:], "[]"))
		}
		var next *yaml.Node
		for j := 0; j+1 < len(n.Content); j += 2 {
			if n.Content[j].Value == key {
				next = n.Content[j+1]
			}
		}
		if next == nil {
			t.Fatalf("%s not found", path)
		}
		parent = n
		if idx >= 0 {
			next = next.Content[idx]
		}
		n = next
	}
	m := leadingNumber.FindStringSubmatch(n.Value)
	if m == nil {
		return nil, false
	}
	x, _ := strconv.ParseFloat(m[1], 64)
	moved := x * 1.01
	if strings.Contains(m[2], "°") {
		moved = x + 0.7
	}
	n.Value = strconv.FormatFloat(moved, 'g', -1, 64) + m[2]
	if strings.HasSuffix(path, "flow_index") {
		// K keeps its value in Pa·sⁿ with the new n.
		for j := 0; j+1 < len(parent.Content); j += 2 {
			if parent.Content[j].Value == "consistency" {
				k := parent.Content[j+1]
				k.Value = regexp.MustCompile(`\^[0-9.]+`).ReplaceAllString(k.Value, "^"+strconv.FormatFloat(moved, 'g', -1, 64))
			}
		}
	}
	out, err := yaml.Marshal(&doc)
	if err != nil {
		t.Fatal(err)
	}
	p, err := plantfile.Parse("moved.yaml", out)
	if err == nil {
		err = plantfile.Validate(p)
	}
	return p, err == nil
}

// copyInputs copies the slices a slot may write.
func copyInputs(in HoldingInputs) HoldingInputs {
	out := in
	out.Organisms = append(out.Organisms[:0:0], in.Organisms...)
	out.Viscosity = append(out.Viscosity[:0:0], in.Viscosity...)
	return out
}

// inputsDiffer compares every number of two inputs within rel; "" when alike.
func inputsDiffer(a, b HoldingInputs, rel float64) string {
	var walk func(x, y reflect.Value, name string) string
	walk = func(x, y reflect.Value, name string) string {
		switch x.Kind() {
		case reflect.Float64:
			if u, v := x.Float(), y.Float(); math.Abs(u-v) > rel*math.Max(math.Abs(u), math.Abs(v)) {
				return fmt.Sprintf("%s %.15g against %.15g", name, u, v)
			}
		case reflect.Struct:
			for i := range x.NumField() {
				if d := walk(x.Field(i), y.Field(i), name+"."+x.Type().Field(i).Name); d != "" {
					return d
				}
			}
		case reflect.Slice:
			if x.Len() != y.Len() {
				return name + " lengths differ"
			}
			for i := range x.Len() {
				if d := walk(x.Index(i), y.Index(i), fmt.Sprintf("%s[%d]", name, i)); d != "" {
					return d
				}
			}
		case reflect.Bool, reflect.String:
			if x.Interface() != y.Interface() {
				return name + " differs"
			}
		}
		return ""
	}
	return walk(reflect.ValueOf(a), reflect.ValueOf(b), "in")
}
