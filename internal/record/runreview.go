package record

import (
	"fmt"
	"math"
	"strings"
	"time"

	"pasval/internal/assess"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/internal/version"
	"pasval/report"
	"pasval/runs"
)

// The run-review record: what a recorded run did against the plant's
// critical limits (docs/METHOD.md §13), for the corrective-action file. It
// draws what assess and runs returned; no physics is computed here.
//
//	doc := record.BuildRunReview(rev, record.RunOptions{Date: day, PlantName: "line2.yaml"})
//	pdf, pages, err := report.Render(doc)

// RunOptions are the run-review record's inputs beyond the review.
type RunOptions struct {
	Date      time.Time // the record date; also the PDF creation date
	PlantName string    // file name for the attachment
	// Options is how the runs were read, as the command line can read it
	// back (kept in the metadata, for verify); Reading says it in words.
	Options string
	Reading [][2]string
}

// TraceBuckets is how many buckets of each file's trace the record asks
// the engine for (runs.Options.Trace): more than the columns of a page.
const TraceBuckets = 1024

// RunStatement is printed on the run-review record's cover.
const RunStatement = "This record documents a review, made with pasval, of the recorded runs listed in it against the plant file " +
	"attached to it. It is not a regulatory approval, an inspection or a process-authority letter, and it reads the recordings as written."

// BuildRunReview makes the run-review document. The files' results must
// carry their traces (runs.Options.Trace) for the temperature and flow
// figures.
func BuildRunReview(rev *assess.RunReview, opts RunOptions) *report.Document {
	p := rev.Plant
	d := present.Display{Sys: p.System}
	doc := &report.Document{
		Title:     "Run review record",
		SHA256:    p.SHA256,
		ShortHash: p.SHA256[:12],
		Date:      opts.Date,
		Version:   version.Version,
		PageSize:  "A4",
		Attachments: []report.Attachment{{Name: opts.PlantName, Content: p.Source,
			Description: "plant file, SHA-256 " + p.SHA256}},
		Kind:    report.KindRunReview,
		Options: opts.Options,
	}
	if p.System == units.US {
		doc.PageSize = "Letter"
	}
	for _, f := range rev.Files {
		doc.Inputs = append(doc.Inputs, report.InputRef{Name: f.Path, SHA256: f.SHA256})
	}
	var hdr []string
	for _, k := range []string{"site", "line"} {
		if v := p.RecordValue(k); v != "" {
			hdr = append(hdr, v)
		}
	}
	doc.Header = strings.Join(hdr, " · ")
	if doc.Header == "" {
		doc.Header = p.Product.Name
	}
	doc.Cover = runCover(rev, doc, d)
	doc.Sections = []report.Section{
		reviewedSection(rev, opts, d),
		runSummarySection(rev, d),
		trendSection(rev, d),
		eventsSection(rev, d),
	}
	if rev.Heating != nil {
		doc.Sections = append(doc.Sections, heatingSection(rev, d))
	}
	doc.Sections = append(doc.Sections,
		runMethodSection(rev),
		runCautionSection(rev),
		report.Section{Heading: "Sign-off", Blocks: []report.Block{
			report.Paragraph{Text: "Signatures confirm that the recordings reviewed are those of the runs named, and that each event and " +
				"the disposition of the product at risk were reviewed; they do not make this record a regulatory approval."},
			report.SignOff{Roles: []string{"Reviewed by", "Corrective action approved by"}},
		}},
	)
	return doc
}

// eventsOf counts a review's events by what they show.
func eventsOf(rev *assess.RunReview) (temp, flow, atRisk, gaps int) {
	for _, f := range rev.Files {
		for _, e := range f.Result.Events {
			switch e.Kind {
			case runs.KindTemperature:
				temp++
			case runs.KindFlow:
				flow++
			case runs.KindTemperatureFlow:
				temp++
				flow++
			case runs.KindGap:
				gaps++
			case runs.KindLethality:
			default:
				panic(fmt.Sprintf("%sno verdict line for event kind %q", panicPrefix, e.Kind))
			}
			if e.Verdict == runs.ProductAtRisk {
				atRisk++
			}
		}
	}
	return
}

