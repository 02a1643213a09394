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
// with the reading lowered by the sensor accuracy.
type tempEntry struct {
	key      uint64 // math.Float64bits of the temperature
	used     bool
	gen      uint32    // the cache's generation when filled
	d        []float64 // D per organism, s
	legal    legalBounds
	dLow     []float64 // D per organism at the reading less Model.SensorAccuracy, s (nil without one)
	legalLow legalBounds
	rh       uint32 // the number of the rheology at this temperature (Engine.rheologyID); 0 when it does not depend on it
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
	gen     uint32 // raised when the rheology numbers start afresh
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

// at returns the entry for temperature temp (°C), filled for the engine's
// model.
func (c *tempCache) at(temp float64, eng *Engine) *tempEntry {
	key := math.Float64bits(temp)
	e := &c.entries[slot(key, tempCacheBits)]
	if e.used && e.key == key && e.gen == c.gen {
		return e
	}
	e.key, e.used, e.legal, e.legalLow, e.rh = key, true, legalBounds{}, legalBounds{}, 0
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
		// The colder of the reading and the setpoint (Model.RheologyAt).
		e.rh = eng.rheologyID(math.Min(temp, eng.m.Setpoint)) // may start a new generation
	}
	e.gen = c.gen
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

// speedCache remembers the fastest particle's speed per flow and rheology
// number (Engine.rheologyID).
type speedCache struct {
	entries [1 << speedCacheBits]struct {
		q    uint64
		rh   uint32
		used bool
		u    float64
	}
}

func (c *speedCache) get(q float64, rh uint32) (float64, bool) {
	kq := math.Float64bits(q)
	e := &c.entries[slot(kq^(uint64(rh)*0xBF58476D1CE4E5B9), speedCacheBits)]
	return e.u, e.used && e.q == kq && e.rh == rh
}

func (c *speedCache) put(q float64, rh uint32, u float64) {
	kq := math.Float64bits(q)
	e := &c.entries[slot(kq^(uint64(rh)*0xBF58476D1CE4E5B9), speedCacheBits)]
	e.q, e.rh, e.u, e.used = kq, rh, u, true
}

// maxRheologies bounds the rheologies an Engine numbers at once.
const maxRheologies = 4096

// rheologies numbers the distinct rheologies met so far. lethality's
// rheologies are comparable values, so equal ones share a number.
type rheologies struct {
	ids  map[lethality.Rheology]uint32
	list []lethality.Rheology
}
