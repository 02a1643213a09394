package runs_test

// Expected values are computed in the test from the definitions of docs/METHOD.md §13
// (one file against several, and against the engine fed directly).

import (
	"bytes"
	"compress/gzip"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	gen "pasval/internal/rungen"
	"pasval/internal/runlog"
	"pasval/runs"
)

// demoRun is the committed demo shift for the SI demo plant.
var demoRun = filepath.Join("..", "testdata", "demo", "runs", "htst-milk-si-shift.csv")

// review reads one file and analyses it, as the command layer does: a mass
// flow is turned into a volumetric one with the model's density; the engine
// starts at the first record, when the reader's origin of clock times is
// known, so that results are in Unix seconds.
func review(r *runlog.Reader, m runs.Model, opt runs.Options) (runs.Result, error) {
	var e *runs.Engine
	mass := r.FlowIsMass()
	for r.Next() {
		if e == nil {
			var err error
			opt.Origin = float64(r.Origin())
			if e, err = runs.NewEngine(m, opt); err != nil {
				return runs.Result{}, err
			}
		}
		rec := r.Record()
		q := rec.Flow
		if mass {
			q /= m.Density
		}
		if err := e.Add(runs.Sample{Time: rec.Time, Temperature: rec.Temperature, Flow: q, Forward: rec.Forward}); err != nil {
			return runs.Result{}, err
		}
	}
	if err := r.Err(); err != nil {
		return runs.Result{}, err
	}
	if e == nil { // not reached: a file without rows is an error
		return runs.Result{}, fmt.Errorf("%s: no records", r.Name())
	}
	return e.Finish(), nil
}

