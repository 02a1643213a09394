// Package runs judges a recorded production run of a continuous pasteurizer
// against the plant's critical limits: deviations (forward flow below the
// diversion setpoint or above the sealed maximum flow), recording gaps, the
// lethality each parcel of product actually received in the holding tube,
// and how fast the flow-diversion device answered a temperature drop
// (docs/METHOD.md §13 (recorded runs); the tube model is that of
// docs/METHOD.md §7 (holding tube), through package lethality).
//
// It takes SI values and returns results; it never reads files or prints.
// Samples stream through an Engine, so memory does not grow with the run:
//
//	e, err := runs.NewEngine(runs.Model{
//		Tube:      lethality.Tube{InnerDiameter: 0.0475, Length: 34},
//		Rheology:  lethality.Newtonian{Viscosity: 0.72e-3},
//		Density:   1031,
//		Organisms: []lethality.Organism{{Name: "L. monocytogenes", D: 0.9, DTemperature: 71.7, Z: 6.3, RequiredLogReduction: 5}},
//		Legal:     []lethality.LegalRow{{Temperature: 72, Time: 15}},
//		Setpoint:  72.5,
//		MaxFlow:   11.0 / 3.6 / 1000,
//	}, runs.Options{})
//	for _, s := range samples {
//		if err := e.Add(s); err != nil { … }
//	}
//	res := e.Finish() // res.Summary, res.Events, res.Drops
//
// What a sample means (docs/METHOD.md §13): a sample holds until the next
// (zero-order hold); the last has no duration. The parcel leaving the tube at
// a sample's time carries that sample's temperature, and its fastest particle
// entered when the distance the fastest particle covers, integrated back over
// the recorded flow, reaches the tube length; its log reduction is that
// residence over D at the outlet temperature (conservative: the parcel was
// hotter upstream).
//
// Results map one-to-one onto the JSON of the run review (always SI there,
// keys carrying units; pasval/internal/assess builds it, converting flows
// and volumes to the recorded flow's own terms):
//
//	summary.rows                        Summary.Rows
//	summary.start, summary.end          Summary.Start, Summary.End (s; RFC 3339 for clock times)
//	summary.forward_s, diverted_s       Summary.Forward, Summary.Diverted
//	summary.forward_volume_L            Summary.ForwardVolume × 1000 (m³ → L)
//	summary.diverted_volume_L           Summary.DivertedVolume × 1000
//	summary.min_forward_temperature_C   Summary.MinForwardTemperature (null when NaN)
//	summary.max_forward_flow_L_h        Summary.MaxForwardFlow × 3.6e6 (m³/s → L/h)
//	summary.min_forward_log_reduction   Summary.MinForwardLogReduction[0] (the first organism)
//	summary.min_forward_log_reduction_by_organism
//	                                    Summary.MinForwardLogReduction[i] keyed by Model.Organisms[i].Name
//	summary.min_forward_residence_s     Summary.MinForwardResidence
//	summary.samples_short               Summary.SamplesShort
//	summary.sensor_low_K                Model.SensorAccuracy (the keys "at sensor low" only when > 0)
//	summary.samples_short_at_sensor_low Summary.SamplesShortAtSensorLow
//	summary.min_forward_log_reduction_at_sensor_low(_by_organism)
//	                                    Summary.MinForwardLogReductionAtSensorLow
//	summary.gaps                        Summary.Gaps
//	summary.bad_rows                    (the reader's count of skipped rows)
//	summary.median_interval_s           Summary.MedianInterval (the resolution of every time)
//	summary.gap_threshold_s             Summary.GapThreshold
//	events[].kind, verdict              Event.Kind, Event.Verdict (their string values)
//	events[].start, end, duration_s     Event.Start, Event.End, Event.Duration
//	events[].min_temperature_C          Event.MinTemperature
//	events[].max_flow_L_h               Event.MaxFlow × 3.6e6
//	events[].volume_L, at_risk_volume_L Event.Volume, Event.AtRiskVolume × 1000
//	events[].min_log_reduction          Event.MinLogReduction[0]; _by_organism as above
//	events[].min_residence_s            Event.MinResidence
//	events[].min_sample_residence_s     Event.MinSampleResidence (the per-sample estimate beside it)
//	events[].legal_row_met              Event.LegalRowMet
//	events[].samples_short_at_sensor_low, min_log_reduction_at_sensor_low(_by_organism)
//	                                    Event.SamplesShortAtSensorLow, MinLogReductionAtSensorLow
//	events[].divert_after_s             Event.DivertAfter (null when nil)
//	drops[]                             Result.Drops (every drop below the setpoint, diverted ones too)
//
// Start and end are Unix seconds for clock times (ClockTime turns them into
// time.Time for RFC 3339), else seconds as the file wrote them. An infinite
// residence or log reduction (product that has not moved since the run
// began) and NaN (no forward sample) have no JSON number: null.
// Event.First, Event.Last and Event.Drop tie an event to its samples and
// its drop; they are not in the JSON.
package runs

