package main

// Reproducers of faults found by adversarial testing, as end-to-end tests of
// the binary (README "Reliability"). Source of the expectations: the project's
// contract (exit 0 pass, 1 a check fails, 2 bad input, usage or lost output;
// errors name file, line and field; free text never prints raw).

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// TestLostOutputIsAnError: a command whose results cannot be written (a full
// disk, a closed standard output) exits 2 with the write error, never 0 or 1.
func TestLostOutputIsAnError(t *testing.T) {
	if _, err := os.Stat("/dev/full"); err != nil {
		t.Skip("no /dev/full on this system")
	}
	milk := filepath.Join(demoDir, "htst-milk-si.yaml")
	dessert := filepath.Join(demoDir, "frozen-dessert-si.yaml") // fails a check: exit 1 when written
	cider := filepath.Join(demoDir, "cider-us.yaml")
	dir := t.TempDir()
	rec := filepath.Join(dir, "milk.pdf")
	if _, errs, code := runBinary(t, "report", milk, "-o", rec, "--date", "2026-12-01"); code != 0 {
		t.Fatalf("report: %d %s", code, errs)
	}
	for _, args := range [][]string{
		{"check", milk}, {"check", milk, "--json"}, {"check", dessert}, {"check", "--compare-arrangements", milk},
		{"hold", milk}, {"hold", dessert, "--json"}, {"plates", cider, "--add", "10"}, {"plates", cider, "--add", "10", "--json"},
		{"due", milk}, {"due", dessert, "--json"},
		{"verify", rec}, {"verify", rec, milk}, {"schema"}, {"init"}, {"init", "--units", "us"},
		{"completion", "bash"}, {"completion", "zsh"}, {"completion", "fish"}, {"--help"}, {"check", "--help"}, {"--version"},
	} {
		for _, redirect := range []string{">/dev/full", ">&-"} {
			cmd := exec.Command("sh", append([]string{"-c", `"$0" "$@" ` + redirect, binPath}, args...)...)
			var errb strings.Builder
			cmd.Stderr = &errb
			err := cmd.Run()
			code := 0
			if ee, ok := err.(*exec.ExitError); ok {
				code = ee.ExitCode()
			}
			if code != exitInput || !strings.Contains(errb.String(), "cannot write the output") {
				t.Errorf("%v %s: exit %d, stderr %q; want 2 and the write error", args, redirect, code, errb.String())
			}
		}
	}
}

// TestUsageErrorsExitTwo: a shell pasval cannot complete and a help topic that
// does not exist are usage errors; a sweep whose step would overflow is
// refused with the rule, not a wrapped-around number.
func TestUsageErrorsExitTwo(t *testing.T) {
	cider := filepath.Join(demoDir, "cider-us.yaml")
	for _, tc := range []struct {
		args []string
		frag string
	}{
		{[]string{"completion", "tcsh"}, `no completion for "tcsh"`},
		{[]string{"completion"}, "completion needs a shell"},
		{[]string{"help", "nosuchcmd"}, `no help topic "nosuchcmd"`},
		{[]string{"help", "check", "extra"}, `no help topic "check extra"`},
		{[]string{"plates", cider, "--sweep", "1:10000:9223372036854775807"}, "STEP from 1 to 10000"},
		{[]string{"plates", cider, "--sweep", "1:99999999999999999999:1"}, "whole numbers"},
	} {
		out, errs, code := runBinary(t, tc.args...)
		if code != exitInput || !strings.Contains(errs, tc.frag) || strings.Contains(errs, "-9223372036854775808") {
			t.Errorf("%v: exit %d, stderr %q, stdout %d bytes; want 2 and %q", tc.args, code, errs, len(out), tc.frag)
		}
	}
	if out, errs, code := runBinary(t, "help", "check"); code != 0 || !strings.Contains(out, "pasval check") {
		t.Errorf("help check: exit %d %q", code, errs)
	}
}

