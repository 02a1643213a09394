// Command demorun writes an invented recorded run of the demo's shape (the
// SI demo plant's two-hour shift, repeated with time running on) for
// benchmarks and trials:
//
//	go run ./internal/rungen/demorun -rows 2000000 -o /tmp/run-2M.csv
//
// The first shift of seed 2026 is the committed demo run,
// testdata/demo/runs/htst-milk-si-shift.csv.
package main

import (
	"bufio"
	"flag"
	"fmt"
	"io"
	"os"

	"pasval/internal/rungen"
)

func main() {
	rows := flag.Int("rows", rungen.ShiftRows, "data rows to write")
	seed := flag.Uint64("seed", rungen.DemoSeed, "noise seed")
	out := flag.String("o", "", "file to write (default: standard output)")
	flag.Parse()
	if *rows < 1 || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: demorun [-rows N] [-seed S] [-o FILE]")
		os.Exit(2)
	}
	var w io.Writer = os.Stdout
	var f *os.File
	if *out != "" {
		var err error
		if f, err = os.Create(*out); err != nil {
			fmt.Fprintln(os.Stderr, "demorun:", err)
			os.Exit(1)
		}
		w = f
	}
	bw := bufio.NewWriterSize(w, 1<<20)
	err := rungen.Write(bw, *rows, *seed)
	if err == nil {
		err = bw.Flush()
	}
	if f != nil {
		if cerr := f.Close(); err == nil {
			err = cerr
		}
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "demorun:", err)
		os.Exit(1)
	}
}
