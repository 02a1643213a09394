// Package record fills the validation record (report.Document) from the
// results of a plant file: the cover and its verdicts, the inputs with what
// each field means, the method, the heat-exchange tables and temperature
// diagram, the holding tube with the accumulated log reduction, the checks,
// the cautions and the sign-off, and — when the plant file allows it — the
// what-if page of added regeneration plates. It draws only what assess
// returned: no physics is computed here.
//
//	doc, err := record.Build(res, record.Options{Date: day, PlantName: "line2.yaml"})
//	pdf, pages, err := report.Render(doc)
package record

import (
	"fmt"
	"path/filepath"
	"strings"
	"time"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/regen"
	"pasval/report"
)

// Options are the record's inputs beyond the results.
type Options struct {
	Date      time.Time // the record date; also the PDF creation date
	PlantName string    // file name for the attachment
	// LineName is the line file's attachment name (the plant file names one);
	// default LineAttachmentName.
	LineName string
}

// LineAttachmentName is the name a plant's line file is attached under: its
// base name, or "line-" and it when that is the plant file's own.
func LineAttachmentName(p *plantfile.Plant, plantName string) string {
	name := filepath.Base(p.Line.File)
	if name == plantName {
		name = "line-" + name
	}
	return name
}

// Build makes the document from check results. The plant file travels in the
// document (attached and hashed). A rated regenerator with an economics block
// adds the what-if page (WantsWhatIf), whose options are computed here
// through assess.
func Build(res *assess.Result, opts Options) (*report.Document, error) {
	var w *assess.WhatIf
	if p := res.Plant; WantsWhatIf(p) {
		var err error
		if w, err = assess.AddPlates(p, WhatIfSweep(p.Regeneration.Plates.Plates), assess.DefaultKneeFraction, WhatIfLayout(p)); err != nil {
			return nil, err
		}
	}
	if p := res.Plant; len(p.Uncertainty) > 0 && res.Margins == nil {
		// The default samples and seed: a record reproduces from its plant file alone.
		m, err := assess.RunMargins(p, res, assess.MarginOptions{Samples: assess.DefaultSamples, Seed: assess.DefaultSeed})
		if err != nil {
			return nil, err
		}
		with := *res
		with.Margins = m
		res = &with
	}
	return build(res, opts, w), nil
}

// WantsWhatIf says whether a plant's record has the what-if page: a rated
// regenerator (plates entered) with room for more plates
// (plantfile.MaxPlates) and an economics block.
func WantsWhatIf(p *plantfile.Plant) bool {
	return p.Economics != nil && p.Regeneration != nil && p.Regeneration.Plates.Plates > 0 &&
		len(WhatIfSweep(p.Regeneration.Plates.Plates)) > 0
}

// hasPack reports whether any section has a plate pack.
func hasPack(res *assess.Result) bool {
	for _, s := range res.Sections {
		if s.PackFigures != nil {
			return true
		}
	}
	return false
}

// WhatIfLayout is how the record's what-if page adds plates: as channels per
// pass to a regenerator with a plate pack, so that the page shows U falling
// with the velocity (the page says so), and simply as plates otherwise.
func WhatIfLayout(p *plantfile.Plant) assess.Layout {
	if p.Regeneration != nil && p.Regeneration.Pack != nil {
		return assess.LayoutChannels
	}
	return assess.LayoutNone
}

// tableFrom turns a shared grid into a record table.
func tableFrom(caption string, g present.Grid) report.Table {
	t := report.Table{Caption: caption, Rows: g.Rows}
	for i, h := range g.Headers {
		t.Columns = append(t.Columns, report.Column{Title: h, Right: g.Right[i]})
	}
	return t
}

// Statement is printed on the cover.
const Statement = "This record documents an engineering calculation made with pasval from the plant file " +
	"attached to it. It is not a regulatory approval, an inspection or a process-authority letter."

// AcceptanceTests are the tests the record never replaces (SAFETY.md).
var AcceptanceTests = []string{
	"the holding-time test at the sealed maximum flow, on the installed equipment, as the regulator directs;",
	"the flow-diversion device tests (response time, assembly, leak detection, cut-in and cut-out temperatures);",
	"the recorder-controller tests and the check of the indicating and recording thermometers against a certified standard;",
	"the regenerator pressure-differential tests and any booster-pump interlock tests;",
	"any other test the local regulator requires.",
}

