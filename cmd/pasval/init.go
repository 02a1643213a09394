package main

import (
	_ "embed"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/fileout"
)

var (
	//go:embed starter/si.yaml
	starterSI []byte
	//go:embed starter/us.yaml
	starterUS []byte
)

type initOptions struct {
	units  string
	output string
	force  bool
	demo   string // a demo's name, or "list"
	// unitsSet is true when --units was given (a demo has its own units).
	unitsSet bool
}

func newInitCmd(stdout io.Writer) *cobra.Command {
	var opts initOptions
	cmd := &cobra.Command{
		Use:   "init",
		Short: "Write a commented starter plant file, or one of the demo plants",
		Long: `init prints a commented starter plant file, or writes it with -o. The values
are placeholders to edit for your line; the file passes 'pasval check' as written.

With --demo NAME it writes one of the demo plants instead (invented plants, the
same bytes as the repository's testdata/demo); --demo list lists them. A demo
that is a set (a line file and the product files that name it, for 'pasval
matrix') is written into the folder -o names, made when missing; the product
files name the line file beside them.`,
		Example: `  pasval init > line1.yaml
  pasval init --units us -o line1.yaml
  pasval init --demo list
  pasval init --demo htst-milk-si -o milk.yaml
  pasval init --demo dairy-line-si -o line3`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.unitsSet = cmd.Flags().Changed("units")
			return runInit(opts, stdout)
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	cmd.Flags().StringVar(&opts.units, "units", "si", "unit system of the starter file: si or us")
	cmd.Flags().StringVarP(&opts.output, "output", "o", "", "write to this file instead of standard output")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the output file if it exists")
	cmd.Flags().StringVar(&opts.demo, "demo", "", "write the demo plant NAME instead of the starter file ('list' lists them)")
	if err := cmd.RegisterFlagCompletionFunc("demo", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		names := []string{"list"}
		for _, d := range demos {
			names = append(names, d.name+"\t"+d.about)
		}
		return names, cobra.ShellCompDirectiveNoFileComp
	}); err != nil {
		panic("pasval: the --demo flag has no completion: " + err.Error()) // registered just above: a programming error
	}
	return cmd
}

func runInit(opts initOptions, out io.Writer) error {
	if opts.demo != "" {
		if opts.unitsSet {
			return usagef("--units chooses the starter file's units; a demo is written in its own units (see 'pasval init --demo list')")
		}
		if opts.demo == "list" {
			if opts.output != "" {
				return usagef("--demo list prints the demos; -o applies to a demo's name (pasval init --demo NAME -o FILE)")
			}
			return listDemos(out)
		}
		d, ok := findDemo(opts.demo)
		if !ok {
			var names []string
			for _, d := range demos {
				names = append(names, d.name)
			}
			return usagef("no demo %q; the demos are %s (see 'pasval init --demo list')", opts.demo, strings.Join(names, ", "))
		}
		return writeDemo(d, opts.output, opts.force, out)
	}
	var data []byte
	switch opts.units {
	case "si":
		data = starterSI
	case "us":
		data = starterUS
	default:
		return usagef("--units must be si or us, not %q", opts.units)
	}
	if opts.output == "" {
		_, err := out.Write(data)
		return err
	}
	if err := fileout.Write(opts.output, data, opts.force); err != nil {
		return usagef("%v", err)
	}
	fmt.Fprintf(out, "wrote %s\n", opts.output)
	return nil
}
