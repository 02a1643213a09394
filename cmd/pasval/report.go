package main

import (
	"crypto"
	"crypto/x509"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/fileout"
	"pasval/internal/plantfile"
	"pasval/internal/record"
	"pasval/internal/units"
	"pasval/report"
)

type reportOptions struct {
	file   string
	output string
	date   string // YYYY-MM-DD; empty: today
	force  bool
	// signKey and signCert are PEM files: the record is signed with a
	// standard PDF signature when both are given.
	signKey, signCert string
	// logs are recorded runs (files or folders): the record is then a
	// run review of them (reviewrecord.go).
	logs []string
	runFlags
}

func newReportCmd(stdout io.Writer) *cobra.Command {
	var opts reportOptions
	cmd := &cobra.Command{
		Use:   "report PLANT.yaml -o RECORD.pdf",
		Short: "Write the validation record (PDF) of a plant file",
		Long: `report computes the plant file as check does and writes a validation record:
a cover with the verdicts, the inputs as entered and in SI, the method and its
references, the heat-exchange tables and temperature diagram, the holding tube
and lethality with a log-reduction plot, the checks with their margins, the
cautions, and a sign-off block. The plant file is attached to the PDF and its
SHA-256 is in the document metadata; 'pasval verify' checks them later.

The record is written to a temporary file beside the target and renamed, so a
failure never leaves a partial record; an existing file is kept unless --force.
With --date the same plant file gives the same PDF bytes.

With --sign KEY.pem --cert CERT.pem the record carries a standard PDF
signature (PKCS#7, SHA-256), appended after the record so that 'pasval
verify' still compares the record with its re-render and checks the
signature too.`,
		Example: `  pasval report testdata/demo/htst-milk-si.yaml -o line2-record.pdf
  pasval report line2.yaml -o line2.pdf --date 2026-12-01 --force
  pasval report line2.yaml --log shift-2026-03-14.csv -o review-2026-03-14.pdf`,
		Args: argsFile,
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.file = args[0]
			if err := refuseRunFlags(cmd, opts.logs); err != nil {
				return err
			}
			if len(opts.logs) > 0 {
				return runReviewRecord(opts, stdout, cmd.ErrOrStderr())
			}
			return runReport(opts, stdout)
		},
	}
	cmd.Long += `

With --log RUN.csv (repeated, or a folder) the record is a run review
instead: the recorded runs judged against the plant file as 'pasval logs'
judges them, with temperature and flow against time, the events and their
verdicts, the diversion response, each run file's SHA-256, the cautions and
sign-off lines; the plant file is attached and the runs' hashes and reading
options are kept in the metadata, so 'pasval verify REVIEW.pdf --log
RUN.csv' re-renders it. Exit status 1 then means some event was found.`
	cmd.Long += "\n" + exitStatusHelp
	cmd.Flags().StringVarP(&opts.output, "output", "o", "", "the record to write (required)")
	cmd.Flags().StringVar(&opts.date, "date", "", "record date YYYY-MM-DD (default: today); fixes the PDF bytes")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the record if it exists")
	cmd.Flags().StringVar(&opts.signKey, "sign", "", "sign the record with this private key (PEM: PKCS#8, PKCS#1 RSA or EC)")
	cmd.Flags().StringVar(&opts.signCert, "cert", "", "the signer's certificate (PEM; its chain may follow), with --sign")
	cmd.Flags().StringArrayVar(&opts.logs, "log", nil, "a recorded run (file or folder; repeat for several): write a run-review record of them")
	opts.runFlags.register(cmd)
	return cmd
}

// recordDate parses --date, or takes today's date.
func recordDate(s string) (time.Time, error) { return dateFlag("--date", s) }

// dateFlag parses a YYYY-MM-DD flag value, or takes today's date when empty.
func dateFlag(flag, s string) (time.Time, error) {
	if s == "" {
		return today()
	}
	d, err := units.ParseDate(s)
	if err != nil {
		return time.Time{}, usagef("%s must be a date YYYY-MM-DD, not %q", flag, s)
	}
	return d, nil
}

// today is the current date (UTC), the review date of acceptance tests and
// the default record date. When SOURCE_DATE_EPOCH is set (seconds since
// 1970, the reproducible-builds convention) it is that instant's date
// instead, so that a build, a test suite or a re-run can fix "today".
func today() (time.Time, error) {
	now := time.Now().UTC()
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		sec, err := strconv.ParseInt(s, 10, 64)
		if err != nil || sec < 0 || sec > 253402300799 {
			return time.Time{}, usagef("SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01, not %q", s)
		}
		now = time.Unix(sec, 0).UTC()
	}
	return time.Date(now.Year(), now.Month(), now.Day(), 0, 0, 0, 0, time.UTC), nil
}

