package runs_test

import (
	"errors"
	"fmt"
	"math"
	"testing"
	"time"

	gen "pasval/internal/rungen"
	"pasval/lethality"
	"pasval/runs"
)

// lh is one litre per hour in m³/s.
const lh = 1e-3 / 3600

// demoModel is the SI demo plant, testdata/demo/htst-milk-si.yaml: a 2 in
// sanitary tube (0.065 in wall), 34 m; milk of 1031 kg/m³ and 0.72 mPa·s at
// the 72.5 °C setpoint; sealed maximum 11 000 L/h; the plant file's
// organisms and legal rows (PMO continuous-flow rows).
func demoModel(t testing.TB) runs.Model {
	t.Helper()
	// 2 in sanitary tube: OD 2 in, wall 0.065 in (docs/METHOD.md §7.1, from memory).
	const outer, wall = 2 * 0.0254, 0.065 * 0.0254
	return runs.Model{
		Tube:     lethality.Tube{InnerDiameter: outer - 2*wall, OuterDiameter: outer, Length: 34, Rise: 0.8},
		Rheology: lethality.Newtonian{Viscosity: 0.72e-3},
		Density:  1031,
		Organisms: []lethality.Organism{
			{Name: "M. paratuberculosis", D: 11.67, DTemperature: 71, Z: 7.11},
			{Name: "Listeria monocytogenes", D: 0.9, DTemperature: 71.7, Z: 6.3, RequiredLogReduction: 5},
		},
		Legal:    []lethality.LegalRow{{Temperature: 72, Time: 15}, {Temperature: 89, Time: 1}, {Temperature: 90, Time: 0.5}},
		Setpoint: 72.5,
		MaxFlow:  11000 * lh,
	}
}

// uMax is the fastest particle's speed at flow q (L/h), from package
// lethality's tube model (the model the engine must use).
func uMax(m runs.Model, q float64) float64 {
	h := m.Tube.Hydraulics(lethality.Flow{Volumetric: q * lh, Density: m.Density}, m.Rheology, m.FastestToMean)
	return h.FastestToMean * h.MeanVelocity
}

// scriptedShift is the demo shift's script without noise: one-second
// samples, the recording gap left out.
func scriptedShift() []runs.Sample {
	var s []runs.Sample
	for sec := range gen.ShiftLength {
		temp, flow, fwd, skip := gen.Script(sec)
		if skip {
			continue
		}
		s = append(s, runs.Sample{Time: float64(sec), Temperature: temp, Flow: flow * lh, Forward: fwd})
	}
	return s
}

func analyse(t testing.TB, m runs.Model, opt runs.Options, samples []runs.Sample) runs.Result {
	t.Helper()
	e, err := runs.NewEngine(m, opt)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range samples {
		if err := e.Add(s); err != nil {
			t.Fatal(err)
		}
	}
	return e.Finish()
}

func near(got, want, tol float64) bool {
	if math.IsInf(want, 0) || math.IsNaN(want) {
		return got == want || (math.IsNaN(got) && math.IsNaN(want))
	}
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

func checkNear(t *testing.T, name string, got, want, tol float64) {
	t.Helper()
	if !near(got, want, tol) {
		t.Errorf("%s = %.12g, want %.12g (tolerance %g)", name, got, want, tol)
	}
}

// TestTubeSpeeds checks the demo tube's steady residences against a hand
// calculation, so the scenario below rests on known numbers.
func TestTubeSpeeds(t *testing.T) {
	m := demoModel(t)
	cases := []struct {
		name       string
		flowLh     float64
		residence  float64 // s
		tol        float64
		sourceNote string
	}{
		// Hand calculation: D = 2 in − 2 × 0.065 in = 0.047498 m, A = 1.77190e-3 m²;
		// 10 000 L/h → v = 1.56766 m/s, Re = 1031·1.56766·0.047498/0.72e-3 = 106 623;
		// n_p = 0.790 ln Re − 1.64 = 7.5061, ratio = (n_p+1)(2n_p+1)/(2n_p²) = 1.20870;
		// t = 34/(1.20870·1.56766) = 17.944 s.
		{"normal rate", 10000, 17.944, 2e-4, "hand calculation"},
		// 12 800 L/h: v = 2.00661, Re = 136 478, n_p = 7.7011, ratio = 1.20337, t = 14.080 s.
		{"long surge", 12800, 14.080, 2e-4, "hand calculation"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			checkNear(t, "residence", m.Tube.Length/uMax(m, c.flowLh), c.residence, c.tol)
		})
	}
}

