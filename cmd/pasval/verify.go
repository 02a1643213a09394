package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/fileout"
	"pasval/internal/record"
	"pasval/internal/version"
	"pasval/report"
)

// errMismatch reports a verification that read everything and found a difference.
var errMismatch = fmt.Errorf("the record does not match: %w", errChecksFailed)

// errUnverified reports a run review given without its runs: what was read
// agrees, but its verdicts and pages could not be recomputed.
var errUnverified = fmt.Errorf("the record could not be verified without its recorded runs: %w", errChecksFailed)

func newVerifyCmd(stdout io.Writer) *cobra.Command {
	var logs []string
	cmd := &cobra.Command{
		Use:   "verify RECORD.pdf [PLANT.yaml [LINE.yaml]] [--log RUN.csv …]",
		Short: "Check that a record is exactly what its plant file gives",
		Long: `verify reads a record written by 'pasval report'. It checks that the plant
file attached to the record matches the SHA-256 in the record's metadata (and,
given one, that PLANT.yaml matches it too), computes the attached plant file
again, and re-renders the record with the record date and tool version stored
in its metadata: the whole file must be identical, byte for byte, so an edited
page, verdict or attachment is found (the first page that differs is named).
A record made by another version of pasval cannot be re-rendered identically:
then the verdicts stored in its metadata are compared with the recomputed ones,
and verify says plainly that the pages were not byte-checked. The record is
read with a PDF library, so a record re-saved by another program is read (and
reported as differing from the re-rendered one).

A record of a plant file that names a line file (line_file) carries both, each
with its SHA-256, and verify checks both. A matrix record ('pasval matrix
--record') carries the line file first, then each product file (named by its
product), and is re-rendered from them all. The files given are matched to
the files the record carries by their content, in any order; one that matches
none is reported as not one the record carries. ` + fmt.Sprintf(`Every file is read only from
a regular file, a record of at most %d MiB (one is well under 150 KB) and each input
file of at most %d MiB.`, report.MaxRecordSize>>20, report.MaxPlantFileSize>>20),
		Example: `  pasval verify line2-record.pdf
  pasval verify line2-record.pdf line2.yaml
  pasval verify milk-record.pdf whole-milk.yaml line.yaml
  pasval verify line3-matrix.pdf line.yaml whole-milk.yaml cream.yaml
  pasval verify review-2026-03-14.pdf --log shift-2026-03-14.csv`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 1 {
				return usagef("verify needs a record and optionally the files it was made from, got %d arguments", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return runVerify(args[0], args[1:], logs, stdout, cmd.ErrOrStderr())
		},
	}
	cmd.Flags().StringArrayVar(&logs, "log", nil, "a recorded run of a run-review record (file or folder; repeat for several), to re-render it")
	cmd.Long += `

A run-review record (report --log) carries its plant file but not its
recorded runs: verify re-reads the runs given with --log (matched by their
SHA-256, read with the options the record stores) and re-renders the
record; without them it checks the plant file only and ends UNVERIFIED
(exit 1): neither the verdicts nor the pages could be checked, so a script
that trusts the exit status is never told that an unchecked review holds.`
	cmd.Long += `

The last line is MATCH only when the record is byte for byte its re-render;
PARTIAL MATCH when what could be checked agrees but the pages could not be
compared (a record of another version); UNVERIFIED for a run review given
without its runs; MISMATCH otherwise.

Exit status:
  0  MATCH: the record is identical to the one its plant file gives; or
     PARTIAL MATCH: made by another version, its plant file and verdicts
     agree (pages not byte-checked)
  1  anything differs: the attachment, the plant file given, a verdict, a page,
     or any other byte of the file; or UNVERIFIED: a run review given without
     its runs (its plant file agrees; verdicts and pages not checked)
  2  the record or plant file cannot be read`
	return cmd
}

func sha256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

func runVerify(recordPath string, inputPaths, logs []string, out, diag io.Writer) error {
	pdf, err := readRegular(recordPath, "record", report.ReadRecord)
	if err != nil {
		return err
	}
	inputs := make([][]byte, len(inputPaths))
	for i, path := range inputPaths {
		if inputs[i], err = readRegular(path, "plant file", report.ReadPlantFile); err != nil {
			return err
		}
	}
	st, err := report.Read(pdf)
	if err != nil {
		if errors.Is(err, report.ErrUnreadable) {
			return usagef("%s: %v", recordPath, err)
		}
		return err
	}
	if len(inputPaths) > len(st.Attachments) {
		return usagef("%s carries %d input files (%s); %d were given to compare", recordPath, len(st.Attachments), attachmentNames(st), len(inputPaths))
	}
	// Each file given is matched to the attachment with its content, in any
	// order; one that matches none is at fault, not the record.
	sums := make([]string, len(inputs))
	for i := range inputs {
		sums[i] = sha256Hex(inputs[i])
	}
	given := make([]int, len(st.Attachments)) // the input matched to each attachment, or −1
	used := make([]bool, len(inputs))
	for i, a := range st.Attachments {
		given[i] = -1
		sum := sha256Hex(a.Content)
		for j := range inputs {
			if !used[j] && sums[j] == sum {
				given[i], used[j] = j, true
				break
			}
		}
	}
	ok, filesOK := true, true
	for i, a := range st.Attachments {
		role := attachmentRole(st, i)
		recorded := st.FileHashes[a.Name]
		if i == 0 {
			recorded = st.RecordedSHA256
		}
		attSum := sha256Hex(a.Content)
		if recorded == "" {
			fmt.Fprintf(out, "%-27s %s\n", "recorded "+role+" sha256", "none: the record's metadata lists no hash for "+a.Name)
		} else {
			fmt.Fprintf(out, "%-27s %s  %s\n", "recorded "+role+" sha256", recorded, attachmentWhat(st, i))
		}
		fmt.Fprintf(out, "%-27s %s  %s\n", "attached "+role+" sha256", attSum, okWord(attSum == recorded))
		ok = ok && attSum == recorded
		if j := given[i]; j >= 0 {
			writePathLine(out, inputPaths[j], sums[j]+"  "+okWord(sums[j] == recorded))
			ok = ok && sums[j] == recorded
		}
	}
	for j, path := range inputPaths {
		if !used[j] {
			writePathLine(out, path, sums[j]+"  DIFFERS: this file is not one the record carries")
			filesOK = false
		}
	}
	// partial names what was not checked when the pages could not be
	// compared byte for byte ("" when they were).
	partial := ""
	// unverified names what was not checked of a run review given without
	// its runs: nothing it prints was recomputed, so it does not exit 0.
	unverified := ""
	switch st.Kind {
	case report.KindRunReview:
		okRuns, err := verifyRunReview(st, pdf, logs, out, diag)
		if err != nil {
			return err
		}
		ok = okRuns && ok
		switch {
		case len(logs) == 0:
			unverified = "the attachments agree; verdicts and pages not checked (give --log with each recorded run to re-render it)"
		case st.Version != version.Version || st.Date.IsZero():
			partial = fmt.Sprintf("attachments, runs and verdicts agree; pages not byte-checked (the record was made by %s, this is pasval %s)",
				madeBy(st), version.Version)
		}
	default:
		if len(logs) > 0 {
			return usagef("%s is not a run-review record: --log does not apply", recordPath)
		}
		okContent, byteChecked := verifyContent(st, pdf, out)
		ok = okContent && ok
		if !byteChecked {
			partial = fmt.Sprintf("attachments and verdicts agree; pages not byte-checked (the record was made by %s, this is pasval %s)",
				madeBy(st), version.Version)
		}
	}
	switch {
	case !ok:
		fmt.Fprintf(out, "MISMATCH: the record is not what %s %s; do not rely on it\n", attachedFiles(st), giveVerb(st))
		writeCaution(out)
		return errMismatch
	case !filesOK:
		fmt.Fprintf(out, "MISMATCH: a file given is not one the record carries (the record itself is what %s %s)\n", attachedFiles(st), giveVerb(st))
		writeCaution(out)
		return errMismatch
	case unverified != "":
		fmt.Fprintln(out, "UNVERIFIED: "+unverified)
		writeCaution(out)
		return errUnverified
	case partial != "":
		fmt.Fprintln(out, "PARTIAL MATCH: "+partial)
	default:
		fmt.Fprintln(out, "MATCH")
	}
	writeCaution(out)
	return nil
}

// writePathLine prints a file given on the command line and what was found
// of it; a path too long for the label column goes on a line of its own, so
// that the hashes stay in one column.
func writePathLine(out io.Writer, path, found string) {
	if len([]rune(path)) > 27 {
		fmt.Fprintf(out, "%s\n%-27s %s\n", path, "", found)
		return
	}
	fmt.Fprintf(out, "%-27s %s\n", path, found)
}

// attachmentWhat says which file an attachment is: its name, and for a
// matrix's product file the product, as the record's verdicts name it.
func attachmentWhat(st *report.Stored, i int) string {
	name := st.Attachments[i].Name
	if st.Kind == report.KindMatrix && i > 0 && len(st.Verdicts) == len(st.Attachments)-1 {
		return st.Verdicts[i-1].Check + " (" + name + ")"
	}
	return "(" + name + ")"
}

// attachedFiles names what a record is re-rendered from.
func attachedFiles(st *report.Stored) string {
	switch {
	case st.Kind == report.KindMatrix:
		return "its line and product files"
	case st.Kind != report.KindRunReview && len(st.Attachments) > 1:
		return "its plant and line files"
	}
	return "its plant file"
}

// giveVerb agrees with attachedFiles.
func giveVerb(st *report.Stored) string {
	if attachedFiles(st) == "its plant file" {
		return "gives"
	}
	return "give"
}

// attachmentRole names an attached file by what it is to the record.
func attachmentRole(st *report.Stored, i int) string {
	switch {
	case st.Kind == report.KindMatrix && i == 0:
		return "line-file"
	case st.Kind == report.KindMatrix:
		return "product"
	case i == 0:
		return "plant-file"
	case i == 1:
		return "line-file"
	}
	return "input-file"
}

func attachmentNames(st *report.Stored) string {
	var names []string
	for _, a := range st.Attachments {
		names = append(names, a.Name)
	}
	return strings.Join(names, ", ")
}

// madeBy names the version that made a record.
func madeBy(st *report.Stored) string {
	if st.Version == "" {
		return "an unstated version"
	}
	return "pasval " + st.Version
}

// verifyContent recomputes the attached plant file, compares the verdicts
// and, for a record of this version, the whole file with its re-render;
// byteChecked is false when the pages could not be compared (a record of
// another version).
func verifyContent(st *report.Stored, pdf []byte, out io.Writer) (ok, byteChecked bool) {
	rep, err := record.Reproduce(st)
	if err != nil {
		fmt.Fprintf(out, "recomputed                  the attached plant file does not compute: %s\n", strings.ReplaceAll(err.Error(), "\n", "; "))
		return false, true
	}
	cover := rep.Doc.Cover
	ok = true
	switch {
	case !st.HasVerdicts:
		fmt.Fprintf(out, "verdicts                    recomputed %s; the record stores none to compare\n", resultWord(cover.Pass, cover.NotJudged))
	case st.Pass == cover.Pass && st.NotJudged == cover.NotJudged && equalVerdicts(st.Verdicts, cover.Verdicts):
		what := "checks"
		if st.Kind == report.KindMatrix {
			what = "products"
		}
		fmt.Fprintf(out, "verdicts                    stored %s, recomputed %s (%d %s)  match\n", resultWord(st.Pass, st.NotJudged),
			resultWord(cover.Pass, cover.NotJudged), len(cover.Verdicts), what)
	default:
		fmt.Fprintf(out, "verdicts                    stored %s (%s), recomputed %s (%s)  DIFFER\n", resultWord(st.Pass, st.NotJudged),
			verdictList(st.Verdicts), resultWord(cover.Pass, cover.NotJudged), verdictList(cover.Verdicts))
		ok = false
	}
	signed := report.Signed(pdf)
	if signed {
		ok = verifySignatures(pdf, out) && ok
	}
	if st.Version != version.Version || rep.PDF == nil {
		fmt.Fprintf(out, "pages                       NOT byte-checked: the record was made by %s, this is pasval %s; only its plant file and verdicts were checked\n",
			madeBy(st), version.Version)
		return ok, false
	}
	return comparePages(st, pdf, rep.PDF, signed, attachedFiles(st), out) && ok, true
}

// comparePages compares a record with its re-render (from what: "its plant
// file"): identical bytes, or, for a signed record, the re-render followed
// by the signatures; else it names the first page that differs.
func comparePages(st *report.Stored, pdf, again []byte, signed bool, from string, out io.Writer) bool {
	if bytes.Equal(pdf, again) {
		fmt.Fprintf(out, "pages                       identical, byte for byte, to the record re-rendered from %s (pasval %s, %s)\n",
			from, st.Version, st.Date.Format("2006-01-02"))
		return true
	}
	if signed && bytes.HasPrefix(pdf, again) {
		// A signature is appended after the record: the record itself must
		// be the re-render, byte for byte, and the signing must change no page.
		if page, err := report.FirstDifferentPage(pdf, again); err == nil && page == 0 {
			fmt.Fprintf(out, "pages                       identical, byte for byte, to the record re-rendered from %s (pasval %s, %s), "+
				"followed by its signatures\n", from, st.Version, st.Date.Format("2006-01-02"))
			return true
		}
	}
	page, err := report.FirstDifferentPage(pdf, again)
	switch {
	case err != nil:
		fmt.Fprintf(out, "pages                       DIFFER from the re-rendered record; the pages cannot be compared one by one (%v)\n", err)
	case page > 0:
		fmt.Fprintf(out, "pages                       DIFFER from the record re-rendered from %s: page %d differs first\n", from, page)
	default:
		fmt.Fprintln(out, "pages                       every page's content matches the re-rendered record, but the file DIFFERS elsewhere "+
			"(metadata, attachment or structure: edited, or re-saved by another program)")
	}
	return false
}

// verifySignatures checks a signed record's signatures: each valid, the last
// covering the whole file, and no annotation but the signature fields.
func verifySignatures(pdf []byte, out io.Writer) bool {
	sigs, err := report.ReadSignatures(pdf)
	if err != nil {
		fmt.Fprintf(out, "signatures                  DIFFER: %v\n", err)
		return false
	}
	ok := sigs.Whole
	for _, sg := range sigs.List {
		state := "valid"
		if !sg.Valid {
			state = "INVALID"
		}
		trust := "its certificate does not chain to a root this system trusts: check who the signer is"
		if sg.Trusted {
			trust = "its certificate chains to a root this system trusts"
		}
		fmt.Fprintf(out, "signature                   %s (%s): %s; %s\n", sg.Name, sg.Subject, state, trust)
	}
	if !sigs.Whole {
		fmt.Fprintf(out, "signatures                  DIFFER: %d found, %d check out, or bytes were added after the last signature\n",
			sigs.Found, len(sigs.List))
	}
	only, page, err := report.OnlySignatureAnnotations(pdf)
	if err != nil || !only {
		fmt.Fprintf(out, "annotations                 DIFFER: page %d carries an annotation that is not a signature field\n", page)
		ok = false
	}
	return ok
}

// resultWord is a stored or recomputed result: PASS, FAIL, or NOT JUDGED
// when nothing was judged.
func resultWord(pass, notJudged bool) string {
	switch {
	case notJudged:
		return "NOT JUDGED"
	case pass:
		return "PASS"
	}
	return "FAIL"
}

func passWord(pass bool) string { return resultWord(pass, false) }

func verdictList(vs []report.Verdict) string {
	var s []string
	for _, v := range vs {
		s = append(s, v.Check+" "+resultWord(v.Pass, v.NotJudged))
	}
	if len(s) == 0 {
		return "no checks"
	}
	return strings.Join(s, ", ")
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
