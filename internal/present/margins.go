package present

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// Margins under uncertainty in words and tables, for the terminal and the
// record alike (docs/METHOD.md §14).

// sig4 prints a number with four significant digits, never in e-notation
// for the magnitudes of a plant file.
func sig4(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	dec := 3 - int(math.Floor(math.Log10(math.Abs(v))))
	if dec > 12 {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	return strconv.FormatFloat(v, 'f', max(dec, 0), 64)
}

// FieldValue prints an entered value of a field (SI in, display units out);
// difference says the value is a tolerance (a temperature's is a difference).
func (d Display) FieldValue(p *plantfile.Plant, path string, v float64, difference bool) string {
	f, _ := plantfile.Lookup(path)
	switch f.Value {
	case plantfile.KindQuantity:
		k := f.Unit
		if k.Name == units.Length.Name && v < 0.5 { // a diameter: mm or in
			unit := map[units.System]string{units.SI: "mm", units.US: "in"}[d.Sys]
			return sig4(units.FromSI(v, k, unit)) + " " + unit
		}
		if k.Name == units.Temperature.Name {
			if difference {
				return d.With(v, units.TemperatureDifference, 2)
			}
			return d.With(v, k, 2)
		}
		return sig4(units.FromSI(v, k, d.Unit(k))) + " " + d.Unit(k)
	case plantfile.KindFlow:
		k := units.VolumeFlow
		for _, in := range p.Inputs {
			if in.Field == path && in.SIUnit == units.MassFlow.SIUnit {
				k = units.MassFlow
			}
		}
		return sig4(units.FromSI(v, k, d.Unit(k))) + " " + d.Unit(k)
	case plantfile.KindConsistency:
		return sig4(v) + " Pa·sⁿ"
	}
	return sig4(v)
}

// MarginInputs is the table of varied inputs: nominal, tolerance and the ends.
func MarginInputs(m *assess.Margins, p *plantfile.Plant, d Display) Grid {
	g := grid("field", ">nominal", ">tolerance", "distribution", ">low end", ">high end")
	for _, in := range m.Inputs {
		g.add(in.Field, d.FieldValue(p, in.Field, in.Nominal, false), in.Tolerance, in.Distribution,
			d.FieldValue(p, in.Field, in.Low, false), d.FieldValue(p, in.Field, in.High, false))
	}
	return g
}

// WorstCase is the worst case of each check: verdict, values, margin and
// the inputs at their ends.
func WorstCase(m *assess.Margins, d Display) Grid {
	g := grid("check", "result", ">required", ">actual", ">margin", "inputs at an end")
	for _, w := range m.WorstCase.Checks {
		c := w.Check()
		verdict := "PASS"
		if !c.Pass {
			verdict = "FAIL"
		}
		op := "≥ "
		if c.Limit == assess.AtMost {
			op = "≤ "
		}
		req, act := CheckValues(c, d)
		g.add(CheckLabel(c), verdict, op+req, act, CheckMargin(c, d), endsText(m, w.Ends))
	}
	return g
}

// endsText names the inputs moved to an end, in the block's order.
func endsText(m *assess.Margins, ends map[string]string) string {
	var parts []string
	for _, in := range m.Inputs {
		if e, ok := ends[in.Field]; ok {
			parts = append(parts, in.Field+" "+e)
		}
	}
	if len(parts) == 0 {
		return "none (no input lowers it)"
	}
	return strings.Join(parts, ", ")
}

// WorstCaseValues are the worst-case fastest-particle time and log reductions.
func WorstCaseValues(m *assess.Margins) string {
	names := m.Organisms
	parts := []string{fmt.Sprintf("fastest particle %.2f s (nominal %.2f s)", m.WorstCase.MinResidenceS, m.Nominal.MinResidenceS)}
	for _, n := range names {
		parts = append(parts, fmt.Sprintf("log reduction of %s %s (nominal %s)", n, LogText(m.WorstCase.LogReductionByOrganism[n]),
			LogText(m.Nominal.LogReductionByOrganism[n])))
	}
	return strings.Join(parts, "; ")
}

// Probabilities is the Monte Carlo table of each check's probability of holding.
func Probabilities(m *assess.Margins) Grid {
	g := grid("check", ">P(holds)", ">standard error")
	for _, pr := range m.MonteCarlo.Checks {
		g.add(CheckLabel(assess.Check{ID: pr.ID, Organism: pr.Organism}), fmt.Sprintf("%.4f", pr.Probability), fmt.Sprintf("%.4f", pr.StandardError))
	}
	if len(m.MonteCarlo.Checks) > 0 {
		a := m.MonteCarlo.AllChecks
		g.add("all checks", fmt.Sprintf("%.4f", a.Probability), fmt.Sprintf("%.4f", a.StandardError))
	}
	return g
}

// MarginPercentiles is the table of percentiles beside the nominal and worst-case values.
func MarginPercentiles(m *assess.Margins) Grid {
	names := m.Organisms
	g := grid("quantity", ">p01", ">p05", ">p50", ">nominal", ">worst case")
	mc := m.MonteCarlo
	g.add("fastest particle, s", fmt.Sprintf("%.2f", mc.MinResidenceS.P01), fmt.Sprintf("%.2f", mc.MinResidenceS.P05),
		fmt.Sprintf("%.2f", mc.MinResidenceS.P50), fmt.Sprintf("%.2f", m.Nominal.MinResidenceS), fmt.Sprintf("%.2f", m.WorstCase.MinResidenceS))
	for _, n := range names {
		p := mc.LogReductionByOrganism[n]
		g.add("log reduction, "+n, LogText(p.P01), LogText(p.P05), LogText(p.P50), LogText(m.Nominal.LogReductionByOrganism[n]),
			LogText(m.WorstCase.LogReductionByOrganism[n]))
	}
	return g
}

// SensitivityTable is each input swung alone, ranked.
func SensitivityTable(m *assess.Margins) Grid {
	names := m.Organisms
	h := []string{"field", ">fastest particle at low → high end, s", ">swing s"}
	for _, n := range names {
		h = append(h, ">swing log, "+n)
	}
	g := grid(h...)
	for _, s := range m.Sensitivity {
		row := []string{s.Field, fmt.Sprintf("%.2f → %.2f", s.LowMinResidenceS, s.HighMinResidenceS), fmt.Sprintf("%.3f", s.SwingS)}
		for _, n := range names {
			row = append(row, fmt.Sprintf("%.3f", s.SwingLogReduction[n]))
		}
		g.add(row...)
	}
	return g
}

// MarginsLine is check's one line on margins: the worst case and the
// probability that every holding-tube check holds.
func MarginsLine(m *assess.Margins, d Display) string {
	var fails []string
	for _, w := range m.WorstCase.Checks {
		if c := w.Check(); !c.Pass {
			if words, ok := FailWords(c); ok {
				fails = append(fails, CheckLabel(c)+" fails ("+words+")")
			} else {
				fails = append(fails, CheckLabel(c)+" fails by "+CheckMargin(c, d))
			}
		}
	}
	mc := m.MonteCarlo
	s := "worst case: all checks hold"
	if len(fails) > 0 {
		s = "worst case: " + strings.Join(fails, ", ")
	}
	if len(mc.Checks) == 0 {
		return s + fmt.Sprintf(" (no holding-tube check applies; %d samples, seed %d)", mc.Samples, mc.Seed)
	}
	return s + fmt.Sprintf("; P(all hold) = %.4f ± %.4f (%d samples, seed %d)", mc.AllChecks.Probability, mc.AllChecks.StandardError, mc.Samples, mc.Seed)
}