// TestScriptedShift runs the demo shift's script without noise and checks
// every event, drop and summary figure against values computed here from
// the definitions (docs/METHOD.md §13 (recorded runs)).
func TestScriptedShift(t *testing.T) {
	m := demoModel(t)
	res := analyse(t, m, runs.Options{}, scriptedShift())
	L := m.Tube.Length
	un, us, ul, uc := uMax(m, gen.NormalFlow), uMax(m, gen.ShortSurgeFlow), uMax(m, gen.LongSurgeFlow), uMax(m, gen.CombinedFlow)
	qn, qs, ql, qc := gen.NormalFlow*lh, gen.ShortSurgeFlow*lh, gen.LongSurgeFlow*lh, gen.CombinedFlow*lh
	listeria, map_ := m.Organisms[1], m.Organisms[0]
	lr := func(o lethality.Organism, res, temp float64) float64 { return res / o.DAt(temp) }
	steady := L / un

	// Short surge (8 s): the parcel leaving at 4500+k went k s at the surge
	// speed and the rest of the tube at the normal speed: residence
	// k + (L − k·u_s)/u_n, least at k = 7.
	shortMin := 7 + (L-7*us)/un
	// Long surge (45 s): parcel at 5700+k: k + (L − k·u_l)/u_n while k·u_l < L,
	// else L/u_l. After it, parcel at 5745+j: j + (L − j·u_n)/u_l while
	// j·u_n < L. A parcel fails when its residence is under the 15 s row
	// (at 73 °C no hotter row applies and Listeria's 5 logs are met:
	// 14.08 s / D(73 °C) = 14.08/0.558 = 25).
	longRes := func(k int) float64 {
		if float64(k)*ul >= L {
			return L / ul
		}
		return float64(k) + (L-float64(k)*ul)/un
	}
	afterRes := func(j int) float64 { return float64(j) + (L-float64(j)*un)/ul }
	longAtRisk, trailing := 0.0, 0
	for k := range gen.LongSurgeLength {
		if longRes(k) < 15 {
			longAtRisk += ql
		}
	}
	for j := 0; afterRes(j) < 15; j++ {
		trailing++
	}
	if trailing == 0 {
		t.Fatal("the long surge should leave under-held product behind it")
	}
	// The trailing parcels form their own lethality event; its worst parcel
	// is the first after the surge, which crossed the whole tube in it.
	trailingMin := afterRes(0)
	combinedMin := 7 + (L-7*uc)/un

	two := 2.0
	type want struct {
		kind                 runs.EventKind
		first, last          float64 // sample times, s
		duration, volume     float64
		minT, maxQ           float64
		minRes               float64
		minLRListeria, minLR float64 // Listeria, M. paratuberculosis
		legal                bool
		verdict              runs.Verdict
		atRisk               float64
		divertAfter          *float64
	}
	wants := []want{
		{runs.KindTemperature, gen.SmallDip, gen.SmallDip + gen.SmallDipLength - 1, gen.SmallDipLength, gen.SmallDipLength * qn,
			72.30, qn, steady, lr(listeria, steady, 72.30), lr(map_, steady, 72.30), true, runs.LimitsMet, 0, nil},
		// Upset: 72.4 °C (meets the 72 °C row) then 71.9 °C (below every
		// row: at risk), diverted at the third sample: 2 s after the first
		// sample below the setpoint.
		{runs.KindTemperature, gen.Upset + 1, gen.Upset + 2, 2, 2 * qn,
			71.9, qn, steady, lr(listeria, steady, 71.9), lr(map_, steady, 71.9), false, runs.ProductAtRisk, qn, &two},
		{runs.KindFlow, gen.ShortSurge, gen.ShortSurge + gen.ShortSurgeLength - 1, gen.ShortSurgeLength, gen.ShortSurgeLength * qs,
			73, qs, shortMin, lr(listeria, shortMin, 73), lr(map_, shortMin, 73), true, runs.LimitsMet, 0, nil},
		{runs.KindFlow, gen.LongSurge, gen.LongSurge + gen.LongSurgeLength - 1, gen.LongSurgeLength, gen.LongSurgeLength * ql,
			73, ql, L / ul, lr(listeria, L/ul, 73), lr(map_, L/ul, 73), false, runs.ProductAtRisk, longAtRisk, nil},
		// Within both limits again, but the parcels leaving just after the
		// surge went through the tube during it.
		{runs.KindLethality, gen.LongSurge + gen.LongSurgeLength, gen.LongSurge + gen.LongSurgeLength + float64(trailing) - 1, float64(trailing), float64(trailing) * qn,
			73, qn, trailingMin, lr(listeria, trailingMin, 73), lr(map_, trailingMin, 73), false, runs.ProductAtRisk, float64(trailing) * qn, nil},
		{runs.KindGap, gen.Gap, gen.Gap, gen.GapLength, gen.GapLength * qn,
			73, qn, steady, lr(listeria, steady, 73), lr(map_, steady, 73), false, runs.NoRecord, gen.GapLength * qn, nil},
		{runs.KindTemperatureFlow, gen.Combined, gen.Combined + gen.CombinedLength - 1, gen.CombinedLength, gen.CombinedLength * qc,
			72.42, qc, combinedMin, lr(listeria, combinedMin, 72.42), lr(map_, combinedMin, 72.42), true, runs.LimitsMet, 0, nil},
	}
	if len(res.Events) != len(wants) {
		for _, e := range res.Events {
			t.Logf("event %s %g–%g", e.Kind, e.Start, e.End)
		}
		t.Fatalf("%d events, want %d (the diverted start-up and shutdown drops are no events)", len(res.Events), len(wants))
	}
	const tol = 1e-9
	for i, w := range wants {
		e := res.Events[i]
		t.Run(string(w.kind)+"@"+formatSec(w.first), func(t *testing.T) {
			if e.Kind != w.kind || e.Verdict != w.verdict || e.LegalRowMet != w.legal {
				t.Errorf("kind %q verdict %q legal %v, want %q %q %v", e.Kind, e.Verdict, e.LegalRowMet, w.kind, w.verdict, w.legal)
			}
			checkNear(t, "start", e.Start, w.first, tol)
			checkNear(t, "end", e.End, w.first+w.duration, tol)
			checkNear(t, "duration", e.Duration, w.duration, tol)
			checkNear(t, "volume", e.Volume, w.volume, tol)
			checkNear(t, "min temperature", e.MinTemperature, w.minT, tol)
			checkNear(t, "max flow", e.MaxFlow, w.maxQ, tol)
			checkNear(t, "min residence", e.MinResidence, w.minRes, tol)
			checkNear(t, "min log reduction (Listeria)", e.MinLogReduction[1], w.minLRListeria, tol)
			checkNear(t, "min log reduction (MAP)", e.MinLogReduction[0], w.minLR, tol)
			checkNear(t, "at-risk volume", e.AtRiskVolume, w.atRisk, tol)
			switch {
			case (e.DivertAfter == nil) != (w.divertAfter == nil):
				t.Errorf("divert after %v, want %v", e.DivertAfter, w.divertAfter)
			case e.DivertAfter != nil:
				checkNear(t, "divert after", *e.DivertAfter, *w.divertAfter, tol)
			}
		})
	}

	// A surge shorter than the residence: judged per parcel it meets the
	// 15 s row; the per-sample estimate, L/(r·v) at the surge flow, does not.
	short := res.Events[2]
	checkNear(t, "short surge per-sample residence", short.MinSampleResidence, L/us, tol)
	if !(short.MinSampleResidence < 15 && short.MinResidence >= 15) {
		t.Errorf("short surge: per-sample %.3f s, per-parcel %.3f s; want the first under 15 s and the second not", short.MinSampleResidence, short.MinResidence)
	}
	// A surge longer than the residence: both agree on its worst parcel.
	checkNear(t, "long surge per-sample residence", res.Events[3].MinSampleResidence, res.Events[3].MinResidence, tol)

	// Drops: start-up (diverted throughout: divert after 0), the small dip
	// (recovered forward: nil), the upset (2 s), the combined event (nil),
	// shutdown (diverted, never recovered).
	// Start-up: 66 + 7·s/200 < 72.5 until s = 185; shutdown: 73 − 13·(s − 7080)/120
	// < 72.5 from s = 7085; upset back to 72.56 °C at +76.
	zero := 0.0
	drops := []struct {
		start, end          float64
		recovered, fwdBelow bool
		divertAfter         *float64
		minT                float64
	}{
		{0, 186, true, false, &zero, 66},
		{gen.SmallDip, gen.SmallDip + gen.SmallDipLength, true, true, nil, 72.3},
		{gen.Upset + 1, gen.Upset + 76, true, true, &two, 70.8},
		{gen.Combined, gen.Combined + gen.CombinedLength, true, true, nil, 72.42},
		{7085, 7199, false, false, &zero, 73.0 - 13.0*119/120},
	}
	if len(res.Drops) != len(drops) {
		t.Fatalf("%d drops, want %d", len(res.Drops), len(drops))
	}
	for i, w := range drops {
		d := res.Drops[i]
		checkNear(t, "drop start", d.Start, w.start, tol)
		checkNear(t, "drop end", d.End, w.end, tol)
		checkNear(t, "drop min temperature", d.MinTemperature, w.minT, tol)
		if d.Recovered != w.recovered || d.ForwardBelow != w.fwdBelow || (d.DivertAfter == nil) != (w.divertAfter == nil) ||
			(d.DivertAfter != nil && !near(*d.DivertAfter, *w.divertAfter, tol)) {
			t.Errorf("drop %d: recovered %v forward below %v divert after %v; want %v %v %v", i, d.Recovered, d.ForwardBelow, d.DivertAfter, w.recovered, w.fwdBelow, w.divertAfter)
		}
	}

	// Summary. Forward from 240 s to 7080 s except the upset's diverted
	// 92 s (3003–3095); the gap's 40 s count forward. The last sample
	// (7199 s) has no duration.
	s := res.Summary
	forward := float64(gen.Shutdown-gen.StartupEnd) - 92
	fwdVol := (forward-gen.ShortSurgeLength-gen.LongSurgeLength-gen.CombinedLength)*qn +
		gen.ShortSurgeLength*qs + gen.LongSurgeLength*ql + gen.CombinedLength*qc
	if s.Rows != gen.ShiftRows || s.Gaps != 1 {
		t.Errorf("rows %d gaps %d, want %d and 1", s.Rows, s.Gaps, gen.ShiftRows)
	}
	checkNear(t, "start", s.Start, 0, tol)
	checkNear(t, "end", s.End, gen.ShiftLength-1, tol)
	checkNear(t, "forward time", s.Forward, forward, tol)
	checkNear(t, "diverted time", s.Diverted, gen.ShiftLength-1-forward, tol)
	checkNear(t, "forward volume", s.ForwardVolume, fwdVol, tol)
	checkNear(t, "min forward temperature", s.MinForwardTemperature, 71.9, tol)
	checkNear(t, "max forward flow", s.MaxForwardFlow, ql, tol)
	checkNear(t, "min forward residence", s.MinForwardResidence, L/ul, tol)
	checkNear(t, "min forward LR (Listeria)", s.MinForwardLogReduction[1],
		math.Min(lr(listeria, steady, 71.9), lr(listeria, L/ul, 73)), tol)
	checkNear(t, "median interval", s.MedianInterval, 1, tol)
	checkNear(t, "gap threshold", s.GapThreshold, runs.GapFactor, tol)
}

