package main

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"pasval/fouling"
	"pasval/internal/assess"
	"pasval/internal/plantfile"
)

// The heating section over a recorded run (docs/METHOD.md §17), end to end:
// runs written from the plant model with a known fouling, read back by
// 'pasval logs'.

// foulingPlant is the test plant whose heating section is rated from its
// plate pack; its heating fouling line is set by foulingPlantWith.
var foulingPlant = filepath.Join("..", "..", "testdata", "fouling", "heating-pack-si.yaml")

// foulingPlantWith is the test plant with the heating section's fouling set
// to rf (m²·K/W), parsed and validated.
func foulingPlantWith(t *testing.T, rf float64) *plantfile.Plant {
	t.Helper()
	src, err := os.ReadFile(foulingPlant)
	if err != nil {
		t.Fatal(err)
	}
	const marker = "  fouling: 0 m2*K/W                     # FOULING (set by the tests)"
	if !strings.Contains(string(src), marker) {
		t.Fatalf("%s has no heating fouling line to set", foulingPlant)
	}
	text := strings.Replace(string(src), marker, fmt.Sprintf("  fouling: %.17g m2*K/W", rf), 1)
	p, err := plantfile.Parse(foulingPlant, []byte(text))
	if err == nil {
		err = plantfile.Validate(p)
	}
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// checkRequiredInlet is the medium inlet the design check requires of the
// test plant's heating section with the fouling rf: the heating-medium
// check's required value (assess.Run, the check command's computation).
func checkRequiredInlet(t *testing.T, rf float64) float64 {
	t.Helper()
	res, err := assess.Run(foulingPlantWith(t, rf))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range res.Checks {
		if c.ID == assess.HeatingMedium {
			return c.Required
		}
	}
	t.Fatal("no heating-medium check")
	return 0
}

// checkReached is the time, h from the run's start, at which the fouling
// rf(t) brings the design check's required medium inlet to inlet: bisection
// on t with the check's own computation (the reference of the forecast).
func checkReached(t *testing.T, rf func(h float64) float64, inlet float64) float64 {
	t.Helper()
	lo, hi := 0.0, 48.0
	for hi-lo > 1e-5 { // 0.04 s
		mid := (lo + hi) / 2
		if checkRequiredInlet(t, rf(mid)) >= inlet {
			hi = mid
		} else {
			lo = mid
		}
	}
	return (lo + hi) / 2
}

// runStart is the synthetic runs' first sample.
var runStart = time.Date(2026, 4, 2, 5, 0, 0, 0, time.UTC)

// disturbance marks stretches of a synthetic run whose samples must be left
// out: diverted, or an unsteady flow; their heating readings are garbage,
// which would spoil the fit if they were used.
type disturbance struct {
	from, to int     // s from the start
	flow     float64 // L/h during it; 0: the normal rate
	diverted bool
}

// writeFoulingRun writes a run of the test plant: one sample a second for
// hours h, the heating section rated at each second with the fouling rf(t)
// on its clean U at the normal rate (fouling.Section.Rate, the design
// check's rating: TestRateWithPackIsTheLine), with sensor noise: σ 0.03 K
// on each temperature (then rounded to 0.01 K), 15 L/h on the product flow
// and 60 L/h on the medium flow.
func writeFoulingRun(t *testing.T, h float64, rf func(h float64) float64, dist []disturbance, seed uint64) string {
	t.Helper()
	sec, err := assess.HeatingSection(foulingPlantWith(t, 0))
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(seed, 17))
	var b strings.Builder
	b.WriteString("time,hold_outlet_temperature [°C],flow_rate [L/h],forward,heating_product_in [°C],heating_product_out [°C]," +
		"heating_medium_in [°C],heating_medium_out [°C],heating_medium_flow [L/h]\n")
	medium := sec.Spec.Flow.Volumetric * 3.6e6
	for s := range int(h * 3600) {
		r, err := sec.Rate(math.NaN(), rf(float64(s)/3600))
		if err != nil {
			t.Fatal(err)
		}
		flow, fwd, temps := 10000.0, "1", []float64{r.ProductIn, r.ProductOut, r.OtherIn, r.OtherOut}
		for _, d := range dist {
			if s >= d.from && s < d.to {
				if d.flow > 0 {
					flow = d.flow
				}
				if d.diverted {
					fwd = "0"
				}
				temps = []float64{60, 66, 90, 88} // what a section being cleaned or upset might read
			}
		}
		fmt.Fprintf(&b, "%s,73.00,%.1f,%s", runStart.Add(time.Duration(s)*time.Second).Format(time.RFC3339), flow+15*rng.NormFloat64(), fwd)
		for _, v := range temps {
			fmt.Fprintf(&b, ",%.2f", v+0.03*rng.NormFloat64())
		}
		fmt.Fprintf(&b, ",%.0f\n", medium+60*rng.NormFloat64())
	}
	path := filepath.Join(t.TempDir(), "fouling.csv")
	writeFile(t, path, b.String())
	return path
}

