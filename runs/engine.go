package runs

import (
	"fmt"
	"math"
	"sort"

	"pasval/lethality"
)

// Engine analyses one recorded run, sample by sample. Add the samples in
// time order, then call Finish once.
type Engine struct {
	m         Model
	threshold float64 // gap threshold, s; 0 until known
	median    float64
	origin    float64 // Options.Origin, added to the result's times
	t0        float64 // the first sample's time: the tracker's time is from it

	// Waiting for the median interval.
	pending   []Sample
	intervals []float64
	// The first MedianWindow forward samples' temperatures and flows.
	fwdTemps, fwdFlows []float64

	// The sample awaiting its held interval, and its parcel.
	n        int // samples taken so far
	last     Sample
	lastU    float64   // its fastest-particle speed, m/s
	lastRes  float64   // its parcel's residence, s
	lastLR   []float64 // its parcel's log reduction per organism
	low      bool      // Model.SensorAccuracy > 0: judge at the lowered reading too
	lowLR    []float64 // scratch: a parcel's log reduction per organism at the lowered reading
	required []float64 // each organism's required log reduction (0: none)
	prevTime float64   // the latest time added (for order)
	tr       tracker

	temps    *tempCache
	speeds   speedCache
	lastTemp *tempEntry // the cache entry of the last sample's temperature

	trace  *trace // nil unless Options.Trace
	sum    Summary
	events []Event
	open   *openEvent
	drops  []Drop
	drop   int // index of the drop in progress, −1 for none
	err    error
	done   bool
}

// openEvent is an event still growing.
type openEvent struct {
	Event
	class              eventClass
	temp, flow, allMet bool
}

// eventClass is what the samples of one event have in common: consecutive
// samples of another class start a new event.
type eventClass int

const (
	classLimit     eventClass = iota + 1 // forward below the setpoint or above the maximum flow
	classGap                             // the held interval of the sample before a recording gap
	classLethality                       // within both limits, but the parcel failed a row or a required log reduction
)

// A reading equal to a limit is not past it; these tolerances keep a value
// written in other units (161.6 °F for 72 °C, gpm for L/h) on the same
// side of the limit after conversion. legalTolerance is the relative
// tolerance on a legal row's time, the same one rule the design checks use
// (docs/METHOD.md §1.5). All lie far below any sensor's resolution.
const (
	limitTolerance = 1e-9  // K
	flowTolerance  = 1e-12 // relative
	legalTolerance = 1e-9  // relative, of the row time
)

// NewEngine starts the analysis of one run. It returns ErrNoCriteria for a
// model with nothing to judge events against, and panics on a model no
// plant file can give (a non-positive tube, density or maximum flow).
func NewEngine(m Model, opt Options) (*Engine, error) {
	if err := m.check(); err != nil {
		return nil, err
	}
	if opt.GapThreshold < 0 || math.IsNaN(opt.GapThreshold) {
		panic(fmt.Sprintf("%sNewEngine: gap threshold %g s", panicPrefix, opt.GapThreshold))
	}
	no := len(m.Organisms)
	low := m.SensorAccuracy > 0
	e := &Engine{m: m, threshold: opt.GapThreshold, origin: opt.Origin, drop: -1, lastLR: make([]float64, no), temps: newTempCache(no, low), low: low}
	e.tr.length = m.Tube.Length
	if opt.Trace != 0 {
		e.trace = newTrace(opt.Trace)
	}
	e.required = make([]float64, no)
	for i, o := range m.Organisms {
		e.required[i] = o.RequiredLogReduction
	}
	e.median = math.NaN()
	e.sum = Summary{MinForwardTemperature: math.Inf(1), MaxForwardFlow: math.Inf(-1), MinForwardResidence: math.Inf(1),
		MinForwardLogReduction: make([]float64, no), MedianInterval: math.NaN()}
	for i := range e.sum.MinForwardLogReduction {
		e.sum.MinForwardLogReduction[i] = math.Inf(1)
	}
	if low {
		e.lowLR = make([]float64, no)
		e.sum.MinForwardLogReductionAtSensorLow = infinities(no)
	}
	return e, nil
}

