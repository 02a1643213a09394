package plantfile

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// MaxFileSize is the largest plant file read (a real one is a few kilobytes).
const MaxFileSize = 1 << 20

// Top-level keys, in the order the documentation gives them.
var topKeys = []string{"record", "product", "flow", "process", "regeneration", "heating", "cooling",
	"holding_tube", "organisms", "legal_minimums", "economics"}

var recordKeys = []string{"site", "line", "product", "schedule", "prepared_by", "notes"}

// Load reads, parses and validates a plant file.
func Load(path string) (*Plant, error) {
	// A file that cannot be read has no line to point at: the error names the
	// file alone ("line2.yaml: cannot read line2.yaml: no such file or directory").
	cannotRead := func(err error) error {
		return inputerr.List{inputerr.At(inputerr.Pos{File: path}, "", "cannot read %s: %v", path, unwrapPathError(err))}
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, cannotRead(err)
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, MaxFileSize+1))
	if err != nil {
		return nil, cannotRead(err)
	}
	p, err := Parse(path, data)
	if err != nil {
		return nil, err
	}
	if err := Validate(p); err != nil {
		return nil, err
	}
	return p, nil
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// Parse turns plant-file bytes into a Plant, checking the schema and every
// unit but no rule that spans fields (see Validate). file names the source in
// error positions.
func Parse(file string, data []byte) (p *Plant, err error) {
	d := &decoder{file: file}
	first := func(line, col int, msg string) error {
		return inputerr.List{{Pos: inputerr.Pos{File: file, Line: line, Column: col}, Field: keyOnLine(data, line), Msg: msg}}
	}
	if len(data) > MaxFileSize {
		return nil, first(1, 1, fmt.Sprintf("the file is larger than %d bytes; a plant file is a few kilobytes", MaxFileSize))
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, first(1, 1, "the plant file is empty; expected at least 'product' and 'process' (run 'pasval init' for a starter file)")
	}
	if !utf8.Valid(data) {
		line, col := invalidUTF8At(data)
		return nil, first(line, col, "the file is not valid UTF-8 text; save it as UTF-8")
	}
	if line, col, ok := tabIndent(data); ok {
		return nil, first(line, col, "a tab is used for indentation; YAML needs spaces")
	}
	root, err := decodeYAML(data)
	if err != nil {
		line, col, msg := yamlErrorPos(data, err)
		return nil, first(line, col, msg)
	}
	if root == nil {
		return nil, first(1, 1, "the plant file holds no YAML mapping; expected at least 'product' and 'process'")
	}
	if n, path := findAlias(root, ""); n != nil {
		return nil, inputerr.List{{Pos: inputerr.Pos{File: file, Line: n.Line, Column: n.Column}, Field: path,
			Msg: "anchors and aliases (& and *) are not supported in plant files; write each value out"}}
	}
	sum := sha256.Sum256(data)
	p = &Plant{File: file, SHA256: hex.EncodeToString(sum[:]), Source: data}
	top := d.object(root, "", topKeys...)
	if top != nil {
		d.decodePlant(p, top)
	}
	p.Inputs = d.inputs
	if len(d.errs) > 0 {
		sortErrors(d.errs)
		return nil, d.errs
	}
	p.System = p.Process.HoldSetpoint.System
	return p, nil
}

// decodeYAML parses exactly one YAML document. yaml.v3 has panicked on some
// malformed inputs in the past; a panic is turned into an error here so that
// bad input never produces a stack trace.
func decodeYAML(data []byte) (root *yaml.Node, err error) {
	defer func() {
		if r := recover(); r != nil {
			root, err = nil, fmt.Errorf("yaml: the file could not be parsed (%v)", r)
		}
	}()
	dec := yaml.NewDecoder(bytes.NewReader(data))
	var doc yaml.Node
	if err := dec.Decode(&doc); err != nil {
		if err == io.EOF {
			return nil, nil
		}
		return nil, err
	}
	var extra yaml.Node
	if err := dec.Decode(&extra); err != io.EOF {
		if err != nil {
			return nil, err
		}
		return nil, fmt.Errorf("yaml: line %d: a second YAML document starts here; a plant file holds one", secondDocumentLine(data, extra.Line))
	}
	if doc.Kind != yaml.DocumentNode || len(doc.Content) == 0 {
		return nil, nil
	}
	return doc.Content[0], nil
}

var docStart = regexp.MustCompile(`^---(\s|$)`)

// secondDocumentLine is the line of the "---" that opens the second document
// (the last separator before the second document's first node).
func secondDocumentLine(data []byte, contentLine int) int {
	found := max(contentLine, 1)
	for i, l := range bytes.Split(data, []byte("\n")) {
		if i+1 > contentLine {
			break
		}
		if docStart.Match(l) && i > 0 {
			found = i + 1
		}
	}
	return found
}

