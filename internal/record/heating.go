package record

import (
	"fmt"
	"math"
	"unicode"
	"unicode/utf8"

	"pasval/fouling"
	"pasval/internal/assess"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/report"
)

// heatingSection is the run review's page on the heating section
// (docs/METHOD.md §17): U and the fouling resistance against time with the
// fits, what they give, and the forecast. It draws what fouling.Analyse
// returned.
func heatingSection(rev *assess.RunReview, d present.Display) report.Section {
	h := rev.Heating
	run := h.Latest()
	res := run.Result
	blocks := []report.Block{
		report.Paragraph{Text: fmt.Sprintf("The heating section's overall coefficient U = q/(A·ΔT_lm) over clock-aligned windows of %s "+
			"(q from the product side, ΔT_lm from the four mean temperatures, A the installed area); windows with a diverted sample or an "+
			"unsteady flow are left out. The fouling resistance R_f = 1/U − 1/U_clean is fitted against time in two forms and the one of lower "+
			"AIC is used to forecast when the section, rated at the normal rate as the design check rates it, needs a hotter medium than it "+
			"may have (docs/METHOD.md §17).", present.Seconds(h.Width))},
		report.KeyValues{Pairs: append(present.HeatingFacts(rev, d), present.HeatingForecast(rev, d)...)},
		report.Paragraph{Text: sentence(present.CleanBefore(rev, d)), Emphasis: true},
	}
	if len(res.Points) > 0 {
		blocks = append(blocks, uPlot(rev, res, d), foulingPlot(rev, res, d))
	}
	if len(h.Runs) > 1 {
		blocks = append(blocks, tableFrom("U at the start and the end of each run, in date order (the chosen fit's): did cleaning restore it?",
			present.HeatingRuns(rev, d)))
	}
	blocks = append(blocks, report.Paragraph{Text: "The forecast extrapolates a fit of one run; it is a planning aid for cleaning, " +
		"not a food-safety limit: the holding-tube temperature and the flow-diversion device protect the product whatever the heating section does."})
	return report.Section{Heading: "Heating section: U, fouling and the cleaning forecast", NewPage: true, Blocks: blocks}
}

// sentence starts s with a capital letter.
func sentence(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	return string(unicode.ToUpper(r)) + s[n:]
}

// hoursLabel is the time axis of the heating figures.
func hoursLabel(rev *assess.RunReview, res *fouling.Result) string {
	return "hours from " + present.RunTime(rev, res.Points[0].Time) + " (" + present.TimeBasis(rev) + ")"
}

// uPlot is U per window with the chosen fit's U.
func uPlot(rev *assess.RunReview, res *fouling.Result, d present.Display) report.Plot {
	uu := d.Unit(units.HeatTransferCoefficient)
	p := report.Plot{Caption: "U of the heating section per window, and the U the chosen fit of R_f gives.", XLabel: hoursLabel(rev, res),
		YLabel: "U, " + uu}
	measured := report.Series{Name: "U per window", Markers: true}
	fitted := report.Series{Name: "from the " + string(res.Chosen) + " fit"}
	for i, pt := range res.Points {
		measured.X = append(measured.X, pt.Hours)
		measured.Y = append(measured.Y, units.FromSI(pt.U, units.HeatTransferCoefficient, uu))
		if u := res.FittedU(i); !math.IsNaN(u) {
			fitted.X = append(fitted.X, pt.Hours)
			fitted.Y = append(fitted.Y, units.FromSI(u, units.HeatTransferCoefficient, uu))
		}
	}
	p.Series = []report.Series{measured}
	if len(fitted.X) > 0 {
		p.Series = append(p.Series, fitted)
	}
	return p
}

// foulingPlot is R_f per window with both fits, the chosen one carried on
// to the limit it is forecast to reach (when that lies within five spans of
// the data), and the limit's R_f.
func foulingPlot(rev *assess.RunReview, res *fouling.Result, d present.Display) report.Plot {
	fu := d.Unit(units.FoulingResistance)
	conv := func(v float64) float64 { return units.FromSI(v, units.FoulingResistance, fu) }
	largest := 0.0
	for _, pt := range res.Points {
		largest = math.Max(largest, math.Abs(conv(pt.Fouling)))
	}
	var limit *fouling.Forecast
	if _, fc, ok := rev.Heating.CleanBefore(); ok && fc.State == fouling.Ahead {
		limit = &fc
		largest = math.Max(largest, math.Abs(conv(fc.Fouling)))
	}
	exp := 0.0
	if largest > 0 {
		exp = math.Floor(math.Log10(largest))
	}
	scale := math.Pow(10, -exp)
	p := report.Plot{Caption: "Fouling resistance R_f = 1/U − 1/U_clean per window, the fits, and the R_f at which the section reaches its limit.",
		XLabel: hoursLabel(rev, res), YLabel: fmt.Sprintf("R_f, 10%s %s", present.Superscript(int(exp)), fu)}
	measured := report.Series{Name: "R_f per window", Markers: true}
	for _, pt := range res.Points {
		measured.X = append(measured.X, pt.Hours)
		measured.Y = append(measured.Y, conv(pt.Fouling)*scale)
	}
	p.Series = append(p.Series, measured)
	span := res.Points[len(res.Points)-1].Hours
	end := span
	if limit != nil {
		if t := (limit.Time - res.Points[0].Time) / 3600; t > span && t <= 5*math.Max(span, 0.2) {
			end = t
		}
	}
	for _, k := range fouling.FitKinds {
		f, ok := res.Fits[k]
		if !ok {
			continue
		}
		to := span
		if k == res.Chosen {
			to = end
		}
		s := report.Series{Name: string(k) + " fit"}
		for i := 0; i <= 60; i++ {
			t := to * float64(i) / 60
			s.X = append(s.X, t)
			s.Y = append(s.Y, conv(f.At(t))*scale)
		}
		p.Series = append(p.Series, s)
	}
	if limit != nil && end > span {
		y := conv(limit.Fouling) * scale
		p.Series = append(p.Series, report.Series{Name: "R_f at the limit", X: []float64{0, end}, Y: []float64{y, y}})
	}
	return p
}
