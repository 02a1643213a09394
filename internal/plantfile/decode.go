package plantfile

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
	"pasval/internal/oneline"
	"pasval/internal/units"
)

// decoder walks a YAML node tree against the plant-file schema, collecting
// every error rather than stopping at the first.
type decoder struct {
	file   string
	errs   inputerr.List
	inputs []Input
	// read reads a line file named by line_file (nil: line files are refused).
	read ReadFunc
	// lineFile and lineNodes are the line file merged under this one: a node
	// of its tree is positioned in lineFile (docs/METHOD.md §16).
	lineFile  string
	lineNodes map[*yaml.Node]bool
	// lineOnly reads a line file on its own (pasval matrix): the blocks a
	// product file gives (product, process) are not required.
	lineOnly bool
	// consulted holds the table paths the decoding looked up (tests check
	// that every field of the table is decoded).
	consulted map[string]bool
	// replace holds scalar values to read in place of the file's, by
	// concrete path (Plant.Replaced).
	replace map[string]string
}

const maxErrors = 50

func (d *decoder) pos(n *yaml.Node) inputerr.Pos {
	if n == nil {
		return inputerr.Pos{File: d.file, Line: 1, Column: 1}
	}
	if d.lineNodes[n] {
		return inputerr.Pos{File: d.lineFile, Line: n.Line, Column: n.Column}
	}
	return inputerr.Pos{File: d.file, Line: n.Line, Column: n.Column}
}

func (d *decoder) errorf(n *yaml.Node, field, format string, args ...any) {
	if len(d.errs) >= maxErrors {
		return
	}
	d.errs = append(d.errs, &inputerr.Error{Pos: d.pos(n), Field: field, Msg: fmt.Sprintf(format, args...)})
}

// object is a YAML mapping checked against its allowed keys.
type object struct {
	d      *decoder
	path   string // concrete: "cooling[1]"
	table  string // the same with list indices dropped: "cooling[]"
	node   *yaml.Node
	values map[string]*yaml.Node
	keys   map[string]*yaml.Node
	// suggested holds the allowed keys that an unknown key resembled, so that
	// a typo is reported once (as the typo) and not also as a missing key.
	suggested map[string]bool
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

// object checks that n is a mapping whose keys are all allowed (the field
// table's children of path) and unique. It returns nil (after recording an
// error) when n is not a mapping.
func (d *decoder) object(n *yaml.Node, path string) *object {
	return d.objectIn(n, path, tableOf(path))
}

// objectIn is object for a mapping whose table path is given (an entry of
// the uncertainty block, whose key is a field path).
func (d *decoder) objectIn(n *yaml.Node, path, table string) *object {
	allowed := allowedKeys(strings.TrimSuffix(table, "[]"))
	if len(allowed) == 0 {
		panic(panicPrefix + "no fields in the table under " + path)
	}
	if n.Kind != yaml.MappingNode {
		d.errorf(n, path, "expected a mapping of %s, found %s", strings.Join(allowed, ", "), describe(n))
		return nil
	}
	o := &object{d: d, path: path, table: table, node: n,
		values: map[string]*yaml.Node{}, keys: map[string]*yaml.Node{}, suggested: map[string]bool{}}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if k.Kind != yaml.ScalarNode {
			d.errorf(k, path, "keys must be plain names")
			continue
		}
		name := k.Value
		if len(allowed) == 1 && allowed[0] == NameKey {
			if !namePattern.MatchString(name) {
				d.errorf(k, join(path, name), "%q is not a name pasval takes here; write letters, digits, - and _ (e.g. high-fat)", name)
				continue
			}
		} else if !contains(allowed, name) {
			hint := didYouMean(name, allowed)
			if hint != "" {
				o.suggested[suggestion(name, allowed)] = true
			}
			d.errorf(k, join(path, name), "unknown key %q%s; allowed here: %s", name, hint, strings.Join(allowed, ", "))
			continue
		}
		if prev, dup := o.keys[name]; dup {
			d.errorf(k, join(path, name), "%q is given twice (first at line %d)", name, prev.Line)
			continue
		}
		o.keys[name], o.values[name] = k, v
	}
	return o
}

