package report

// Source of the expected values: the glyphs of the embedded Go font and the
// project's axis-label rule; records of real results are tested in
// internal/record.

import "testing"

func TestPrintable(t *testing.T) {
	// Characters outside the embedded Go font become '?'; those in it stay.
	if got := printable("72.5 °C ≥ 15 s · ε µ ± ² →"); got != "72.5 °C ≥ 15 s · ε µ ± ² →" {
		t.Errorf("printable changed supported text: %q", got)
	}
	if got := printable("乳業 dairy"); got != "?? dairy" {
		t.Errorf("printable(%q)", got)
	}
}

func TestTickLabels(t *testing.T) {
	// Axis labels carry the step's decimals and no floating-point noise.
	for _, c := range []struct {
		v, step float64
		want    string
	}{{3.8000000000000016, 0.2, "3.8"}, {20, 10, "20"}, {2.5, 2.5, "2.5"}, {0.05, 0.05, "0.05"}, {-20, 20, "-20"}} {
		if got := tick(c.v, c.step); got != c.want {
			t.Errorf("tick(%v, %v) = %q, want %q", c.v, c.step, got, c.want)
		}
	}
}
