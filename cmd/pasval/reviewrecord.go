package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/fileout"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/record"
	"pasval/internal/version"
	"pasval/report"
)

// The run-review record: 'report PLANT.yaml --log RUN.csv … -o REVIEW.pdf'
// writes it, 'verify REVIEW.pdf --log RUN.csv …' re-renders it.

// runFlagNames are the flags of runFlags, which report takes only with --log.
var runFlagNames = []string{"columns", "separator", "decimal-comma", "temperature-unit", "flow-unit", "timezone", "skip-bad-rows", "gap", "window", "quiet"}

// refuseRunFlags makes a run flag without --log a usage error.
func refuseRunFlags(cmd *cobra.Command, logs []string) error {
	if len(logs) > 0 {
		return nil
	}
	for _, n := range runFlagNames {
		if cmd.Flags().Changed(n) {
			return usagef("--%s reads recorded runs: it goes with --log RUN.csv", n)
		}
	}
	return nil
}

// runReviewRecord writes the run-review record of opts.logs.
func runReviewRecord(opts reportOptions, out, diag io.Writer) error {
	if opts.output == "" {
		return usagef("report needs -o REVIEW.pdf (see 'pasval report --help')")
	}
	date, err := recordDate(opts.date)
	if err != nil {
		return err
	}
	if _, _, err := opts.readerOptions(); err != nil {
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
	rev, err := reviewRunsTraced(p, opts.logs, opts.runFlags, diag, record.TraceBuckets)
	if err != nil {
		return err
	}
	for _, in := range append([]string{p.File}, runPathsOf(rev)...) {
		if sameFile(opts.output, in) {
			return usagef("the record %s would overwrite its input %s", opts.output, in)
		}
	}
	doc := record.BuildRunReview(rev, record.RunOptions{Date: date, PlantName: filepath.Base(p.File),
		Options: opts.runFlags.encode(), Reading: opts.runFlags.reading()})
	pdf, pages, err := report.Render(doc)
	if err != nil {
		return err
	}
	pdf, signed, err := signRecord(pdf, sg, "pasval run-review record")
	if err != nil {
		return err
	}
	if err := fileout.Write(opts.output, pdf, opts.force); err != nil {
		return usagef("%v", err)
	}
	fmt.Fprintf(out, "wrote %s: %d pages, %s, plant file sha256 %s%s\n", opts.output, pages, present.RunOverall(rev), p.SHA256, signed)
	if rev.Events() > 0 {
		return errChecksFailed
	}
	return nil
}

func runPathsOf(rev *assess.RunReview) []string {
	var paths []string
	for _, f := range rev.Files {
		paths = append(paths, f.Path)
	}
	return paths
}

// verifyRunReview checks a run-review record: with the recorded runs given,
// each must be one the record names (by SHA-256), and the review computed
// again from them and the attached plant file, read as the record says,
// must re-render the record byte for byte. Without them the pages cannot be
// checked, and it says so. Bad run files are an error (exit 2).
func verifyRunReview(st *report.Stored, pdf []byte, logs []string, out, diag io.Writer) (bool, error) {
	for _, in := range st.Inputs {
		fmt.Fprintf(out, "%-27s %s  %s\n", "recorded run", in.SHA256, in.Name)
	}
	signed := report.Signed(pdf)
	ok := true
	if signed {
		ok = verifySignatures(pdf, out)
	}
	if len(logs) == 0 {
		fmt.Fprintln(out, "pages                       NOT byte-checked: the recorded runs were not given (add --log RUN.csv for each); "+
			"only the attached plant file was checked")
		return ok, nil
	}
	f, err := decodeRunFlags(st.Options)
	if err != nil {
		fmt.Fprintf(out, "reading options             DIFFER: the record's are unreadable (%v)\n", err)
		return false, nil
	}
	plant := st.Attachments[0]
	p, err := plantfile.Parse(plant.Name, plant.Content)
	if err == nil {
		err = plantfile.Validate(p)
	}
	if err != nil {
		fmt.Fprintf(out, "recomputed                  the attached plant file does not compute: %s\n", strings.ReplaceAll(err.Error(), "\n", "; "))
		return false, nil
	}
	rev, err := reviewRunsTraced(p, logs, f, diag, record.TraceBuckets)
	if err != nil {
		return false, err
	}
	// Each recorded run must be given, once; nothing else may be.
	files := make([]assess.RunFile, len(st.Inputs))
	used := make([]bool, len(rev.Files))
	matched := true
	for i, in := range st.Inputs {
		found := -1
		for j, g := range rev.Files {
			if !used[j] && g.SHA256 == in.SHA256 {
				found = j
				break
			}
		}
		if found < 0 {
			writePathLine(out, in.Name, in.SHA256+"  DIFFERS: no file given has it")
			matched = false
			continue
		}
		used[found] = true
		g := rev.Files[found]
		writePathLine(out, g.Path, g.SHA256+"  matches")
		// Shown under the name the record gave it.
		g.Path = in.Name
		listed := make(inputerr.List, len(g.Listed))
		for k, e := range g.Listed {
			c := *e
			c.Pos.File = in.Name
			listed[k] = &c
		}
		g.Listed = listed
		files[i] = g
	}
	for j, g := range rev.Files {
		if !used[j] {
			writePathLine(out, g.Path, g.SHA256+"  DIFFERS: not a run of this record")
			matched = false
		}
	}
	if !matched {
		return false, nil
	}
	again, err := assess.NewRunReview(p, rev.Model, files, rev.Location)
	if err != nil {
		return false, reviewError(err)
	}
	doc := record.BuildRunReview(again, record.RunOptions{Date: st.Date, PlantName: plant.Name, Options: st.Options, Reading: f.reading()})
	cover := doc.Cover
	switch {
	case !st.HasVerdicts:
	case st.Pass == cover.Pass && equalVerdicts(st.Verdicts, cover.Verdicts):
		fmt.Fprintf(out, "verdicts                    stored %s, recomputed %s (%d lines)  match\n", passWord(st.Pass), passWord(cover.Pass), len(cover.Verdicts))
	default:
		fmt.Fprintf(out, "verdicts                    stored %s (%s), recomputed %s (%s)  DIFFER\n", passWord(st.Pass), verdictList(st.Verdicts),
			passWord(cover.Pass), verdictList(cover.Verdicts))
		ok = false
	}
	if st.Version != version.Version || st.Date.IsZero() {
		fmt.Fprintf(out, "pages                       NOT byte-checked: the record was made by pasval %s, this is pasval %s; only its inputs and verdicts were checked\n",
			st.Version, version.Version)
		return ok, nil
	}
	re, _, err := report.Render(doc)
	if err != nil {
		return false, err
	}
	return comparePages(st, pdf, re, signed, "its plant file and recorded runs", out) && ok, nil
}

func equalVerdicts(a, b []report.Verdict) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}
