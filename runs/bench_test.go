package runs_test

// Benchmarks only: no expected values (no source needed).

import (
	"bufio"
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"sync"
	"testing"

	"pasval/internal/props"
	gen "pasval/internal/rungen"
	"pasval/internal/runlog"
	"pasval/lethality"
	"pasval/runs"
)

// Benchmarks on a generated recorded run of the demo's shape (RFC 3339
// time, two numbers, a flag; the demo shift repeated), 2 million rows unless
// -runs.file names another file:
//
//	go test ./runs/ -run '^$' -bench . -benchmem
//	go test -c -o runs.test ./runs/
//	./runs.test -test.run '^$' -test.bench '^BenchmarkReadRun$' -test.benchtime 1x -runs.rows 10000000 -runs.keep /tmp/10M.csv
//	/usr/bin/time -v ./runs.test -test.run '^$' -test.bench '^BenchmarkPipeline$' -test.benchtime 1x -runs.file /tmp/10M.csv
var (
	benchFile = flag.String("runs.file", "", "recorded run for the benchmarks (default: a generated file)")
	benchRows = flag.Int("runs.rows", 2_000_000, "rows of the generated benchmark file")
	benchKeep = flag.String("runs.keep", "", "write the generated benchmark file here and keep it")
)

var (
	genOnce sync.Once
	genDir  string
	genPath string
	genErr  error
)

func TestMain(m *testing.M) {
	code := m.Run()
	if genDir != "" {
		os.RemoveAll(genDir)
	}
	os.Exit(code)
}

// bigRun returns the benchmark file's path and size.
func bigRun(b *testing.B) (string, int64) {
	b.Helper()
	path := *benchFile
	if path == "" {
		genOnce.Do(func() {
			if *benchKeep != "" {
				genPath = *benchKeep
			} else {
				if genDir, genErr = os.MkdirTemp("", "runs-bench-"); genErr != nil {
					return
				}
				genPath = filepath.Join(genDir, "run.csv")
			}
			f, err := os.Create(genPath)
			if err != nil {
				genErr = err
				return
			}
			w := bufio.NewWriterSize(f, 1<<20)
			if genErr = gen.Write(w, *benchRows, 1); genErr == nil {
				genErr = w.Flush()
			}
			if err := f.Close(); genErr == nil {
				genErr = err
			}
		})
		if genErr != nil {
			b.Fatal(genErr)
		}
		path = genPath
	}
	st, err := os.Stat(path)
	if err != nil {
		b.Fatal(err)
	}
	return path, st.Size()
}

// BenchmarkReadRun reads the file alone.
func BenchmarkReadRun(b *testing.B) {
	path, size := bigRun(b)
	b.SetBytes(size)
	b.ReportAllocs()
	n := 0
	for b.Loop() {
		r, err := runlog.Open(path, runlog.Options{})
		if err != nil {
			b.Fatal(err)
		}
		n = 0
		for r.Next() {
			n++
		}
		if err := r.Err(); err != nil {
			b.Fatal(err)
		}
		r.Close()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/row")
}

// BenchmarkPipeline reads and analyses the file: the work of a run review.
func BenchmarkPipeline(b *testing.B) {
	path, size := bigRun(b)
	m := commandModel(b)
	b.SetBytes(size)
	b.ReportAllocs()
	rows := 0
	for b.Loop() {
		r, err := runlog.Open(path, runlog.Options{})
		if err != nil {
			b.Fatal(err)
		}
		res, err := review(r, m, runs.Options{})
		if err != nil {
			b.Fatal(err)
		}
		r.Close()
		rows = res.Summary.Rows
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(rows), "ns/row")
}

// commandModel is the demo model as the command builds it from the plant
// file: the viscosity points (taken at the colder of the reading and the
// setpoint) and the sensor accuracy of testdata/demo/htst-milk-si.yaml.
func commandModel(b *testing.B) runs.Model {
	m := demoModel(b)
	curve, err := props.NewViscosityCurve([]props.ViscosityPoint{{TempC: 4, Viscosity: 3.1e-3}, {TempC: 40, Viscosity: 1.35e-3},
		{TempC: 72.5, Viscosity: 0.72e-3}, {TempC: 80, Viscosity: 0.64e-3}})
	if err != nil {
		b.Fatal(err)
	}
	m.RheologyAt = func(t float64) lethality.Rheology {
		mu, _ := curve.At(t)
		return lethality.Newtonian{Viscosity: mu}
	}
	m.SensorAccuracy = 0.25
	return m
}

// BenchmarkEngine analyses samples already in memory: the engine's share.
// The samples are 20 generated shifts (noise included, as recorders write
// them), run through ten times with time running on: 1.4 million samples,
// judged against the demo plant as the command judges them (commandModel).
func BenchmarkEngine(b *testing.B) {
	m := commandModel(b)
	var text bytes.Buffer
	if err := gen.Write(&text, 20*gen.ShiftRows, 1); err != nil {
		b.Fatal(err)
	}
	r, err := runlog.NewReader(&text, "shifts.csv", runlog.Options{})
	if err != nil {
		b.Fatal(err)
	}
	var samples []runs.Sample
	for r.Next() {
		rec := r.Record()
		samples = append(samples, runs.Sample{Time: rec.Time, Temperature: rec.Temperature, Flow: rec.Flow, Forward: rec.Forward})
	}
	if err := r.Err(); err != nil {
		b.Fatal(err)
	}
	span := samples[len(samples)-1].Time - samples[0].Time + 1
	const rounds = 10
	b.ReportAllocs()
	for b.Loop() {
		e, err := runs.NewEngine(m, runs.Options{})
		if err != nil {
			b.Fatal(err)
		}
		for k := range rounds {
			for _, s := range samples {
				s.Time += float64(k) * span
				if err := e.Add(s); err != nil {
					b.Fatal(err)
				}
			}
		}
		e.Finish()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(rounds*len(samples)), "ns/row")
}
