package main

// Reproducers of an independent audit of the run review (testdata/audit-runs,
// where its README says what each file is), and the review's figures that
// the audit asked for.

import (
	"math"
	"path/filepath"
	"testing"
)

const auditRuns = "../../testdata/audit-runs"

// TestLogsClockTimesAsExactAsSeconds: the same 120 samples written with time
// in seconds from 0 and as clock times give the same review. Half of the
// parcels are held 15 s − 5×10⁻⁸ s in the audit's construction, short of
// the 72 °C / 15 s row by more than its tolerance (10⁻⁹ × 15 s,
// docs/METHOD.md §1.5): 52 lethality events and exit 1 in both. Held as
// Unix seconds in a float64 (steps of 2^-22 s = 0.24 µs in 2026), the clock
// file lost the 5×10⁻⁸ s and passed.
func TestLogsClockTimesAsExactAsSeconds(t *testing.T) {
	plant := filepath.Join(auditRuns, "tie-plant.yaml")
	secs, codeS := logsJSON(t, plant, filepath.Join(auditRuns, "tie-seconds.csv"))
	clock, codeC := logsJSON(t, plant, filepath.Join(auditRuns, "tie-clock.csv"))
	for name, c := range map[string]struct {
		v    map[string]any
		code int
	}{"seconds": {secs, codeS}, "clock times": {clock, codeC}} {
		s := c.v["summary"].(map[string]any)
		// The audit's count: from 16 s on, every other parcel (the ones
		// that left after a second at the higher flow) falls short, each a
		// one-second event of its own between parcels that pass.
		if c.code != exitFail || s["events"] != 52.0 {
			t.Errorf("%s: exit %d, %v events; want 1 and 52", name, c.code, s["events"])
		}
		// 15 s − 5×10⁻⁸ s: the audit's construction of the flows.
		if got := s["min_forward_residence_s"].(float64); math.Abs(got-(15-5e-8)) > 1e-12 {
			t.Errorf("%s: min residence %.12f s, want 14.99999995 s", name, got)
		}
	}
	// Identical numbers (tolerance 0), times apart: seconds against clock times.
	skip := map[string]bool{"file": true, "files": true, "start": true, "end": true}
	for _, key := range []string{"summary", "events", "drops"} {
		sameJSON(t, key, secs[key], clock[key], 0, skip)
	}
}
