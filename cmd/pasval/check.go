package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/present"
	"pasval/internal/units"
)

type checkOptions struct {
	outputFlags
	file   string
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
	opts.register(cmd)
	cmd.Flags().StringVar(&opts.record, "record", "", "also write the validation record (PDF) to this file, as 'pasval report' does")
	cmd.Flags().StringVar(&opts.date, "date", "", "review date YYYY-MM-DD: acceptance tests are judged on it, and it is the --record date (default: today)")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the --record file if it exists")
	cmd.Flags().BoolVar(&opts.compare, "compare-arrangements", false, "also show the area each section would need in the other arrangement (counterflow / co-current)")
	return cmd
}

// runCheck prints results to out; notes about files written go to diag.
func runCheck(opts checkOptions, out, diag io.Writer) error {
	date, err := recordDate(opts.date)
	if err != nil {
		return err
	}
	p, d, err := opts.load(opts.file)
	if err != nil {
		return err
	}
	res, err := assess.RunWith(p, assess.Options{On: date})
	if err != nil {
		return err
	}
	if opts.compare {
		assess.CompareArrangements(res)
	}
	if len(p.Uncertainty) > 0 {
		// The default samples and seed, as the record uses: check stays quick
		// and its line matches the record's margins page.
		if res.Margins, err = assess.RunMargins(p, res, assess.MarginOptions{Samples: assess.DefaultSamples, Seed: assess.DefaultSeed}); err != nil {
			return err
		}
	}
	if opts.record != "" {
		// Written first, so that a refusal (file exists) comes before any output.
		if err := writeRecord(res, opts.record, date, opts.force, diag, nil); err != nil {
			return err
		}
	}
	if opts.json {
		if err := writeJSON(out, present.ForJSON(res)); err != nil {
			return err
		}
	} else {
		writeCheck(out, res, d, useColour(out))
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
	fmt.Fprint(w, inputHashes(res)+"\n")

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
	if len(res.Acceptance) > 0 {
		writeAcceptance(w, res, d)
	}
	writeChecks(w, res, d, colour)
	writeWarnings(w, present.Warnings(res, d))
	writeNotes(w, present.Notes(res, d))
	fmt.Fprint(w, "\n"+wrap(res.Caution, "Caution:", 88))
}

func writeSections(w io.Writer, res *assess.Result, d present.Display) {
	fmt.Fprintf(w, "\nHeat-exchange sections (normal rate)\n")
	tableOf(present.Sections(res, d)).write(w)
	fmt.Fprintf(w, "\nTemperatures (%s)\n", d.Unit(units.Temperature))
	tableOf(present.Temperatures(res, d)).write(w)
	if g := present.PackSides(res, d); len(g.Rows) > 0 {
		fmt.Fprintf(w, "\nPlate packs (normal rate; Martin's correlation, docs/METHOD.md §12)\n")
		tableOf(g).write(w)
		fmt.Fprintln(w)
		tableOf(present.PackU(res, d)).write(w)
	}
	if res.RegenerationRatio != nil {
		fmt.Fprintf(w, "\nRegeneration ratio  %.1f %%\n", *res.RegenerationRatio*100)
	}
}

func writeChecks(w io.Writer, res *assess.Result, d present.Display, colour bool) {
	fmt.Fprintln(w, "\nChecks")
	if len(res.Checks) == 0 {
		fmt.Fprintln(w, "  none apply: every section is in sizing mode and no holding tube or kinetics are described")
		fmt.Fprintln(w, "\nResult: no check failed (nothing was judged)")
		return
	}
	t := tableOf(present.Checks(res, d))
	t.colour = colour
	t.write(w)
	fmt.Fprintf(w, "\nResult: %s\n", present.Overall(res))
	if res.Margins != nil {
		fmt.Fprintf(w, "Margins: %s\n", present.MarginsLine(res.Margins, d)) // one line; pasval margins has the tables
	}
}

func writeComparison(w io.Writer, res *assess.Result, d present.Display) {
	au := d.Unit(units.Area)
	fmt.Fprintln(w, "\nArrangement comparison (same duty between the same temperatures)")
	t := newTable("section", "arrangement", ">area "+au, "other", ">other area "+au, ">ratio", "note")
	for _, c := range res.ArrangementComparison {
		label := present.SectionLabel(assess.Section{Name: c.Section, Stage: c.Stage})
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

// writeAcceptance prints every entered acceptance-test result against the
// model, with its verdict and due date on the review date.
func writeAcceptance(w io.Writer, res *assess.Result, d present.Display) {
	fmt.Fprintf(w, "\nAcceptance tests (measured on the installed equipment; judged on %s)\n", res.ReviewDate)
	tableOf(present.AcceptanceTests(res, d)).write(w)
}

func writeNotes(w io.Writer, notes []string) {
	if len(notes) > 0 {
		fmt.Fprintln(w, "\nNotes")
		for _, m := range notes {
			fmt.Fprint(w, wrap(m, "  i", 88))
		}
	}
}

func writeWarnings(w io.Writer, warnings []string) {
	if len(warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings")
		for _, m := range warnings {
			fmt.Fprint(w, wrap(m, "  !", 88))
		}
	}
}

// inputHashes are the lines that name the input files by their SHA-256: the
// plant file, and the line file it names.
func inputHashes(res *assess.Result) string {
	s := fmt.Sprintf("input sha256 %s\n", res.InputSHA256)
	if l := res.LineFile; l != nil {
		s += fmt.Sprintf("line file %s sha256 %s\n", l.File, l.SHA256)
	}
	return s
}
