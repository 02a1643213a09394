package runs

import "math"

// TraceBucket summarises the samples of one stretch of a run for drawing:
// their extremes and how many went forward and how many were diverted. A
// drawing that shows each bucket from its minimum to its maximum loses no
// excursion, however long the run.
type TraceBucket struct {
	Start, End       float64 // s: the first and last sample times in the bucket
	MinTemperature   float64 // °C
	MaxTemperature   float64 // °C
	MinFlow, MaxFlow float64 // m³/s, as given to the engine
	Forward          int     // samples in forward flow
	Diverted         int     // samples diverted
}

// traceWidth0 is the first bucket width, s; it doubles as the run grows.
const traceWidth0 = 1e-3

// trace keeps at most cap buckets of equal width on a grid from the first
// sample's time: when a sample falls beyond the last, neighbouring buckets
// merge in pairs and the width doubles, so memory stays fixed and every
// bucket covers the same span of time (docs/METHOD.md §13.7).
type trace struct {
	cap    int
	origin float64 // added to the buckets' times (Options.Origin)
	t0     float64
	width  float64
	b      []TraceBucket // index k covers [t0 + k·width, t0 + (k+1)·width); empty ones have Start > End
}

func newTrace(buckets int) *trace {
	if buckets < 2 || buckets%2 != 0 {
		panic(panicPrefix + "Options.Trace must be an even number of buckets, at least 2")
	}
	return &trace{cap: buckets, width: traceWidth0}
}

func emptyBucket() TraceBucket {
	return TraceBucket{Start: math.Inf(1), End: math.Inf(-1), MinTemperature: math.Inf(1), MaxTemperature: math.Inf(-1),
		MinFlow: math.Inf(1), MaxFlow: math.Inf(-1)}
}

// add takes the next sample (times in order).
func (tr *trace) add(s Sample) {
	if len(tr.b) == 0 {
		tr.t0 = s.Time
	}
	k := int((s.Time - tr.t0) / tr.width)
	for k >= tr.cap {
		tr.halve()
		k = int((s.Time - tr.t0) / tr.width)
	}
	for len(tr.b) <= k {
		tr.b = append(tr.b, emptyBucket())
	}
	b := &tr.b[k]
	b.Start, b.End = math.Min(b.Start, s.Time), math.Max(b.End, s.Time)
	b.MinTemperature, b.MaxTemperature = math.Min(b.MinTemperature, s.Temperature), math.Max(b.MaxTemperature, s.Temperature)
	b.MinFlow, b.MaxFlow = math.Min(b.MinFlow, s.Flow), math.Max(b.MaxFlow, s.Flow)
	if s.Forward {
		b.Forward++
	} else {
		b.Diverted++
	}
}

// halve merges neighbouring buckets and doubles the width.
func (tr *trace) halve() {
	n := (len(tr.b) + 1) / 2
	for j := range n {
		m := tr.b[2*j]
		if 2*j+1 < len(tr.b) {
			o := tr.b[2*j+1]
			m.Start, m.End = math.Min(m.Start, o.Start), math.Max(m.End, o.End)
			m.MinTemperature, m.MaxTemperature = math.Min(m.MinTemperature, o.MinTemperature), math.Max(m.MaxTemperature, o.MaxTemperature)
			m.MinFlow, m.MaxFlow = math.Min(m.MinFlow, o.MinFlow), math.Max(m.MaxFlow, o.MaxFlow)
			m.Forward += o.Forward
			m.Diverted += o.Diverted
		}
		tr.b[j] = m
	}
	tr.b = tr.b[:n]
	tr.width *= 2
}

// buckets returns the buckets that hold samples, in time order.
func (tr *trace) buckets() []TraceBucket {
	out := make([]TraceBucket, 0, len(tr.b))
	for _, b := range tr.b {
		if b.Forward+b.Diverted > 0 {
			b.Start += tr.origin
			b.End += tr.origin
			out = append(out, b)
		}
	}
	return out
}
