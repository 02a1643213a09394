package plantfile

// Source of the expectations: the free-text rule (internal/oneline): free
// text is one line; a control, separator or bidirectional formatting
// character is refused where it is read, with its line and field.

import (
	"fmt"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

// everyText holds every text field of the table once.
const everyText = `record:
  site: Test site
  line: line 1
  product: test milk
  schedule: 72 °C, 15 s
  prepared_by: tester
  notes: none
product:
  name: test milk
  density: 1030 kg/m3
  specific_heat: 3.93 kJ/(kg*K)
flow:
  rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
  outlet_target: 4 °C
heating:
  medium: {name: hot water set, density: 980 kg/m3, specific_heat: 4.19 kJ/(kg*K)}
  medium_inlet: 77 °C
  medium_rate: 20000 L/h
  plate_area: 0.35 m2
  u_value: 3300 W/(m2*K)
cooling:
  - name: glycol
    medium: {name: glycol 30 %, density: 1040 kg/m3, specific_heat: 3.7 kJ/(kg*K)}
    medium_inlet: -2 °C
    medium_rate: 20000 L/h
    plate_area: 0.35 m2
    u_value: 3000 W/(m2*K)
organisms:
  - {name: test organism, D: 1 s, D_temperature: 72 °C, z: 6 °C}
economics:
  currency: EUR
  operating_hours_per_year: 2000
  heat_price_per_kWh: 0.05
  cooling_price_per_kWh: 0.03
  plate_cost: 300
line_file: line.yaml
legal_tables:
  milk:
    - {temperature: 72 °C, time: 15 s}
legal_table: milk
acceptance:
  - {test: other, name: leak test, date: 2026-06-01, by: inspector, pass: true, note: three runs}
haccp:
  setpoint: {monitoring: chart read hourly, corrective_action: divert and hold, verification: QA reviews daily, records: kept 2 years}
  max_flow: {monitoring: chart read hourly, corrective_action: divert and hold, verification: QA reviews daily, records: kept 2 years}
  holding_time: {monitoring: chart read hourly, corrective_action: divert and hold, verification: QA reviews daily, records: kept 2 years}
  regenerator_pressure: {monitoring: chart read hourly, corrective_action: divert and hold, verification: QA reviews daily, records: kept 2 years}
  cooling_outlet: {monitoring: chart read hourly, corrective_action: divert and hold, verification: QA reviews daily, records: kept 2 years}
`

// lineOfEveryText is the line file everyText names (its blocks are all
// replaced by everyText's own).
func lineOfEveryText(string) ([]byte, error) { return []byte("flow:\n  rate: 9000 L/h\n"), nil }

// textNodes maps each text field's concrete path in everyText to its node.
func textNodes(t *testing.T, root *yaml.Node) map[string]*yaml.Node {
	t.Helper()
	out := map[string]*yaml.Node{}
	var walk func(n *yaml.Node, path string)
	walk = func(n *yaml.Node, path string) {
		switch n.Kind {
		case yaml.DocumentNode:
			walk(n.Content[0], path)
		case yaml.MappingNode:
			for i := 0; i+1 < len(n.Content); i += 2 {
				walk(n.Content[i+1], join(path, n.Content[i].Value))
			}
		case yaml.SequenceNode:
			for i, c := range n.Content {
				walk(c, fmt.Sprintf("%s[%d]", path, i))
			}
		case yaml.ScalarNode:
			if f, ok := Lookup(path); ok && f.Value == KindText {
				out[path] = n
			}
		}
	}
	walk(root, "")
	return out
}

func TestFreeTextIsOneLine(t *testing.T) {
	var doc yaml.Node
	if err := yaml.Unmarshal([]byte(everyText), &doc); err != nil {
		t.Fatal(err)
	}
	if _, err := ParseWith("p.yaml", []byte(everyText), lineOfEveryText); err != nil {
		t.Fatalf("base: %v", err)
	}
	nodes := textNodes(t, &doc)
	for _, f := range Fields() {
		if f.Value != KindText {
			continue
		}
		found := false
		for p := range nodes {
			if listIndex.ReplaceAllString(p, "[]") == f.Path {
				found = true
			}
		}
		if !found {
			t.Errorf("text field %s is missing from the test file", f.Path)
		}
	}
	for path, n := range nodes {
		for _, bad := range []string{"x\nResult: PASS", "x\x1b[2K", "x\x00", "x\x7f", "x\u0085y", "x\u009b2J", "x\u2028y", "x\u202eyx", "x\u2066y", "x\ty", "x\ry"} {
			old := n.Value
			n.Value, n.Style = bad, yaml.DoubleQuotedStyle
			src, err := yaml.Marshal(&doc)
			n.Value, n.Style = old, 0
			if err != nil {
				t.Fatal(err)
			}
			var again yaml.Node
			if err := yaml.Unmarshal(src, &again); err != nil {
				t.Fatalf("%s: %v", path, err)
			}
			line := textNodes(t, &again)[path].Line
			_, err = ParseWith("p.yaml", src, lineOfEveryText)
			want := fmt.Sprintf("p.yaml:%d:", line)
			if err == nil || !strings.Contains(err.Error(), want) || !strings.Contains(err.Error(), ": "+path+": ") ||
				!strings.Contains(err.Error(), "one line") {
				t.Errorf("%s = %q: %v; want a refusal at line %d", path, bad, err, line)
			}
			if err != nil && strings.ContainsAny(err.Error(), "\x1b\x00\x7f\r\t") {
				t.Errorf("%s: the error prints the character raw: %q", path, err.Error())
			}
		}
	}
}
