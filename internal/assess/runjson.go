package assess

import (
	"math"
	"time"

	"pasval/internal/version"
	"pasval/lethality"
	"pasval/runs"
)

// The JSON of a run review: always SI, every key naming its unit
// (docs/METHOD.md §13 (recorded runs)). Times are RFC 3339 strings in the
// review's zone for clock times, else numbers of seconds as the files wrote
// them. A value with no JSON number (no forward sample, product that never
// moved since the run began, a gap limit that differs between files) is null.

// ReviewJSON is the whole review.
type ReviewJSON struct {
	Tool        string      `json:"tool"`
	Version     string      `json:"version"`
	Plant       string      `json:"plant"`
	PlantSHA256 string      `json:"plant_sha256"`
	Summary     SummaryJSON `json:"summary"`
	Events      []EventJSON `json:"events"`
	Drops       []DropJSON  `json:"drops"`
	// Heating is the heating section over the runs that have its columns
	// (docs/METHOD.md §17); absent when none has.
	Heating *HeatingJSON  `json:"heating,omitempty"`
	Files   []RunFileJSON `json:"files"`
	// Warnings are the review's warnings (the caller words them, in SI).
	Warnings []Warning `json:"warnings"`
	// SamplingNote states the sampling interval's limit on every time of
	// the review, in words (internal/present fills it, in SI).
	SamplingNote string `json:"sampling_note"`
	Caution      string `json:"caution"`
}

// SummaryJSON covers every file of the review.
type SummaryJSON struct {
	Rows                             int                 `json:"rows"`
	Start                            any                 `json:"start"`
	End                              any                 `json:"end"`
	ForwardS                         float64             `json:"forward_s"`
	DivertedS                        float64             `json:"diverted_s"`
	ForwardVolumeL                   float64             `json:"forward_volume_L"`
	DivertedVolumeL                  float64             `json:"diverted_volume_L"`
	MinForwardTemperatureC           *float64            `json:"min_forward_temperature_C"`
	MaxForwardFlowLh                 *float64            `json:"max_forward_flow_L_h"`
	MinForwardLogReduction           *float64            `json:"min_forward_log_reduction"`
	MinForwardLogReductionByOrganism map[string]*float64 `json:"min_forward_log_reduction_by_organism"`
	MinForwardResidenceS             *float64            `json:"min_forward_residence_s"`
	// SamplesShort counts the forward samples whose parcels failed a legal
	// row or a required log reduction, as recorded.
	SamplesShort int `json:"samples_short"`
	// With process.sensor_accuracy, the same judged with every reading
	// lowered by it (SensorLowK); null without (docs/METHOD.md §13.4).
	SensorLowK                                  *float64            `json:"sensor_low_K"`
	SamplesShortAtSensorLow                     *int                `json:"samples_short_at_sensor_low"`
	MinForwardLogReductionAtSensorLow           *float64            `json:"min_forward_log_reduction_at_sensor_low"`
	MinForwardLogReductionAtSensorLowByOrganism map[string]*float64 `json:"min_forward_log_reduction_at_sensor_low_by_organism"`
	Gaps                                        int                 `json:"gaps"`
	BadRows                                     int                 `json:"bad_rows"`
	Events                                      int                 `json:"events"`
	MedianIntervalS                             *float64            `json:"median_interval_s"`
	GapThresholdS                               *float64            `json:"gap_threshold_s"`
}

// EventJSON is one event; File is its file's path as given.
type EventJSON struct {
	File                      string              `json:"file"`
	Kind                      runs.EventKind      `json:"kind"`
	Start                     any                 `json:"start"`
	End                       any                 `json:"end"`
	DurationS                 float64             `json:"duration_s"`
	MinTemperatureC           float64             `json:"min_temperature_C"`
	MaxFlowLh                 float64             `json:"max_flow_L_h"`
	VolumeL                   float64             `json:"volume_L"`
	MinLogReduction           *float64            `json:"min_log_reduction"`
	MinLogReductionByOrganism map[string]*float64 `json:"min_log_reduction_by_organism"`
	MinResidenceS             *float64            `json:"min_residence_s"`
	MinSampleResidenceS       *float64            `json:"min_sample_residence_s"`
	LegalRowMet               *bool               `json:"legal_row_met"`
	Verdict                   runs.Verdict        `json:"verdict"`
	AtRiskVolumeL             float64             `json:"at_risk_volume_L"`
	DivertAfterS              *float64            `json:"divert_after_s"`
	// With process.sensor_accuracy: the event's parcels judged with the
	// reading lowered by it; null without.
	SamplesShortAtSensorLow              *int                `json:"samples_short_at_sensor_low"`
	MinLogReductionAtSensorLow           *float64            `json:"min_log_reduction_at_sensor_low"`
	MinLogReductionAtSensorLowByOrganism map[string]*float64 `json:"min_log_reduction_at_sensor_low_by_organism"`
}

// DropJSON is one drop of the outlet temperature below the setpoint, forward
// or diverted: how the flow-diversion device answered it.
type DropJSON struct {
	File            string   `json:"file"`
	Start           any      `json:"start"`
	End             any      `json:"end"`
	Recovered       bool     `json:"recovered"`
	MinTemperatureC float64  `json:"min_temperature_C"`
	ForwardBelow    bool     `json:"forward_below_setpoint"`
	DivertAfterS    *float64 `json:"divert_after_s"`
}

// RunFileJSON is one file of the review.
type RunFileJSON struct {
	Path    string   `json:"path"`
	SHA256  string   `json:"sha256"`
	Rows    int      `json:"rows"`
	BadRows int      `json:"bad_rows"`
	Listed  []string `json:"bad_rows_listed"`
}

// m3sToLh is one m³/s in L/h.
const m3sToLh = 3.6e6