const panicPrefix = "record: "

func runCover(rev *assess.RunReview, doc *report.Document, d present.Display) report.Cover {
	p := rev.Plant
	s := rev.Summary
	c := report.Cover{Statement: RunStatement, Pass: rev.Events() == 0}
	labels := map[string]string{"site": "Site", "line": "Line", "product": "Product", "schedule": "Schedule"}
	for _, k := range []string{"site", "line", "product", "schedule"} {
		if v := p.RecordValue(k); v != "" {
			c.Fields = append(c.Fields, [2]string{labels[k], v})
		}
	}
	if p.RecordValue("product") == "" {
		c.Fields = append(c.Fields, [2]string{"Product", p.Product.Name})
	}
	if s.Rows > 0 {
		c.Fields = append(c.Fields, [2]string{"Period", fmt.Sprintf("%s → %s (%s)", present.RunTime(rev, s.Start), present.RunTime(rev, s.End),
			present.TimeBasis(rev))})
	}
	c.Fields = append(c.Fields,
		[2]string{"Recorded runs", fmt.Sprintf("%d file%s, %d rows (SHA-256 of each in section 1)", len(rev.Files), map[bool]string{true: "s"}[len(rev.Files) != 1], s.Rows)},
		[2]string{"Record date", doc.Date.Format("2006-01-02")},
		[2]string{"Plant file", doc.Attachments[0].Name},
		[2]string{"Plant file SHA-256", p.SHA256},
		[2]string{"Tool", "pasval " + doc.Version},
	)
	temp, flow, atRisk, gaps := eventsOf(rev)
	m := rev.Model.Model
	c.Verdicts = []report.Verdict{
		{Check: "forward flow at or above the diversion setpoint " + d.With(m.Setpoint, units.Temperature, 2), Pass: temp == 0},
		{Check: "forward flow at or below the sealed maximum " + present.RunFlow(rev, m.MaxFlow, d), Pass: flow == 0},
		{Check: "every parcel held to a legal row and the required log reductions", Pass: atRisk == 0},
		{Check: "a record throughout forward flow (no gap)", Pass: gaps == 0},
	}
	c.Overall = "Result: " + present.RunOverall(rev) + "."
	return c
}

func reviewedSection(rev *assess.RunReview, opts RunOptions, d present.Display) report.Section {
	m := rev.Model.Model
	p := rev.Plant
	plant := [][2]string{
		{"diversion setpoint", d.With(m.Setpoint, units.Temperature, 2) + " (process.hold_setpoint)"},
		{"sealed maximum", present.RunFlow(rev, m.MaxFlow, d) + " (flow.max_rate)"},
		{"holding tube", fmt.Sprintf("inner diameter %s, length %s", d.Small(m.Tube.InnerDiameter), d.With(m.Tube.Length, units.Length, 2))},
	}
	var rows []string
	for _, r := range m.Legal {
		rows = append(rows, fmt.Sprintf("%s for %g s", d.With(r.Temperature, units.Temperature, 1), r.Time))
	}
	if len(rows) > 0 {
		plant = append(plant, [2]string{"legal minimums", strings.Join(rows, "; ") + " (never interpolated)"})
	}
	for _, o := range m.Organisms {
		v := fmt.Sprintf("D %g s at %s, z %s", o.D, d.With(o.DTemperature, units.Temperature, 1), d.With(o.Z, units.TemperatureDifference, 1))
		if o.RequiredLogReduction > 0 {
			v += fmt.Sprintf("; required log reduction %g", o.RequiredLogReduction)
		} else {
			v += "; reported, not judged"
		}
		plant = append(plant, [2]string{o.Name, v})
	}
	plant = append(plant, [2]string{"product", p.Product.Name})
	zone := "seconds as the files wrote them"
	if rev.Clock {
		zone = rev.Location.String() + " (clock times written without an offset are read in it, and every time is shown in it)"
	}
	reading := append([][2]string{{"time zone", zone}}, opts.Reading...)
	return report.Section{Heading: "Runs reviewed", Blocks: []report.Block{
		tableFrom("The recorded runs reviewed, with the SHA-256 of each file as read; the files are not attached (a year of one-second samples is "+
			"a gigabyte): keep them, 'pasval verify' re-renders this record from them.", present.RunFiles(rev)),
		report.Paragraph{Text: "Judged against the plant file attached to this record:"},
		report.KeyValues{Pairs: plant},
		report.Paragraph{Text: "Read as:"},
		report.KeyValues{Pairs: reading},
	}}
}

