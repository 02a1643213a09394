package assess

import (
	"errors"
	"math"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/internal/runlog"
	"pasval/lethality"
	"pasval/runs"
)

// RunModel is the plant as a recorded run is judged against it
// (docs/METHOD.md §13 (recorded runs)): the engine's model, built from the
// same holding-tube inputs and tube model as the design check, and the
// densities that relate a recorded flow to the tube's.
type RunModel struct {
	Model runs.Model
	// ProductDensity turns a recorded volumetric flow into mass and back,
	// kg/m³: product.density, or Choi–Okos at the raw inlet (as flow.max_rate).
	ProductDensity float64
	// HoldDensity is the density in the tube, kg/m³ (at the setpoint).
	HoldDensity float64
	// NormalFlow is flow.rate in the tube's terms, m³/s (the engine's flows).
	NormalFlow float64
}

// NewRunModel builds the run model of a validated plant file. A plant
// without a holding tube, or with neither a legal row nor a required log
// reduction, cannot judge a run: a positioned error (exit 2).
func NewRunModel(p *plantfile.Plant) (RunModel, error) {
	if p.HoldingTube == nil {
		return RunModel{}, inputerr.List{inputerr.At(inputerr.Pos{File: p.File, Line: 1, Column: 1}, "holding_tube",
			"the plant file describes no holding tube, so a recorded run cannot be judged; add holding_tube (see 'pasval init' and the README)")}
	}
	pp := productProps(p)
	in := GatherHolding(p, pp)
	ev, err := EvaluateHolding(in)
	if err != nil {
		return RunModel{}, holdingInputError(p, err)
	}
	m := runs.Model{Tube: ev.Tube, Rheology: ev.Rheology, Density: in.Density, FastestToMean: in.FastestToMean,
		Organisms: in.Organisms, Legal: in.Legal, Setpoint: in.Setpoint, MaxFlow: in.MaxMassFlow / in.Density,
		SensorAccuracy: in.SensorAccuracy}
	if in.FlowIndex == 0 && len(in.Viscosity) > 1 {
		// Each interval's Reynolds number at its own recorded temperature,
		// on the product's viscosity curve (docs/METHOD.md §4 (viscosity)).
		curve, err := props.NewViscosityCurve(in.Viscosity)
		if err != nil { // EvaluateHolding has built the same curve
			return RunModel{}, holdingInputError(p, err)
		}
		m.RheologyAt = func(t float64) lethality.Rheology {
			mu, _ := curve.At(t)
			return lethality.Newtonian{Viscosity: mu}
		}
	}
	// Judge nothing the engine cannot: check the criteria here, where the
	// plant file can be named.
	if _, err := runs.NewEngine(m, runs.Options{}); errors.Is(err, runs.ErrNoCriteria) {
		pos := p.HoldingTube.Pos
		if pos.Line == 0 {
			pos = inputerr.Pos{File: p.File, Line: 1, Column: 1}
		}
		return RunModel{}, inputerr.List{inputerr.At(pos, "legal_minimums",
			"%v; add legal_minimums or an organism's required_log_reduction", err)}
	} else if err != nil {
		return RunModel{}, err
	}
	return RunModel{Model: m, ProductDensity: pp.Density, HoldDensity: in.Density, NormalFlow: in.MassFlow / in.Density}, nil
}

// TubeFlow is the tube's volumetric flow, m³/s, for a recorded flow q: a
// volumetric one (m³/s) to mass with the product density and back over the
// density in the tube; a mass flow (kg/s) over the density in the tube.
func (rm RunModel) TubeFlow(q float64, mass bool) float64 {
	switch {
	case mass:
		return q / rm.HoldDensity
	case rm.ProductDensity == rm.HoldDensity:
		return q
	}
	return q * rm.ProductDensity / rm.HoldDensity
}

// ProductMassFlow is the product's mass flow, kg/s, for a recorded flow q:
// a volumetric one (m³/s) with the product density, a mass flow as it is.
func (rm RunModel) ProductMassFlow(q float64, mass bool) float64 {
	if mass {
		return q
	}
	return q * rm.ProductDensity
}

// Recorded turns a tube flow or volume (m³/s, m³) into the recorded flow's
// own volumetric terms (a mass over the product density), the terms every
// flow and volume of a review is shown in.
func (rm RunModel) Recorded(v float64) float64 {
	if rm.ProductDensity == rm.HoldDensity {
		return v
	}
	return v * rm.HoldDensity / rm.ProductDensity
}

// RunFile is one recorded-run file of a review, analysed on its own.
type RunFile struct {
	Path    string
	SHA256  string // hex, of the file's bytes as stored
	Rows    int    // samples read
	BadRows int    // malformed rows skipped
	// Listed is the first skipped rows' errors (runlog.MaxListed at most).
	Listed inputerr.List
	// Clock says whether times are clock times (Unix seconds) rather than
	// seconds from an origin of the file's own.
	Clock  bool
	Result runs.Result
	// Heating is the run's windows of the heating section's columns
	// (docs/METHOD.md §17); nil when the file has none.
	Heating *HeatingWindows
}