func formatSec(s float64) string { return fmt.Sprintf("%.0fs", s) }

// TestParcelHistory checks per-parcel residences in small hand-worked runs.
func TestParcelHistory(t *testing.T) {
	// A model with a fixed fastest-to-mean ratio of 2 and a tube of 1 m²
	// cross-section and 10 m length makes the speeds round: u = 2·Q.
	m := runs.Model{
		Tube:          lethality.Tube{InnerDiameter: math.Sqrt(4 / math.Pi), Length: 10},
		Rheology:      lethality.Newtonian{Viscosity: 1e-3},
		Density:       1000,
		FastestToMean: 2,
		Legal:         []lethality.LegalRow{{Temperature: 70, Time: 4}},
		Setpoint:      70,
		MaxFlow:       1.5,
	}
	// Speeds: Q = 0.5 m³/s → u = 1 m/s; Q = 2 m³/s (over the 1.5 maximum)
	// → u = 4 m/s; held before the first sample at 1 m/s.
	cases := []struct {
		name     string
		samples  []runs.Sample
		minRes   float64 // least per-parcel residence over the event, s
		sample   float64 // least per-sample estimate L/u, s
		duration float64 // s
		atRisk   float64 // m³
		kind     runs.EventKind
		verdict  runs.Verdict
	}{
		{
			// Hand calculation: the only deviating sample is the surge at
			// t = 10; the parcel leaving then filled the tube before it:
			// 10 m at 1 m/s = 10 s. The parcel at t = 11 went 4 m in the
			// surge and 6 m before it: 1 + 6 = 7 s ≥ 4 s, no deviation. The
			// per-sample estimate at the surge says 10/4 = 2.5 s.
			name:    "surge shorter than the residence",
			samples: []runs.Sample{{0, 80, 0.5, true}, {10, 80, 2, true}, {11, 80, 0.5, true}, {30, 80, 0.5, true}},
			minRes:  10, sample: 2.5, duration: 1, atRisk: 0, kind: runs.KindFlow, verdict: runs.LimitsMet,
		},
		{
			// Hand calculation, surge from t = 10 to 14 at 4 m/s
			// (X = distance since t = 0; τ₀ where X = X(t) − 10 m):
			// t = 12: X = 18, τ₀ = 8 → 4 s (meets the 4 s row);
			// t = 13: X = 22, τ₀ = 10 + 2/4 → 2.5 s (fails);
			// t = 14: back to 0.5 m³/s but X = 26, τ₀ = 10 + 6/4 → 2.5 s:
			// under-held product leaving after the surge, within both
			// limits: a lethality event of its own (below), so the flow
			// event spans its four samples, 4 s.
			// At risk in the flow event: sample 13 (2 m³/s × 1 s) = 2 m³.
			name:    "surge longer than the residence",
			samples: []runs.Sample{{0, 80, 0.5, true}, {10, 80, 2, true}, {11, 80, 2, true}, {12, 80, 2, true}, {13, 80, 2, true}, {14, 80, 0.5, true}, {100, 80, 0.5, true}},
			minRes:  2.5, sample: 2.5, duration: 4, atRisk: 2, kind: runs.KindFlow, verdict: runs.ProductAtRisk,
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			res := analyse(t, m, runs.Options{GapThreshold: 1000}, c.samples)
			if c.kind == runs.KindFlow && c.verdict == runs.ProductAtRisk {
				// The trailing parcel at t = 14 (2.5 s, held 86 s until
				// t = 100, whose parcel has 10 s again): 0.5 × 86 = 43 m³.
				if len(res.Events) != 2 {
					t.Fatalf("%d events, want the flow event and a lethality event", len(res.Events))
				}
				l := res.Events[1]
				if l.Kind != runs.KindLethality || l.Verdict != runs.ProductAtRisk || l.First != 5 || l.Last != 5 {
					t.Errorf("trailing event %s %s samples %d–%d, want lethality, product at risk, 5–5", l.Kind, l.Verdict, l.First, l.Last)
				}
				checkNear(t, "trailing duration", l.Duration, 86, 1e-12)
				checkNear(t, "trailing at-risk volume", l.AtRiskVolume, 43, 1e-12)
				checkNear(t, "trailing min residence", l.MinResidence, 2.5, 1e-12)
				res.Events = res.Events[:1]
			}
			if len(res.Events) != 1 {
				t.Fatalf("%d events, want 1", len(res.Events))
			}
			e := res.Events[0]
			checkNear(t, "min residence", e.MinResidence, c.minRes, 1e-12)
			checkNear(t, "per-sample residence", e.MinSampleResidence, c.sample, 1e-12)
			checkNear(t, "duration", e.Duration, c.duration, 1e-12)
			checkNear(t, "at-risk volume", e.AtRiskVolume, c.atRisk, 1e-12)
			if e.Kind != c.kind || e.Verdict != c.verdict {
				t.Errorf("%s %s, want %s %s", e.Kind, e.Verdict, c.kind, c.verdict)
			}
		})
	}
}

