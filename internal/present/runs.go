package present

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/oneline"
	"pasval/internal/units"
	"pasval/runs"
)

// The run review in words and tables, shared by the terminal and the
// record: flows and volumes in the recorded flow's volumetric terms and the
// display units, clock times in the review's zone.

// flowPrec and volPrec are the decimals of a flow and a volume in d.
func (d Display) flowPrec() int {
	if d.Sys == units.US {
		return 2
	}
	return 0
}

// RunFlow formats a tube flow (m³/s) of the review in display units.
func RunFlow(r *assess.RunReview, q float64, d Display) string {
	return d.With(r.Model.Recorded(q), units.VolumeFlow, d.flowPrec())
}

// RunVolume formats a tube volume (m³) of the review in display units.
func RunVolume(r *assess.RunReview, v float64, d Display) string {
	return d.With(r.Model.Recorded(v), units.Volume, 1)
}

// Seconds prints a time span in seconds without trailing zeros (to the
// millisecond).
func Seconds(s float64) string {
	return strconv.FormatFloat(math.Round(s*1000)/1000, 'f', -1, 64) + " s"
}

// Span prints a long time span as hours, minutes and seconds.
func Span(s float64) string {
	if s < 60 {
		return Seconds(s)
	}
	whole := math.Round(s)
	h, m, sec := int(whole)/3600, int(whole)%3600/60, int(whole)%60
	if h > 0 {
		return fmt.Sprintf("%d h %02d min %02d s", h, m, sec)
	}
	return fmt.Sprintf("%d min %02d s", m, sec)
}

const clockLayout = "2006-01-02 15:04:05.999"

// RunTime prints a sample time: date and time in the review's zone, or
// seconds from the files' own start.
func RunTime(r *assess.RunReview, s float64) string {
	if t, ok := r.Time(s); ok {
		return t.Format(clockLayout)
	}
	return Seconds(s)
}

// runEnd prints an end time, without the date when it is the start's.
func runEnd(r *assess.RunReview, start, end float64) string {
	a, ok1 := r.Time(start)
	b, ok2 := r.Time(end)
	if ok1 && ok2 && a.Format("2006-01-02") == b.Format("2006-01-02") {
		return b.Format("15:04:05.999")
	}
	return RunTime(r, end)
}

// TimeBasis says how the review's times are shown: "times UTC",
// "times Europe/Berlin", or "times in seconds as the files wrote them".
func TimeBasis(r *assess.RunReview) string {
	if !r.Clock {
		return "times in seconds as the files wrote them"
	}
	return "times " + r.Location.String()
}

// SamplingNote states how far the sampling interval limits the review's
// times (docs/METHOD.md §13.5).
func SamplingNote(r *assess.RunReview) string {
	med := r.Summary.MedianInterval
	if math.IsNaN(med) {
		return "The files hold no two samples at different times: no duration can be resolved."
	}
	return fmt.Sprintf("Event bounds and diversion-response times are resolved only to the sampling interval "+
		"(median %s): each may be up to one interval shorter or longer than what happened.", Seconds(med))
}

