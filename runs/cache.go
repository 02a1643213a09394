package runs

import (
	"math"

	"pasval/lethality"
)

// Recorders write values to a fixed resolution (0.01 °C, 0.1 L/h), so a run
// repeats a few hundred distinct temperatures and flows millions of times.
// These direct-mapped caches remember what was computed for a recent value,
// keyed by its exact bits, so the results are those of a fresh computation.

const (
	tempCacheBits  = 11
	speedCacheBits = 12
)

// slot hashes the bits of a key into a cache of 2^bits entries (Fibonacci
// hashing).
func slot(key uint64, bits uint) uint64 { return (key * 0x9E3779B97F4A7C15) >> (64 - bits) }

// tempEntry is what depends on a recorded outlet temperature alone: each
// organism's D value and what is known of the legal table there.
type tempEntry struct {
	key   uint64 // math.Float64bits of the temperature
	used  bool
	d     []float64 // D per organism, s
	legal legalBounds
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

type tempCache struct {
	entries [1 << tempCacheBits]tempEntry
}

func newTempCache(organisms int) *tempCache {
	c := &tempCache{}
	d := make([]float64, organisms*len(c.entries))
	for i := range c.entries {
		c.entries[i].d = d[i*organisms : (i+1)*organisms : (i+1)*organisms]
	}
	return c
}

// at returns the entry for temperature temp (°C), filled for the model.
func (c *tempCache) at(temp float64, m *Model) *tempEntry {
	key := math.Float64bits(temp)
	e := &c.entries[slot(key, tempCacheBits)]
	if e.used && e.key == key {
		return e
	}
	e.key, e.used, e.legal = key, true, legalBounds{}
	for i, o := range m.Organisms {
		e.d[i] = o.DAt(temp)
	}
	return e
}

// meetsLegal says whether a parcel at this entry's temperature with
// residence res (s) meets a row of the legal table; true when the model has
// none.
func (e *tempEntry) meetsLegal(res float64, m *Model) bool {
	if len(m.Legal) == 0 {
		return true
	}
	b := &e.legal
	switch {
	case b.hasMet && res >= b.met:
		return true
	case b.hasFail && res <= b.fail:
		return false
	}
	met := lethality.JudgeLegal(m.Legal, math.Float64frombits(e.key), res, legalTolerance).Met
	if met {
		b.met, b.hasMet = res, true
	} else {
		b.fail, b.hasFail = res, true
	}
	return met
}

// speedCache remembers the fastest particle's speed per flow (and
// temperature, when the rheology depends on it).
type speedCache struct {
	entries [1 << speedCacheBits]struct {
		q, t uint64
		u    float64
		used bool
	}
}

func (c *speedCache) get(q, t float64) (float64, bool) {
	kq, kt := math.Float64bits(q), math.Float64bits(t)
	e := &c.entries[slot(kq^(kt*0xBF58476D1CE4E5B9), speedCacheBits)]
	return e.u, e.used && e.q == kq && e.t == kt
}

func (c *speedCache) put(q, t, u float64) {
	kq, kt := math.Float64bits(q), math.Float64bits(t)
	e := &c.entries[slot(kq^(kt*0xBF58476D1CE4E5B9), speedCacheBits)]
	e.q, e.t, e.u, e.used = kq, kt, u, true
}
