package main

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"pasval/internal/rungen"
)

var (
	demoPlant = filepath.Join(demoDir, "htst-milk-si.yaml")
	demoRun   = filepath.Join(demoDir, "runs", "htst-milk-si-shift.csv")
)

// logsJSON runs 'pasval logs --json' (the built binary) and decodes its output.
func logsJSON(t *testing.T, args ...string) (map[string]any, int) {
	t.Helper()
	out, errs, code := runBinary(t, append([]string{"logs", "--json"}, args...)...)
	var v map[string]any
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatalf("logs %v: %v\nstdout %q\nstderr %q", args, err, out, errs)
	}
	return v, code
}

// scriptedShiftCSV writes the demo shift's script without noise (the
// scenario of internal/rungen: every deviation at its exact value).
func scriptedShiftCSV(t *testing.T) string {
	t.Helper()
	var b strings.Builder
	b.WriteString(rungen.Header + "\n")
	for sec := range rungen.ShiftLength {
		temp, flow, fwd, skip := rungen.Script(sec)
		if skip {
			continue
		}
		flag := "0"
		if fwd {
			flag = "1"
		}
		fmt.Fprintf(&b, "%s,%s,%s,%s\n", rungen.Start.Add(time.Duration(sec)*time.Second).Format(time.RFC3339),
			strconv.FormatFloat(temp, 'f', -1, 64), strconv.FormatFloat(flow, 'f', -1, 64), flag)
	}
	path := filepath.Join(t.TempDir(), "scripted.csv")
	writeFile(t, path, b.String())
	return path
}

