package assess

import (
	"math"

	"pasval/fouling"
)

// HeatingJSON is the heating section over the recorded runs in the JSON
// contract (docs/METHOD.md §17): the latest run's U, fouling, fits and
// forecast, and U at the start of every run. SI, units in the keys; a value
// with no JSON number is null.
type HeatingJSON struct {
	File           string         `json:"file"` // the run the figures are of: the latest
	WindowS        float64        `json:"window_s"`
	Windows        int            `json:"windows"`
	WindowsUsed    int            `json:"windows_used"`
	WindowsSkipped map[string]int `json:"windows_skipped"` // by reason (fouling.Skips)
	U              HeatingUJSON   `json:"u_W_m2K"`
	// UCleanWm2K is U_clean: the run's fitted U at its start, or with a
	// plate pack the median of the pack's clean U over the windows;
	// UCleanBasis says which ("run_start", "plate_pack").
	UCleanWm2K  *float64 `json:"u_clean_W_m2K"`
	UCleanBasis string   `json:"u_clean_basis"`
	// FoulingPerH is the linear fit's slope.
	FoulingPerH *float64           `json:"fouling_m2K_W_per_h"`
	Fit         *fouling.FitKind   `json:"fit"` // the chosen fit; null without one
	Fits        map[string]FitJSON `json:"fits"`
	// ForecastCleanBefore is the earliest time to clean over the limits
	// (HeatingReview.CleanBefore); null when no limit is reached or
	// forecast. ForecastBasis says how, in words (internal/present fills it).
	ForecastCleanBefore any              `json:"forecast_clean_before"`
	ForecastBasis       string           `json:"forecast_basis"`
	Forecasts           []ForecastJSON   `json:"forecasts"`
	Runs                []HeatingRunJSON `json:"runs"`
}

// HeatingUJSON is U over the windows: nearest-rank percentiles and the means
// of the first and the last hour, W/(m²·K).
type HeatingUJSON struct {
	P05       *float64 `json:"p05"`
	P50       *float64 `json:"p50"`
	P95       *float64 `json:"p95"`
	FirstHour *float64 `json:"first_hour"`
	LastHour  *float64 `json:"last_hour"`
}

// FitJSON is one fit of R_f against t (h from the first window).
type FitJSON struct {
	AM2KW     float64  `json:"a_m2K_W"`
	BM2KWPerH *float64 `json:"b_m2K_W_per_h,omitempty"`
	RInfM2KW  *float64 `json:"r_inf_m2K_W,omitempty"`
	TauH      *float64 `json:"tau_h,omitempty"`
	// StdErrors are the parameters' standard errors (the square roots of
	// the covariance's diagonal), under the parameters' keys.
	StdErrors       map[string]*float64 `json:"std_errors"`
	Points          int                 `json:"points"`
	RMSResidualM2KW float64             `json:"rms_residual_m2K_W"`
	AIC             *float64            `json:"aic"`
	Determined      bool                `json:"determined"`
}

// ForecastJSON is when one limit of the heating section is reached.
type ForecastJSON struct {
	Limit          fouling.LimitKind `json:"limit"`
	MediumInletC   float64           `json:"medium_inlet_limit_C"`
	RequiredNowC   *float64          `json:"required_medium_inlet_now_C"`
	FoulingNow     *float64          `json:"fouling_now_m2K_W"`
	FoulingAtLimit *float64          `json:"fouling_at_limit_m2K_W"`
	State          fouling.State     `json:"state"`
	At             any               `json:"at"`
	SigmaH         *float64          `json:"sigma_h"`
	CleanBefore    any               `json:"clean_before"`
	Error          string            `json:"error,omitempty"`
}

