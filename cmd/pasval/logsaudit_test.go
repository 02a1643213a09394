package main

// Reproducers of an independent audit of the run review (testdata/audit-runs,
// where its README says what each file is), and the review's figures that
// the audit asked for.

import (
	"bytes"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"pasval/internal/runlog"
)

const auditRuns = "../../testdata/audit-runs"

// TestLogsClockTimesAsExactAsSeconds: the same 120 samples written with time
// in seconds from 0 and as clock times give the same review. Half of the
// parcels are held 15 s − 5×10⁻⁸ s in the audit's construction, short of
// the 72 °C / 15 s row by more than its tolerance (10⁻⁹ × 15 s,
// docs/METHOD.md §1.5): 52 lethality events and exit 1 in both. Held as
// Unix seconds in a float64 (steps of 2^-22 s = 0.24 µs in 2026), the clock
// file lost the 5×10⁻⁸ s and passed.
func TestLogsClockTimesAsExactAsSeconds(t *testing.T) {
	plant := filepath.Join(auditRuns, "tie-plant.yaml")
	secs, codeS := logsJSON(t, plant, filepath.Join(auditRuns, "tie-seconds.csv"))
	clock, codeC := logsJSON(t, plant, filepath.Join(auditRuns, "tie-clock.csv"))
	for name, c := range map[string]struct {
		v    map[string]any
		code int
	}{"seconds": {secs, codeS}, "clock times": {clock, codeC}} {
		s := c.v["summary"].(map[string]any)
		// The audit's count: from 16 s on, every other parcel (the ones
		// that left after a second at the higher flow) falls short, each a
		// one-second event of its own between parcels that pass.
		if c.code != exitFail || s["events"] != 52.0 {
			t.Errorf("%s: exit %d, %v events; want 1 and 52", name, c.code, s["events"])
		}
		// 15 s − 5×10⁻⁸ s: the audit's construction of the flows.
		if got := s["min_forward_residence_s"].(float64); math.Abs(got-(15-5e-8)) > 1e-12 {
			t.Errorf("%s: min residence %.12f s, want 14.99999995 s", name, got)
		}
	}
	// Identical numbers (tolerance 0), times apart: seconds against clock times.
	skip := map[string]bool{"file": true, "files": true, "start": true, "end": true}
	for _, key := range []string{"summary", "events", "drops"} {
		sameJSON(t, key, secs[key], clock[key], 0, skip)
	}
}

// TestLogsViscosityNotCreditedAboveTheSetpoint: product recorded hotter than
// the setpoint is not credited with its lower viscosity (docs/METHOD.md
// §13.4). In the audit's cream run, 720–760 s at 78 °C and 1620 L/h against
// a 76 °C setpoint: hand calculation, A = π (0.0475 m)²/4 = 1.77205e-3 m²,
// v = 0.253943 m/s; μ ln-interpolated between the plant's 3.2 mPa·s at
// 75 °C and 2.8 at 85 °C (docs/METHOD.md §4): 3.15755 mPa·s at 76 °C,
// 3.07434 at 78 °C; Re = 1030 · 0.253943 · 0.0475 / μ = 3935 at the
// setpoint (laminar: r = 2, 12 m / (2v) = 23.627 s, short of the 25 s row)
// and 4041 at the reading (turbulent: 35.6 s, no event). The parcels leaving
// from 728 s to 780 s are a lethality event: the audit's 52 s at 23.63 s.
func TestLogsViscosityNotCreditedAboveTheSetpoint(t *testing.T) {
	v, code := logsJSON(t, filepath.Join(auditRuns, "cream-plant.yaml"), filepath.Join(auditRuns, "cream-run.csv"))
	if code != exitFail {
		t.Errorf("exit %d, want 1", code)
	}
	var found bool
	for _, e := range v["events"].([]any) {
		e := e.(map[string]any)
		if e["start"].(float64) < 720 {
			continue
		}
		found = true
		if e["kind"] != "lethality" || e["verdict"] != "product at risk" || e["start"] != 728.0 || e["duration_s"] != 52.0 {
			t.Errorf("event %v at %v s for %v s, %v; want lethality at 728 s for 52 s, product at risk", e["kind"], e["start"], e["duration_s"], e["verdict"])
		}
		if got := e["min_residence_s"].(float64); math.Abs(got-23.627395) > 1e-5 {
			t.Errorf("min residence %.6f s, want 23.627395 s", got)
		}
	}
	if !found {
		t.Error("no event after 720 s: the hotter samples were credited with their lower viscosity")
	}
}