func reviewText(t *testing.T, text []byte, ropt runlog.Options, m runs.Model) runs.Result {
	t.Helper()
	r, err := runlog.NewReader(bytes.NewReader(text), "run.csv", ropt)
	if err != nil {
		t.Fatal(err)
	}
	res, err := review(r, m, runs.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestDemoRun reads the committed demo shift (noise included): the scripted
// deviations, and only they, come out, with their verdicts.
func TestDemoRun(t *testing.T) {
	m := demoModel(t)
	rs, errs := runlog.Each([]string{demoRun}, runlog.Options{}, 0, func(r *runlog.Reader) (runs.Result, error) {
		return review(r, m, runs.Options{})
	})
	if errs[0] != nil {
		t.Fatal(errs[0])
	}
	res := rs[0]
	t0 := float64(gen.Start.Unix())
	want := []struct {
		kind    runs.EventKind
		start   float64 // s from the shift's start
		verdict runs.Verdict
	}{
		{runs.KindTemperature, gen.SmallDip, runs.LimitsMet},
		{runs.KindTemperature, gen.Upset + 1, runs.ProductAtRisk},
		{runs.KindFlow, gen.ShortSurge, runs.LimitsMet},
		{runs.KindFlow, gen.LongSurge, runs.ProductAtRisk},
		{runs.KindLethality, gen.LongSurge + gen.LongSurgeLength, runs.ProductAtRisk},
		{runs.KindGap, gen.Gap, runs.NoRecord},
		{runs.KindTemperatureFlow, gen.Combined, runs.LimitsMet},
	}
	if len(res.Events) != len(want) {
		for _, e := range res.Events {
			t.Logf("%s at %+.0f s: %s", e.Kind, e.Start-t0, e.Verdict)
		}
		t.Fatalf("%d events, want %d", len(res.Events), len(want))
	}
	for i, w := range want {
		e := res.Events[i]
		if e.Kind != w.kind || e.Verdict != w.verdict || !near(e.Start-t0, w.start, 1e-9) {
			t.Errorf("event %d: %s at %+.0f s, %s; want %s at %+.0f s, %s", i, e.Kind, e.Start-t0, e.Verdict, w.kind, w.start, w.verdict)
		}
	}
	if res.Summary.Rows != gen.ShiftRows || res.Summary.Gaps != 1 || !near(res.Summary.MedianInterval, 1, 1e-9) {
		t.Errorf("summary %+v", res.Summary)
	}
}

// TestSameRunOtherForms writes the demo shift in °F and gpm, with ';' and
// decimal commas, gzip-compressed, with renamed columns and with a mass flow,
// and checks that every form gives the same result.
func TestSameRunOtherForms(t *testing.T) {
	m := demoModel(t)
	plain, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	want := reviewText(t, plain, runlog.Options{}, m)

	// rewrite maps each data row's fields through f and puts header first.
	rewrite := func(header string, sep string, f func(ts string, tc, qlh float64, fwd string) []string) []byte {
		var b bytes.Buffer
		b.WriteString(header + "\n")
		for _, line := range strings.Split(strings.TrimSpace(string(plain)), "\n")[1:] {
			p := strings.Split(line, ",")
			tc, _ := strconv.ParseFloat(p[1], 64)
			q, _ := strconv.ParseFloat(p[2], 64)
			b.WriteString(strings.Join(f(p[0], tc, q, p[3]), sep) + "\n")
		}
		return b.Bytes()
	}
	ff := func(v float64, prec int) string { return strconv.FormatFloat(v, 'f', prec, 64) }
	comma := func(s string) string { return strings.ReplaceAll(s, ".", ",") }
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write(plain)
	zw.Close()

	cases := []struct {
		name string
		text []byte
		opt  runlog.Options
	}{
		// T·9/5 + 32 is exact in decimal at 0.01 °C → 0.018 °F; 1 gpm =
		// 3.785411784 L/min (NIST SP 811), 12 decimals keep the flow to 1e-13.
		{"°F and gpm", rewrite("time,hold_outlet_temperature [°F],flow_rate [gpm],forward", ",", func(ts string, tc, q float64, fwd string) []string {
			return []string{ts, ff(tc*9/5+32, 4), ff(q/60/3.785411784, 12), fwd}
		}), runlog.Options{}},
		{"';' and decimal commas", rewrite("time;hold_outlet_temperature [°C];flow_rate [L/h];forward", ";", func(ts string, tc, q float64, fwd string) []string {
			return []string{ts, comma(ff(tc, 2)), comma(ff(q, 1)), fwd}
		}), runlog.Options{DecimalComma: true}},
		{"gzip-compressed", gz.Bytes(), runlog.Options{}},
		{"renamed columns, units by option, words for the flag", rewrite("Timestamp\tTT-301\tFT-101\tFDV", "\t", func(ts string, tc, q float64, fwd string) []string {
			return []string{strings.Replace(ts, "T", " ", 1), ff(tc, 2), ff(q/1000, 4), map[string]string{"1": "Forward", "0": "Divert"}[fwd]}
		}), runlog.Options{Columns: map[string]string{runlog.KeyTime: "timestamp", runlog.KeyTemperature: "TT-301", runlog.KeyFlow: "FT-101", runlog.KeyForward: "FDV"},
			TemperatureUnit: "°C", FlowUnit: "m3/h"}},
		// Mass flow at the model's density, 1031 kg/m³: 1 L/h = 1.031 kg/h.
		{"mass flow", rewrite("time,hold_outlet_temperature [K],flow_rate [kg/h],forward", ",", func(ts string, tc, q float64, fwd string) []string {
			return []string{ts, ff(tc+273.15, 2), ff(q*1.031, 4), fwd}
		}), runlog.Options{}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := reviewText(t, c.text, c.opt, m)
			sameResult(t, got, want, 1e-9)
		})
	}
}

// sameResult compares two results to a relative tolerance.
func sameResult(t *testing.T, got, want runs.Result, tol float64) {
	t.Helper()
	g, w := got.Summary, want.Summary
	if g.Rows != w.Rows || g.Gaps != w.Gaps || g.ForwardSamples != w.ForwardSamples {
		t.Errorf("summary counts %d/%d/%d, want %d/%d/%d", g.Rows, g.Gaps, g.ForwardSamples, w.Rows, w.Gaps, w.ForwardSamples)
	}
	for _, c := range []struct {
		name string
		g, w float64
	}{
		{"start", g.Start, w.Start}, {"end", g.End, w.End}, {"forward", g.Forward, w.Forward}, {"diverted", g.Diverted, w.Diverted},
		{"forward volume", g.ForwardVolume, w.ForwardVolume}, {"min forward temperature", g.MinForwardTemperature, w.MinForwardTemperature},
		{"max forward flow", g.MaxForwardFlow, w.MaxForwardFlow}, {"min forward residence", g.MinForwardResidence, w.MinForwardResidence},
		{"min forward LR", g.MinForwardLogReduction[1], w.MinForwardLogReduction[1]},
	} {
		checkNear(t, "summary "+c.name, c.g, c.w, tol)
	}
	if len(got.Events) != len(want.Events) {
		t.Fatalf("%d events, want %d", len(got.Events), len(want.Events))
	}
	for i := range want.Events {
		ge, we := got.Events[i], want.Events[i]
		if ge.Kind != we.Kind || ge.Verdict != we.Verdict || ge.LegalRowMet != we.LegalRowMet || ge.First != we.First || ge.Last != we.Last {
			t.Errorf("event %d: %s %s %v %d–%d, want %s %s %v %d–%d", i, ge.Kind, ge.Verdict, ge.LegalRowMet, ge.First, ge.Last, we.Kind, we.Verdict, we.LegalRowMet, we.First, we.Last)
		}
		for _, c := range []struct {
			name string
			g, w float64
		}{
			{"start", ge.Start, we.Start}, {"duration", ge.Duration, we.Duration}, {"volume", ge.Volume, we.Volume},
			{"min temperature", ge.MinTemperature, we.MinTemperature}, {"max flow", ge.MaxFlow, we.MaxFlow},
			{"min residence", ge.MinResidence, we.MinResidence}, {"min LR", ge.MinLogReduction[1], we.MinLogReduction[1]},
			{"at risk", ge.AtRiskVolume, we.AtRiskVolume},
		} {
			checkNear(t, fmt.Sprintf("event %d %s", i, c.name), c.g, c.w, tol)
		}
	}
}

// TestMergeSummaries merges two runs' summaries.
func TestMergeSummaries(t *testing.T) {
	m := demoModel(t)
	m.SensorAccuracy = 0.25 // the demo plant's
	shift := scriptedShift()
	a := analyse(t, m, runs.Options{}, shift[:3000]).Summary
	b := analyse(t, m, runs.Options{}, shift[3000:]).Summary
	all := runs.MergeSummaries([]runs.Summary{a, b})
	// Expected from the parts by their definitions (sums, minima, span).
	checkNear(t, "forward", all.Forward, a.Forward+b.Forward, 1e-12)
	checkNear(t, "start", all.Start, a.Start, 0)
	checkNear(t, "end", all.End, b.End, 0)
	checkNear(t, "min forward temperature", all.MinForwardTemperature, math.Min(a.MinForwardTemperature, b.MinForwardTemperature), 0)
	checkNear(t, "max forward flow", all.MaxForwardFlow, math.Max(a.MaxForwardFlow, b.MaxForwardFlow), 0)
	if all.Rows != a.Rows+b.Rows || all.Gaps != a.Gaps+b.Gaps || all.SamplesShort != a.SamplesShort+b.SamplesShort ||
		all.SamplesShortAtSensorLow != a.SamplesShortAtSensorLow+b.SamplesShortAtSensorLow || all.SamplesShortAtSensorLow == 0 {
		t.Errorf("rows %d gaps %d short %d, at the low reading %d", all.Rows, all.Gaps, all.SamplesShort, all.SamplesShortAtSensorLow)
	}
	for k := range all.MinForwardLogReductionAtSensorLow {
		checkNear(t, "min LR at the low reading", all.MinForwardLogReductionAtSensorLow[k],
			math.Min(a.MinForwardLogReductionAtSensorLow[k], b.MinForwardLogReductionAtSensorLow[k]), 0)
	}
	none := analyse(t, m, runs.Options{}, []runs.Sample{{Time: 0, Temperature: 60, Flow: 0.002}}).Summary
	if !math.IsNaN(none.MinForwardTemperature) {
		t.Errorf("a run without forward flow: min forward temperature %g, want NaN", none.MinForwardTemperature)
	}
	if got := runs.MergeSummaries([]runs.Summary{none, a}); !near(got.MinForwardTemperature, a.MinForwardTemperature, 0) {
		t.Errorf("merge with a run without forward flow: %g, want %g", got.MinForwardTemperature, a.MinForwardTemperature)
	}
}