func runSummarySection(rev *assess.RunReview, d present.Display) report.Section {
	blocks := []report.Block{report.KeyValues{Pairs: present.RunFacts(rev, d)}}
	if lines, more := present.BadRowLines(rev, 10); len(lines) > 0 {
		if more > 0 {
			lines = append(lines, fmt.Sprintf("… and %d more", more))
		}
		blocks = append(blocks, report.Paragraph{Text: "Malformed rows skipped (the first of each file):"}, report.Bullets{Items: lines})
	}
	if text := present.SensorLow(rev, d); text != "" {
		blocks = append(blocks, report.Paragraph{Text: text})
	}
	if warnings := present.RunWarnings(rev, d); len(warnings) > 0 {
		blocks = append(blocks, report.Paragraph{Text: "Warnings:"}, report.Bullets{Items: warnings})
	}
	return report.Section{Heading: "Summary", Blocks: blocks}
}

// trendSection draws the temperature and the flow against time.
func trendSection(rev *assess.RunReview, d present.Display) report.Section {
	s := rev.Summary
	m := rev.Model.Model
	start, end := s.Start, s.End
	if !(end > start) {
		end = start + 1
	}
	ticks := timeTicks(rev, start, end)
	var bands []report.Band
	for _, f := range rev.Files {
		for _, e := range f.Result.Events {
			b := report.Band{Start: e.Start, End: e.End}
			switch e.Verdict {
			case runs.ProductAtRisk:
				b.Shade, b.Name = report.ShadeAlert, "event: product at risk"
			case runs.LimitsMet:
				b.Shade, b.Name = report.ShadeNotice, "event: limits met"
			case runs.NoRecord:
				b.Shade, b.Name = report.ShadeUnknown, "gap: no record"
			default:
				panic(fmt.Sprintf("%sno shade for verdict %q", panicPrefix, e.Verdict))
			}
			bands = append(bands, b)
		}
	}
	temp := report.Trend{YLabel: "holding-tube outlet temperature, " + d.Unit(units.Temperature), Start: start, End: end, Ticks: ticks, Bands: bands,
		Limit: units.FromSI(m.Setpoint, units.Temperature, d.Unit(units.Temperature)), LimitLabel: "diversion setpoint " + d.With(m.Setpoint, units.Temperature, 2),
		StateLabels: [2]string{"forward flow", "diverted"},
		Caption:     "Holding-tube outlet temperature against time (" + present.TimeBasis(rev) + ")."}
	fu := d.Unit(units.VolumeFlow)
	flow := report.Trend{YLabel: "flow, " + fu, Start: start, End: end, Ticks: ticks, Bands: bands,
		Limit:       units.FromSI(rev.Model.Recorded(m.MaxFlow), units.VolumeFlow, fu),
		LimitLabel:  "sealed maximum " + present.RunFlow(rev, m.MaxFlow, d),
		StateLabels: [2]string{"forward flow", "diverted"},
		Caption:     "Flow against time, as recorded (" + present.TimeBasis(rev) + ")."}
	for _, f := range rev.Files {
		for _, b := range f.Result.Trace {
			temp.Buckets = append(temp.Buckets, report.TrendBucket{Start: b.Start, End: b.End, First: b.Forward, Second: b.Diverted,
				Min: units.FromSI(b.MinTemperature, units.Temperature, d.Unit(units.Temperature)),
				Max: units.FromSI(b.MaxTemperature, units.Temperature, d.Unit(units.Temperature))})
			flow.Buckets = append(flow.Buckets, report.TrendBucket{Start: b.Start, End: b.End, First: b.Forward, Second: b.Diverted,
				Min: units.FromSI(rev.Model.Recorded(b.MinFlow), units.VolumeFlow, fu),
				Max: units.FromSI(rev.Model.Recorded(b.MaxFlow), units.VolumeFlow, fu)})
		}
	}
	return report.Section{Heading: "Temperature and flow", Blocks: []report.Block{
		report.Paragraph{Text: fmt.Sprintf("Every one of the %d samples is drawn: each pixel column of a figure spans a stretch of time and is "+
			"drawn from the least to the greatest value recorded in it, so no excursion disappears however long the run (the samples are "+
			"summarised as they are read, at most %d stretches of equal time per file, each again the least and greatest of its samples). "+
			"Events are shaded (an event shorter than a column is widened to be seen); the strip under each figure shows whether the "+
			"column's samples were in forward flow, diverted, or both (split).", s.Rows, TraceBuckets)},
		temp, flow,
	}}
}

