package fouling

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/optimize"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// near says got is within tol of want, relative to |want|.
func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol*math.Abs(want) }

// hours returns n times from 0 every step h.
func hours(n int, step float64) []float64 {
	t := make([]float64, n)
	for i := range t {
		t[i] = float64(i) * step
	}
	return t
}

func TestFitLinear(t *testing.T) {
	// Exact data y = 2e-5 + 3e-6 t: the fit returns the line (by construction).
	ts := hours(10, 0.5)
	y := make([]float64, len(ts))
	for i, x := range ts {
		y[i] = 2e-5 + 3e-6*x
	}
	f, err := FitLinear(ts, y)
	if err != nil {
		t.Fatal(err)
	}
	if !near(f.A, 2e-5, 1e-9) || !near(f.B, 3e-6, 1e-9) || f.RSS > 1e-28 {
		t.Errorf("exact line: a %g b %g RSS %g, want 2e-5 3e-6 0", f.A, f.B, f.RSS)
	}

	// Noisy data against gonum's stat.LinearRegression (an independent
	// implementation) and the textbook variances of a straight-line fit:
	// Var(b) = s²/Sxx, Var(a) = s² (1/n + t̄²/Sxx), Cov(a, b) = −s² t̄/Sxx,
	// s² = RSS/(n − 2) (e.g. Bates and Watts (1988), §1.1, from memory).
	rng := rand.New(rand.NewPCG(1, 2))
	for i, x := range ts {
		y[i] = 2e-5 + 3e-6*x + 4e-7*rng.NormFloat64()
	}
	f, err = FitLinear(ts, y)
	if err != nil {
		t.Fatal(err)
	}
	a, b := stat.LinearRegression(ts, y, nil, false)
	if !near(f.A, a, 1e-12) || !near(f.B, b, 1e-9) {
		t.Errorf("noisy: a %g b %g, gonum %g %g", f.A, f.B, a, b)
	}
	n := float64(len(ts))
	mean, sxx := stat.Mean(ts, nil), 0.0
	for _, x := range ts {
		sxx += (x - mean) * (x - mean)
	}
	s2 := f.RSS / (n - 2)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"var(a)", f.Cov[0][0], s2 * (1/n + mean*mean/sxx)},
		{"var(b)", f.Cov[1][1], s2 / sxx},
		{"cov(a,b)", f.Cov[0][1], -s2 * mean / sxx},
		{"AIC", f.AIC, n*math.Log(f.RSS/n) + 4},
	} {
		if !near(c.got, c.want, 1e-9) {
			t.Errorf("%s = %g, want %g", c.name, c.got, c.want)
		}
	}
	if _, err := FitLinear(ts[:2], y[:2]); err != ErrTooFew {
		t.Errorf("two points: %v, want ErrTooFew", err)
	}
}

// asymptoticData is a + R∞(1 − e^(−t/τ)) plus normal noise of σ.
func asymptoticData(ts []float64, a, rInf, tau, sigma float64, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	y := make([]float64, len(ts))
	for i, x := range ts {
		y[i] = a + rInf*(1-math.Exp(-x/tau)) + sigma*rng.NormFloat64()
	}
	return y
}