// TestLogsSensorLowReading: with process.sensor_accuracy the review shows,
// beside the verdicts on the readings as recorded, the parcels judged with
// every reading lowered by it (docs/METHOD.md §13.4; the figures themselves
// are held to the independent reference in TestLogsAgainstReference); without
// it the keys are null and the sentence is left out.
func TestLogsSensorLowReading(t *testing.T) {
	v, _ := logsJSON(t, demoPlant, demoRun)
	s := v["summary"].(map[string]any)
	// The demo plant's 0.25 °C; one more parcel falls short at the low
	// reading than as recorded: the dip to 72.24 °C reads 71.99 °C, below
	// every legal row (72, 89 and 90 °C).
	if s["sensor_low_K"] != 0.25 || s["samples_short"] != 40.0 || s["samples_short_at_sensor_low"] != 41.0 {
		t.Errorf("sensor low %v K, short %v as recorded and %v at the low reading; want 0.25, 40, 41",
			s["sensor_low_K"], s["samples_short"], s["samples_short_at_sensor_low"])
	}
	first := v["events"].([]any)[0].(map[string]any)
	if first["samples_short_at_sensor_low"] != 1.0 || first["verdict"] != "limits met" {
		t.Errorf("the 72.24 °C dip: %v short at the low reading, verdict %v; want 1 and limits met as recorded",
			first["samples_short_at_sensor_low"], first["verdict"])
	}
	for _, c := range []struct{ units, want string }{
		{"si", "With the sensor reading 0.25 K low (its stated accuracy), 41 forward samples' parcels\n  would fall short"},
		{"us", "With the sensor reading 0.45 °F low"},
	} {
		out, _, _ := runBinary(t, "logs", demoPlant, demoRun, "--units", c.units)
		if !strings.Contains(out, c.want) || !strings.Contains(out, "The verdicts take the readings\n  as recorded.") && c.units == "si" {
			t.Errorf("--units %s: no %q in\n%s", c.units, c.want, out)
		}
	}

	src, err := os.ReadFile(demoPlant)
	if err != nil {
		t.Fatal(err)
	}
	plant := filepath.Join(t.TempDir(), "no-accuracy.yaml")
	writeFile(t, plant, strings.Replace(string(src), "  sensor_accuracy: 0.25 °C", "", 1))
	v, _ = logsJSON(t, plant, demoRun)
	s = v["summary"].(map[string]any)
	for _, k := range []string{"sensor_low_K", "samples_short_at_sensor_low", "min_forward_log_reduction_at_sensor_low", "min_forward_log_reduction_at_sensor_low_by_organism"} {
		if got, ok := s[k]; !ok || got != nil {
			t.Errorf("without an accuracy: summary.%s = %v (present %v), want null", k, got, ok)
		}
	}
	if s["samples_short"] != 40.0 {
		t.Errorf("samples short as recorded %v without an accuracy, want 40", s["samples_short"])
	}
	if out, _, _ := runBinary(t, "logs", plant, demoRun); strings.Contains(out, "sensor reading") {
		t.Errorf("without an accuracy the review speaks of the sensor:\n%s", out)
	}
}

// TestLogsUnitsImplausible: a column whose header names one unit but holds
// values in another passes every parser; the review warns, with the
// numbers, when the median forward temperature lies more than 15 K from the
// setpoint or the median forward flow outside 0.2 to 5 × the normal rate
// (docs/METHOD.md §13.1). The demo shift with its temperatures written in
// °F under a [°C] header (73.00 °C = 163.40 °F: 1.8 × 73 + 32) and with its
// flows in gpm under [L/h] (10 000 L/h = 44.03 gpm; 1 gpm = 3.785411784 L ×
// 60 = 227.1247 L/h, NIST SP 811).
func TestLogsUnitsImplausible(t *testing.T) {
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(plain)), "\n")
	rewrite := func(name string, col int, f func(float64) float64) string {
		out := []string{lines[0]}
		for _, l := range lines[1:] {
			p := strings.Split(l, ",")
			v, err := strconv.ParseFloat(p[col], 64)
			if err != nil {
				t.Fatal(err)
			}
			p[col] = strconv.FormatFloat(f(v), 'f', 2, 64)
			out = append(out, strings.Join(p, ","))
		}
		path := filepath.Join(t.TempDir(), name)
		writeFile(t, path, strings.Join(out, "\n")+"\n")
		return path
	}
	cases := []struct {
		name, path, code, field string
		values                  map[string]float64 // to 1e-6 relative
		words                   string
	}{
		{"°F under [°C]", rewrite("fahrenheit.csv", 1, func(c float64) float64 { return 1.8*c + 32 }), "run-temperature-implausible",
			"hold_outlet_temperature",
			// The median of the first 4096 forward samples: 73.00 °C in the demo, 163.40 °F.
			map[string]float64{"median_C": 163.4, "setpoint_C": 72.5, "limit_K": 15},
			"the median forward hold_outlet_temperature is 163.40 °C, 90.9 K from the setpoint 72.50 °C (more than 15 K): check the units of the column"},
		{"gpm under [L/h]", rewrite("gpm.csv", 2, func(q float64) float64 { return q / 227.12470704 }), "run-flow-implausible", "flow_rate",
			// The demo's median forward flow, 10 000 L/h, is 44.03 gpm, read as 44.03 L/h.
			map[string]float64{"median_m3_s": 44.03 / 3.6e6, "normal_m3_s": 10000 / 3.6e6, "low_ratio": 0.2, "high_ratio": 5},
			"the median forward flow_rate is 44 L/h, 0.0044 × the plant's normal rate 10000 L/h (outside 0.2 to 5 ×): check the units of the column"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			v, _ := logsJSON(t, demoPlant, c.path)
			ws := v["warnings"].([]any)
			if len(ws) != 1 {
				t.Fatalf("warnings %v, want one", ws)
			}
			w := ws[0].(map[string]any)
			if w["code"] != c.code || w["file"] != c.path || w["field"] != c.field || !strings.Contains(w["message"].(string), c.words) {
				t.Errorf("warning %v", w)
			}
			for k, want := range c.values {
				if got, ok := w["values"].(map[string]any)[k].(float64); !ok || math.Abs(got-want) > 1e-6*math.Abs(want) {
					t.Errorf("values.%s = %v, want %g", k, w["values"].(map[string]any)[k], want)
				}
			}
			out, _, _ := runBinary(t, "logs", demoPlant, c.path)
			if !strings.Contains(strings.Join(strings.Fields(out), " "), "Warnings ! "+c.path+": "+c.words) { // the words unwrapped
				t.Errorf("the text shows no warning:\n%s", out)
			}
		})
	}
	// The demo as written: no warning.
	if v, _ := logsJSON(t, demoPlant, demoRun); len(v["warnings"].([]any)) != 0 {
		t.Errorf("the demo shift: warnings %v, want none", v["warnings"])
	}
}

