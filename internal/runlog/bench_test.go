package runlog

import (
	"bytes"
	"strconv"
	"testing"
	"time"
)

// Benchmarks of the reader's parts and of the whole reader on text in
// memory; the runs package benchmarks it on a generated file of the demo's
// shape (BenchmarkReadRun, BenchmarkPipeline).

var (
	sinkF  float64
	sinkOK bool
)

func BenchmarkParseClock(b *testing.B) {
	in := []byte("2026-03-14T06:00:01Z")
	for b.Loop() {
		var c clock
		sinkOK = parseClock(in, &c)
		sinkF = float64(c.sec)
	}
}

func BenchmarkParseNumber(b *testing.B) {
	in := []byte("10012.5")
	for b.Loop() {
		sinkF, sinkOK = parseNumber(in, false)
	}
}

func BenchmarkSplit(b *testing.B) {
	in := []byte("2026-03-14T06:00:01Z,72.98,10012.5,1")
	s := splitter{sep: ','}
	for b.Loop() {
		s.split(in, false)
	}
}

// BenchmarkReader reads 200 000 rows of the demo's shape from memory.
func BenchmarkReader(b *testing.B) {
	var buf bytes.Buffer
	buf.WriteString(hdr)
	t0 := time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC)
	for i := range 200000 {
		buf.WriteString(t0.Add(time.Duration(i) * time.Second).Format(time.RFC3339))
		buf.WriteString(",73.0" + strconv.Itoa(i%10) + ",100" + strconv.Itoa(10+i%90) + ".5,1\n")
	}
	text := buf.Bytes()
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		r, err := NewReader(bytes.NewReader(text), "bench.csv", Options{})
		if err != nil {
			b.Fatal(err)
		}
		for r.Next() {
		}
		if err := r.Err(); err != nil {
			b.Fatal(err)
		}
	}
}
