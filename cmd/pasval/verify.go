package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"pasval/internal/fileout"
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
record's metadata; with one, that the given file matches it too. ` + fmt.Sprintf(`Both are
read only from regular files, a record of at most %d MiB (one is about 70 KB)
and a plant file of at most %d MiB.`, report.MaxRecordSize>>20, report.MaxPlantFileSize>>20),
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
	pdf, err := readRegular(recordPath, "record", report.ReadRecord)
	if err != nil {
		return err
	}
	var plant []byte
	if plantPath != "" {
		if plant, err = readRegular(plantPath, "plant file", report.ReadPlantFile); err != nil {
			return err
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

// readRegular reads a file named on the command line through read, which
// bounds its size. Only a regular file (or a link to one) is opened: a named
// pipe would block until written and a device may never end. The file is
// checked again once open, in case it was swapped meanwhile.
func readRegular(path, what string, read func(io.Reader) ([]byte, error)) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, usagef("cannot read the %s: %v", what, err)
	}
	if !st.Mode().IsRegular() {
		return nil, usagef("%s: not a regular file (%s); verify reads the %s from a file", path, fileout.Kind(st.Mode()), what)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, usagef("cannot read the %s: %v", what, err)
	}
	if now, err := f.Stat(); err != nil || !os.SameFile(st, now) {
		return nil, errors.Join(usagef("%s: the file changed while being opened; try again", path), f.Close())
	}
	data, err := read(f)
	if cerr := f.Close(); err == nil && cerr != nil {
		return nil, usagef("cannot read the %s: %v", what, cerr)
	}
	if err != nil {
		if errors.Is(err, report.ErrUnreadable) {
			return nil, usagef("%s: %v", path, err)
		}
		return nil, usagef("cannot read the %s: %v", what, err)
	}
	return data, nil
}

func okWord(ok bool) string {
	if ok {
		return "matches"
	}
	return "DIFFERS"
}
