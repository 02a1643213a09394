package plantfile

import (
	"fmt"
	"strings"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// Acceptance tests, the diversion system and the HACCP plan's words
// (docs/METHOD.md §15): the dated results of the regulator's tests on the
// installed equipment, which pasval compares with its model and whose due
// dates it follows.

// TestKind is a kind of acceptance test; the words are the plant file's.
type TestKind string

const (
	TestHoldingTime         TestKind = "holding-time"
	TestCutOut              TestKind = "cut-out"
	TestCutIn               TestKind = "cut-in"
	TestValveResponse       TestKind = "valve-response"
	TestSensorCheck         TestKind = "sensor-check"
	TestRegeneratorPressure TestKind = "regenerator-pressure"
	TestOther               TestKind = "other"
)

// TestKindDef is what one kind of test records: the measured values it
// needs, the optional ones, and what the test is, in words.
type TestKindDef struct {
	Kind     TestKind
	Needs    []string // keys that must be given
	Optional []string // keys that may be given besides the common ones
	What     string
}

// commonTestKeys are the keys every result has or may have.
var commonTestKeys = []string{"test", "date", "by", "interval", "note"}

// testKinds is the one list of kinds, in the order they are reported.
var testKinds = []TestKindDef{
	{TestHoldingTime, []string{"fluid", "flow", "time"}, []string{"temperature"},
		"the fastest particle timed through the holding tube (salt or dye), with water or the product"},
	{TestCutOut, []string{"temperature"}, nil, "the temperature at which the flow-diversion device diverted, falling"},
	{TestCutIn, []string{"temperature"}, nil, "the temperature at which it returned to forward flow, rising"},
	{TestValveResponse, []string{"time"}, nil, "the time from the diversion signal to the valve fully diverted"},
	{TestSensorCheck, []string{"sensor", "reference"}, nil, "the diversion sensor's reading against a reference thermometer"},
	{TestRegeneratorPressure, []string{"difference"}, nil, "the least pressure of the pasteurized side above the raw side, measured"},
	{TestOther, []string{"name", "pass"}, nil, "a test pasval does not model, with its result as entered"},
}

// TestKinds returns the kinds of acceptance test, in report order.
func TestKinds() []TestKindDef { return append([]TestKindDef(nil), testKinds...) }

// KindDef is the definition of a kind; an unknown kind is a programming error.
func KindDef(k TestKind) TestKindDef {
	for _, d := range testKinds {
		if d.Kind == k {
			return d
		}
	}
	panic(fmt.Sprintf("%sno acceptance-test kind %q", panicPrefix, k))
}

func testKindWords() []string {
	var out []string
	for _, d := range testKinds {
		out = append(out, string(d.Kind))
	}
	return out
}

// Fluid is what a holding-time test was timed with.
type Fluid string

const (
	FluidWater   Fluid = "water"
	FluidProduct Fluid = "product"
)

// AcceptanceTest is one dated result, as entered. Only the values its kind
// records are set (Validate refuses the others).
type AcceptanceTest struct {
	Kind TestKind
	Date time.Time // a civil date, midnight UTC
	By   string
	// Interval is how long until the test is due again; nil when not entered.
	Interval *units.Interval

	Fluid       Fluid    // holding-time
	Flow        FlowRate // holding-time: the flow during the test
	Time        Quantity // holding-time: the measured fastest time; valve-response: signal to fully diverted, s
	Temperature Quantity // holding-time: of the fluid (default the setpoint); cut-out, cut-in: the switching temperature, °C
	Sensor      Quantity // sensor-check: the diversion sensor's reading, °C
	Reference   Quantity // sensor-check: the reference thermometer's reading, °C
	Difference  Quantity // regenerator-pressure: pasteurized − raw, the measured least, Pa
	Name, Note  string   // other: what the test is; any kind: a remark
	Pass        bool     // other: the result as entered

	// Given are the keys written, with their positions (Validate checks them
	// against the kind).
	Given map[string]inputerr.Pos
	Pos   inputerr.Pos
}

// Label names the test as reports do: its kind, and an other test's name.
func (t AcceptanceTest) Label() string {
	if t.Kind == TestOther && t.Name != "" {
		return string(t.Kind) + " (" + t.Name + ")"
	}
	return string(t.Kind)
}

// Diversion is the stretch from the diversion sensor to the flow-diversion
// valve (docs/METHOD.md §15.4).
type Diversion struct {
	SensorToValve Quantity // m
	ResponseTime  Quantity // s, optional when a valve-response test is entered
	InnerDiameter Quantity // m, optional: default the holding tube's
	Pos           inputerr.Pos
}

// CriticalLimitID names a critical limit of the HACCP plan.
type CriticalLimitID string

const (
	LimitSetpoint            CriticalLimitID = "setpoint"
	LimitMaxFlow             CriticalLimitID = "max_flow"
	LimitHoldingTime         CriticalLimitID = "holding_time"
	LimitRegeneratorPressure CriticalLimitID = "regenerator_pressure"
	LimitCoolingOutlet       CriticalLimitID = "cooling_outlet"
)

// CriticalLimitIDs lists the limits in the plan's order.
var CriticalLimitIDs = []CriticalLimitID{LimitSetpoint, LimitMaxFlow, LimitHoldingTime, LimitRegeneratorPressure, LimitCoolingOutlet}

// criticalLimitWhat describes each limit's haccp: block.
var criticalLimitWhat = map[CriticalLimitID]string{
	LimitSetpoint:            "the diversion setpoint at the holding-tube outlet",
	LimitMaxFlow:             "the sealed maximum flow",
	LimitHoldingTime:         "the fastest particle's holding time",
	LimitRegeneratorPressure: "the regenerator pressure margin",
	LimitCoolingOutlet:       "the cooling outlet maximum",
}

// HACCPTexts are the four columns of the plan's table for one limit; ""
// where the plant file leaves the default.
type HACCPTexts struct {
	Monitoring, CorrectiveAction, Verification, Records string
}

// haccpColumns are the keys of each limit's block.
var haccpColumns = []struct{ key, what string }{
	{"monitoring", "how and how often it is monitored, and by whom"},
	{"corrective_action", "what is done when the limit is not met"},
	{"verification", "how the monitoring is verified (the acceptance tests and their due dates are listed beside it)"},
	{"records", "the records kept"},
}

// HACCP is the optional haccp: block: the plan's words for each limit.
type HACCP struct {
	Limits map[CriticalLimitID]HACCPTexts
	Pos    inputerr.Pos
}

// acceptanceFields are the field-table entries of acceptance:, diversion:
// and haccp: (docs/METHOD.md §15).
func acceptanceFields() []Field {
	t := []Field{
		list("acceptance", "dated results of the acceptance tests on the installed equipment (holding time, diversion, thermometer, regenerator pressure, others)"),
		{Path: "acceptance[].test", Value: KindEnum, Values: testKindWords(), Required: true,
			Description: "the kind of test: holding-time, cut-out, cut-in, valve-response, sensor-check, regenerator-pressure or other", Example: "holding-time"},
		{Path: "acceptance[].date", Value: KindDate, Required: true, Description: "the day the test was done, an ISO 8601 date (not after the review date)", Example: "2026-05-12"},
		text("acceptance[].by", "who did or witnessed the test", "county milk inspector").required(),
		{Path: "acceptance[].interval", Value: KindInterval,
			Description: "how long until the test is due again (d, week, month, year); without it no due date is given", Example: "6 months"},
		text("acceptance[].note", "a remark for the record (other tests: what was found)", "salt conductivity, three runs"),
		{Path: "acceptance[].fluid", Value: KindEnum, Values: []string{string(FluidWater), string(FluidProduct)},
			Description: "holding-time: what the tube was timed with", Example: "water"},
		flow("acceptance[].flow", "holding-time: the flow during the test", "11000 L/h"),
		q("acceptance[].time", units.Time, "holding-time: the measured fastest time; valve-response: from the signal to the valve fully diverted", "16.5 s"),
		q("acceptance[].temperature", units.Temperature,
			"holding-time: the fluid's temperature (default the setpoint); cut-out, cut-in: where the valve diverted or returned to forward flow", "72.4 °C"),
		q("acceptance[].sensor", units.Temperature, "sensor-check: the diversion sensor's reading", "72.5 °C"),
		q("acceptance[].reference", units.Temperature, "sensor-check: the reference thermometer's reading", "72.4 °C"),
		q("acceptance[].difference", units.Pressure, "regenerator-pressure: the measured least pressure of the pasteurized side above the raw side", "28 kPa"),
		text("acceptance[].name", "other: what the test is", "leak-detect valve assembly"),
		{Path: "acceptance[].pass", Value: KindBoolean, Description: "other: whether it passed", Example: "true"},
		mapping("diversion", "the diversion sensor to the flow-diversion valve, for the diversion-timing check"),
		q("diversion.sensor_to_valve_length", units.Length, "pipe length from the diversion sensor to the flow-diversion valve", "3.2 m").required(),
		q("diversion.response_time", units.Time, "the valve's response time, signal to fully diverted (a measured valve-response test wins)", "1 s"),
		q("diversion.inner_diameter", units.Length, "inner diameter of that pipe (default the holding tube's)", "47.5 mm"),
		mapping("haccp", "the HACCP plan's words for each critical limit; pasval writes plain defaults for what is left out"),
	}
	for _, id := range CriticalLimitIDs {
		base := "haccp." + string(id)
		t = append(t, mapping(base, "the plan's words for "+criticalLimitWhat[id]))
		for _, c := range haccpColumns {
			t = append(t, text(base+"."+c.key, c.what, haccpExample(c.key)))
		}
	}
	return t
}

func haccpExample(key string) string {
	switch key {
	case "monitoring":
		return "recording thermometer, continuous; operator reads it hourly"
	case "corrective_action":
		return "divert, hold product since the last good reading, call QA"
	case "verification":
		return "QA reviews the charts daily"
	}
	return "recorder charts kept 2 years"
}

// decodeAcceptance reads acceptance:, diversion: and haccp:.
func (d *decoder) decodeAcceptance(p *Plant, top *object) {
	for i, n := range top.list("acceptance") {
		path := fmt.Sprintf("acceptance[%d]", i)
		o := d.object(n, path)
		if o == nil {
			continue
		}
		t := AcceptanceTest{Pos: d.pos(n), Given: map[string]inputerr.Pos{}}
		for k, v := range o.values {
			t.Given[k] = d.pos(v)
		}
		t.Kind = TestKind(o.enum("test"))
		t.Date = o.date("date")
		t.By = o.text("by")
		t.Interval = o.interval("interval")
		t.Note = o.text("note")
		t.Fluid = Fluid(o.enum("fluid"))
		t.Flow = o.flowRate("flow")
		t.Time = o.quantity("time")
		t.Temperature = o.quantity("temperature")
		t.Sensor = o.quantity("sensor")
		t.Reference = o.quantity("reference")
		t.Difference = o.quantity("difference")
		t.Name = o.text("name")
		t.Pass = o.boolean("pass")
		p.Acceptance = append(p.Acceptance, t)
	}
	if dv := top.sub("diversion"); dv != nil {
		p.Diversion = &Diversion{Pos: d.pos(dv.node),
			SensorToValve: dv.quantity("sensor_to_valve_length"),
			ResponseTime:  dv.quantity("response_time"),
			InnerDiameter: dv.quantity("inner_diameter")}
	}
	if hc := top.sub("haccp"); hc != nil {
		h := &HACCP{Pos: d.pos(hc.node), Limits: map[CriticalLimitID]HACCPTexts{}}
		for _, id := range CriticalLimitIDs {
			lo := hc.sub(string(id))
			if lo == nil {
				continue
			}
			h.Limits[id] = HACCPTexts{Monitoring: lo.text("monitoring"), CorrectiveAction: lo.text("corrective_action"),
				Verification: lo.text("verification"), Records: lo.text("records")}
		}
		p.HACCP = h
	}
}

// date reads an ISO 8601 calendar date.
func (o *object) date(key string) time.Time {
	o.field(key)
	s, n, ok := o.scalar(key, "a date YYYY-MM-DD")
	if !ok {
		return time.Time{}
	}
	d, err := units.ParseDate(s)
	if err != nil {
		o.d.errorf(n, join(o.path, key), "%v", err)
		return time.Time{}
	}
	return d
}

// interval reads a calendar interval ("6 months"); nil when absent or wrong.
func (o *object) interval(key string) *units.Interval {
	o.field(key)
	s, n, ok := o.scalar(key, "an interval such as "+units.IntervalExample)
	if !ok {
		return nil
	}
	iv, err := units.ParseInterval(s)
	if err != nil {
		o.d.errorf(n, join(o.path, key), "%v", err)
		return nil
	}
	return &iv
}

// acceptance checks each result against its kind: the measured values it
// needs are given and nothing another kind records (docs/METHOD.md §15.1),
// and the plant describes what the test is judged against.
func (v *validator) acceptance(p *Plant) {
	for i, t := range p.Acceptance {
		if t.Kind == "" {
			continue // the kind itself was refused when read
		}
		path := fmt.Sprintf("acceptance[%d]", i)
		def := KindDef(t.Kind)
		allowed := append(append(append([]string(nil), commonTestKeys...), def.Needs...), def.Optional...)
		for _, k := range sortedKeys(t.Given) {
			if !contains(allowed, k) {
				v.add(t.Given[k], path+"."+k, "a %s test does not record %s; its keys: %s", t.Kind, k, strings.Join(allowed, ", "))
			}
		}
		var missing []string
		for _, k := range def.Needs {
			if _, ok := t.Given[k]; !ok {
				missing = append(missing, k)
			}
		}
		if len(missing) > 0 {
			v.add(t.Pos, path+"."+missing[0], "missing; a %s test records %s", t.Kind, andList(def.Needs))
		}
		switch t.Kind {
		case TestHoldingTime:
			if p.HoldingTube == nil {
				v.add(t.Pos, path+".test", "a holding-time test needs the holding tube it timed: describe holding_tube")
			}
			v.positive(t.Time, path+".time")
			if t.Flow.Set && !(t.Flow.SI > 0) {
				v.add(t.Flow.Pos, path+".flow", "the flow must be greater than zero, found %s", t.Flow.Text)
			}
			if t.Fluid == FluidWater && t.Temperature.Set && (t.Temperature.SI < 1 || t.Temperature.SI > 150) {
				v.add(t.Temperature.Pos, path+".temperature", "water is taken between 1 and 150 °C, found %s", t.Temperature.Text)
			}
		case TestValveResponse:
			v.positive(t.Time, path+".time")
		case TestRegeneratorPressure:
			if p.Regeneration == nil {
				v.add(t.Pos, path+".test", "a regenerator-pressure test on a plant with no regeneration section: describe regeneration")
			}
		}
	}
	if dv := p.Diversion; dv != nil {
		v.positive(dv.SensorToValve, "diversion.sensor_to_valve_length")
		v.positive(dv.ResponseTime, "diversion.response_time")
		v.positive(dv.InnerDiameter, "diversion.inner_diameter")
		if p.HoldingTube == nil {
			v.add(dv.Pos, "diversion", "the diversion timing follows the product from the holding tube: describe holding_tube")
		}
		if !dv.ResponseTime.Set && !p.HasTest(TestValveResponse) {
			v.add(dv.Pos, "diversion.response_time", "missing; give the valve's response time (e.g. 1 s) or enter a valve-response acceptance test")
		}
	}
}

// HasTest reports whether the plant file enters a result of the kind.
func (p *Plant) HasTest(k TestKind) bool {
	for _, t := range p.Acceptance {
		if t.Kind == k {
			return true
		}
	}
	return false
}

func sortedKeys(m map[string]inputerr.Pos) []string {
	var keys []string
	for k := range m {
		keys = append(keys, k)
	}
	// In file order: line, then column.
	for i := 1; i < len(keys); i++ {
		for j := i; j > 0 && before(m[keys[j]], m[keys[j-1]]); j-- {
			keys[j], keys[j-1] = keys[j-1], keys[j]
		}
	}
	return keys
}

func before(a, b inputerr.Pos) bool {
	return a.Line < b.Line || a.Line == b.Line && a.Column < b.Column
}

// andList joins words as "a, b and c".
func andList(words []string) string {
	switch len(words) {
	case 0:
		return ""
	case 1:
		return words[0]
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}