import (
	"errors"
	"fmt"
	"math"
	"time"

	"pasval/lethality"
)

const panicPrefix = "runs: "

// Model is the plant as the run is judged against it: the holding tube and
// the product (docs/METHOD.md §7 (holding tube)), the organisms, the legal
// table and the two critical limits.
type Model struct {
	Tube lethality.Tube // InnerDiameter and Length > 0
	// Rheology is the product's flow behaviour; used for every interval
	// when RheologyAt is nil.
	Rheology lethality.Rheology
	// RheologyAt, when set, gives the rheology at a temperature (°C) (a
	// Newtonian viscosity curve, for instance). The engine takes each
	// interval's Reynolds number with it at the colder of the recorded
	// temperature and Setpoint: product recorded below the setpoint is
	// more viscous, and product recorded above it is never credited beyond
	// the design model, which takes the viscosity at the setpoint
	// (docs/METHOD.md §13.4). Its values must be comparable
	// (lethality.Newtonian and PowerLaw are): equal ones share cached speeds.
	RheologyAt func(temperature float64) lethality.Rheology
	Density    float64 // kg/m³ at the holding temperature, > 0
	// FastestToMean overrides u_max/u_mean for every flow when > 0; 0 takes
	// it from each interval's Reynolds number.
	FastestToMean float64
	Organisms     []lethality.Organism
	Legal         []lethality.LegalRow
	Setpoint      float64 // °C, the diversion setpoint (cut-out)
	MaxFlow       float64 // m³/s, the sealed maximum flow, > 0
	// SensorAccuracy is the outlet sensor's stated accuracy, K, ≥ 0; 0 for
	// none. Readings are judged as recorded; beside them each forward
	// sample's parcel is judged once more with its reading lowered by this
	// much (the legal table and the kinetics read there; the residence is
	// the recorded one), for Summary's and Event's figures "at sensor low".
	SensorAccuracy float64
}

// ErrNoCriteria is returned for a model with neither legal rows nor an
// organism with a required log reduction: no event could then be judged.
var ErrNoCriteria = errors.New("neither a legal time–temperature row nor a required log reduction is given: deviations cannot be judged")

// check panics on a model no plant file can produce.
func (m *Model) check() error {
	if !(m.Tube.InnerDiameter > 0) || !(m.Tube.Length > 0) || !(m.Density > 0) || !(m.MaxFlow > 0) ||
		math.IsNaN(m.Setpoint) || math.IsInf(m.Setpoint, 0) || m.FastestToMean < 0 || (m.Rheology == nil && m.RheologyAt == nil) ||
		!(m.SensorAccuracy >= 0) || math.IsInf(m.SensorAccuracy, 0) {
		panic(fmt.Sprintf("%sNewEngine: invalid model: tube %+v, density %g, max flow %g, setpoint %g, fastest-to-mean %g, rheology %v, sensor accuracy %g",
			panicPrefix, m.Tube, m.Density, m.MaxFlow, m.Setpoint, m.FastestToMean, m.Rheology != nil || m.RheologyAt != nil, m.SensorAccuracy))
	}
	required := false
	for _, o := range m.Organisms {
		if !(o.D > 0) || !(o.Z > 0) {
			panic(fmt.Sprintf("%sNewEngine: organism %q needs D > 0 and z > 0", panicPrefix, o.Name))
		}
		required = required || o.RequiredLogReduction > 0
	}
	if len(m.Legal) == 0 && !required {
		return ErrNoCriteria
	}
	return nil
}

