package units

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// Calendar intervals: how long until an acceptance test is due again
// ("90 d", "6 months", "1 year"). They are a kind of their own, read only by
// ParseInterval: a month or a year is not a fixed number of seconds, so the
// calendar units never enter the unit table, and "30 d" is refused in a time
// field (docs/METHOD.md §15.5, due dates).

// CalendarUnit is the unit of an Interval.
type CalendarUnit int

const (
	Days   CalendarUnit = iota + 1 // d: 24 h days
	Weeks                          // week: 7 days
	Months                         // month: calendar months, the day clamped to the month's end
	Years                          // year: calendar years, 29 February clamped to 28 February
)

// calendarUnits are the words an interval may use, singular and plural.
var calendarUnits = map[string]CalendarUnit{
	"d": Days, "day": Days, "days": Days,
	"week": Weeks, "weeks": Weeks,
	"month": Months, "months": Months,
	"year": Years, "years": Years,
}

// Interval is a whole number of calendar units.
type Interval struct {
	Count int // ≥ 1
	Unit  CalendarUnit
}

// IntervalExample is a valid interval, shown in messages.
const IntervalExample = "90 d, 6 months or 1 year"

// MaxIntervalCount bounds an interval's number (36 500 days is a century).
const MaxIntervalCount = 36500

// ParseInterval reads a calendar interval: a positive whole number and one
// of the units d (day, days), week(s), month(s), year(s).
func ParseInterval(s string) (Interval, error) {
	if err := oneLine(s); err != nil {
		return Interval{}, err
	}
	in := strings.TrimSpace(s)
	fields := strings.Fields(in)
	if len(fields) == 0 {
		return Interval{}, errorf(s, "empty value: expected an interval such as %s", IntervalExample)
	}
	numText, unitText := fields[0], strings.Join(fields[1:], " ")
	if len(fields) == 1 {
		// "90d": a number and its unit without a space.
		i := strings.IndexFunc(in, func(r rune) bool { return (r < '0' || r > '9') && r != '.' && r != '+' && r != '-' })
		if i > 0 {
			numText, unitText = in[:i], in[i:]
		}
	}
	n, err := strconv.Atoi(numText)
	if err != nil {
		if _, ferr := strconv.ParseFloat(numText, 64); ferr == nil {
			return Interval{}, errorf(s, "%q: an interval is a whole number of days, weeks, months or years, e.g. %s", s, IntervalExample)
		}
		return Interval{}, errorf(s, "%q is not a number followed by a calendar unit: expected an interval such as %s", s, IntervalExample)
	}
	if unitText == "" {
		return Interval{}, errorf(s, "%q has no unit: an interval needs d, week, month or year, e.g. %s", s, IntervalExample)
	}
	u, ok := calendarUnits[unitText]
	if !ok {
		return Interval{}, errorf(s, "%q: %q is not a calendar unit; write d, week, month or year (or their plurals), e.g. %s", s, unitText, IntervalExample)
	}
	if n < 1 || n > MaxIntervalCount {
		return Interval{}, errorf(s, "%q: an interval must be from 1 to %d %s", s, MaxIntervalCount, u.plural())
	}
	return Interval{Count: n, Unit: u}, nil
}

func (u CalendarUnit) singular() string {
	switch u {
	case Days:
		return "day"
	case Weeks:
		return "week"
	case Months:
		return "month"
	case Years:
		return "year"
	}
	panic(fmt.Sprintf("%sno name for calendar unit %d", panicPrefix, int(u)))
}

func (u CalendarUnit) plural() string { return u.singular() + "s" }

// String writes the interval in words: "90 days", "1 month", "6 months".
func (iv Interval) String() string {
	if iv.Count == 1 {
		return "1 " + iv.Unit.singular()
	}
	return fmt.Sprintf("%d %s", iv.Count, iv.Unit.plural())
}

// After is the date the interval after date (a civil date: the clock time and
// location of date are kept, only the day moves):
//
//	d, week:      date + Count·1 or Count·7 days
//	month, year:  the same day Count months (12·Count for years) later, clamped to
//	              the last day of that month: 31 January + 1 month = 28 February
//	              (29 in a leap year), 29 February + 1 year = 28 February
//
// References: docs/METHOD.md §15.5 (due dates).
func (iv Interval) After(date time.Time) time.Time {
	switch iv.Unit {
	case Days:
		return date.AddDate(0, 0, iv.Count)
	case Weeks:
		return date.AddDate(0, 0, 7*iv.Count)
	case Months, Years:
		months := iv.Count
		if iv.Unit == Years {
			months *= 12
		}
		y, m, d := date.Date()
		total := int(m) - 1 + months
		ny, nm := y+total/12, time.Month(total%12+1)
		last := time.Date(ny, nm+1, 0, 0, 0, 0, 0, time.UTC).Day()
		h, mi, s := date.Clock()
		return time.Date(ny, nm, min(d, last), h, mi, s, date.Nanosecond(), date.Location())
	}
	panic(fmt.Sprintf("%sinterval with no unit: %+v", panicPrefix, iv))
}

// DateLayout is the one date format of plant files and of the command line:
// an ISO 8601 calendar date, YYYY-MM-DD.
const DateLayout = "2006-01-02"

// ParseDate reads an ISO 8601 calendar date (YYYY-MM-DD) as midnight UTC.
func ParseDate(s string) (time.Time, error) {
	if err := oneLine(s); err != nil {
		return time.Time{}, err
	}
	in := strings.TrimSpace(s)
	d, err := time.Parse(DateLayout, in)
	if err != nil || len(in) != len(DateLayout) {
		return time.Time{}, errorf(s, "%q is not a date: expected an ISO 8601 date YYYY-MM-DD, e.g. 2026-05-12", s)
	}
	return d, nil
}
