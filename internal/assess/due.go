package assess

import (
	"fmt"
	"time"

	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// DueState is where a test stands on the review date (docs/METHOD.md §15.5).
type DueState string

const (
	DueOK         DueState = "ok"          // next due more than DueSoonDays away
	DueSoon       DueState = "due-soon"    // next due within DueSoonDays (today included)
	DueOverdue    DueState = "overdue"     // the review date is after the next due date
	DueNever      DueState = "never-done"  // a kind that applies to the plant has no result
	DueNoInterval DueState = "no-interval" // the latest result has no interval: no due date
	DueSuperseded DueState = "superseded"  // a result with a later one of its kind
)

// DueStates lists every state (tests walk each through the wording).
var DueStates = []DueState{DueOK, DueSoon, DueOverdue, DueNever, DueNoInterval, DueSuperseded}

// DueSoonDays is how close a due date is "due soon".
const DueSoonDays = 30

// dueState is the state of a latest result whose next due date is next
// (hasInterval false: none) on the review date on:
//
//	overdue    on > next
//	due-soon   next − on ≤ 30 days
//	ok         otherwise
//
// Dates are civil dates at midnight UTC, so the day counts are whole.
func dueState(next time.Time, hasInterval bool, on time.Time) DueState {
	switch {
	case !hasInterval:
		return DueNoInterval
	case on.After(next):
		return DueOverdue
	case !next.After(on.AddDate(0, 0, DueSoonDays)):
		return DueSoon
	}
	return DueOK
}

// DueItem is one test in the due list: a kind of test (an other test by its
// name), its latest result and when it is due again.
type DueItem struct {
	Test plantfile.TestKind `json:"test"`
	Name string             `json:"name,omitempty"`
	// LastDate, LastPass and NextDue are null when never done; LastPass is
	// also null when the result is not judged (the plant file lacks what it
	// is judged against). LastPass is the measured values' verdict; a result
	// past its interval is overdue here and fails its check.
	LastDate *string  `json:"last_date"`
	LastPass *bool    `json:"last_pass"`
	Interval string   `json:"interval,omitempty"`
	NextDue  *string  `json:"next_due"`
	State    DueState `json:"state"`
	// DaysLeft is next due − review date in days (negative when overdue);
	// absent without a due date.
	DaysLeft *int   `json:"days_left,omitempty"`
	By       string `json:"by,omitempty"`
}

// Applies reports whether a kind of test applies to the plant, so that
// 'pasval due' lists it as never done when it has no result
// (docs/METHOD.md §15.5): the holding-time test, the cut-out and cut-in
// temperatures, the valve response and the sensor check wherever a holding
// tube (and so a diversion sensor and valve) is described; the regenerator
// pressure test wherever a regeneration section is; other tests only as
// entered.
func Applies(p *plantfile.Plant, k plantfile.TestKind) bool {
	switch k {
	case plantfile.TestHoldingTime, plantfile.TestCutOut, plantfile.TestCutIn, plantfile.TestValveResponse, plantfile.TestSensorCheck:
		return p.HoldingTube != nil
	case plantfile.TestRegeneratorPressure:
		return p.Regeneration != nil
	case plantfile.TestOther:
		return false
	}
	panic(fmt.Sprintf("%sno rule for acceptance-test kind %q", panicPrefix, k))
}

// DueList is every test kind that applies to the plant or has a result, in
// report order (other tests by name, in file order), with its latest
// result and state on the review date on.
func DueList(res *Result, on time.Time) []DueItem {
	p := res.Plant
	out := []DueItem{}
	for _, d := range plantfile.TestKinds() {
		found := false
		for i := range res.Acceptance {
			a := res.Acceptance[i]
			if a.Test != d.Kind || !a.Latest {
				continue
			}
			found = true
			date := a.Date
			it := DueItem{Test: a.Test, Name: a.Name, LastDate: &date, LastPass: a.Pass, Interval: a.Interval, State: a.State, By: a.By}
			if a.NextDue != "" {
				next := a.NextDue
				it.NextDue = &next
				days := int(a.nextDue.Sub(on).Hours() / 24)
				it.DaysLeft = &days
			}
			out = append(out, it)
		}
		if !found && Applies(p, d.Kind) {
			out = append(out, DueItem{Test: d.Kind, State: DueNever})
		}
	}
	return out
}

// DueFails reports whether anything in the list is overdue or never done:
// 'pasval due' then exits 1.
func DueFails(items []DueItem) bool {
	for _, it := range items {
		if it.State == DueOverdue || it.State == DueNever {
			return true
		}
	}
	return false
}

// FormatDate writes a civil date as the plant file does (YYYY-MM-DD).
func FormatDate(d time.Time) string { return d.Format(units.DateLayout) }