// heatingJSON runs logs --json on the test plant and returns its heating object.
func heatingJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	v, _ := logsJSON(t, append([]string{foulingPlant}, args...)...)
	h, ok := v["heating"].(map[string]any)
	if !ok {
		t.Fatalf("no heating section in %v", v)
	}
	return h
}

// jsonTime reads an RFC 3339 time of the JSON as hours from runStart.
func jsonTime(t *testing.T, v any) float64 {
	t.Helper()
	s, ok := v.(string)
	if !ok {
		t.Fatalf("%v is not a time", v)
	}
	at, err := time.Parse(time.RFC3339Nano, s)
	if err != nil {
		t.Fatal(err)
	}
	return at.Sub(runStart).Hours()
}

// jsonAt is the value under keys in nested JSON objects, nil when absent.
func jsonAt(m map[string]any, keys ...string) any {
	var v any = m
	for _, k := range keys {
		mm, ok := v.(map[string]any)
		if !ok {
			return nil
		}
		v = mm[k]
	}
	return v
}

// TestHeatingLinearFouling: a run from the plant model with a known linear
// fouling rate and sensor noise, with a diverted stretch and an unsteady
// minute whose heating readings are garbage. The linear fit recovers the
// rate within 3 %, and each limit's forecast lies within 10 minutes of the
// time at which the known fouling makes the design check's required medium
// inlet reach it.
func TestHeatingLinearFouling(t *testing.T) {
	rf := func(h float64) float64 { return 1e-5 + 6e-5*h } // m²·K/W, invented
	dist := []disturbance{
		{from: 2400, to: 2700, diverted: true}, // five diverted minutes: windows 40–44
		{from: 4230, to: 4260, flow: 10800},    // a 30 s step of 8 % inside the minute 4200–4260
	}
	run := writeFoulingRun(t, 2.5, rf, dist, 1)
	h := heatingJSON(t, run)
	skipped := jsonAt(h, "windows_skipped").(map[string]any)
	if h["windows"] != 150.0 || skipped["diverted"] != 5.0 || skipped["unsteady"] != 1.0 || h["windows_used"] != 144.0 {
		t.Errorf("windows %v, used %v, skipped %v; want 150, 144, 5 diverted and 1 unsteady", h["windows"], h["windows_used"], skipped)
	}
	rate := h["fouling_m2K_W_per_h"].(float64)
	t.Logf("fouling rate %.6g m²·K/W per h (%+.2f %%)", rate, (rate/6e-5-1)*100)
	if math.Abs(rate/6e-5-1) > 0.03 {
		t.Errorf("fouling rate %g m²·K/W per h, want 6e-5 within 3 %%", rate)
	}
	if h["fit"] != "linear" || h["u_clean_basis"] != "plate_pack" {
		t.Errorf("fit %v, U_clean %v; want linear, plate_pack", h["fit"], h["u_clean_basis"])
	}
	forecasts := h["forecasts"].([]any)
	if len(forecasts) != 2 {
		t.Fatalf("%d forecasts, want the medium inlet and the burn-on limit", len(forecasts))
	}
	// The plant's limits: the hottest water 79 °C; the burn-on limit 5.5 K
	// above the 72.80 °C the heating section must deliver (check's heater
	// outlet with the tube's heat loss) = 78.30 °C.
	for i, inlet := range []float64{79, 72.8 + 5.5} {
		fc := forecasts[i].(map[string]any)
		want := checkReached(t, rf, fc["medium_inlet_limit_C"].(float64))
		got := jsonTime(t, fc["at"])
		t.Logf("%v: forecast %.4f h, the check's %.4f h (%+.1f min), σ %.4f h", fc["limit"], got, want, (got-want)*60, fc["sigma_h"])
		if fc["state"] != "ahead" || math.Abs(got-want) > 10.0/60 || math.Abs(fc["medium_inlet_limit_C"].(float64)-inlet) > 0.01 {
			t.Errorf("%v: %v at %.3f h, want %.3f h within 10 min (limit %v °C, want %.2f)", fc["limit"], fc["state"], got, want,
				fc["medium_inlet_limit_C"], inlet)
		}
		if cb := jsonTime(t, fc["clean_before"]); !(cb < got) || math.Abs(got-cb-fouling.OneSidedZ*fc["sigma_h"].(float64)) > 1e-6 {
			t.Errorf("%v: clean before %.4f h, forecast %.4f h, σ %v h", fc["limit"], cb, got, fc["sigma_h"])
		}
	}
	// The burn-on limit comes first, and sets the time to clean.
	burn := forecasts[1].(map[string]any)
	if h["forecast_clean_before"] != burn["clean_before"] {
		t.Errorf("clean before %v, want the burn-on limit's %v", h["forecast_clean_before"], burn["clean_before"])
	}
}

