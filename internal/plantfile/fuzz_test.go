package plantfile_test

// Source of the invariants: the project's error contract (every refusal
// names the file, a line and a message).

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

// FuzzLoad runs any bytes through the whole reading pipeline (parse,
// validate, compute). Invariants: no panic; a refusal is an inputerr.List whose
// entries name the file and a line ≥ 1 with a message; an accepted plant
// computes or is refused with a positioned error.
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
			_, err = assess.Run(p)
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
		}
	})
}