// TestEngineRefuses checks the errors the engine returns.
func TestEngineRefuses(t *testing.T) {
	m := demoModel(t)
	none := m
	none.Legal, none.Organisms = nil, []lethality.Organism{{Name: "x", D: 1, DTemperature: 70, Z: 5}}
	if _, err := runs.NewEngine(none, runs.Options{}); !errors.Is(err, runs.ErrNoCriteria) {
		t.Errorf("model without criteria: %v, want ErrNoCriteria", err)
	}
	e, err := runs.NewEngine(m, runs.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if err := e.Add(runs.Sample{Time: 10, Temperature: 73, Flow: 0.003, Forward: true}); err != nil {
		t.Fatal(err)
	}
	err = e.Add(runs.Sample{Time: 9, Temperature: 73, Flow: 0.003, Forward: true})
	var se *runs.SampleError
	if !errors.As(err, &se) || se.Index != 1 || se.Field != "time" || !near(se.Previous, 10, 0) {
		t.Errorf("time backwards: %v", err)
	}
	e2, _ := runs.NewEngine(m, runs.Options{})
	if err := e2.Add(runs.Sample{Time: 0, Temperature: math.NaN(), Flow: 0.003}); !errors.As(err, &se) || se.Field != "temperature" {
		t.Errorf("NaN temperature: %v", err)
	}
}

// TestGapThreshold: five times the median interval by default, or as given.
func TestGapThreshold(t *testing.T) {
	m := demoModel(t)
	q := 10000 * lh
	// Two-second samples with a 9 s and an 11 s interval: the median is 2 s,
	// the threshold 10 s, so only the 11 s interval is a gap.
	var s []runs.Sample
	tm := 0.0
	for i := range 100 {
		s = append(s, runs.Sample{Time: tm, Temperature: 73, Flow: q, Forward: true})
		switch i {
		case 30:
			tm += 9
		case 60:
			tm += 11
		default:
			tm += 2
		}
	}
	res := analyse(t, m, runs.Options{}, s)
	if len(res.Events) != 1 || res.Events[0].Kind != runs.KindGap || res.Events[0].First != 60 {
		t.Fatalf("events %+v, want one gap at sample 60", res.Events)
	}
	checkNear(t, "median", res.Summary.MedianInterval, 2, 0)
	checkNear(t, "threshold", res.Summary.GapThreshold, 10, 0)
	// With a threshold of 8 s both are gaps.
	res = analyse(t, m, runs.Options{GapThreshold: 8}, s)
	if len(res.Events) != 2 || res.Summary.Gaps != 2 {
		t.Errorf("threshold 8 s: %d events, %d gaps; want 2 and 2", len(res.Events), res.Summary.Gaps)
	}
	// A gap while diverted is no event.
	s[60].Forward = false
	res = analyse(t, m, runs.Options{}, s)
	if len(res.Events) != 0 {
		t.Errorf("a gap while diverted gave %d events", len(res.Events))
	}
}

// TestRheologyAtTemperature: with a viscosity that depends on temperature,
// each interval's Reynolds number is taken at its own temperature. A product
// that is turbulent at 73 °C and laminar when cold (a dip to 60 °C) has its
// fastest particle at twice the mean velocity while cold.
func TestRheologyAtTemperature(t *testing.T) {
	m := demoModel(t)
	visc := func(temp float64) lethality.Rheology {
		if temp < 65 {
			return lethality.Newtonian{Viscosity: 0.05} // Re = 1031·1.568·0.0475/0.05 ≈ 1540 at 10 000 L/h: laminar
		}
		return lethality.Newtonian{Viscosity: 0.72e-3}
	}
	m.RheologyAt = visc
	q := 10000 * lh
	var s []runs.Sample
	for i := range 200 {
		temp := 73.0
		if i >= 100 {
			temp = 60 // long enough to fill the tube with cold product
		}
		s = append(s, runs.Sample{Time: float64(i), Temperature: temp, Flow: q, Forward: true})
	}
	res := analyse(t, m, runs.Options{}, s)
	hot := m.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: m.Density}, visc(73), 0)
	cold := m.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: m.Density}, visc(60), 0)
	if cold.Regime == lethality.Turbulent || hot.Regime != lethality.Turbulent {
		t.Fatalf("regimes %s and %s, want laminar when cold", cold.Regime, hot.Regime)
	}
	// Laminar Newtonian: u_max = 2·v (Hagen–Poiseuille, common practice).
	checkNear(t, "cold fastest-to-mean", cold.FastestToMean, 2, 1e-12)
	checkNear(t, "min forward residence", res.Summary.MinForwardResidence, cold.MinResidence, 1e-9)
	if len(res.Events) != 1 || res.Events[0].Kind != runs.KindTemperature {
		t.Fatalf("events %+v", res.Events)
	}
	checkNear(t, "event min residence", res.Events[0].MinResidence, cold.MinResidence, 1e-9)
}

