package assess

// Source of the expected values: the guard rails of docs/METHOD.md §19.2
// (water boils at 100 °C at atmospheric pressure; 7 °C, or 45 °F, the outlet
// many codes set for pasteurized milk: PMO standard as reproduced in Chandan
// and Kilara 2011, Table 15.4) and the exact °F conversion t_F = 1.8 t_C + 32.

import (
	"strings"
	"testing"
)

// guardPlant is a line with heating and one sized cooling stage; %s are the
// setpoint, the heating medium inlet and the outlet target.
const guardPlant = `product:
  name: test product
  density: 1030 kg/m3
  specific_heat: 3.9 kJ/(kg*K)
flow:
  rate: 10000 L/h
process:
  raw_inlet: 4 °C
  hold_setpoint: SETPOINT
  outlet_target: TARGET
heating:
  medium: water
  medium_inlet: MEDIUM
  medium_rate: 20000 L/h
  plate_area: 0.35 m2
  u_value: 3800 W/(m2*K)
cooling:
  - name: chilled water
    medium: water
    medium_inlet: 1 °C
    medium_rate: 25000 L/h
    plate_area: 0.35 m2
    u_value: 3000 W/(m2*K)
`

func guard(t *testing.T, setpoint, medium, target string) *Result {
	t.Helper()
	src := strings.NewReplacer("SETPOINT", setpoint, "MEDIUM", medium, "TARGET", target).Replace(guardPlant)
	res, err := Run(load(t, src))
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func codes(res *Result) map[WarningCode]Warning {
	m := map[WarningCode]Warning{}
	for _, w := range res.Warnings {
		m[w.Code] = w
	}
	return m
}

func TestGuardRails(t *testing.T) {
	tests := []struct {
		name                     string
		setpoint, medium, target string
		want                     []WarningCode
		not                      []WarningCode
	}{
		{"quiet line", "72.5 °C", "77 °C", "4 °C", nil, []WarningCode{WarnMediumPressurised, WarnOutletWarm, NoteOutletWarm, WarnProductFrozen}},
		// A medium above 100 °C must be pressurised.
		{"medium above boiling", "95 °C", "105 °C", "4 °C", []WarningCode{WarnMediumPressurised}, []WarningCode{WarnOutletWarm}},
		{"medium at boiling", "95 °C", "100 °C", "4 °C", nil, []WarningCode{WarnMediumPressurised}},
		// An outlet target above 7 °C is taken as meant: a note, not a warning.
		{"target above 7 °C", "72.5 °C", "77 °C", "10 °C", []WarningCode{NoteOutletWarm}, []WarningCode{WarnOutletWarm}},
		// 45 °F (7.22 °C) is the limit of a plant written in °F; 7.1 °C in SI is above 7 °C.
		{"45 °F in US units", "162.5 °F", "170.6 °F", "45 °F", nil, []WarningCode{WarnOutletWarm, NoteOutletWarm}},
		{"7.1 °C in SI", "72.5 °C", "77 °C", "7.1 °C", []WarningCode{NoteOutletWarm}, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := codes(guard(t, tc.setpoint, tc.medium, tc.target))
			for _, c := range tc.want {
				if _, ok := got[c]; !ok {
					t.Errorf("no %s in %v", c, got)
				}
			}
			for _, c := range tc.not {
				if _, ok := got[c]; ok {
					t.Errorf("unexpected %s: %v", c, got[c])
				}
			}
			if w, ok := got[NoteOutletWarm]; ok && !w.Note {
				t.Errorf("the outlet note is not marked a note")
			}
		})
	}
}

func TestWarmOutletOfARatedStage(t *testing.T) {
	// A rated stage that cannot reach the 4 °C target leaves the product above
	// 7 °C: the cooling-outlet check fails and the warm outlet is a warning.
	src := strings.NewReplacer("SETPOINT", "72.5 °C", "MEDIUM", "77 °C", "TARGET", "4 °C",
		"    medium_rate: 25000 L/h\n", "    medium_rate: 25000 L/h\n    plates: 2\n").Replace(guardPlant)
	res, err := Run(load(t, src))
	if err != nil {
		t.Fatal(err)
	}
	w, ok := codes(res)[WarnOutletWarm]
	if !ok || w.Note || !(w.Values["outlet_C"] > ColdLimitC) || res.Pass {
		t.Errorf("warnings %v, pass %v", res.Warnings, res.Pass)
	}
}

func TestEngineErrorsInTheFilesUnits(t *testing.T) {
	// A cooling cross in a plant written in °F is told in °F: 2 °C = 35.60 °F,
	// and a difference of 2 K = 3.60 °F.
	if got := inUSUnits("product 10.40 → 4.00 °C, medium 2.00 → 8.00 °C; the differences are -2.00 K and 2.00 K"); got !=
		"product 50.72 → 39.20 °F, medium 35.60 → 46.40 °F; the differences are -3.60 °F and 3.60 °F" {
		t.Errorf("converted: %q", got)
	}
	src := strings.NewReplacer("SETPOINT", "162.5 °F", "MEDIUM", "170.6 °F", "TARGET", "39.2 °F",
		"medium_rate: 20000 L/h", "medium_rate: 0.5 gpm").Replace(guardPlant)
	_, err := Run(load(t, src))
	if err == nil || !strings.Contains(err.Error(), "°F") || strings.Contains(err.Error(), "°C") || strings.Contains(err.Error(), " K ") {
		t.Errorf("error in a °F file: %v", err)
	}
}

func TestProductCooledBelowFreezing(t *testing.T) {
	// Glycol at −5 °C cooling to a −0.5 °C target: below 0 °C without an
	// entered freezing point; with product.freezing_point −1 °C, not.
	base := strings.NewReplacer("SETPOINT", "72.5 °C", "MEDIUM", "77 °C", "TARGET", "-0.5 °C",
		"    medium: water\n    medium_inlet: 1 °C", "    medium: {name: glycol, density: 1040 kg/m3, specific_heat: 3.7 kJ/(kg*K)}\n    medium_inlet: -5 °C").Replace(guardPlant)
	for _, c := range []struct {
		name   string
		extra  string
		frozen bool
	}{
		{"no freezing point", "", true},
		{"freezing point below the outlet", "  freezing_point: -1 °C\n", false},
		{"freezing point above the outlet", "  freezing_point: -0.4 °C\n", true},
	} {
		t.Run(c.name, func(t *testing.T) {
			src := strings.Replace(base, "  specific_heat: 3.9 kJ/(kg*K)\n", "  specific_heat: 3.9 kJ/(kg*K)\n"+c.extra, 1)
			res, err := Run(load(t, src))
			if err != nil {
				t.Fatal(err)
			}
			if _, got := codes(res)[WarnProductFrozen]; got != c.frozen {
				t.Errorf("frozen warning %v, want %v: %v", got, c.frozen, res.Warnings)
			}
		})
	}
}
