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

	// Waiting for the median interval.
	pending   []Sample
	intervals []float64

	// The sample awaiting its held interval, and its parcel.
	n        int // samples taken so far
	last     Sample
	lastU    float64   // its fastest-particle speed, m/s
	lastRes  float64   // its parcel's residence, s
	lastLR   []float64 // its parcel's log reduction per organism
	prevTime float64   // the latest time added (for order)
	tr       tracker

	// Caches of the last inputs (recorder values repeat).
	speedQ, speedT, speedU float64
	dT                     float64
	d                      []float64
	legal                  map[float64]legalBounds

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
	gap, temp, flow, allMet bool
}

// legalBounds are, for one temperature, the least residence known to meet
// the legal table and the greatest known to fail it. Meeting it is monotone
// in the residence (a longer one meets every row a shorter one meets), so
// lethality.JudgeLegal, the one home of the rule, is asked only when a
// residence falls between them.
type legalBounds struct {
	met, fail       float64
	hasMet, hasFail bool
}

// legalCacheSize bounds the cache; recorders write temperatures to a
// resolution of 0.01 to 0.1 °C, so a run has a few hundred distinct values.
const legalCacheSize = 4096

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
	e := &Engine{m: m, threshold: opt.GapThreshold, drop: -1, lastLR: make([]float64, no), d: make([]float64, no),
		speedQ: math.NaN(), dT: math.NaN(), legal: map[float64]legalBounds{}}
	e.tr.length = m.Tube.Length
	e.median = math.NaN()
	e.sum = Summary{MinForwardTemperature: math.Inf(1), MaxForwardFlow: math.Inf(-1), MinForwardResidence: math.Inf(1),
		MinForwardLogReduction: make([]float64, no), MedianInterval: math.NaN()}
	for i := range e.sum.MinForwardLogReduction {
		e.sum.MinForwardLogReduction[i] = math.Inf(1)
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
	for _, f := range []struct {
		name string
		v    float64
	}{{"time", s.Time}, {"temperature", s.Temperature}, {"flow", s.Flow}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			e.err = &SampleError{Index: idx, Field: f.name, Value: f.v, Previous: math.NaN()}
			return e.err
		}
	}
	if idx > 0 && s.Time < e.prevTime {
		e.err = &SampleError{Index: idx, Field: "time", Value: s.Time, Previous: e.prevTime}
		return e.err
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
	if len(e.intervals) >= MedianWindow {
		e.settle()
	}
	return nil
}

// settle fixes the gap threshold from the intervals seen so far and judges
// the samples held back.
func (e *Engine) settle() {
	if len(e.intervals) > 0 {
		sort.Float64s(e.intervals)
		n := len(e.intervals)
		e.median = e.intervals[n/2]
		if n%2 == 0 {
			e.median = (e.intervals[n/2-1] + e.intervals[n/2]) / 2
		}
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
	if e.n == 0 {
		e.sum.Start = s.Time
		e.tr.start(s.Time, e.speed(s.Flow, s.Temperature))
	} else {
		e.close(e.last, e.n-1, s.Time-e.last.Time)
		e.tr.advance(e.lastU, s.Time)
	}
	e.lastRes = e.tr.residence()
	e.dValues(s.Temperature)
	for i := range e.lastLR {
		e.lastLR[i] = e.lastRes / e.d[i]
	}
	e.lastU = e.speed(s.Flow, s.Temperature)
	e.last = s
	e.n++
}

// speed is the fastest particle's speed r·v for flow q (m³/s) at temperature
// temp (°C), by the same tube model as the design check
// (docs/METHOD.md §7 (holding tube)): v = Q/A, r from the interval's
// Reynolds number (or the model's override). Zero for no flow.
func (e *Engine) speed(q, temp float64) float64 {
	if !(q > 0) {
		return 0
	}
	if e.m.RheologyAt == nil {
		temp = 0 // the rheology does not depend on it
	}
	if q == e.speedQ && temp == e.speedT {
		return e.speedU
	}
	rh := e.m.Rheology
	if e.m.RheologyAt != nil {
		rh = e.m.RheologyAt(temp)
	}
	h := e.m.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: e.m.Density}, rh, e.m.FastestToMean)
	e.speedQ, e.speedT, e.speedU = q, temp, h.FastestToMean*h.MeanVelocity
	return e.speedU
}

