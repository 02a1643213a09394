package main

// Source of the expected values: the project's reading rules for verify
// (regular files only; a record at most report.MaxRecordSize bytes, a plant
// file at most report.MaxPlantFileSize); no outside reference applies.

import (
	"context"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"time"

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
	if out, errs, code := runBinaryGuarded(t, "verify", rec); code != 0 || !strings.Contains(out, "MATCH") {
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
