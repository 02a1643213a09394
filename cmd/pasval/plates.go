package main

import (
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/internal/version"
)

type platesOptions struct {
	outputFlags
	file   string
	add    string // "10,20,40"
	sweep  string // "FROM:TO:STEP"
	knee   float64
	layout string // passes or channels, for a regenerator with a plate pack
}

func newPlatesCmd(stdout io.Writer) *cobra.Command {
	var opts platesOptions
	cmd := &cobra.Command{
		Use:   "plates PLANT.yaml (--add N,N,… | --sweep FROM:TO:STEP)",
		Short: "What if the regenerator had more plates: ratio, duties, energy, money, payback",
		Long: `plates recomputes the whole line with plates added to a rated regenerator
(plates: N in the plant file) and prints, for the baseline and each option,
the regeneration ratio, the temperatures leaving regeneration, the heating and
cooling duties, the heating-medium inlet needed and cooling outlet reached
(when those sections are rated), whether every check still passes, and the
savings. With an economics block the savings are priced:

  heating saved = cooling saved = C · Δratio · (setpoint − raw inlet)
  annual cost saved = (heating saved · heat price + cooling saved · cooling price) · hours
  payback = added plates · plate cost / annual cost saved

--sweep also marks the knee: beyond it each further 10 plates save less than
--knee-fraction of what the first 10 saved.

A regenerator with a plate pack (plate, product_side, other_side) needs
--layout: passes adds whole passes to both sides (the channel velocity and U
stay, the pressure drop grows), channels adds channels per pass to both sides
(the velocity falls, and with it U and the pressure drop). Each option is
rounded to whole steps of the layout, U and the pressure drops are computed
for it, and the table gains U and the product-side pressure drop.`,
		Example: `  pasval plates testdata/demo/cider-us.yaml --add 10,20,40
  pasval plates testdata/demo/htst-milk-si.yaml --add 10,20,40 --layout channels
  pasval plates line2.yaml --sweep 5:60:5
  pasval plates line2.yaml --add 20 --json`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			return runPlates(opts, stdout)
		},
	}
	cmd.Long += "\n" + exitStatusHelp + "\n  (1 here: the baseline or an option fails a check)"
	cmd.Flags().StringVar(&opts.add, "add", "", "plates to add, comma-separated (e.g. 10,20,40)")
	cmd.Flags().StringVar(&opts.sweep, "sweep", "", "a range of added plates FROM:TO:STEP (e.g. 5:60:5)")
	cmd.Flags().Float64Var(&opts.knee, "knee-fraction", assess.DefaultKneeFraction, "knee: where 10 more plates save less than this fraction of the first 10")
	cmd.Flags().StringVar(&opts.layout, "layout", "", "with a plate pack: add plates as whole passes or as channels per pass (passes|channels)")
	opts.register(cmd)
	return cmd
}

// parseAdded reads --add or --sweep into a list of added plates.
func parseAdded(add, sweep string) ([]int, error) {
	if (add == "") == (sweep == "") {
		return nil, usagef("give exactly one of --add N,N,… and --sweep FROM:TO:STEP")
	}
	const most = plantfile.MaxPlates
	if add != "" {
		var out []int
		for _, f := range strings.Split(add, ",") {
			n, err := strconv.Atoi(strings.TrimSpace(f))
			if err != nil || n < 1 || n > most {
				return nil, usagef("--add takes whole numbers of plates from 1 to %d, not %q", most, f)
			}
			out = append(out, n)
		}
		return out, nil
	}
	parts := strings.Split(sweep, ":")
	if len(parts) != 3 {
		return nil, usagef("--sweep takes FROM:TO:STEP, e.g. 5:60:5, not %q", sweep)
	}
	var v [3]int
	for i, s := range parts {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil {
			return nil, usagef("--sweep takes whole numbers FROM:TO:STEP, not %q", sweep)
		}
		v[i] = n
	}
	from, to, step := v[0], v[1], v[2]
	// Each bounded before any arithmetic, so no sum or count can overflow.
	if from < 1 || to < from || to > most || step < 1 || step > most || (to-from)/step >= 200 {
		return nil, usagef("--sweep %q: need 1 ≤ FROM ≤ TO ≤ %d, a STEP from 1 to %d and at most 200 options", sweep, most, most)
	}
	out := make([]int, 0, (to-from)/step+1)
	for i := 0; from+i*step <= to; i++ {
		out = append(out, from+i*step)
	}
	return out, nil
}

func runPlates(opts platesOptions, out io.Writer) error {
	added, err := parseAdded(opts.add, opts.sweep)
	if err != nil {
		return err
	}
	if !(opts.knee > 0 && opts.knee < 1) {
		return usagef("--knee-fraction must be between 0 and 1, not %g", opts.knee)
	}
	layout := assess.Layout(opts.layout)
	if layout != assess.LayoutNone && layout != assess.LayoutPasses && layout != assess.LayoutChannels {
		return usagef("--layout must be passes or channels, not %q", opts.layout)
	}
	p, d, err := opts.load(opts.file)
	if err != nil {
		return err
	}
	// The options judge the line's checks, not the acceptance tests' due
	// dates; a result dated in the future is refused all the same.
	on, err := today()
	if err != nil {
		return err
	}
	if err := assess.RefuseFutureTests(p, on); err != nil {
		return err
	}
	w, err := assess.AddPlates(p, added, opts.knee, layout)
	var tooMany *assess.AddedPlatesError
	if errors.As(err, &tooMany) {
		if tooMany.Added < 1 || tooMany.Pos.Line == 0 {
			return usagef("%v", err)
		}
		// The sum is over the limit: point at the installed plates, which
		// the reader may have to check as much as the flag.
		return inputerr.List{inputerr.At(tooMany.Pos, "regeneration.plates",
			"%d installed; --add/--sweep: %v", tooMany.Installed, err)}
	}
	if err != nil {
		return err
	}
	if opts.json {
		if err := writeJSON(out, w); err != nil {
			return err
		}
	} else {
		writePlates(out, p, w, d, opts.sweep != "")
	}
	if !w.Baseline.ChecksPass {
		return errChecksFailed
	}
	for _, o := range w.Options {
		if !o.ChecksPass {
			return errChecksFailed
		}
	}
	return nil
}

