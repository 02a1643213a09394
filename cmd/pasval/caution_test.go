package main

// Every printed verdict carries the caution (SAFETY.md "What every output
// says"): report's "wrote … PASS" line and verify's result among them.
// Source of the expected text: assess.Caution, the wording SAFETY.md sets out.

import (
	"bytes"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/assess"
)

func TestRecordVerdictsCarryTheCaution(t *testing.T) {
	caution := strings.Join(strings.Fields(assess.Caution), " ")
	count := func(s string) int { return strings.Count(strings.Join(strings.Fields(s), " "), caution) }
	dir := t.TempDir()
	rec := filepath.Join(dir, "milk.pdf")
	milk := filepath.Join(demoDir, "htst-milk-si.yaml")
	var out, errb bytes.Buffer
	if code := run([]string{"report", milk, "-o", rec}, &out, &errb); code != exitPass || count(out.String()) != 1 {
		t.Errorf("report: exit %d, the caution %d times:\n%s", code, count(out.String()), out.String())
	}
	out.Reset()
	if code := run([]string{"verify", rec}, &out, &errb); code != exitPass || count(out.String()) != 1 {
		t.Errorf("verify: exit %d, the caution %d times:\n%s", code, count(out.String()), out.String())
	}
	// check --record prints the "wrote" line as a note beside its results,
	// which carry the caution once.
	out.Reset()
	errb.Reset()
	if code := run([]string{"check", milk, "--record", rec, "--force"}, &out, &errb); code != exitPass ||
		count(out.String()+errb.String()) != 1 || !strings.Contains(errb.String(), "wrote ") {
		t.Errorf("check --record: exit %d, the caution %d times:\n%s%s", code, count(out.String()+errb.String()), out.String(), errb.String())
	}
}