// findAlias returns the first anchored or alias node and its field path.
func findAlias(n *yaml.Node, path string) (*yaml.Node, string) {
	if n.Kind == yaml.AliasNode || n.Anchor != "" {
		return n, path
	}
	for i, c := range n.Content {
		p := path
		switch n.Kind {
		case yaml.MappingNode:
			if i%2 == 1 {
				p = join(path, n.Content[i-1].Value)
			} else {
				p = join(path, c.Value)
			}
		case yaml.SequenceNode:
			p = fmt.Sprintf("%s[%d]", path, i)
		}
		if a, ap := findAlias(c, p); a != nil {
			return a, ap
		}
	}
	return nil, ""
}

var keyPattern = regexp.MustCompile(`^\s*(?:-\s+)?([A-Za-z_][A-Za-z0-9_]*)\s*:`)

// keyOnLine names the key written on a line, for errors found before the
// YAML tree exists (tabs, bad bytes, syntax); "" when the line has none.
func keyOnLine(data []byte, line int) string {
	lines := bytes.Split(data, []byte("\n"))
	if line < 1 || line > len(lines) {
		return ""
	}
	if m := keyPattern.FindSubmatch(lines[line-1]); m != nil {
		return string(m[1])
	}
	return ""
}

func invalidUTF8At(data []byte) (int, int) {
	line, col := 1, 1
	for i := 0; i < len(data); {
		r, size := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && size <= 1 {
			return line, col
		}
		if r == '\n' {
			line, col = line+1, 1
		} else {
			col++
		}
		i += size
	}
	return line, col
}

// tabIndent finds a tab in a line's leading white space.
func tabIndent(data []byte) (int, int, bool) {
	for i, l := range strings.Split(string(data), "\n") {
		for j, r := range l {
			if r == '\t' {
				return i + 1, j + 1, true
			}
			if r != ' ' {
				break
			}
		}
	}
	return 0, 0, false
}

var yamlLine = regexp.MustCompile(`line (\d+)`)

// yamlErrorPos extracts the line from a yaml.v3 error ("yaml: line 4: …")
// and points the column at the line's first non-blank character.
func yamlErrorPos(data []byte, err error) (int, int, string) {
	msg := strings.TrimPrefix(err.Error(), "yaml: ")
	line := 1
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		line, _ = strconv.Atoi(m[1])
		msg = strings.TrimSpace(yamlLine.ReplaceAllString(msg, ""))
		msg = strings.TrimPrefix(msg, ": ")
	}
	col := 1
	lines := strings.Split(string(data), "\n")
	if line >= 1 && line <= len(lines) {
		col = len(lines[line-1]) - len(strings.TrimLeft(lines[line-1], " ")) + 1
	}
	return line, col, "the file is not valid YAML: " + msg
}

