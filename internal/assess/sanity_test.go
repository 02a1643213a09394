package assess

import (
	"strings"
	"testing"
)

func TestSanityWarnings(t *testing.T) {
	// Typical ranges are common practice for plate pasteurizers; water's viscosity
	// at 20 °C is 1.0016 mPa·s (IAPWS 2008, see props tests).
	src := `product:
  name: typo milk
  density: 1.03 kg/m3
  specific_heat: 3.93 kJ/(kg*K)
  viscosity:
    - {at: 20 °C, value: 0.3 mPa*s}
flow:
  rate: 36 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
regeneration:
  ratio: 0.97
  plate_area: 35 m2
  u_value: 33000 W/(m2*K)
holding_tube:
  inner_diameter: 47.5 mm
  length: 40 m
  rise: 1 m
`
	res, err := Run(load(t, src))
	if err != nil {
		t.Fatal(err)
	}
	all := strings.Join(res.Warnings, "\n")
	for _, want := range []string{
		"regeneration.u_value 33000 W/(m2*K) is outside",
		"regeneration.plate_area 35 m2",
		"product density 1.03 kg/m³",
		"below water's 1.002 mPa·s",
		"regeneration ratio of 97.0 %",
		"beyond what a continuous line holds",
		"mean velocity in the holding tube",
	} {
		if !strings.Contains(all, want) {
			t.Errorf("no warning containing %q in:\n%s", want, all)
		}
	}
	// The demos raise none of these.
	for _, demo := range []string{"htst-milk-si", "cider-us"} {
		p := load(t, string(mustRead(t, "../../testdata/demo/"+demo+".yaml")))
		res, _ := Run(p)
		if len(res.Warnings) != 0 {
			t.Errorf("%s warns: %v", demo, res.Warnings)
		}
	}
}
