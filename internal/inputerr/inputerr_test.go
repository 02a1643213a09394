package inputerr

// No external source applies: the expected texts are the project's own message convention.

import "testing"

func TestErrorText(t *testing.T) {
	// Expected texts follow the project's own message convention (README "Exit status").
	cases := []struct {
		name string
		err  *Error
		want string
	}{
		{"full position", At(Pos{File: "a.yaml", Line: 11, Column: 3}, "process.hold_setpoint", "expected %s", "a temperature"),
			"a.yaml:11:3: process.hold_setpoint: expected a temperature"},
		{"line only", At(Pos{File: "run.csv", Line: 7}, "flow_rate", "not a number"), "run.csv:7: flow_rate: not a number"},
		{"whole file", At(Pos{File: "missing.yaml"}, "", "cannot read missing.yaml: no such file"), "missing.yaml: cannot read missing.yaml: no such file"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := c.err.Error(); got != c.want {
				t.Errorf("got %q, want %q", got, c.want)
			}
		})
	}
	l := List{cases[0].err, cases[1].err}
	if got, want := l.Error(), cases[0].want+"\n"+cases[1].want; got != want {
		t.Errorf("list: got %q, want %q", got, want)
	}
}
