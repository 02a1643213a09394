package present

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/regen"
)

// The matrix of a line's products (pasval matrix and its record): each grid
// has one row per product, in the order the products were given.

// ProductName is a product's name as its plant file gives it.
func ProductName(o assess.OnLine) string { return o.Result.Plant.Product.Name }

// MatrixHolding is each product's schedule and holding tube: setpoint and
// judged temperature, seal flow, the fastest particle's time (at the worst
// flow) against its legal row.
func MatrixHolding(ps []assess.OnLine, d Display) Grid {
	t := d.Unit(units.Temperature)
	g := grid("product", "file", "legal table", ">setpoint "+t, ">judged "+t, ">seal "+d.Unit(units.VolumeFlow), ">fastest s", "legal row")
	for _, o := range ps {
		res := o.Result
		p := res.Plant
		table := p.LegalTable
		if table == "" {
			table = "legal_minimums"
			if len(p.LegalMinimums) == 0 {
				table = "—"
			}
		}
		judged, fastest, row := "—", "—", "—"
		if h := res.HoldingTube; h != nil {
			judged = d.Num(h.JudgedTemperatureC, units.Temperature, 2)
			fastest = fmt.Sprintf("%.2f", h.WorstMinResidenceS)
			if l := h.Legal; l != nil {
				row = fmt.Sprintf("%s %s s", d.With(l.TemperatureC, units.Temperature, 1), trimNum(l.TimeS))
				if l.RowIndex < 0 {
					row += " (above the judged temperature)"
				}
			}
		}
		g.add(ProductName(o), filepath.Base(p.File), table, d.Num(p.Process.HoldSetpoint.SI, units.Temperature, 2), judged,
			d.flowNum(sealOf(res)), fastest, row)
	}
	return g
}

// sealOf is a result's seal flow, m³/s at the setpoint.
func sealOf(res *assess.Result) float64 {
	if res.HoldingTube != nil {
		return res.HoldingTube.MaxFlowM3s
	}
	return res.Product.MaxMassFlow / res.Product.Density
}

func trimNum(v float64) string { return fmt.Sprintf("%g", v) }

// MatrixLethality is each product's judged log reductions against the
// required ones, one row per organism.
func MatrixLethality(ps []assess.OnLine) Grid {
	g := grid("product", "organism", ">log reduction", ">required")
	for _, o := range ps {
		name := ProductName(o)
		for _, l := range o.Result.Lethality {
			req := "—"
			if l.RequiredLogReduction != nil {
				req = fmt.Sprintf("%.2f", *l.RequiredLogReduction)
			}
			g.add(name, l.Organism, fmt.Sprintf("%.2f", l.LogReduction), req)
			name = ""
		}
	}
	return g
}

// MatrixLine is each product through the heat-exchange sections: the
// heating medium needed against the hottest available (a rated heating
// section), the product outlet, the regeneration ratio.
func MatrixLine(ps []assess.OnLine, d Display) Grid {
	t := d.Unit(units.Temperature)
	g := grid("product", ">medium needed "+t, ">available "+t, ">outlet "+t, ">regeneration ratio")
	for _, o := range ps {
		res := o.Result
		needed, avail, outlet, ratio := "—", "—", "—", "—"
		for _, s := range res.Sections {
			switch s.Kind {
			case regen.HeatingSection:
				if s.MediumAvailableC != nil {
					needed, avail = d.Num(s.OtherInC, units.Temperature, 2), d.Num(*s.MediumAvailableC, units.Temperature, 2)
				} else {
					needed = d.Num(s.OtherInC, units.Temperature, 2) + " (sized)"
				}
			case regen.CoolingSection:
				outlet = d.Num(s.ProductOutC, units.Temperature, 2)
			}
		}
		if r := res.RegenerationRatio; r != nil {
			ratio = fmt.Sprintf("%.1f %%", *r*100)
		}
		g.add(ProductName(o), needed, avail, outlet, ratio)
	}
	return g
}

// RelativeText is a relative margin as a signed percentage.
func RelativeText(r float64) string {
	if math.IsInf(r, 0) {
		if r > 0 {
			return "+∞"
		}
		return "−∞"
	}
	return Signed(fmt.Sprintf("%.1f", r*100)) + " %"
}

// MatrixVerdicts is each product's verdict and limiting check: the check
// with the smallest relative margin, among the failing ones when any fails
// (docs/METHOD.md §16.3).
func MatrixVerdicts(ps []assess.OnLine, d Display) Grid {
	g := grid("product", "result", "limiting check", ">margin", ">relative margin")
	for _, o := range ps {
		res := o.Result
		verdict := VerdictWord(res)
		if !o.LimitingOK {
			g.add(ProductName(o), verdict, "none applies", "—", "—")
			continue
		}
		g.add(ProductName(o), verdict, CheckLabel(o.Limiting), CheckMargin(o.Limiting, d), RelativeMarginText(o.Limiting, o.LimitingRelative))
	}
	return g
}

// limitedBy names the checks that fail beyond an envelope's edge.
func limitedBy(b assess.Bound) string {
	switch {
	case len(b.LimitedBy) > 0:
		s := ""
		for i, c := range b.LimitedBy {
			if i > 0 {
				s += ", "
			}
			s += CheckLabel(c)
		}
		return s
	case b.Refused != "":
		return "the plant file is refused beyond it"
	}
	return "—"
}

