package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
)

type holdOptions struct {
	outputFlags
	file string
	date string // YYYY-MM-DD, the review date; empty: today
}

func newHoldCmd(stdout io.Writer) *cobra.Command {
	var opts holdOptions
	cmd := &cobra.Command{
		Use:   "hold PLANT.yaml",
		Short: "Show the holding tube in detail: hydraulics, residence, legal rows, lethality",
		Long: `hold prints the holding tube alone: at the sealed maximum flow the mean
velocity, Reynolds number and regime, the fastest-to-mean velocity ratio,
fastest-particle and mean residence times; the worst flow up to the seal
(just below Re 4000 when the seal is turbulent and that is shorter), where
the holding time and log reductions are judged, at the setpoint less the
sensor's stated accuracy; the tube length and the largest flow that would
meet each legal row; and a table of each organism's log reduction and the
legal table for diversion setpoints from 1 K below to 2 K above the entered
one (whole °F in US units).

Only the holding-tube checks (holding-time, log-reduction, tube-slope,
diversion-timing: the fastest particle from the diversion sensor to the
valve, and acceptance-holding-time: a measured holding-time test converted
to the product, judged on the review date, --date or today) decide the exit
status here, and the Result line says so; 'pasval check' judges every check
of the line.`,
		Example: `  pasval hold testdata/demo/frozen-dessert-si.yaml
  pasval hold line2.yaml --units us
  pasval hold line2.yaml --json`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			return runHold(opts, stdout)
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	opts.register(cmd)
	cmd.Flags().StringVar(&opts.date, "date", "", "review date YYYY-MM-DD: the holding-time test is judged on it (default: today)")
	return cmd
}

// holdReport is the JSON of the hold command.
type holdReport struct {
	Tool          string               `json:"tool"`
	Version       string               `json:"version"`
	InputSHA256   string               `json:"input_sha256"`
	LineFile      *assess.SourceRef    `json:"line_file,omitempty"`
	HoldingTube   *assess.HoldingTube  `json:"holding_tube"`
	Lethality     []assess.Lethality   `json:"lethality"`
	SetpointTable []assess.SetpointRow `json:"setpoint_table"`
	Checks        []assess.Check       `json:"checks"`
	Warnings      []assess.Warning     `json:"warnings"`
	Pass          bool                 `json:"pass"`
	Judged        bool                 `json:"judged"` // false when no check of the holding tube applies
	Caution       string               `json:"caution"`
}

func runHold(opts holdOptions, out io.Writer) error {
	p, d, err := opts.load(opts.file)
	if err != nil {
		return err
	}
	if p.HoldingTube == nil {
		return inputerr.List{{Pos: inputerr.Pos{File: p.File, Line: 1, Column: 1}, Field: "holding_tube",
			Msg: "the plant file describes no holding tube; add holding_tube (see 'pasval init' and the README)"}}
	}
	on, err := dateFlag("--date", opts.date)
	if err != nil {
		return err
	}
	res, err := assess.RunWith(p, assess.Options{On: on})
	if err != nil {
		return err
	}
	rows, err := assess.SetpointTable(res, setpointOffsets(d))
	if err != nil {
		return err
	}
	// A heat-exchange section's warnings (its plate pack) are check's, not hold's.
	only := *res
	only.Warnings = []assess.Warning{}
	// So are the other acceptance tests'.
	for _, w := range res.Warnings {
		if w.Section == "" && !(w.Code == assess.WarnAcceptanceNotJudged && !holdingTest(res, w)) {
			only.Warnings = append(only.Warnings, w)
		}
	}
	worded := present.ForJSON(&only)
	rep := holdReport{Tool: res.Tool, Version: res.Version, InputSHA256: res.InputSHA256, LineFile: res.LineFile, HoldingTube: res.HoldingTube,
		Lethality: res.Lethality, SetpointTable: rows, Checks: []assess.Check{}, Warnings: worded.Warnings,
		Pass: true, Caution: res.Caution}
	only.Checks = []assess.Check{}
	for i, c := range res.Checks {
		if c.IsHolding() {
			only.Checks = append(only.Checks, c)
			rep.Checks = append(rep.Checks, worded.Checks[i])
			rep.Pass = rep.Pass && c.Pass
			rep.Judged = true
		}
	}
	if opts.json {
		if err := writeJSON(out, rep); err != nil {
			return err
		}
	} else {
		fmt.Fprintf(out, "pasval %s · holding tube of %s\n%s", res.Version, p.File, inputHashes(res.InputSHA256, res.LineFile))
		writeHolding(out, res, d)
		writeSetpointTable(out, res, rep.SetpointTable, d)
		writeChecks(out, &only, d, useColour(out), present.HoldingOverall(&only))
		writeWarnings(out, present.Warnings(&only, d))
		writeNotes(out, present.Notes(res, d))
		fmt.Fprint(out, "\n"+wrap(res.Caution, "Caution:", 88))
	}
	if !rep.Pass {
		return errChecksFailed
	}
	return nil
}

// holdingTest reports whether an acceptance warning concerns a holding-time test.
func holdingTest(res *assess.Result, w assess.Warning) bool {
	i := int(w.Values["test_index"])
	return i >= 0 && i < len(res.Acceptance) && res.Acceptance[i].Test == plantfile.TestHoldingTime
}

// setpointOffsets are the setpoint steps of the table: half kelvins in SI,
// whole degrees Fahrenheit in US units.
func setpointOffsets(d present.Display) []float64 {
	if d.Sys == units.US {
		return assess.SetpointOffsetsUS
	}
	return assess.SetpointOffsets
}

func writeSetpointTable(w io.Writer, res *assess.Result, rows []assess.SetpointRow, d present.Display) {
	if len(rows) == 0 || (len(res.Lethality) == 0 && rows[0].LegalMet == nil) {
		return
	}
	title := "Log reduction of the fastest particle"
	if len(res.Lethality) == 0 {
		title = "Legal table"
	} else if rows[0].LegalMet != nil {
		title += " and the legal table"
	}
	title += " versus diversion setpoint (tube and flow unchanged"
	if res.HoldingTube.SensorAccuracyK > 0 {
		title += fmt.Sprintf("; each judged %s below its setpoint", d.With(res.HoldingTube.SensorAccuracyK, units.TemperatureDifference, 2))
	}
	fmt.Fprintln(w, "\n  "+title+")")
	headers := []string{"setpoint"}
	for _, l := range res.Lethality {
		headers = append(headers, ">"+l.Organism)
	}
	if rows[0].LegalMet != nil {
		headers = append(headers, "legal table")
	}
	t := newTable(headers...)
	for _, r := range rows {
		label := d.With(r.SetpointC, units.Temperature, 1)
		if r.OffsetK == 0 {
			label += " (entered)"
		} else {
			prec := 1
			if d.Sys == units.US {
				prec = 0
			}
			label += fmt.Sprintf(" (%s)", present.Signed(d.Num(r.OffsetK, units.TemperatureDifference, prec))+" "+d.Unit(units.TemperatureDifference))
		}
		cells := []string{label}
		for _, lr := range r.LogReductions {
			cells = append(cells, present.LogText(lr))
		}
		if r.LegalMet != nil {
			cells = append(cells, map[bool]string{true: "met", false: "not met"}[*r.LegalMet])
		}
		t.add(cells...)
	}
	t.write(w)
}