// Sample is one recorded sample, in SI.
type Sample struct {
	// Time is in s from Options.Origin. The engine works in time from the
	// first sample, so any origin gives the same residences; but a float64
	// far from its origin has coarse steps (Unix seconds in 2026: 0.24 µs,
	// more than the tolerance of a legal row's time), so give times from a
	// nearby origin when they carry fractions of a second.
	Time        float64
	Temperature float64 // °C at the holding-tube outlet (the diversion sensor)
	Flow        float64 // m³/s; zero or negative is read as no flow
	Forward     bool    // the flow-diversion device in forward flow
}

// Options tune the analysis; the zero value is the documented default.
type Options struct {
	// GapThreshold is the longest interval between samples that is not a
	// recording gap, s; 0 takes GapFactor × the median interval.
	GapThreshold float64
	// Trace is the number of buckets of Result.Trace, even; 0 keeps none.
	// Between Trace/2 and Trace of them cover the run.
	Trace int
	// Origin is added to every time the result gives (Summary, Events,
	// Drops, Trace), s: the Unix second a reader's clock times count from,
	// say, so that results are in Unix seconds. 0 gives them as the
	// samples' own times.
	Origin float64
}

// GapFactor times the median interval is the default gap threshold.
const GapFactor = 5

// MedianWindow is how many intervals the median is taken over: the first
// positive ones of the run (a sort of at most this many values). Samples are
// held back until the median is known (at most 4 × MedianWindow of them,
// repeated times included, so memory stays bounded), then judged in order; a
// gap threshold given in Options needs no wait. The median of the whole run
// would need the whole run first; recorders sample at a fixed rate, so the
// first hour of one-second samples fixes it.
const MedianWindow = 4096

// EventKind says what made an event.
type EventKind string

const (
	KindTemperature     EventKind = "temperature"      // forward flow below the setpoint
	KindFlow            EventKind = "flow"             // forward flow above the sealed maximum
	KindTemperatureFlow EventKind = "temperature+flow" // both, in the same event
	// KindLethality is forward flow within both limits whose parcel still
	// failed a legal row or a required log reduction: product that was in
	// the tube during a surge and leaves after it, a flow under the seal
	// but below Re 4000 (where the laminar ratio shortens the time), or a
	// tube too short for the legal row at any flow. Consecutive such
	// samples form their own event, always "product at risk", so that the
	// other kinds keep exactly the bounds of their deviating samples.
	KindLethality EventKind = "lethality"
	KindGap       EventKind = "gap" // no record during forward flow
)

// Verdict is an event's judgement.
type Verdict string

const (
	LimitsMet     Verdict = "limits met"      // every parcel met a legal row and each required log reduction
	ProductAtRisk Verdict = "product at risk" // some parcel did not
	NoRecord      Verdict = "no record"       // a recording gap: no proof either way
)

// Event is a run of consecutive deviating samples, a recording gap, or a
// run of consecutive forward samples within both limits whose parcels
// failed a legal row or a required log reduction (KindLethality). A forward
// sample deviates when its temperature is below the setpoint or its flow
// above the maximum; a change from one of these three classes to another
// starts a new event, so a deviation event spans exactly its deviating
// samples and the under-held product leaving after a surge is its own
// lethality event (conservative: it is not missed).
type Event struct {
	Kind        EventKind
	First, Last int     // indices of its first and last samples in the run
	Start, End  float64 // s: the first sample's time; the end of the last one's held interval
	Duration    float64 // s: the sum of its samples' held intervals
	Volume      float64 // m³: Σ flow × held interval

	MinTemperature float64 // °C
	MaxFlow        float64 // m³/s
	// MinLogReduction is, per organism (Model order), the least log
	// reduction of the parcels that left at its samples.
	MinLogReduction []float64
	MinResidence    float64 // s, the least per-parcel fastest-particle residence
	// MinSampleResidence is the per-sample estimate beside it: L/(r·v) at
	// each sample's own flow, as if it had run that way through the whole
	// tube. A surge shorter than the residence makes it the smaller one.
	MinSampleResidence float64
	LegalRowMet        bool // every parcel met a legal row; false for a gap (no proof)
	Verdict            Verdict
	AtRiskVolume       float64 // m³: the samples whose parcels failed; all of a gap
	// With Model.SensorAccuracy > 0, the parcels judged with the reading
	// lowered by it: how many of the event's samples' parcels then fail a
	// legal row or a required log reduction, and the least log reduction
	// per organism. Zero and nil without a sensor accuracy.
	SamplesShortAtSensorLow    int
	MinLogReductionAtSensorLow []float64
	// Drop is the index in Result.Drops of the temperature drop the event
	// belongs to; −1 for a flow event or a gap.
	Drop int
	// DivertAfter is the drop's response time (see Drop); nil when the
	// event has no drop or the temperature recovered in forward flow.
	DivertAfter *float64
}