// HeatingRunJSON is one run's U at its start and end (the chosen fit's),
// for the question whether cleaning restored it.
type HeatingRunJSON struct {
	File        string   `json:"file"`
	Start       any      `json:"start"`
	UStartWm2K  *float64 `json:"u_start_W_m2K"`
	UEndWm2K    *float64 `json:"u_end_W_m2K"`
	FoulingPerH *float64 `json:"fouling_m2K_W_per_h"`
	WindowsUsed int      `json:"windows_used"`
}

// heatingJSON is the review's heating section in the JSON contract.
func (r *RunReview) heatingJSON() *HeatingJSON {
	h := r.Heating
	run := h.Latest()
	res := run.Result
	j := &HeatingJSON{File: run.Path, WindowS: h.Width, Windows: res.Windows, WindowsUsed: len(res.Points), WindowsSkipped: map[string]int{},
		U: HeatingUJSON{P05: number(res.Percentile(0.05)), P50: number(res.Percentile(0.5)), P95: number(res.Percentile(0.95)),
			FirstHour: number(res.FirstHour()), LastHour: number(res.LastHour())},
		Fits: map[string]FitJSON{}, Forecasts: []ForecastJSON{}, Runs: []HeatingRunJSON{}}
	for _, s := range fouling.Skips {
		j.WindowsSkipped[s.String()] = res.Skipped[s]
	}
	j.UCleanBasis, j.UCleanWm2K = "run_start", number(res.CleanU())
	if res.CleanFromPack {
		j.UCleanBasis = "plate_pack"
	}
	if f, ok := res.Fits[fouling.Linear]; ok {
		j.FoulingPerH = number(f.B)
	}
	if f, ok := res.Fit(); ok {
		k := f.Kind
		j.Fit = &k
	}
	for k, f := range res.Fits {
		j.Fits[string(k)] = fitJSON(f)
	}
	if t, _, ok := h.CleanBefore(); ok {
		j.ForecastCleanBefore = r.timeJSON(t)
	}
	for _, fc := range res.Forecasts {
		fj := ForecastJSON{Limit: fc.Limit, MediumInletC: fc.Inlet, RequiredNowC: number(fc.RequiredNow), FoulingNow: number(fc.FoulingNow),
			FoulingAtLimit: number(fc.Fouling), State: fc.State, SigmaH: number(fc.Sigma / 3600)}
		if fc.State == fouling.Ahead {
			fj.At, fj.CleanBefore = r.timeJSON(fc.Time), r.timeJSON(fc.CleanBefore)
		}
		if fc.Err != nil {
			fj.Error = fc.Err.Error()
		}
		j.Forecasts = append(j.Forecasts, fj)
	}
	for _, hr := range h.Runs {
		rj := HeatingRunJSON{File: hr.Path, Start: r.timeJSON(hr.Result.First), UStartWm2K: number(hr.Result.StartU()),
			UEndWm2K: number(hr.Result.EndU()), WindowsUsed: len(hr.Result.Points)}
		if f, ok := hr.Result.Fits[fouling.Linear]; ok {
			rj.FoulingPerH = number(f.B)
		}
		j.Runs = append(j.Runs, rj)
	}
	return j
}

// fitJSON is one fit in the JSON contract.
func fitJSON(f fouling.Fit) FitJSON {
	fj := FitJSON{AM2KW: f.A, Points: f.N, RMSResidualM2KW: f.RMS(), AIC: number(f.AIC), Determined: f.Determined, StdErrors: map[string]*float64{}}
	keys := []string{"a_m2K_W", "b_m2K_W_per_h"}
	if f.Kind == fouling.Asymptotic {
		keys = []string{"a_m2K_W", "r_inf_m2K_W", "tau_h"}
		fj.RInfM2KW, fj.TauH = number(f.RInf), number(f.Tau)
	} else {
		fj.BM2KWPerH = number(f.B)
	}
	for i, k := range keys {
		v := math.NaN()
		if f.Cov != nil {
			v = math.Sqrt(f.Cov[i][i])
		}
		fj.StdErrors[k] = number(v)
	}
	return fj
}
