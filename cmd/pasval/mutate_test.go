package main

// Mutated plant files: valid plants changed one field at a time, the field
// table (internal/plantfile/fields.go) telling what each field holds, run
// through check, hold and plates. Byte-level fuzzing of the reader (FuzzLoad)
// rarely gets past the YAML and the units to the numbers; these mutations
// start from plants that compute and push one value at a time toward
// extremes, swap its unit for one of any dimension, or put control
// characters into text. Source of the invariants: the project's contract
// (README "Reliability"): no panic; exit 0, 1 or 2; a refusal names the file,
// line, column and field; JSON output parses and every number in it is
// finite; text output holds no infinity, NaN or control character.

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"

	"go.yaml.in/yaml/v3"

	"pasval/internal/oneline"
	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// mutBase is a valid plant file and its mutable scalars.
type mutBase struct {
	name   string
	src    []byte
	leaves []mutLeaf
}

// mutLeaf is one scalar of a base: its concrete path and its table field.
type mutLeaf struct {
	path  string
	field plantfile.Field
}

// mutBases are the demos, the SI demo's US twin, both starter files and the
// plants of testdata/mutate, which between them hold every field.
var mutBases = sync.OnceValues(func() ([]mutBase, error) {
	extra, err := filepath.Glob("../../testdata/mutate/*.yaml")
	if err != nil {
		return nil, err
	}
	files := append([]string{}, goldenDemos...)
	for _, e := range extra {
		files = append(files, strings.TrimPrefix(filepath.ToSlash(e), "../../"))
	}
	var bases []mutBase
	for _, f := range files {
		src, err := os.ReadFile(filepath.Join("../..", f))
		if err != nil {
			return nil, err
		}
		bases = append(bases, mutBase{name: f, src: src})
	}
	bases = append(bases, mutBase{name: "starter/si.yaml", src: starterSI}, mutBase{name: "starter/us.yaml", src: starterUS})
	for i := range bases {
		var doc yaml.Node
		if err := yaml.Unmarshal(bases[i].src, &doc); err != nil {
			return nil, fmt.Errorf("%s: %w", bases[i].name, err)
		}
		walkLeaves(&doc, "", func(n *yaml.Node, path string, f plantfile.Field) {
			bases[i].leaves = append(bases[i].leaves, mutLeaf{path: path, field: f})
		})
	}
	return bases, nil
})

// walkLeaves calls fn for every scalar whose path is a field of the table.
func walkLeaves(n *yaml.Node, path string, fn func(*yaml.Node, string, plantfile.Field)) {
	switch n.Kind {
	case yaml.DocumentNode:
		for _, c := range n.Content {
			walkLeaves(c, path, fn)
		}
	case yaml.MappingNode:
		for i := 0; i+1 < len(n.Content); i += 2 {
			p := n.Content[i].Value
			if path != "" {
				p = path + "." + p
			}
			walkLeaves(n.Content[i+1], p, fn)
		}
	case yaml.SequenceNode:
		for i, c := range n.Content {
			walkLeaves(c, fmt.Sprintf("%s[%d]", path, i), fn)
		}
	case yaml.ScalarNode:
		if f, ok := plantfile.Lookup(path); ok {
			fn(n, path, f)
		}
	}
}