// MatrixEnvelope is each product's envelope: the highest seal flow that
// passes at its setpoint and the lowest setpoint that passes at its flows,
// each with the checks that fail just beyond it.
func MatrixEnvelope(ps []assess.OnLine, d Display) Grid {
	t := d.Unit(units.Temperature)
	g := grid("product", ">highest seal "+d.Unit(units.VolumeFlow), "limited by", ">lowest setpoint "+t, "limited by")
	for _, o := range ps {
		e := o.Envelope
		flow, flowBy := "none in range", limitedBy(e.MaxSeal)
		switch {
		case e.MaxSeal.Found && e.MaxSeal.AtRangeEnd:
			flow, flowBy = "≥ "+d.flowNum(e.MaxSeal.Value), fmt.Sprintf("(search ends at %g × the seal)", assess.EnvelopeFlowCap)
		case e.MaxSeal.Found:
			flow = d.flowNum(e.MaxSeal.Value)
		}
		sp, spBy := "none in range", limitedBy(e.MinSetpoint)
		switch {
		case e.MinSetpoint.Found && e.MinSetpoint.AtRangeEnd:
			sp, spBy = d.Num(e.MinSetpoint.Value, units.Temperature, 2), "(the search's lowest setpoint passes)"
		case e.MinSetpoint.Found:
			sp = d.Num(e.MinSetpoint.Value, units.Temperature, 2)
		default:
			spBy = "at " + d.With(assess.EnvelopeSetpointTo, units.Temperature, 0) + ": " + spBy
		}
		g.add(ProductName(o), flow, flowBy, sp, spBy)
	}
	return g
}

// flowNum is a volumetric flow without its unit: whole numbers from 1000 up,
// one decimal below (gpm).
func (d Display) flowNum(q float64) string {
	if units.FromSI(q, units.VolumeFlow, d.Unit(units.VolumeFlow)) < 1000 {
		return d.Num(q, units.VolumeFlow, 1)
	}
	return d.Num(q, units.VolumeFlow, 0)
}

// sci prints a small number as 1e-9 rather than 1e-09.
func sci(v float64) string {
	return strings.Replace(strings.Replace(fmt.Sprintf("%g", v), "e-0", "e-", 1), "e+0", "e+", 1)
}

// EnvelopeMethod says how the envelope was searched, in display units.
func EnvelopeMethod(d Display) string {
	return fmt.Sprintf("Highest seal flow: both rates scaled together from the entered ones (the normal rate keeps its proportion to the seal), "+
		"in steps of ×%.3f up to %g × the entered seal (down to 1/%g of it when the seal fails), then bisected to %s relative; "+
		"lowest setpoint: at the entered rates, from %s up in %s steps to %s, then bisected to %s %s. "+
		"Each trial computes the whole plant, every check (docs/METHOD.md §16.3).",
		assess.EnvelopeFlowStep, assess.EnvelopeFlowCap, 1/assess.EnvelopeFlowFloor, sci(assess.EnvelopeFlowTol),
		d.With(assess.EnvelopeSetpointFrom, units.Temperature, 0), d.With(assess.EnvelopeSetpointStep, units.TemperatureDifference, 1),
		d.With(assess.EnvelopeSetpointTo, units.Temperature, 0),
		sci(units.FromSI(assess.EnvelopeSetpointTol, units.TemperatureDifference, d.Unit(units.TemperatureDifference))), d.Unit(units.TemperatureDifference))
}

// MatrixFailing lists every failing check of every product.
func MatrixFailing(ps []assess.OnLine, d Display) Grid {
	g := grid("product", "check", ">required", ">actual", ">margin")
	for _, o := range ps {
		for _, c := range o.Result.Checks {
			if c.Pass {
				continue
			}
			op := "≥ "
			if c.Limit == assess.AtMost {
				op = "≤ "
			}
			req, act := CheckValues(c, d)
			g.add(ProductName(o), CheckLabel(c), op+req, act, CheckMargin(c, d))
		}
	}
	return g
}

// MatrixOverall is the matrix's one-line result.
func MatrixOverall(ps []assess.OnLine) string {
	var failed []string
	var unjudged []string
	for _, o := range ps {
		switch {
		case !o.Result.Pass:
			failed = append(failed, ProductName(o))
		case !o.Result.Judged:
			unjudged = append(unjudged, ProductName(o))
		}
	}
	switch {
	case len(failed) == 0 && len(unjudged) == len(ps):
		return NotJudged + " to any product"
	case len(failed) == 0 && len(unjudged) > 0:
		return fmt.Sprintf("PASS, %d of %d products pass; %d NOT JUDGED (no check applies): %s", len(ps)-len(unjudged), len(ps),
			len(unjudged), strings.Join(unjudged, ", "))
	case len(failed) == 0:
		return fmt.Sprintf("PASS, all %d products pass", len(ps))
	}
	s := fmt.Sprintf("FAIL, %d of %d products fail: ", len(failed), len(ps))
	for i, n := range failed {
		if i > 0 {
			s += ", "
		}
		s += n
	}
	return s
}

// MatrixLineWarnings are the line file's warnings in words, each followed by
// the product files it concerns.
func MatrixLineWarnings(line *plantfile.Plant, ps []assess.OnLine, d Display) []string {
	var out []string
	var plants []*plantfile.Plant
	for _, o := range ps {
		plants = append(plants, o.Result.Plant)
	}
	for _, w := range assess.LineWarnings(line, plants) {
		text := WarningText(w, line, d)
		var files []string
		for _, p := range plants {
			if b := assess.Inherited(p); len(b) > 0 {
				files = append(files, filepath.Base(p.File)+" takes "+strings.Join(b, ", "))
			}
		}
		if len(files) > 0 {
			text += ": " + strings.Join(files, "; ")
		}
		out = append(out, text)
	}
	return out
}