// TestLogsScriptedShift runs the noise-free demo shift through the command
// and checks each event against values worked by hand from the plant file
// (docs/METHOD.md §7, §13): the demo tube (2 in sanitary, ID 47.498 mm,
// A = 1.77190e-3 m², L = 34 m), milk of 1031 kg/m³ whose viscosity is taken
// at the colder of the reading and the 72.5 °C setpoint (docs/METHOD.md
// §13.4), ln-interpolated between the plant's points (docs/METHOD.md §4):
// 0.72 mPa·s at 73 °C (the setpoint's point), 0.72279 at 72.30 °C, 0.72840
// at 71.9 °C, 0.72111 at 72.42 °C. Fastest-particle times L/(r·Q/A) with
// Petukhov's ratio (computed with python3 from the formulas of
// docs/METHOD.md §7.4): at 73 °C, 10 000 L/h → Re 106 625, r 1.208718,
// 17.943077 s; 12 500 L/h → 14.413949 s; 12 800 L/h → 14.082161 s;
// 10 000 L/h at 72.30 °C → 17.941761 s, at 71.9 °C → 17.939128 s; 11 500
// L/h at 72.42 °C → 15.643030 s.
func TestLogsScriptedShift(t *testing.T) {
	v, code := logsJSON(t, demoPlant, scriptedShiftCSV(t))
	if code != exitFail {
		t.Errorf("exit %d, want 1 (events found)", code)
	}
	un := 34 / 17.943077 // m/s at 10 000 L/h, 73 °C
	us := 34 / 14.413949 // at 12 500 L/h, 73 °C
	uc := 34 / 15.643030 // at 11 500 L/h, 72.42 °C
	lh := func(q float64) float64 { return q / 3600 }
	// Listeria: D(T) = 0.9 s · 10^((71.7 − T)/6.3).
	dL := func(temp float64) float64 { return 0.9 * math.Pow(10, (71.7-temp)/6.3) }
	type want struct {
		kind, start, verdict    string
		duration, volume, minT  float64
		maxQ, minRes, sampleRes float64
		atRisk                  float64
		divert                  any // nil or seconds
	}
	steady := 17.943077
	shortMin := 7 + (34-7*us)/un    // 16.2292 s: 7 s of surge, the rest at the normal rate
	combinedMin := 7 + (34-7*uc)/un // 16.9138 s
	wants := []want{
		// A 20 s dip to 72.30 °C, above the 72 °C row: limits met, not diverted.
		// Longer than the residence: its last parcels crossed the tube at 72.30 °C.
		{"temperature", "2026-03-14T06:25:00Z", "limits met", 20, 20 * lh(10000), 72.30, 10000, 17.941761, 17.941761, 0, nil},
		// 72.4 then 71.9 °C (below every row: at risk), diverted at the third sample below.
		{"temperature", "2026-03-14T06:50:01Z", "product at risk", 2, 2 * lh(10000), 71.9, 10000, steady, 17.939128, lh(10000), 2.0},
		// 8 s at 12 500 L/h: per parcel 16.23 s meets 15 s; per sample 14.41 s would not.
		{"flow", "2026-03-14T07:15:00Z", "limits met", 8, 8 * lh(12500), 73, 12500, shortMin, 14.413949, 0, nil},
		// 45 s at 12 800 L/h: the tube fills with surge product, 14.08 s.
		// At risk: the parcels leaving from +k s with k + (34 − k·u_l)/u_n < 15
		// (k ≥ 11, worked with python3): 34 samples × 12 800 L/h × 1 s.
		{"flow", "2026-03-14T07:35:00Z", "product at risk", 45, 45 * lh(12800), 73, 12800, 14.082161, 14.082161, 34 * lh(12800), nil},
		// Then 5 parcels leave within both limits but under-held: j + (34 − j·u_n)/u_l < 15 for j = 0…4.
		{"lethality", "2026-03-14T07:35:45Z", "product at risk", 5, 5 * lh(10000), 73, 10000, 14.082161, steady, 5 * lh(10000), nil},
		// The recorder's 40 s hole in forward flow.
		{"gap", "2026-03-14T07:50:00Z", "no record", 40, 40 * lh(10000), 73, 10000, steady, steady, 40 * lh(10000), nil},
		{"temperature+flow", "2026-03-14T07:55:00Z", "limits met", 8, 8 * lh(11500), 72.42, 11500, combinedMin, 15.643030, 0, nil},
	}
	events := v["events"].([]any)
	if len(events) != len(wants) {
		t.Fatalf("%d events, want %d", len(events), len(wants))
	}
	num := func(m map[string]any, k string) float64 {
		f, ok := m[k].(float64)
		if !ok {
			t.Fatalf("%s: %v is not a number", k, m[k])
		}
		return f
	}
	for i, w := range wants {
		e := events[i].(map[string]any)
		t.Run(fmt.Sprintf("%d-%s", i+1, w.kind), func(t *testing.T) {
			if e["kind"] != w.kind || e["start"] != w.start || e["verdict"] != w.verdict {
				t.Errorf("%v %v %v, want %s %s %s", e["kind"], e["start"], e["verdict"], w.kind, w.start, w.verdict)
			}
			for _, c := range []struct {
				key       string
				want, tol float64
			}{
				{"duration_s", w.duration, 1e-9}, {"volume_L", w.volume, 1e-9}, {"min_temperature_C", w.minT, 1e-9},
				{"max_flow_L_h", w.maxQ, 1e-9}, {"at_risk_volume_L", w.atRisk, 1e-9},
				// The per-parcel hand values take every interval at 73 °C,
				// where the dips' few seconds were a little more viscous (a
				// change under 1e-4); the speeds are rounded to 7 digits.
				{"min_residence_s", w.minRes, 1e-4}, {"min_sample_residence_s", w.sampleRes, 1e-6},
			} {
				if got := num(e, c.key); math.Abs(got-c.want) > c.tol*math.Max(1, math.Abs(c.want)) {
					t.Errorf("%s = %.9g, want %.9g", c.key, got, c.want)
				}
			}
			lr := num(e["min_log_reduction_by_organism"].(map[string]any), "Listeria monocytogenes")
			if want := w.minRes / dL(w.minT); math.Abs(lr-want) > 1e-4*want {
				t.Errorf("Listeria log reduction %.6g, want %.6g", lr, want)
			}
			if w.divert == nil && e["divert_after_s"] != nil || w.divert != nil && e["divert_after_s"] != w.divert {
				t.Errorf("divert after %v, want %v", e["divert_after_s"], w.divert)
			}
		})
	}
	s := v["summary"].(map[string]any)
	// Forward from 240 s to 7080 s but for the upset's diverted 92 s.
	if num(s, "rows") != float64(rungen.ShiftRows) || num(s, "gaps") != 1 || math.Abs(num(s, "forward_s")-(7080-240-92)) > 1e-9 {
		t.Errorf("summary rows %v gaps %v forward %v", s["rows"], s["gaps"], s["forward_s"])
	}
}