// Add takes the next sample. Time may stand still but not go back; values
// must be finite. After an error every later Add returns it.
func (e *Engine) Add(s Sample) error {
	if e.done {
		panic(panicPrefix + "Add after Finish")
	}
	if e.err != nil {
		return e.err
	}
	idx := e.n + len(e.pending)
	if !finite(s.Time) || !finite(s.Temperature) || !finite(s.Flow) {
		field, v := "time", s.Time
		switch {
		case !finite(s.Temperature):
			field, v = "temperature", s.Temperature
		case !finite(s.Flow):
			field, v = "flow", s.Flow
		}
		e.err = &SampleError{Index: idx, Field: field, Value: v, Previous: math.NaN()}
		return e.err
	}
	if idx > 0 && s.Time < e.prevTime {
		e.err = &SampleError{Index: idx, Field: "time", Value: s.Time, Previous: e.prevTime}
		return e.err
	}
	if e.trace != nil {
		e.trace.add(s)
	}
	if idx > 0 && s.Time > e.prevTime && e.threshold == 0 {
		e.intervals = append(e.intervals, s.Time-e.prevTime)
	}
	e.prevTime = s.Time
	if e.threshold > 0 {
		e.take(s)
		return nil
	}
	e.pending = append(e.pending, s)
	if len(e.intervals) >= MedianWindow || len(e.pending) >= 4*MedianWindow {
		e.settle()
	}
	return nil
}

// settle fixes the gap threshold from the intervals seen so far and judges
// the samples held back.
func (e *Engine) settle() {
	if len(e.intervals) > 0 {
		e.median = median(e.intervals)
		e.threshold = GapFactor * e.median
	} else {
		e.threshold = math.Inf(1)
	}
	e.intervals = nil
	for _, s := range e.pending {
		e.take(s)
	}
	e.pending = nil
}

// take runs one sample through the analysis: it closes the previous sample's
// held interval, then finds the parcel leaving now.
func (e *Engine) take(s Sample) {
	if e.n > 0 {
		e.close(e.last, e.n-1, s.Time-e.last.Time)
		// In time from the first sample: residences are differences of
		// times, and a time far from its origin loses their digits.
		e.tr.advance(e.lastU, s.Time-e.t0)
	}
	e.lastTemp = e.temps.at(s.Temperature, e)
	u := e.speed(s.Flow, s.Temperature, e.lastTemp)
	if e.n == 0 {
		e.t0 = s.Time
		e.sum.Start = s.Time
		e.tr.start(0, u)
	}
	e.lastRes = e.tr.residence()
	for i, d := range e.lastTemp.d {
		e.lastLR[i] = e.lastRes / d
	}
	e.lastU = u
	e.last = s
	e.n++
}

// speed is the fastest particle's speed r·v for flow q (m³/s) in product
// at temperature temp (°C) with cache entry t, by the same tube model as
// the design check (docs/METHOD.md §7 (holding tube)): v = Q/A, r from the
// interval's Reynolds number (or the model's override). Zero for no flow.
func (e *Engine) speed(q, temp float64, t *tempEntry) float64 {
	if !(q > 0) {
		return 0
	}
	kq, kt := math.Float64bits(q), uint64(0)
	if e.m.RheologyAt != nil {
		kt = math.Float64bits(e.rheologyTemp(temp))
	}
	c := e.speeds.speedSlot(kq, kt)
	if c.q == kq && c.t == kt {
		return c.u
	}
	u := e.freshSpeed(q, t)
	*c = speedEntry{q: kq, t: kt, u: u}
	return u
}

// freshSpeed is speed computed afresh, without the speed cache.
func (e *Engine) freshSpeed(q float64, t *tempEntry) float64 {
	rh := e.m.Rheology
	if e.m.RheologyAt != nil {
		rh = t.rh
	}
	h := e.m.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: e.m.Density}, rh, e.m.FastestToMean)
	return h.FastestToMean * h.MeanVelocity
}

// rheologyTemp is the temperature Model.RheologyAt is taken at for a
// reading temp (°C): the colder of the reading and the setpoint.
func (e *Engine) rheologyTemp(temp float64) float64 { return math.Min(temp, e.m.Setpoint) }