// namePattern is a name the user gives under a KindNamed field (a product
// class of legal_tables).
var namePattern = regexp.MustCompile(NamePattern)

// NamePattern is the regular expression a name under a KindNamed field
// matches (for the JSON Schema too).
const NamePattern = `^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$`

// names are the keys of a KindNamed mapping, in file order.
func (o *object) names() []string {
	if o == nil {
		return nil
	}
	var out []string
	for i := 0; i+1 < len(o.node.Content); i += 2 {
		if k := o.node.Content[i]; o.keys[k.Value] == k {
			out = append(out, k.Value)
		}
	}
	return out
}

// namedList is the items of the list a KindNamed mapping gives under name.
func (o *object) namedList(name string) []*yaml.Node {
	o.field(NameKey)
	return o.listNode(o.values[name], join(o.path, name))
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func describe(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.ScalarNode:
		if n.Tag == "!!null" {
			return "nothing"
		}
		return fmt.Sprintf("%q", n.Value)
	}
	return "something else"
}

func (o *object) has(key string) bool { return o != nil && o.values[key] != nil }

// field is the table's entry for a key of this mapping. Decoding a key the
// table lacks is a programming error.
func (o *object) field(key string) Field {
	f, ok := byPath[join(o.table, key)]
	if !ok {
		panic(panicPrefix + "decoding a key that is not in the field table: " + join(o.table, key))
	}
	if o.d.consulted != nil {
		o.d.consulted[f.Path] = true
	}
	return f
}

// scalar returns the key's scalar text; ok is false (with an error recorded
// when the table says the key is required) if it is absent, empty or not a
// scalar.
func (o *object) scalar(key string, expect string) (string, *yaml.Node, bool) {
	if o == nil {
		return "", nil, false
	}
	required := o.field(key).Required
	v := o.values[key]
	f := join(o.path, key)
	if v == nil {
		if required && !o.suggested[key] {
			o.d.errorf(o.node, f, "missing; expected %s", expect)
		}
		return "", nil, false
	}
	if r, ok := o.d.replace[f]; ok {
		return r, v, true
	}
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || strings.TrimSpace(v.Value) == "" {
		o.d.errorf(v, f, "expected %s, found %s", expect, describe(v))
		return "", v, false
	}
	return v.Value, v, true
}

// text reads free text: one line of printable characters (internal/oneline),
// so that no value can add a line or a terminal control to what pasval
// prints or records.
func (o *object) text(key string) string {
	s, n, ok := o.scalar(key, "text")
	if !ok {
		return ""
	}
	if i, r, bad := oneline.Find(s); bad {
		o.d.errorf(n, join(o.path, key), "%q holds %s at character %d; free text is one line of printable characters",
			s, oneline.Describe(r), i)
		return ""
	}
	return strings.TrimSpace(s)
}

// quantity reads "number unit" of the kind the table gives the key.
func (o *object) quantity(key string) Quantity {
	if o == nil {
		return Quantity{}
	}
	k := o.field(key).Unit
	return o.quantityOf(key, k)
}

// quantityOf reads "number unit" of kind k (a consistency index, whose kind
// depends on the flow index).
func (o *object) quantityOf(key string, k units.Kind) Quantity {
	s, n, ok := o.scalar(key, fmt.Sprintf("%s with its unit, e.g. %s", units.Article(k.Name), k.Example))
	if !ok {
		return Quantity{}
	}
	return o.d.parseQuantity(n, join(o.path, key), s, k)
}