// Values the mutations draw from.
var (
	mutExtremes = []float64{0, math.Copysign(0, -1), 5e-324, 1e-308, 1e-10, 1e-9, 1e-3, 0.5, 1, 2, 99.999, 100, 101, 273.15,
		-273.15, -273.16, -40, 999, 1000, 1001, 1e4, 1e9, 1.1e9, 1e15, 1e300, 1.7e308, -1, -1e9, -1.7e308}
	mutIntegers = []string{"0", "-1", "1", "2", "9999", "10000", "10001", "2147483648", "9223372036854775807",
		"99999999999999999999", "1e3", "12.5", "0x10", " 7 "}
	mutTexts = []string{"\n", "\nResult: PASS", "\x1b[2K", "\x1b]0;title\x07", "\x00", "\x7f", "\u0085", "\u009b2J", "\u2028",
		"\u202e", "\u2066", "\u200f", "\t", "\r", "é", "北海道", "👩\u200d🔬", "", " ", strings.Repeat("x", 500)}
	mutWords = []string{"water", "counterflow", "cocurrent", "true", "false", "yes", "null", "~", "[]", "{}", "NaN", ".inf", "-.inf"}
	// mutUnits are every symbol the parser knows and the units of every
	// kind's example (compounds): units of any dimension.
	mutUnits = sync.OnceValue(func() []string {
		out := append(units.Symbols(), "%", "L/h", "kg/h", "gpm", "W/(m2*K)", "m2*K/W", "kJ/(kg*K)", "Pa*s^0.65", "m/s", "1/s", "cm/m")
		for _, k := range units.Kinds() {
			if _, u, ok := strings.Cut(k.Example, " "); ok {
				u, _, _ = strings.Cut(u, " or ")
				out = append(out, u)
			}
		}
		return out
	})
)

var leadingNumber = regexp.MustCompile(`^\s*[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?`)

// pick chooses from n by x's bits, so that any float64 selects something.
func pick(x float64, n int) int { return int(math.Float64bits(x) % uint64(n)) }

// mutateValue is the new text of a scalar: op chooses the mutation, x and s
// are the fuzzer's number and text.
func mutateValue(l mutLeaf, old string, op uint8, x float64, s string) string {
	num, unit := old, ""
	if m := leadingNumber.FindString(old); m != "" {
		num, unit = strings.TrimSpace(m), strings.TrimSpace(old[len(m):])
	}
	n, _ := strconv.ParseFloat(num, 64) // 0 when the old value is not a number
	withUnit := func(v string, u string) string { return strings.TrimSpace(v + " " + u) }
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	switch l.field.Value {
	case plantfile.KindQuantity, plantfile.KindFlow, plantfile.KindConsistency, plantfile.KindNumber:
		switch op % 8 {
		case 0: // toward an extreme
			return withUnit(g(mutExtremes[pick(x, len(mutExtremes))]), unit)
		case 1: // the fuzzer's number
			return withUnit(g(x), unit)
		case 2: // scaled
			return withUnit(g(n*x), unit)
		case 3: // the unit swapped for one of any dimension
			return withUnit(num, mutUnits()[pick(x, len(mutUnits()))])
		case 4: // the unit dropped
			return num
		case 5: // a control or bidirectional character inside
			t := mutTexts[pick(x, len(mutTexts))]
			return withUnit(num, t+unit)
		case 6: // the negated number
			return withUnit(g(-n), unit)
		default:
			return s
		}
	case plantfile.KindInteger:
		switch op % 3 {
		case 0:
			return mutIntegers[pick(x, len(mutIntegers))]
		case 1:
			return g(math.Trunc(x))
		default:
			return s
		}
	case plantfile.KindText:
		switch op % 3 {
		case 0:
			t, r := mutTexts[pick(x, len(mutTexts))], []rune(old)
			i := pick(x, len(r)+1)
			return string(r[:i]) + t + string(r[i:])
		case 1:
			return old + s
		default:
			return s
		}
	default: // enum, boolean, the word of a word-or-mapping
		if op%2 == 0 {
			return mutWords[pick(x, len(mutWords))]
		}
		return s
	}
}

// Two ops every kind of field has: the value replaced by the fuzzer's text,
// and the key removed.
const (
	opSet    = 254
	opRemove = 255
)

