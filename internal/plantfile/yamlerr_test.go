package plantfile

// Source of the expected positions: each case's file read by eye (the line
// of the unclosed bracket, the alias, the control byte); the library's own
// messages from go.yaml.in/yaml/v3 v3.0.6.

import (
	"fmt"
	"strings"
	"testing"
)

func TestYAMLErrorPositions(t *testing.T) {
	// good (plantfile_test.go) by line: 1 record, 2 site, 3 product, 4 name,
	// 5 density, 6 specific_heat, 7 flow, 8 rate, 9 process, 10 raw_inlet,
	// 11 hold_setpoint, 12 outlet_target, 13 regeneration, 14 arrangement,
	// 15 ratio, 16 plate_area, 17 u_value, 18 fouling.
	for _, tc := range []struct {
		name      string
		from, to  string
		line, col int
		frag      string
	}{
		// The parser reports the line of the unclosed bracket counted from 0.
		{"unclosed bracket", "  arrangement: cocurrent", "  arrangement: [cocurrent", 14, 3, "did not find expected ',' or ']'"},
		{"unclosed brace", "  name: test milk", "  name: {test milk", 4, 3, "did not find expected ',' or '}'"},
		{"bracket open at the end", "  fouling: 0.0001 m2*K/W\n", "  fouling: [\n", 18, 3, "did not find expected node content"},
		{"mapping dedented", "  density: 1030 kg/m3", " density: 1030 kg/m3", 5, 2, "did not find expected key"},
		{"list item in a mapping", "flow:\n", "- flow\nflow:\n", 7, 1, "did not find expected key"},
		// The scanner counts from 1 already.
		{"mapping value in a value", "  name: test milk", "  name: test: milk", 4, 3, "mapping values are not allowed"},
		{"unterminated quote", "  name: test milk", "  name: \"test milk", 4, 3, "found unexpected end of stream"},
		{"character that starts no token", "  ratio: 45 %", "  ratio: @45 %", 15, 3, "cannot start any token"},
		// Reported without a line by the library.
		{"undefined alias", "  plate_area: 0.35 m2", "  plate_area: *area", 16, 15, "unknown anchor 'area' referenced"},
		{"undefined alias after a comment naming it", "  ratio: 45 %", "  ratio: 45 %  # not *area\n  x: *area", 16, 6, "unknown anchor"},
		{"control byte in a comment", "process:\n", "process:   # \x01 note\n", 9, 14, "control character (U+0001)"},
		{"escape byte in a plain value", "  name: test milk", "  name: test\x1bmilk", 4, 13, "control character (U+001B)"},
		{"DEL in a value", "  name: test milk", "  name: test\x7fmilk", 4, 13, "control character (U+007F)"},
		{"C1 control in a value", "  name: test milk", "  name: test\u0090milk", 4, 13, "control character (U+0090)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			src := strings.Replace(good, tc.from, tc.to, 1)
			if src == good {
				t.Fatalf("%q not in the file", tc.from)
			}
			_, err := Parse("p.yaml", []byte(src))
			if err == nil {
				t.Fatalf("accepted")
			}
			first := strings.SplitN(err.Error(), "\n", 2)[0]
			want := fmt.Sprintf("p.yaml:%d:%d:", tc.line, tc.col)
			if !strings.HasPrefix(first, want) || !strings.Contains(first, tc.frag) {
				t.Errorf("got %q, want %s … %q", first, want, tc.frag)
			}
		})
	}
}