func writePlates(w io.Writer, p *plantfile.Plant, wi *assess.WhatIf, d present.Display, sweep bool) {
	fmt.Fprintf(w, "pasval %s · added regeneration plates for %s\n%s", version.Version, p.File, inputHashes(p.SHA256, lineRef(p)))
	duty := d.DutyUnit()
	tu := d.Unit(units.Temperature)
	all := append([]assess.PlatesOption{wi.Baseline}, wi.Options...)
	kneeMark := func(o assess.PlatesOption) string {
		if wi.KneeAdded != nil && *wi.KneeAdded == o.AddedPlates {
			return "◀ knee"
		}
		return ""
	}
	fmt.Fprintf(w, "\nLine with added plates (normal rate)\n")
	if wi.Layout != assess.LayoutNone {
		tableOf(present.PlatesLayout(wi, d)).write(w)
		fmt.Fprintln(w)
	}
	t := newTable(">added", ">plates", ">ratio", ">raw out "+tu, ">pasteurized out "+tu, ">heating "+duty, ">cooling "+duty,
		">medium needed "+tu, ">cooling outlet "+tu, "checks", "")
	for _, o := range all {
		med, cool := "—", "—"
		if o.HeatingMediumRequiredC != nil {
			med = d.Num(*o.HeatingMediumRequiredC, units.Temperature, 1)
		}
		if o.CoolingOutletC != nil {
			cool = d.Num(*o.CoolingOutletC, units.Temperature, 1)
		}
		t.add(present.AddedLabel(o), fmt.Sprint(o.Plates), fmt.Sprintf("%.1f %%", o.RegenerationRatio*100), d.Num(o.RawOutC, units.Temperature, 1),
			d.Num(o.PasteurizedOutC, units.Temperature, 1), d.Power(o.HeatingDutyKW*1e3), d.Power(o.CoolingDutyKW*1e3), med, cool, present.ChecksText(o), kneeMark(o))
	}
	t.write(w)
	if notes := append(present.LayoutNotes(wi), present.NotRejudgedNotes(wi)...); len(notes) > 0 {
		fmt.Fprintln(w)
		for _, note := range notes {
			fmt.Fprint(w, wrap(note, "  ", 88))
		}
	}

	fmt.Fprintf(w, "\nSavings against the baseline\n")
	cur := wi.Currency
	t = newTable(">added", ">heating saved "+duty, ">cooling saved "+duty, ">energy kWh/yr", ">cost "+cur+"/yr", ">payback years", "")
	for _, o := range wi.Options {
		energy, cost, payback := "—", "—", "—"
		if o.AnnualEnergySavedKWh != nil {
			energy = fmt.Sprintf("%.0f", *o.AnnualEnergySavedKWh)
			cost = fmt.Sprintf("%.0f", *o.AnnualCostSaved)
		}
		if o.PaybackYears != nil {
			payback = fmt.Sprintf("%.2f", *o.PaybackYears)
		}
		t.add(fmt.Sprintf("+%d", o.AddedPlates), d.Power(o.HeatingSavedKW*1e3), d.Power(o.CoolingSavedKW*1e3), energy, cost, payback, kneeMark(o))
	}
	t.write(w)
	if p.Economics == nil {
		fmt.Fprintln(w, "\n  (no economics block in the plant file: energy rates only, no annual figures or payback)")
	} else {
		e := p.Economics
		fmt.Fprintf(w, "\n  %g operating hours a year; heat %g and cooling %g %s per kWh; %g %s per added plate installed\n",
			e.OperatingHoursPerYear, e.HeatPricePerKWh, e.CoolingPricePerKWh, e.Currency, e.PlateCost, e.Currency)
	}
	if sweep {
		if wi.KneeAdded != nil {
			fmt.Fprintf(w, "  knee: beyond +%d plates each further 10 plates save less than %.0f %% of what the first 10 saved\n", *wi.KneeAdded, wi.KneeFraction*100)
		} else {
			fmt.Fprintf(w, "  no knee in this range: every 10 plates still save at least %.0f %% of what the first 10 saved\n", wi.KneeFraction*100)
		}
	}
	fmt.Fprint(w, "\n"+wrap(wi.Caution, "Caution:", 88))
}

// lineRef is the line file a plant names, for the header's hashes (nil
// without one).
func lineRef(p *plantfile.Plant) *assess.SourceRef {
	if p.Line == nil {
		return nil
	}
	return &assess.SourceRef{File: p.Line.File, SHA256: p.Line.SHA256}
}
