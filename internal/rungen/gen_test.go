package rungen

// No external source applies: the reference is the committed demo run itself.

import (
	"bytes"
	"flag"
	"math"
	"os"
	"path/filepath"
	"testing"

	"pasval/fouling"
	"pasval/internal/assess"
	"pasval/internal/plantfile"
)

var update = flag.Bool("update", false, "rewrite the demo run in testdata/demo/runs")

// demoPath is the committed demo run.
var demoPath = filepath.Join("..", "..", "testdata", "demo", "runs", "htst-milk-si-shift.csv")

// demoHeating is the SI demo plant's heating section, as check computes it.
func demoHeating(t *testing.T) *fouling.Section {
	t.Helper()
	p, err := plantfile.Load(filepath.Join("..", "..", "testdata", "demo", "htst-milk-si.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	// The scenario's temperatures are the plant's.
	if math.Abs(p.Process.RawInlet.SI-RawInlet) > 1e-12 || math.Abs(p.Process.HoldSetpoint.SI-Setpoint) > 1e-12 {
		t.Fatalf("the demo plant's raw inlet %g °C and setpoint %g °C, the scenario's %g and %g", p.Process.RawInlet.SI, p.Process.HoldSetpoint.SI, RawInlet, Setpoint)
	}
	s, err := assess.HeatingSection(p)
	if err != nil {
		t.Fatal(err)
	}
	return &s
}

// TestDemoFile keeps the committed demo run equal to what the generator
// writes, so the file and the documented scenario cannot drift apart.
func TestDemoFile(t *testing.T) {
	var b bytes.Buffer
	if err := WriteRun(&b, ShiftRows, DemoSeed, demoHeating(t)); err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile(demoPath, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	got, err := os.ReadFile(demoPath)
	if err != nil {
		t.Fatalf("%v (run with -update to write it)", err)
	}
	if !bytes.Equal(got, b.Bytes()) {
		t.Fatalf("%s differs from the generator's output; rerun with -update if the scenario changed on purpose", demoPath)
	}
	// Under ~320 KB, so it is kept uncompressed (a size, not a speed: the
	// file is committed).
	if len(got) > 320<<10 {
		t.Errorf("the demo run is %d bytes; compress it", len(got))
	}
}

// TestWriteRows checks the row count across shifts (the gap's samples are
// left out of every shift).
func TestWriteRows(t *testing.T) {
	var b bytes.Buffer
	if err := Write(&b, 2*ShiftRows+5, 1); err != nil {
		t.Fatal(err)
	}
	lines := bytes.Count(b.Bytes(), []byte("\n"))
	if lines != 2*ShiftRows+5+1 {
		t.Errorf("%d lines, want %d rows and the header", lines, 2*ShiftRows+5)
	}
}
