package main

// Source of the expected values: the project's reading rules for verify
// (regular files only; a record at most report.MaxRecordSize bytes, a plant
// file at most report.MaxPlantFileSize; exit 0 only for a record identical to
// its re-render); no outside reference applies.

import (
	"bytes"
	"context"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"testing"
	"time"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/model"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/types"

	"pasval/internal/version"
	"pasval/report"
)

// runBinaryGuarded runs the binary like runBinary, but kills it after a
// minute: a read that blocks (a named pipe) or never ends (a device) must
// fail the test rather than hang it. The time is a guard, not asserted.
func runBinaryGuarded(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, binPath, args...)
	var out, errb strings.Builder
	cmd.Stdout, cmd.Stderr = &out, &errb
	err := cmd.Run()
	if ctx.Err() != nil {
		t.Fatalf("pasval %s did not finish: %v", strings.Join(args, " "), err)
	}
	var ee *exec.ExitError
	if errors.As(err, &ee) {
		return out.String(), errb.String(), ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return out.String(), errb.String(), 0
}

func TestVerifyRecordSizeCap(t *testing.T) {
	// A record padded after its end to exactly the cap still verifies; one
	// byte more is refused before it is read whole.
	dir := t.TempDir()
	rec := filepath.Join(dir, "record.pdf")
	if _, errs, code := runBinary(t, "report", filepath.Join(demoDir, "htst-milk-si.yaml"), "-o", rec, "--date", "2026-12-01"); code != 0 {
		t.Fatalf("report: %d %s", code, errs)
	}
	if err := os.Truncate(rec, report.MaxRecordSize); err != nil { // zeros after %%EOF
		t.Fatal(err)
	}
	// Read whole (not refused for its size); the zeros after %%EOF make it
	// differ from the re-rendered record outside its pages: exit 1.
	if out, errs, code := runBinaryGuarded(t, "verify", rec); code != 1 || !strings.Contains(out, "DIFFERS elsewhere") {
		t.Errorf("record of exactly %d bytes: exit %d %q %q", report.MaxRecordSize, code, out, errs)
	}
	if err := os.Truncate(rec, report.MaxRecordSize+1); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runBinaryGuarded(t, "verify", rec)
	if want := rec + ": not a pasval record: larger than 16 MiB"; code != exitInput || !strings.Contains(errs, want) {
		t.Errorf("record of %d bytes: exit %d %q; want 2 and %q", report.MaxRecordSize+1, code, errs, want)
	}
	// A plant file to compare is bounded too.
	plant := filepath.Join(dir, "plant.yaml")
	if err := os.WriteFile(plant, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Truncate(plant, report.MaxPlantFileSize+1); err != nil {
		t.Fatal(err)
	}
	if err := os.Truncate(rec, report.MaxRecordSize); err != nil {
		t.Fatal(err)
	}
	_, errs, code = runBinaryGuarded(t, "verify", rec, plant)
	if want := plant + ": not a plant file: larger than 1 MiB"; code != exitInput || !strings.Contains(errs, want) {
		t.Errorf("plant file of %d bytes: exit %d %q; want 2 and %q", report.MaxPlantFileSize+1, code, errs, want)
	}
}

func TestVerifyReadsRegularFilesOnly(t *testing.T) {
	// A folder, a device that never ends (/dev/zero) and a named pipe that
	// blocks until written are refused at once, as record or as plant file.
	dir := t.TempDir()
	rec := filepath.Join(dir, "record.pdf")
	if _, errs, code := runBinary(t, "report", filepath.Join(demoDir, "htst-milk-si.yaml"), "-o", rec, "--date", "2026-12-01"); code != 0 {
		t.Fatalf("report: %d %s", code, errs)
	}
	cases := map[string]string{dir: "a folder"}
	if runtime.GOOS == "linux" {
		cases["/dev/zero"] = "a device"
	}
	if fifo, ok := makeFIFO(t, dir); ok {
		cases[fifo] = "a named pipe"
	}
	for path, kind := range cases {
		for _, args := range [][]string{{"verify", path}, {"verify", rec, path}} {
			_, errs, code := runBinaryGuarded(t, args...)
			if want := path + ": not a regular file (" + kind + ")"; code != exitInput || !strings.Contains(errs, want) {
				t.Errorf("%v: exit %d %q; want 2 and %q", args, code, errs, want)
			}
		}
	}
	// A symbolic link to a record is read as the record.
	link := filepath.Join(dir, "link.pdf")
	if err := os.Symlink(rec, link); err != nil {
		t.Fatal(err)
	}
	if out, errs, code := runBinaryGuarded(t, "verify", link); code != 0 || !strings.Contains(out, "MATCH") {
		t.Errorf("verify through a link: exit %d %q %q", code, out, errs)
	}
}

// makeFIFO makes a named pipe in dir with mkfifo(1), where there is one.
func makeFIFO(t *testing.T, dir string) (string, bool) {
	t.Helper()
	if _, err := exec.LookPath("mkfifo"); err != nil {
		t.Logf("no mkfifo: %v", err)
		return "", false
	}
	p := filepath.Join(dir, "pipe.pdf")
	if out, err := exec.Command("mkfifo", p).CombinedOutput(); err != nil {
		t.Fatalf("mkfifo: %v %s", err, out)
	}
	return p, true
}

// pdfcpuConf is a pdfcpu configuration that reads and writes no
// configuration folder.
func pdfcpuConf() *model.Configuration {
	api.DisableConfigDir()
	return model.NewDefaultConfiguration()
}

// failingRecord writes the failing frozen-dessert demo's record into dir.
func failingRecord(t *testing.T, dir string) (string, []byte) {
	t.Helper()
	rec := filepath.Join(dir, "record.pdf")
	if _, errs, code := runBinary(t, "report", filepath.Join(demoDir, "frozen-dessert-si.yaml"), "-o", rec, "--date", "2026-12-01"); code != 1 {
		t.Fatalf("report: exit %d %s", code, errs)
	}
	pdf, err := os.ReadFile(rec)
	if err != nil {
		t.Fatal(err)
	}
	return rec, pdf
}

func TestVerifyFindsAForgedPage(t *testing.T) {
	dir := t.TempDir()
	rec, pdf := failingRecord(t, dir)
	if out, _, code := runBinary(t, "verify", rec); code != 0 || !strings.Contains(out, "identical, byte for byte") {
		t.Fatalf("untouched record: exit %d\n%s", code, out)
	}
	// Text drawn over page 1 of the failing record, attachment and metadata
	// untouched: the verdict box now "says" PASS.
	wm, err := api.TextWatermark("Result: PASS, all 3 checks pass", "font:Helvetica, points:24, pos:c, rot:0, fillcolor:#008000", true, false, types.POINTS)
	if err != nil {
		t.Fatal(err)
	}
	var forged bytes.Buffer
	if err := api.AddWatermarks(bytes.NewReader(pdf), &forged, []string{"1"}, wm, pdfcpuConf()); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "forged.pdf")
	if err := os.WriteFile(path, forged.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := runBinary(t, "verify", path)
	if code != 1 || !strings.Contains(out, "page 1 differs first") || !strings.Contains(out, "MISMATCH") {
		t.Errorf("forged page: exit %d\n%s%s", code, out, errs)
	}
}

func TestVerifyReadsARecordResavedByAnotherProgram(t *testing.T) {
	dir := t.TempDir()
	_, pdf := failingRecord(t, dir)
	// Re-saved, untouched, by another PDF program (pdfcpu's optimizer rewrites
	// the whole file): read, not refused; its verdicts agree, its pages have the
	// same content, but the file is not byte-identical: exit 1, saying so.
	var resaved bytes.Buffer
	if err := api.Optimize(bytes.NewReader(pdf), &resaved, pdfcpuConf()); err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(resaved.Bytes(), pdf) {
		t.Fatal("the re-save changed nothing")
	}
	path := filepath.Join(dir, "resaved.pdf")
	if err := os.WriteFile(path, resaved.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := runBinary(t, "verify", path)
	for _, want := range []string{"attached plant-file sha256", "matches", "stored FAIL, recomputed FAIL (3 checks)  match",
		"every page's content matches the re-rendered record, but the file DIFFERS elsewhere"} {
		if !strings.Contains(out, want) {
			t.Errorf("re-saved record: output lacks %q", want)
		}
	}
	if code != 1 {
		t.Errorf("re-saved record: exit %d, want 1 (not byte-identical)\n%s%s", code, out, errs)
	}
}

func TestVerifyRecordOfAnotherVersion(t *testing.T) {
	dir := t.TempDir()
	_, pdf := failingRecord(t, dir)
	// The version in the metadata is another (an edit of the same length keeps
	// the file's offsets): the pages cannot be byte-checked, the verdicts are
	// recomputed and compared, and they agree: exit 0, saying so plainly.
	other := bytes.Replace(pdf, []byte("pasval-version:"+version.Version), []byte("pasval-version:"+strings.Repeat("9", len(version.Version))), 1)
	if bytes.Equal(other, pdf) {
		t.Fatal("no version in the metadata")
	}
	path := filepath.Join(dir, "other.pdf")
	if err := os.WriteFile(path, other, 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, code := runBinary(t, "verify", path)
	if code != 0 || !strings.Contains(out, "NOT byte-checked") || !strings.Contains(out, "stored FAIL, recomputed FAIL") ||
		!strings.Contains(out, "\nPARTIAL MATCH: attachments and verdicts agree; pages not byte-checked") || strings.Contains(out, "\nMATCH") {
		t.Errorf("other version: exit %d\n%s", code, out)
	}
	// The stored result edited to pass: the recomputed verdicts disagree, exit 1.
	forged := bytes.Replace(other, []byte("pasval-result:fail"), []byte("pasval-result:pass"), 1)
	if err := os.WriteFile(path, forged, 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, code = runBinary(t, "verify", path)
	if code != 1 || !strings.Contains(out, "DIFFER") {
		t.Errorf("other version, verdict edited: exit %d\n%s", code, out)
	}
}

func TestVerifyRunReviewWithoutItsRunsIsUnverified(t *testing.T) {
	// A run review carries its plant file, not its runs: without --log its
	// verdicts and pages cannot be checked, so verify says UNVERIFIED (exit
	// 1), never MATCH; with the run it is byte for byte, MATCH.
	dir := t.TempDir()
	rec := filepath.Join(dir, "review.pdf")
	plant, shift := filepath.Join(demoDir, "htst-milk-si.yaml"), filepath.Join(demoDir, "runs", "htst-milk-si-shift.csv")
	if _, errs, code := runBinary(t, "report", plant, "--log", shift, "-o", rec); code > 1 {
		t.Fatalf("report: exit %d %s", code, errs)
	}
	out, _, code := runBinary(t, "verify", rec)
	if code != exitFail || !strings.Contains(out, "\nUNVERIFIED: ") || !strings.Contains(out, "give --log") || strings.Contains(out, "MATCH") {
		t.Errorf("without the run: exit %d\n%s", code, out)
	}
	out, _, code = runBinary(t, "verify", rec, "--log", shift)
	if code != exitPass || !strings.Contains(out, "\nMATCH\n") || strings.Contains(out, "PARTIAL") {
		t.Errorf("with the run: exit %d\n%s", code, out)
	}
	// The run's path is long: the hashes still line up in one column.
	hash := regexp.MustCompile(`[0-9a-f]{64}`)
	for _, l := range strings.Split(out, "\n") {
		if loc := hash.FindStringIndex(l); loc != nil && loc[0] != 28 {
			t.Errorf("a hash at column %d, not 28: %q", loc[0], l)
		}
	}
}
