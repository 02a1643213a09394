// Package rungen writes invented recorded runs for the SI demo plant
// (testdata/demo/htst-milk-si.yaml: setpoint 72.5 °C, sealed maximum
// 11 000 L/h, normal rate 10 000 L/h): the demo shift in
// testdata/demo/runs/ and, for benchmarks, files of any length with the same
// shape (RFC 3339 time, two numbers, a flag). Every number is made up.
//
// With a heating section (WriteRun), the run also carries the heating
// section's four temperatures every HeatingEvery seconds, computed from the
// plant model: the section is rated at each recorded second with the
// fouling of the scenario (Fouling) on its clean U, the product leaving it
// at the holding-tube outlet plus the tube's heat loss and entering it from
// the regenerator (docs/METHOD.md §17).
//
// The demo file is regenerated with
//
//	go test ./internal/rungen -run TestDemoFile -update
//
// and the test fails when the committed file and the generator disagree.
package rungen

import (
	"bufio"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"time"

	"pasval/fouling"
)

// ShiftLength is the demo shift's length, s (two hours of one-second samples).
const ShiftLength = 7200

// Start is the demo shift's first sample time.
var Start = time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC)

// Header is the header row of a run without the heating section's columns.
const Header = "time,hold_outlet_temperature [°C],flow_rate [L/h],forward"

// HeatingHeader is what WriteRun adds to Header with a heating section.
const HeatingHeader = ",heating_product_in [°C],heating_product_out [°C],heating_medium_in [°C],heating_medium_out [°C]"

// HeatingEvery is how often the heating section's columns are recorded, s:
// the rows between leave them empty (a historian that logs the heating loop
// more slowly than the holding tube), which keeps the demo file small.
const HeatingEvery = 10

// The demo plant's temperatures that place the heating section in the
// scenario: the raw inlet and the diversion setpoint (process.raw_inlet,
// process.hold_setpoint; a test holds them to the plant file).
const (
	RawInlet = 5.0
	Setpoint = 72.5
)

// Fouling is the demo shift's fouling resistance on the heating section's
// clean U at t seconds from the shift's start, m²·K/W: a deposit growing at
// FoulingRate from FoulingStart (the plates somewhat below the plate
// correlation's clean U from the start).
func Fouling(t float64) float64 { return FoulingStart + FoulingRate*t/3600 }

// The demo shift's fouling: m²·K/W, and m²·K/W per h.
const (
	FoulingStart = 2e-5
	FoulingRate  = 2.2e-5
)

// The scripted happenings of the shift, as seconds from its start.
const (
	StartupEnd       = 240  // diverted start-up: temperature climbing to the setpoint (a drop while diverted, not an event)
	SmallDip         = 1500 // 20 s at 72.30 °C in forward flow: below the setpoint, above the 72 °C legal row
	SmallDipLength   = 20
	Upset            = 3000 // hot-water upset: below the setpoint at +1 s, diverted at +3 s
	ShortSurge       = 4500 // 8 s at 12 500 L/h: shorter than the residence
	ShortSurgeLength = 8
	LongSurge        = 5700 // 45 s at 12 800 L/h: longer than the residence
	LongSurgeLength  = 45
	Gap              = 6600 // the recorder loses 39 samples after this one
	GapLength        = 40   // the interval held by the sample before the hole, s
	Combined         = 6900 // 8 s at 72.42 °C and 11 500 L/h
	CombinedLength   = 8
	Shutdown         = 7080 // diverted from here on, cooling down
)

// Flows of the scenario, L/h.
const (
	NormalFlow     = 10000.0
	ShortSurgeFlow = 12500.0
	LongSurgeFlow  = 12800.0
	CombinedFlow   = 11500.0
)

// Script is the scripted state at second sec (0 ≤ sec < ShiftLength) of a
// shift, before noise: temperature °C, flow L/h, forward flow; skip is true
// inside the recording gap.
func Script(sec int) (temp, flow float64, forward, skip bool) {
	temp, flow, forward = 73.0, NormalFlow, true
	switch {
	case sec < StartupEnd:
		temp = math.Min(73.0, 66.0+7.0*float64(sec)/200)
		forward = false
	case sec >= SmallDip && sec < SmallDip+SmallDipLength:
		temp = 72.30
	case sec >= Upset && sec < Upset+95:
		// 72.8, 72.4, 71.9, … down to 70.8, back to 73 by +80; forward
		// again at +95.
		k := sec - Upset
		switch {
		case k < 4:
			temp = []float64{72.8, 72.4, 71.9, 71.4}[k]
		case k < 60:
			temp = 70.8
		case k < 80:
			temp = 70.8 + 2.2*float64(k-60)/20
		}
		forward = k < 3
	case sec >= ShortSurge && sec < ShortSurge+ShortSurgeLength:
		flow = ShortSurgeFlow
	case sec >= LongSurge && sec < LongSurge+LongSurgeLength:
		flow = LongSurgeFlow
	case sec > Gap && sec < Gap+GapLength:
		skip = true
	case sec >= Combined && sec < Combined+CombinedLength:
		temp, flow = 72.42, CombinedFlow
	case sec >= Shutdown:
		temp = 73.0 - 13.0*float64(sec-Shutdown)/float64(ShiftLength-Shutdown)
		forward = false
	}
	return
}