// TestStandingProduct: flow stopped since before the run began: the product
// in the tube has been there for an unknown, unbounded time (+Inf); once
// the flow starts, residences become finite.
func TestStandingProduct(t *testing.T) {
	m := demoModel(t)
	q := 10000 * lh
	s := []runs.Sample{{Time: 0, Temperature: 73, Flow: 0, Forward: true}, {Time: 10, Temperature: 73, Flow: q, Forward: true}}
	for i := 11; i < 100; i++ {
		s = append(s, runs.Sample{Time: float64(i), Temperature: 73, Flow: q, Forward: true})
	}
	e, err := runs.NewEngine(m, runs.Options{GapThreshold: 60})
	if err != nil {
		t.Fatal(err)
	}
	for _, x := range s[:2] {
		e.Add(x)
	}
	first := e.Finish()
	if !math.IsInf(first.Summary.MinForwardResidence, 1) || !math.IsInf(first.Summary.MinForwardLogReduction[1], 1) {
		t.Errorf("standing product: residence %g, LR %g; want +Inf", first.Summary.MinForwardResidence, first.Summary.MinForwardLogReduction[1])
	}
	all := analyse(t, m, runs.Options{GapThreshold: 60}, s)
	// Once the tube has been flushed at the normal rate, the steady value.
	checkNear(t, "min residence", all.Summary.MinForwardResidence, m.Tube.Length/uMax(m, 10000), 1e-9)
	// The held 10 s at no flow delivered nothing.
	checkNear(t, "forward volume", all.Summary.ForwardVolume, 89*q, 1e-12)
}

