package main

// Sources of the expectations: docs/METHOD.md §14.3 (results identical
// whatever the number of cores) and the exit-status contract of the README.

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

func TestMarginsSameOnOneCoreAndAll(t *testing.T) {
	// The same seed gives byte-identical JSON with GOMAXPROCS=1 and with every core.
	path := filepath.Join(demoDir, "htst-milk-si.yaml")
	run := func(procs string) string {
		cmd := exec.Command(binPath, "margins", path, "--json", "--samples", "30000")
		cmd.Env = os.Environ()
		if procs != "" {
			cmd.Env = append(cmd.Env, "GOMAXPROCS="+procs)
		}
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("GOMAXPROCS=%s: %v", procs, err)
		}
		return string(out)
	}
	one, all, four := run("1"), run(""), run("4")
	if one != all || one != four {
		t.Error("margins differ with the number of cores")
	}
	if !strings.Contains(one, `"seed": 14`) || !strings.Contains(one, `"samples": 30000`) {
		t.Errorf("JSON lacks the seed or the sample count:\n%.400s", one)
	}
}

func TestMarginsExitAndUsage(t *testing.T) {
	demo := filepath.Join(demoDir, "htst-milk-si.yaml")
	out, errs, code := runBinary(t, "margins", demo, "--samples", "2000")
	if code != 0 || !strings.Contains(out, "Worst case") || !strings.Contains(out, "Sensitivity") || !strings.Contains(out, "Caution:") {
		t.Errorf("margins on the demo: exit %d %s\n%s", code, errs, out)
	}
	for _, c := range []struct {
		args []string
		frag string
	}{
		{[]string{"margins", demo, "--samples", "0"}, "--samples must be from 1"},
		{[]string{"margins", filepath.Join(demoDir, "cider-us.yaml")}, "no uncertainty block"},
		{[]string{"margins", demo, "--seed", "-1"}, "invalid argument"},
	} {
		_, errs, code := runBinary(t, c.args...)
		if code != exitInput || !strings.Contains(errs, c.frag) {
			t.Errorf("%v: exit %d %q, want 2 and %q", c.args, code, errs, c.frag)
		}
	}
	// A worst case that fails is exit 1: the closed-form plant of the tests
	// fails its row at the high end of the flow.
	p := filepath.Join(t.TempDir(), "tight.yaml")
	writeFile(t, p, `product: {name: x, density: 1000 kg/m3, specific_heat: 4 kJ/(kg*K), viscosity: [{at: 72 °C, value: 1 mPa*s}]}
flow: {max_rate: 4700 L/h}
process: {raw_inlet: 5 °C, hold_setpoint: 72 °C}
holding_tube: {inner_diameter: 50 mm, length: 20 m, fastest_to_mean: 2}
legal_minimums: [{temperature: 72 °C, time: 15 s}]
uncertainty: {flow.max_rate: {tolerance: ±5 %, distribution: uniform}}
`)
	out, _, code = runBinary(t, "margins", p, "--samples", "1000")
	if code != exitFail || !strings.Contains(out, "FAIL") {
		t.Errorf("a failing worst case: exit %d\n%s", code, out)
	}
	out, _, code = runBinary(t, "check", p)
	if code != 0 || !strings.Contains(out, "Margins: worst case: holding-time fails by −0.68 s; P(all hold) = ") {
		t.Errorf("check's margins line: exit %d\n%s", code, out)
	}
}