// close books sample s (index i) with its held interval d, s.
func (e *Engine) close(s Sample, i int, d float64) {
	vol := 0.0
	if s.Flow > 0 {
		vol = s.Flow * d
	}
	sum := &e.sum
	sum.Rows++
	sum.End = s.Time
	if s.Forward {
		sum.Forward += d
		sum.ForwardVolume += vol
		sum.ForwardSamples++
		if len(e.fwdTemps) < MedianWindow {
			e.fwdTemps = append(e.fwdTemps, s.Temperature)
			e.fwdFlows = append(e.fwdFlows, s.Flow)
		}
		// Plain comparisons: every value here is a number (Add refuses NaN;
		// a residence may be +Inf), and math.Min's NaN and −0 rules cost time
		// in the per-sample path.
		if s.Temperature < sum.MinForwardTemperature {
			sum.MinForwardTemperature = s.Temperature
		}
		if s.Flow > sum.MaxForwardFlow {
			sum.MaxForwardFlow = s.Flow
		}
		if e.lastRes < sum.MinForwardResidence {
			sum.MinForwardResidence = e.lastRes
		}
		for k, lr := range e.lastLR {
			if lr < sum.MinForwardLogReduction[k] {
				sum.MinForwardLogReduction[k] = lr
			}
		}
	} else {
		sum.Diverted += d
		sum.DivertedVolume += vol
	}

	below := s.Temperature < e.m.Setpoint-limitTolerance
	e.trackDrop(s, i, below)

	if !s.Forward {
		e.closeEvent()
		return
	}
	gap := d > e.threshold
	temp := below
	flow := s.Flow > e.m.MaxFlow*(1+flowTolerance)
	legal := e.lastTemp.meetsLegal(e.lastRes, &e.m)
	reqMet := true
	for k, lr := range e.lastLR {
		if r := e.required[k]; r > 0 && !(lr >= r) {
			reqMet = false
		}
	}
	if !legal || !reqMet {
		sum.SamplesShort++
	}
	lowShort := e.low && e.judgeLow()
	var class eventClass
	switch {
	case gap:
		class = classGap
	case temp || flow:
		class = classLimit
	case !legal || !reqMet:
		class = classLethality
	default:
		e.closeEvent()
		return
	}
	if e.open != nil && e.open.class != class {
		e.closeEvent()
	}
	if e.open == nil {
		e.open = &openEvent{Event: Event{First: i, Start: s.Time, MinTemperature: math.Inf(1), MaxFlow: math.Inf(-1),
			MinLogReduction: make([]float64, len(e.lastLR)), MinResidence: math.Inf(1), MinSampleResidence: math.Inf(1),
			LegalRowMet: !gap, Drop: -1}, class: class, allMet: true}
		for k := range e.open.MinLogReduction {
			e.open.MinLogReduction[k] = math.Inf(1)
		}
	}
	ev := e.open
	ev.Last, ev.End = i, s.Time+d
	ev.Duration += d
	ev.Volume += vol
	ev.MinTemperature = math.Min(ev.MinTemperature, s.Temperature)
	ev.MaxFlow = math.Max(ev.MaxFlow, s.Flow)
	ev.MinResidence = math.Min(ev.MinResidence, e.lastRes)
	if e.lastU > 0 {
		ev.MinSampleResidence = math.Min(ev.MinSampleResidence, e.m.Tube.Length/e.lastU)
	}
	for k, lr := range e.lastLR {
		ev.MinLogReduction[k] = math.Min(ev.MinLogReduction[k], lr)
	}
	if e.low {
		if ev.MinLogReductionAtSensorLow == nil {
			ev.MinLogReductionAtSensorLow = infinities(len(e.lowLR))
		}
		for k, lr := range e.lowLR {
			ev.MinLogReductionAtSensorLow[k] = math.Min(ev.MinLogReductionAtSensorLow[k], lr)
		}
		if lowShort {
			ev.SamplesShortAtSensorLow++
		}
	}
	if gap {
		ev.AtRiskVolume += vol
		return
	}
	if temp {
		ev.temp = true
		if ev.Drop < 0 {
			ev.Drop = e.drop
		}
	}
	ev.flow = ev.flow || flow
	if !legal {
		ev.LegalRowMet = false
	}
	if !legal || !reqMet {
		ev.allMet = false
		ev.AtRiskVolume += vol
	}
}

// judgeLow judges the last sample's parcel with its reading lowered by the
// sensor accuracy (the residence as recorded: the accuracy is a doubt about
// the reading, applied where the rules read a temperature, docs/METHOD.md
// §13.4): it fills e.lowLR, books the summary's figures and says whether the
// parcel then fails a legal row or a required log reduction.
func (e *Engine) judgeLow() (short bool) {
	sum := &e.sum
	short = !e.lastTemp.meetsLegalLow(e.lastRes, &e.m)
	for k, d := range e.lastTemp.dLow {
		lr := e.lastRes / d
		e.lowLR[k] = lr
		if lr < sum.MinForwardLogReductionAtSensorLow[k] {
			sum.MinForwardLogReductionAtSensorLow[k] = lr
		}
		if r := e.required[k]; r > 0 && !(lr >= r) {
			short = true
		}
	}
	if short {
		sum.SamplesShortAtSensorLow++
	}
	return short
}

