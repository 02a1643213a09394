package assess

import (
	"fmt"
	"math"
	"strings"
)

// CheckID names a check; scripts depend on these words, so they never change.
type CheckID string

const (
	HoldingTime         CheckID = "holding-time"
	LogReduction        CheckID = "log-reduction"
	TubeSlope           CheckID = "tube-slope"
	RegeneratorPressure CheckID = "regenerator-pressure"
	HeatingMedium       CheckID = "heating-medium"
	CoolingOutlet       CheckID = "cooling-outlet"
	PressureDrop        CheckID = "pressure-drop"

	// Acceptance tests (docs/METHOD.md §15): the latest result of each kind.
	AcceptanceHoldingTime         CheckID = "acceptance-holding-time"
	AcceptanceCutOut              CheckID = "acceptance-cut-out"
	AcceptanceCutIn               CheckID = "acceptance-cut-in"
	AcceptanceValveResponse       CheckID = "acceptance-valve-response"
	AcceptanceSensorCheck         CheckID = "acceptance-sensor-check"
	AcceptanceRegeneratorPressure CheckID = "acceptance-regenerator-pressure"
	AcceptanceOther               CheckID = "acceptance-other"
	DiversionTiming               CheckID = "diversion-timing"
)

// Limit says how a check's actual value is judged against the required one.
type Limit string

const (
	AtLeast Limit = "min" // actual ≥ required
	AtMost  Limit = "max" // actual ≤ required
)

// CheckDef is a check's definition: the registry below is the one list of
// checks, in the order they are printed.
type CheckDef struct {
	ID CheckID
	// Holding is true for checks that judge the holding tube alone: 'pasval
	// hold' shows these and decides its exit status by them.
	Holding    bool
	Limit      Limit
	Unit       string // of Required and Actual: "°C", "s", "Pa", "slope", "log"
	MarginUnit string // of Margin: "K" for temperatures, else Unit
	// PassesWhen is the rule in words, for the README's list of checks.
	PassesWhen string
	// Note is the check's note when it carries no numbers; a note with
	// numbers (from Check.Detail) is worded in internal/present instead.
	Note string
}

// checkDefs is the registry, in print order: the holding-tube checks, then the
// line's.
var checkDefs = []CheckDef{
	{TubeSlope, true, AtLeast, "slope", "slope", "(rise entered) rise/length ≥ `min_slope`",
		"continuous upward slope of the holding tube (rise/length)"},
	{HoldingTime, true, AtLeast, "s", "s",
		"(legal rows entered) some row has temperature ≤ setpoint and time ≤ the fastest particle's time", ""},
	{LogReduction, true, AtLeast, "log", "log", "(per organism with `required_log_reduction`) fastest-particle log reduction ≥ required", ""},
	{HeatingMedium, false, AtLeast, "°C", "K",
		"(heating in rating mode) the medium inlet needed by the installed plates ≤ the hottest available", ""},
	{CoolingOutlet, false, AtMost, "°C", "K", "(a rated cooling stage) the product leaving the last stage ≤ `outlet_target`",
		"product leaving the last cooling stage, against the outlet target"},
	{RegeneratorPressure, false, AtLeast, "Pa", "Pa", "(pressure entered) pasteurized minimum − raw maximum ≥ required margin",
		"pasteurized-side minimum pressure above raw-side maximum in the regenerator"},
	{PressureDrop, false, AtMost, "Pa", "Pa",
		"(per section with a plate pack and `product_side.max_pressure_drop`) product-side pressure drop through the pack ≤ the maximum",
		"product-side pressure drop through the plate pack (channels and ports, elevation ignored) against the pumps' allowance"},
	{AcceptanceHoldingTime, true, AtLeast, "s", "s",
		"(latest `holding-time` result, legal rows entered) the measured time converted to the product at the worst flow meets the legal table at the judged temperature, and the result is not past its interval", ""},
	{AcceptanceCutOut, false, AtLeast, "°C", "K",
		"(latest `cut-out` result) the cut-out temperature ≥ the judged temperature (setpoint − sensor accuracy) and ≥ the judged legal row's, not past its interval", ""},
	{AcceptanceCutIn, false, AtLeast, "°C", "K",
		"(latest `cut-in` result) the cut-in temperature ≥ the same limit as the cut-out, not past its interval", ""},
	{AcceptanceValveResponse, false, AtMost, "s", "s",
		"(latest `valve-response` result, `diversion` entered) the measured response ≤ the fastest particle's travel time from the sensor to the valve, not past its interval", ""},
	{AcceptanceSensorCheck, false, AtMost, "K", "K",
		"(latest `sensor-check` result, `sensor_accuracy` entered) \\|sensor − reference\\| ≤ the stated accuracy, not past its interval", ""},
	{AcceptanceRegeneratorPressure, false, AtLeast, "Pa", "Pa",
		"(latest `regenerator-pressure` result) the measured difference ≥ the required margin, not past its interval", ""},
	{AcceptanceOther, false, AtLeast, "pass", "pass", "(latest `other` result of each name) passed as entered, not past its interval", ""},
	{DiversionTiming, false, AtLeast, "s", "s",
		"(`diversion` entered) the fastest particle's travel time from the sensor to the valve at the worst flow ≥ the valve's response time", ""},
}