// RunFacts is the review's summary as labelled values.
func RunFacts(r *assess.RunReview, d Display) [][2]string {
	s := r.Summary
	var kv [][2]string
	add := func(k, v string) { kv = append(kv, [2]string{k, v}) }
	add("rows", fmt.Sprintf("%d in %d file%s", s.Rows, len(r.Files), plural(len(r.Files))))
	if s.Rows > 0 {
		add("period", fmt.Sprintf("%s → %s (%s)", RunTime(r, s.Start), runEnd(r, s.Start, s.End), Span(s.End-s.Start)))
	}
	add("forward", fmt.Sprintf("%s, %s", Span(s.Forward), RunVolume(r, s.ForwardVolume, d)))
	add("diverted", fmt.Sprintf("%s, %s", Span(s.Diverted), RunVolume(r, s.DivertedVolume, d)))
	if s.ForwardSamples == 0 {
		add("forward flow", "none: nothing went forward")
	} else {
		add("min forward temperature", fmt.Sprintf("%s (setpoint %s)", d.With(s.MinForwardTemperature, units.Temperature, 2),
			d.With(r.Model.Model.Setpoint, units.Temperature, 2)))
		add("max forward flow", fmt.Sprintf("%s (sealed maximum %s)", RunFlow(r, s.MaxForwardFlow, d), RunFlow(r, r.Model.Model.MaxFlow, d)))
		add("min fastest-particle time", residence(s.MinForwardResidence))
		for i, o := range r.Model.Model.Organisms {
			v := logReduction(s.MinForwardLogReduction[i])
			if o.RequiredLogReduction > 0 {
				v += fmt.Sprintf(" (required %.2f)", o.RequiredLogReduction)
			}
			add("min log reduction, "+o.Name, v)
		}
	}
	gaps := fmt.Sprintf("%d", s.Gaps)
	switch {
	case math.IsNaN(s.GapThreshold):
		gaps += " (each file judged with its own limit)"
	case !math.IsInf(s.GapThreshold, 1):
		gaps += fmt.Sprintf(" (an interval over %s in forward flow)", Seconds(s.GapThreshold))
	}
	add("recording gaps", gaps)
	bad := fmt.Sprintf("%d", r.BadRows())
	if r.BadRows() > 0 {
		bad += " skipped"
	}
	add("bad rows", bad)
	add("events", eventCounts(r))
	return kv
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// eventCounts is "none", or "7: 3 limits met, 3 product at risk, 1 no record".
func eventCounts(r *assess.RunReview) string {
	n := r.Events()
	if n == 0 {
		return "none"
	}
	count := map[runs.Verdict]int{}
	for _, f := range r.Files {
		for _, e := range f.Result.Events {
			count[e.Verdict]++
		}
	}
	var parts []string
	for _, v := range []runs.Verdict{runs.LimitsMet, runs.ProductAtRisk, runs.NoRecord} {
		if count[v] > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", count[v], v))
		}
	}
	return fmt.Sprintf("%d: %s", n, strings.Join(parts, ", "))
}

// RunOverall is the review's result in a line.
func RunOverall(r *assess.RunReview) string {
	if r.Events() == 0 {
		return "no event: forward flow stayed within both limits, every parcel met the criteria, and no record is missing"
	}
	return fmt.Sprintf("%d event%s (%s)", r.Events(), plural(r.Events()), strings.SplitN(eventCounts(r), ": ", 2)[1])
}

// SensorLow says, when the plant gives the sensor's accuracy, what the
// review's parcels would have been with every reading lowered by it
// (docs/METHOD.md §13.4): how many forward samples' parcels would fall
// short, and the least log reduction per organism, each beside its value as
// recorded. "" without an accuracy or without forward samples.
func SensorLow(r *assess.RunReview, d Display) string {
	a, s := r.Model.Model.SensorAccuracy, r.Summary
	if !(a > 0) || s.ForwardSamples == 0 {
		return ""
	}
	var b strings.Builder
	whose := "samples'"
	if s.SamplesShortAtSensorLow == 1 {
		whose = "sample's"
	}
	fmt.Fprintf(&b, "with the sensor reading %s low (its stated accuracy), %d forward %s parcels would fall short of a legal row or a "+
		"required log reduction, against %d as recorded", d.With(a, units.TemperatureDifference, 2), s.SamplesShortAtSensorLow, whose, s.SamplesShort)
	orgs := r.Model.Model.Organisms
	for i, o := range orgs {
		switch i {
		case 0:
			b.WriteString("; the least log reduction would be ")
		case len(orgs) - 1:
			b.WriteString(" and ")
		default:
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "%s for %s (%s as recorded)", logReduction(s.MinForwardLogReductionAtSensorLow[i]), o.Name, logReduction(s.MinForwardLogReduction[i]))
	}
	b.WriteString(". The verdicts take the readings as recorded.")
	text := b.String()
	return strings.ToUpper(text[:1]) + text[1:]
}

