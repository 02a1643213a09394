package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/present"
)

type dueOptions struct {
	file string
	on   string // YYYY-MM-DD; empty: today
	date string // --date, the same as --on
	json bool
}

func newDueCmd(stdout io.Writer) *cobra.Command {
	var opts dueOptions
	cmd := &cobra.Command{
		Use:   "due PLANT.yaml",
		Short: "List the acceptance tests with their last result, next due date and state",
		Long: `due lists every kind of acceptance test that applies to the plant (the
holding-time test, cut-out and cut-in temperatures, valve response and sensor
check wherever a holding tube is described; the regenerator pressure test
wherever a regeneration section is; each other test by name as entered), with
its latest result in the plant file's acceptance: block, that result's
verdict, the next due date (the result's date plus its interval) and its state
on the review date: ok, due within 30 days, overdue, never done, no interval
entered, or, for a latest result that failed its check, "FAILED — repeat the
test" (JSON state "failed"). Intervals come only from the plant file (the
regulator's or the plant's), never from pasval. A result dated after the
review date is refused.`,
		Example: `  pasval due testdata/demo/htst-milk-si.yaml
  pasval due line2.yaml --on 2027-03-01
  pasval due line2.yaml --json`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			if cmd.Flags().Changed("date") {
				if cmd.Flags().Changed("on") && opts.date != opts.on {
					return usagef("--on %s and --date %s name two review dates; give one", opts.on, opts.date)
				}
				opts.on = opts.date
			}
			return runDue(opts, stdout)
		},
	}
	cmd.Long += `

Exit status:
  0  nothing failed, is overdue or was never done
  1  some test's latest result failed, is overdue or was never done
  2  bad input or usage (the message names the file, line and field)`
	cmd.Flags().StringVar(&opts.on, "on", "", "review date YYYY-MM-DD (default: today)")
	cmd.Flags().StringVar(&opts.date, "date", "", "the same as --on, as check, report and matrix spell it")
	cmd.Flags().BoolVar(&opts.json, "json", false, "print the list as JSON")
	return cmd
}

// dueReport is the JSON of the due command.
type dueReport struct {
	Tool        string           `json:"tool"`
	Version     string           `json:"version"`
	InputSHA256 string           `json:"input_sha256"`
	On          string           `json:"on"`
	Tests       []assess.DueItem `json:"tests"`
	Caution     string           `json:"caution"`
}

func runDue(opts dueOptions, out io.Writer) error {
	on, err := dateFlag("--on", opts.on)
	if err != nil {
		return err
	}
	p, _, err := outputFlags{}.load(opts.file)
	if err != nil {
		return err
	}
	res, err := assess.RunWith(p, assess.Options{On: on})
	if err != nil {
		return err
	}
	items := assess.DueList(res, on)
	if opts.json {
		if err := writeJSON(out, dueReport{Tool: res.Tool, Version: res.Version, InputSHA256: res.InputSHA256, On: res.ReviewDate,
			Tests: items, Caution: res.Caution}); err != nil {
			return err
		}
	} else {
		fmt.Fprintf(out, "pasval %s · acceptance tests of %s on %s\n", res.Version, p.File, res.ReviewDate)
		if len(items) == 0 {
			fmt.Fprintln(out, "\nNo acceptance test applies: the plant file describes no holding tube, regeneration section or test.")
		} else {
			fmt.Fprintln(out)
			tableOf(present.Due(items)).write(out)
		}
		fmt.Fprintf(out, "\nResult: %s\n", present.DueSummary(items))
		fmt.Fprint(out, "\n"+wrap(res.Caution, "Caution:", 88))
	}
	if assess.DueFails(items) {
		return errChecksFailed
	}
	return nil
}