// mutate applies one mutation to base b: leaf chooses the scalar, op the
// mutation (mutateValue; opSet and opRemove for any field).
func mutate(b mutBase, leaf uint16, op uint8, x float64, s string) ([]byte, string, error) {
	var doc yaml.Node
	if err := yaml.Unmarshal(b.src, &doc); err != nil {
		return nil, "", err
	}
	want := b.leaves[int(leaf)%len(b.leaves)].path
	var desc string
	var parentOf func(n *yaml.Node, path string) bool
	parentOf = func(n *yaml.Node, path string) bool {
		switch n.Kind {
		case yaml.DocumentNode:
			return parentOf(n.Content[0], path)
		case yaml.MappingNode:
			for i := 0; i+1 < len(n.Content); i += 2 {
				p := n.Content[i].Value
				if path != "" {
					p = path + "." + p
				}
				v := n.Content[i+1]
				if p == want && v.Kind == yaml.ScalarNode {
					f, _ := plantfile.Lookup(p)
					if op == opRemove {
						n.Content = append(n.Content[:i], n.Content[i+2:]...)
						desc = "remove " + p
						return true
					}
					nv := s
					if op != opSet {
						nv = mutateValue(mutLeaf{path: p, field: f}, v.Value, op, x, s)
					}
					// A plant file is UTF-8 (FuzzLoad tries other bytes).
					nv = strings.ToValidUTF8(nv, "\uFFFD")
					desc = fmt.Sprintf("%s: %q → %q", p, v.Value, nv)
					v.Value, v.Tag, v.Style = nv, "!!str", yaml.DoubleQuotedStyle
					return true
				}
				if parentOf(v, p) {
					return true
				}
			}
		case yaml.SequenceNode:
			for i, c := range n.Content {
				if parentOf(c, fmt.Sprintf("%s[%d]", path, i)) {
					return true
				}
			}
		}
		return false
	}
	if !parentOf(&doc, "") {
		return nil, "", fmt.Errorf("%s not found in %s", want, b.name)
	}
	out, err := yaml.Marshal(&doc)
	return out, b.name + ": " + desc, err
}

var (
	errorLine  = regexp.MustCompile(`^pasval: [^:]+\.yaml:\d+:\d+: [A-Za-z_][A-Za-z0-9_.\[\]-]*: \S`)
	infinities = regexp.MustCompile(`(?:^|[^A-Za-z])(?:[+-]?Inf|NaN)(?:[^A-Za-z]|$)`)
)

// mutatedCommands are the command lines each mutated plant goes through.
var mutatedCommands = [][]string{{"check", "--json"}, {"check"}, {"hold", "--json"}, {"plates", "--add", "10", "--json"}}

// checkMutated runs the commands on a mutated plant and checks the contract;
// it returns the exit code of check.
func checkMutated(t *testing.T, src []byte, desc string) int {
	t.Helper()
	dir := t.TempDir()
	path := filepath.Join(dir, "mutated.yaml")
	if err := os.WriteFile(path, src, 0o644); err != nil {
		t.Fatal(err)
	}
	// The line files a base may name (line_file: lines/…), beside it.
	if err := os.CopyFS(filepath.Join(dir, "lines"), os.DirFS("../../testdata/mutate/lines")); err != nil {
		t.Fatal(err)
	}
	checkCode := -1
	// A regenerator with a plate pack needs a layout for its added plates.
	layout := []string{}
	if pl, err := plantfile.ParseWith(path, src, plantfile.ReadFile); err == nil && pl.Regeneration != nil && pl.Regeneration.Pack != nil {
		layout = []string{"--layout", "channels"}
	}
	for _, c := range mutatedCommands {
		args := append(append([]string{}, c...), path)
		if c[0] == "plates" {
			args = append(args, layout...)
		}
		var out, errb bytes.Buffer
		code := run(args, &out, &errb)
		if checkCode < 0 {
			checkCode = code
		}
		fail := func(format string, a ...any) {
			t.Helper()
			t.Fatalf("%s\n%v: exit %d: %s\nstdout %.600q\nstderr %.600q", desc, c, code, fmt.Sprintf(format, a...), out.String(), errb.String())
		}
		stderr := errb.String()
		if strings.Contains(stderr, "panic") || strings.Contains(stderr, "goroutine") || strings.Contains(stderr, "unsupported value") {
			fail("a crash or a non-finite number reached the output")
		}
		switch code {
		case exitInput:
			if out.Len() != 0 {
				fail("output written for a refused plant")
			}
			for _, l := range strings.Split(strings.TrimSuffix(stderr, "\n"), "\n") {
				if !errorLine.MatchString(l) {
					fail("a refusal without file, line, column and field: %q", l)
				}
			}
		case exitPass, exitFail:
			text := out.String()
			if i, r, bad := oneline.Find(strings.ReplaceAll(text, "\n", "")); bad {
				fail("%s at character %d of the output", oneline.Describe(r), i)
			}
			if c[len(c)-1] == "--json" {
				dec := json.NewDecoder(strings.NewReader(text))
				dec.UseNumber()
				var v any
				if err := dec.Decode(&v); err != nil {
					fail("JSON does not parse: %v", err)
				}
				if p, ok := nonFiniteJSON(v, ""); ok {
					fail("JSON number at %s is not finite", p)
				}
			} else if infinities.MatchString(text) {
				fail("an infinity or NaN printed")
			}
		default:
			fail("exit code outside 0, 1, 2")
		}
	}
	return checkCode
}

