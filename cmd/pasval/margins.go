package main

import (
	"bytes"
	"fmt"
	"io"
	"strconv"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/fileout"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
)

type marginsOptions struct {
	outputFlags
	file    string
	samples int
	seed    uint64
	// dump writes every sample's inputs and outcome as CSV (a test hook for
	// the independent reference script; not in the help).
	dump string
}

// maxSamples bounds --samples: each sample keeps one float per organism and
// one for the fastest particle until the percentiles are taken.
const maxSamples = 10_000_000

func newMarginsCmd(stdout io.Writer) *cobra.Command {
	var opts marginsOptions
	cmd := &cobra.Command{
		Use:   "margins PLANT.yaml",
		Short: "Worst case, probability of meeting each limit, and which input matters most",
		Long: `margins varies the inputs named in the plant file's uncertainty block within
their tolerances and judges the holding tube as check does each time
(docs/METHOD.md §14):

  worst case   for each check, every input at the end of its tolerance that
               lowers that check's margin, found by evaluating both ends;
  Monte Carlo  --samples draws from each input's distribution (seeded, so that
               a result reproduces): the probability that each check holds with
               its standard error, and the 1st, 5th and 50th percentiles of the
               fastest particle's time and of each log reduction;
  sensitivity  each input alone at both ends of its tolerance, ranked by the
               swing of the fastest particle's time.

The exit status follows the worst case: 1 when some check fails with its
inputs at their unfavourable ends.`,
		Example: `  pasval margins testdata/demo/htst-milk-si.yaml
  pasval margins line2.yaml --samples 1000000 --seed 7
  pasval margins line2.yaml --json`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			return runMargins(opts, stdout)
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	opts.register(cmd)
	cmd.Flags().IntVar(&opts.samples, "samples", assess.DefaultSamples, "Monte Carlo samples")
	cmd.Flags().Uint64Var(&opts.seed, "seed", assess.DefaultSeed, "seed of the random streams (the same seed gives the same result)")
	cmd.Flags().StringVar(&opts.dump, "dump-samples", "", "write every sample's inputs and outcome to this CSV file")
	if err := cmd.Flags().MarkHidden("dump-samples"); err != nil {
		panic(err) // the flag is defined just above
	}
	return cmd
}

// marginsReport is the JSON of the margins command.
type marginsReport struct {
	Tool        string `json:"tool"`
	Version     string `json:"version"`
	InputSHA256 string `json:"input_sha256"`
	*assess.Margins
	Caution string `json:"caution"`
}

func runMargins(opts marginsOptions, out io.Writer) error {
	if opts.samples < 1 || opts.samples > maxSamples {
		return usagef("--samples must be from 1 to %d, not %d", maxSamples, opts.samples)
	}
	p, d, err := opts.load(opts.file)
	if err != nil {
		return err
	}
	if len(p.Uncertainty) == 0 {
		return inputerr.List{{Pos: inputerr.Pos{File: p.File, Line: 1, Column: 1}, Field: plantfile.UncertaintyKey,
			Msg: "the plant file has no uncertainty block; give tolerances to the inputs to vary, e.g. uncertainty: {flow.max_rate: {tolerance: ±2 %, distribution: uniform}}"}}
	}
	res, err := assess.Run(p)
	if err != nil {
		return err
	}
	m, err := assess.RunMargins(p, res, assess.MarginOptions{Samples: opts.samples, Seed: opts.seed, KeepSamples: opts.dump != ""})
	if err != nil {
		return err
	}
	if opts.dump != "" {
		if err := fileout.Write(opts.dump, samplesCSV(m.Samples), true); err != nil {
			return err
		}
	}
	if opts.json {
		if err := writeJSON(out, marginsReport{Tool: res.Tool, Version: res.Version, InputSHA256: res.InputSHA256, Margins: m, Caution: res.Caution}); err != nil {
			return err
		}
	} else {
		writeMargins(out, res, m, d)
	}
	for _, w := range m.WorstCase.Checks {
		if !w.Pass {
			return errChecksFailed
		}
	}
	return nil
}

func writeMargins(w io.Writer, res *assess.Result, m *assess.Margins, d present.Display) {
	p := res.Plant
	fmt.Fprintf(w, "pasval %s · margins of %s\ninput sha256 %s\n", res.Version, p.File, res.InputSHA256)
	fmt.Fprintln(w, "\nInputs varied (docs/METHOD.md §14.1; normal: the tolerance is 2σ, draws within ±1.5× it)")
	tableOf(present.MarginInputs(m, p, d)).write(w)
	fmt.Fprintln(w, "\nWorst case: each check with every input at the end of its tolerance that lowers its margin")
	if len(m.WorstCase.Checks) > 0 {
		tableOf(present.WorstCase(m, d)).write(w)
	} else {
		fmt.Fprintln(w, "  no holding-tube check applies")
	}
	fmt.Fprint(w, wrap(present.WorstCaseValues(m), "  ", 88))
	mc := m.MonteCarlo
	fmt.Fprintf(w, "\nMonte Carlo: %d samples, seed %d\n", mc.Samples, mc.Seed)
	if len(mc.Checks) > 0 {
		tableOf(present.Probabilities(m)).write(w)
		fmt.Fprintln(w)
	}
	tableOf(present.MarginPercentiles(m)).write(w)
	fmt.Fprintln(w, "\nSensitivity: each input alone at the two ends of its tolerance, the others nominal")
	tableOf(present.SensitivityTable(m)).write(w)
	fmt.Fprint(w, "\n"+wrap(res.Caution, "Caution:", 88))
}

// samplesCSV writes the kept samples: the drawn inputs (SI), the fastest
// particle's time, each log reduction and each check's verdict (1 holds).
func samplesCSV(s *assess.MarginSamples) []byte {
	var b bytes.Buffer
	cols := append([]string(nil), s.Fields...)
	cols = append(cols, "min_residence_s")
	for _, n := range s.Organisms {
		cols = append(cols, "log_reduction:"+n)
	}
	for _, c := range s.Checks {
		cols = append(cols, "pass:"+present.CheckLabel(c))
	}
	for i, c := range cols {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(strconv.Quote(c))
	}
	b.WriteByte('\n')
	g := func(v float64) { b.WriteString(strconv.FormatFloat(v, 'g', -1, 64)) }
	for k := range s.MinResidence {
		for i := range s.Fields {
			g(s.Inputs[i][k])
			b.WriteByte(',')
		}
		g(s.MinResidence[k])
		for i := range s.Organisms {
			b.WriteByte(',')
			g(s.LogReduction[i][k])
		}
		for i := range s.Checks {
			b.WriteString(map[bool]string{true: ",1", false: ",0"}[s.Pass[i][k]])
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}
