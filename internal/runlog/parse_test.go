package runlog

import (
	"math"
	"testing"
	"time"
)

func TestParseNumber(t *testing.T) {
	cases := []struct {
		in    string
		comma bool
		want  float64
		ok    bool
	}{
		// Expected values are the decimal numbers as written (exact
		// arithmetic); strconv.ParseFloat agrees (FuzzRunReader checks it on
		// arbitrary text).
		{"72.5", false, 72.5, true},
		{"-0.25", false, -0.25, true},
		{"+1e3", false, 1000, true},
		{"1.e2", false, 100, true},
		{".5", false, 0.5, true},
		{"72,5", true, 72.5, true},
		{"10012.5", false, 10012.5, true},
		{"0.000000000000000000000001", false, 1e-24, true},              // beyond the exact powers: strconv
		{"12345678901234567890123", false, 1.2345678901234568e22, true}, // more than 19 digits: strconv
		{"72,5", false, 0, false},
		{"72.5", true, 0, false},
		{"", false, 0, false},
		{".", false, 0, false},
		{"1e", false, 0, false},
		{"0x10", false, 0, false},
		{"Inf", false, 0, false},
		{"NaN", false, 0, false},
		{"1_000", false, 0, false},
		{"1e400", false, 0, false},
		{"72.5 ", false, 0, false},
	}
	for _, c := range cases {
		got, ok := parseNumber([]byte(c.in), c.comma)
		if ok != c.ok || (ok && math.Abs(got-c.want) > 1e-15*math.Abs(c.want)) {
			t.Errorf("parseNumber(%q, comma %v) = %v, %v; want %v, %v", c.in, c.comma, got, ok, c.want, c.ok)
		}
	}
}

func TestParseClock(t *testing.T) {
	cases := []struct {
		in   string
		want time.Time // from the standard library's time.Date
		ok   bool
	}{
		{"2026-03-14T06:00:00Z", time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC), true},
		{"2026-03-14 07:00:00+01:00", time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC), true},
		{"2026-03-14T06:00:00.123456789123Z", time.Date(2026, 3, 14, 6, 0, 0, 123456789, time.UTC), true},
		{"2026-03-14T06:00:00,5-02:30", time.Date(2026, 3, 14, 8, 30, 0, 5e8, time.UTC), true},
		{"2024-02-29T00:00:00Z", time.Date(2024, 2, 29, 0, 0, 0, 0, time.UTC), true}, // leap year
		{"1969-12-31T23:59:59Z", time.Date(1969, 12, 31, 23, 59, 59, 0, time.UTC), true},
		{"2026-03-14T06:00:00", time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC), true}, // zone-less, read in UTC here
		{"2025-02-29T00:00:00Z", time.Time{}, false},
		{"2026-03-14T24:00:00Z", time.Time{}, false},
		{"2026-03-14T06:00:60Z", time.Time{}, false},
		{"2026-03-14T06:00:00z", time.Time{}, false},
		{"2026-03-14T6:00:00Z", time.Time{}, false},
		{"2026-03-14T06:00:00+0100", time.Time{}, false},
		{"2026-03-14T06:00:00.Z", time.Time{}, false},
	}
	for _, c := range cases {
		var cl clock
		ok := parseClock([]byte(c.in), &cl)
		if ok != c.ok {
			t.Errorf("parseClock(%q) ok = %v, want %v", c.in, ok, c.ok)
			continue
		}
		if !ok {
			continue
		}
		if got := cl.unix(time.UTC); got != c.want.Unix() || cl.nsec != c.want.Nanosecond() {
			t.Errorf("parseClock(%q) = %d s %d ns, want %d s %d ns", c.in, got, cl.nsec, c.want.Unix(), c.want.Nanosecond())
		}
	}
}

func TestParseFlag(t *testing.T) {
	for in, want := range map[string]bool{"1": true, "0": false, "TRUE": true, "false": false, "Forward": true, "DIVERT": false} {
		if got, ok := parseFlag([]byte(in)); !ok || got != want {
			t.Errorf("parseFlag(%q) = %v, %v", in, got, ok)
		}
	}
	for _, in := range []string{"", "2", "yes", "fwd", "diverted", "tru"} {
		if _, ok := parseFlag([]byte(in)); ok {
			t.Errorf("parseFlag(%q) accepted", in)
		}
	}
}

func TestDaysFromCivil(t *testing.T) {
	// Against the standard library's calendar over four centuries and more.
	for d := time.Date(1600, 1, 1, 0, 0, 0, 0, time.UTC); d.Year() < 2401; d = d.AddDate(0, 0, 7) {
		if got, want := daysFromCivil(d.Year(), int(d.Month()), d.Day()), d.Unix()/86400; got != want {
			t.Fatalf("%s: %d days, want %d", d.Format(time.DateOnly), got, want)
		}
	}
}
