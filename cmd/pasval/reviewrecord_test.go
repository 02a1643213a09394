package main

// Expected outcomes come from the record's own definition (docs/METHOD.md §13.7:
// byte comparison after re-rendering); no external source applies to them.

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestRunReviewRecord writes the run-review record of the demo shift and
// verifies it: without the runs nothing is recomputed (UNVERIFIED, exit 1), with
// them the record is re-rendered byte for byte; another run, an edited
// record or a validation record given runs are refused.
func TestRunReviewRecord(t *testing.T) {
	dir := t.TempDir()
	rec := filepath.Join(dir, "review.pdf")
	out, errs, code := runBinary(t, "report", demoPlant, "--log", demoRun, "-o", rec, "--date", "2026-12-01")
	if code != exitFail || !strings.HasPrefix(out, "wrote "+rec+": ") || !strings.Contains(out, "7 events (3 limits met, 3 product at risk, 1 no record)") {
		t.Fatalf("report --log: exit %d %q %q", code, out, errs)
	}
	out, _, code = runBinary(t, "verify", rec)
	if code != exitFail || !strings.Contains(out, "NOT byte-checked: the recorded runs were not given") || !strings.Contains(out, "recorded run ") {
		t.Errorf("verify without runs: exit %d\n%s", code, out)
	}
	// The run may be given from elsewhere, under another name.
	moved := filepath.Join(dir, "copy of the shift.csv")
	data, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	writeFile(t, moved, string(data))
	out, _, code = runBinary(t, "verify", rec, demoPlant, "--log", moved)
	if code != exitPass || !strings.Contains(out, "identical, byte for byte, to the record re-rendered from its plant file and recorded runs") ||
		!strings.Contains(out, "\nMATCH\n") {
		t.Errorf("verify with the run: exit %d\n%s", code, out)
	}
	// Another run: not one of the record's.
	other := filepath.Join(dir, "other.csv")
	writeFile(t, other, strings.Replace(string(data), "73.0", "73.1", 1))
	out, _, code = runBinary(t, "verify", rec, "--log", other)
	if code != exitFail || !strings.Contains(out, "DIFFERS: not a run of this record") || !strings.Contains(out, "DIFFERS: no file given has it") {
		t.Errorf("verify with another run: exit %d\n%s", code, out)
	}
	// An edited page (one byte of the trend's stream would be compressed;
	// the verdict text in the metadata is plain).
	pdf, err := os.ReadFile(rec)
	if err != nil {
		t.Fatal(err)
	}
	edited := filepath.Join(dir, "edited.pdf")
	writeFile(t, edited, strings.Replace(string(pdf), "pasval-result:fail", "pasval-result:pass", 1))
	out, _, code = runBinary(t, "verify", edited, "--log", demoRun)
	if code != exitFail || !strings.Contains(out, "MISMATCH") {
		t.Errorf("verify an edited record: exit %d\n%s", code, out)
	}
	// A validation record given runs; run flags without --log.
	val := filepath.Join(dir, "validation.pdf")
	if _, errs, code := runBinary(t, "report", demoPlant, "-o", val, "--date", "2026-12-01"); code > 1 {
		t.Fatalf("report: %d %s", code, errs)
	}
	if _, errs, code := runBinary(t, "verify", val, "--log", demoRun); code != exitInput || !strings.Contains(errs, "is not a run-review record: --log does not apply") {
		t.Errorf("verify a validation record with runs: exit %d %q", code, errs)
	}
	if _, errs, code := runBinary(t, "report", demoPlant, "-o", val, "--force", "--decimal-comma"); code != exitInput || !strings.Contains(errs, "--decimal-comma reads recorded runs: it goes with --log") {
		t.Errorf("report with a run flag and no --log: exit %d %q", code, errs)
	}
	// The record never overwrites its inputs.
	if _, errs, code := runBinary(t, "report", demoPlant, "--log", moved, "-o", moved, "--force"); code != exitInput || !strings.Contains(errs, "would overwrite its input") {
		t.Errorf("report over its run: exit %d %q", code, errs)
	}
}

// TestRunReviewRecordKeepsTheReadingOptions: a run read with options (';',
// decimal commas, renamed columns, a time zone) is verified without them:
// the record carries how it was read.
func TestRunReviewRecordKeepsTheReadingOptions(t *testing.T) {
	dir := t.TempDir()
	data, err := os.ReadFile(demoRun)
	if err != nil {
		t.Fatal(err)
	}
	// Local times without an offset (06:00 UTC is 07:00 in Berlin in
	// March), ';' between columns, decimal commas, other column names.
	var b strings.Builder
	b.WriteString("Zeit;TT-301 [°C];FT-101 [L/h];FDV\n")
	for _, l := range strings.Split(strings.TrimSpace(string(data)), "\n")[1:] {
		f := strings.Split(l, ",")
		h := int(f[0][11]-'0')*10 + int(f[0][12]-'0') + 1
		ts := f[0][:11] + string(rune('0'+h/10)) + string(rune('0'+h%10)) + strings.TrimSuffix(f[0][13:], "Z")
		b.WriteString(strings.Join([]string{ts, strings.ReplaceAll(f[1], ".", ","), strings.ReplaceAll(f[2], ".", ","), f[3]}, ";") + "\n")
	}
	runFile := filepath.Join(dir, "schicht.csv")
	writeFile(t, runFile, b.String())
	rec := filepath.Join(dir, "review.pdf")
	args := []string{"report", demoPlant, "--log", runFile, "-o", rec, "--date", "2026-12-01", "--decimal-comma", "--timezone", "Europe/Berlin",
		"--columns", "time=Zeit,hold_outlet_temperature=TT-301,flow_rate=FT-101,forward=FDV"}
	if out, errs, code := runBinary(t, args...); code != exitFail {
		t.Fatalf("report: exit %d %q %q", code, out, errs)
	}
	out, _, code := runBinary(t, "verify", rec, "--log", runFile)
	if code != exitPass || !strings.Contains(out, "identical, byte for byte") {
		t.Errorf("verify: exit %d\n%s", code, out)
	}
	var o, e bytes.Buffer
	if c := run([]string{"logs", demoPlant, runFile, "--decimal-comma", "--timezone", "Europe/Berlin",
		"--columns", "time=Zeit,hold_outlet_temperature=TT-301,flow_rate=FT-101,forward=FDV"}, &o, &e); c != exitFail || !strings.Contains(o.String(), "Summary (times Europe/Berlin)") {
		t.Errorf("logs of the same file: exit %d %s", c, e.String())
	}
}