func (d *decoder) decodePlant(p *Plant, top *object) {
	if rec := top.sub("record", false, recordKeys...); rec != nil {
		for _, k := range recordKeys {
			if v := rec.text(k, false); v != "" {
				p.Record = append(p.Record, RecordField{Key: k, Value: v})
			}
		}
	}
	defer d.decodeEconomics(p, top)
	defer d.decodeHolding(p, top)
	if prod := top.sub("product", true, "name", "density", "specific_heat", "conductivity", "composition", "viscosity", "power_law"); prod != nil {
		d.decodeProduct(&p.Product, prod)
	}
	if fl := top.sub("flow", false, "rate", "max_rate"); fl != nil {
		p.Flow.Pos = d.pos(fl.node)
		p.Flow.Rate = fl.flowRate("rate", false)
		p.Flow.MaxRate = fl.flowRate("max_rate", false)
		if !fl.has("rate") && !fl.has("max_rate") {
			d.errorf(fl.node, "flow", "give rate, max_rate or both, e.g. rate: 10000 L/h")
		}
	}
	if pr := top.sub("process", true, "raw_inlet", "hold_setpoint", "outlet_target", "sensor_accuracy"); pr != nil {
		p.Process.SensorAccuracy = pr.quantity("sensor_accuracy", units.TemperatureDifference, false)
		p.Process.Pos = d.pos(pr.node)
		p.Process.RawInlet = pr.quantity("raw_inlet", units.Temperature, true)
		p.Process.HoldSetpoint = pr.quantity("hold_setpoint", units.Temperature, true)
		p.Process.OutletTarget = pr.quantity("outlet_target", units.Temperature, false)
	}
	if rg := top.sub("regeneration", false, "arrangement", "ratio", "plates", "plate_area", "u_value", "fouling", "pressure"); rg != nil {
		r := &Regeneration{Pos: d.pos(rg.node)}
		r.Plates = d.decodePlates(rg)
		r.Ratio, r.RatioPos, r.RatioSet = rg.number("ratio", false)
		if pr := rg.sub("pressure", false, "raw_max", "pasteurized_min", "required_margin"); pr != nil {
			r.Pressure = &Pressure{Pos: d.pos(pr.node),
				RawMax:         pr.quantity("raw_max", units.Pressure, true),
				PasteurizedMin: pr.quantity("pasteurized_min", units.Pressure, true),
				RequiredMargin: pr.quantity("required_margin", units.Pressure, false),
			}
		}
		p.Regeneration = r
	}
	mediumKeys := []string{"arrangement", "plates", "plate_area", "u_value", "fouling", "medium", "medium_inlet", "medium_rate"}
	if ht := top.sub("heating", false, mediumKeys...); ht != nil {
		p.Heating = &Heating{Pos: d.pos(ht.node), MediumSide: d.decodeMediumSide(ht)}
	}
	for i, n := range top.list("cooling") {
		path := fmt.Sprintf("cooling[%d]", i)
		st := d.object(n, path, append([]string{"name", "product_out"}, mediumKeys...)...)
		if st == nil {
			continue
		}
		c := CoolingStage{Pos: d.pos(n), MediumSide: d.decodeMediumSide(st)}
		c.Name = st.text("name", false)
		if c.Name == "" {
			c.Name = fmt.Sprintf("stage %d", i+1)
		}
		c.ProductOut = st.quantity("product_out", units.Temperature, false)
		p.Cooling = append(p.Cooling, c)
	}
}

func (d *decoder) decodeHolding(p *Plant, top *object) {
	if ht := top.sub("holding_tube", false, "inner_diameter", "sanitary_tube", "outer_diameter", "length", "rise",
		"min_slope", "fastest_to_mean", "ambient", "outer_coefficient", "pu"); ht != nil {
		h := &HoldingTube{Pos: d.pos(ht.node)}
		h.InnerDiameter = ht.quantity("inner_diameter", units.Length, false)
		h.SanitaryTube = ht.quantity("sanitary_tube", units.Length, false)
		h.OuterDiameter = ht.quantity("outer_diameter", units.Length, false)
		h.Length = ht.quantity("length", units.Length, true)
		h.Rise = ht.quantity("rise", units.Length, false)
		h.MinSlope, _, h.MinSlopeSet = ht.number("min_slope", false)
		h.FastestToMean, _, _ = ht.number("fastest_to_mean", false)
		h.Ambient = ht.quantity("ambient", units.Temperature, false)
		h.OuterCoefficient = ht.quantity("outer_coefficient", units.HeatTransferCoefficient, false)
		if s, n, ok := ht.scalar("pu", false, "true or false"); ok {
			switch s {
			case "true":
				h.PU = true
			case "false":
			default:
				d.errorf(n, "holding_tube.pu", "expected true or false, found %q", s)
			}
		}
		h.resolveDiameters()
		p.HoldingTube = h
	}
	for i, n := range top.list("organisms") {
		path := fmt.Sprintf("organisms[%d]", i)
		o := d.object(n, path, "name", "D", "D_temperature", "z", "required_log_reduction")
		if o == nil {
			continue
		}
		org := Organism{Pos: d.pos(n), Name: o.text("name", true),
			D:            o.quantity("D", units.Time, true),
			DTemperature: o.quantity("D_temperature", units.Temperature, true),
			Z:            o.quantity("z", units.TemperatureDifference, true),
		}
		org.RequiredLogReduction, _, org.RequiredSet = o.number("required_log_reduction", false)
		p.Organisms = append(p.Organisms, org)
	}
	for i, n := range top.list("legal_minimums") {
		path := fmt.Sprintf("legal_minimums[%d]", i)
		o := d.object(n, path, "temperature", "time")
		if o == nil {
			continue
		}
		p.LegalMinimums = append(p.LegalMinimums, LegalRow{Pos: d.pos(n),
			Temperature: o.quantity("temperature", units.Temperature, true),
			Time:        o.quantity("time", units.Time, true)})
	}
}