// runReference runs testdata/reference/run_reference.py on a run file.
func runReference(t *testing.T, run string) map[string]any {
	t.Helper()
	py := "/usr/bin/python3"
	if _, err := os.Stat(py); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("python3 is required in CI: %v", err)
		}
		t.Skip("python3 not installed")
	}
	raw, err := exec.Command(py, "../../testdata/reference/run_reference.py", run).Output()
	if err != nil {
		t.Fatal(err)
	}
	var v map[string]any
	if err := json.Unmarshal(raw, &v); err != nil {
		t.Fatal(err)
	}
	return v
}

// TestLogsAgainstReference compares the command with an independent
// computation of docs/METHOD.md §13 (testdata/reference/run_reference.py,
// Python standard library only) on the committed demo shift and on the
// noise-free script: every summary, event and drop value to 1e-9.
func TestLogsAgainstReference(t *testing.T) {
	for name, run := range map[string]string{"demo shift": demoRun, "noise-free script": scriptedShiftCSV(t)} {
		t.Run(name, func(t *testing.T) {
			ref := runReference(t, run)
			got, _ := logsJSON(t, demoPlant, run)
			for _, key := range []string{"summary", "events", "drops"} {
				sameJSON(t, key, ref[key], got[key], 1e-9, nil)
			}
		})
	}
}

// sameJSON compares want (every key of it) with got: numbers to a relative
// tolerance, everything else exactly; keys in skip are not compared.
func sameJSON(t *testing.T, path string, want, got any, tol float64, skip map[string]bool) {
	t.Helper()
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok {
			t.Errorf("%s: %v, want an object", path, got)
			return
		}
		keys := make([]string, 0, len(w))
		for k := range w {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			if skip[k] {
				continue
			}
			if _, ok := g[k]; !ok {
				t.Errorf("%s.%s missing", path, k)
				continue
			}
			sameJSON(t, path+"."+k, w[k], g[k], tol, skip)
		}
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			t.Errorf("%s: %d elements, want %d", path, len(g), len(w))
			return
		}
		for i := range w {
			sameJSON(t, fmt.Sprintf("%s[%d]", path, i), w[i], g[i], tol, skip)
		}
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > tol*math.Max(1, math.Abs(w)) {
			t.Errorf("%s = %v, want %.12g", path, got, w)
		}
	default:
		if want != got {
			t.Errorf("%s = %v, want %v", path, got, want)
		}
	}
}

