package fouling

import (
	"fmt"
	"math"
)

// Sample is one recorded sample of a run, in SI.
type Sample struct {
	Time            float64 // s: since 1970-01-01 UTC for clock times, else as the file wrote it
	ProductMassFlow float64 // kg/s, the recorded product flow as mass
	Forward         bool    // false: the flow-diversion device was diverting
	// The heating section's four temperatures, °C; NaN where the sample has
	// none (an empty cell). A sample counts for the window's temperatures
	// only when it has all four.
	ProductIn, ProductOut, MediumIn, MediumOut float64
	// MediumFlow is the recorded medium flow, m³/s or kg/s as the run's
	// column holds it (Windower's mass); NaN when not recorded.
	MediumFlow float64
}

// Window is the summary of the samples whose time falls in [Start, End):
// counts, the product flow's range and mean, and the means of the heating
// temperatures and the medium flow.
type Window struct {
	Start, End float64 // s
	Samples    int     // samples in the window
	Heating    int     // of them, samples with all four heating temperatures
	Diverted   int     // of them, diverted samples

	ProductFlowMin, ProductFlowMax, ProductFlowMean float64 // kg/s, over every sample

	// Means over the Heating samples, °C; NaN when Heating is 0.
	ProductIn, ProductOut, MediumIn, MediumOut float64
	// MediumFlow is the mean recorded medium flow over the samples that
	// have one (m³/s or kg/s); NaN when none has.
	MediumFlow float64
}

// Centre is the time the window is stamped with, s: (Start + End)/2.
func (w Window) Centre() float64 { return (w.Start + w.End) / 2 }

// Windower gathers a run's samples, in time order, into non-overlapping
// windows of equal width aligned to the clock:
//
//	window k = [k·W, (k+1)·W),  k = ⌊t/W⌋
//
// so that with clock times (seconds since 1970-01-01 UTC) a 60 s window is a
// whole minute of UTC. Only windows that hold a sample exist. Memory is one
// summary per window (about 100 bytes).
//
// References: docs/METHOD.md §17.1 (U from a recorded run).
type Windower struct {
	width float64
	mass  bool
	cur   accumulator
	open  bool
	k     float64 // index of the open window
	out   []Window
}

// accumulator is the sums of the open window.
type accumulator struct {
	n, heating, diverted, media int
	flowMin, flowMax, flowSum   float64
	pin, pout, min, mout        float64
	medium                      float64
}

// NewWindower returns a Windower of windows width seconds wide; mediumMass
// says whether the samples' MediumFlow is a mass flow. A width that is not a
// positive finite number is a caller bug and panics.
func NewWindower(width float64, mediumMass bool) *Windower {
	if !(width > 0) || math.IsInf(width, 0) {
		panic(fmt.Sprintf("%sNewWindower: width %g s", panicPrefix, width))
	}
	return &Windower{width: width, mass: mediumMass}
}

// MediumMass says whether the windows' MediumFlow is a mass flow (kg/s)
// rather than a volumetric one (m³/s).
func (w *Windower) MediumMass() bool { return w.mass }

// Width is the windows' width, s.
func (w *Windower) Width() float64 { return w.width }

// Add adds a sample. Samples come in time order (time may stand still);
// a sample earlier than the open window is a caller bug and panics.
func (w *Windower) Add(s Sample) {
	k := math.Floor(s.Time / w.width)
	switch {
	case !w.open:
		w.open, w.k = true, k
	case k < w.k:
		panic(fmt.Sprintf("%sWindower.Add: time %g s before the open window [%g, %g) s", panicPrefix, s.Time, w.k*w.width, (w.k+1)*w.width))
	case k > w.k:
		w.close()
		w.open, w.k = true, k
	}
	a := &w.cur
	if a.n == 0 {
		a.flowMin, a.flowMax = s.ProductMassFlow, s.ProductMassFlow
	}
	a.n++
	a.flowMin, a.flowMax = math.Min(a.flowMin, s.ProductMassFlow), math.Max(a.flowMax, s.ProductMassFlow)
	a.flowSum += s.ProductMassFlow
	if !s.Forward {
		a.diverted++
	}
	if !math.IsNaN(s.ProductIn) && !math.IsNaN(s.ProductOut) && !math.IsNaN(s.MediumIn) && !math.IsNaN(s.MediumOut) {
		a.heating++
		a.pin += s.ProductIn
		a.pout += s.ProductOut
		a.min += s.MediumIn
		a.mout += s.MediumOut
	}
	if !math.IsNaN(s.MediumFlow) {
		a.media++
		a.medium += s.MediumFlow
	}
}

// close ends the open window.
func (w *Windower) close() {
	a := w.cur
	win := Window{Start: w.k * w.width, End: (w.k + 1) * w.width, Samples: a.n, Heating: a.heating, Diverted: a.diverted,
		ProductFlowMin: a.flowMin, ProductFlowMax: a.flowMax, ProductFlowMean: a.flowSum / float64(a.n),
		ProductIn: math.NaN(), ProductOut: math.NaN(), MediumIn: math.NaN(), MediumOut: math.NaN(), MediumFlow: math.NaN()}
	if h := float64(a.heating); h > 0 {
		win.ProductIn, win.ProductOut, win.MediumIn, win.MediumOut = a.pin/h, a.pout/h, a.min/h, a.mout/h
	}
	if a.media > 0 {
		win.MediumFlow = a.medium / float64(a.media)
	}
	w.out = append(w.out, win)
	w.cur = accumulator{}
	w.open = false
}

// Windows closes the open window and returns every window, in time order.
func (w *Windower) Windows() []Window {
	if w.open {
		w.close()
	}
	return w.out
}