// Noise is the sensor noise: standard deviations of the recorded
// temperature (°C) and flow (L/h) around the script, before rounding to the
// recorder's 0.01 °C and 0.1 L/h. Small enough that noise alone never
// crosses a limit (five deviations stay 0.15 °C above the setpoint and
// 925 L/h below the maximum).
const (
	TemperatureNoise = 0.03
	FlowNoise        = 15.0
)

// Write writes rows samples, the demo shift repeated with time running on
// (the first ShiftLength−GapLength+1 rows are the demo shift), with the
// header. seed fixes the noise.
func Write(w io.Writer, rows int, seed uint64) error { return WriteRun(w, rows, seed, nil) }

// WriteRun is Write, with the heating section's columns when heat is not
// nil: heat is the demo plant's heating section (assess.HeatingSection),
// rated every HeatingEvery seconds (Heated).
func WriteRun(w io.Writer, rows int, seed uint64, heat *fouling.Section) error {
	bw := bufio.NewWriterSize(w, 64<<10)
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	heatRNG := rand.New(rand.NewPCG(seed, 0x4ea7)) // a stream of its own: the other columns are those of Write
	header := Header
	if heat != nil {
		header += HeatingHeader
	}
	if _, err := bw.WriteString(header + "\n"); err != nil {
		return err
	}
	buf := make([]byte, 0, 128)
	for n, k := 0, 0; n < rows; k++ {
		shift, sec := k/ShiftLength, k%ShiftLength
		temp, flow, fwd, skip := Script(sec)
		tn, fn := rng.NormFloat64(), rng.NormFloat64() // drawn for every second, so the noise does not depend on the gap
		var hn [4]float64
		if heat != nil {
			for i := range hn {
				hn[i] = heatRNG.NormFloat64()
			}
		}
		if skip {
			continue
		}
		t := Start.Add(time.Duration(shift*ShiftLength+sec) * time.Second)
		buf = t.AppendFormat(buf[:0], time.RFC3339)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, math.Round((temp+TemperatureNoise*tn)*100)/100, 'f', 2, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, math.Round((flow+FlowNoise*fn)*10)/10, 'f', 1, 64)
		if fwd {
			buf = append(buf, ",1"...)
		} else {
			buf = append(buf, ",0"...)
		}
		if heat != nil {
			if sec%HeatingEvery != 0 {
				buf = append(buf, ",,,,"...)
			} else {
				h, err := Heated(*heat, temp, float64(sec))
				if err != nil {
					return err
				}
				for i, v := range h {
					buf = append(buf, ',')
					buf = strconv.AppendFloat(buf, math.Round((v+TemperatureNoise*hn[i])*100)/100, 'f', 2, 64)
				}
			}
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
		n++
	}
	return bw.Flush()
}

// Heated is the heating section at a second of the scenario, before noise:
// product in, product out, medium in and medium out, °C. The product leaves
// it at the holding-tube outlet temp plus the tube's heat loss at the normal
// rate (the design's ProductOut − Setpoint) and enters it from the
// regenerator, whose pasteurized side enters at temp, with the design's
// ratio (ProductIn − RawInlet)/(Setpoint − RawInlet); the medium inlet is
// the one the section requires with the fouling Fouling(t) on its clean U
// (fouling.Section.Rate: the plant model of check), the medium outlet by its
// energy balance.
func Heated(heat fouling.Section, temp, t float64) ([4]float64, error) {
	ratio := (heat.ProductIn - RawInlet) / (Setpoint - RawInlet)
	heat.ProductOut, heat.ProductIn = temp+heat.ProductOut-Setpoint, RawInlet+ratio*(temp-RawInlet)
	sec, err := heat.Rate(DemoCleanU, Fouling(t))
	if err != nil {
		return [4]float64{}, err
	}
	return [4]float64{sec.ProductIn, sec.ProductOut, sec.OtherIn, sec.OtherOut}, nil
}

// DemoCleanU is the clean U, W/(m²·K), a heating section without a plate
// pack is rated with in the scenario (the demo's has one: its pack's clean
// U is used).
const DemoCleanU = 5000.0

// ShiftRows is the number of rows in one shift (the gap's samples missing).
const ShiftRows = ShiftLength - (GapLength - 1)

// DemoSeed is the noise seed of the committed demo file.
const DemoSeed = 2026
