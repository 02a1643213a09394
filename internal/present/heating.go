package present

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"pasval/fouling"
	"pasval/internal/assess"
	"pasval/internal/oneline"
	"pasval/internal/units"
)

// The heating section over recorded runs in words (docs/METHOD.md §17),
// shared by the terminal and the record: U and its fits, the fouling and
// the cleaning forecast.

// Sci prints a small number as "2.21×10⁻⁵" (three significant digits, a
// true minus sign).
func Sci(v float64) string {
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return "—"
	case v == 0:
		return "0"
	}
	m, e := strconv.FormatFloat(v, 'e', 2, 64), ""
	m, e, _ = strings.Cut(m, "e")
	exp, err := strconv.Atoi(e)
	if err != nil {
		return m
	}
	m = strings.Replace(m, "-", "−", 1)
	if exp == 0 {
		return m
	}
	return m + "×10" + Superscript(exp)
}

// Superscript writes an integer in superscript digits: −5 → ⁻⁵.
func Superscript(n int) string {
	digits := []rune("⁰¹²³⁴⁵⁶⁷⁸⁹")
	var b strings.Builder
	if n < 0 {
		b.WriteRune('⁻')
		n = -n
	}
	for _, c := range strconv.Itoa(n) {
		b.WriteRune(digits[c-'0'])
	}
	return b.String()
}

// fouling prints a fouling resistance in display units.
func (d Display) fouling(v float64) string {
	return Sci(units.FromSI(v, units.FoulingResistance, d.Unit(units.FoulingResistance))) + " " + d.Unit(units.FoulingResistance)
}

// foulingNum is a fouling resistance in display units without its unit.
func (d Display) foulingNum(v float64) string {
	return Sci(units.FromSI(v, units.FoulingResistance, d.Unit(units.FoulingResistance)))
}

// u prints a heat-transfer coefficient without decimals, without its unit.
func (d Display) u(v float64) string {
	if math.IsNaN(v) {
		return "—"
	}
	return d.Num(v, units.HeatTransferCoefficient, 0)
}

// heatingClock prints a time of the heating section: HH:MM in the
// review's zone (with the date when it is not the day of the review's last
// sample), rounded down to the minute; seconds from a start as such.
func heatingClock(r *assess.RunReview, s float64) string {
	t, ok := r.Time(s)
	if !ok {
		return Seconds(math.Floor(s))
	}
	t = t.Truncate(time.Minute)
	if last, ok := r.Time(r.Summary.End); ok && last.Format("2006-01-02") != t.Format("2006-01-02") {
		return t.Format("2006-01-02 15:04")
	}
	return t.Format("15:04")
}

// startClock prints the time origin of the fits: the time of day to the
// second (runEnd's form), or seconds from a start.
func startClock(r *assess.RunReview, s float64) string {
	if t, ok := r.Time(s); ok {
		return t.Format("15:04:05")
	}
	return Seconds(s)
}

// spanH prints an uncertainty: minutes below 1.5 h, else hours.
func spanH(s float64) string {
	switch {
	case math.IsNaN(s):
		return "unknown"
	case s < 5400:
		return fmt.Sprintf("%.0f min", math.Ceil(s/60))
	}
	return fmt.Sprintf("%.1f h", s/3600)
}

// skipWords name the reasons a window gives no U.
func skipWords(s fouling.Skip) string {
	switch s {
	case fouling.SkipDiverted:
		return "with a diverted sample"
	case fouling.SkipUnsteady:
		return fmt.Sprintf("with unsteady flow (range over %.0f %% of the mean)", fouling.UnsteadyFraction*100)
	case fouling.SkipNoReading:
		return "without a heating reading"
	case fouling.SkipCross:
		return "whose temperatures cross"
	case fouling.SkipPack:
		return "where the plate pack could not be rated"
	}
	panic(fmt.Sprintf("%sno words for skip %d", panicPrefix, int(s)))
}

