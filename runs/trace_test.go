package runs

// No external source applies: the trace's definition (trace.go) is the reference.

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestTraceKeepsEveryExcursion feeds long noisy runs with one-sample spikes
// and checks the definition of the trace (trace.go): at most the asked
// number of buckets, in time order without overlap, every sample counted in
// the one bucket whose time range holds it and inside that bucket's
// extremes, so a drawing from minimum to maximum loses no sample.
func TestTraceKeepsEveryExcursion(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{1, 7, 1000, 100_000} {
		const buckets = 64
		tr := newTrace(buckets)
		var s []Sample
		tm := 1e9 + rng.Float64()
		for i := range n {
			temp, q := 73+0.03*rng.NormFloat64(), 0.003+1e-5*rng.NormFloat64()
			if i%997 == 500 {
				temp = 60 // a one-sample drop
			}
			x := Sample{Time: tm, Temperature: temp, Flow: q, Forward: i%5 != 0}
			s = append(s, x)
			tr.add(x)
			if rng.Float64() > 0.1 {
				tm += rng.ExpFloat64()
			}
		}
		got := tr.buckets()
		if len(got) > buckets || len(got) == 0 {
			t.Fatalf("%d samples: %d buckets, want 1 to %d", n, len(got), buckets)
		}
		if n >= 1000 && len(got) < buckets/2 {
			t.Errorf("%d samples: only %d buckets used of %d", n, len(got), buckets)
		}
		count := 0
		for i, b := range got {
			count += b.Forward + b.Diverted
			if b.Start > b.End || i > 0 && !(got[i-1].End < b.Start) {
				t.Fatalf("%d samples: bucket %d [%g, %g] out of order", n, i, b.Start, b.End)
			}
		}
		if count != n {
			t.Errorf("%d samples counted, want %d", count, n)
		}
		j := 0
		for i, x := range s {
			for j < len(got) && got[j].End < x.Time {
				j++
			}
			if j == len(got) || x.Time < got[j].Start {
				t.Fatalf("%d samples: sample %d at %g in no bucket", n, i, x.Time)
			}
			b := got[j]
			if x.Temperature < b.MinTemperature || x.Temperature > b.MaxTemperature || x.Flow < b.MinFlow || x.Flow > b.MaxFlow {
				t.Fatalf("%d samples: sample %d (%g °C, %g m³/s) outside its bucket's extremes %+v", n, i, x.Temperature, x.Flow, b)
			}
		}
		lo := math.Inf(1)
		for _, b := range got {
			lo = math.Min(lo, b.MinTemperature)
		}
		if n > 500 && lo > 60 {
			t.Errorf("%d samples: least temperature drawn %g, want the 60 °C spike", n, lo)
		}
	}
}