// CheckDefs returns the registry, in print order.
func CheckDefs() []CheckDef { return append([]CheckDef(nil), checkDefs...) }

// DefOf is the definition of a check; an unknown id is a programming error.
func DefOf(id CheckID) CheckDef {
	if i, ok := defIndex[id]; ok {
		return checkDefs[i]
	}
	panic(fmt.Sprintf("%sno check definition for %q", panicPrefix, id))
}

// The holding tube's checks, found once.
var (
	defTubeSlope    = DefOf(TubeSlope)
	defHoldingTime  = DefOf(HoldingTime)
	defLogReduction = DefOf(LogReduction)
)

// defIndex finds a definition in the registry (NewCheck runs once per check
// in each Monte Carlo sample of margins).
var defIndex = func() map[CheckID]int {
	m := map[CheckID]int{}
	for i, d := range checkDefs {
		m[d.ID] = i
	}
	return m
}()

const panicPrefix = "assess: "

// Tolerance is the one rule by which a check passes at its limit: a check
// passes when its margin is at least −Tolerance·|required|, so that a value
// equal to its limit by construction (a tube sized to the exact legal length,
// a stage cooling to exactly its target) is not failed by the last bits of
// floating-point rounding. The legal table is judged with the same rule
// (lethality.JudgeLegal is given this tolerance).
const Tolerance = 1e-9

// NewCheck judges actual against required by the check's definition:
//
//	margin = actual − required   (AtLeast)
//	margin = required − actual   (AtMost)
//	pass   ⇔ margin ≥ −Tolerance·|required|
func NewCheck(id CheckID, required, actual float64) Check {
	return newCheck(DefOf(id), required, actual)
}

// newCheck is NewCheck with the definition found (the holding tube's judged
// core finds its three once, for the many evaluations of margins).
func newCheck(def CheckDef, required, actual float64) Check {
	id := def.ID
	c := Check{ID: id, Required: required, Actual: actual, Unit: def.Unit, MarginUnit: def.MarginUnit, Limit: def.Limit}
	switch def.Limit {
	case AtLeast:
		c.Margin = actual - required
	case AtMost:
		c.Margin = required - actual
	default:
		panic(fmt.Sprintf("%scheck %s has no limit", panicPrefix, id))
	}
	c.Pass = c.Margin >= -Tolerance*math.Abs(required)
	return c
}

// IsHolding reports whether a check judges the holding tube alone.
func (c Check) IsHolding() bool { return DefOf(c.ID).Holding }

// README markers around the generated list of checks.
const (
	ChecksBegin = "<!-- checks: generated from internal/assess/checks.go by 'go test ./internal/assess/ -update'; do not edit by hand -->"
	ChecksEnd   = "<!-- end of checks -->"
)

// ChecksTable is the registry as a Markdown table for the README.
func ChecksTable() string {
	var b strings.Builder
	b.WriteString("| id | passes when | `hold` |\n|---|---|---|\n")
	for _, d := range checkDefs {
		hold := ""
		if d.Holding {
			hold = "yes"
		}
		fmt.Fprintf(&b, "| `%s` | %s | %s |\n", d.ID, d.PassesWhen, hold)
	}
	return b.String()
}