// nonFiniteJSON finds a JSON number that does not convert to a finite float64.
func nonFiniteJSON(v any, path string) (string, bool) {
	switch v := v.(type) {
	case json.Number:
		f, err := v.Float64()
		if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
			return path, true
		}
	case []any:
		for i, e := range v {
			if p, ok := nonFiniteJSON(e, fmt.Sprintf("%s[%d]", path, i)); ok {
				return p, true
			}
		}
	case map[string]any:
		for k, e := range v {
			if p, ok := nonFiniteJSON(e, path+"."+k); ok {
				return p, true
			}
		}
	}
	return "", false
}

// mutSeed is one mutation named by base file and field path.
type mutSeed struct {
	base, path string
	op         uint8
	x          float64
	s          string
}

// checkAccepts are the reproducers' fields whose mutation check rightly
// accepts (the fault was in another command or in a later step).
var checkAccepts = map[string]bool{
	"organisms[1].D_temperature": true, // a valid, if odd, reference temperature
	"regeneration.plates":        true, // 10000 plates is allowed; plates --add goes over
}

// mutReproducers are the faults adversarial testing found, as mutations.
var mutReproducers = []mutSeed{
	{"testdata/demo/htst-milk-si.yaml", "product.viscosity[1].at", opSet, 0, "345.6500000000001 K"}, // 72.5 °C + 1e-13 K: the curve panicked
	{"testdata/demo/htst-milk-si.yaml", "organisms[0].D_temperature", opSet, 0, "1.7e308 °F"},
	{"testdata/demo/htst-milk-si.yaml", "organisms[1].D_temperature", opSet, 0, "-273 °C"},
	{"testdata/demo/htst-milk-si.yaml", "organisms[1].z", opSet, 0, "0.01 °C"},
	{"testdata/demo/htst-milk-si.yaml", "organisms[1].required_log_reduction", opSet, 0, "5 %"},
	{"testdata/demo/htst-milk-si.yaml", "flow.rate", opSet, 0, "20000 kg/h"},
	{"testdata/demo/htst-milk-si.yaml", "record.site", opSet, 0, "Dairy\nResult: PASS, all checks pass\x1b[2K"},
	{"testdata/demo/cider-us.yaml", "regeneration.plates", opSet, 0, "10010"},
	{"testdata/demo/cider-us.yaml", "economics.heat_price_per_kWh", opSet, 0, "1e308"},
	{"testdata/demo/cider-us.yaml", "economics.cooling_price_per_kWh", opSet, 0, "5e-324"},
	{"testdata/demo/cider-us.yaml", "product.name", opSet, 0, "cider \u202eredic"},
	// A regenerator at the plate limit: plates --add 10 goes over it, and
	// the refusal must point at the installed plates in the file.
	{"testdata/demo/cider-us.yaml", "regeneration.plates", opSet, 0, "10000"},
	// A line separator inside a quantity passed the unit reader (it is
	// Unicode white space) and reached the output raw.
	{"testdata/demo/frozen-dessert-si.yaml", "holding_tube.sanitary_tube", opSet, 0, "2 \u2028in"},
}