// JSON is the review in its JSON form (SamplingNote left to the caller).
func (r *RunReview) JSON() ReviewJSON {
	s := r.Summary
	orgs := r.Model.Model.Organisms
	out := ReviewJSON{Tool: "pasval", Version: version.Version, Plant: r.Plant.File, PlantSHA256: r.Plant.SHA256,
		Events: []EventJSON{}, Drops: []DropJSON{}, Files: []RunFileJSON{}, Warnings: append([]Warning{}, r.Warnings...), Caution: r.Caution}
	out.Summary = SummaryJSON{Rows: s.Rows, Start: r.timeJSON(s.Start), End: r.timeJSON(s.End), ForwardS: s.Forward, DivertedS: s.Diverted,
		ForwardVolumeL: r.Model.Recorded(s.ForwardVolume) * 1e3, DivertedVolumeL: r.Model.Recorded(s.DivertedVolume) * 1e3,
		MinForwardTemperatureC: number(s.MinForwardTemperature), MaxForwardFlowLh: number(r.Model.Recorded(s.MaxForwardFlow) * m3sToLh),
		MinForwardLogReductionByOrganism: byOrganism(orgs, s.MinForwardLogReduction), MinForwardResidenceS: number(s.MinForwardResidence),
		Gaps: s.Gaps, BadRows: r.BadRows(), Events: r.Events(), MedianIntervalS: number(s.MedianInterval), GapThresholdS: number(s.GapThreshold)}
	if len(s.MinForwardLogReduction) > 0 {
		out.Summary.MinForwardLogReduction = number(s.MinForwardLogReduction[0])
	}
	out.Summary.SamplesShort = s.SamplesShort
	if a := r.Model.Model.SensorAccuracy; a > 0 {
		n := s.SamplesShortAtSensorLow
		out.Summary.SensorLowK, out.Summary.SamplesShortAtSensorLow = &a, &n
		out.Summary.MinForwardLogReductionAtSensorLowByOrganism = byOrganism(orgs, s.MinForwardLogReductionAtSensorLow)
		if len(s.MinForwardLogReductionAtSensorLow) > 0 {
			out.Summary.MinForwardLogReductionAtSensorLow = number(s.MinForwardLogReductionAtSensorLow[0])
		}
	}
	if s.Rows == 0 {
		out.Summary.Start, out.Summary.End = nil, nil
	}
	if r.Heating != nil {
		out.Heating = r.heatingJSON()
	}
	for _, f := range r.Files {
		fj := RunFileJSON{Path: f.Path, SHA256: f.SHA256, Rows: f.Rows, BadRows: f.BadRows, Listed: []string{}}
		for _, e := range f.Listed {
			fj.Listed = append(fj.Listed, e.Error())
		}
		out.Files = append(out.Files, fj)
		for _, e := range f.Result.Events {
			out.Events = append(out.Events, r.eventJSON(f.Path, e))
		}
		for _, d := range f.Result.Drops {
			out.Drops = append(out.Drops, DropJSON{File: f.Path, Start: r.timeJSON(d.Start), End: r.timeJSON(d.End), Recovered: d.Recovered,
				MinTemperatureC: d.MinTemperature, ForwardBelow: d.ForwardBelow, DivertAfterS: copyPtr(d.DivertAfter)})
		}
	}
	return out
}

func (r *RunReview) eventJSON(path string, e runs.Event) EventJSON {
	orgs := r.Model.Model.Organisms
	ej := EventJSON{File: path, Kind: e.Kind, Start: r.timeJSON(e.Start), End: r.timeJSON(e.End), DurationS: e.Duration,
		MinTemperatureC: e.MinTemperature, MaxFlowLh: r.Model.Recorded(e.MaxFlow) * m3sToLh, VolumeL: r.Model.Recorded(e.Volume) * 1e3,
		MinLogReductionByOrganism: byOrganism(orgs, e.MinLogReduction), MinResidenceS: number(e.MinResidence),
		MinSampleResidenceS: number(e.MinSampleResidence), Verdict: e.Verdict, AtRiskVolumeL: r.Model.Recorded(e.AtRiskVolume) * 1e3,
		DivertAfterS: copyPtr(e.DivertAfter)}
	if len(e.MinLogReduction) > 0 {
		ej.MinLogReduction = number(e.MinLogReduction[0])
	}
	if len(r.Model.Model.Legal) > 0 {
		met := e.LegalRowMet
		ej.LegalRowMet = &met
	}
	if r.Model.Model.SensorAccuracy > 0 {
		n := e.SamplesShortAtSensorLow
		ej.SamplesShortAtSensorLow = &n
		ej.MinLogReductionAtSensorLowByOrganism = byOrganism(orgs, e.MinLogReductionAtSensorLow)
		if len(e.MinLogReductionAtSensorLow) > 0 {
			ej.MinLogReductionAtSensorLow = number(e.MinLogReductionAtSensorLow[0])
		}
	}
	return ej
}

// timeJSON is a sample time as JSON: RFC 3339 in the review's zone for clock
// times, else the number of seconds.
func (r *RunReview) timeJSON(s float64) any {
	if t, ok := r.Time(s); ok {
		return t.Format(time.RFC3339Nano)
	}
	return number(s)
}

// number is v for JSON, nil for NaN and ±Inf (no JSON number).
func number(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func copyPtr(p *float64) *float64 {
	if p == nil {
		return nil
	}
	v := *p
	return &v
}

func byOrganism(orgs []lethality.Organism, v []float64) map[string]*float64 {
	m := make(map[string]*float64, len(orgs))
	for i, o := range orgs {
		if i < len(v) {
			m[o.Name] = number(v[i])
		}
	}
	return m
}
