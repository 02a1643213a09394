package plantfile

import (
	"math"
	"testing"
)

func TestSanitaryTube(t *testing.T) {
	// 2 in OD, 0.065 in wall → ID 1.870 in; 4 in OD, 0.083 in wall → ID 3.834 in
	// (ASTM A270 / 3-A practice, from memory; docs/METHOD.md (holding tube)).
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-12 }
	s, ok := LookupSanitaryTube(0.0508)
	if !ok || !near(s.Inner(), 1.870*0.0254) {
		t.Errorf("2 in: %+v %v", s, ok)
	}
	if s, ok := LookupSanitaryTube(4 * 0.0254); !ok || !near(s.Inner(), 3.834*0.0254) {
		t.Errorf("4 in: %+v", s)
	}
	if _, ok := LookupSanitaryTube(0.05); ok {
		t.Error("50 mm accepted as a sanitary size")
	}
}

func TestCompositionValidate(t *testing.T) {
	// The sum rule (mass fractions sum to 1 within 0.005) and the range rule.
	if err := (Composition{Water: 0.9, Fat: 0.05}).validate(); err == nil {
		t.Error("sum 0.95 accepted")
	}
	if err := (Composition{Water: 1.2, Fat: -0.2}).validate(); err == nil {
		t.Error("negative fraction accepted")
	}
	if err := (Composition{Water: 0.878, Protein: 0.032, Fat: 0.035, Carbohydrate: 0.048, Ash: 0.007}).validate(); err != nil {
		t.Errorf("milk refused: %v", err)
	}
}