// TestLogsSameRunOtherForms: the demo shift written in °F and gpm, with ';'
// and decimal commas, gzip-compressed, and with renamed columns (units by
// option, words for the flag, a space for the T) gives the same JSON numbers.
func TestLogsSameRunOtherForms(t *testing.T) {
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	want, wantCode := logsJSON(t, demoPlant, demoRun)
	dir := t.TempDir()
	// The heating section's four temperatures go through temp, like the
	// holding-tube outlet's; an empty cell stays empty.
	rewrite := func(name, header, sep string, f func(ts string, tc, qlh float64, fwd string) []string, temp func(float64) string) string {
		var b bytes.Buffer
		b.WriteString(header + "\n")
		for _, line := range strings.Split(strings.TrimSpace(string(plain)), "\n")[1:] {
			p := strings.Split(line, ",")
			tc, _ := strconv.ParseFloat(p[1], 64)
			q, _ := strconv.ParseFloat(p[2], 64)
			cells := f(p[0], tc, q, p[3])
			for _, h := range p[4:] {
				if v, err := strconv.ParseFloat(h, 64); err == nil {
					h = temp(v)
				}
				cells = append(cells, h)
			}
			b.WriteString(strings.Join(cells, sep) + "\n")
		}
		path := filepath.Join(dir, name)
		writeFile(t, path, b.String())
		return path
	}
	ff := func(v float64, prec int) string { return strconv.FormatFloat(v, 'f', prec, 64) }
	heating := func(sep, unit string) string {
		var h []string
		for _, k := range []string{"heating_product_in", "heating_product_out", "heating_medium_in", "heating_medium_out"} {
			h = append(h, k+unit)
		}
		return sep + strings.Join(h, sep)
	}
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write(plain)
	zw.Close()
	gzPath := filepath.Join(dir, "shift.csv.gz")
	writeFile(t, gzPath, gz.String())

	cases := []struct {
		name string
		args []string
	}{
		// T·9/5 + 32 is exact in decimal at 0.01 °C → 0.018 °F; 1 gpm =
		// 3.785411784 L/min (NIST SP 811); 12 decimals keep the flow to 1e-13.
		{"°F and gpm", []string{rewrite("us.csv", "time,hold_outlet_temperature [°F],flow_rate [gpm],forward"+heating(",", " [°F]"), ",", func(ts string, tc, q float64, fwd string) []string {
			return []string{ts, ff(tc*9/5+32, 4), ff(q/60/3.785411784, 12), fwd}
		}, func(c float64) string { return ff(c*9/5+32, 4) })}},
		{"';' and decimal commas", []string{rewrite("eu.csv", "time;hold_outlet_temperature [°C];flow_rate [L/h];forward"+heating(";", " [°C]"), ";", func(ts string, tc, q float64, fwd string) []string {
			return []string{ts, strings.ReplaceAll(ff(tc, 2), ".", ","), strings.ReplaceAll(ff(q, 1), ".", ","), fwd}
		}, func(c float64) string { return strings.ReplaceAll(ff(c, 2), ".", ",") }), "--decimal-comma"}},
		{"gzip-compressed", []string{gzPath}},
		{"renamed columns", []string{rewrite("renamed.csv", "Timestamp;TT-301;FT-101;FDV;TT-201;TT-202;TT-203;TT-204", ";", func(ts string, tc, q float64, fwd string) []string {
			return []string{strings.Replace(ts, "T", " ", 1), ff(tc, 2), ff(q/1000, 4), map[string]string{"1": "Forward", "0": "Divert"}[fwd]}
		}, func(c float64) string { return ff(c, 2) }), "--columns", "time=Timestamp,hold_outlet_temperature=TT-301,flow_rate=FT-101,forward=FDV," +
			"heating_product_in=TT-201,heating_product_out=TT-202,heating_medium_in=TT-203,heating_medium_out=TT-204",
			"--temperature-unit", "°C", "--flow-unit", "m3/h", "--separator", ";"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, code := logsJSON(t, append([]string{demoPlant}, c.args...)...)
			if code != wantCode {
				t.Errorf("exit %d, want %d", code, wantCode)
			}
			// The file's name and hash differ by construction.
			sameJSON(t, "", want, got, 1e-9, map[string]bool{"file": true, "files": true})
		})
	}
}

