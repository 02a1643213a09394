package runlog

import "testing"

var sinkF float64
var sinkOK bool

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