func (d *decoder) decodeEconomics(p *Plant, top *object) {
	ec := top.sub("economics", false, "currency", "operating_hours_per_year", "heat_price_per_kWh", "cooling_price_per_kWh", "plate_cost")
	if ec == nil {
		return
	}
	e := &Economics{Pos: d.pos(ec.node), Currency: ec.text("currency", false)}
	if e.Currency == "" {
		e.Currency = "currency units"
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
		v, pos, ok := ec.number(f.key, true)
		if ok && !(v >= 0 && v <= f.max) {
			what := "a price cannot be negative"
			if f.key == "operating_hours_per_year" {
				what = "expected 0 to 8784 hours a year"
			}
			d.errs = append(d.errs, &inputerr.Error{Pos: pos, Field: "economics." + f.key, Msg: fmt.Sprintf("%s, found %g", what, v)})
		}
		*f.dst = v
	}
	p.Economics = e
}

func (d *decoder) decodeProduct(pr *Product, o *object) {
	pr.Pos = d.pos(o.node)
	pr.Name = o.text("name", true)
	pr.Density = o.quantity("density", units.Density, false)
	pr.SpecificHeat = o.quantity("specific_heat", units.SpecificHeat, false)
	pr.Conductivity = o.quantity("conductivity", units.ThermalConductivity, false)
	if c := o.sub("composition", false, "water", "protein", "fat", "carbohydrate", "fiber", "ash"); c != nil {
		comp := &Composition{Pos: d.pos(c.node)}
		for _, f := range []struct {
			key string
			dst *float64
		}{{"water", &comp.Water}, {"protein", &comp.Protein}, {"fat", &comp.Fat}, {"carbohydrate", &comp.Carbohydrate}, {"fiber", &comp.Fiber}, {"ash", &comp.Ash}} {
			*f.dst, _, _ = c.number(f.key, false)
		}
		pr.Composition = comp
	}
	for i, n := range o.list("viscosity") {
		path := fmt.Sprintf("product.viscosity[%d]", i)
		vp := d.object(n, path, "at", "value")
		if vp == nil {
			continue
		}
		pr.Viscosity = append(pr.Viscosity, ViscosityPoint{
			At:    vp.quantity("at", units.Temperature, true),
			Value: vp.quantity("value", units.Viscosity, true),
		})
	}
	if pl := o.sub("power_law", false, "flow_index", "consistency"); pl != nil {
		law := &PowerLaw{Pos: d.pos(pl.node)}
		var ok bool
		law.FlowIndex, _, ok = pl.number("flow_index", true)
		if ok && !(law.FlowIndex > 0 && law.FlowIndex <= 1.5) {
			d.errorf(pl.values["flow_index"], "product.power_law.flow_index", "the flow index n must be above 0 and at most 1.5, found %g", law.FlowIndex)
			ok = false
		}
		if ok {
			law.Consistency = pl.quantity("consistency", units.ConsistencyKind(law.FlowIndex), true)
		}
		pr.PowerLaw = law
	}
}

func (d *decoder) decodePlates(o *object) Plates {
	var p Plates
	switch a := o.text("arrangement", false); a {
	case "", string(Counterflow):
		p.Arrangement = Counterflow
	case string(Cocurrent):
		p.Arrangement = Cocurrent
	default:
		d.errorf(o.values["arrangement"], join(o.path, "arrangement"), "expected counterflow or cocurrent, found %q%s",
			a, didYouMean(a, []string{"counterflow", "cocurrent"}))
	}
	p.Plates, p.PlatesPos, _ = o.integer("plates", false)
	p.PlateArea = o.quantity("plate_area", units.Area, true)
	p.UValue = o.quantity("u_value", units.HeatTransferCoefficient, true)
	p.Fouling = o.quantity("fouling", units.FoulingResistance, false)
	return p
}

func (d *decoder) decodeMediumSide(o *object) MediumSide {
	m := MediumSide{Plates: d.decodePlates(o)}
	m.MediumInlet = o.quantity("medium_inlet", units.Temperature, true)
	m.MediumRate = o.flowRate("medium_rate", true)
	v := o.values["medium"]
	switch {
	case v == nil:
		d.errorf(o.node, join(o.path, "medium"), "missing; expected water, or a mapping {name, density, specific_heat}")
	case v.Kind == yaml.ScalarNode:
		if v.Value != "water" {
			d.errorf(v, join(o.path, "medium"), "expected water, or a mapping {name, density, specific_heat}, found %q", v.Value)
		}
		m.Medium = Medium{Name: "water", Water: true}
	default:
		mo := d.object(v, join(o.path, "medium"), "name", "density", "specific_heat")
		if mo != nil {
			m.Medium.Name = mo.text("name", true)
			m.Medium.Density = mo.quantity("density", units.Density, true)
			m.Medium.SpecificHeat = mo.quantity("specific_heat", units.SpecificHeat, true)
		}
	}
	return m
}