// fitFormula is a fit in display units: "2.15×10⁻⁵ + 2.21×10⁻⁵·t".
func (d Display) fitFormula(f fouling.Fit) string {
	switch f.Kind {
	case fouling.Linear:
		return fmt.Sprintf("%s + %s·t %s", d.foulingNum(f.A), d.foulingNum(f.B), d.Unit(units.FoulingResistance))
	case fouling.Asymptotic:
		return fmt.Sprintf("%s + %s·(1 − e^(−t/%.2f h)) %s", d.foulingNum(f.A), d.foulingNum(f.RInf), f.Tau, d.Unit(units.FoulingResistance))
	}
	panic(fmt.Sprintf("%sno formula for fit kind %q", panicPrefix, f.Kind))
}

// fitNote says how a fit stands: chosen, not determined, or not chosen.
func fitNote(res *fouling.Result, k fouling.FitKind) string {
	f := res.Fits[k]
	switch {
	case !f.Determined:
		return "τ at the end of the range searched: not determined, not used"
	case res.Chosen == k:
		if other, ok := res.Fits[otherFit(k)]; ok && other.Determined {
			return "chosen, the lower AIC"
		}
		return "chosen"
	}
	return "not chosen: the higher AIC"
}

func otherFit(k fouling.FitKind) fouling.FitKind {
	if k == fouling.Linear {
		return fouling.Asymptotic
	}
	return fouling.Linear
}

// HeatingFacts is the heating section of the latest run as labelled values:
// windows, U, U_clean, the fits and the fouling rate.
func HeatingFacts(r *assess.RunReview, d Display) [][2]string {
	h := r.Heating
	run := h.Latest()
	res := run.Result
	var kv [][2]string
	add := func(k, v string) { kv = append(kv, [2]string{k, v}) }
	if len(h.Runs) > 1 {
		add("run", oneline.Escape(run.Path)+" (the latest)")
	}
	win := fmt.Sprintf("%d of %s: %d used", res.Windows, Seconds(h.Width), len(res.Points))
	var skipped []string
	for _, s := range fouling.Skips {
		if n := res.Skipped[s]; n > 0 {
			skipped = append(skipped, fmt.Sprintf("%d %s", n, skipWords(s)))
		}
	}
	if len(skipped) > 0 {
		win += "; skipped " + strings.Join(skipped, ", ")
	}
	add("windows", win)
	uu := d.Unit(units.HeatTransferCoefficient)
	if len(res.Points) == 0 {
		add("U", "no window gives one")
		return kv
	}
	add("U", fmt.Sprintf("p05 %s, p50 %s, p95 %s %s; mean over the first hour %s, over the last %s", d.u(res.Percentile(0.05)),
		d.u(res.Percentile(0.5)), d.u(res.Percentile(0.95)), uu, d.u(res.FirstHour()), d.u(res.LastHour())))
	switch {
	case res.CleanFromPack:
		add("U clean", fmt.Sprintf("%s %s: the plate pack's, at each window's temperatures and flows (median)", d.u(res.CleanU()), uu))
	case !math.IsNaN(res.UClean):
		add("U clean", fmt.Sprintf("%s %s: the fitted U at the run's start (no plate pack)", d.u(res.UClean), uu))
	}
	if h.EnteredU > 0 {
		add("U entered", fmt.Sprintf("%s %s (u_value with its fouling): the design figure, not used here", d.u(h.EnteredU), uu))
	}
	add("fouling R_f", "1/U − 1/U clean against t, h from "+startClock(r, res.Points[0].Time)+" (the first window used)")
	for _, k := range fouling.FitKinds {
		f, ok := res.Fits[k]
		if !ok {
			add("  "+string(k), fmt.Sprintf("not fitted: %d windows, it takes %d", len(res.Points), fouling.MinPoints[k]))
			continue
		}
		add("  "+string(k), fmt.Sprintf("%s (rms residual %s, AIC %s): %s", d.fitFormula(f), d.foulingNum(f.RMS()), aic(f.AIC), fitNote(res, k)))
	}
	if f, ok := res.Fits[fouling.Linear]; ok {
		add("fouling rate", fmt.Sprintf("%s per h (the linear fit's slope)", d.fouling(f.B)))
	}
	return kv
}

