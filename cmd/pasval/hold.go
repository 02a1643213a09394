package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/present"
	"pasval/internal/units"
)

type holdOptions struct {
	outputFlags
	file string
}

func newHoldCmd(stdout io.Writer) *cobra.Command {
	var opts holdOptions
	cmd := &cobra.Command{
		Use:   "hold PLANT.yaml",
		Short: "Show the holding tube in detail: hydraulics, residence, legal rows, lethality",
		Long: `hold prints the holding tube alone, judged at the sealed maximum flow: mean
velocity, Reynolds number and regime, the fastest-to-mean velocity ratio,
fastest-particle and mean residence times, the tube length and the largest flow
that would meet each legal row, and a table of each organism's log reduction
for diversion setpoints from 1 K below to 2 K above the entered one.

Only the holding-tube checks (holding-time, log-reduction, tube-slope) decide
the exit status here; 'pasval check' judges the whole line.`,
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
	return cmd
}

// holdReport is the JSON of the hold command.
type holdReport struct {
	Tool          string               `json:"tool"`
	Version       string               `json:"version"`
	InputSHA256   string               `json:"input_sha256"`
	HoldingTube   *assess.HoldingTube  `json:"holding_tube"`
	Lethality     []assess.Lethality   `json:"lethality"`
	SetpointTable []assess.SetpointRow `json:"setpoint_table"`
	Checks        []assess.Check       `json:"checks"`
	Warnings      []assess.Warning     `json:"warnings"`
	Pass          bool                 `json:"pass"`
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
	res, err := assess.Run(p)
	if err != nil {
		return err
	}
	rows, err := assess.SetpointTable(res)
	if err != nil {
		return err
	}
	worded := present.ForJSON(res)
	rep := holdReport{Tool: res.Tool, Version: res.Version, InputSHA256: res.InputSHA256, HoldingTube: res.HoldingTube,
		Lethality: res.Lethality, SetpointTable: rows, Checks: []assess.Check{}, Warnings: worded.Warnings,
		Pass: true, Caution: res.Caution}
	only := *res
	only.Checks = []assess.Check{}
	for i, c := range res.Checks {
		if c.IsHolding() {
			only.Checks = append(only.Checks, c)
			rep.Checks = append(rep.Checks, worded.Checks[i])
			rep.Pass = rep.Pass && c.Pass
		}
	}
	if opts.json {
		if err := writeJSON(out, rep); err != nil {
			return err
		}
	} else {
		fmt.Fprintf(out, "pasval %s · holding tube of %s\ninput sha256 %s\n", res.Version, p.File, res.InputSHA256)
		writeHolding(out, res, d)
		writeSetpointTable(out, res, rep.SetpointTable, d)
		writeChecks(out, &only, d, useColour(out))
		writeWarnings(out, present.Warnings(res, d))
		fmt.Fprint(out, "\n"+wrap(res.Caution, "Caution:", 88))
	}
	if !rep.Pass {
		return errChecksFailed
	}
	return nil
}

func writeSetpointTable(w io.Writer, res *assess.Result, rows []assess.SetpointRow, d present.Display) {
	if len(rows) == 0 || (len(res.Lethality) == 0 && rows[0].LegalMet == nil) {
		return
	}
	fmt.Fprintln(w, "\n  Log reduction of the fastest particle versus diversion setpoint (tube and flow unchanged)")
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
			label += fmt.Sprintf(" (%s)", present.Signed(d.Num(r.OffsetK, units.TemperatureDifference, 1))+" "+d.Unit(units.TemperatureDifference))
		}
		cells := []string{label}
		for _, lr := range r.LogReductions {
			cells = append(cells, fmt.Sprintf("%.2f", lr))
		}
		if r.LegalMet != nil {
			cells = append(cells, map[bool]string{true: "met", false: "not met"}[*r.LegalMet])
		}
		t.add(cells...)
	}
	t.write(w)
}
