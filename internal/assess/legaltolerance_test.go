package assess

import (
	"testing"

	"pasval/lethality"
)

// TestLegalRowReadWithTheOneTolerance pins the rule docs/METHOD.md §1.5
// (Rounding and comparison) states for the legal table: a row is met when
// row time − t_min ≤ 10⁻⁹ · row time, the same rule as every check's
// margin ≥ −10⁻⁹ · |required|, so that the holding-time check and the table
// reading never disagree.
//
// The second case is a product on an invented line (2 in sanitary tube,
// D = 0.047498 m, L = 22 m, ρ = 1034 kg/m³, μ = 0.62 mPa·s, turbulent) at a
// seal of 0.002145692207946452 m³/s, the top of its flow envelope found by
// 'pasval matrix' (bisection to 10⁻⁹, docs/METHOD.md §16.3): t_min =
// 14.999999986447905 s against a 15 s row, 9.03 × 10⁻¹⁰ of the row short,
// computed by hand from docs/METHOD.md §7.2, §7.4 and §7.5 with Python.
func TestLegalRowReadWithTheOneTolerance(t *testing.T) {
	rows := []lethality.LegalRow{{Temperature: 72, Time: 15}}
	table := lethality.NewLegalTable(rows)
	for _, c := range []struct {
		name string
		tmin float64
		met  bool
	}{
		{"exactly the row", 15, true},
		{"rounding short, 5e-10 of the row", 15 * (1 - 5e-10), true},
		{"envelope edge, 9.03e-10 short (Python, docs/METHOD.md §7.5)", 14.999999986447905, true},
		{"2e-9 of the row short", 15 * (1 - 2e-9), false},
		{"a microsecond short", 15 - 1e-6, false},
	} {
		v := table.Judge(72.2, c.tmin, Tolerance)
		chk := NewCheck(HoldingTime, 15, c.tmin)
		if v.Met != c.met || chk.Pass != c.met {
			t.Errorf("%s: table met %v, check pass %v, want %v", c.name, v.Met, chk.Pass, c.met)
		}
	}
}
