package runs

import (
	"math"
	"math/rand/v2"
	"testing"

	"pasval/lethality"
)

// bruteResidence is the definition of docs/METHOD.md §13 evaluated directly:
// walk back from sample i over the held intervals, summing u_j·(t_{j+1} − t_j)
// until the tube length is covered; before the first sample, u_0 holds.
// O(n) per parcel, for checking the tracker only.
func bruteResidence(ts, us []float64, i int, length float64) float64 {
	rest := length
	for j := i - 1; j >= 0; j-- {
		d := ts[j+1] - ts[j]
		if us[j]*d >= rest {
			return ts[i] - (ts[j+1] - rest/us[j])
		}
		rest -= us[j] * d
	}
	if !(us[0] > 0) {
		return math.Inf(1)
	}
	return ts[i] - ts[0] + rest/us[0]
}

// TestTrackerAgainstDefinition compares the streaming tracker with the
// direct sum on random runs: irregular intervals (repeated times
// included), flows that stop and restart.
func TestTrackerAgainstDefinition(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for run := range 20 {
		n := 2000
		ts, us := make([]float64, n), make([]float64, n)
		for i := 1; i < n; i++ {
			ts[i] = ts[i-1]
			if rng.Float64() > 0.05 {
				ts[i] += rng.ExpFloat64()
			}
		}
		for i := range us {
			switch {
			case rng.Float64() < 0.1:
				us[i] = 0
			default:
				us[i] = 0.2 + 3*rng.Float64()
			}
		}
		if run%2 == 0 {
			us[0] = 0 // product standing before the run: infinite residences at first
		}
		length := 5 + 20*rng.Float64()
		var k tracker
		k.length = length
		k.start(ts[0], us[0])
		for i := range n {
			if i > 0 {
				k.advance(us[i-1], ts[i])
			}
			got, want := k.residence(), bruteResidence(ts, us, i, length)
			if math.IsInf(want, 1) {
				if !math.IsInf(got, 1) {
					t.Fatalf("run %d sample %d: residence %g, want +Inf", run, i, got)
				}
				continue
			}
			// Both are sums of the same terms in another order.
			if math.Abs(got-want) > 1e-9*(1+want) {
				t.Fatalf("run %d sample %d: residence %.15g, want %.15g", run, i, got, want)
			}
		}
	}
}

// TestTrackerWindowBounded checks that the window holds about a tube's
// worth of intervals, not the run: a long steady run at one-second samples
// with a residence of ~18 s.
func TestTrackerWindowBounded(t *testing.T) {
	var k tracker
	k.length = 34
	k.start(0, 1.9)
	maxLen := 0
	for i := 1; i <= 1_000_000; i++ {
		k.advance(1.9, float64(i))
		k.residence()
		maxLen = max(maxLen, len(k.segs))
	}
	// Compaction runs once the dropped front reaches 4096 entries and half
	// the slice: at most 2 × 4096 + the ~18 live ones.
	if maxLen > 2*4096+64 {
		t.Errorf("window grew to %d intervals", maxLen)
	}
}

// TestSpeedsKeyedByRheology: with a viscosity for every recorded
// temperature, more of them than the temperature cache holds, every
// parcel's residence still equals the definition walked back with speeds
// computed afresh from package lethality, the viscosity taken at the colder
// of the reading and the setpoint (docs/METHOD.md §13.4), and every cached
// speed is the fresh one to the bit.
func TestSpeedsKeyedByRheology(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	m := Model{
		Tube:     lethality.Tube{InnerDiameter: 0.0475, Length: 34},
		Rheology: lethality.Newtonian{Viscosity: 0.72e-3},
		// A different viscosity for each hundredth of a degree, as a curve
		// of points would give below its last point.
		RheologyAt: func(temp float64) lethality.Rheology {
			return lethality.Newtonian{Viscosity: 0.72e-3 * math.Exp(0.02*(72.5-temp))}
		},
		Density: 1031, Legal: []lethality.LegalRow{{Temperature: 72, Time: 15}}, Setpoint: 72.5, MaxFlow: 11000.0 / 3.6e6,
	}
	e, err := NewEngine(m, Options{GapThreshold: 10})
	if err != nil {
		t.Fatal(err)
	}
	const many = 4096 // more temperatures than the temperature cache has entries
	const n = 3 * many
	ts, us := make([]float64, n), make([]float64, n)
	for i := range n {
		temp := 60 + float64(rng.IntN(2000))/100 // 2000 temperatures, revisited, 750 of them above the setpoint
		if i > 2*many {
			temp = 72.4 - float64(i-2*many)/1000 // then new ones below it, evicting one another
		}
		q := (9500 + float64(rng.IntN(1000))) / 3.6e6
		ts[i] = float64(i)
		h := m.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: m.Density}, m.RheologyAt(math.Min(temp, m.Setpoint)), 0)
		us[i] = h.FastestToMean * h.MeanVelocity
		if err := e.Add(Sample{Time: ts[i], Temperature: temp, Flow: q, Forward: true}); err != nil {
			t.Fatal(err)
		}
		if want := bruteResidence(ts, us, i, m.Tube.Length); math.Abs(e.lastRes-want) > 1e-9*want {
			t.Fatalf("sample %d: residence %.15g, want %.15g", i, e.lastRes, want)
		}
		// The cached speed is the fresh one to the bit.
		if math.Float64bits(e.lastU) != math.Float64bits(us[i]) {
			t.Fatalf("sample %d (%.2f °C, %g m³/s): speed %.17g m/s, computed afresh %.17g", i, temp, q, e.lastU, us[i])
		}
	}
}
