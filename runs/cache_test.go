package runs

import (
	"math"
	"math/rand/v2"
	"testing"

	"pasval/lethality"
)

// TestCachesBitIdentical: over a sweep of recorded temperatures and flows —
// at recorder resolution and off it, revisited, in °C ranges and at flows
// that share cache entries and so evict one another, above and below the
// setpoint — every value the engine takes from its caches is the one a
// fresh computation through package lethality gives, to the bit: each
// organism's D as read and at the lowered reading, the rheology at the
// colder of the reading and the setpoint, and the fastest particle's speed.
// The caches only remember; they must never change a result. Expected
// values: package lethality's uncached functions, the engine's source.
func TestCachesBitIdentical(t *testing.T) {
	m := Model{
		Tube:     lethality.Tube{InnerDiameter: 0.0475, Length: 34},
		Rheology: lethality.Newtonian{Viscosity: 0.72e-3},
		RheologyAt: func(temp float64) lethality.Rheology {
			// A different viscosity for every temperature (a curve of
			// points, between them).
			return lethality.Newtonian{Viscosity: 0.72e-3 * math.Exp(0.02*(72.5-temp))}
		},
		Density: 1031,
		Organisms: []lethality.Organism{{Name: "a", D: 0.9, DTemperature: 71.7, Z: 6.3, RequiredLogReduction: 5},
			{Name: "b", D: 18, DTemperature: 70, Z: 7.5}},
		Legal:    []lethality.LegalRow{{Temperature: 72, Time: 15}},
		Setpoint: 72.5, MaxFlow: 11000.0 / 3.6e6, SensorAccuracy: 0.25,
	}
	for _, curve := range []bool{true, false} {
		mm := m
		if !curve {
			mm.RheologyAt = nil
		}
		e, err := NewEngine(mm, Options{GapThreshold: 10})
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(5, 6))
		// Readings below the setpoint whose speeds share an entry at the
		// same flow, taken one after the other.
		var clash []float64
		byEntry := map[*speedEntry]float64{}
		for c := 60000; c < 72500 && len(clash) < 40; c++ {
			temp := float64(c) / 1000
			ce := e.speeds.speedSlot(math.Float64bits(10000.0/3.6e6), math.Float64bits(temp))
			if other, ok := byEntry[ce]; ok {
				clash = append(clash, other, temp)
			}
			byEntry[ce] = temp
		}
		if curve && len(clash) < 4 {
			t.Fatalf("only %d readings share speed entries: the sweep would not show a clash", len(clash))
		}
		for i := range 200_000 {
			var temp, lh float64
			switch i % 5 {
			case 4:
				if !curve {
					continue
				}
				temp, lh = clash[(i/5)%len(clash)], 10000

			case 0: // recorder resolution near the set point: heavy reuse
				temp, lh = 72+float64(rng.IntN(200))/100, 10000+float64(rng.IntN(600)-300)/10
			case 1: // temperatures 16 °C apart and flows 1/8 apart share entries
				temp = 60 + 16*float64(rng.IntN(3)) + float64(rng.IntN(50))/100
				lh = 9000 * (1 + float64(rng.IntN(4))/8) * (1 + float64(rng.IntN(20))*1e-5)
			case 2: // any value at all
				temp, lh = 4+90*rng.Float64(), 100+20000*rng.Float64()
			case 3: // below zero and far from the rest
				temp, lh = -5+10*rng.Float64(), 1+rng.Float64()
			}
			q := lh / 3.6e6
			te := e.temps.at(temp, e)
			for k, o := range mm.Organisms {
				if got, want := te.d[k], o.DAt(temp); math.Float64bits(got) != math.Float64bits(want) {
					t.Fatalf("%.17g °C: D of %s %.17g s from the cache, %.17g s afresh", temp, o.Name, got, want)
				}
				if got, want := te.dLow[k], o.DAt(temp-mm.SensorAccuracy); math.Float64bits(got) != math.Float64bits(want) {
					t.Fatalf("%.17g °C: D at sensor low of %s %.17g s from the cache, %.17g s afresh", temp, o.Name, got, want)
				}
			}
			rh := mm.Rheology
			if curve {
				rh = mm.RheologyAt(math.Min(temp, mm.Setpoint))
				if te.rh != rh {
					t.Fatalf("%.17g °C: rheology %v from the cache, %v afresh", temp, te.rh, rh)
				}
			}
			h := mm.Tube.Hydraulics(lethality.Flow{Volumetric: q, Density: mm.Density}, rh, mm.FastestToMean)
			want := h.FastestToMean * h.MeanVelocity
			if got := e.speed(q, temp, te); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%.17g °C, %.17g L/h: speed %.17g m/s from the cache, %.17g m/s afresh", temp, lh, got, want)
			}
		}
	}
}
