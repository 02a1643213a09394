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
		{"today: nothing overdue", []string{"due", milk}, exitPass, "nothing failed, overdue or never done (7 tests, 1 with no interval entered)"},
		// 2026-11-10 + 2 years = 2028-11-10, overdue on 2028-11-15.
		{"later: overdue", []string{"due", milk, "--on", "2028-11-15"}, exitFail, "1 overdue, 0 never done"},
		// The frozen-dessert demo enters only its holding-time test.
		{"never done", []string{"due", filepath.Join(demoDir, "frozen-dessert-si.yaml")}, exitFail, "0 overdue, 5 never done"},
		{"later, as --date", []string{"due", milk, "--date", "2028-11-15"}, exitFail, "1 overdue, 0 never done"},
		{"two review dates", []string{"due", milk, "--date", "2028-11-15", "--on", "2027-01-01"}, exitInput, "name two review dates"},
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
	if code := run([]string{"due", milk, "--json", "--on", "2028-11-15"}, &out, &bytes.Buffer{}); code != exitFail {
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
	if rep.On != "2028-11-15" || len(rep.Tests) != 7 || first["test"] != "holding-time" || first["last_date"] != "2026-11-10" ||
		first["last_pass"] != true || first["next_due"] != "2028-11-10" || first["state"] != "overdue" {
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

func TestDemoStaysCurrent(t *testing.T) {
	// The README's quick start checks the SI demo on the day it is run: its
	// acceptance results must not fall stale for years (the invented demo
	// results are dated 2026-11 with intervals of two years and more), so
	// check passes on each of these review dates, for the demo and its exact
	// US-unit twin.
	for _, plant := range []string{filepath.Join(demoDir, "htst-milk-si.yaml"), "../../testdata/equivalence/htst-milk-us.yaml"} {
		for _, on := range []string{"2026-12-01", "2027-06-01", "2027-12-10", "2028-06-01", "2028-10-01"} {
			var out, errb bytes.Buffer
			if code := run([]string{"check", plant, "--date", on}, &out, &errb); code != exitPass {
				t.Errorf("%s on %s: exit %d\n%s%s", filepath.Base(plant), on, code, out.String(), errb.String())
			}
		}
	}
}

func TestDueShowsAFailedResult(t *testing.T) {
	// The frozen-dessert demo's holding-time test, converted to the mix,
	// fails its legal row (README, docs/METHOD.md §15.2): due must not call
	// it ok. It is shown as failed, to be repeated, and due exits 1 as for
	// an overdue test; JSON keeps last_pass false and gives the state.
	dessert := filepath.Join(demoDir, "frozen-dessert-si.yaml")
	var out, errb bytes.Buffer
	code := run([]string{"due", dessert}, &out, &errb)
	line := ""
	for _, l := range strings.Split(out.String(), "\n") {
		if strings.HasPrefix(strings.TrimSpace(l), "holding-time") {
			line = l
		}
	}
	if code != exitFail || !strings.Contains(line, "FAILED — repeat the test") || strings.Contains(line, " ok") ||
		!strings.Contains(out.String(), "1 failed") {
		t.Errorf("exit %d, holding-time line %q:\n%s", code, line, out.String())
	}
	out.Reset()
	if code := run([]string{"due", dessert, "--json"}, &out, &errb); code != exitFail {
		t.Errorf("json: exit %d", code)
	}
	var rep struct{ Tests []map[string]any }
	if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	if first := rep.Tests[0]; first["test"] != "holding-time" || first["last_pass"] != false || first["state"] != "failed" {
		t.Errorf("json %v", first)
	}
}

func TestFailingScheduleIsNotCalledValidated(t *testing.T) {
	// The frozen-dessert demo fails its holding time: its critical-limit
	// table is drafted from a schedule that is not validated, and says so;
	// the SI demo's, which passes, is validated.
	for _, c := range []struct {
		plant     string
		validated bool
	}{{"frozen-dessert-si.yaml", false}, {"htst-milk-si.yaml", true}} {
		out, _, _ := runBinary(t, "check", "--json", filepath.Join(demoDir, c.plant))
		var r struct {
			CriticalLimits []struct {
				ID        string `json:"id"`
				Validated bool   `json:"validated"`
				LimitText string `json:"limit_text"`
			} `json:"critical_limits"`
		}
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		if len(r.CriticalLimits) == 0 {
			t.Fatalf("%s: no critical limits", c.plant)
		}
		for _, l := range r.CriticalLimits {
			said := strings.Contains(l.LimitText, "NOT VALIDATED: some checks fail")
			if l.Validated != c.validated || said == c.validated || (!c.validated && strings.Contains(l.LimitText, "validated at")) {
				t.Errorf("%s %s: validated %v, %q", c.plant, l.ID, l.Validated, l.LimitText)
			}
		}
	}
}
