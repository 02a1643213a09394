package fouling

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat"
)

// Run is one recorded run's windows.
type Run struct {
	Windows    []Window
	MediumMass bool    // the windows' MediumFlow is a mass flow (kg/s), not volumetric (m³/s)
	First      float64 // s: the run's first sample
	Last       float64 // s: the run's last sample
}

// Result is the analysis of one run's heating section.
type Result struct {
	Windows int            // windows that hold a sample
	Skipped [skipCount]int // windows that give no U, by reason (Skips)
	Points  []Point        // the windows that give U, in time order
	First   float64        // s: the run's first sample
	Last    float64        // s: the run's last sample
	// UClean is the run's U_clean without a plate pack: the chosen fit's U
	// at the first point, W/(m²·K); NaN with a pack (each point has its
	// own) or without a fit.
	UClean float64
	// CleanFromPack says U_clean came from the plate pack at each window.
	CleanFromPack bool
	// Fits by kind, absent when there are too few points (FitErr says why).
	Fits   map[FitKind]Fit
	FitErr map[FitKind]error
	// Chosen is the fit the forecast uses: the lower AIC among the fits
	// that are determined; "" without a fit.
	Chosen FitKind
	// Forecasts: the hottest available medium inlet first, then the burn-on
	// limit when the section has one; none without a fit.
	Forecasts []Forecast
}

// Fit is the chosen fit; ok is false without one.
func (r *Result) Fit() (Fit, bool) {
	f, ok := r.Fits[r.Chosen]
	return f, ok && r.Chosen != ""
}

// Analyse computes U over a run's windows, the fouling resistance and its
// fits, and the forecast of when the heating section reaches its limits
// (docs/METHOD.md §17):
//
//	U(t)   = q / (A ΔT_lm) for each window that gives one (Section.point)
//	R_f(t) = 1/U(t) − 1/U_clean
//	U_clean: with a plate pack, the pack's at each window's temperatures and flows;
//	         else 1/ŷ(0), ŷ the chosen fit of 1/U against t (the U at the run's start)
//	fits:  linear and asymptotic (FitLinear, FitAsymptotic over TauRange),
//	       the determined one of lower AIC chosen (the linear one on a tie)
//
// then the forecasts (forecast). t is in hours from the first point.
func Analyse(s Section, run Run) *Result {
	s.check()
	res := &Result{Windows: len(run.Windows), First: run.First, Last: run.Last, UClean: math.NaN(), CleanFromPack: s.Pack != nil,
		Fits: map[FitKind]Fit{}, FitErr: map[FitKind]error{}}
	for _, w := range run.Windows {
		p, why, ok := s.point(w, run.MediumMass)
		if !ok {
			res.Skipped[why]++
			continue
		}
		res.Points = append(res.Points, p)
	}
	if len(res.Points) == 0 {
		for _, k := range FitKinds {
			res.FitErr[k] = ErrTooFew
		}
		return res
	}
	t := make([]float64, len(res.Points))
	y := make([]float64, len(res.Points))
	for i := range res.Points {
		p := &res.Points[i]
		p.Hours = (p.Time - res.Points[0].Time) / 3600
		t[i] = p.Hours
		if s.Pack != nil {
			y[i] = p.Fouling
		} else {
			y[i] = 1 / p.U
		}
	}
	res.fit(t, y)
	if f, ok := res.Fit(); ok && s.Pack == nil {
		// Without a pack the fits are of 1/U; U_clean is the chosen fit's U
		// at the start, and R_f = 1/U − 1/U_clean shifts every fit alike.
		c := f.At(0)
		if !(c > 0) {
			res.Chosen = ""
			res.FitErr[f.Kind] = fmt.Errorf("the fitted 1/U at the start is %g m²·K/W, not positive", c)
			return res
		}
		res.UClean = 1 / c
		for k, f := range res.Fits {
			f.shift(c)
			res.Fits[k] = f
		}
		for i := range res.Points {
			res.Points[i].Fouling = y[i] - c
		}
	}
	if _, ok := res.Fit(); ok {
		res.forecast(s)
	}
	return res
}

// fit makes both fits and chooses one.
func (r *Result) fit(t, y []float64) {
	if f, err := FitLinear(t, y); err == nil {
		r.Fits[Linear] = f
	} else {
		r.FitErr[Linear] = err
	}
	lo, hi := TauRange(t)
	if f, err := FitAsymptotic(t, y, lo, hi); err == nil {
		r.Fits[Asymptotic] = f
	} else {
		r.FitErr[Asymptotic] = err
	}
	for _, k := range FitKinds {
		f, ok := r.Fits[k]
		if !ok || !f.Determined {
			continue
		}
		if r.Chosen == "" || f.AIC < r.Fits[r.Chosen].AIC {
			r.Chosen = k
		}
	}
}

// Percentile is the U of nearest rank ⌈q·n⌉ over the points, W/(m²·K)
// (gonum stat.Empirical); NaN without points.
func (r *Result) Percentile(q float64) float64 {
	u := make([]float64, len(r.Points))
	for i, p := range r.Points {
		u[i] = p.U
	}
	return nearestRank(u, q)
}

// CleanU is the run's U_clean, W/(m²·K): without a pack the fitted U at
// the start (UClean); with one the median (nearest rank) of the pack's
// clean U over the points. NaN when there is none.
func (r *Result) CleanU() float64 {
	if !r.CleanFromPack {
		return r.UClean
	}
	u := make([]float64, len(r.Points))
	for i, p := range r.Points {
		u[i] = p.UClean
	}
	return nearestRank(u, 0.5)
}

// nearestRank is the value of rank ⌈q·n⌉ of x (sorted in place): gonum's
// stat.Empirical quantile. NaN for no values.
func nearestRank(x []float64, q float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	slices.Sort(x)
	return stat.Quantile(q, stat.Empirical, x, nil)
}

// MeanU is the mean U of the points stamped in [from, to], W/(m²·K); NaN
// when none is.
func (r *Result) MeanU(from, to float64) float64 {
	sum, n := 0.0, 0
	for _, p := range r.Points {
		if p.Time >= from && p.Time <= to {
			sum += p.U
			n++
		}
	}
	if n == 0 {
		return math.NaN()
	}
	return sum / float64(n)
}

// FirstHour and LastHour are the mean U over the run's first hour (from its
// first sample) and its last hour (to its last sample).
func (r *Result) FirstHour() float64 { return r.MeanU(r.First, r.First+3600) }
func (r *Result) LastHour() float64  { return r.MeanU(r.Last-3600, r.Last) }

// StartU is the chosen fit's U at the first point, W/(m²·K):
// 1/(1/U_clean + R̂_f(0)) with that point's U_clean (or the run's); NaN
// without a fit.
func (r *Result) StartU() float64 { return r.fittedU(0) }

// EndU is the chosen fit's U at the last point, W/(m²·K).
func (r *Result) EndU() float64 {
	if len(r.Points) == 0 {
		return math.NaN()
	}
	return r.fittedU(len(r.Points) - 1)
}

// FittedU is the chosen fit's U at point i, W/(m²·K).
func (r *Result) FittedU(i int) float64 { return r.fittedU(i) }

func (r *Result) fittedU(i int) float64 {
	f, ok := r.Fit()
	if !ok || i >= len(r.Points) {
		return math.NaN()
	}
	p := r.Points[i]
	c := r.UClean
	if r.CleanFromPack {
		c = p.UClean
	}
	return 1 / (1/c + f.At(p.Hours))
}
