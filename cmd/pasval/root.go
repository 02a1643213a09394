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
	"pasval/internal/oneline"
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
	root.AddCommand(newCheckCmd(stdout), newHoldCmd(stdout), newReportCmd(stdout), newVerifyCmd(stdout), newPlatesCmd(stdout),
		newMarginsCmd(stdout), newMatrixCmd(stdout), newLogsCmd(stdout), newDueCmd(stdout), newInitCmd(stdout), newSchemaCmd(stdout),
		newDocsCmd(stdout))
	root.SetHelpCommand(newHelpCmd())
	refuseUnknownShells(root)
	for _, c := range root.Commands() {
		switch c.Name() {
		case "check", "hold", "report", "plates", "margins", "due":
			c.ValidArgsFunction = completePlantFile
		case "matrix":
			c.ValidArgsFunction = completePlantFiles
		case "verify":
			c.ValidArgsFunction = completeRecord
		case "logs":
			c.ValidArgsFunction = completeRunFiles
		case "init", "schema":
			c.ValidArgsFunction = cobra.NoFileCompletions
		}
	}
	return root
}

// run executes the command line and maps the outcome to an exit code; it is
// the one place that prints errors. Everything a command prints goes through
// one checked writer: output that could not be written (a full disk, a closed
// standard output) is lost, so the command exits 2 with the write error,
// whatever it found.
func run(args []string, stdout, stderr io.Writer) int {
	out := &checkedWriter{w: stdout}
	if f, ok := stdout.(*os.File); ok && closedOutput(f) {
		// Nothing would reach the reader: refuse before doing anything.
		fmt.Fprintf(stderr, "pasval: cannot write the output: %v\n", errOutputClosed)
		return exitInput
	}
	root := newRootCmd(out, stderr)
	root.SetArgs(args)
	err := root.Execute()
	if werr := out.err; werr != nil {
		if err != nil && !errors.Is(err, werr) && !errors.Is(err, errChecksFailed) {
			exitCode(err, stderr)
		}
		fmt.Fprintf(stderr, "pasval: cannot write the output: %v\n", werr)
		return exitInput
	}
	return exitCode(err, stderr)
}

// errOutputClosed is a standard output that was closed when pasval started.
var errOutputClosed = errors.New("standard output is closed (to discard the output, redirect it to /dev/null)")

// checkedWriter keeps the first write error; after it, nothing more is
// written. run reads the error once, when the command has finished.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	if err == nil && n < len(p) {
		err = io.ErrShortWrite
	}
	c.err = err
	return n, err
}

// newHelpCmd is 'pasval help [command]'; a topic that is not a command is a
// usage error (exit 2), not a help text and exit 0.
func newHelpCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "help [command]",
		Short: "Help about any command",
		Args:  cobra.ArbitraryArgs,
		ValidArgsFunction: func(c *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
			var names []string
			for _, s := range c.Root().Commands() {
				if s.IsAvailableCommand() && strings.HasPrefix(s.Name(), toComplete) {
					names = append(names, s.Name())
				}
			}
			return names, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(c *cobra.Command, args []string) error {
			topic, rest, err := c.Root().Find(args)
			if err != nil || topic == nil || len(rest) > 0 {
				return usagef("no help topic %q; 'pasval --help' lists the commands", strings.Join(args, " "))
			}
			return topic.Help()
		},
	}
}

// refuseUnknownShells makes 'pasval completion SHELL' a usage error (exit 2)
// for a shell it has no script for, and without a shell; cobra would print
// the command's help and exit 0.
func refuseUnknownShells(root *cobra.Command) {
	root.InitDefaultCompletionCmd()
	for _, c := range root.Commands() {
		if c.Name() != "completion" {
			continue
		}
		var shells []string
		for _, s := range c.Commands() {
			if s.IsAvailableCommand() {
				shells = append(shells, s.Name())
			}
		}
		list := strings.Join(shells, ", ")
		c.Args = cobra.ArbitraryArgs
		c.RunE = func(_ *cobra.Command, args []string) error {
			if len(args) == 0 {
				return usagef("completion needs a shell: %s", list)
			}
			return usagef("no completion for %q; pasval completes %s", args[0], list)
		}
	}
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

// completeRunFiles offers a plant file first, then recorded runs (files or
// folders).
func completeRunFiles(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	if len(args) == 0 {
		return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
	}
	return nil, cobra.ShellCompDirectiveDefault
}

// completePlantFiles offers *.yaml and *.yml files for every argument (matrix).
func completePlantFiles(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
}

// completeRecord offers a PDF first, then plant files.
func completeRecord(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	if len(args) == 0 {
		return []string{"pdf"}, cobra.ShellCompDirectiveFilterFileExt
	}
	// The files the record was made from: the plant file and its line file,
	// or a matrix's line and product files.
	return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
}

// useColour is true when w is a terminal and neither NO_COLOR nor TERM=dumb
// asks for plain text (https://no-color.org).
func useColour(w io.Writer) bool {
	if os.Getenv("NO_COLOR") != "" || os.Getenv("TERM") == "dumb" {
		return false
	}
	if c, ok := w.(*checkedWriter); ok {
		w = c.w
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

// writeJSON prints v as indented JSON, keeping °, µ and the like readable;
// control and bidirectional formatting characters (the schema's free-text
// pattern holds some) are written as \uXXXX escapes, never raw.
func writeJSON(out io.Writer, v any) error {
	var b strings.Builder
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return err
	}
	_, err := io.WriteString(out, oneline.EscapeLines(b.String()))
	return err
}

// argsFile requires exactly one plant-file argument.
func argsFile(cmd *cobra.Command, args []string) error {
	if len(args) != 1 {
		return usagef("%s needs exactly one plant file, got %d arguments (see '%s --help')", cmd.Name(), len(args), cmd.CommandPath())
	}
	return nil
}