// Drop is a stretch of consecutive samples below the setpoint, forward or
// not: how the flow-diversion device answered it.
type Drop struct {
	First     int     // index of the first sample below the setpoint
	Start     float64 // s, its time
	End       float64 // s: the first sample back at or above the setpoint, or the last sample's time
	Recovered bool    // the temperature came back before the run ended
	// DivertAfter is the time from the first sample below the setpoint to
	// the first diverted sample before the temperature recovered, s; 0 when
	// it began diverted; nil when it recovered (or the run ended) still
	// forward. Its resolution is the sampling interval.
	DivertAfter    *float64
	ForwardBelow   bool    // some sample below the setpoint was in forward flow
	MinTemperature float64 // °C
}

// Summary covers the whole run.
type Summary struct {
	Rows           int
	Start, End     float64 // s: first and last sample times
	Forward        float64 // s in forward flow (gaps included: the product went forward)
	Diverted       float64 // s
	ForwardVolume  float64 // m³
	DivertedVolume float64 // m³
	ForwardSamples int
	// The minima and maximum below are over forward samples only; NaN
	// when there is none.
	MinForwardTemperature  float64   // °C
	MaxForwardFlow         float64   // m³/s
	MinForwardLogReduction []float64 // per organism, Model order
	MinForwardResidence    float64   // s
	// SamplesShort counts the forward samples whose parcels failed a legal
	// row or a required log reduction (a gap's included, judged on its
	// parcel figures).
	SamplesShort int
	// With Model.SensorAccuracy > 0, the same with every reading lowered by
	// it (Event's fields of the name); MinForwardLogReductionAtSensorLow is
	// NaN without forward samples, nil without a sensor accuracy.
	SamplesShortAtSensorLow           int
	MinForwardLogReductionAtSensorLow []float64
	Gaps                              int // gap events
	// MedianForwardTemperature and MedianForwardFlow are the medians over
	// the first MedianWindow forward samples (°C, m³/s; NaN with none): what
	// the run mostly recorded, to tell a column read in the wrong unit. A
	// merged summary has them only when it merges one run (NaN otherwise).
	MedianForwardTemperature float64
	MedianForwardFlow        float64
	// MedianInterval is the median of the first MedianWindow positive
	// intervals (NaN with none): the resolution of every time here.
	MedianInterval float64
	GapThreshold   float64 // s, as used (+Inf when no interval was positive)
}

// Result is the analysis of one run.
type Result struct {
	Summary Summary
	Events  []Event
	Drops   []Drop
	// Trace is the run summarised for drawing (Options.Trace buckets at
	// most, those holding samples, in time order); nil unless asked for.
	Trace []TraceBucket
}

// SampleError is a sample the engine cannot take: a value that is not a
// finite number, or time going backwards.
type SampleError struct {
	Index    int // in the run
	Field    string
	Value    float64
	Previous float64 // for time going backwards: the previous sample's time
}

func (e *SampleError) Error() string {
	if e.Field == "time" && !math.IsNaN(e.Previous) {
		return fmt.Sprintf("sample %d: time %g s is before the previous sample's %g s", e.Index, e.Value, e.Previous)
	}
	return fmt.Sprintf("sample %d: %s is %g, not a finite number", e.Index, e.Field, e.Value)
}

// UnixSeconds is a clock time as seconds since 1970-01-01 UTC, the form of
// a result's times with a reader's Origin. float64 keeps such times to about
// 0.2 µs: fine for showing a time, too coarse to compute a residence with
// (see Sample.Time).
func UnixSeconds(t time.Time) float64 {
	return float64(t.Unix()) + float64(t.Nanosecond())*1e-9
}

// ClockTime is the inverse of UnixSeconds, rounded to the microsecond (the
// precision float64 seconds carry today).
func ClockTime(s float64) time.Time {
	sec := math.Floor(s)
	return time.Unix(int64(sec), 0).Add(time.Duration(math.Round((s-sec)*1e6)) * time.Microsecond).UTC()
}