// heatingLimitWords say what a limit of the heating section is.
func heatingLimitWords(h *assess.HeatingReview, fc fouling.Forecast, d Display) string {
	switch fc.Limit {
	case fouling.LimitMediumInlet:
		return fmt.Sprintf("the %s available", d.With(fc.Inlet, units.Temperature, 2))
	case fouling.LimitMediumToProduct:
		return fmt.Sprintf("%s, the burn-on limit of %s above the product outlet", d.With(fc.Inlet, units.Temperature, 2),
			d.With(h.Section.MaxMediumToProduct, units.TemperatureDifference, 2))
	}
	panic(fmt.Sprintf("%sno words for limit %q", panicPrefix, fc.Limit))
}

// aic prints an AIC with a true minus sign; −∞ for a fit without residuals.
func aic(v float64) string {
	if math.IsInf(v, -1) {
		return "−∞"
	}
	return strings.Replace(strconv.FormatFloat(v, 'f', 1, 64), "-", "−", 1)
}

// limitLabel names a limit in a list.
func limitLabel(k fouling.LimitKind) string {
	switch k {
	case fouling.LimitMediumInlet:
		return "medium inlet"
	case fouling.LimitMediumToProduct:
		return "burn-on limit"
	}
	panic(fmt.Sprintf("%sno label for limit %q", panicPrefix, k))
}

// HeatingForecast is the forecast of each limit as labelled values.
func HeatingForecast(r *assess.RunReview, d Display) [][2]string {
	h := r.Heating
	res := h.Latest().Result
	var kv [][2]string
	if len(res.Forecasts) == 0 {
		return kv
	}
	sec := h.Section
	kv = append(kv, [2]string{"heating", fmt.Sprintf("at the normal rate %s, from %s to %s (the outlet the plant model requires)",
		d.With(sec.ProductMassFlow/r.Model.ProductDensity, units.VolumeFlow, d.flowPrec()), d.With(sec.ProductIn, units.Temperature, 2),
		d.With(sec.ProductOut, units.Temperature, 2))})
	for _, fc := range res.Forecasts {
		v := ""
		switch fc.State {
		case fouling.Failed:
			v = "not forecast: " + fc.Err.Error()
		default:
			v = fmt.Sprintf("%s required now of %s", requiredWords(fc, d), heatingLimitWords(h, fc, d))
			switch fc.State {
			case fouling.Reached:
				v += ": already reached"
			case fouling.NotReached:
				v += fmt.Sprintf(": the fit never reaches the %s it takes", d.fouling(fc.Fouling))
			case fouling.Ahead:
				v += fmt.Sprintf("; reached at %s ± %s (1 σ), at R_f %s", heatingClock(r, fc.Time), spanH(fc.Sigma), d.fouling(fc.Fouling))
			}
		}
		kv = append(kv, [2]string{limitLabel(fc.Limit), v})
	}
	return kv
}

func requiredWords(fc fouling.Forecast, d Display) string {
	if math.IsInf(fc.RequiredNow, 1) {
		return "no medium temperature"
	}
	return d.With(fc.RequiredNow, units.Temperature, 2)
}

// CleanBefore is the forecast in one sentence: "clean before 13:34 (in 5.6
// h after the last sample): …", "clean now: …", or why there is none.
func CleanBefore(r *assess.RunReview, d Display) string {
	h := r.Heating
	res := h.Latest().Result
	f, ok := res.Fit()
	if !ok {
		return "no cleaning forecast: too few windows give U to fit the fouling (" + strconv.Itoa(len(res.Points)) + ")."
	}
	t, fc, ok := h.CleanBefore()
	if !ok {
		var why []string
		for _, fc := range res.Forecasts {
			switch fc.State {
			case fouling.NotReached:
				why = append(why, fmt.Sprintf("the %s fit never reaches the fouling at which the medium inlet required reaches %s", f.Kind, heatingLimitWords(h, fc, d)))
			case fouling.Failed:
				why = append(why, fmt.Sprintf("%s: %v", limitLabel(fc.Limit), fc.Err))
			}
		}
		return "no cleaning forecast: " + strings.Join(why, "; ") + "."
	}
	if fc.State == fouling.Reached {
		return fmt.Sprintf("clean now: at the last window the heating section at the normal rate already needs %s, beyond %s.",
			requiredWords(fc, d), heatingLimitWords(h, fc, d))
	}
	after := (t - res.Last) / 3600
	when := fmt.Sprintf("in %.1f h after the last sample", after)
	if after < 0 {
		when = fmt.Sprintf("%.1f h before the last sample", -after)
	}
	s := fmt.Sprintf("clean before %s (%s): the %s fit of R_f (%s) reaches %s at %s ± %s (1 σ, delta method), where the heating "+
		"section at the normal rate needs its medium at %s", heatingClock(r, t), when, f.Kind, choiceWords(res), d.fouling(fc.Fouling),
		heatingClock(r, fc.Time), spanH(fc.Sigma), heatingLimitWords(h, fc, d))
	if math.IsNaN(fc.Sigma) {
		return s + "; the fit gives no uncertainty."
	}
	return s + "; the time to clean is 1.645 σ before it (one-sided 95 %)."
}