func (d *decoder) parseQuantity(n *yaml.Node, field, s string, k units.Kind) Quantity {
	v, err := units.Parse(s, k)
	if err != nil {
		d.errorf(n, field, "%v", err)
		return Quantity{}
	}
	if k.Name == units.Temperature.Name {
		if v.SI > MaxTemperature {
			d.errorf(n, field, "%q is outside the temperatures pasval computes with (absolute zero to %g °C); check the number and its unit",
				s, MaxTemperature)
			return Quantity{}
		}
	} else if a := math.Abs(v.SI); a != 0 && (a < minMagnitude || a > maxMagnitude) {
		d.errorf(n, field, "%q is outside the magnitudes pasval computes with (%g to %g in SI units); check the number and its unit", s, minMagnitude, maxMagnitude)
		return Quantity{}
	}
	q := Quantity{SI: v.SI, Text: strings.TrimSpace(s), System: v.System, Pos: d.pos(n), Set: true}
	d.record(field, q, k)
	return q
}

// Magnitude limits for entered quantities in SI and for plain numbers: far
// outside any plant, they keep absurd entries (a unit typo, 1e300) from
// overflowing the arithmetic. Temperatures are points, not magnitudes: they
// run from absolute zero to MaxTemperature.
const (
	minMagnitude = 1e-9
	maxMagnitude = 1e9
	// MaxTemperature is the hottest temperature read, °C: far above any
	// pasteurizer, its media or its surroundings.
	MaxTemperature = 1000.0
)

func (d *decoder) record(field string, q Quantity, k units.Kind) {
	d.inputs = append(d.inputs, Input{Field: field, Text: q.Text, SI: q.SI, SIUnit: k.SIUnit, Pos: q.Pos, System: q.System})
}

// flowRate reads a product or medium rate, volumetric or by mass.
func (o *object) flowRate(key string) FlowRate {
	s, n, ok := o.scalar(key, "a flow with its unit, e.g. 10000 L/h, 44 gpm or 10300 kg/h")
	if !ok {
		return FlowRate{}
	}
	v, k, err := units.ParseEither(s, units.VolumeFlow, units.MassFlow)
	f := join(o.path, key)
	if err != nil {
		o.d.errorf(n, f, "%v", err)
		return FlowRate{}
	}
	if a := math.Abs(v.SI); a != 0 && (a < minMagnitude || a > maxMagnitude) {
		o.d.errorf(n, f, "%q is outside the magnitudes pasval computes with (%g to %g in SI units); check the number and its unit", s, minMagnitude, maxMagnitude)
		return FlowRate{}
	}
	q := Quantity{SI: v.SI, Text: strings.TrimSpace(s), System: v.System, Pos: o.d.pos(n), Set: true}
	o.d.record(f, q, k)
	return FlowRate{Quantity: q, ByMass: k.Name == units.MassFlow.Name}
}

// number reads a plain number, within the magnitudes pasval computes with. A
// Fraction field (the table says which) may also be written as a percentage
// or a ratio of like units; any other number takes no unit.
func (o *object) number(key string) (float64, inputerr.Pos, bool) {
	s, n, ok := o.scalar(key, "a number")
	if !ok {
		return 0, o.d.pos(n), false
	}
	f := o.field(key)
	v, err := units.Parse(s, units.Dimensionless)
	switch {
	case err != nil && f.Fraction:
		o.d.errorf(n, join(o.path, key), "expected a number such as %s, or a percentage such as 92 %%, found %q", f.Example, s)
		return 0, o.d.pos(n), false
	case err != nil || (!f.Fraction && v.Unit != ""):
		o.d.errorf(n, join(o.path, key), "expected a plain number such as %s, without a unit (this is not a fraction), found %q", f.Example, s)
		return 0, o.d.pos(n), false
	case v.SI != 0 && (math.Abs(v.SI) < minMagnitude || math.Abs(v.SI) > maxMagnitude):
		o.d.errorf(n, join(o.path, key), "%q is outside the magnitudes pasval computes with (0, or %g to %g); check the number", s, minMagnitude, maxMagnitude)
		return 0, o.d.pos(n), false
	}
	q := Quantity{SI: v.SI, Text: strings.TrimSpace(s), Pos: o.d.pos(n), Set: true}
	o.d.record(join(o.path, key), q, units.Dimensionless)
	return v.SI, o.d.pos(n), true
}