// median is the median of v, the mean of the middle two for an even count;
// NaN for none. It sorts v.
func median(v []float64) float64 {
	n := len(v)
	if n == 0 {
		return math.NaN()
	}
	sort.Float64s(v)
	if n%2 == 0 {
		return (v[n/2-1] + v[n/2]) / 2
	}
	return v[n/2]
}

// infinities is n values of +Inf, the start of a minimum.
func infinities(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.Inf(1)
	}
	return v
}

// trackDrop follows the temperature drops below the setpoint.
func (e *Engine) trackDrop(s Sample, i int, below bool) {
	if e.drop >= 0 && !below {
		e.drops[e.drop].End, e.drops[e.drop].Recovered = s.Time, true
		e.drop = -1
	}
	if !below {
		return
	}
	if e.drop < 0 {
		e.drops = append(e.drops, Drop{First: i, Start: s.Time, MinTemperature: s.Temperature})
		e.drop = len(e.drops) - 1
	}
	dr := &e.drops[e.drop]
	dr.End = s.Time
	dr.MinTemperature = math.Min(dr.MinTemperature, s.Temperature)
	if s.Forward {
		dr.ForwardBelow = true
	} else if dr.DivertAfter == nil {
		v := s.Time - dr.Start
		dr.DivertAfter = &v
	}
}

// closeEvent ends the open event, if any.
func (e *Engine) closeEvent() {
	ev := e.open
	if ev == nil {
		return
	}
	e.open = nil
	switch {
	case ev.class == classGap:
		ev.Kind, ev.Verdict = KindGap, NoRecord
		e.sum.Gaps++
	case ev.class == classLethality:
		ev.Kind = KindLethality
	case ev.temp && ev.flow:
		ev.Kind = KindTemperatureFlow
	case ev.temp:
		ev.Kind = KindTemperature
	case ev.flow:
		ev.Kind = KindFlow
	default:
		panic(panicPrefix + "an event of no class")
	}
	if ev.class != classGap {
		ev.Verdict = ProductAtRisk
		if ev.allMet {
			ev.Verdict = LimitsMet
		}
	}
	e.events = append(e.events, ev.Event)
}

// Finish ends the run (the last sample has no duration) and returns the
// result. The Engine cannot be used after it.
func (e *Engine) Finish() Result {
	if e.done {
		panic(panicPrefix + "Finish called twice")
	}
	if e.threshold == 0 {
		e.settle()
	}
	if e.n > 0 {
		e.close(e.last, e.n-1, 0)
	}
	e.sum.MedianForwardTemperature, e.sum.MedianForwardFlow = median(e.fwdTemps), median(e.fwdFlows)
	e.fwdTemps, e.fwdFlows = nil, nil
	e.closeEvent()
	e.done = true
	for i := range e.events {
		ev := &e.events[i]
		if ev.Drop >= 0 && e.drops[ev.Drop].DivertAfter != nil {
			v := *e.drops[ev.Drop].DivertAfter
			ev.DivertAfter = &v
		}
	}
	e.shiftTimes()
	s := &e.sum
	s.MedianInterval, s.GapThreshold = e.median, e.threshold
	if s.ForwardSamples == 0 {
		s.MinForwardTemperature, s.MaxForwardFlow, s.MinForwardResidence = math.NaN(), math.NaN(), math.NaN()
		for k := range s.MinForwardLogReduction {
			s.MinForwardLogReduction[k] = math.NaN()
		}
		for k := range s.MinForwardLogReductionAtSensorLow {
			s.MinForwardLogReductionAtSensorLow[k] = math.NaN()
		}
	}
	if e.events == nil {
		e.events = []Event{}
	}
	if e.drops == nil {
		e.drops = []Drop{}
	}
	res := Result{Summary: e.sum, Events: e.events, Drops: e.drops}
	if e.trace != nil {
		res.Trace = e.trace.buckets()
	}
	return res
}

// shiftTimes adds Options.Origin to every time of the result; a drop's and
// an event's response time, a difference, stays as computed.
func (e *Engine) shiftTimes() {
	if e.origin == 0 {
		return
	}
	o := e.origin
	e.sum.Start += o
	e.sum.End += o
	for i := range e.events {
		e.events[i].Start += o
		e.events[i].End += o
	}
	for i := range e.drops {
		e.drops[i].Start += o
		e.drops[i].End += o
	}
	if e.trace != nil {
		e.trace.origin = o
	}
}

// finite says whether v is a number other than ±Inf.
func finite(v float64) bool { return v-v == 0 }
