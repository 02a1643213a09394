package schema

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/santhosh-tekuri/jsonschema/v6"
	"go.yaml.in/yaml/v3"
)

func compile(t *testing.T) *jsonschema.Schema {
	t.Helper()
	raw, err := json.Marshal(PlantFile())
	if err != nil {
		t.Fatal(err)
	}
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(raw))
	if err != nil {
		t.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	if err := c.AddResource(ID, doc); err != nil {
		t.Fatal(err)
	}
	s, err := c.Compile(ID)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// instance reads a YAML plant file as a JSON value; ok is false when the file
// is not YAML that maps to JSON (those are refused before any schema applies).
func instance(t *testing.T, path string) (any, bool) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var v any
	if err := yaml.Unmarshal(data, &v); err != nil || v == nil {
		return nil, false
	}
	v = datesAsText(v)
	raw, err := json.Marshal(v)
	if err != nil {
		return nil, false
	}
	inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(raw))
	return inst, err == nil
}

// datesAsText turns the dates the YAML library resolved back into the text
// written: an editor's YAML 1.2 has no timestamp type, so the schema sees a
// date as the string "2026-06-09".
func datesAsText(v any) any {
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			x[k] = datesAsText(e)
		}
	case []any:
		for i, e := range x {
			x[i] = datesAsText(e)
		}
	case time.Time:
		return x.Format("2006-01-02")
	}
	return v
}

func TestDemosAndStartersMatchTheSchema(t *testing.T) {
	s := compile(t)
	files, _ := filepath.Glob("../../testdata/demo/*.yaml")
	sets, _ := filepath.Glob("../../testdata/demo/*/*.yaml") // a line file and its product files
	more, _ := filepath.Glob("../../testdata/equivalence/*.yaml")
	starters, _ := filepath.Glob("../../cmd/pasval/starter/*.yaml")
	files = append(append(append(files, sets...), more...), starters...)
	if len(files) < 6 {
		t.Fatalf("only %d files", len(files))
	}
	for _, f := range files {
		inst, ok := instance(t, f)
		if !ok {
			t.Errorf("%s is not YAML", f)
			continue
		}
		if err := s.Validate(inst); err != nil {
			t.Errorf("%s fails the schema: %v", f, err)
		}
	}
}

// Every file of testdata/bad is classified here. structural: the fault is in
// the structure (a key, a type, a missing field, a value that is not "number
// unit"), so the schema must refuse it. semantic: the fault is one of
// dimension, physics or rules across fields, which pasval checks and a schema
// cannot (the file may pass the schema). yaml: refused at the YAML level
// (syntax, tabs, encoding, anchors, a second document).
var (
	structural = []string{
		"typo-key", "typo-top-key", "missing-product", "missing-setpoint", "missing-unit-temperature", "missing-unit-flow",
		"product-is-list", "unknown-medium", "bad-arrangement", "fractional-plates",
		"null-value", "viscosity-bare-temperature", "organism-bare-z", "legal-row-bare-time", "pu-not-boolean", "organism-typo-key",
		"holding-both-diameters", "economics-missing-plate-cost", "nan-value", "inf-value",
		"plate-pack-missing-port",
		"text-forged-verdict", "text-bidi-override", "log-reduction-percent", "plates-above-limit",
		"uncertainty-no-sign", "uncertainty-bad-distribution", "uncertainty-missing-index",
		"acceptance-unknown-kind", "acceptance-bad-date", "acceptance-interval-no-unit", "acceptance-interval-fraction", "acceptance-interval-hours",
	}
	semantic = []string{
		// ratio or plates: a plate pack's passes also put a regenerator in
		// rating mode, so the choice is a rule across fields (Validate).
		"ratio-and-plates", "no-ratio-no-plates",
		// Plate packs: the layout's rules, the engine's ranges and an angle's unit.
		"no-u-value", "plate-pack-plates-mismatch", "plate-pack-angle-range", "plate-pack-angle-celsius", "plate-pack-one-side-passes",
		"plate-pack-no-conductivity", "plate-pack-missing-side", "plate-pack-unequal-channels", "plate-pack-enlargement",
		"plate-pack-medium-no-viscosity",
		// Product files on a line: rules across files (the line file alone,
		// a cycle, a chain, a missing file, a legal class or both ways of rows).
		"line-for-bad", "line-unknown-table", "line-cycle-a", "line-cycle-b", "line-chain", "line-chain-middle", "line-missing", "line-both-legal",
		"below-absolute-zero", "cocurrent-regenerator", "cocurrent-regenerator-half", "composition-sum", "cooling-cross", "economics-hours",
		"economics-negative-price", "heating-cross", "heating-starved", "holding-ambient-above-setpoint", "holding-heat-loss-absurd",
		"holding-heat-loss-no-od", "holding-credit-without-heat-loss", "holding-no-viscosity", "holding-ratio-below-one", "holding-rise-above-length",
		"holding-unknown-sanitary", "holding-zero-length", "huge-number", "intermediate-stage-no-outlet", "magnitude-tiny",
		"missing-flow", "negative-flow", "negative-viscosity", "organism-D-as-temperature", "organism-zero-z",
		"organisms-without-tube", "percent-flow", "rate-above-max", "rated-stage-with-outlet", "ratio-above-one", "ratio-one",
		"ratio-zero", "raw-above-setpoint", "raw-at-setpoint", "setpoint-out-of-range", "unknown-unit", "water-frozen",
		"wrong-dimension-density", "wrong-dimension-flow", "wrong-dimension-u", "zero-flow", "zero-medium-flow", "heating-burn-on-zero",
		"viscosity-same-temperature", "temperature-overflow", "temperature-beyond-range", "kinetics-non-finite",
		"economics-price-huge", "rate-above-max-mixed-units", "organism-z-tiny",
		// Uncertainty: a path of the right form that names no varied value, a
		// tolerance of the wrong dimension or beyond the physical range.
		"uncertainty-unknown-path", "uncertainty-not-scalar", "uncertainty-not-varied", "uncertainty-wrong-dimension",
		"uncertainty-percent-temperature", "uncertainty-crosses-bound", "uncertainty-not-given", "uncertainty-index-out-of-range",
		// Acceptance tests: the review date, and which keys each kind records.
		"acceptance-future-date", "acceptance-missing-value", "acceptance-wrong-key", "diversion-no-response",
	}
	notYAML = []string{"anchor-alias", "broken-yaml", "comments-only", "duplicate-key", "empty", "not-utf8", "tab-indent", "two-documents",
		"yaml-unclosed-bracket", "yaml-undefined-alias", "yaml-control-in-comment", "yaml-tag-binary", "yaml-tag-custom", "yaml-tag-map"}
)

