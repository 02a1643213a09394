// Package gen writes invented recorded runs for the SI demo plant
// (testdata/demo/htst-milk-si.yaml: setpoint 72.5 °C, sealed maximum
// 11 000 L/h, normal rate 10 000 L/h): the demo shift in
// testdata/demo/runs/ and, for benchmarks, files of any length with the same
// shape (RFC 3339 time, two numbers, a flag). Every number is made up.
//
// The demo file is regenerated with
//
//	go test ./runs/internal/gen -run TestDemoFile -update
//
// and the test fails when the committed file and the generator disagree.
package gen

import (
	"bufio"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"time"
)

// ShiftLength is the demo shift's length, s (two hours of one-second samples).
const ShiftLength = 7200

// Start is the demo shift's first sample time.
var Start = time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC)

// Header is the demo file's header row.
const Header = "time,hold_outlet_temperature [°C],flow_rate [L/h],forward"

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
func Write(w io.Writer, rows int, seed uint64) error {
	bw := bufio.NewWriterSize(w, 64<<10)
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	if _, err := bw.WriteString(Header + "\n"); err != nil {
		return err
	}
	buf := make([]byte, 0, 64)
	for n, k := 0, 0; n < rows; k++ {
		shift, sec := k/ShiftLength, k%ShiftLength
		temp, flow, fwd, skip := Script(sec)
		tn, fn := rng.NormFloat64(), rng.NormFloat64() // drawn for every second, so the noise does not depend on the gap
		if skip {
			continue
		}
		temp = math.Round((temp+TemperatureNoise*tn)*100) / 100
		flow = math.Round((flow+FlowNoise*fn)*10) / 10
		t := Start.Add(time.Duration(shift*ShiftLength+sec) * time.Second)
		buf = t.AppendFormat(buf[:0], time.RFC3339)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, temp, 'f', 2, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, flow, 'f', 1, 64)
		if fwd {
			buf = append(buf, ",1\n"...)
		} else {
			buf = append(buf, ",0\n"...)
		}
		if _, err := bw.Write(buf); err != nil {
			return err
		}
		n++
	}
	return bw.Flush()
}

// ShiftRows is the number of rows in one shift (the gap's samples missing).
const ShiftRows = ShiftLength - (GapLength - 1)

// DemoSeed is the noise seed of the committed demo file.
const DemoSeed = 2026