// TestClockSeconds round-trips clock times through float seconds.
func TestClockSeconds(t *testing.T) {
	for _, tm := range []time.Time{
		time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC),
		time.Date(2026, 3, 14, 6, 0, 0, 250_000_000, time.UTC),
		time.Date(1969, 12, 31, 23, 59, 59, 500_000_000, time.UTC),
	} {
		if got := runs.ClockTime(runs.UnixSeconds(tm)); !got.Equal(tm) {
			t.Errorf("%s came back as %s", tm.Format(time.RFC3339Nano), got.Format(time.RFC3339Nano))
		}
	}
}

// TestLaminarBelowTheSeal: a flow under the sealed maximum but below
// Re 4000 is laminar, so its fastest particle moves at twice the mean
// velocity and can miss a legal row the seal meets. No limit is crossed;
// the under-held product is a lethality event (docs/METHOD.md §7.7, worked
// example, and §13).
func TestLaminarBelowTheSeal(t *testing.T) {
	// docs/METHOD.md §7.7 worked example: ρ = 1030 kg/m³, μ = 5 mPa·s,
	// 2 in sanitary tube (ID 47.498 mm), 20 m, seal 3000 L/h; a 25 s row.
	const outer, wall = 2 * 0.0254, 0.065 * 0.0254
	d := outer - 2*wall
	m := runs.Model{
		Tube:     lethality.Tube{InnerDiameter: d, Length: 20},
		Rheology: lethality.Newtonian{Viscosity: 5e-3},
		Density:  1030,
		Legal:    []lethality.LegalRow{{Temperature: 72, Time: 25}},
		Setpoint: 72.5,
		MaxFlow:  3000 * lh,
	}
	area := math.Pi * d * d / 4
	steady := func(flowLh float64) []runs.Sample {
		var s []runs.Sample
		for i := range 100 {
			s = append(s, runs.Sample{Time: float64(i), Temperature: 73, Flow: flowLh * lh, Forward: true})
		}
		return s
	}
	// Hand calculation at 2600 L/h: v = Q/A = 0.40760 m/s,
	// Re = 1030 · 0.40760 · 0.047498 / 0.005 = 3988 < 4000: laminar, the
	// fastest particle at 2v (Hagen–Poiseuille, common practice):
	// t = 20 / (2 · 0.40760) = 24.53 s < 25 s.
	v := 2600 * lh / area
	if re := 1030 * v * d / 5e-3; !(re < 4000 && re > 3900) {
		t.Fatalf("Re %.0f at 2600 L/h, want just under 4000", re)
	}
	res := analyse(t, m, runs.Options{GapThreshold: 10}, steady(2600))
	if len(res.Events) != 1 {
		t.Fatalf("%d events at 2600 L/h, want one lethality event", len(res.Events))
	}
	e := res.Events[0]
	if e.Kind != runs.KindLethality || e.Verdict != runs.ProductAtRisk || e.LegalRowMet {
		t.Errorf("%s %s legal %v, want lethality, product at risk, not met", e.Kind, e.Verdict, e.LegalRowMet)
	}
	checkNear(t, "min residence", e.MinResidence, 20/(2*v), 1e-9)
	checkNear(t, "duration", e.Duration, 99, 1e-12) // the last sample holds no time
	checkNear(t, "at-risk volume", e.AtRiskVolume, 99*2600*lh, 1e-9)
	// At the seal, 3000 L/h: turbulent (Re 4602) and 32.25 s (the worked
	// example): no event.
	if res := analyse(t, m, runs.Options{GapThreshold: 10}, steady(3000)); len(res.Events) != 0 {
		t.Errorf("%d events at the seal, want none", len(res.Events))
	}
}

// TestTimeFarFromItsOrigin: the engine computes in time from the first
// sample, so the same run with its times written from 0 and from
// 1 773 468 000 s (Unix seconds in 2026, where a float64 steps by 2^-22 s =
// 0.24 µs) gives the same residences, to the last bit of a residence near
// 15 s. The flows make the fastest particle take 15 s − 5×10⁻⁸ s at the
// 72 °C / 15 s row's temperature (computed here from the tube's area and an
// entered ratio of 2), short by more than the row's tolerance (10⁻⁹ × 15 s,
// docs/METHOD.md §1.5).
func TestTimeFarFromItsOrigin(t *testing.T) {
	m := demoModel(t)
	m.FastestToMean = 2
	m.Organisms = nil
	m.Legal = []lethality.LegalRow{{Temperature: 72, Time: 15}}
	area := math.Pi * m.Tube.InnerDiameter * m.Tube.InnerDiameter / 4
	q := m.Tube.Length * area / (2 * (15 - 5e-8)) // m³/s: L/(2·Q/A) = 15 s − 5e-8 s
	run := func(origin float64) runs.Result {
		var s []runs.Sample
		for i := range 60 {
			s = append(s, runs.Sample{Time: origin + float64(i), Temperature: 72.5, Flow: q, Forward: true})
		}
		return analyse(t, m, runs.Options{GapThreshold: 5}, s)
	}
	// Every parcel falls short, those that entered before the run and
	// those that entered during it: one lethality event over all 60 samples.
	for name, res := range map[string]runs.Result{"from 0": run(0), "from 1 773 468 000 s": run(1_773_468_000)} {
		checkNear(t, name+": min residence", res.Summary.MinForwardResidence, 15-5e-8, 1e-14)
		if len(res.Events) != 1 || res.Events[0].Kind != runs.KindLethality || res.Events[0].First != 0 || res.Events[0].Last != 59 {
			t.Errorf("%s: events %+v; want one lethality event over samples 0 to 59", name, res.Events)
		}
	}
}