// badRuns is the bad recorded-run corpus, testdata/bad-runs: for each file,
// the line:column and a fragment of the message pasval must give.
var badRuns = map[string]struct{ pos, msg string }{
	"empty.csv":            {"1:1", "the file is empty"},
	"header-only.csv":      {"2:1", "no data rows"},
	"unknown-unit.csv":     {"1:6", "[°Q] is not a unit of temperature"},
	"missing-column.csv":   {"1:1", `no column "flow_rate"`},
	"text-in-a-number.csv": {"3:28", `expected a number, found "ten"`},
	"time-backwards.csv":   {"3:1", "time goes backwards"},
	// At the first ',' of a row in a ';' file.
	"mixed-separators.csv": {"3:21", "mixed separators"},
	// The heating section's columns (docs/METHOD.md §17.1): a unit is never
	// assumed; all four temperatures or none; numbers as in any column.
	"heating-no-unit.csv": {"1:60", `heating_product_in: no unit for temperature: write it in the header, as "heating_product_in [°C]"`},
	"heating-partial.csv": {"1:1", "heating_medium_out: the header has heating_product_in, heating_product_out, heating_medium_in but no heating_medium_out"},
	"heating-text.csv":    {"3:49", `heating_medium_in: expected a number, found "hot"`},
}

// TestLogsBadFiles: each malformed file is refused, exit 2, naming the
// file, the line and the column, with nothing on standard output.
func TestLogsBadFiles(t *testing.T) {
	dir := "../../testdata/bad-runs"
	files, err := filepath.Glob(filepath.Join(dir, "*"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no bad runs in %s: %v", dir, err)
	}
	for _, path := range files {
		name := filepath.Base(path)
		t.Run(name, func(t *testing.T) {
			want, ok := badRuns[name]
			if !ok {
				t.Fatalf("%s has no expectation in badRuns", name)
			}
			out, errs, code := runBinary(t, "logs", demoPlant, path)
			prefix := "pasval: " + path + ":" + want.pos + ": "
			if code != exitInput || !strings.HasPrefix(errs, prefix) || !strings.Contains(errs, want.msg) || out != "" {
				t.Errorf("exit %d, stderr %q, stdout %q; want 2, %q…%q and no output", code, errs, out, prefix, want.msg)
			}
		})
	}
}

// TestLogsFlags: a bad option is refused before any file is read, naming
// its flag (exit 2).
func TestLogsFlags(t *testing.T) {
	cases := []struct {
		args []string
		msg  string
	}{
		{[]string{"--separator", "|"}, "--separator must be"},
		{[]string{"--separator", ",", "--decimal-comma"}, "--decimal-comma: a decimal comma cannot be read with ','"},
		{[]string{"--columns", "temperature=TT-301"}, `--columns: no column is called "temperature"`},
		{[]string{"--columns", "flow_rate= "}, "--columns: the header name for \"flow_rate\" is empty"},
		{[]string{"--temperature-unit", "furlong"}, `--temperature-unit: "furlong" is not a unit of temperature`},
		{[]string{"--flow-unit", "kPa"}, `--flow-unit: "kPa" is not a unit of volumetric flow`},
		{[]string{"--skip-bad-rows", "-1"}, "--skip-bad-rows: the number of bad rows to skip must be 0 or more"},
		{[]string{"--timezone", "Mars/Olympus_Mons"}, `--timezone "Mars/Olympus_Mons" is not a time zone name`},
		{[]string{"--gap", "-3"}, "--gap must be a number of seconds above 0"},
		{[]string{"--window", "-60"}, "--window must be a number of seconds above 0 and at most 86400"},
		{[]string{"--window", "1e6"}, "--window must be a number of seconds above 0 and at most 86400"},
		{[]string{"--columns", "heating_medium=TT-201"}, `--columns: no column is called "heating_medium"`},
		{[]string{"--units", "metric"}, "--units must be si or us"},
	}
	for _, c := range cases {
		t.Run(strings.Join(c.args, " "), func(t *testing.T) {
			var out, errb bytes.Buffer
			code := run(append([]string{"logs", demoPlant, "no-such-run.csv"}, c.args...), &out, &errb)
			if code != exitInput || !strings.Contains(errb.String(), c.msg) || out.Len() > 0 {
				t.Errorf("exit %d, stderr %q; want 2 and %q", code, errb.String(), c.msg)
			}
		})
	}
	var out, errb bytes.Buffer
	if code := run([]string{"logs", demoPlant}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "at least one recorded run") {
		t.Errorf("no run file: exit %d %q", code, errb.String())
	}
}

// TestLogsPlantWithoutCriteria: a plant file without a holding tube, or with
// nothing to judge a run against, is refused with its position.
func TestLogsPlantWithoutCriteria(t *testing.T) {
	src, err := os.ReadFile(demoPlant)
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	dir := t.TempDir()
	noTube := text[:strings.Index(text, "holding_tube:")]
	noCriteria := strings.Replace(text[:strings.Index(text, "legal_minimums:")], "    required_log_reduction: 5\n", "", 1)
	for _, c := range []struct{ name, text, msg string }{
		{"no-tube.yaml", noTube, ":1:1: holding_tube: the plant file describes no holding tube"},
		// At the holding tube, whose run cannot be judged.
		{"no-criteria.yaml", noCriteria, ":72:3: legal_minimums: neither a legal time–temperature row nor a required log reduction"},
	} {
		path := filepath.Join(dir, c.name)
		writeFile(t, path, c.text)
		var out, errb bytes.Buffer
		if code := run([]string{"logs", path, demoRun}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), c.name+c.msg) {
			t.Errorf("%s: exit %d %q; want 2 and %q", c.name, code, errb.String(), c.msg)
		}
	}
}