// TestHeatingAsymptoticFouling: a fouling that levels off, R_f = a +
// R∞(1 − e^(−t/τ)); the asymptotic fit is chosen and recovers R∞ and τ within
// 3 %, and the forecast lies within 10 minutes of the check's reference.
func TestHeatingAsymptoticFouling(t *testing.T) {
	const a, rInf, tau = 1e-5, 3.5e-4, 1.5 // m²·K/W, m²·K/W, h; invented
	rf := func(h float64) float64 { return a + rInf*(1-math.Exp(-h/tau)) }
	h := heatingJSON(t, writeFoulingRun(t, 3, rf, nil, 2))
	fit := jsonAt(h, "fits", "asymptotic").(map[string]any)
	if h["fit"] != "asymptotic" || fit["determined"] != true {
		t.Fatalf("fit %v, asymptotic %v", h["fit"], fit)
	}
	if got := fit["r_inf_m2K_W"].(float64); math.Abs(got/rInf-1) > 0.03 {
		t.Errorf("R∞ %g, want %g within 3 %%", got, rInf)
	}
	if got := fit["tau_h"].(float64); math.Abs(got/tau-1) > 0.03 {
		t.Errorf("τ %g h, want %g within 3 %%", got, tau)
	}
	t.Logf("R∞ %.6g (%+.2f %%), τ %.4f h (%+.2f %%)", fit["r_inf_m2K_W"], (fit["r_inf_m2K_W"].(float64)/rInf-1)*100, fit["tau_h"],
		(fit["tau_h"].(float64)/tau-1)*100)
	fc := h["forecasts"].([]any)[0].(map[string]any)
	want := checkReached(t, rf, 79)
	got := jsonTime(t, fc["at"])
	t.Logf("forecast %.4f h, the check's %.4f h (%+.1f min), σ %.4f h", got, want, (got-want)*60, fc["sigma_h"])
	if fc["state"] != "ahead" || math.Abs(got-want) > 10.0/60 {
		t.Errorf("%v at %.3f h, want %.3f h within 10 min", fc["state"], got, want)
	}
}

// TestHeatingWithoutColumns: a run without the heating section's columns
// says nothing about it, in text or JSON.
func TestHeatingWithoutColumns(t *testing.T) {
	run := scriptedShiftCSV(t)
	out, _, _ := runBinary(t, "logs", demoPlant, run)
	if strings.Contains(out, "Heating section") || strings.Contains(out, "Forecast:") || strings.Contains(out, "fouling") || strings.Contains(out, "clean before") {
		t.Errorf("the text mentions the heating section:\n%s", out)
	}
	v, _ := logsJSON(t, demoPlant, run)
	if _, ok := v["heating"]; ok {
		t.Error("the JSON has a heating key")
	}
}

// TestHeatingAcrossRuns: two runs, the second after a cleaning, in date
// order whatever the order given: U at the start of each.
func TestHeatingAcrossRuns(t *testing.T) {
	dir := t.TempDir()
	first := writeFoulingRun(t, 1, func(h float64) float64 { return 2e-5 + 6e-5*h }, nil, 3)
	later := strings.ReplaceAll(readFile(t, writeFoulingRun(t, 1, func(h float64) float64 { return 1e-5 + 5e-5*h }, nil, 4)), "2026-04-02T", "2026-04-03T")
	writeFile(t, filepath.Join(dir, "a-later.csv"), later)
	writeFile(t, filepath.Join(dir, "b-first.csv"), readFile(t, first))
	h := heatingJSON(t, dir)
	runsOut := h["runs"].([]any)
	if len(runsOut) != 2 || !strings.HasSuffix(runsOut[0].(map[string]any)["file"].(string), "b-first.csv") {
		t.Fatalf("runs %v, want b-first.csv first (its samples are a day earlier)", runsOut)
	}
	if !strings.HasSuffix(h["file"].(string), "a-later.csv") {
		t.Errorf("the figures are of %v, want the latest run", h["file"])
	}
	// U at each start: the pack's clean U with 2e-5 and 1e-5 of fouling;
	// the later start, after the cleaning, is higher.
	u0, u1 := runsOut[0].(map[string]any)["u_start_W_m2K"].(float64), runsOut[1].(map[string]any)["u_start_W_m2K"].(float64)
	if !(u1 > u0) {
		t.Errorf("U at the starts %g then %g: the cleaning should show", u0, u1)
	}
	out, _, _ := runBinary(t, "logs", foulingPlant, dir)
	if !strings.Contains(out, "U at the start of each run, in date order (did cleaning restore it?)") || !strings.Contains(out, "b-first.csv") {
		t.Errorf("no table of the runs' starts:\n%s", out)
	}
}

