package fouling

import (
	"fmt"
	"math"

	"pasval/regen"
)

// LimitKind names a limit of the heating section the forecast looks for.
type LimitKind string

const (
	// LimitMediumInlet: the medium inlet required reaches the hottest
	// available (the section's Spec.Inlet).
	LimitMediumInlet LimitKind = "medium-inlet"
	// LimitMediumToProduct: the medium inlet required less the product
	// outlet reaches Section.MaxMediumToProduct (a burn-on limit).
	LimitMediumToProduct LimitKind = "medium-to-product"
)

// State says what a forecast found.
type State string

const (
	// Ahead: the chosen fit reaches the limit's fouling after the last point.
	Ahead State = "ahead"
	// Reached: at the fit's fouling at the last point the limit is already
	// reached.
	Reached State = "reached"
	// NotReached: the fit never reaches the limit's fouling (a slope that is
	// not positive, or an asymptote below it).
	NotReached State = "not-reached"
	// Failed: the section could not be rated (Err).
	Failed State = "failed"
)

// OneSidedZ is the standard normal quantile of 0.95: CleanBefore lies
// OneSidedZ standard uncertainties before the central forecast, a one-sided
// 95 % bound under the normal approximation of the delta method.
const OneSidedZ = 1.6448536269514722

// Forecast is when one limit is reached.
type Forecast struct {
	Limit LimitKind
	// Inlet is the medium inlet at the limit, °C: the hottest available, or
	// the product outlet plus the burn-on limit.
	Inlet float64
	// FoulingNow is the chosen fit's R_f at the last point, m²·K/W, and
	// RequiredNow the medium inlet the section requires with it, °C (NaN when
	// the rating failed, +Inf when no medium temperature delivers the outlet).
	FoulingNow, RequiredNow float64
	// Fouling is the R_f at which the required inlet reaches Inlet, m²·K/W
	// (NaN when Reached or Failed).
	Fouling float64
	State   State
	// Time is when the fit reaches Fouling, s on the samples' time axis;
	// Sigma its standard uncertainty by the delta method, s (NaN without a
	// covariance); CleanBefore = Time − OneSidedZ·Sigma (Time when Sigma is
	// NaN). NaN unless Ahead.
	Time, Sigma, CleanBefore float64
	Err                      error // Failed: why
}

// forecast finds, for each limit, the fouling at which the section at the
// normal rate reaches it and when the chosen fit gets there:
//
//	T_req(R) = Section.Rate(U_clean, R).OtherIn, rising with R
//	R*: T_req(R*) = T_limit, by bisection from the fit's R_f at the last point
//	t*: R̂_f(t*) = R* (Fit.Reaches), σ_t = √(gᵀ C g) (the delta method)
//	clean before t* − 1.645 σ_t
//
// A rating that no medium temperature can deliver (regen.IsInfeasible)
// counts as beyond every limit.
//
// References: docs/METHOD.md §17.3 (forecast).
func (r *Result) forecast(s Section) {
	limits := []Forecast{{Limit: LimitMediumInlet, Inlet: s.Spec.Inlet}}
	if s.MaxMediumToProduct > 0 {
		limits = append(limits, Forecast{Limit: LimitMediumToProduct, Inlet: s.ProductOut + s.MaxMediumToProduct})
	}
	f, _ := r.Fit()
	last := r.Points[len(r.Points)-1]
	ref := math.Abs(r.Points[0].Fouling) + 1/last.U // the scale of R_f: the whole resistance
	required := func(rf float64) (float64, error) {
		sec, err := s.Rate(r.UClean, rf)
		switch {
		case regen.IsInfeasible(err):
			return math.Inf(1), nil
		case err != nil:
			return math.NaN(), err
		}
		return sec.OtherIn, nil
	}
	for _, fc := range limits {
		fc.Fouling, fc.Time, fc.Sigma, fc.CleanBefore = math.NaN(), math.NaN(), math.NaN(), math.NaN()
		fc.FoulingNow = f.At(last.Hours)
		now, err := required(fc.FoulingNow)
		fc.RequiredNow = now
		switch {
		case err != nil:
			fc.State, fc.Err = Failed, err
		case now >= fc.Inlet:
			fc.State = Reached
		default:
			fc.Fouling, err = foulingAt(required, fc.FoulingNow, fc.Inlet, ref)
			if err != nil {
				fc.State, fc.Err = Failed, err
				break
			}
			t, g, ok := f.Reaches(fc.Fouling)
			if !ok {
				fc.State = NotReached
				break
			}
			fc.State = Ahead
			fc.Time = r.Points[0].Time + t*3600
			fc.Sigma = math.Sqrt(f.Variance(g)) * 3600
			fc.CleanBefore = fc.Time
			if !math.IsNaN(fc.Sigma) {
				fc.CleanBefore -= OneSidedZ * fc.Sigma
			}
		}
		r.Forecasts = append(r.Forecasts, fc)
	}
}

// foulingAt finds R* > from with required(R*) = target, required rising in
// R and below target at from: the step above from doubles (from 5 % of
// scale) until the target is passed, then bisection to 10⁻¹² of scale.
func foulingAt(required func(float64) (float64, error), from, target, scale float64) (float64, error) {
	lo, hi := from, from
	step := 0.05 * scale
	for i := 0; ; i++ {
		if i == 64 {
			return math.NaN(), fmt.Errorf("no fouling up to %g m²·K/W brings the required medium inlet to %.2f °C", hi, target)
		}
		hi = from + step
		v, err := required(hi)
		if err != nil {
			return math.NaN(), err
		}
		if v >= target {
			break
		}
		lo, step = hi, 2*step
	}
	for range 200 {
		if hi-lo <= 1e-12*scale {
			break
		}
		mid := (lo + hi) / 2
		v, err := required(mid)
		if err != nil {
			return math.NaN(), err
		}
		if v >= target {
			hi = mid
		} else {
			lo = mid
		}
	}
	return (lo + hi) / 2, nil
}