// TestForgedVerdictNeverPrinted: a site name whose YAML escapes hold a line
// break and a terminal escape cannot add a "Result: PASS" line to the
// terminal or to the record's cover: it is refused where the file is read,
// naming the line and field, and no record is written.
func TestForgedVerdictNeverPrinted(t *testing.T) {
	bad := filepath.Join(badDir, "text-forged-verdict.yaml")
	rec := filepath.Join(t.TempDir(), "forged.pdf")
	for _, args := range [][]string{{"check", bad}, {"hold", bad}, {"report", bad, "-o", rec}, {"check", bad, "--record", rec}} {
		out, errs, code := runBinary(t, args...)
		if code != exitInput || out != "" || !strings.Contains(errs, "text-forged-verdict.yaml:3:") || !strings.Contains(errs, "record.site") {
			t.Errorf("%v: exit %d, stdout %q, stderr %q; want 2 naming record.site on line 3", args, code, out, errs)
		}
		if strings.Contains(errs, "\nResult") || strings.ContainsRune(errs, '\x1b') {
			t.Errorf("%v: the forged text reached the terminal raw: %q", args, errs)
		}
		if _, err := os.Stat(rec); err == nil {
			t.Fatalf("%v wrote a record", args)
		}
	}
}

// TestPlatesLimitIsOneLimit: a regenerator at the largest plate count pasval
// reads gets its record, the what-if page sized within the limit; plates
// beyond it are refused where the file is read, and an --add beyond it is a
// usage error that names the limit.
func TestPlatesLimitIsOneLimit(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(demoDir, "cider-us.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, plates := range []string{"9995", "10000"} {
		src := strings.Replace(string(data), "  plates: 40\n", "  plates: "+plates+"\n", 1)
		if src == string(data) {
			t.Fatal("the cider demo's regenerator plates line moved")
		}
		plant := filepath.Join(dir, "big-"+plates+".yaml")
		writeFile(t, plant, src)
		rec := filepath.Join(dir, "big-"+plates+".pdf")
		if _, errs, code := runBinary(t, "report", plant, "-o", rec, "--date", "2026-12-01"); code > 1 {
			t.Errorf("report with %s plates: exit %d %s", plates, code, errs)
		}
		if _, errs, code := runBinary(t, "plates", plant, "--add", "10"); code != exitInput || !strings.Contains(errs, "10000") {
			t.Errorf("plates --add 10 with %s plates: exit %d %q; want 2 naming the limit", plates, code, errs)
		}
	}
	src := strings.Replace(string(data), "  plates: 40\n", "  plates: 10010\n", 1)
	plant := filepath.Join(dir, "too-many.yaml")
	writeFile(t, plant, src)
	for _, args := range [][]string{{"check", plant}, {"report", plant, "-o", filepath.Join(dir, "too-many.pdf")}} {
		if _, errs, code := runBinary(t, args...); code != exitInput || !strings.Contains(errs, "too-many.yaml:25:") ||
			!strings.Contains(errs, "regeneration.plates") {
			t.Errorf("%v: exit %d %q; want 2 at line 25, regeneration.plates", args, code, errs)
		}
	}
}

// TestNonFiniteResultsTracedToInputs: a result that would be infinite is
// never printed ("+Inf" in text, a JSON encoder error): the command exits 2
// naming the entered values that cause it, with their lines. Here kinetics
// at -233.3 °C with z = 1 K give a finite log reduction at the setpoint
// (about 1e307) but an infinite one 1.5 K above it, in hold's setpoint table.
func TestNonFiniteResultsTracedToInputs(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(badDir, "organism-zero-z.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	src := strings.Replace(strings.Replace(string(data), "D_temperature: 71.7 °C", "D_temperature: -233.3 °C", 1), "z: 0 °C", "z: 1 °C", 1)
	plant := filepath.Join(t.TempDir(), "far-kinetics.yaml")
	writeFile(t, plant, src)
	for _, args := range [][]string{{"hold", plant}, {"hold", plant, "--json"}} {
		out, errs, code := runBinary(t, args...)
		if code != exitInput || out != "" || !strings.Contains(errs, "far-kinetics.yaml:21:20: organisms[0].D_temperature: ") ||
			!strings.Contains(errs, "far-kinetics.yaml:22:8: organisms[0].z: ") || strings.Contains(errs, "Inf") {
			t.Errorf("%v: exit %d, stdout %d bytes, stderr %q; want 2 naming D_temperature and z", args, code, len(out), errs)
		}
	}
	bad := filepath.Join(badDir, "kinetics-non-finite.yaml")
	for _, cmd := range []string{"check", "hold", "report"} {
		args := []string{cmd, bad}
		if cmd == "report" {
			args = append(args, "-o", filepath.Join(t.TempDir(), "r.pdf"))
		}
		if out, errs, code := runBinary(t, args...); code != exitInput || out != "" || !strings.Contains(errs, ":21:20: organisms[0].D_temperature: ") {
			t.Errorf("%v: exit %d, stderr %q", args, code, errs)
		}
	}
}