// tickSteps are the clock-time tick steps, s.
var tickSteps = []float64{1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 10800, 21600, 43200, 86400, 2 * 86400, 7 * 86400,
	14 * 86400, 28 * 86400, 91 * 86400, 182 * 86400, 364 * 86400}

// timeTicks labels the time axis: at most about eight ticks at a round step
// of clock time in the review's zone (or of seconds).
func timeTicks(rev *assess.RunReview, start, end float64) []report.Tick {
	span := end - start
	step := tickSteps[len(tickSteps)-1]
	for _, s := range tickSteps {
		if span/s <= 8 {
			step = s
			break
		}
	}
	var ticks []report.Tick
	if !rev.Clock {
		for v := math.Ceil(start/step) * step; v <= end; v += step {
			ticks = append(ticks, report.Tick{At: v, Label: present.Seconds(v)})
		}
		return ticks
	}
	t0, _ := rev.Time(start)
	// Round down to the step in local time (from local midnight, or the
	// start of the week's day for longer steps).
	day := time.Date(t0.Year(), t0.Month(), t0.Day(), 0, 0, 0, 0, rev.Location)
	first := day
	if step < 86400 {
		for first.Add(time.Duration(step * float64(time.Second))).Before(t0) {
			first = first.Add(time.Duration(step * float64(time.Second)))
		}
	}
	layout := "15:04"
	switch {
	case step >= 86400:
		layout = "2006-01-02"
	case span > 86400:
		layout = "01-02 15:04"
	case step < 60:
		layout = "15:04:05"
	}
	for t := first; ; t = t.Add(time.Duration(step * float64(time.Second))) {
		at := runs.UnixSeconds(t)
		if at > end {
			break
		}
		if at >= start {
			ticks = append(ticks, report.Tick{At: at, Label: t.Format(layout)})
		}
	}
	return ticks
}

