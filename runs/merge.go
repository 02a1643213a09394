package runs

import "math"

// MergeSummaries is the summary of several runs reviewed together (several
// files, each analysed on its own): counts, times and volumes add; minima
// and maxima are taken over the runs that have forward samples; Start and
// End span them all. The median interval is the largest of the runs' (the
// coarsest resolution applies to the whole review); the gap threshold is
// each run's own, so the merged one is NaN unless all runs agree; the
// medians of forward samples are NaN unless there is one run.
func MergeSummaries(runs []Summary) Summary {
	if len(runs) == 0 {
		return Summary{MinForwardTemperature: math.NaN(), MaxForwardFlow: math.NaN(), MinForwardResidence: math.NaN(),
			MedianInterval: math.NaN(), GapThreshold: math.NaN(), MedianForwardTemperature: math.NaN(), MedianForwardFlow: math.NaN()}
	}
	m := Summary{Start: math.Inf(1), End: math.Inf(-1), MinForwardTemperature: math.NaN(), MaxForwardFlow: math.NaN(),
		MinForwardResidence: math.NaN(), MedianInterval: math.NaN(), GapThreshold: runs[0].GapThreshold,
		MedianForwardTemperature: math.NaN(), MedianForwardFlow: math.NaN(),
		MinForwardLogReduction: make([]float64, len(runs[0].MinForwardLogReduction))}
	for k := range m.MinForwardLogReduction {
		m.MinForwardLogReduction[k] = math.NaN()
	}
	if runs[0].MinForwardLogReductionAtSensorLow != nil {
		m.MinForwardLogReductionAtSensorLow = make([]float64, len(runs[0].MinForwardLogReductionAtSensorLow))
		for k := range m.MinForwardLogReductionAtSensorLow {
			m.MinForwardLogReductionAtSensorLow[k] = math.NaN()
		}
	}
	if len(runs) == 1 { // medians do not merge
		m.MedianForwardTemperature, m.MedianForwardFlow = runs[0].MedianForwardTemperature, runs[0].MedianForwardFlow
	}
	for _, r := range runs {
		if len(r.MinForwardLogReduction) != len(m.MinForwardLogReduction) ||
			len(r.MinForwardLogReductionAtSensorLow) != len(m.MinForwardLogReductionAtSensorLow) {
			panic(panicPrefix + "MergeSummaries: runs judged with different organisms or sensor accuracies")
		}
		m.Rows += r.Rows
		m.Start, m.End = math.Min(m.Start, r.Start), math.Max(m.End, r.End)
		m.Forward += r.Forward
		m.Diverted += r.Diverted
		m.ForwardVolume += r.ForwardVolume
		m.DivertedVolume += r.DivertedVolume
		m.ForwardSamples += r.ForwardSamples
		m.Gaps += r.Gaps
		m.SamplesShort += r.SamplesShort
		m.SamplesShortAtSensorLow += r.SamplesShortAtSensorLow
		for k, v := range r.MinForwardLogReductionAtSensorLow {
			m.MinForwardLogReductionAtSensorLow[k] = minKnown(m.MinForwardLogReductionAtSensorLow[k], v)
		}
		m.MinForwardTemperature = minKnown(m.MinForwardTemperature, r.MinForwardTemperature)
		m.MaxForwardFlow = -minKnown(-m.MaxForwardFlow, -r.MaxForwardFlow)
		m.MinForwardResidence = minKnown(m.MinForwardResidence, r.MinForwardResidence)
		for k, v := range r.MinForwardLogReduction {
			m.MinForwardLogReduction[k] = minKnown(m.MinForwardLogReduction[k], v)
		}
		m.MedianInterval = -minKnown(-m.MedianInterval, -r.MedianInterval)
		if r.GapThreshold != m.GapThreshold {
			m.GapThreshold = math.NaN()
		}
	}
	return m
}

// minKnown is the smaller of a and b, NaN standing for "none".
func minKnown(a, b float64) float64 {
	switch {
	case math.IsNaN(a):
		return b
	case math.IsNaN(b):
		return a
	}
	return math.Min(a, b)
}
