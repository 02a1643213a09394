package main

// Benchmarks only: no expected values (no source needed).

import (
	"bufio"
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"pasval/internal/rungen"
)

var logsFile = flag.String("logs.file", "", "recorded run for BenchmarkLogs (default: 2 million generated rows of the demo's shape)")

// BenchmarkLogs is 'pasval logs --quiet' on a long run of the demo's shape,
// as a whole command (reading, hashing, parsing, judging, the text), for a
// CPU profile of what the command does:
//
//	go test ./cmd/pasval/ -run '^$' -bench '^BenchmarkLogs$' -benchtime 5x -cpuprofile /tmp/logs.prof
//	go tool pprof -top /tmp/logs.prof
func BenchmarkLogs(b *testing.B) {
	path := *logsFile
	if path == "" {
		path = filepath.Join(b.TempDir(), "run.csv")
		f, err := os.Create(path)
		if err != nil {
			b.Fatal(err)
		}
		w := bufio.NewWriterSize(f, 1<<20)
		if err := rungen.Write(w, 2_000_000, 1); err != nil {
			b.Fatal(err)
		}
		if err := w.Flush(); err != nil {
			b.Fatal(err)
		}
		if err := f.Close(); err != nil {
			b.Fatal(err)
		}
	}
	st, err := os.Stat(path)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(st.Size())
	plant := filepath.Join(demoDir, "htst-milk-si.yaml")
	for b.Loop() {
		var out bytes.Buffer
		if code := run([]string{"logs", plant, path, "--quiet"}, &out, &out); code == exitInput {
			b.Fatal(out.String())
		}
	}
}
