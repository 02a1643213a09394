package units

// Source of the expected dates: the Gregorian calendar (a year divisible by 4
// is a leap year unless divisible by 100 and not by 400: 2028 and 2000 are
// leap years, 2027 and 2100 are not), counted by hand; the clamping rule is
// docs/METHOD.md §15.5.

import (
	"strings"
	"testing"
	"time"
)

func day(s string) time.Time {
	d, err := time.Parse(DateLayout, s)
	if err != nil {
		panic(err)
	}
	return d
}

func TestIntervalAfter(t *testing.T) {
	for _, c := range []struct {
		name, from, interval, want string
	}{
		{"90 days across the new year", "2026-12-01", "90 d", "2027-03-01"}, // 30 (Dec) + 31 (Jan) + 28 (Feb) + 1
		{"90 days in a leap year", "2027-12-01", "90 d", "2028-02-29"},      // 30 + 31 + 29 = 90
		{"one week", "2026-12-28", "1 week", "2027-01-04"},                  // 3 days to the year's end, then 4
		{"two weeks", "2028-02-20", "2 weeks", "2028-03-05"},                // 29 February in between
		{"1 month from 31 January", "2027-01-31", "1 month", "2027-02-28"},  // clamped to February's end
		{"1 month from 31 January, leap year", "2028-01-31", "1 month", "2028-02-29"},
		{"1 month from 30 January", "2027-01-30", "1 month", "2027-02-28"},
		{"1 month from 28 February", "2027-02-28", "1 month", "2027-03-28"}, // not the month's end: the same day
		{"1 month from 31 March", "2027-03-31", "1 month", "2027-04-30"},
		{"6 months from 31 August", "2027-08-31", "6 months", "2028-02-29"}, // into a leap February
		{"6 months from 31 August, no leap", "2026-08-31", "6 months", "2027-02-28"},
		{"3 months across the year", "2026-11-30", "3 months", "2027-02-28"},
		{"12 months", "2026-05-12", "12 months", "2027-05-12"},
		{"13 months", "2026-12-31", "13 months", "2028-01-31"},
		{"1 year from 29 February", "2028-02-29", "1 year", "2029-02-28"},
		{"4 years from 29 February", "2028-02-29", "4 years", "2032-02-29"},      // leap to leap
		{"4 years from 29 February 2096", "2096-02-29", "4 years", "2100-02-28"}, // 2100 is not a leap year
		{"4 years from 29 February 1996", "1996-02-29", "4 years", "2000-02-29"}, // 2000 is
		{"plain year", "2026-06-15", "1 year", "2027-06-15"},
	} {
		t.Run(c.name, func(t *testing.T) {
			iv, err := ParseInterval(c.interval)
			if err != nil {
				t.Fatal(err)
			}
			if got := iv.After(day(c.from)).Format(DateLayout); got != c.want {
				t.Errorf("%s + %s = %s, want %s", c.from, c.interval, got, c.want)
			}
		})
	}
}

func TestParseInterval(t *testing.T) {
	for _, c := range []struct {
		in    string
		count int
		unit  CalendarUnit
		words string
	}{
		{"90 d", 90, Days, "90 days"},
		{"90d", 90, Days, "90 days"},
		{"1 day", 1, Days, "1 day"},
		{"2 weeks", 2, Weeks, "2 weeks"},
		{"1 week", 1, Weeks, "1 week"},
		{"6 months", 6, Months, "6 months"},
		{"1 month", 1, Months, "1 month"},
		{" 1 year ", 1, Years, "1 year"},
		{"2 years", 2, Years, "2 years"},
	} {
		iv, err := ParseInterval(c.in)
		if err != nil || iv.Count != c.count || iv.Unit != c.unit || iv.String() != c.words {
			t.Errorf("ParseInterval(%q) = %+v %q, %v", c.in, iv, iv.String(), err)
		}
	}
	for _, c := range []struct{ in, want string }{
		{"90", "has no unit"},
		{"", "empty value"},
		{"six months", "not a number"},
		{"1.5 months", "whole number"},
		{"0 d", "from 1 to"},
		{"-3 d", "from 1 to"},
		{"90 s", "not a calendar unit"},
		{"3 min", "not a calendar unit"},
		{"1 fortnight", "not a calendar unit"},
		{"100000 d", "from 1 to"},
		{"2 \u2028years", "line or paragraph separator"},
		{"2 years\u200f", "bidirectional"},
	} {
		_, err := ParseInterval(c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("ParseInterval(%q) = %v, want an error with %q", c.in, err, c.want)
		}
	}
}

func TestCalendarUnitsStayOutOfTimeFields(t *testing.T) {
	// A day is not a time unit of the plant file: "30 d" in a time field is
	// refused, so that a month (not a fixed number of seconds) cannot slip in.
	for _, s := range []string{"30 d", "1 week", "1 month", "1 year"} {
		if _, err := Parse(s, Time); err == nil {
			t.Errorf("Parse(%q, Time) accepted a calendar unit", s)
		}
	}
}

func TestParseDate(t *testing.T) {
	if d, err := ParseDate("2028-02-29"); err != nil || d.Format(DateLayout) != "2028-02-29" {
		t.Errorf("leap day: %v %v", d, err)
	}
	for _, s := range []string{"2027-02-29", "2026-13-01", "12/05/2026", "2026-5-12", "20260512", "2026-05-12T10:00:00Z", "", "2026-05-12\u2028", "\u202a2026-05-12"} {
		if _, err := ParseDate(s); err == nil {
			t.Errorf("ParseDate(%q) accepted", s)
		}
	}
}
