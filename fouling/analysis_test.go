package fouling

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestWindower(t *testing.T) {
	w := NewWindower(60, false)
	nan := math.NaN()
	// Samples every 10 s from 1 000 000 030 s, a clock time mid-minute.
	for i := range 12 {
		s := Sample{Time: 1e9 + 30 + float64(i)*10, ProductMassFlow: 2 + 0.01*float64(i), Forward: i != 7,
			ProductIn: 60, ProductOut: 70 + float64(i), MediumIn: 80, MediumOut: 75, MediumFlow: nan}
		if i == 2 {
			s.MediumOut = nan // an empty cell: the sample is left out of the temperatures
		}
		if i == 3 {
			s.MediumFlow = 0.005
		}
		w.Add(s)
	}
	got := w.Windows()
	// 1e9 + 30 = 16 666 667 × 60 + 10 (by hand), so the first window is
	// [1e9 + 20, 1e9 + 80) and holds the samples at +30 … +70 (5); the
	// next, [1e9 + 80, 1e9 + 140), those at +80 … +130 (6); the last +140.
	if len(got) != 3 {
		t.Fatalf("%d windows, want 3", len(got))
	}
	first := got[0]
	if first.Start != 1e9+20 || first.End != 1e9+80 || first.Samples != 5 || first.Heating != 4 || first.Diverted != 0 {
		t.Errorf("first window %+v", first)
	}
	// Product out over samples 0, 1, 3, 4 (2 has no medium out): (70+71+73+74)/4 = 72.
	if math.Abs(first.ProductOut-72) > 1e-12 || math.Abs(first.MediumFlow-0.005) > 1e-15 || math.Abs(first.Centre()-(1e9+50)) > 0 {
		t.Errorf("first window means: product out %g, medium flow %g, centre %g", first.ProductOut, first.MediumFlow, first.Centre())
	}
	// Flows 2.00…2.04: min, max, mean 2.02.
	if math.Abs(first.ProductFlowMin-2) > 1e-12 || math.Abs(first.ProductFlowMax-2.04) > 1e-12 || math.Abs(first.ProductFlowMean-2.02) > 1e-12 {
		t.Errorf("first window flows %g %g %g", first.ProductFlowMin, first.ProductFlowMax, first.ProductFlowMean)
	}
	if got[1].Samples != 6 || got[1].Diverted != 1 || !math.IsNaN(got[1].MediumFlow) || got[2].Samples != 1 {
		t.Errorf("second and third windows %+v %+v", got[1], got[2])
	}
	defer func() {
		if recover() == nil {
			t.Error("a sample before the open window did not panic")
		}
	}()
	w2 := NewWindower(60, false)
	w2.Add(Sample{Time: 200})
	w2.Add(Sample{Time: 100})
}

// syntheticRun rates the hand section (TestRateHandWorked) every 10 s for
// hours h with the fouling rf(t) and noise of σ K on each temperature, as a
// run of windows of 60 s.
func syntheticRun(t *testing.T, s Section, uClean float64, hoursLong float64, rf func(h float64) float64, sigma float64) Run {
	t.Helper()
	w := NewWindower(60, false)
	rng := rand.New(rand.NewPCG(5, 6))
	n := int(hoursLong * 360)
	for i := range n {
		tt := float64(i) * 10
		sec, err := s.Rate(uClean, rf(tt/3600))
		if err != nil {
			t.Fatal(err)
		}
		noise := func() float64 { return sigma * rng.NormFloat64() }
		w.Add(Sample{Time: tt, ProductMassFlow: s.ProductMassFlow, Forward: true, ProductIn: sec.ProductIn + noise(), ProductOut: sec.ProductOut + noise(),
			MediumIn: sec.OtherIn + noise(), MediumOut: sec.OtherOut + noise(), MediumFlow: math.NaN()})
	}
	return Run{Windows: w.Windows(), First: 0, Last: float64(n-1) * 10}
}

// TestAnalyseLinear: a section rated with a known linear fouling rate; the
// fit recovers it and the forecast is the time at which the known rate
// reaches the fouling that makes the required inlet the hottest available.
func TestAnalyseLinear(t *testing.T) {
	s := handSection()
	const uc, a0, rate = 4000.0, 0, 2e-5 // W/(m²·K), m²·K/W, m²·K/W per h
	run := syntheticRun(t, s, uc, 3, func(h float64) float64 { return a0 + rate*h }, 0.01)
	res := Analyse(s, run)
	if len(res.Points) != 180 || res.Chosen == "" {
		t.Fatalf("%d points, fit %q (%v)", len(res.Points), res.Chosen, res.FitErr)
	}
	lin := res.Fits[Linear]
	if math.Abs(lin.B-rate) > 0.03*rate {
		t.Errorf("slope %g, want %g within 3 %%", lin.B, rate)
	}
	// The reference: R* where the hand section needs 85 °C, by bisection on
	// the rating itself, then t* = R*/rate + the first window's centre (30 s).
	lo, hi := 0.0, 1e-3
	for range 200 {
		mid := (lo + hi) / 2
		sec, err := s.Rate(uc, mid)
		if err != nil || sec.OtherIn >= 85 {
			hi = mid
		} else {
			lo = mid
		}
	}
	want := lo/rate*3600 + 30
	fc := res.Forecasts[0]
	if fc.State != Ahead || math.Abs(fc.Time-want) > 600 || !(fc.CleanBefore < fc.Time) {
		t.Errorf("forecast %v at %g s (clean before %g), want %g s within 10 min", fc.State, fc.Time, fc.CleanBefore, want)
	}
	if math.Abs(res.UClean-uc) > 0.01*uc {
		t.Errorf("U_clean %g from the fit, want %g (the run starts clean)", res.UClean, uc)
	}
}

// TestAnalyseBurnOn: the burn-on limit is reached before the hottest
// available inlet when it is tighter.
func TestAnalyseBurnOn(t *testing.T) {
	s := handSection()
	s.MaxMediumToProduct = 8 // 75 + 8 = 83 °C, below the 85 °C available
	run := syntheticRun(t, s, 4000, 2, func(h float64) float64 { return 2e-5 * h }, 0.01)
	res := Analyse(s, run)
	if len(res.Forecasts) != 2 {
		t.Fatalf("%d forecasts, want 2", len(res.Forecasts))
	}
	in, burn := res.Forecasts[0], res.Forecasts[1]
	if burn.Limit != LimitMediumToProduct || math.Abs(burn.Inlet-83) > 1e-12 || !(burn.Time < in.Time) || !(burn.Fouling < in.Fouling) {
		t.Errorf("burn-on %+v against the inlet %+v", burn, in)
	}
}

// TestAnalyseAlreadyReached: a section already beyond its hottest medium
// says so, and a falling fouling never reaches the limit.
func TestAnalyseAlreadyReached(t *testing.T) {
	s := handSection()
	s.Spec.Inlet = 81 // below the 81.39 °C the section needs at 5e-5 (TestRateHandWorked)
	res := Analyse(s, syntheticRun(t, s, 4000, 1, func(h float64) float64 { return 5e-5 + 1e-6*h }, 0.005))
	if fc := res.Forecasts[0]; fc.State != Reached || !(fc.RequiredNow > 81) {
		t.Errorf("%+v, want reached", fc)
	}
	s.Spec.Inlet = 85
	res = Analyse(s, syntheticRun(t, s, 4000, 1, func(h float64) float64 { return 5e-5 - 2e-5*h }, 0.005))
	if fc := res.Forecasts[0]; fc.State != NotReached {
		t.Errorf("%+v, want not reached", fc)
	}
}