// dValues fills e.d with each organism's D at temp.
func (e *Engine) dValues(temp float64) {
	if temp == e.dT {
		return
	}
	for i, o := range e.m.Organisms {
		e.d[i] = o.DAt(temp)
	}
	e.dT = temp
}

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
		sum.MinForwardTemperature = math.Min(sum.MinForwardTemperature, s.Temperature)
		sum.MaxForwardFlow = math.Max(sum.MaxForwardFlow, s.Flow)
		sum.MinForwardResidence = math.Min(sum.MinForwardResidence, e.lastRes)
		for k, lr := range e.lastLR {
			sum.MinForwardLogReduction[k] = math.Min(sum.MinForwardLogReduction[k], lr)
		}
	} else {
		sum.Diverted += d
		sum.DivertedVolume += vol
	}

	below := s.Temperature < e.m.Setpoint
	e.trackDrop(s, i, below)

	if !s.Forward {
		e.closeEvent()
		return
	}
	gap := d > e.threshold
	temp := below
	flow := s.Flow > e.m.MaxFlow
	legal := e.meetsLegal(s.Temperature, e.lastRes)
	reqMet := true
	for k, lr := range e.lastLR {
		if r := e.m.Organisms[k].RequiredLogReduction; r > 0 && !(lr >= r) {
			reqMet = false
		}
	}
	if !gap && !temp && !flow && legal && reqMet {
		e.closeEvent()
		return
	}
	if e.open != nil && e.open.gap != gap {
		e.closeEvent()
	}
	if e.open == nil {
		e.open = &openEvent{Event: Event{First: i, Start: s.Time, MinTemperature: math.Inf(1), MaxFlow: math.Inf(-1),
			MinLogReduction: make([]float64, len(e.lastLR)), MinResidence: math.Inf(1), MinSampleResidence: math.Inf(1),
			LegalRowMet: !gap, Drop: -1}, gap: gap, allMet: true}
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

// meetsLegal says whether a parcel at temperature temp (°C) with residence
// res (s) meets a row of the legal table; true when the model has none.
func (e *Engine) meetsLegal(temp, res float64) bool {
	if len(e.m.Legal) == 0 {
		return true
	}
	b, ok := e.legal[temp]
	if !ok {
		if len(e.legal) >= legalCacheSize {
			clear(e.legal)
		}
	}
	switch {
	case b.hasMet && res >= b.met:
		return true
	case b.hasFail && res <= b.fail:
		return false
	}
	met := lethality.JudgeLegal(e.m.Legal, temp, res).Met
	if met {
		b.met, b.hasMet = res, true
	} else {
		b.fail, b.hasFail = res, true
	}
	e.legal[temp] = b
	return met
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
	case ev.gap:
		ev.Kind, ev.Verdict = KindGap, NoRecord
		e.sum.Gaps++
	case ev.temp && ev.flow:
		ev.Kind = KindTemperatureFlow
	case ev.temp:
		ev.Kind = KindTemperature
	case ev.flow:
		ev.Kind = KindFlow
	default:
		ev.Kind = KindLethality
	}
	if !ev.gap {
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
	e.closeEvent()
	e.done = true
	for i := range e.events {
		ev := &e.events[i]
		if ev.Drop >= 0 && e.drops[ev.Drop].DivertAfter != nil {
			v := *e.drops[ev.Drop].DivertAfter
			ev.DivertAfter = &v
		}
	}
	s := &e.sum
	s.MedianInterval, s.GapThreshold = e.median, e.threshold
	if s.ForwardSamples == 0 {
		s.MinForwardTemperature, s.MaxForwardFlow, s.MinForwardResidence = math.NaN(), math.NaN(), math.NaN()
		for k := range s.MinForwardLogReduction {
			s.MinForwardLogReduction[k] = math.NaN()
		}
	}
	if e.events == nil {
		e.events = []Event{}
	}
	if e.drops == nil {
		e.drops = []Drop{}
	}
	return Result{Summary: e.sum, Events: e.events, Drops: e.drops}
}