func runReport(opts reportOptions, out io.Writer) error {
	if opts.output == "" {
		return usagef("report needs -o RECORD.pdf (see 'pasval report --help')")
	}
	date, err := recordDate(opts.date)
	if err != nil {
		return err
	}
	sg, err := loadSigner(opts.signKey, opts.signCert)
	if err != nil {
		return err
	}
	p, err := plantfile.Load(opts.file)
	if err != nil {
		return err
	}
	res, err := assess.RunWith(p, assess.Options{On: date})
	if err != nil {
		return err
	}
	if err := writeRecord(res, opts.output, date, opts.force, out, sg); err != nil {
		return err
	}
	if !res.Pass {
		return errChecksFailed
	}
	return nil
}

// recordSigner is a key and certificate chain to sign records with.
type recordSigner struct {
	key   crypto.Signer
	chain []*x509.Certificate
}

// maxKeyFile bounds a key or certificate file (a few kilobytes).
const maxKeyFile = 1 << 20

// loadSigner reads --sign and --cert (both or neither).
func loadSigner(keyPath, certPath string) (*recordSigner, error) {
	if keyPath == "" && certPath == "" {
		return nil, nil
	}
	if keyPath == "" || certPath == "" {
		return nil, usagef("--sign and --cert go together: the private key and the signer's certificate")
	}
	read := func(r io.Reader) ([]byte, error) {
		b, err := io.ReadAll(io.LimitReader(r, maxKeyFile+1))
		if err == nil && len(b) > maxKeyFile {
			err = fmt.Errorf("larger than %d MiB", maxKeyFile>>20)
		}
		return b, err
	}
	keyPEM, err := readRegular(keyPath, "key", read)
	if err != nil {
		return nil, err
	}
	certPEM, err := readRegular(certPath, "certificate", read)
	if err != nil {
		return nil, err
	}
	key, chain, err := report.ParseSigner(keyPEM, certPEM)
	if err != nil {
		return nil, usagef("%s, %s: %v", keyPath, certPath, err)
	}
	return &recordSigner{key: key, chain: chain}, nil
}

// writeRecord renders (and signs, with sg) and writes the record atomically.
func writeRecord(res *assess.Result, path string, date time.Time, force bool, out io.Writer, sg *recordSigner) error {
	if sameFile(path, res.Plant.File) {
		return usagef("the record %s would overwrite the plant file", path)
	}
	if l := res.Plant.Line; l != nil {
		if sameFile(path, l.File) {
			return usagef("the record %s would overwrite the line file", path)
		}
	}
	doc, err := record.Build(res, record.Options{Date: date, PlantName: filepath.Base(res.Plant.File)})
	if err != nil {
		return err
	}
	pdf, pages, err := report.Render(doc)
	if err != nil {
		return err
	}
	pdf, signed, err := signRecord(pdf, sg, "pasval validation record")
	if err != nil {
		return err
	}
	if err := fileout.Write(path, pdf, force); err != nil {
		return usagef("%v", err)
	}
	verdict := "PASS"
	if !res.Pass {
		verdict = "FAIL"
	}
	line := ""
	if l := res.LineFile; l != nil {
		line = ", line file sha256 " + l.SHA256
	}
	fmt.Fprintf(out, "wrote %s: %d pages, %s, plant file sha256 %s%s%s\n", path, pages, verdict, res.InputSHA256, line, signed)
	return nil
}

// signRecord signs a rendered record with sg (none: unchanged) and says by
// whom, for the "wrote" line.
func signRecord(pdf []byte, sg *recordSigner, reason string) ([]byte, string, error) {
	if sg == nil {
		return pdf, "", nil
	}
	name := sg.chain[0].Subject.CommonName
	pdf, err := report.Sign(pdf, sg.key, sg.chain, report.SignInfo{Name: name, Reason: reason, Time: time.Now().UTC()})
	if err != nil {
		return nil, "", err
	}
	return pdf, ", signed by " + name, nil
}

// sameFile reports whether two paths name one existing file; a path that
// cannot be examined (a record not yet written) names no file the other does.
func sameFile(a, b string) bool {
	sa, errA := os.Stat(a)
	sb, errB := os.Stat(b)
	return errA == nil && errB == nil && os.SameFile(sa, sb)
}
