package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
)

type checkOptions struct {
	file   string
	units  string // "", "si" or "us"
	json   bool
	record string // also write the validation record here
	date   string // record date YYYY-MM-DD
	force  bool   // overwrite the record
	// compare adds the area each section would need in the other arrangement.
	compare bool
}

func newCheckCmd(stdout io.Writer) *cobra.Command {
	var opts checkOptions
	cmd := &cobra.Command{
		Use:   "check PLANT.yaml",
		Short: "Compute every section and judge every check in a plant file",
		Long: `check reads a plant file, sizes or rates each heat-exchange section
(regeneration, heating, cooling stages) and prints the duty, LMTD, NTU,
effectiveness, area, plates and temperatures of each, the regeneration ratio,
and each check with PASS or FAIL, the required and actual values and the margin.`,
		Example: `  pasval check testdata/demo/htst-milk-si.yaml
  pasval check cider.yaml --units si
  pasval check line2.yaml --json > line2.json
  pasval check line2.yaml --record line2.pdf --date 2026-12-01`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			return runCheck(opts, stdout, cmd.ErrOrStderr())
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	cmd.Flags().StringVar(&opts.units, "units", "", "units for printed values: si or us (default: us when the hold setpoint is in °F)")
	cmd.Flags().BoolVar(&opts.json, "json", false, "print the results as JSON (SI units, every key names its unit)")
	cmd.Flags().StringVar(&opts.record, "record", "", "also write the validation record (PDF) to this file, as 'pasval report' does")
	cmd.Flags().StringVar(&opts.date, "date", "", "record date YYYY-MM-DD for --record (default: today)")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the --record file if it exists")
	cmd.Flags().BoolVar(&opts.compare, "compare-arrangements", false, "also show the area each section would need in the other arrangement (counterflow / co-current)")
	return cmd
}

func parseSystem(s string, p *plantfile.Plant) (units.System, error) {
	switch strings.ToLower(s) {
	case "":
		return p.System, nil
	case "si":
		return units.SI, nil
	case "us":
		return units.US, nil
	}
	return units.SI, usagef("--units must be si or us, not %q", s)
}

// runCheck prints results to out; notes about files written go to diag.
func runCheck(opts checkOptions, out, diag io.Writer) error {
	if opts.units != "" && opts.units != "si" && opts.units != "us" {
		return usagef("--units must be si or us, not %q", opts.units)
	}
	date, err := recordDate(opts.date)
	if err != nil {
		return err
	}
	p, err := plantfile.Load(opts.file)
	if err != nil {
		return err
	}
	sys, err := parseSystem(opts.units, p)
	if err != nil {
		return err
	}
	res, err := assess.Run(p)
	if err != nil {
		return err
	}
	if opts.compare {
		assess.CompareArrangements(res)
	}
	if opts.record != "" {
		// Written first, so that a refusal (file exists) comes before any output.
		if err := writeRecord(res, opts.record, date, opts.force, diag); err != nil {
			return err
		}
	}
	if opts.json {
		enc := json.NewEncoder(out)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil {
			return err
		}
	} else {
		writeCheck(out, res, present.Display{Sys: sys}, useColour(out))
	}
	if !res.Pass {
		return errChecksFailed
	}
	return nil
}

func writeCheck(w io.Writer, res *assess.Result, d present.Display, colour bool) {
	p := res.Plant
	fmt.Fprintf(w, "pasval %s · check of %s\n", res.Version, p.File)
	var ids []string
	for _, k := range []string{"site", "line", "product", "schedule"} {
		if v := p.RecordValue(k); v != "" {
			ids = append(ids, v)
		}
	}
	if len(ids) > 0 {
		fmt.Fprintln(w, strings.Join(ids, " · "))
	}
	fmt.Fprintf(w, "input sha256 %s\n\n", res.InputSHA256)

	pp := res.Product
	fmt.Fprintf(w, "Product  %s: density %s, specific heat %s%s\n", p.Product.Name,
		d.With(pp.Density, units.Density, 1), d.With(pp.SpecificHeat, units.SpecificHeat, 3), map[bool]string{true: " (from composition)"}[pp.FromComposition])
	fmt.Fprintf(w, "Flow     %s normal, %s sealed maximum\n",
		d.With(pp.MassFlow/pp.Density, units.VolumeFlow, 0), d.With(pp.MaxMassFlow/pp.Density, units.VolumeFlow, 0))
	pr := p.Process
	fmt.Fprintf(w, "Process  raw %s → hold setpoint %s", d.With(pr.RawInlet.SI, units.Temperature, 1), d.With(pr.HoldSetpoint.SI, units.Temperature, 1))
	if pr.OutletTarget.Set {
		fmt.Fprintf(w, " → outlet target %s", d.With(pr.OutletTarget.SI, units.Temperature, 1))
	}
	fmt.Fprintln(w)

	if len(res.Sections) > 0 {
		writeSections(w, res, d)
	}
	if len(res.ArrangementComparison) > 0 {
		writeComparison(w, res, d)
	}
	if res.HoldingTube != nil {
		writeHolding(w, res, d)
	}
	writeChecks(w, res, d, colour)
	if len(res.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings")
		for _, m := range res.Warnings {
			fmt.Fprint(w, wrap(m, "  !", 88))
		}
	}
	fmt.Fprint(w, "\n"+wrap(res.Caution, "Caution:", 88))
}

func writeSections(w io.Writer, res *assess.Result, d present.Display) {
	area := d.Unit(units.Area)
	duty := "kW"
	if d.Sys == units.US {
		duty = "Btu/h"
	}
	fmt.Fprintf(w, "\nHeat-exchange sections (normal rate)\n")
	t := newTable("section", "mode", "arrangement", ">duty "+duty, ">LMTD "+d.Unit(units.TemperatureDifference),
		">NTU", ">ε", ">required "+area, ">installed "+area, ">plates")
	for _, s := range res.Sections {
		t.add(sectionLabel(s), s.Mode, s.Arrangement, d.Power(s.DutyKW*1e3), d.Num(s.LMTDK, units.TemperatureDifference, 2),
			fmt.Sprintf("%.2f", s.NTU), fmt.Sprintf("%.3f", s.Effectiveness),
			d.Num(s.RequiredAreaM2, units.Area, 2), d.Num(s.InstalledAreaM2, units.Area, 2), fmt.Sprintf("%d", s.Plates))
	}
	t.write(w)

	tu := d.Unit(units.Temperature)
	fmt.Fprintf(w, "\nTemperatures (%s)\n", tu)
	t = newTable("section", ">product in", ">product out", ">other in", ">other out", "other stream")
	for _, s := range res.Sections {
		other := "pasteurized product"
		if s.Name != "regeneration" {
			other = mediumName(res.Plant, s)
		}
		otherIn := d.Num(s.OtherInC, units.Temperature, 2)
		if s.MediumAvailableC != nil {
			other += fmt.Sprintf(" (in: required; %s available)", d.With(*s.MediumAvailableC, units.Temperature, 2))
		}
		t.add(sectionLabel(s), d.Num(s.ProductInC, units.Temperature, 2), d.Num(s.ProductOutC, units.Temperature, 2),
			otherIn, d.Num(s.OtherOutC, units.Temperature, 2), other)
	}
	t.write(w)
	if res.RegenerationRatio != nil {
		fmt.Fprintf(w, "\nRegeneration ratio  %.1f %%\n", *res.RegenerationRatio*100)
	}
}

func sectionLabel(s assess.Section) string {
	if s.Stage != "" {
		return s.Name + ": " + s.Stage
	}
	return s.Name
}

func mediumName(p *plantfile.Plant, s assess.Section) string {
	if s.Name == "heating" && p.Heating != nil {
		return p.Heating.Medium.Name
	}
	for _, c := range p.Cooling {
		if c.Name == s.Stage {
			return c.Medium.Name
		}
	}
	return ""
}

func writeChecks(w io.Writer, res *assess.Result, d present.Display, colour bool) {
	fmt.Fprintln(w, "\nChecks")
	if len(res.Checks) == 0 {
		fmt.Fprintln(w, "  none apply: every section is in sizing mode and no holding tube or kinetics are described")
		fmt.Fprintln(w, "\nResult: no check failed (nothing was judged)")
		return
	}
	t := newTable("check", "result", ">required", ">actual", ">margin", "note")
	t.colour = colour
	failed := 0
	for _, c := range res.Checks {
		verdict := "PASS"
		if !c.Pass {
			verdict = "FAIL"
			failed++
		}
		op := "≥ "
		if c.Limit == "max" {
			op = "≤ "
		}
		id := c.ID
		if c.Organism != "" {
			id += " (" + c.Organism + ")"
		}
		t.add(id, verdict, op+present.CheckValue(c.Required, c.Unit, d), present.CheckValue(c.Actual, c.Unit, d), present.CheckMargin(c, d), c.Note)
	}
	t.write(w)
	if failed == 0 {
		fmt.Fprintf(w, "\nResult: PASS, all %d checks pass\n", len(res.Checks))
	} else {
		fmt.Fprintf(w, "\nResult: FAIL, %d of %d checks fail\n", failed, len(res.Checks))
	}
}

func writeComparison(w io.Writer, res *assess.Result, d present.Display) {
	au := d.Unit(units.Area)
	fmt.Fprintln(w, "\nArrangement comparison (same duty between the same temperatures)")
	t := newTable("section", "arrangement", ">area "+au, "other", ">other area "+au, ">ratio", "note")
	for _, c := range res.ArrangementComparison {
		label := c.Section
		if c.Stage != "" {
			label += ": " + c.Stage
		}
		other, ratio := "impossible", "—"
		if c.OtherAreaM2 != nil {
			other, ratio = d.Num(*c.OtherAreaM2, units.Area, 2), fmt.Sprintf("%.3f×", *c.AreaRatio)
		}
		note := c.Note
		if c.OtherAreaM2 != nil {
			note = ""
		}
		t.add(label, c.Arrangement, d.Num(c.AreaM2, units.Area, 2), c.Other, other, ratio, note)
	}
	t.write(w)
}
