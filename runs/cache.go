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
	tempCacheBits  = 12
	speedCacheBits = 14
)

// slot hashes the bits of a key into a cache of 2^bits entries (Fibonacci
// hashing).
func slot(key uint64, bits uint) uint64 { return (key * 0x9E3779B97F4A7C15) >> (64 - bits) }

// tempEntry is what depends on a recorded outlet temperature alone: each
// organism's D value and what is known of the legal table there, as read and
// with the reading lowered by the sensor accuracy, and the product's
// rheology there.
type tempEntry struct {
	key      uint64 // math.Float64bits of the temperature
	used     bool
	d        []float64 // D per organism, s
	legal    legalBounds
	dLow     []float64 // D per organism at the reading less Model.SensorAccuracy, s (nil without one)
	legalLow legalBounds
	// rh is Model.RheologyAt at the colder of the reading and the setpoint
	// (nil without RheologyAt), for the speeds of flows at this
	// temperature.
	rh lethality.Rheology
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

func newTempCache(organisms int, low bool) *tempCache {
	c := &tempCache{}
	d := make([]float64, organisms*len(c.entries))
	var dLow []float64
	if low {
		dLow = make([]float64, organisms*len(c.entries))
	}
	for i := range c.entries {
		c.entries[i].d = d[i*organisms : (i+1)*organisms : (i+1)*organisms]
		if low {
			c.entries[i].dLow = dLow[i*organisms : (i+1)*organisms : (i+1)*organisms]
		}
	}
	return c
}

// tempSlot is the entry for temperature bits key: the bits from the 38th
// on (two or three entries to a hundredth of a degree between 64 and 128
// °C, wrapping round every 16 °C), the sign and exponent hashed to move the
// block. A recorded temperature moves a little from one sample to the next,
// so the entries in use lie together.
func tempSlot(key uint64) uint64 {
	return (key>>38 + slot(key>>52, tempCacheBits)) & (1<<tempCacheBits - 1)
}

// at returns the entry for temperature temp (°C), filled for the engine's
// model.
func (c *tempCache) at(temp float64, eng *Engine) *tempEntry {
	key := math.Float64bits(temp)
	e := &c.entries[tempSlot(key)]
	if e.used && e.key == key {
		return e
	}
	e.key, e.used, e.legal, e.legalLow, e.rh = key, true, legalBounds{}, legalBounds{}, nil
	for i, o := range eng.m.Organisms {
		e.d[i] = o.DAt(temp)
	}
	if e.dLow != nil {
		low := temp - eng.m.SensorAccuracy
		for i, o := range eng.m.Organisms {
			e.dLow[i] = o.DAt(low)
		}
	}
	if eng.m.RheologyAt != nil {
		e.rh = eng.m.RheologyAt(eng.rheologyTemp(temp))
	}
	return e
}

// meetsLegal says whether a parcel at this entry's temperature with
// residence res (s) meets a row of the legal table; true when the model has
// none.
func (e *tempEntry) meetsLegal(res float64, m *Model) bool {
	return judgeLegal(&e.legal, math.Float64frombits(e.key), res, m)
}

// meetsLegalLow is meetsLegal with the reading lowered by the sensor
// accuracy.
func (e *tempEntry) meetsLegalLow(res float64, m *Model) bool {
	return judgeLegal(&e.legalLow, math.Float64frombits(e.key)-m.SensorAccuracy, res, m)
}

// judgeLegal judges the legal table at temperature temp for residence res,
// asking lethality.JudgeLegal only when b does not already tell.
func judgeLegal(b *legalBounds, temp, res float64, m *Model) bool {
	if len(m.Legal) == 0 {
		return true
	}
	switch {
	case b.hasMet && res >= b.met:
		return true
	case b.hasFail && res <= b.fail:
		return false
	}
	met := lethality.JudgeLegal(m.Legal, temp, res, legalTolerance).Met
	if met {
		b.met, b.hasMet = res, true
	} else {
		b.fail, b.hasFail = res, true
	}
	return met
}

// speedCache remembers the fastest particle's speed per flow and the
// temperature the rheology is taken at (Engine.rheologyTemp), both keyed by
// their exact bits: RheologyAt gives one rheology for one temperature, so
// the speed is the one a fresh computation gives. The key does not need the
// temperature's cache entry, so both are looked up at once.
type speedCache struct {
	entries [1 << speedCacheBits]speedEntry
}

// speedEntry is one remembered speed; q is 0 in an unused entry (no flow
// needs a speed: Engine.speed answers 0 for q ≤ 0).
type speedEntry struct {
	q, t uint64 // math.Float64bits of the flow and of the rheology's temperature
	u    float64
}

// speedSlot is the entry for flow bits kq and temperature bits kt. The
// flow's bits from the 35th on pick the entry (flows a few millionths
// apart are neighbours, 1/8 apart wrap round), and the temperature's hash
// moves the whole block: a run's flows, which wander a little about the
// set rate, then fill a few contiguous kilobytes of the table instead of
// scattering over it.
func (c *speedCache) speedSlot(kq, kt uint64) *speedEntry {
	return &c.entries[(kq>>35+slot(kt, speedCacheBits))&(1<<speedCacheBits-1)]
}