// RunReview is one review of recorded runs against a plant: every file, and
// the summary over all of them (runs.MergeSummaries).
type RunReview struct {
	Plant    *plantfile.Plant
	Model    RunModel
	Files    []RunFile
	Summary  runs.Summary
	Location *time.Location // for clock times in output; UTC unless given
	Clock    bool           // every file has clock times
	// Heating is the heating section over the runs that have its columns
	// (docs/METHOD.md §17); nil when none has.
	Heating *HeatingReview
	// Warnings are the files' implausible columns (unitWarnings).
	Warnings []Warning
	Caution  string
}

// ErrMixedTimes is a review whose files do not all write time the same way.
var ErrMixedTimes = errors.New("the files mix clock times and seconds from a start: review them separately")

// NewRunReview merges the files' summaries into one review, and analyses
// the heating section of the runs that have its columns; loc is the zone
// clock times are shown in (nil: UTC). Errors: ErrMixedTimes, and the
// heating section's (HeatingSection: an inputerr.List).
func NewRunReview(p *plantfile.Plant, rm RunModel, files []RunFile, loc *time.Location) (*RunReview, error) {
	if loc == nil {
		loc = time.UTC
	}
	r := &RunReview{Plant: p, Model: rm, Files: files, Location: loc, Caution: Caution, Clock: len(files) > 0}
	sums := make([]runs.Summary, len(files))
	for i, f := range files {
		sums[i] = f.Result.Summary
		if f.Clock != files[0].Clock {
			return nil, ErrMixedTimes
		}
		r.Clock = r.Clock && f.Clock
	}
	r.Summary = runs.MergeSummaries(sums)
	for _, f := range files {
		r.Warnings = append(r.Warnings, rm.unitWarnings(f)...)
	}
	h, err := newHeatingReview(p, files, r.Clock)
	if err != nil {
		return nil, err
	}
	r.Heating = h
	return r, nil
}

// The plausibility of a recorded run's units (docs/METHOD.md §13.1): the
// median forward temperature within RunTemperatureSpread of the setpoint,
// the median forward flow within RunFlowRatioLow to RunFlowRatioHigh times
// the normal rate. A column in °F read as °C lies 40 K or more off at
// pasteurizing temperatures, gpm read as L/h is 227 times too little: far
// outside both, while a line's normal running (a setpoint a few kelvin
// below the product's temperature, a rate turned down or up) stays inside.
const (
	RunTemperatureSpread = 15.0 // K
	RunFlowRatioLow      = 0.2
	RunFlowRatioHigh     = 5.0
)

// unitWarnings are a file's warnings on columns whose forward values lie
// far from what the plant file says (RunTemperatureSpread, RunFlowRatio…).
func (rm RunModel) unitWarnings(f RunFile) []Warning {
	var out []Warning
	s, m := f.Result.Summary, rm.Model
	if t := s.MedianForwardTemperature; !math.IsNaN(t) && math.Abs(t-m.Setpoint) > RunTemperatureSpread {
		out = append(out, Warning{Code: WarnRunTemperatureUnit, File: f.Path, Field: runlog.KeyTemperature,
			Values: map[string]float64{"median_C": t, "setpoint_C": m.Setpoint, "limit_K": RunTemperatureSpread}})
	}
	if q := s.MedianForwardFlow; !math.IsNaN(q) && rm.NormalFlow > 0 &&
		(q < RunFlowRatioLow*rm.NormalFlow || q > RunFlowRatioHigh*rm.NormalFlow) {
		out = append(out, Warning{Code: WarnRunFlowUnit, File: f.Path, Field: runlog.KeyFlow,
			Values: map[string]float64{"median_m3_s": rm.Recorded(q), "normal_m3_s": rm.Recorded(rm.NormalFlow),
				"low_ratio": RunFlowRatioLow, "high_ratio": RunFlowRatioHigh}})
	}
	return out
}

// Events counts the events of every file.
func (r *RunReview) Events() int {
	n := 0
	for _, f := range r.Files {
		n += len(f.Result.Events)
	}
	return n
}

// BadRows counts the skipped rows of every file.
func (r *RunReview) BadRows() int {
	n := 0
	for _, f := range r.Files {
		n += f.BadRows
	}
	return n
}

// Time is a sample time of the review as a clock time in the review's zone;
// ok is false for seconds from a start.
func (r *RunReview) Time(s float64) (t time.Time, ok bool) {
	if !r.Clock || math.IsNaN(s) || math.IsInf(s, 0) {
		return time.Time{}, false
	}
	return runs.ClockTime(s).In(r.Location), true
}