func TestFitAsymptotic(t *testing.T) {
	ts := hours(241, 1.0/60) // four hours of one-minute windows
	lo, hi := TauRange(ts)
	// The range: twice the one-minute spacing to the four-hour span.
	if !near(lo, 2.0/60, 1e-12) || !near(hi, 4, 1e-12) {
		t.Fatalf("τ range %g–%g h, want 1/30–4", lo, hi)
	}
	t.Run("exact", func(t *testing.T) {
		y := asymptoticData(ts, 2e-5, 1.5e-4, 1.2, 0, 0)
		f, err := FitAsymptotic(ts, y, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		// The generating values (by construction).
		if !near(f.A, 2e-5, 1e-6) || !near(f.RInf, 1.5e-4, 1e-6) || !near(f.Tau, 1.2, 1e-6) || !f.Determined {
			t.Errorf("a %g R∞ %g τ %g determined %v, want 2e-5 1.5e-4 1.2 true", f.A, f.RInf, f.Tau, f.Determined)
		}
	})
	t.Run("noisy against a general minimiser", func(t *testing.T) {
		y := asymptoticData(ts, 2e-5, 1.5e-4, 1.2, 3e-7, 3)
		f, err := FitAsymptotic(ts, y, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		// The same least-squares problem in all three parameters at once,
		// solved by gonum's BFGS from a start 20 % off (an independent
		// method): the separable search must find the same optimum.
		scale := 1e-4
		rss := func(p []float64) float64 {
			s := 0.0
			for i, x := range ts {
				r := (y[i] - p[0]*scale - p[1]*scale*(1-math.Exp(-x/p[2]))) / scale
				s += r * r
			}
			return s
		}
		prob := optimize.Problem{Func: rss, Grad: func(g, p []float64) { fd.Gradient(g, rss, p, &fd.Settings{Formula: fd.Central}) }}
		res, err := optimize.Minimize(prob, []float64{0.24, 1.2, 1.44}, &optimize.Settings{GradientThreshold: 1e-12}, &optimize.BFGS{})
		if err != nil && res == nil {
			t.Fatal(err)
		}
		if !near(f.A, res.X[0]*scale, 1e-4) || !near(f.RInf, res.X[1]*scale, 1e-4) || !near(f.Tau, res.X[2], 1e-4) {
			t.Errorf("separable a %g R∞ %g τ %g; BFGS %g %g %g", f.A, f.RInf, f.Tau, res.X[0]*scale, res.X[1]*scale, res.X[2])
		}
		if f.RSS > res.F*scale*scale*(1+1e-9) {
			t.Errorf("separable RSS %g above BFGS's %g", f.RSS, res.F*scale*scale)
		}
	})
	t.Run("a straight line leaves τ undetermined", func(t *testing.T) {
		y := make([]float64, len(ts))
		for i, x := range ts {
			y[i] = 1e-5 + 2e-5*x
		}
		f, err := FitAsymptotic(ts, y, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		// A line is the limit τ → ∞: the search ends at the top of the range.
		if f.Determined || !near(f.Tau, hi, 1e-6) {
			t.Errorf("τ %g determined %v, want the range's top %g, not determined", f.Tau, f.Determined, hi)
		}
	})
}

// TestReachesGradient checks the time a fit reaches a fouling and its
// gradient against finite differences of the same function (gonum fd).
func TestReachesGradient(t *testing.T) {
	cases := []struct {
		name string
		f    Fit
		r    float64
		want float64 // h
	}{
		// (1.5e-4 − 2e-5)/2.6e-5 = 5 h (by hand).
		{"linear", Fit{Kind: Linear, A: 2e-5, B: 2.6e-5}, 1.5e-4, 5},
		// u = (1.1e-4 − 2e-5)/1.5e-4 = 0.6, t = −1.2 ln 0.4 = 1.099545 h (by hand).
		{"asymptotic", Fit{Kind: Asymptotic, A: 2e-5, RInf: 1.5e-4, Tau: 1.2}, 1.1e-4, -1.2 * math.Log(0.4)},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, g, ok := c.f.Reaches(c.r)
			if !ok || !near(got, c.want, 1e-12) {
				t.Fatalf("t = %g (ok %v), want %g", got, ok, c.want)
			}
			params := []float64{c.f.A, c.f.B}
			set := func(f *Fit, p []float64) { f.A, f.B = p[0], p[1] }
			if c.f.Kind == Asymptotic {
				params = []float64{c.f.A, c.f.RInf, c.f.Tau}
				set = func(f *Fit, p []float64) { f.A, f.RInf, f.Tau = p[0], p[1], p[2] }
			}
			num := fd.Gradient(nil, func(p []float64) float64 {
				f := c.f
				set(&f, p)
				v, _, _ := f.Reaches(c.r)
				return v
			}, params, &fd.Settings{Formula: fd.Central, Step: 1e-9})
			for i := range g {
				if math.Abs(g[i]-num[i]) > 1e-5*math.Abs(num[i]) {
					t.Errorf("∂t/∂θ%d = %g, finite differences %g", i, g[i], num[i])
				}
			}
		})
	}
	// Never reached: a falling line, an asymptote below the target.
	if _, _, ok := (Fit{Kind: Linear, A: 1e-5, B: -1e-6}).Reaches(2e-5); ok {
		t.Error("a falling line reaches a higher fouling")
	}
	if _, _, ok := (Fit{Kind: Asymptotic, A: 1e-5, RInf: 5e-5, Tau: 1}).Reaches(6e-5); ok {
		t.Error("an asymptote of 6e-5 reaches 6e-5")
	}
}

// TestOneSidedZ: the 95 % one-sided standard normal quantile (gonum distuv).
func TestOneSidedZ(t *testing.T) {
	if z := distuv.UnitNormal.Quantile(0.95); math.Abs(z-OneSidedZ) > 1e-12 {
		t.Errorf("z = %.16g, gonum %.16g", OneSidedZ, z)
	}
}

// TestDeltaMethodCoverage: over many noisy runs of a known line, the
// forecast time's delta-method σ matches the spread of the forecasts
// (a Monte Carlo check of C = s²(JᵀJ)⁻¹ and g).
func TestDeltaMethodCoverage(t *testing.T) {
	ts := hours(121, 1.0/60)
	const a, b, sigma, target = 2e-5, 3e-5, 1e-6, 2e-4 // target reached at 6 h
	var times, sigmas []float64
	rng := rand.New(rand.NewPCG(11, 12))
	y := make([]float64, len(ts))
	for range 400 {
		for i, x := range ts {
			y[i] = a + b*x + sigma*rng.NormFloat64()
		}
		f, err := FitLinear(ts, y)
		if err != nil {
			t.Fatal(err)
		}
		tt, g, ok := f.Reaches(target)
		if !ok {
			t.Fatal("not reached")
		}
		times = append(times, tt)
		sigmas = append(sigmas, math.Sqrt(f.Variance(g)))
	}
	sd := stat.StdDev(times, nil)
	meanSigma := stat.Mean(sigmas, nil)
	// 400 draws: the sample SD is within about 10 % of the true σ.
	if math.Abs(meanSigma/sd-1) > 0.12 {
		t.Errorf("delta-method σ %g h against the spread %g h of 400 forecasts", meanSigma, sd)
	}
	if m := stat.Mean(times, nil); math.Abs(m-6) > 3*sd/math.Sqrt(400) {
		t.Errorf("mean forecast %g h, want 6 (by hand: (2e-4 − 2e-5)/3e-5)", m)
	}
}

func TestGoldenSection(t *testing.T) {
	// (x − 0.3)² on [−1, 2]: minimum at 0.3 (by hand).
	if x := goldenSection(func(x float64) float64 { return (x - 0.3) * (x - 0.3) }, -1, 2, 1e-10); math.Abs(x-0.3) > 1e-9 {
		t.Errorf("minimum at %g, want 0.3", x)
	}
}