// runUnitText words a recorded run's implausible column (docs/METHOD.md
// §13.1), with the numbers: what the column mostly holds against what the
// plant file says the line runs at.
func runUnitText(w assess.Warning, d Display) string {
	v := w.Values
	file := oneline.Escape(w.File)
	if w.Code == assess.WarnRunTemperatureUnit {
		return fmt.Sprintf("%s: the median forward %s is %s, %s from the setpoint %s (more than %s): check the units of the column "+
			"(the unit in its header, or --temperature-unit)", file, w.Field, d.With(v["median_C"], units.Temperature, 2),
			d.With(math.Abs(v["median_C"]-v["setpoint_C"]), units.TemperatureDifference, 1), d.With(v["setpoint_C"], units.Temperature, 2),
			d.With(v["limit_K"], units.TemperatureDifference, 0))
	}
	return fmt.Sprintf("%s: the median forward %s is %s, %s × the plant's normal rate %s (outside %s to %s ×): check the units of the column "+
		"(the unit in its header, or --flow-unit)", file, w.Field, d.With(v["median_m3_s"], units.VolumeFlow, d.flowPrec()),
		strconv.FormatFloat(v["median_m3_s"]/v["normal_m3_s"], 'g', 3, 64), d.With(v["normal_m3_s"], units.VolumeFlow, d.flowPrec()),
		strconv.FormatFloat(v["low_ratio"], 'g', -1, 64), strconv.FormatFloat(v["high_ratio"], 'g', -1, 64))
}

// RunWarnings are a review's warnings in words.
func RunWarnings(r *assess.RunReview, d Display) []string {
	out := make([]string, len(r.Warnings))
	for i, w := range r.Warnings {
		out[i] = WarningText(w, r.Plant, d)
	}
	return out
}

// RunWarningsJSON are a review's warnings with their messages, in SI.
func RunWarningsJSON(r *assess.RunReview) []assess.Warning {
	si := Display{Sys: units.SI}
	out := make([]assess.Warning, len(r.Warnings))
	for i, w := range r.Warnings {
		w.Message = WarningText(w, r.Plant, si)
		out[i] = w
	}
	return out
}

// residence prints a fastest-particle residence; +Inf is product that has
// not moved since the run began.
func residence(s float64) string {
	switch {
	case math.IsInf(s, 1):
		return "standing"
	case math.IsNaN(s):
		return "—"
	}
	return fmt.Sprintf("%.2f s", s)
}

func logReduction(v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "unbounded"
	case math.IsNaN(v):
		return "—"
	}
	return fmt.Sprintf("%.2f", v)
}

// BadRowLines lists the first skipped rows' errors over every file, at most
// max, and how many more were skipped.
func BadRowLines(r *assess.RunReview, max int) (lines []string, more int) {
	for _, f := range r.Files {
		for _, e := range f.Listed {
			if len(lines) < max {
				lines = append(lines, e.Error())
			}
		}
	}
	return lines, r.BadRows() - len(lines)
}

// RunFiles is the table of the review's files.
func RunFiles(r *assess.RunReview) Grid {
	g := grid(">#", "file", ">rows", ">bad rows", "sha256")
	for i, f := range r.Files {
		// A file name may hold any byte but '/' and NUL: shown escaped, so it
		// cannot move the cursor or start a line (internal/oneline).
		g.add(fmt.Sprintf("%d", i+1), oneline.Escape(f.Path), fmt.Sprintf("%d", f.Rows), fmt.Sprintf("%d", f.BadRows), f.SHA256)
	}
	return g
}