// TestLogsSeveralFiles: the demo shift split in two files in a folder (one
// compressed) is one review: rows add up, events keep their file, and the
// only difference from the whole file is the one second between the parts
// (the last sample of a file holds no time).
func TestLogsSeveralFiles(t *testing.T) {
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.SplitAfter(string(plain), "\n")
	const cut = 2001 // a quiet stretch of forward flow (line 2002, 06:33:20)
	dir := t.TempDir()
	a := filepath.Join(dir, "a-shift.csv")
	writeFile(t, a, strings.Join(lines[:cut], ""))
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write([]byte(lines[0] + strings.Join(lines[cut:], "")))
	zw.Close()
	b := filepath.Join(dir, "b-shift.csv.gz")
	writeFile(t, b, gz.String())
	writeFile(t, filepath.Join(dir, "notes.md"), "not a run")

	whole, _ := logsJSON(t, demoPlant, demoRun)
	split, code := logsJSON(t, demoPlant, dir)
	if code != exitFail {
		t.Errorf("exit %d, want 1", code)
	}
	files := split["files"].([]any)
	if len(files) != 2 || files[0].(map[string]any)["path"] != a || files[1].(map[string]any)["path"] != b {
		t.Fatalf("files %v, want %s and %s", files, a, b)
	}
	ws, ss := whole["summary"].(map[string]any), split["summary"].(map[string]any)
	if ss["rows"] != ws["rows"] || ss["events"] != ws["events"] {
		t.Errorf("rows %v events %v, want %v and %v", ss["rows"], ss["events"], ws["rows"], ws["events"])
	}
	if got, want := ss["forward_s"].(float64), ws["forward_s"].(float64)-1; math.Abs(got-want) > 1e-9 {
		t.Errorf("forward %v s, want %v (one second between the files)", got, want)
	}
	we, se := whole["events"].([]any), split["events"].([]any)
	for i := range se {
		e := se[i].(map[string]any)
		wantFile := b
		if i < 1 { // only the dip at 06:25 falls in the first file
			wantFile = a
		}
		if e["file"] != wantFile || e["start"] != we[i].(map[string]any)["start"] || e["kind"] != we[i].(map[string]any)["kind"] {
			t.Errorf("event %d: %v %v in %v; want as the whole file, in %s", i, e["kind"], e["start"], e["file"], wantFile)
		}
	}

	// A folder with no run in it, and files that do not agree on time.
	empty := t.TempDir()
	var out, errb bytes.Buffer
	if code := run([]string{"logs", demoPlant, empty}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "holds no recorded run") {
		t.Errorf("empty folder: exit %d %q", code, errb.String())
	}
	secs := filepath.Join(dir, "seconds.txt")
	writeFile(t, secs, "time [s],hold_outlet_temperature [°C],flow_rate [L/h],forward\n0,73,10000,1\n1,73,10000,1\n")
	errb.Reset()
	if code := run([]string{"logs", demoPlant, a, secs}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "mix clock times and seconds") {
		t.Errorf("mixed times: exit %d %q", code, errb.String())
	}
}