func eventsSection(rev *assess.RunReview, d present.Display) report.Section {
	var blocks []report.Block
	if rev.Events() == 0 {
		blocks = append(blocks, report.Paragraph{Text: "No event: forward flow stayed at or above the setpoint and at or below the sealed maximum, " +
			"every parcel met a legal row and the required log reductions, and no record is missing."})
	} else {
		blocks = append(blocks,
			tableFrom("Events ("+present.TimeBasis(rev)+"): when, how long, the extremes, the volume and how soon the flow was diverted.", present.RunEvents(rev, d)),
			tableFrom("Delivered lethality of the product that left during each event: the fastest particle per parcel, with the per-sample "+
				"estimate (the tube at that sample's flow alone) beside it; the verdict and the volume at risk.", present.RunJudgements(rev, d)))
		var kinds [][2]string
		seen := map[runs.EventKind]bool{}
		for _, f := range rev.Files {
			for _, e := range f.Result.Events {
				seen[e.Kind] = true
			}
		}
		for _, kv := range present.KindMeanings() {
			if seen[runs.EventKind(kv[0])] {
				kinds = append(kinds, kv)
			}
		}
		blocks = append(blocks, report.KeyValues{Pairs: kinds})
	}
	if drops := present.RunDrops(rev, d); len(drops.Rows) > 0 {
		blocks = append(blocks, tableFrom("Diversion response: each drop of the outlet temperature below the setpoint, forward or diverted.", drops))
	}
	blocks = append(blocks, report.Paragraph{Text: present.SamplingNote(rev)})
	return report.Section{Heading: "Events and diversion response", Blocks: blocks}
}

func runMethodSection(rev *assess.RunReview) report.Section {
	items := []string{
		"Samples (docs/METHOD.md §13): each sample holds until the next; the last has no duration. A recorded flow is taken as flow.max_rate is: " +
			"to mass with the product density, over the density at the setpoint in the tube; flows and volumes are shown in the recording's own terms.",
		"Deviations: forward flow with the outlet temperature below the diversion setpoint, or flow above the sealed maximum; consecutive deviating " +
			"samples form one event. Forward flow within both limits whose product was still held too short is an event of its own (lethality). " +
			"An interval longer than the gap limit in forward flow is a gap: no record, all its volume at risk.",
		"Delivered lethality per parcel: the parcel leaving at a sample's time carries that sample's temperature; its fastest particle entered when " +
			"∫ r·v dτ, integrated back over the recorded flow, reaches the tube length, v = Q/A and r the fastest-to-mean ratio of each interval's " +
			"Reynolds number at its recorded temperature (docs/METHOD.md §7.4). Its log reduction is that residence over D at the outlet temperature " +
			"(conservative: it was hotter upstream); a legal row is met when its temperature is at most the outlet reading and its time at most the residence.",
		"Diversion response: for each drop below the setpoint, the time from the first sample below it to the first diverted sample; resolved to the sampling interval.",
		"The readings are taken as recorded: the recorder's and the sensor's own accuracy are outside this review.",
	}
	if math.IsNaN(rev.Summary.GapThreshold) {
		items = append(items, "Each file was judged with its own gap limit (5 × its median interval, or as given).")
	}
	if rev.Heating != nil {
		items = append(items, "Heating section (docs/METHOD.md §17): U = q/(A·ΔT_lm) per window from the window's mean temperatures and "+
			"product flow, A the installed area; R_f = 1/U − 1/U_clean, U_clean from the plate pack at each window's conditions or else the "+
			"fitted U at the run's start; linear and asymptotic least-squares fits chosen by AIC; the medium inlet required at the normal rate "+
			"from the same rating as the design check, with U_service = 1/(1/U_clean + R_f(t)); its uncertainty by the delta method, and the "+
			"time to clean 1.645 σ before the central forecast.")
	}
	return report.Section{Heading: "Method", Blocks: []report.Block{report.Bullets{Items: items}}}
}

func runCautionSection(rev *assess.RunReview) report.Section {
	return report.Section{Heading: "Cautions", Blocks: []report.Block{
		report.Paragraph{Text: rev.Caution, Emphasis: true},
		report.Paragraph{Text: "In particular, this record does not replace:"},
		report.Bullets{Items: AcceptanceTests},
		report.Paragraph{Text: "Nor does it decide what becomes of product at risk: the process authority and the local regulator do. " +
			"It is only as good as the recordings and the plant file: a recorder that is out of calibration, a clock that drifted or an " +
			"export that left rows out are outside what it can see."},
	}}
}
