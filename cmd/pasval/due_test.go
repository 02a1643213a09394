package main

// Source of the expectations: the due command's contract (docs/METHOD.md
// §15.5) and the SI demo's invented test dates; the review date of the
// tests is 2026-12-01 (SOURCE_DATE_EPOCH, set in TestMain).

import (
	"bytes"
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

func TestDueCommand(t *testing.T) {
	milk := filepath.Join(demoDir, "htst-milk-si.yaml")
	for _, c := range []struct {
		name string
		args []string
		code int
		frag string
	}{
		{"today: nothing overdue", []string{"due", milk}, exitPass, "2 due within 30 days"},
		// 2026-06-09 + 6 months = 2026-12-09, overdue on 2027-01-15.
		{"later: overdue", []string{"due", milk, "--on", "2027-01-15"}, exitFail, "2 overdue, 0 never done"},
		// The frozen-dessert demo enters only its holding-time test.
		{"never done", []string{"due", filepath.Join(demoDir, "frozen-dessert-si.yaml")}, exitFail, "0 overdue, 5 never done"},
		{"a date that is not one", []string{"due", milk, "--on", "15/01/2027"}, exitInput, "--on must be a date YYYY-MM-DD"},
		{"before the tests", []string{"due", milk, "--on", "2026-10-19"}, exitInput, "is after the review date 2026-10-19"},
	} {
		t.Run(c.name, func(t *testing.T) {
			var out, errb bytes.Buffer
			code := run(c.args, &out, &errb)
			if code != c.code || !strings.Contains(out.String()+errb.String(), c.frag) {
				t.Errorf("exit %d, want %d and %q:\n%s%s", code, c.code, c.frag, out.String(), errb.String())
			}
		})
	}
	var out bytes.Buffer
	if code := run([]string{"due", milk, "--json", "--on", "2027-01-15"}, &out, &bytes.Buffer{}); code != exitFail {
		t.Fatalf("json: exit %d", code)
	}
	var rep struct {
		On    string `json:"on"`
		Tests []map[string]any
	}
	if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	first := rep.Tests[0]
	if rep.On != "2027-01-15" || len(rep.Tests) != 7 || first["test"] != "holding-time" || first["last_date"] != "2026-06-09" ||
		first["last_pass"] != true || first["next_due"] != "2026-12-09" || first["state"] != "overdue" {
		t.Errorf("json %+v", rep)
	}
}

func TestSourceDateEpoch(t *testing.T) {
	// SOURCE_DATE_EPOCH fixes today (the reproducible-builds convention);
	// a value that is not a count of seconds is a usage error.
	t.Setenv("SOURCE_DATE_EPOCH", "1828051200") // 2027-12-06T00:00:00Z
	if d, err := today(); err != nil || d.Format("2006-01-02") != "2027-12-06" {
		t.Errorf("today %v %v", d, err)
	}
	t.Setenv("SOURCE_DATE_EPOCH", "yesterday")
	var errb bytes.Buffer
	if code := run([]string{"due", filepath.Join(demoDir, "htst-milk-si.yaml")}, &bytes.Buffer{}, &errb); code != exitInput ||
		!strings.Contains(errb.String(), "SOURCE_DATE_EPOCH must be a whole number of seconds") {
		t.Errorf("exit %d %q", code, errb.String())
	}
}