// TestRunMessagesNameTheFlags: the reader's messages that say what to change
// name the command line's flags, and each flag they name is one that logs
// and report register (the names are runlog's constants).
func TestRunMessagesNameTheFlags(t *testing.T) {
	for _, cmd := range []*cobra.Command{newLogsCmd(io.Discard), newReportCmd(io.Discard)} {
		for _, f := range []string{runlog.FlagSeparator, runlog.FlagDecimalComma, runlog.FlagColumns, runlog.FlagTemperatureUnit,
			runlog.FlagFlowUnit, runlog.FlagTimezone, runlog.FlagSkipBadRows, runlog.FlagGap, runlog.FlagWindow} {
			if cmd.Flags().Lookup(strings.TrimPrefix(f, "--")) == nil {
				t.Errorf("%s has no flag %s", cmd.Name(), f)
			}
		}
	}
	dir := t.TempDir()
	const row = "2026-03-14T06:00:00Z,73,10000,1\n"
	for _, c := range []struct{ name, text, msg string }{
		{"no-unit.csv", "time,hold_outlet_temperature,flow_rate [L/h],forward\n" + row, "or give --temperature-unit"},
		{"no-flow-unit.csv", "time,hold_outlet_temperature [°C],flow_rate,forward\n" + row, "or give --flow-unit"},
		{"renamed.csv", "time,TT-301 [°C],flow_rate [L/h],forward\n" + row, "name the file's column for it with --columns hold_outlet_temperature=NAME"},
		{"decimal-comma.csv", "time;hold_outlet_temperature [°C];flow_rate [L/h];forward\n2026-03-14T06:00:00Z;73,0;10000;1\n",
			"if the file is written with decimal commas, read it with --decimal-comma"},
		{"heating-partial.csv", "time,hold_outlet_temperature [°C],flow_rate [L/h],forward,heating_product_in [°C]\n" + strings.TrimSuffix(row, "\n") + ",61\n",
			"name the file's columns for them with --columns heating_product_out=NAME"},
	} {
		path := filepath.Join(dir, c.name)
		writeFile(t, path, c.text)
		var out, errb bytes.Buffer
		if code := run([]string{"logs", demoPlant, path}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), c.msg) {
			t.Errorf("%s: exit %d, %q; want 2 and %q", c.name, code, errb.String(), c.msg)
		}
	}
	// Skipping: the limit names its flag.
	bad := filepath.Join(dir, "two-bad.csv")
	writeFile(t, bad, "time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n"+row+"2026-03-14T06:00:01Z,x,10000,1\n2026-03-14T06:00:02Z,y,10000,1\n")
	var out, errb bytes.Buffer
	if code := run([]string{"logs", demoPlant, bad, "--skip-bad-rows", "1"}, &out, &errb); code != exitInput ||
		!strings.Contains(errb.String(), "(one more than --skip-bad-rows 1 allows)") {
		t.Errorf("over the limit: exit %d, %q", code, errb.String())
	}
}