// TestLogsSkipBadRows: malformed rows stop the review unless skipped, and
// skipped ones are counted and listed with their position.
func TestLogsSkipBadRows(t *testing.T) {
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.SplitAfter(string(plain), "\n")
	// Two garbled rows after lines 1000 and 3000 (file lines 1001 and 3002).
	text := strings.Join(lines[:1000], "") + "2026-03-14T06:16:39Z,73.0#,10000.0,1,,,,\n" +
		strings.Join(lines[1000:3000], "") + "2026-03-14T06:49:58Z,73.00,10000.0\n" + strings.Join(lines[3000:], "")
	path := filepath.Join(t.TempDir(), "garbled.csv")
	writeFile(t, path, text)

	var out, errb bytes.Buffer
	if code := run([]string{"logs", demoPlant, path}, &out, &errb); code != exitInput || !strings.HasPrefix(errb.String(), "pasval: "+path+":1001:22: hold_outlet_temperature:") {
		t.Errorf("no skipping: exit %d %q", code, errb.String())
	}
	v, code := logsJSON(t, demoPlant, path, "--skip-bad-rows", "2")
	if code != exitFail {
		t.Errorf("exit %d, want 1", code)
	}
	f := v["files"].([]any)[0].(map[string]any)
	listed := f["bad_rows_listed"].([]any)
	if v["summary"].(map[string]any)["bad_rows"] != 2.0 || len(listed) != 2 ||
		!strings.HasPrefix(listed[0].(string), path+":1001:22:") || !strings.HasPrefix(listed[1].(string), path+":3002:") {
		t.Errorf("bad rows %v listed %v", v["summary"].(map[string]any)["bad_rows"], listed)
	}
	out.Reset()
	if code := run([]string{"logs", demoPlant, path, "--skip-bad-rows", "2"}, &out, &bytes.Buffer{}); code != exitFail ||
		!strings.Contains(out.String(), "Bad rows skipped (the first few)\n    "+path+":1001:22:") {
		t.Errorf("text output: exit %d, no listing of the bad rows:\n%s", code, out.String())
	}
	errb.Reset()
	if code := run([]string{"logs", demoPlant, path, "--skip-bad-rows", "1"}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), ":3002:") {
		t.Errorf("one allowed, two found: exit %d %q", code, errb.String())
	}
}