func readFile(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestHeatingPlantWithoutHeating: heating columns against a plant without
// a heating section are refused, naming the plant file.
func TestHeatingPlantWithoutHeating(t *testing.T) {
	run := writeFoulingRun(t, 0.1, func(float64) float64 { return 0 }, nil, 5)
	plant := filepath.Join("..", "..", "testdata", "judging", "milk-heat-loss-si.yaml")
	out, errs, code := runBinary(t, "logs", plant, run)
	if code != exitInput || out != "" || !strings.Contains(errs, "milk-heat-loss-si.yaml:1:1: heating: ") ||
		!strings.Contains(errs, "describes no heating section") {
		t.Errorf("exit %d, stderr %q, stdout %q", code, errs, out)
	}
}

// TestHeatingAgainstReference compares the demo shift's heating section
// with an independent computation of docs/METHOD.md §17
// (testdata/reference/fouling_reference.py: water from Debian's
// python3-iapws, the plate pack by plate_pack.py, the fit by python3-numpy):
// the windows, U, U_clean, the linear fit and the medium-inlet forecast, to
// 1e-8 (times to a millisecond).
func TestHeatingAgainstReference(t *testing.T) {
	py := "/usr/bin/python3"
	if err := exec.Command(py, "-c", "import iapws, numpy").Run(); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("python3-iapws and python3-numpy are required in CI: %v", err)
		}
		t.Skip("python3-iapws or python3-numpy not installed (apt-get install python3-iapws python3-numpy)")
	}
	raw, err := exec.Command(py, "../../testdata/reference/fouling_reference.py", demoRun).Output()
	if err != nil {
		t.Fatal(err)
	}
	var ref map[string]any
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	v, _ := logsJSON(t, demoPlant, demoRun)
	h := v["heating"].(map[string]any)
	for _, key := range []string{"windows", "windows_used", "windows_skipped", "u_W_m2K", "u_clean_W_m2K", "fouling_m2K_W_per_h"} {
		sameJSON(t, key, ref[key], h[key], 1e-8, nil)
	}
	sameJSON(t, "fits.linear", ref["linear"], jsonAt(h, "fits", "linear"), 1e-8, nil)
	fc := h["forecasts"].([]any)[0].(map[string]any)
	sameJSON(t, "forecasts[0]", ref["forecast"], fc, 1e-8, nil)
	for _, k := range []string{"at", "clean_before"} {
		at, err := time.Parse(time.RFC3339Nano, fc[k].(string))
		if err != nil {
			t.Fatal(err)
		}
		if got, want := float64(at.UnixNano())/1e9, ref[k+"_s"].(float64); math.Abs(got-want) > 1e-3 {
			t.Errorf("%s %.3f s, reference %.3f s", k, got, want)
		}
	}
}

// TestHeatingColumnsAndWindow: the heating columns under the file's own
// names (--columns) read as under the default ones; --window sets the
// windows' width.
func TestHeatingColumnsAndWindow(t *testing.T) {
	text := readFile(t, demoRun)
	header, rest, _ := strings.Cut(text, "\n")
	for i, name := range []string{"heating_product_in", "heating_product_out", "heating_medium_in", "heating_medium_out"} {
		header = strings.Replace(header, name, fmt.Sprintf("TT-20%d", i+1), 1)
	}
	renamed := filepath.Join(t.TempDir(), "renamed.csv")
	writeFile(t, renamed, header+"\n"+rest)
	v, _ := logsJSON(t, demoPlant, renamed, "--columns",
		"heating_product_in=TT-201,heating_product_out=TT-202,heating_medium_in=TT-203,heating_medium_out=TT-204")
	w, _ := logsJSON(t, demoPlant, demoRun)
	if got, want := jsonAt(v, "heating", "fouling_m2K_W_per_h"), jsonAt(w, "heating", "fouling_m2K_W_per_h"); got == nil || got != want {
		t.Errorf("renamed columns: fouling %v, the demo's %v", got, want)
	}
	// Two hours in windows of 120 s: 60 windows (the run's 06:00:00–07:59:59).
	x, _ := logsJSON(t, demoPlant, demoRun, "--window", "120")
	if jsonAt(x, "heating", "window_s") != 120.0 || jsonAt(x, "heating", "windows") != 60.0 {
		t.Errorf("--window 120: width %v s, %v windows; want 120 s, 60", jsonAt(x, "heating", "window_s"), jsonAt(x, "heating", "windows"))
	}
}
