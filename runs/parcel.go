package runs

import "math"

// tracker finds, for the parcel leaving the holding tube at the latest
// sample time t_i, the time τ₀ its fastest particle entered
// (docs/METHOD.md §13 (recorded runs)):
//
//	∫_{τ₀}^{t_i} u(τ) dτ = L,   u = r·Q_j/A on [t_j, t_{j+1})
//
// with u held at the first sample's value before the run began. With
// X(t) = ∫_{t₀}^{t} u dτ the distance covered since the first sample, τ₀ is
// the latest time with X(τ₀) = X(t_i) − L. X only grows, so the target
// X(t_i) − L only grows from one sample to the next: the tracker keeps the
// intervals of positive speed from the one holding the target onwards (a
// window covering the tube) and drops intervals from its front as the target
// passes them, amortised O(1) per sample. Intervals of zero speed cover no
// distance and are never stored, so the window is bounded by the tube's
// content in samples, not by the run's length.
type tracker struct {
	length float64   // L, m
	t0     float64   // the first sample's time, s
	pre    float64   // the speed before the first sample, m/s
	t      float64   // the latest sample's time, s
	x      float64   // X(t), m
	segs   []segment // intervals of positive speed, in time order, from head on
	head   int
}

// segment is an interval starting at time t, distance x, at speed u > 0.
type segment struct{ t, x, u float64 }

// start begins the run at time t0 with the speed held before it.
func (k *tracker) start(t0, pre float64) {
	k.t0, k.t, k.pre = t0, t0, pre
}

// advance moves to the next sample time t, the interval from the previous
// sample having run at speed u.
func (k *tracker) advance(u, t float64) {
	if d := t - k.t; u > 0 && d > 0 {
		k.segs = append(k.segs, segment{k.t, k.x, u})
		k.x += u * d
	}
	k.t = t
}

// residence is t_i − τ₀ for the parcel leaving at the latest sample time;
// +Inf when the product has not moved a tube length since before the run.
func (k *tracker) residence() float64 {
	target := k.x - k.length
	if target < 0 {
		if !(k.pre > 0) {
			return math.Inf(1)
		}
		return (k.t - k.t0) + (-target)/k.pre
	}
	for k.head+1 < len(k.segs) && k.segs[k.head+1].x <= target {
		k.head++
	}
	s := k.segs[k.head]
	r := k.t - (s.t + (target-s.x)/s.u)
	if k.head >= 4096 && 2*k.head >= len(k.segs) {
		n := copy(k.segs, k.segs[k.head:])
		k.segs, k.head = k.segs[:n], 0
	}
	return r
}