// TestLogsTimezone: zone-less clock times are read in --timezone, and every
// time is shown in it.
func TestLogsTimezone(t *testing.T) {
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	// 06:00 UTC on 14 March 2026 is 07:00 in Berlin (CET, UTC+1; summer
	// time begins on 29 March 2026).
	local := strings.ReplaceAll(string(plain), "Z,", ",")
	var b strings.Builder
	for i, l := range strings.SplitAfter(local, "\n") {
		if i > 0 && len(l) > 13 {
			h, _ := strconv.Atoi(l[11:13])
			l = l[:11] + fmt.Sprintf("%02d", h+1) + l[13:]
		}
		b.WriteString(l)
	}
	path := filepath.Join(t.TempDir(), "berlin.csv")
	writeFile(t, path, b.String())
	utc, _ := logsJSON(t, demoPlant, demoRun)
	berlin, _ := logsJSON(t, demoPlant, path, "--timezone", "Europe/Berlin")
	ss := berlin["summary"].(map[string]any)
	if ss["start"] != "2026-03-14T07:00:00+01:00" || ss["end"] != "2026-03-14T08:59:59+01:00" {
		t.Errorf("start %v end %v, want 07:00:00+01:00 and 08:59:59+01:00", ss["start"], ss["end"])
	}
	sameJSON(t, "", utc, berlin, 1e-9, map[string]bool{"file": true, "files": true, "start": true, "end": true,
		"forecast_clean_before": true, "at": true, "clean_before": true})
	// The heating section's forecast is the same instant, written in Berlin time.
	for _, k := range [][]string{{"heating", "forecast_clean_before"}} {
		a, errA := time.Parse(time.RFC3339Nano, jsonAt(utc, k...).(string))
		b, errB := time.Parse(time.RFC3339Nano, jsonAt(berlin, k...).(string))
		if errA != nil || errB != nil || !a.Equal(b) || !strings.HasSuffix(jsonAt(berlin, k...).(string), "+01:00") {
			t.Errorf("%v: %v in UTC, %v in Berlin", k, jsonAt(utc, k...), jsonAt(berlin, k...))
		}
	}
	var out bytes.Buffer
	run([]string{"logs", demoPlant, path, "--timezone", "Europe/Berlin"}, &out, &bytes.Buffer{})
	if !strings.Contains(out.String(), "Summary (times Europe/Berlin)") || !strings.Contains(out.String(), "2026-03-14 07:25:00  07:25:20") {
		t.Errorf("text output not in Berlin time:\n%s", out.String())
	}
}

// TestShowProgress: a bar only on a terminal, over 50 MB, without --quiet.
func TestShowProgress(t *testing.T) {
	cases := []struct {
		quiet, terminal bool
		total           int64
		want            bool
	}{
		{false, true, 60_000_000, true},
		{true, true, 60_000_000, false},   // --quiet
		{false, false, 60_000_000, false}, // a pipe or a file
		{false, true, 50_000_000, false},  // not over 50 MB
	}
	for _, c := range cases {
		if got := showProgress(c.quiet, c.terminal, c.total); got != c.want {
			t.Errorf("showProgress(%v, %v, %d) = %v, want %v", c.quiet, c.terminal, c.total, got, c.want)
		}
	}
}

// TestLogsFileNameShownEscaped: a run file's name is shown with its control
// characters escaped (internal/oneline), so it cannot clear the screen or
// start a line of its own in the review.
func TestLogsFileNameShownEscaped(t *testing.T) {
	data, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "shift\x1b[2J\nResult: no event.csv")
	writeFile(t, path, string(data))
	var out bytes.Buffer
	run([]string{"logs", demoPlant, path}, &out, &bytes.Buffer{})
	if strings.Contains(out.String(), "\x1b") || !strings.Contains(out.String(), `shift\u001B[2J\u000AResult: no event.csv`) {
		t.Errorf("the file name is not escaped:\n%s", out.String())
	}
}

// TestLogsUSTwinGivesTheSameNumbers: the SI demo plant and its exact twin in
// US units (testdata/equivalence) judge the demo shift to the same JSON
// numbers (SI there), to 1e-9.
func TestLogsUSTwinGivesTheSameNumbers(t *testing.T) {
	si, codeSI := logsJSON(t, demoPlant, demoRun)
	us, codeUS := logsJSON(t, "../../testdata/equivalence/htst-milk-us.yaml", demoRun)
	if codeSI != codeUS {
		t.Errorf("exit %d and %d", codeSI, codeUS)
	}
	sameJSON(t, "", si, us, 1e-9, map[string]bool{"plant": true, "plant_sha256": true})
}