// TestOriginShiftsTheResultsTimes: Options.Origin is added to every time the
// result gives, and to nothing else.
func TestOriginShiftsTheResultsTimes(t *testing.T) {
	m := demoModel(t)
	const origin = 1_773_446_400 // 2026-03-14T00:00:00Z
	plain := analyse(t, m, runs.Options{Trace: 8}, scriptedShift())
	shifted := analyse(t, m, runs.Options{Trace: 8, Origin: origin}, scriptedShift())
	checkNear(t, "start", shifted.Summary.Start, plain.Summary.Start+origin, 1e-15)
	checkNear(t, "end", shifted.Summary.End, plain.Summary.End+origin, 1e-15)
	for i, e := range shifted.Events {
		p := plain.Events[i]
		checkNear(t, "event start", e.Start, p.Start+origin, 1e-15)
		checkNear(t, "event end", e.End, p.End+origin, 1e-15)
		checkNear(t, "event duration", e.Duration, p.Duration, 1e-15)
		checkNear(t, "event residence", e.MinResidence, p.MinResidence, 1e-15)
	}
	for i, d := range shifted.Drops {
		checkNear(t, "drop start", d.Start, plain.Drops[i].Start+origin, 1e-15)
		if (d.DivertAfter == nil) != (plain.Drops[i].DivertAfter == nil) || d.DivertAfter != nil && *d.DivertAfter != *plain.Drops[i].DivertAfter {
			t.Errorf("drop %d: divert after %v, want %v", i, d.DivertAfter, plain.Drops[i].DivertAfter)
		}
	}
	for i, b := range shifted.Trace {
		checkNear(t, "bucket start", b.Start, plain.Trace[i].Start+origin, 1e-15)
		checkNear(t, "bucket end", b.End, plain.Trace[i].End+origin, 1e-15)
	}
	if len(shifted.Events) != len(plain.Events) || len(shifted.Drops) == 0 || len(shifted.Trace) == 0 {
		t.Errorf("%d events, %d drops, %d buckets", len(shifted.Events), len(shifted.Drops), len(shifted.Trace))
	}
}

// TestViscosityAtTheColderOfReadingAndSetpoint: the Reynolds number of an
// interval takes the viscosity at its recorded temperature when that is
// below the setpoint (colder product is more viscous), and at the setpoint
// when the reading is above it (hotter product is not credited beyond the
// design model, which takes the setpoint; docs/METHOD.md §13.4). A product
// laminar below the 72.5 °C setpoint, turbulent above it and thinner still
// from 75 °C (viscosity steps invented for the test) shows both sides: at
// 80 °C the parcels are held as at 72.5 °C, at 71 °C as laminar product.
func TestViscosityAtTheColderOfReadingAndSetpoint(t *testing.T) {
	m := demoModel(t)
	var asked []float64
	m.RheologyAt = func(temp float64) lethality.Rheology {
		asked = append(asked, temp)
		switch {
		case temp < 72.5:
			return lethality.Newtonian{Viscosity: 0.05} // Re ≈ 1540 at 10 000 L/h: laminar
		case temp < 75:
			return lethality.Newtonian{Viscosity: 2e-3} // Re ≈ 38 400: turbulent
		}
		return lethality.Newtonian{Viscosity: 0.72e-3} // Re ≈ 106 600: turbulent, a smaller ratio
	}
	q := 10000 * lh
	flow := lethality.Flow{Volumetric: q, Density: m.Density}
	steady := func(temp float64) runs.Result {
		var s []runs.Sample
		for i := range 100 {
			s = append(s, runs.Sample{Time: float64(i), Temperature: temp, Flow: q, Forward: true})
		}
		return analyse(t, m, runs.Options{GapThreshold: 5}, s)
	}
	for _, c := range []struct {
		name        string
		temp, muAt  float64 // the reading; where the viscosity must be taken
		wantLaminar bool
	}{
		{"above the setpoint: at the setpoint", 80, 72.5, false},
		{"below the setpoint: at the reading", 71, 71, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			asked = asked[:0]
			res := steady(c.temp)
			for _, a := range asked {
				if a != c.muAt { // exact: the engine passes one of the two values through
					t.Fatalf("viscosity asked at %g °C, want %g °C", a, c.muAt)
				}
			}
			h := m.Tube.Hydraulics(flow, m.RheologyAt(c.muAt), 0)
			at := m.Tube.Hydraulics(flow, m.RheologyAt(c.temp), 0) // at the reading: what must not be used above the setpoint
			if (h.Regime != lethality.Turbulent) != c.wantLaminar || c.temp > m.Setpoint && near(at.MinResidence, h.MinResidence, 1e-6) {
				t.Fatalf("regime %s; residences %g s and %g s at the reading: the case shows nothing", h.Regime, h.MinResidence, at.MinResidence)
			}
			checkNear(t, "min residence", res.Summary.MinForwardResidence, h.MinResidence, 1e-12)
		})
	}
}