func build(res *assess.Result, opts Options, whatIf *assess.WhatIf) *report.Document {
	p := res.Plant
	d := present.Display{Sys: p.System}
	doc := &report.Document{
		Title:     "Pasteurizer validation record",
		SHA256:    res.InputSHA256,
		ShortHash: res.InputSHA256[:12],
		Date:      opts.Date,
		Version:   res.Version,
		PageSize:  "A4",
		Attachments: []report.Attachment{{Name: opts.PlantName, Content: p.Source,
			Description: "plant file, SHA-256 " + res.InputSHA256}},
	}
	if l := p.Line; l != nil {
		name := opts.LineName
		if name == "" {
			name = LineAttachmentName(p, opts.PlantName)
		}
		doc.Attachments = append(doc.Attachments, report.Attachment{Name: name, Content: l.Source,
			Description: "line file named by the plant file (line_file), SHA-256 " + l.SHA256})
	}
	if p.System == units.US {
		doc.PageSize = "Letter"
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
	doc.Cover = buildCover(res, doc)
	doc.Sections = []report.Section{
		inputsSection(res, doc),
		methodSection(res),
	}
	if len(res.Sections) > 0 {
		doc.Sections = append(doc.Sections, heatSection(res, d))
	}
	if res.HoldingTube != nil {
		doc.Sections = append(doc.Sections, holdingSection(res, d))
	}
	doc.Sections = append(doc.Sections, checksSection(res, d))
	if res.Margins != nil {
		doc.Sections = append(doc.Sections, marginsSection(res, d))
	}
	if len(res.Acceptance) > 0 || res.Diversion != nil {
		doc.Sections = append(doc.Sections, acceptanceSection(res, opts, d))
	}
	doc.Sections = append(doc.Sections, limitsSection(res, d))
	if whatIf != nil {
		doc.Sections = append(doc.Sections, whatIfSection(whatIf, d))
	}
	doc.Sections = append(doc.Sections, cautionSection(res), signOffSection())
	return doc
}

func buildCover(res *assess.Result, doc *report.Document) report.Cover {
	p := res.Plant
	c := report.Cover{Statement: Statement, Pass: res.Pass}
	labels := map[string]string{"site": "Site", "line": "Line", "product": "Product", "schedule": "Schedule", "prepared_by": "Prepared by", "notes": "Notes"}
	for _, k := range []string{"site", "line", "product", "schedule", "prepared_by", "notes"} {
		if v := p.RecordValue(k); v != "" {
			c.Fields = append(c.Fields, [2]string{labels[k], v})
		}
	}
	if p.RecordValue("product") == "" {
		c.Fields = append(c.Fields, [2]string{"Product", p.Product.Name})
	}
	if h := res.HoldingTube; h != nil && h.CreditHeatLoss {
		c.Fields = append(c.Fields, [2]string{"Heat-loss credit", "taken: log reductions judged with the heat-loss profile (holding_tube.credit_heat_loss: true)"})
	}
	c.Fields = append(c.Fields,
		[2]string{"Record date", doc.Date.Format("2006-01-02")},
		[2]string{"Plant file", doc.Attachments[0].Name},
		[2]string{"Plant file SHA-256", res.InputSHA256},
	)
	if l := p.Line; l != nil {
		c.Fields = append(c.Fields,
			[2]string{"Line file", doc.Attachments[1].Name + " (line_file: " + p.LineFile + "; every block the plant file does not give)"},
			[2]string{"Line file SHA-256", l.SHA256})
	}
	c.Fields = append(c.Fields, [2]string{"Tool", "pasval " + res.Version})
	for _, ch := range res.Checks {
		c.Verdicts = append(c.Verdicts, report.Verdict{Check: present.CheckLabel(ch), Pass: ch.Pass})
	}
	c.NotJudged = !res.Judged
	c.Overall = "Result: " + present.Overall(res) + "."
	if res.Margins != nil {
		c.Margins = "Margins: " + present.MarginsLine(res.Margins, present.Display{Sys: p.System}) +
			" (the margins page gives the tables)."
	}
	return c
}

func inputsSection(res *assess.Result, doc *report.Document) report.Section {
	t := report.Table{Caption: "Every quantity entered in the plant file, as written and in SI, with what the field means.",
		Columns: []report.Column{{Title: "field"}, {Title: "as entered"}, {Title: "SI value", Right: true}, {Title: "SI unit"}, {Title: "meaning"}}}
	line := res.Plant.Line
	if line != nil {
		t.Caption = "Every quantity entered in the plant file and in the blocks its line file gives, as written and in SI, with the file and what the field means."
		t.Columns = append(t.Columns[:4:4], report.Column{Title: "file"}, t.Columns[4])
	}
	for _, in := range res.Plant.Inputs {
		f, _ := plantfile.Lookup(in.Field)
		unit := in.SIUnit
		if unit == "1" || unit == "" {
			unit = "— (a number)" // dimensionless: no unit to print
		}
		row := []string{in.Field, in.Text, fmt.Sprintf("%.6g", in.SI), unit, f.Description}
		if line != nil {
			from := doc.Attachments[0].Name
			if in.Pos.File == line.File {
				from = doc.Attachments[1].Name
			}
			row = append(row[:4:4], from, f.Description)
		}
		t.Rows = append(t.Rows, row)
	}
	pp := res.Product
	kv := report.KeyValues{Pairs: [][2]string{
		{"product", res.Plant.Product.Name},
		{"density used", fmt.Sprintf("%.1f kg/m³", pp.Density)},
		{"specific heat used", fmt.Sprintf("%.1f J/(kg·K)", pp.SpecificHeat)},
		{"mass flow (normal, sealed maximum)", fmt.Sprintf("%.4f kg/s, %.4f kg/s", pp.MassFlow, pp.MaxMassFlow)},
	}}
	switch f := res.Plant.Flow; {
	case !f.Rate.Set && !f.MaxRate.Set:
		kv.Pairs[3][1] = "none entered (nothing here needs it: no heat-exchange section or holding tube)"
	case !f.MaxRate.Set:
		kv.Pairs[3][1] += " (flow.max_rate not entered: the normal rate is taken as the sealed maximum)"
	case !f.Rate.Set:
		kv.Pairs[3][1] += " (flow.rate not entered: the sealed maximum is taken as the normal rate)"
	}
	if pp.FromComposition {
		kv.Pairs = append(kv.Pairs, [2]string{"properties", "Choi–Okos (1986) from the composition entered"})
	}
	return report.Section{Heading: "Inputs", Blocks: []report.Block{t, kv}}
}

func methodSection(res *assess.Result) report.Section {
	items := []string{
		"Units: every entered quantity carries its unit; calculations are in SI, temperatures in °C (differences in K).",
		"Water media: IAPWS-IF97 region 1 (IAPWS R7-97(2012)); volumetric rates convert to mass at the medium inlet; cp at the mean of inlet and outlet, iterated.",
		"Heat exchange: LMTD ΔT_lm = (ΔT₁ − ΔT₂)/ln(ΔT₁/ΔT₂) and effectiveness–NTU for counterflow and co-current flow (Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., §11.3–11.4); sizing gives the area for a duty, rating gives temperatures for the installed plates.",
		"Regeneration ratio = (raw product leaving regeneration − raw inlet)/(diversion setpoint − raw inlet); the same product on both sides gives C_r = 1, so the ratio equals the effectiveness.",
		"Plates = ceil(area / effective area per plate); required and installed areas are both reported.",
	}
	if hasPack(res) {
		items = append(items,
			"Plate packs (docs/METHOD.md §12): hydraulic diameter 2b/Φ; channel velocity m/(channels per pass · ρ b w), m the side's mass flow; Darcy factor by Martin's correlation in the VDI Heat Atlas form (2010); Nu = 0.122 Pr^(1/3) (μ/μ_w)^(1/6) (ξ Re² sin 2φ)^0.374, μ_w at the wall temperature from the clean resistances, iterated with the section; U_clean = 1/(1/h_product + t/k_w + 1/h_other), 1/U_service = 1/U_clean + fouling; water conductivity IAPWS R15-11, viscosity R12-08.",
			"Pressure drop per side: ξ (passes · L_p/d_h) ρv²/2 + 1.4 · passes · ρ v_port²/2 (port losses after Kakaç and Liu, Heat Exchangers, 2nd ed., 2002); elevation ignored. A section without an entered u_value uses U_service; with one, the entered U is used and the computed one reported beside it.")
	}
	if res.HoldingTube != nil {
		items = append(items,
			"Holding tube: judged for the fastest particle at the worst flow up to the sealed maximum — the seal, or just below Re 4000 where the laminar ratio applies (docs/METHOD.md §7.7) — at the judged temperature: the diversion setpoint less the sensor's stated accuracy (§9.4).",
			"Reynolds number ρvD/μ (Newtonian) or Metzner–Reed (power law; Metzner and Reed 1955), properties at the setpoint. Re < 2100 laminar; 2100–4000 transitional, treated as laminar; ≥ 4000 turbulent.",
			"Fastest-to-mean velocity ratio: 2 (laminar Newtonian), (3n+1)/(n+1) (laminar power law; Steffe 1996), (n_p+1)(2n_p+1)/(2n_p²) with n_p = 0.790 ln Re − 1.64 (turbulent; Petukhov friction factor, power-law velocity profile), unless entered.",
			"Heat loss (when entered): T(x) = T_a + (T_in − T_a)·exp(−h_o π D_o x/(m c_p)), m the mass flow, outlet at the setpoint; it sets the reported tube inlet (m at the sealed maximum) and the heating section's target (m at the normal rate). Its extra lethality rests on an unmeasured coefficient: it is reported as the heat-loss credit and judged only when the plant file sets holding_tube.credit_heat_loss: true.",
			"Lethality: D(T) = D_ref·10^((T_ref − T)/z); the judged log reduction is that of the tube isothermal at the judged temperature, LR = t_min/D(T_j), at the worst flow (with the credit: LR = ∫ dt/D(T) along the profile, Simpson's rule with 1024 intervals, the lower of the candidate flows). Kinetics used more than 10 K from their reference temperature are flagged.",
			"Legal table: met when some row has temperature ≤ the judged temperature and time ≤ the fastest particle's time at the worst flow; rows are never interpolated.",
		)
		if len(res.Acceptance) > 0 {
			items = append(items,
				"Acceptance tests (docs/METHOD.md §15): a holding-time test gives the hold-up the fastest particle saw, V = t·r_test·Q_t, r_test the tested fluid's fastest-to-mean ratio at the test flow (water: IF97 density and IAPWS 2008 viscosity at the test temperature); the product's time is V/(r_p·Q) at the worst flow, judged against the legal table at the judged temperature. Cut-out and cut-in must not be below the judged temperature nor the judged legal row; a sensor check must agree with the reference within the stated accuracy. A latest result past its interval on the record date is stale and fails its check.")
		}
		if res.Diversion != nil {
			items = append(items, "Diversion timing: the fastest particle's travel time from the diversion sensor to the valve at the worst flow of that pipe must be at least the valve's response time (a measured valve-response test wins over the entered one).")
		}
		if res.HoldingTube.CreditHeatLoss {
			items = append(items, "This record judges the log reductions WITH the heat-loss credit (holding_tube.credit_heat_loss: true): a process authority's decision recorded in the plant file.")
		}
	}
	return report.Section{Heading: "Method", Blocks: []report.Block{report.Bullets{Items: items}}}
}

func heatSection(res *assess.Result, d present.Display) report.Section {
	blocks := []report.Block{
		tableFrom("Sections at the normal rate.", present.Sections(res, d)),
		tableFrom("Temperatures, "+d.Unit(units.Temperature)+". Other stream: the pasteurized product in regeneration, the medium elsewhere; in rated heating its inlet is the temperature required.",
			present.Temperatures(res, d)),
	}
	if res.RegenerationRatio != nil {
		blocks = append(blocks, report.KeyValues{Pairs: [][2]string{{"regeneration ratio", fmt.Sprintf("%.1f %%", *res.RegenerationRatio*100)}}})
	}
	if g := present.PackSides(res, d); len(g.Rows) > 0 {
		blocks = append(blocks,
			tableFrom("Plate packs at the normal rate, each side: layout, channel velocity, Reynolds number, film coefficient and pressure drop (Martin's correlation; ports included, elevation ignored).", g),
			tableFrom("Plate packs: overall coefficient clean and in service (with fouling), and the U each section used.", present.PackU(res, d)))
	}
	blocks = append(blocks, temperatureDiagram(res, d))
	for _, s := range res.Sections {
		blocks = append(blocks, tableFrom("Section "+present.SectionLabel(s)+".", present.SectionDetail(res, s, d)))
	}
	if w := warningsAbout(res, d, true); len(w) > 0 {
		blocks = append(blocks, report.Paragraph{Text: "Warnings on the sections:", Emphasis: true}, report.Bullets{Items: w})
	}
	return report.Section{Heading: "Heat exchange", Blocks: blocks}
}

// warningsAbout are the result's warnings in words (notes left out: they
// are listed as notes): those that concern a heat-exchange section
// (sections true), or all the others.
func warningsAbout(res *assess.Result, d present.Display, sections bool) []string {
	var out []string
	for _, w := range res.Warnings {
		if !w.Note && (w.Section != "") == sections {
			out = append(out, present.WarningText(w, res.Plant, d))
		}
	}
	return out
}

// temperatureDiagram lays the product path out in process order: raw side of
// regeneration, heating, holding tube, pasteurized side of regeneration,
// cooling stages; each stretch shows the other stream against it.
func temperatureDiagram(res *assess.Result, d present.Display) report.Diagram {
	T := func(c float64) float64 { return units.FromSI(c, units.Temperature, d.Unit(units.Temperature)) }
	dg := report.Diagram{Unit: d.Unit(units.Temperature), Setpoint: T(res.Plant.Process.HoldSetpoint.SI),
		Caption: "Temperatures at the normal rate along the product path (solid) and of the stream on the other side of each plate pack (broken lines, a colour and pattern for each kind of stream; arrows show its direction)."}
	var regenerator *assess.Section
	for i := range res.Sections {
		if res.Sections[i].Kind == regen.RegenerationSection {
			regenerator = &res.Sections[i]
		}
	}
	// stretch lays one section along the product path: product left to right;
	// the other stream enters at the right when counterflow.
	stretch := func(label string, s assess.Section, productIn, productOut, otherIn, otherOut float64, other string, hot, isProduct bool) report.Segment {
		seg := report.Segment{Label: label, ProductIn: T(productIn), ProductOut: T(productOut), Other: other, OtherIsHot: hot, OtherIsProduct: isProduct}
		if s.Arrangement == "counterflow" {
			seg.OtherAtLeft, seg.OtherAtRight, seg.OtherLeftward = T(otherOut), T(otherIn), true
		} else {
			seg.OtherAtLeft, seg.OtherAtRight = T(otherIn), T(otherOut)
		}
		return seg
	}
	if regenerator != nil {
		s := *regenerator
		dg.Segments = append(dg.Segments, stretch("regeneration (raw)", s, s.ProductInC, s.ProductOutC, s.OtherInC, s.OtherOutC, "pasteurized product", true, true))
	}
	for _, s := range res.Sections {
		if s.Kind == regen.HeatingSection {
			dg.Segments = append(dg.Segments, stretch("heating", s, s.ProductInC, s.ProductOutC, s.OtherInC, s.OtherOutC, present.OtherStream(res.Plant, s), true, false))
		}
	}
	if h := res.HoldingTube; h != nil {
		// At the normal rate, like the sections: the heater delivers HeatingOutletC.
		dg.Segments = append(dg.Segments, report.Segment{Label: "holding tube", ProductIn: T(h.HeatingOutletC), ProductOut: T(h.OutletTemperatureC)})
	}
	if regenerator != nil {
		// The pasteurized side: the product here is the regenerator's other stream.
		s := *regenerator
		dg.Segments = append(dg.Segments, stretch("regeneration (pasteurized)", s, s.OtherInC, s.OtherOutC, s.ProductInC, s.ProductOutC, "raw product", false, true))
	}
	for _, s := range res.Sections {
		if s.Kind == regen.CoolingSection {
			dg.Segments = append(dg.Segments, stretch("cooling: "+s.Stage, s, s.ProductInC, s.ProductOutC, s.OtherInC, s.OtherOutC, present.OtherStream(res.Plant, s), false, false))
		}
	}
	return dg
}

func holdingSection(res *assess.Result, d present.Display) report.Section {
	h := res.HoldingTube
	blocks := []report.Block{report.KeyValues{Pairs: append([][2]string{{"flows", present.HoldingHeading(res, d)}},
		present.HoldingFacts(res, d)...)}}
	if len(h.Rows) > 0 {
		blocks = append(blocks, tableFrom("Legal minimums as entered; the judged row is marked. Rows are never interpolated.", present.LegalRows(res, d)))
	}
	if len(res.Lethality) > 0 {
		plot := report.Plot{Caption: "Accumulated log reduction of the fastest particle along the holding tube.",
			XLabel: "distance from the tube inlet, " + d.Unit(units.Length), YLabel: "log reduction"}
		for _, l := range res.Lethality {
			s := report.Series{Name: l.Organism}
			for _, pt := range l.Along {
				s.X = append(s.X, units.FromSI(pt.X, units.Length, d.Unit(units.Length)))
				s.Y = append(s.Y, pt.LogRed)
			}
			plot.Series = append(plot.Series, s)
		}
		blocks = append(blocks, tableFrom("Log reduction of the fastest particle, judged at the judged temperature and the worst flow; beside it the values where they differ.", present.Lethality(res, d)), plot)
	}
	if w := warningsAbout(res, d, false); len(w) > 0 {
		blocks = append(blocks, report.Paragraph{Text: "Warnings:", Emphasis: true}, report.Bullets{Items: w})
	}
	if n := present.Notes(res, d); len(n) > 0 {
		blocks = append(blocks, report.Paragraph{Text: "Notes:", Emphasis: true}, report.Bullets{Items: n})
	}
	return report.Section{Heading: "Holding tube and lethality", Blocks: blocks}
}

func checksSection(res *assess.Result, d present.Display) report.Section {
	blocks := []report.Block{tableFrom("", present.Checks(res, d))}
	if len(res.Checks) == 0 {
		blocks = []report.Block{report.Paragraph{Text: "No check applies: every section is in sizing mode and no holding tube, kinetics or pressures are described."}}
	}
	blocks = append(blocks, report.Paragraph{Text: "Result: " + present.Overall(res) + ".", Emphasis: true})
	if res.HoldingTube == nil {
		// The warnings and notes that no section concerns are on the holding
		// tube's page; without one, they are here.
		if w := warningsAbout(res, d, false); len(w) > 0 {
			blocks = append(blocks, report.Paragraph{Text: "Warnings:", Emphasis: true}, report.Bullets{Items: w})
		}
		if n := present.Notes(res, d); len(n) > 0 {
			blocks = append(blocks, report.Paragraph{Text: "Notes:", Emphasis: true}, report.Bullets{Items: n})
		}
	}
	return report.Section{Heading: "Checks", Blocks: blocks}
}

// acceptanceSection is the page of the measured acceptance tests, the
// diversion timing and what is due when (docs/METHOD.md §15).
func acceptanceSection(res *assess.Result, opts Options, d present.Display) report.Section {
	var blocks []report.Block
	if len(res.Acceptance) > 0 {
		blocks = append(blocks, tableFrom(fmt.Sprintf("Every result entered, measured against the model, judged on %s. The latest result of each kind is a check; an older one is superseded. A holding-time test is converted to the product at the worst flow.", res.ReviewDate),
			present.AcceptanceTests(res, d)))
	}
	if v := res.Diversion; v != nil {
		c, _ := checkOf(res, assess.DiversionTiming)
		blocks = append(blocks, report.KeyValues{Pairs: [][2]string{
			{"diversion timing", present.CheckNote(c, d)},
			{"travel time", fmt.Sprintf("%.2f s against a response time of %.2f s: %s", v.TravelTimeS, v.ResponseTimeS, map[bool]string{true: "PASS", false: "FAIL"}[v.Pass])},
		}})
	}
	blocks = append(blocks, tableFrom("When each test is due again (intervals as entered in the plant file; pasval invents none).", present.Due(assess.DueList(res, opts.Date))))
	return report.Section{Heading: "Acceptance tests", Blocks: blocks}
}

// checkOf is the result's check with the id.
func checkOf(res *assess.Result, id assess.CheckID) (assess.Check, bool) {
	for _, c := range res.Checks {
		if c.ID == id {
			return c, true
		}
	}
	return assess.Check{}, false
}

// limitsSection is the critical-limit table for the HACCP plan, a draft
// on a page of its own (docs/METHOD.md §15.6): the limits in a table, then
// each limit's monitoring, corrective action, verification and records.
func limitsSection(res *assess.Result, d present.Display) report.Section {
	limits := present.CriticalLimits(res, d)
	caption, from := "The critical limits of the validated schedule.", "the schedule this record validates"
	if !res.Pass || !res.Judged {
		caption = "The critical limits of the schedule, " + present.NotValidated(res) + "."
		from = "the schedule this record judges, which is " + present.NotValidated(res) + " (see the checks)"
	}
	t := report.Table{Caption: caption, Columns: []report.Column{{Title: "what is limited"}, {Title: "critical limit"}}}
	blocks := []report.Block{
		report.Paragraph{Text: "DRAFT for the HACCP team. The limits are taken from " + from + "; the monitoring, " +
			"corrective actions, verification and records are the plant file's haccp: block where it gives them and plain defaults " +
			"otherwise. The HACCP team decides the plan.", Emphasis: true},
	}
	for _, c := range limits {
		t.Rows = append(t.Rows, []string{c.Parameter, c.LimitText})
	}
	blocks = append(blocks, t)
	for i, c := range limits {
		blocks = append(blocks, report.Paragraph{Text: fmt.Sprintf("%d. %s: %s", i+1, c.Parameter, c.LimitText), Emphasis: true},
			report.KeyValues{Pairs: [][2]string{{"monitoring", c.Monitoring}, {"corrective action", c.CorrectiveAction},
				{"verification", c.Verification}, {"records", c.Records}}})
	}
	return report.Section{Heading: "Critical limits (draft for the HACCP team)", Blocks: blocks, NewPage: true}
}

func cautionSection(res *assess.Result) report.Section {
	return report.Section{Heading: "Cautions", Blocks: []report.Block{
		report.Paragraph{Text: res.Caution, Emphasis: true},
		report.Paragraph{Text: "In particular, this record does not replace:"},
		report.Bullets{Items: AcceptanceTests},
		report.Paragraph{Text: "It does not replace the process authority, who sets or accepts the schedule (temperature, time, target organisms and " +
			"log reduction), nor the local regulator and local codes, whose legal minimums differ between places and products and change. " +
			"Results are only as good as the plant file: U-values, plate areas, flows, viscosities and kinetic values must come from the " +
			"equipment maker, measurements or literature the authority accepts. Kinetic values in demonstration files are illustrative."},
	}}
}

func signOffSection() report.Section {
	return report.Section{Heading: "Sign-off", Blocks: []report.Block{
		report.Paragraph{Text: "Signatures confirm that the inputs describe the plant as built and that the results were reviewed; they do not make this record a regulatory approval."},
		report.SignOff{Roles: []string{"Prepared by", "Reviewed by", "Approved by"}},
	}}
}

// WhatIfSweep is the sweep of added plates a record shows: about ten steps up
// to doubling the installed plates, and never beyond plantfile.MaxPlates in
// all (none when the regenerator has that many).
func WhatIfSweep(plates int) []int {
	upTo := min(max(plates, 10), plantfile.MaxPlates-plates)
	step := max(1, (upTo+5)/10)
	var out []int
	for a := step; a <= upTo; a += step {
		out = append(out, a)
	}
	return out
}

func whatIfSection(w *assess.WhatIf, d present.Display) report.Section {
	duty := d.DutyUnit()
	t := report.Table{Caption: "The whole line recomputed with plates added to the regenerator (normal rate).",
		Columns: []report.Column{{Title: "added", Right: true}, {Title: "plates", Right: true}, {Title: "ratio", Right: true},
			{Title: "heating " + duty, Right: true}, {Title: "saved " + duty, Right: true}, {Title: "energy kWh/yr", Right: true},
			{Title: "cost " + w.Currency + "/yr", Right: true}, {Title: "payback years", Right: true}, {Title: "checks"}}}
	ratio := report.Plot{Caption: "Regeneration ratio against regeneration plates.", XLabel: "regeneration plates", YLabel: "regeneration ratio, %"}
	payback := report.Plot{Caption: "Simple payback against added plates.", XLabel: "added plates", YLabel: "payback, years"}
	rs := report.Series{Name: "regeneration ratio"}
	ps := report.Series{Name: "payback"}
	for _, o := range append([]assess.PlatesOption{w.Baseline}, w.Options...) {
		energy, cost, pb := "—", "—", "—"
		if o.AnnualEnergySavedKWh != nil && o.AddedPlates > 0 {
			energy, cost = fmt.Sprintf("%.0f", *o.AnnualEnergySavedKWh), fmt.Sprintf("%.0f", *o.AnnualCostSaved)
		}
		if o.PaybackYears != nil {
			pb = fmt.Sprintf("%.2f", *o.PaybackYears)
			ps.X = append(ps.X, float64(o.AddedPlates))
			ps.Y = append(ps.Y, *o.PaybackYears)
		}
		checks := present.ChecksText(o)
		t.Rows = append(t.Rows, []string{present.AddedLabel(o), fmt.Sprint(o.Plates), fmt.Sprintf("%.1f %%", o.RegenerationRatio*100),
			d.Power(o.HeatingDutyKW * 1e3), d.Power((o.HeatingSavedKW + o.CoolingSavedKW) * 1e3), energy, cost, pb, checks})
		rs.X = append(rs.X, float64(o.Plates))
		rs.Y = append(rs.Y, o.RegenerationRatio*100)
	}
	ratio.Series = []report.Series{rs}
	blocks := []report.Block{t}
	if w.Layout != assess.LayoutNone {
		blocks = append(blocks, tableFrom("The regenerator's plate pack in each option: layout (passes × channels per pass), raw-side velocity, U and raw-side pressure drop.",
			present.PlatesLayout(w, d)))
	}
	blocks = append(blocks, ratio)
	if len(ps.X) > 1 {
		payback.Series = []report.Series{ps}
		blocks = append(blocks, payback)
	}
	notes := append([]string{"Saved is heating plus cooling: each equals C · Δratio · (setpoint − raw inlet)."}, present.LayoutNotes(w)...)
	notes = append(notes, present.NotRejudgedNotes(w)...)
	if w.KneeAdded != nil {
		notes = append(notes, fmt.Sprintf("Knee: beyond +%d plates each further 10 plates save less than %.0f %% of what the first 10 saved.", *w.KneeAdded, w.KneeFraction*100))
	}
	blocks = append(blocks, report.Bullets{Items: notes})
	return report.Section{Heading: "What if: added regeneration plates", Blocks: blocks}
}

// marginsSection is the margins page: the tolerances, the worst case, the
// Monte Carlo estimates and the sensitivity, with bar charts of the swings
// (docs/METHOD.md §14).
func marginsSection(res *assess.Result, d present.Display) report.Section {
	m := res.Margins
	mc := m.MonteCarlo
	blocks := []report.Block{
		report.Paragraph{Text: fmt.Sprintf("The holding tube judged as on the checks page, with the inputs of the plant file's uncertainty block "+
			"varied within their tolerances (docs/METHOD.md §14): every check at the worst case of its inputs, %d Monte Carlo samples "+
			"(seed %d; the same plant file gives the same figures), and each input swung alone. The figures are only as good as the "+
			"tolerances entered.", mc.Samples, mc.Seed)},
		tableFrom("Inputs varied: nominal value, tolerance as entered, distribution (normal: the tolerance is 2σ, draws within ±1.5 times it) and the ends of the tolerance.",
			present.MarginInputs(m, res.Plant, d)),
	}
	if len(m.WorstCase.Checks) > 0 {
		blocks = append(blocks, tableFrom("Worst case: each check with every input at the end of its tolerance that lowers its margin (found by evaluating both ends).",
			present.WorstCase(m, d)))
	}
	blocks = append(blocks, report.Paragraph{Text: "Worst case: " + present.WorstCaseValues(m) + "."})
	if len(mc.Checks) > 0 {
		blocks = append(blocks, tableFrom("Monte Carlo: the probability that each check holds, with its standard error.", present.Probabilities(m)))
	}
	blocks = append(blocks,
		tableFrom("Monte Carlo percentiles (nearest rank) beside the nominal and worst-case values.", present.MarginPercentiles(m)),
		tableFrom("Sensitivity: each input alone at the two ends of its tolerance, the others nominal; ranked by the swing of the fastest particle's time.",
			present.SensitivityTable(m)))
	time := report.BarChart{Caption: "Sensitivity: swing of the fastest particle's time across each input's tolerance.", Unit: "swing of the fastest particle's time, s"}
	for _, s := range m.Sensitivity {
		time.Bars = append(time.Bars, report.Bar{Label: s.Field, Value: s.SwingS})
	}
	blocks = append(blocks, time)
	for _, name := range m.Organisms {
		lr := report.BarChart{Caption: "Sensitivity: swing of the log reduction of " + name + " across each input's tolerance.",
			Unit: "swing of the log reduction of " + name}
		for _, s := range m.Sensitivity {
			lr.Bars = append(lr.Bars, report.Bar{Label: s.Field, Value: s.SwingLogReduction[name]})
		}
		blocks = append(blocks, lr)
	}
	return report.Section{Heading: "Margins under uncertainty", Blocks: blocks}
}
