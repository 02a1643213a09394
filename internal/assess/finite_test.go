package assess

// Source of the expectations: the sensitivity probe's rule (finite.go): an
// entered value is blamed when replacing it alone by its field's typical
// value makes every number finite. The plants are made up for the test.

import (
	"math"
	"strings"
	"testing"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

func TestNonFiniteNamesThePath(t *testing.T) {
	type inner struct {
		A float64 `json:"a_m"`
		B []float64
	}
	type outer struct {
		In    inner              `json:"in"`
		P     *float64           `json:"p,omitempty"`
		M     map[string]float64 `json:"values"`
		I     any                `json:"any"`
		F     func()             `json:"-"`
		Plant *plantfile.Plant   `json:"-"`
	}
	inf, one := math.Inf(1), 1.0
	for _, tc := range []struct {
		v    outer
		path string
	}{
		{outer{In: inner{A: 1, B: []float64{1, 2}}, P: &one, M: map[string]float64{"x": 1}, I: 2.0}, ""},
		{outer{In: inner{A: math.NaN()}}, "in.a_m"},
		{outer{In: inner{B: []float64{1, inf}}}, "in.B[1]"},
		{outer{P: &inf}, "p"},
		{outer{M: map[string]float64{"value_K": -inf}}, "values[value_K]"},
		{outer{I: []float64{inf}}, "any[0]"},
		{outer{Plant: &plantfile.Plant{Inputs: []plantfile.Input{{SI: inf}}}}, ""}, // the plant is input, not result
	} {
		path, bad := nonFinite(tc.v)
		if path != tc.path || bad != (tc.path != "") {
			t.Errorf("nonFinite(%+v) = %q %v, want %q", tc.v, path, bad, tc.path)
		}
	}
}

const probePlant = `product:
  name: test milk
  density: 1030 kg/m3
  specific_heat: 3.93 kJ/(kg*K)
flow:
  rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
  outlet_target: 4 °C
`

func TestProbeBlamesTheValueThatExplains(t *testing.T) {
	p, err := plantfile.Parse("p.yaml", []byte(probePlant))
	if err != nil {
		t.Fatal(err)
	}
	// A made-up computation that overflows when the density is above 2000
	// kg/m³ and the raw inlet below 0 °C together: each alone explains it.
	compute := func(q *plantfile.Plant) (*struct{ V float64 }, error) {
		v := 1.0
		if q.Product.Density.SI > 2000 && q.Process.RawInlet.SI < 0 {
			v = math.Inf(1)
		}
		return &struct{ V float64 }{v}, nil
	}
	if _, err := finiteOrTraced(p, compute); err != nil {
		t.Fatalf("a finite result refused: %v", err)
	}
	src := strings.Replace(strings.Replace(probePlant, "1030 kg/m3", "3000 kg/m3", 1), "raw_inlet: 5 °C", "raw_inlet: -3 °C", 1)
	if p, err = plantfile.Parse("p.yaml", []byte(src)); err != nil {
		t.Fatal(err)
	}
	_, err = finiteOrTraced(p, compute)
	list, ok := err.(inputerr.List)
	if !ok || len(list) != 2 {
		t.Fatalf("err %v; want the density and the raw inlet blamed", err)
	}
	for i, want := range []struct {
		field string
		line  int
	}{{"product.density", 3}, {"process.raw_inlet", 8}} {
		if e := list[i]; e.Field != want.field || e.Pos.Line != want.line || !strings.Contains(e.Msg, "not a finite number (V)") {
			t.Errorf("error %d: %v; want %s at line %d", i, e, want.field, want.line)
		}
	}
	// Nothing single explains a result that is never finite: the error names
	// the result and the file, without a made-up line.
	_, err = finiteOrTraced(p, func(*plantfile.Plant) (float64, error) { return math.NaN(), nil })
	if list, ok := err.(inputerr.List); !ok || len(list) != 1 || list[0].Pos.Line != 0 || !strings.Contains(list[0].Msg, "no single value") {
		t.Fatalf("err %v; want the fallback", err)
	}
}