// RunEvents is what happened in each event: when, how long, the extremes,
// the volume and how fast the flow was diverted.
func RunEvents(r *assess.RunReview, d Display) Grid {
	many := len(r.Files) > 1
	h := []string{">#", "kind", "start", "end", ">duration", ">min temperature", ">max flow", ">volume", ">divert after"}
	if many {
		h = append([]string{">file"}, h...)
	}
	g := grid(h...)
	n := 0
	for fi, f := range r.Files {
		for _, e := range f.Result.Events {
			n++
			div := "—"
			switch {
			case e.DivertAfter != nil:
				div = Seconds(*e.DivertAfter)
			case e.Drop >= 0:
				div = "not diverted"
			}
			row := []string{fmt.Sprintf("%d", n), string(e.Kind), RunTime(r, e.Start), runEnd(r, e.Start, e.End), Seconds(e.Duration),
				d.With(e.MinTemperature, units.Temperature, 2), RunFlow(r, e.MaxFlow, d), RunVolume(r, e.Volume, d), div}
			if many {
				row = append([]string{fmt.Sprintf("%d", fi+1)}, row...)
			}
			g.add(row...)
		}
	}
	return g
}

// RunJudgements is the delivered lethality of each event's parcels and its
// verdict: the least fastest-particle residence per parcel, with the
// per-sample estimate beside it, the least log reduction per organism,
// whether every parcel met a legal row, and the volume at risk.
func RunJudgements(r *assess.RunReview, d Display) Grid {
	h := []string{">#", ">min residence", ">per sample"}
	for _, o := range r.Model.Model.Organisms {
		h = append(h, ">LR "+o.Name)
	}
	if len(r.Model.Model.Legal) > 0 {
		h = append(h, "legal row")
	}
	h = append(h, "verdict", ">at risk")
	g := grid(h...)
	n := 0
	for _, f := range r.Files {
		for _, e := range f.Result.Events {
			n++
			row := []string{fmt.Sprintf("%d", n), residence(e.MinResidence), residence(e.MinSampleResidence)}
			for i := range r.Model.Model.Organisms {
				row = append(row, logReduction(e.MinLogReduction[i]))
			}
			if len(r.Model.Model.Legal) > 0 {
				met := "met"
				switch {
				case e.Kind == runs.KindGap:
					met = "no record"
				case !e.LegalRowMet:
					met = "not met"
				}
				row = append(row, met)
			}
			row = append(row, string(e.Verdict), RunVolume(r, e.AtRiskVolume, d))
			g.add(row...)
		}
	}
	return g
}

// RunDrops is how the flow-diversion device answered each drop of the
// outlet temperature below the setpoint, forward or diverted.
func RunDrops(r *assess.RunReview, d Display) Grid {
	many := len(r.Files) > 1
	h := []string{"start", "end", ">min temperature", "forward below setpoint", ">divert after"}
	if many {
		h = append([]string{">file"}, h...)
	}
	g := grid(h...)
	for fi, f := range r.Files {
		for _, dr := range f.Result.Drops {
			end := runEnd(r, dr.Start, dr.End)
			if !dr.Recovered {
				end += " (run ended)"
			}
			fwd := "no"
			if dr.ForwardBelow {
				fwd = "yes"
			}
			div := "not diverted"
			if dr.DivertAfter != nil {
				div = Seconds(*dr.DivertAfter)
			}
			row := []string{RunTime(r, dr.Start), end, d.With(dr.MinTemperature, units.Temperature, 2), fwd, div}
			if many {
				row = append([]string{fmt.Sprintf("%d", fi+1)}, row...)
			}
			g.add(row...)
		}
	}
	return g
}

// KindMeanings says what each event kind and verdict means, for a legend.
func KindMeanings() [][2]string {
	return [][2]string{
		{string(runs.KindTemperature), "forward flow below the diversion setpoint"},
		{string(runs.KindFlow), "flow above the sealed maximum"},
		{string(runs.KindTemperatureFlow), "both deviations within one event"},
		{string(runs.KindLethality), "forward flow within both limits, but the product leaving was held too short (no legal row met, or a required log reduction missed): it was in the tube during a surge, or the flow was under the seal but below Re 4000"},
		{string(runs.KindGap), "no record for longer than the gap limit during forward flow: no proof either way"},
	}
}
