package main

import (
	"fmt"
	"io"

	"pasval/internal/assess"
	"pasval/internal/present"
	"pasval/internal/units"
)

// writeHolding prints the holding tube and lethality blocks shared by check and hold.
func writeHolding(w io.Writer, res *assess.Result, d present.Display) {
	h := res.HoldingTube
	p := res.Plant
	fmt.Fprintf(w, "\nHolding tube (judged at the sealed maximum, %s)\n", d.With(h.MaxFlowM3s, units.VolumeFlow, 0))
	geom := fmt.Sprintf("inner diameter %s, length %s, hold-up %s", d.Small(h.InnerDiameterM), d.With(h.LengthM, units.Length, 2),
		d.With(h.VolumeL/1e3, units.Volume, 1))
	if p.HoldingTube.SanitaryTube.Set {
		geom = p.HoldingTube.SanitaryTube.Text + " sanitary tube, " + geom
	}
	kv := newTable("", "")
	kv.add("tube", geom)
	if h.Slope != nil {
		kv.add("slope", fmt.Sprintf("rise %s = %s (minimum %s)", d.Small(p.HoldingTube.Rise.SI), present.Slope(*h.Slope, d), present.Slope(h.MinSlope, d)))
	}
	rheo := fmt.Sprintf("viscosity %s at the setpoint", d.With(h.ViscosityPas, units.Viscosity, 3))
	if p.Product.PowerLaw != nil {
		rheo = fmt.Sprintf("power law n = %.3g, K = %s", h.FlowIndex, p.Product.PowerLaw.Consistency.Text)
	}
	kv.add("product", fmt.Sprintf("density %s, %s", d.With(h.DensityKgM3, units.Density, 1), rheo))
	ratio := fmt.Sprintf("%.3f", h.FastestToMean)
	if h.FastestToMeanOverridden {
		ratio += " (entered)"
	}
	kv.add("flow", fmt.Sprintf("mean velocity %s, Re %.0f (%s), fastest/mean %s", d.With(h.MeanVelocity, units.Length, 3)+"/s", h.Reynolds, h.Regime, ratio))
	kv.add("residence", fmt.Sprintf("fastest particle %.2f s, mean %.2f s", h.MinResidenceS, h.MeanResidenceS))
	if h.InletTemperatureC != h.OutletTemperatureC {
		kv.add("temperature", fmt.Sprintf("inlet %s → outlet %s with heat loss; the heater delivers %s at the normal rate",
			d.With(h.InletTemperatureC, units.Temperature, 2), d.With(h.OutletTemperatureC, units.Temperature, 2), d.With(h.HeatingOutletC, units.Temperature, 2)))
	} else {
		kv.add("temperature", fmt.Sprintf("%s throughout (no heat loss entered)", d.With(h.OutletTemperatureC, units.Temperature, 2)))
	}
	if h.PasteurizationUnits != nil {
		kv.add("PU", fmt.Sprintf("%.2f pasteurization units (1 PU = 1 min at 60 °C, z = 7 °C)", *h.PasteurizationUnits))
	}
	kv.writeBare(w)

	if len(h.Rows) > 0 {
		fmt.Fprintln(w, "\n  Legal minimums (as entered; rows are never interpolated)")
		t := newTable("row", ">temperature", ">time", "applies", ">length needed", ">max flow")
		for i, r := range h.Rows {
			applies := "no (above setpoint)"
			if r.Applies {
				applies = "yes"
				if h.Legal != nil && h.Legal.RowIndex == i {
					applies = "yes: judged"
				}
			}
			maxFlow := d.With(r.MaxFlowM3s, units.VolumeFlow, 0)
			if r.MaxFlowCapped {
				maxFlow = "≥ " + maxFlow
			}
			t.add(fmt.Sprintf("%d", i+1), d.With(r.TemperatureC, units.Temperature, 1), fmt.Sprintf("%g s", r.TimeS), applies,
				d.With(r.RequiredLengthM, units.Length, 2), maxFlow)
		}
		t.write(w)
	}
	if len(res.Lethality) > 0 {
		fmt.Fprintln(w, "\n  Lethality (fastest particle)")
		t := newTable("organism", ">D at setpoint", ">log reduction", ">required", ">equivalent time at D temperature")
		for _, l := range res.Lethality {
			req := "—"
			for _, o := range p.Organisms {
				if o.Name == l.Organism && o.RequiredSet {
					req = fmt.Sprintf("%.2f", l.RequiredLogReduction)
				}
			}
			t.add(l.Organism, fmt.Sprintf("%.4g s", l.DAtSetpointS), fmt.Sprintf("%.2f", l.LogReduction), req, fmt.Sprintf("%.2f s", l.EquivalentTimeS))
		}
		t.write(w)
	}
}