// choiceWords say why the fit was chosen.
func choiceWords(res *fouling.Result) string {
	other, ok := res.Fits[otherFit(res.Chosen)]
	switch {
	case ok && other.Determined:
		return "chosen by AIC"
	case ok:
		return "the asymptotic fit is not determined"
	}
	return "the only fit"
}

// ForecastBasis is the forecast's basis in words, in SI, for JSON: the fit
// and why it was chosen, where U_clean comes from, the rating, and the
// limit that sets the time to clean.
func ForecastBasis(r *assess.RunReview) string {
	d := Display{Sys: units.SI}
	h := r.Heating
	res := h.Latest().Result
	f, ok := res.Fit()
	if !ok {
		return CleanBefore(r, d)
	}
	clean := "the fitted U at the run's start (no plate pack)"
	if res.CleanFromPack {
		clean = "the plate pack's at each window's temperatures and flows"
	}
	sec := h.Section
	s := fmt.Sprintf("%s fit of R_f = 1/U − 1/U_clean over %d windows of %s (%s); U_clean %s; the heating section rated at the "+
		"normal rate with U_service = 1/(1/U_clean + R_f(t)) to bring the product from %s to %s", f.Kind, len(res.Points), Seconds(h.Width),
		choiceWords(res), clean, d.With(sec.ProductIn, units.Temperature, 2), d.With(sec.ProductOut, units.Temperature, 2))
	_, fc, ok := h.CleanBefore()
	switch {
	case !ok:
		return s + "; " + CleanBefore(r, d)
	case fc.State == fouling.Reached:
		return s + fmt.Sprintf("; at the last window it already needs %s, beyond %s", requiredWords(fc, d), heatingLimitWords(h, fc, d))
	}
	return s + fmt.Sprintf("; the medium inlet required reaches %s at R_f = %s; the time to clean is the time the fit reaches it "+
		"less 1.645 σ (delta method, one-sided 95 %%)", heatingLimitWords(h, fc, d), d.fouling(fc.Fouling))
}

// HeatingRuns is U at the start and end of each run in date order: did
// cleaning restore it?
func HeatingRuns(r *assess.RunReview, d Display) Grid {
	h := r.Heating
	uu := d.Unit(units.HeatTransferCoefficient)
	ref := ">U start / first run's"
	if h.Pack {
		ref = ">U start / U clean"
	}
	g := grid(">#", "file", "start", ">U start "+uu, ">U end "+uu, ">fouling rate "+d.Unit(units.FoulingResistance)+" per h", ref)
	first := math.NaN()
	for i, hr := range h.Runs {
		res := hr.Result
		base := first
		if h.Pack {
			base = res.CleanU()
		}
		if i == 0 {
			first = res.StartU()
			if !h.Pack {
				base = first
			}
		}
		rate := "—"
		if f, ok := res.Fits[fouling.Linear]; ok {
			rate = d.foulingNum(f.B)
		}
		share := "—"
		if s := res.StartU() / base; !math.IsNaN(s) && !math.IsInf(s, 0) {
			share = fmt.Sprintf("%.0f %%", s*100)
		}
		g.add(strconv.Itoa(i+1), oneline.Escape(hr.Path), RunTime(r, res.First), d.u(res.StartU()), d.u(res.EndU()), rate, share)
	}
	return g
}
