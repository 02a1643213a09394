package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"
	"golang.org/x/term"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/internal/version"
)

// Exit codes, the same for every command.
const (
	exitPass  = 0 // every check passes
	exitFail  = 1 // some check fails (or a verification mismatch)
	exitInput = 2 // bad input or usage
)

// errChecksFailed reports that the command ran and some check failed; its
// results are already printed.
var errChecksFailed = errors.New("some checks fail")

// usageError is a command-line mistake.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, args ...any) error { return &usageError{fmt.Sprintf(format, args...)} }

const exitStatusHelp = `
Exit status:
  0  every check passes
  1  some check fails
  2  bad input or usage (the message names the file, line and field)`

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "pasval",
		Short: "Validate continuous pasteurizers from a plant file",
		Long: `pasval computes a continuous plate pasteurizer from a plant file (YAML, every
quantity with its unit): regeneration, heating and cooling sections by LMTD and
effectiveness–NTU, the regeneration ratio, plates and areas, and the checks
that a process authority signs off.

It supports, and never replaces, the regulatory acceptance tests, the process
authority and the local regulator.`,
		Version:       version.Version + " (" + version.Build() + ")",
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetVersionTemplate("pasval {{.Version}}\n")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return usagef("%v (see '%s --help')", err, c.CommandPath())
	})
	root.AddCommand(newCheckCmd(stdout), newHoldCmd(stdout), newReportCmd(stdout), newVerifyCmd(stdout), newPlatesCmd(stdout), newDueCmd(stdout), newInitCmd(stdout), newSchemaCmd(stdout), newDocsCmd(stdout))
	for _, c := range root.Commands() {
		switch c.Name() {
		case "check", "hold", "report", "plates", "due":
			c.ValidArgsFunction = completePlantFile
		case "verify":
			c.ValidArgsFunction = completeRecord
		case "init", "schema":
			c.ValidArgsFunction = cobra.NoFileCompletions
		}
	}
	return root
}

// run executes the command line and maps the outcome to an exit code; it is
// the one place that prints errors.
func run(args []string, stdout, stderr io.Writer) int {
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	return exitCode(err, stderr)
}

func exitCode(err error, stderr io.Writer) int {
	if err == nil {
		return exitPass
	}
	if errors.Is(err, errChecksFailed) {
		return exitFail
	}
	// Bad input, from any reader: one line per problem, file:line:column first.
	var list inputerr.List
	if errors.As(err, &list) {
		for _, e := range list {
			fmt.Fprintf(stderr, "pasval: %v\n", e)
		}
		return exitInput
	}
	var one *inputerr.Error
	if errors.As(err, &one) {
		fmt.Fprintf(stderr, "pasval: %v\n", one)
		return exitInput
	}
	msg := err.Error()
	// cobra's own argument and command errors are usage errors too.
	fmt.Fprintf(stderr, "pasval: %s\n", strings.TrimSpace(msg))
	return exitInput
}

// completePlantFile offers *.yaml and *.yml files for a plant-file argument.
func completePlantFile(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	if len(args) > 0 {
		return nil, cobra.ShellCompDirectiveNoFileComp
	}
	return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
}

// completeRecord offers a PDF first, then a plant file.
func completeRecord(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	switch len(args) {
	case 0:
		return []string{"pdf"}, cobra.ShellCompDirectiveFilterFileExt
	case 1:
		return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
	}
	return nil, cobra.ShellCompDirectiveNoFileComp
}

// useColour is true when w is a terminal and neither NO_COLOR nor TERM=dumb
// asks for plain text (https://no-color.org).
func useColour(w io.Writer) bool {
	if os.Getenv("NO_COLOR") != "" || os.Getenv("TERM") == "dumb" {
		return false
	}
	f, ok := w.(*os.File)
	// term.IsTerminal asks the terminal driver (isatty), so /dev/null and
	// other character devices that are not terminals get no colour codes.
	return ok && term.IsTerminal(int(f.Fd()))
}

// outputFlags are the flags of the commands that print results.
type outputFlags struct {
	units string // "", "si" or "us"
	json  bool
}

func (o *outputFlags) register(cmd *cobra.Command) {
	cmd.Flags().StringVar(&o.units, "units", "", "units for printed values: si or us (default: us when the hold setpoint is in °F)")
	cmd.Flags().BoolVar(&o.json, "json", false, "print the results as JSON (SI units, every key names its unit)")
}

// load checks --units, then reads and validates the plant file and picks the
// display units (the file's own unless --units says otherwise).
func (o outputFlags) load(file string) (*plantfile.Plant, present.Display, error) {
	if o.units != "" && o.units != "si" && o.units != "us" {
		return nil, present.Display{}, usagef("--units must be si or us, not %q", o.units)
	}
	p, err := plantfile.Load(file)
	if err != nil {
		return nil, present.Display{}, err
	}
	sys := p.System
	switch o.units {
	case "si":
		sys = units.SI
	case "us":
		sys = units.US
	}
	return p, present.Display{Sys: sys}, nil
}

// writeJSON prints v as indented JSON, keeping °, µ and the like readable.
func writeJSON(out io.Writer, v any) error {
	enc := json.NewEncoder(out)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// argsFile requires exactly one plant-file argument.
func argsFile(cmd *cobra.Command, args []string) error {
	if len(args) != 1 {
		return usagef("%s needs exactly one plant file, got %d arguments (see '%s --help')", cmd.Name(), len(args), cmd.CommandPath())
	}
	return nil
}
