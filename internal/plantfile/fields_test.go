package plantfile

// Source of the expectations: the field table itself (fields.go) is the
// specification; these tests tie the reader, the README, the starter files
// and the demos to it.

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/diff"
	"go.yaml.in/yaml/v3"
)

var update = flag.Bool("update", false, "rewrite the README's generated plant-file table")

func TestReadmeReferenceTable(t *testing.T) {
	path := "../../README.md"
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s := string(data)
	i, j := strings.Index(s, ReferenceBegin), strings.Index(s, ReferenceEnd)
	if i < 0 || j < i {
		t.Fatalf("README lacks the markers %q … %q", ReferenceBegin, ReferenceEnd)
	}
	want := s[:i+len(ReferenceBegin)] + "\n" + ReferenceTable() + s[j:]
	if want == s {
		return
	}
	if *update {
		if err := os.WriteFile(path, []byte(want), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	t.Errorf("the README's plant-file table differs from the field table (go test ./internal/plantfile/ -update):\n%s",
		diff.Diff("README.md", data, "from fields.go", []byte(want)))
}

func TestLookup(t *testing.T) {
	for _, c := range []struct{ path, want string }{
		{"organisms[0].D", "organisms[].D"},
		{"cooling[12].medium_inlet", "cooling[].medium_inlet"},
		{"cooling[1].medium.density", "cooling[].medium.density"},
		{"product.viscosity[].at", "product.viscosity[].at"},
		{"process.hold_setpoint", "process.hold_setpoint"},
	} {
		f, ok := Lookup(c.path)
		if !ok || f.Path != c.want {
			t.Errorf("Lookup(%q) = %q %v, want %q", c.path, f.Path, ok, c.want)
		}
	}
	if _, ok := Lookup("process.hold_setpiont"); ok {
		t.Error("a misspelt path was found")
	}
	if f, _ := Lookup("organisms[3].z"); f.Unit.Name != "temperature difference" || !f.Required {
		t.Errorf("organisms[].z: %+v", f)
	}
}

func TestTableIsWellFormed(t *testing.T) {
	for _, f := range Fields() {
		if f.Description == "" {
			t.Errorf("%s has no description", f.Path)
		}
		if p := f.Parent(); p != "" {
			if parent, ok := byPath[p]; !ok || !parent.Container() {
				t.Errorf("%s: parent %q is not a mapping or list in the table", f.Path, p)
			}
		}
		if f.Container() && len(Children(f.Path)) == 0 {
			t.Errorf("%s holds nothing", f.Path)
		}
		if !f.Container() && f.Example == "" {
			t.Errorf("%s has no example", f.Path)
		}
		for _, k := range f.OneOf {
			if _, ok := byPath[f.Path+"."+k]; !ok {
				t.Errorf("%s: one-of key %q is not a child", f.Path, k)
			}
		}
		_ = f.Value.String()
		_ = valueText(f)
	}
}

// exampleFile is a plant file that gives every key of the table its example
// (both of each exclusive pair, so Parse accepts it and Validate would not).
func exampleFile() string {
	var b strings.Builder
	var write func(path string, indent string)
	write = func(path, indent string) {
		for _, f := range Children(path) {
			key := f.Key()
			switch f.Value {
			case KindMapping, KindWaterOrMapping:
				fmt.Fprintf(&b, "%s%s:\n", indent, key)
				write(f.Path, indent+"  ")
			case KindList:
				fmt.Fprintf(&b, "%s%s:\n%s  -\n", indent, key, indent)
				write(f.Path, indent+"    ")
			case KindNamed:
				// The one child (NameKey) written under the name legal_table's example picks.
				item := Children(f.Path)[0]
				fmt.Fprintf(&b, "%s%s:\n%s  %s:\n%s    -\n", indent, key, indent, byPath["legal_table"].Example, indent)
				write(item.Path, indent+"      ")
			default:
				fmt.Fprintf(&b, "%s%s: %s\n", indent, key, f.Example)
			}
		}
	}
	write("", "")
	return b.String()
}

func TestEveryFieldIsDecoded(t *testing.T) {
	// A file with every key at its example parses without error (the examples
	// are valid), and the reader looked every key of the table up: a key added
	// to the table without its decoding fails here.
	src := exampleFile()
	// line_file is read too: the line file it names gives one block, which
	// the example's own replaces.
	d := &decoder{file: "every-key.yaml", consulted: map[string]bool{},
		read: func(string) ([]byte, error) { return []byte("holding_tube:\n  length: 1 m\n"), nil }}
	if _, err := parseWith(d, []byte(src)); err != nil {
		t.Fatalf("%v\n%s", err, src)
	}
	for _, f := range Fields() {
		if !d.consulted[f.Path] {
			t.Errorf("%s is in the table but the reader never reads it", f.Path)
		}
	}
}

// TestStartersAndDemosFollowTheTable walks the YAML of each starter file and
// demo against the table, independently of the reader: every key is in the
// table with the shape it says, and every required key is there.
func TestStartersAndDemosFollowTheTable(t *testing.T) {
	files, _ := filepath.Glob("../../cmd/pasval/starter/*.yaml")
	demos, _ := filepath.Glob("../../testdata/demo/*.yaml")
	sets, _ := filepath.Glob("../../testdata/demo/*/*.yaml") // line files and their products
	more, _ := filepath.Glob("../../testdata/equivalence/*.yaml")
	files = append(append(append(files, demos...), sets...), more...)
	if len(files) < 10 {
		t.Fatalf("only %d files", len(files))
	}
	for _, file := range files {
		if filepath.Base(file) == "line.yaml" {
			// A line file: its keys follow the table; product and process
			// come from the product files that name it.
			var doc yaml.Node
			data, _ := os.ReadFile(file)
			if err := yaml.Unmarshal(data, &doc); err != nil {
				t.Fatalf("%s: %v", file, err)
			}
			walkAgainstTable(t, file, doc.Content[0], "", "product", "process")
			if _, err := LoadLine(file); err != nil {
				t.Errorf("%s does not load as a line: %v", file, err)
			}
			continue
		}
		data, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		var doc yaml.Node
		if err := yaml.Unmarshal(data, &doc); err != nil {
			t.Fatalf("%s: %v", file, err)
		}
		walkAgainstTable(t, file, doc.Content[0], "")
		if _, err := Load(file); err != nil {
			t.Errorf("%s does not load: %v", file, err)
		}
	}
}

func walkAgainstTable(t *testing.T, file string, n *yaml.Node, path string, notRequired ...string) {
	t.Helper()
	if n.Kind != yaml.MappingNode {
		t.Errorf("%s: %s is not a mapping", file, path)
		return
	}
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		key, v := n.Content[i].Value, n.Content[i+1]
		seen[key] = true
		fp := key
		if path != "" {
			fp = path + "." + key
		}
		f, ok := byPath[fp]
		if !ok {
			t.Errorf("%s:%d: %s is not in the field table", file, n.Content[i].Line, fp)
			continue
		}
		switch {
		case f.Value == KindList:
			if v.Kind != yaml.SequenceNode {
				t.Errorf("%s: %s is not a list", file, fp)
				continue
			}
			for _, item := range v.Content {
				walkAgainstTable(t, file, item, fp+"[]")
			}
		case f.Value == KindNamed:
			if v.Kind != yaml.MappingNode {
				t.Errorf("%s: %s is not a mapping", file, fp)
				continue
			}
			for j := 1; j < len(v.Content); j += 2 {
				for _, item := range v.Content[j].Content {
					walkAgainstTable(t, file, item, fp+"."+NameKey+"[]")
				}
			}
		case f.Value == KindMapping || f.Value == KindWaterOrMapping && v.Kind == yaml.MappingNode:
			walkAgainstTable(t, file, v, fp)
		case v.Kind != yaml.ScalarNode:
			t.Errorf("%s: %s should be a single value", file, fp)
		}
	}
	for _, f := range Children(strings.TrimSuffix(path, "[]")) {
		if f.Required && !seen[f.Key()] && !slices.Contains(notRequired, f.Key()) {
			t.Errorf("%s: %s is required but missing", file, f.Path)
		}
	}
}
