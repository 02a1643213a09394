package main

import (
	_ "embed"
	"fmt"
	"io"

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
}

func newInitCmd(stdout io.Writer) *cobra.Command {
	var opts initOptions
	cmd := &cobra.Command{
		Use:   "init",
		Short: "Write a commented starter plant file",
		Long: `init prints a commented starter plant file, or writes it with -o. The values
are placeholders to edit for your line; the file passes 'pasval check' as written.`,
		Example: `  pasval init > line1.yaml
  pasval init --units us -o line1.yaml`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runInit(opts, stdout)
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	cmd.Flags().StringVar(&opts.units, "units", "si", "unit system of the starter file: si or us")
	cmd.Flags().StringVarP(&opts.output, "output", "o", "", "write to this file instead of standard output")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the output file if it exists")
	return cmd
}

func runInit(opts initOptions, out io.Writer) error {
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