// TestSensorLowReading: with a sensor accuracy, every forward parcel is
// judged once more with its reading lowered by it, beside the verdicts on
// the readings as recorded (docs/METHOD.md §13.4). Setpoint and row at
// 72 °C, accuracy 0.25 K, 10 000 L/h throughout (one residence, L/u):
// 50 samples at 72.10 °C meet the row as recorded and miss it at 71.85 °C;
// 50 at 72.30 °C meet it either way (72.05 °C); then 5 at 71.95 °C, below
// the setpoint and the row, an event whose parcels fail either way.
func TestSensorLowReading(t *testing.T) {
	m := demoModel(t)
	m.Setpoint, m.SensorAccuracy = 72, 0.25
	m.Legal = []lethality.LegalRow{{Temperature: 72, Time: 15}}
	q := 10000 * lh
	var s []runs.Sample
	for i := range 105 {
		temp := 72.10
		switch {
		case i >= 100:
			temp = 71.95
		case i >= 50:
			temp = 72.30
		}
		s = append(s, runs.Sample{Time: float64(i), Temperature: temp, Flow: q, Forward: true})
	}
	res := analyse(t, m, runs.Options{GapThreshold: 5}, s)
	resid := m.Tube.Length / uMax(m, 10000) // 17.94 s: meets 15 s wherever a row applies
	// Listeria, D = 0.9 s · 10^((71.7 − T)/6.3) (the plant file's kinetics,
	// docs/METHOD.md §9.1): its LR is far above 5 at every temperature here.
	dL := func(temp float64) float64 { return 0.9 * math.Pow(10, (71.7-temp)/6.3) }
	sum := res.Summary
	if sum.SamplesShort != 5 || sum.SamplesShortAtSensorLow != 55 {
		t.Errorf("samples short %d as recorded, %d at the low reading; want 5 and 55", sum.SamplesShort, sum.SamplesShortAtSensorLow)
	}
	checkNear(t, "min LR at the low reading", sum.MinForwardLogReductionAtSensorLow[1], resid/dL(71.95-0.25), 1e-12)
	checkNear(t, "min LR as recorded", sum.MinForwardLogReduction[1], resid/dL(71.95), 1e-12)
	if len(res.Events) != 1 || res.Events[0].Kind != runs.KindTemperature || res.Events[0].Verdict != runs.ProductAtRisk {
		t.Fatalf("events %+v; want the dip, product at risk", res.Events)
	}
	e := res.Events[0]
	if e.SamplesShortAtSensorLow != 5 {
		t.Errorf("event: %d samples short at the low reading, want 5", e.SamplesShortAtSensorLow)
	}
	checkNear(t, "event min LR at the low reading", e.MinLogReductionAtSensorLow[1], resid/dL(71.7), 1e-12)

	// Without an accuracy, nothing at the low reading.
	m.SensorAccuracy = 0
	plain := analyse(t, m, runs.Options{GapThreshold: 5}, s)
	if plain.Summary.SamplesShortAtSensorLow != 0 || plain.Summary.MinForwardLogReductionAtSensorLow != nil || plain.Events[0].MinLogReductionAtSensorLow != nil {
		t.Errorf("without an accuracy: %+v", plain.Summary)
	}
}

// TestForwardMedians: the medians of the first MedianWindow forward samples'
// temperatures and flows, diverted samples left out (computed here from the
// definition: the middle of the sorted values, the mean of the middle two
// for an even count).
func TestForwardMedians(t *testing.T) {
	m := demoModel(t)
	var s []runs.Sample
	temps := []float64{60, 73.1, 72.9, 73.0, 73.4, 90} // the first and last diverted
	for i, temp := range temps {
		s = append(s, runs.Sample{Time: float64(i), Temperature: temp, Flow: float64(9000+500*i) * lh, Forward: i > 0 && i < len(temps)-1})
	}
	res := analyse(t, m, runs.Options{GapThreshold: 5}, s)
	// Forward: 73.1, 72.9, 73.0, 73.4 → (73.0 + 73.1)/2; flows 9500…11000 L/h → 10 250 L/h.
	checkNear(t, "median forward temperature", res.Summary.MedianForwardTemperature, 73.05, 1e-12)
	checkNear(t, "median forward flow", res.Summary.MedianForwardFlow, 10250*lh, 1e-12)
	none := analyse(t, m, runs.Options{GapThreshold: 5}, s[:1])
	if !math.IsNaN(none.Summary.MedianForwardTemperature) || !math.IsNaN(none.Summary.MedianForwardFlow) {
		t.Errorf("no forward sample: medians %g, %g; want NaN", none.Summary.MedianForwardTemperature, none.Summary.MedianForwardFlow)
	}
	merged := runs.MergeSummaries([]runs.Summary{res.Summary, res.Summary})
	if !math.IsNaN(merged.MedianForwardTemperature) {
		t.Errorf("merged medians %g, want NaN (medians do not merge)", merged.MedianForwardTemperature)
	}
}