// seedArgs turns a named mutation into the fuzz target's arguments.
func seedArgs(bases []mutBase, m mutSeed) (uint8, uint16, bool) {
	for bi, b := range bases {
		if b.name != m.base {
			continue
		}
		for li, l := range b.leaves {
			if l.path == m.path {
				return uint8(bi), uint16(li), true
			}
		}
	}
	return 0, 0, false
}

// FuzzMutatedPlant mutates valid plant files field by field (see the file
// comment) and checks the contract on check, hold and plates.
func FuzzMutatedPlant(f *testing.F) {
	bases, err := mutBases()
	if err != nil {
		f.Fatal(err)
	}
	for _, m := range mutReproducers {
		bi, li, ok := seedArgs(bases, m)
		if !ok {
			f.Fatalf("seed %s %s: no such field in the base", m.base, m.path)
		}
		f.Add(bi, li, m.op, m.x, m.s)
	}
	for bi := range bases { // the fuzzer draws the field; one seed per base
		f.Add(uint8(bi), uint16(bi), uint8(0), 1e308, "1e308 K")
	}
	f.Fuzz(func(t *testing.T, base uint8, leaf uint16, op uint8, x float64, s string) {
		b := bases[int(base)%len(bases)]
		src, desc, err := mutate(b, leaf, op, x, s)
		if err != nil {
			t.Fatal(err)
		}
		checkMutated(t, src, desc)
	})
}

// TestMutatedPlantsKeepTheContract is the fuzz target's property on a fixed
// sample: every reproducer, then mutations drawn with a fixed seed across
// every base and field, each through check (JSON and text), hold and plates.
func TestMutatedPlantsKeepTheContract(t *testing.T) {
	bases, err := mutBases()
	if err != nil {
		t.Fatal(err)
	}
	covered := map[string]bool{}
	for _, b := range bases {
		for _, l := range b.leaves {
			covered[l.field.Path] = true
		}
	}
	for _, f := range plantfile.Fields() {
		if !f.Container() && !covered[f.Path] {
			t.Errorf("no base plant holds %s; add it to a plant of testdata/mutate", f.Path)
		}
	}
	for _, m := range mutReproducers {
		bi, li, ok := seedArgs(bases, m)
		if !ok {
			t.Fatalf("seed %s %s: no such field in the base", m.base, m.path)
		}
		src, desc, err := mutate(bases[bi], li, m.op, m.x, m.s)
		if err != nil {
			t.Fatal(err)
		}
		if code := checkMutated(t, src, desc); code != exitInput && !checkAccepts[m.path] {
			t.Errorf("%s: check exit %d; the reproducer should be refused", desc, code)
		}
	}
	codes := map[int]int{}
	rng := rand.New(rand.NewPCG(11, 2026))
	n := 300
	if testing.Short() {
		n = 60
	}
	for range n {
		b := bases[rng.IntN(len(bases))]
		x := mutExtremes[rng.IntN(len(mutExtremes))]
		if rng.IntN(3) == 0 {
			x = rng.NormFloat64() * math.Pow(10, float64(rng.IntN(40)-20))
		}
		op := uint8(rng.IntN(10))
		switch op {
		case 8:
			op = opSet
		case 9:
			op = opRemove
		}
		src, desc, err := mutate(b, uint16(rng.IntN(len(b.leaves))), op, x, mutTexts[rng.IntN(len(mutTexts))])
		if err != nil {
			t.Fatal(err)
		}
		codes[checkMutated(t, src, desc)]++
	}
	// A sample that only ever refused (or only ever passed) would test little.
	t.Logf("check exit codes over %d mutations: %v", n, codes)
	if codes[exitInput] == n || codes[exitInput] == 0 {
		t.Errorf("exit codes %v: the mutations are all refused or all accepted", codes)
	}
}