func TestBadFilesAgainstTheSchema(t *testing.T) {
	s := compile(t)
	class := map[string]string{}
	for _, l := range []struct {
		names []string
		kind  string
	}{{structural, "structural"}, {semantic, "semantic"}, {notYAML, "yaml"}} {
		for _, n := range l.names {
			class[n] = l.kind
		}
	}
	files, _ := filepath.Glob("../../testdata/bad/*.yaml")
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".yaml")
		kind, ok := class[name]
		if !ok {
			t.Errorf("%s is not classified as structural, semantic or yaml in schema_test.go", name)
			continue
		}
		inst, readable := instance(t, f)
		switch kind {
		case "yaml":
			// refused by pasval's reader before any schema applies (a YAML
			// library may still read part of them)
		case "structural":
			if !readable {
				t.Errorf("%s: not readable as YAML", name)
			} else if err := s.Validate(inst); err == nil {
				t.Errorf("%s passes the schema", name)
			}
		case "semantic":
			if !readable {
				t.Errorf("%s: not readable as YAML", name)
			}
		}
	}
}

func TestPatterns(t *testing.T) {
	// The schema's quantity patterns against the unit parser's own examples.
	for _, c := range []struct {
		pattern, in string
		ok          bool
	}{
		{TemperaturePattern, "72.5 °C", true}, {TemperaturePattern, "161°F", true}, {TemperaturePattern, "72.5", false},
		{TemperaturePattern, "72 L/h", false}, {QuantityPattern, "10000 L/h", true}, {QuantityPattern, "3.93 kJ/(kg*K)", true},
		{QuantityPattern, "10000", false}, {QuantityPattern, "NaN kg/m3", false}, {NumberPattern, "92 %", true}, {NumberPattern, "0.92", true},
		{NumberPattern, "2.1 cm/m", true}, {PlainNumberPattern, "5", true}, {PlainNumberPattern, "5 %", false}, {PlainNumberPattern, "5 cm/m", false},
	} {
		if got := match(c.pattern, c.in); got != c.ok {
			t.Errorf("%q against %s: %v", c.in, c.pattern, got)
		}
	}
	if !strings.HasPrefix(ID, "https://") {
		t.Error("schema id")
	}
}

func TestReadmeCountsTheBadFiles(t *testing.T) {
	// The README's reliability table and its tests section count the
	// corpus: each count is the length of the list above, and the whole is
	// every file of testdata/bad.
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob("../../testdata/bad/*.yaml")
	for _, c := range []struct {
		what string
		re   string
		want int
	}{
		{"yaml", `(\d+) bad files \(classed in`, len(notYAML)},
		{"structural", `(\d+) bad files \(the schema refuses them too\)`, len(structural)},
		{"semantic", `\| (\d+) bad files \| every quantity finite`, len(semantic)},
		{"all", "\\(`testdata/bad/`, (\\d+) files", len(files)},
	} {
		m := regexp.MustCompile(c.re).FindSubmatch(data)
		if m == nil {
			t.Errorf("%s: the README gives no count (%s)", c.what, c.re)
			continue
		}
		if n, _ := strconv.Atoi(string(m[1])); n != c.want {
			t.Errorf("%s: the README says %d bad files, the corpus has %d", c.what, n, c.want)
		}
	}
}
