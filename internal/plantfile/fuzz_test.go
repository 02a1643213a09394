package plantfile_test

// Source of the invariants: the project's error contract (every refusal
// names the file, a line and a message).

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

// FuzzLoad runs any bytes through the whole reading pipeline (parse,
// validate, compute, hold's setpoint table, ten added plates). Invariants: no
// panic; a refusal is an inputerr.List whose entries name the file and a line
// ≥ 1 with a message, and a field when a result is not finite; an accepted
// plant computes results whose every number is finite (they encode as JSON)
// or is refused with a positioned error. Each fault adversarial testing found
// is a seed in testdata/fuzz/FuzzLoad (reproducer-*).
func FuzzLoad(f *testing.F) {
	for _, dir := range []string{"../../testdata/demo", "../../testdata/bad", "../../testdata/equivalence"} {
		files, _ := filepath.Glob(filepath.Join(dir, "*.yaml"))
		for _, p := range files {
			if b, err := os.ReadFile(p); err == nil {
				f.Add(b)
			}
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		p, err := plantfile.Parse("fuzz.yaml", data)
		if err == nil {
			err = plantfile.Validate(p)
		}
		if err == nil {
			err = compute(p)
			if err == nil {
				return
			}
		}
		list, ok := err.(inputerr.List)
		if !ok || len(list) == 0 {
			t.Fatalf("error is not a positioned list: %T %v", err, err)
		}
		for _, e := range list {
			if e.Pos.File != "fuzz.yaml" || e.Pos.Line < 1 || e.Pos.Column < 1 || strings.TrimSpace(e.Msg) == "" {
				t.Fatalf("error without a position or message: %#v", e)
			}
			if strings.Contains(e.Msg, "not a finite number") && e.Field == "" {
				t.Fatalf("a result that is not finite, not traced to a field: %v", e)
			}
		}
	})
}

// compute runs what the commands run on an accepted plant; every result must
// encode as JSON (so every number in it is finite).
func compute(p *plantfile.Plant) error {
	res, err := assess.Run(p)
	if err != nil {
		return err
	}
	var results []any
	results = append(results, res)
	if res.HoldingTube != nil {
		rows, err := assess.SetpointTable(res, assess.SetpointOffsets)
		if err != nil {
			return err
		}
		results = append(results, rows)
	}
	if r := p.Regeneration; r != nil && r.Plates.Plates > 0 && r.Plates.Plates+10 <= plantfile.MaxPlates {
		layout := assess.LayoutNone
		if r.Pack != nil {
			layout = assess.LayoutChannels
		}
		w, err := assess.AddPlates(p, []int{10}, assess.DefaultKneeFraction, layout)
		if err != nil {
			return err
		}
		results = append(results, w)
	}
	if _, err := json.Marshal(results); err != nil {
		panic(fmt.Sprintf("an accepted plant gave a result JSON cannot hold: %v", err))
	}
	return nil
}