// integer reads a whole number in the table's range.
func (o *object) integer(key string) (int, inputerr.Pos, bool) {
	s, n, ok := o.scalar(key, "a whole number")
	if !ok {
		return 0, o.d.pos(n), false
	}
	f := o.field(key)
	i, err := strconv.Atoi(strings.TrimSpace(s))
	if err != nil || float64(i) < f.Min || float64(i) > f.Max {
		o.d.errorf(n, join(o.path, key), "expected a whole number from %g to %g, found %q", f.Min, f.Max, s)
		return 0, o.d.pos(n), false
	}
	o.d.inputs = append(o.d.inputs, Input{Field: join(o.path, key), Text: s, SI: float64(i), SIUnit: "1", Pos: o.d.pos(n)})
	return i, o.d.pos(n), true
}

// sub is the mapping under key, or nil when it is absent (an error when the
// table says it is required) or not a mapping.
func (o *object) sub(key string) *object {
	if o == nil {
		return nil
	}
	f := o.field(key)
	v := o.values[key]
	if v == nil {
		top := o.path == ""
		if f.Required && !o.suggested[key] && !(top && o.d.lineOnly) {
			where := ""
			if top && o.d.lineFile != "" {
				where = " (neither this file nor its line file " + o.d.lineFile + " gives it)"
			}
			o.d.errorf(o.node, join(o.path, key), "missing%s; expected a mapping of %s", where, strings.Join(allowedKeys(f.Path), ", "))
		}
		return nil
	}
	return o.d.object(v, join(o.path, key))
}

// list is the items of the list under key (each to be read with d.object).
func (o *object) list(key string) []*yaml.Node {
	if o == nil {
		return nil
	}
	o.field(key)
	return o.listNode(o.values[key], join(o.path, key))
}

func (o *object) listNode(v *yaml.Node, path string) []*yaml.Node {
	if v == nil {
		return nil
	}
	if v.Kind != yaml.SequenceNode {
		o.d.errorf(v, path, "expected a list (lines starting with '- '), found %s", describe(v))
		return nil
	}
	if len(v.Content) == 0 {
		o.d.errorf(v, path, "the list is empty")
	}
	return v.Content
}

func closestWithDistance(name string, allowed []string) (string, int) {
	best, bestD := "", math.MaxInt
	for _, a := range allowed {
		if d := editDistance(strings.ToLower(name), strings.ToLower(a)); d < bestD {
			best, bestD = a, d
		}
	}
	return best, bestD
}

// suggestion is the allowed word a misspelt name most likely meant, or "":
// a word that starts with it (at least four letters), else the nearest by
// edit distance when that is at most 2 or a third of the name's length.
func suggestion(name string, allowed []string) string {
	for _, a := range allowed {
		if len(name) >= 4 && strings.HasPrefix(strings.ToLower(a), strings.ToLower(name)) {
			return a
		}
	}
	best, d := closestWithDistance(name, allowed)
	if best != "" && (d <= 2 || d <= len(name)/3) {
		return best
	}
	return ""
}

// didYouMean is the " (did you mean …?)" hint, or "".
func didYouMean(name string, allowed []string) string {
	if s := suggestion(name, allowed); s != "" {
		return fmt.Sprintf(" (did you mean %q?)", s)
	}
	return ""
}

func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// sortErrors orders errors by position so the first one shown is the first
// in the file: those in the file named first (a product file), then those in
// its line file.
func sortErrors(l inputerr.List, first string) {
	sort.SliceStable(l, func(i, j int) bool {
		if fi, fj := l[i].Pos.File == first, l[j].Pos.File == first; fi != fj {
			return fi
		}
		if l[i].Pos.Line != l[j].Pos.Line {
			return l[i].Pos.Line < l[j].Pos.Line
		}
		return l[i].Pos.Column < l[j].Pos.Column
	})
}
