package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/internal/version"
)

type logsOptions struct {
	outputFlags
	runFlags
	plant string
	runs  []string // files or folders
}

func newLogsCmd(stdout io.Writer) *cobra.Command {
	var opts logsOptions
	cmd := &cobra.Command{
		Use:   "logs PLANT.yaml RUN.csv[.gz]|FOLDER …",
		Short: "Review recorded production runs against the plant's critical limits",
		Long: `logs reads recorded runs of the pasteurizer (CSV exports of the recorder or
historian, one row per sample: time, holding-tube outlet temperature, flow and
the flow-diversion position; gzip-compressed or not) and judges them against
the plant file: every deviation (forward flow below the diversion setpoint,
flow above the sealed maximum), every recording gap in forward flow, the
lethality each parcel of product actually received in the holding tube, and
how fast the flow was diverted when the temperature dropped.

Several files, or a folder of them, are one review: each file is read on its
own core, events keep their file, and the summary covers all. The columns are
found by header name (time, hold_outlet_temperature, flow_rate, forward, or the
names --columns gives); units come from the header ("flow_rate [gpm]") or from
--temperature-unit and --flow-unit, and are never assumed. Times are RFC 3339
clock times or seconds from a start. The method is docs/METHOD.md §13.

With the heating section's temperatures (columns heating_product_in,
heating_product_out, heating_medium_in, heating_medium_out, and optionally
heating_medium_flow), it also follows the section's U over clock-aligned
windows (--window), fits the fouling resistance and forecasts when to clean:
when the heating medium the section needs reaches the hottest available, or
the plant file's heating.max_medium_to_product (docs/METHOD.md §17).`,
		Example: `  pasval logs testdata/demo/htst-milk-si.yaml testdata/demo/runs/htst-milk-si-shift.csv
  pasval logs line2.yaml exports/ --json > review.json
  pasval logs line2.yaml shift.csv --separator ';' --decimal-comma --timezone Europe/Berlin
  pasval logs line2.yaml shift.csv --columns time=Timestamp,hold_outlet_temperature=TT-301 --flow-unit gpm`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 2 {
				return usagef("logs needs a plant file and at least one recorded run (a file or a folder), got %d arguments (see '%s --help')", len(args), cmd.CommandPath())
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.plant, opts.runs = args[0], args[1:]
			return runLogs(opts, stdout, cmd.ErrOrStderr())
		},
	}
	cmd.Long += "\n" + strings.Replace(exitStatusHelp, "every check passes\n  1  some check fails", "no event\n  1  some event, whatever its verdict (a deviation, a gap, or under-held product)", 1)
	opts.outputFlags.register(cmd)
	opts.runFlags.register(cmd)
	return cmd
}

// runLogs prints the review to out; the progress bar, if any, goes to diag.
func runLogs(opts logsOptions, out, diag io.Writer) error {
	if _, _, err := opts.readerOptions(); err != nil {
		return err
	}
	p, d, err := opts.load(opts.plant)
	if err != nil {
		return err
	}
	rev, err := reviewRuns(p, opts.runs, opts.runFlags, diag)
	if err != nil {
		return err
	}
	if opts.json {
		j := rev.JSON()
		j.Warnings = present.RunWarningsJSON(rev)
		j.SamplingNote = present.SamplingNote(rev)
		if j.Heating != nil {
			j.Heating.ForecastBasis = present.ForecastBasis(rev)
		}
		if err := writeJSON(out, j); err != nil {
			return err
		}
	} else {
		writeRunReview(out, rev, d)
	}
	if rev.Events() > 0 {
		return errChecksFailed
	}
	return nil
}

