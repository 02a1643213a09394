package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"pasval/report"
)

// errMismatch reports a verification that read everything and found a difference.
var errMismatch = fmt.Errorf("the record does not match: %w", errChecksFailed)

func newVerifyCmd(stdout io.Writer) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "verify RECORD.pdf [PLANT.yaml]",
		Short: "Check that a record matches its plant file",
		Long: `verify reads a record written by 'pasval report'. Without a plant file it
checks that the plant file attached to the record matches the SHA-256 in the
record's metadata; with one, that the given file matches it too.`,
		Example: `  pasval verify line2-record.pdf
  pasval verify line2-record.pdf line2.yaml`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 1 || len(args) > 2 {
				return usagef("verify needs a record and optionally a plant file, got %d arguments", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			plant := ""
			if len(args) == 2 {
				plant = args[1]
			}
			return runVerify(args[0], plant, stdout)
		},
	}
	cmd.Long += `

Exit status:
  0  the record matches
  1  the record does not match (altered record or plant file)
  2  the record or plant file cannot be read`
	return cmd
}

func runVerify(recordPath, plantPath string, out io.Writer) error {
	pdf, err := os.ReadFile(recordPath)
	if err != nil {
		return usagef("cannot read the record: %v", err)
	}
	var plant []byte
	if plantPath != "" {
		if plant, err = os.ReadFile(plantPath); err != nil {
			return usagef("cannot read the plant file: %v", err)
		}
	}
	v, err := report.Verify(pdf, plant)
	if err != nil {
		if errors.Is(err, report.ErrUnreadable) {
			return usagef("%s: %v", recordPath, err)
		}
		return err
	}
	fmt.Fprintf(out, "recorded plant-file sha256  %s\n", v.RecordedSHA256)
	fmt.Fprintf(out, "attached plant-file sha256  %s  %s\n", v.AttachmentSHA256, okWord(v.AttachmentSHA256 == v.RecordedSHA256))
	if plantPath != "" {
		fmt.Fprintf(out, "%-27s %s  %s\n", plantPath, v.FileSHA256, okWord(v.FileSHA256 == v.RecordedSHA256))
	}
	if !v.Match {
		fmt.Fprintln(out, "MISMATCH: the record and the plant file differ; do not rely on this record for this plant file")
		return errMismatch
	}
	fmt.Fprintln(out, "MATCH")
	return nil
}

func okWord(ok bool) string {
	if ok {
		return "matches"
	}
	return "DIFFERS"
}