func writeRunReview(w io.Writer, rev *assess.RunReview, d present.Display) {
	p := rev.Plant
	m := rev.Model.Model
	fmt.Fprintf(w, "pasval %s · review of %d recorded run%s against %s\n", version.Version, len(rev.Files), map[bool]string{true: "s"}[len(rev.Files) != 1], p.File)
	var ids []string
	for _, k := range []string{"site", "line", "product"} {
		if v := p.RecordValue(k); v != "" {
			ids = append(ids, v)
		}
	}
	ids = append(ids, "setpoint "+d.With(m.Setpoint, units.Temperature, 2), "sealed maximum "+present.RunFlow(rev, m.MaxFlow, d))
	fmt.Fprintln(w, strings.Join(ids, " · "))
	fmt.Fprintf(w, "plant sha256 %s\n", p.SHA256)

	fmt.Fprintln(w, "\nFiles")
	tableOf(present.RunFiles(rev)).write(w)

	fmt.Fprintf(w, "\nSummary (%s)\n", present.TimeBasis(rev))
	t := newTable("", "")
	for _, kv := range present.RunFacts(rev, d) {
		t.add(kv[0], kv[1])
	}
	t.writeBare(w)
	if lines, more := present.BadRowLines(rev, 5); len(lines) > 0 {
		fmt.Fprintln(w, "\n  Bad rows skipped (the first few)")
		for _, l := range lines {
			fmt.Fprintf(w, "    %s\n", l)
		}
		if more > 0 {
			fmt.Fprintf(w, "    … and %d more\n", more)
		}
	}
	if text := present.SensorLow(rev, d); text != "" {
		fmt.Fprint(w, "\n"+wrap(text, "  ", 88))
	}
	writeWarnings(w, present.RunWarnings(rev, d))

	if rev.Events() > 0 {
		fmt.Fprintf(w, "\nEvents (%s)\n", present.TimeBasis(rev))
		tableOf(present.RunEvents(rev, d)).write(w)
		fmt.Fprintln(w, "\nDelivered lethality of the product that left during each event (fastest particle, per parcel;")
		fmt.Fprintln(w, "per sample: the tube at that sample's flow alone, for comparison)")
		tableOf(present.RunJudgements(rev, d)).write(w)
		fmt.Fprintln(w)
		kinds := newTable("", "")
		seen := map[string]bool{}
		for _, f := range rev.Files {
			for _, e := range f.Result.Events {
				seen[string(e.Kind)] = true
			}
		}
		for _, kv := range present.KindMeanings() {
			if seen[kv[0]] {
				kinds.add(kv[0], kv[1])
			}
		}
		for _, r := range kinds.rows {
			fmt.Fprint(w, wrap(r[1], "  "+r[0]+":", 88))
		}
	}
	drops := present.RunDrops(rev, d)
	if len(drops.Rows) > 0 {
		fmt.Fprintln(w, "\nDiversion response: each drop of the outlet temperature below the setpoint")
		tableOf(drops).write(w)
	}
	if rev.Heating != nil {
		writeHeating(w, rev, d)
	}
	fmt.Fprint(w, "\n"+wrap(present.SamplingNote(rev), "Note:", 88))

	fmt.Fprintf(w, "\nResult: %s\n", present.RunOverall(rev))
	fmt.Fprint(w, "\n"+wrap(rev.Caution, "Caution:", 88))
}

// writeHeating prints the heating section over the runs: U, the fouling and
// its fits, the forecast of each limit and when to clean (docs/METHOD.md §17).
func writeHeating(w io.Writer, rev *assess.RunReview, d present.Display) {
	which := "the run"
	if len(rev.Heating.Runs) > 1 {
		which = "the latest run"
	}
	fmt.Fprintf(w, "\nHeating section: U and fouling over %s (docs/METHOD.md §17; %s)\n", which, present.TimeBasis(rev))
	t := newTable("", "")
	for _, kv := range present.HeatingFacts(rev, d) {
		t.add(kv[0], kv[1])
	}
	for _, kv := range present.HeatingForecast(rev, d) {
		t.add(kv[0], kv[1])
	}
	t.writeBare(w)
	if len(rev.Heating.Runs) > 1 {
		fmt.Fprintln(w, "\n  U at the start of each run, in date order (did cleaning restore it?)")
		tableOf(present.HeatingRuns(rev, d)).write(w)
	}
	fmt.Fprint(w, "\n"+wrap(present.CleanBefore(rev, d), "Forecast:", 88))
}
