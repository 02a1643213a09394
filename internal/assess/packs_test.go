package assess

// Source of the expected values: the plate-pack relations of docs/METHOD.md
// §12 (each case says which), the engine's own rating re-run on the same
// streams (two paths to one answer), and the counting rule of §12.1.

import (
	"errors"
	"math"
	"strings"
	"testing"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/regen"
)

// packPlant is a regenerator with a plate pack; {{...}} fields are replaced
// per case.
const packPlant = `product:
  name: test product
  density: 1030 kg/m3
  specific_heat: 3.9 kJ/(kg*K)
PRODUCT
flow:
  rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
  outlet_target: 4 °C
regeneration:
  plate_area: 0.42 m2
REGEN
  plate:
    chevron_angle: ANGLE
    pressing_depth: 3 mm
    enlargement_factor: 1.17
    channel_width: 0.45 m
    port_to_port_length: 0.8 m
    thickness: 0.6 mm
    conductivity: 16 W/(m*K)
    port_diameter: 100 mm
  product_side: {passes: 8, channels_per_pass: 7MAXDP}
  other_side: {passes: 8, channels_per_pass: 7}
`

func packSource(product, regen, angle, maxDP string) string {
	r := strings.NewReplacer("PRODUCT", product, "REGEN", regen, "ANGLE", angle, "MAXDP", maxDP)
	return r.Replace(packPlant)
}

const milkPoints = `  conductivity: 0.58 W/(m*K)
  viscosity:
    - {at: 4 °C, value: 3.1 mPa*s}
    - {at: 72 °C, value: 0.72 mPa*s}`

func warningsOf(res *Result, code WarningCode) []Warning {
	var out []Warning
	for _, w := range res.Warnings {
		if w.Code == code {
			out = append(out, w)
		}
	}
	return out
}

func TestLayoutPlatesMatchTheEngine(t *testing.T) {
	// One counting rule in two places (docs/METHOD.md §12.1): the plant file
	// sets a rated pack's plates, the engine checks them against its own.
	for _, l := range [][4]int{{8, 7, 8, 7}, {1, 5, 1, 6}, {3, 13, 3, 12}, {1, 1, 1, 1}, {10, 4, 10, 4}} {
		pk := &plantfile.PlatePack{Product: plantfile.SideLayout{Passes: l[0], ChannelsPerPass: l[1]},
			Other: plantfile.SideLayout{Passes: l[2], ChannelsPerPass: l[3]}}
		got, ok := pk.LayoutPlates()
		want := regen.PlatePack{Product: regen.SideLayout{Passes: l[0], ChannelsPerPass: l[1]},
			Other: regen.SideLayout{Passes: l[2], ChannelsPerPass: l[3]}}.ThermalPlates()
		if !ok || got != want {
			t.Errorf("%v: plant file %d, engine %d", l, got, want)
		}
	}
}

func TestPackFiguresAreTheEngines(t *testing.T) {
	// The JSON figures are the pack rated at the section's temperatures: rating
	// the plant's pack again with regen.RatePlatePack on those streams gives
	// the same numbers (1e-12), and the section used U_service (1e-10, the
	// coupled iteration's tolerance, docs/METHOD.md §12.2).
	p := load(t, packSource(milkPoints, "", "60 deg", ""))
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	s := res.Sections[0]
	f := s.PackFigures
	if f == nil || s.Mode != "rating" || s.Plates != 111 {
		t.Fatalf("section %+v", s)
	}
	m := res.Product.MassFlow
	product := productFluid(p, res.Product)
	r, err := regen.RatePlatePack(enginePack(p.Regeneration.Plates),
		regen.PackStream{Fluid: product, MassFlow: m, In: s.ProductInC, Out: s.ProductOutC},
		regen.PackStream{Fluid: product, MassFlow: m, In: s.OtherInC, Out: s.OtherOutC})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"U clean", f.UCleanWm2K, r.UClean}, {"U service", f.UServiceWm2K, r.UService},
		{"h product", f.HProductWm2K, r.Product.H}, {"h other", f.HOtherWm2K, r.Other.H},
		{"Re product", f.ReynoldsProduct, r.Product.Reynolds}, {"Re other", f.ReynoldsOther, r.Other.Reynolds},
		{"Δp product", f.PressureDropProductKPa * 1e3, r.Product.PressureDrop}, {"Δp other", f.PressureDropOtherKPa * 1e3, r.Other.PressureDrop},
		// v = ṁ/(N ρ b w) with ṁ = 10 000 L/h × 1030 kg/m³ (§12.2).
		{"velocity", f.VelocityProductMS, 10.0 / 3600 * 1030 / (7 * 1030 * 0.003 * 0.45)},
	} {
		if math.Abs(c.got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("%s: %.15g, re-rated %.15g", c.name, c.got, c.want)
		}
	}
	if math.Abs(s.UWm2K/f.UServiceWm2K-1) > 1e-10 {
		t.Errorf("section U %g, pack U_service %g", s.UWm2K, f.UServiceWm2K)
	}
	if f.PassesProduct != 8 || f.ChannelsPerPassOther != 7 {
		t.Errorf("layout %+v", f)
	}
}

func TestPackWarningsAndCheck(t *testing.T) {
	tests := []struct {
		name            string
		product, regen  string
		angle, maxDP    string
		code            WarningCode
		field           string
		pressureDropAll bool // the pressure-drop check passes
	}{
		// A product of 200 mPa·s: Re = ρ v d_h/μ ≈ 1030 × 0.294 × 0.00513/0.2 ≈ 8, far below 200.
		{"viscous product", "  conductivity: 0.5 W/(m*K)\n  viscosity:\n    - {at: 40 °C, value: 200 mPa*s}", "", "60 deg", "",
			WarnPackReynolds, "regeneration.product_side", true},
		{"angle above 80°", milkPoints, "", "85 deg", "", WarnPackAngle, "regeneration.plate.chevron_angle", true},
		// n = 0.7, K = 0.05 Pa·s^0.7: rated at its apparent viscosity.
		{"power law", "  conductivity: 0.5 W/(m*K)\n  power_law: {flow_index: 0.7, consistency: 0.05 Pa*s^0.7}", "", "60 deg", "",
			WarnPackApparentViscosity, "regeneration.product_side", true},
		// Points at 50 and 60 °C only: the raw side's mean (about 37 °C) lies outside.
		{"viscosity beyond the points", "  conductivity: 0.5 W/(m*K)\n  viscosity:\n    - {at: 50 °C, value: 1.1 mPa*s}\n    - {at: 60 °C, value: 0.9 mPa*s}",
			"", "60 deg", "", WarnPackViscosityExtrapolated, "product.viscosity", true},
		// An entered U far above the pack's: kept, and warned about.
		{"entered U", milkPoints, "  u_value: 9000 W/(m2*K)", "60 deg", "", WarnPackUDiffers, "regeneration.u_value", true},
		// A 20 kPa limit against about 110 kPa: the check fails.
		{"pressure limit", milkPoints, "", "60 deg", ", max_pressure_drop: 20 kPa", "", "", false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Run(load(t, packSource(tc.product, tc.regen, tc.angle, tc.maxDP)))
			if err != nil {
				t.Fatal(err)
			}
			if tc.code != "" {
				ws := warningsOf(res, tc.code)
				if len(ws) == 0 || ws[0].Field != tc.field || ws[0].Section != "regeneration" {
					t.Fatalf("%s: %+v in %+v", tc.code, ws, res.Warnings)
				}
			}
			for _, c := range res.Checks {
				if c.ID == PressureDrop && (c.Pass != tc.pressureDropAll || c.Section != "regeneration") {
					t.Errorf("pressure-drop %+v", c)
				}
			}
			if tc.maxDP != "" && len(res.Checks) != 1 {
				t.Errorf("checks %+v", res.Checks)
			}
		})
	}
	// The entered U is used, and the difference is (u_value − U_clean)/U_clean.
	res, err := Run(load(t, packSource(milkPoints, "  u_value: 9000 W/(m2*K)", "60 deg", "")))
	if err != nil {
		t.Fatal(err)
	}
	s := res.Sections[0]
	w := warningsOf(res, WarnPackUDiffers)[0]
	d, ok := s.UDifference(res.Plant)
	if !ok || s.UWm2K != 9000 || math.Abs(d-(9000-s.UCleanWm2K)/s.UCleanWm2K) > 1e-15 || w.Values["difference"] != d || !(d > UDifferenceWarn) {
		t.Errorf("U %g, clean %g, difference %g, warning %v", s.UWm2K, s.UCleanWm2K, d, w.Values)
	}
}

func TestPackMediaAndComposition(t *testing.T) {
	// A cooling stage with a described medium (its conductivity and viscosity
	// entered) and a product whose conductivity comes from its composition
	// (Choi–Okos at the stream's mean temperature, docs/METHOD.md §12.2): the
	// stage's figures are the engine's rating of those fluids.
	src := `product:
  name: test milk
  composition: {water: 0.878, protein: 0.032, fat: 0.035, carbohydrate: 0.048, ash: 0.007}
  viscosity:
    - {at: 4 °C, value: 3.1 mPa*s}
    - {at: 72 °C, value: 0.72 mPa*s}
flow:
  rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 72 °C
  outlet_target: 4 °C
cooling:
  - name: glycol
    medium: {name: glycol 30 %, density: 1040 kg/m3, specific_heat: 3.7 kJ/(kg*K), conductivity: 0.45 W/(m*K), viscosity: 4 mPa*s}
    medium_inlet: -2 °C
    medium_rate: 30000 L/h
    plate_area: 0.42 m2
    plate:
      chevron_angle: 60 deg
      pressing_depth: 3 mm
      enlargement_factor: 1.17
      channel_width: 0.45 m
      port_to_port_length: 0.8 m
      thickness: 0.6 mm
      conductivity: 16 W/(m*K)
      port_diameter: 100 mm
    product_side: {channels_per_pass: 6}
    other_side: {channels_per_pass: 6}
`
	p := load(t, src)
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	s := res.Sections[0]
	if s.PackFigures == nil || s.Mode != "sizing" || s.Plates != 12*s.PassesProduct-1 {
		t.Fatalf("%+v", s)
	}
	comp := choiOkos(p.Product.Composition)
	medium := regen.ConstantFluid{Rho: 1040, Cp: 3700, K: 0.45, Mu: 4e-3}
	r, err := regen.RatePlatePack(s.Raw().Pack.Pack,
		regen.PackStream{Fluid: productFluid(p, res.Product), MassFlow: res.Product.MassFlow, In: s.ProductInC, Out: s.ProductOutC},
		regen.PackStream{Fluid: medium, MassFlow: s.MediumMassFlowKgS, In: s.OtherInC, Out: s.OtherOutC})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.UService/s.UServiceWm2K-1) > 1e-12 || math.Abs(r.Product.Conductivity-comp.Conductivity(r.Product.MeanTemp)) > 1e-15 {
		t.Errorf("U %g against %g; product k %g", r.UService, s.UServiceWm2K, r.Product.Conductivity)
	}
	// 30 000 L/h of a 1040 kg/m³ medium in 6 channels: v = 8.667 kg/s/(6 × 1040 × 0.003 × 0.45).
	if v := 30.0 / 3600 * 1040 / (6 * 1040 * 0.003 * 0.45); math.Abs(s.VelocityOtherMS-v) > 1e-12 {
		t.Errorf("medium velocity %g, want %g", s.VelocityOtherMS, v)
	}
}

func TestPackErrorsArePositioned(t *testing.T) {
	// A sized pack with 7 and 6 channels per pass needs several passes, whose
	// channel counts drift apart (docs/METHOD.md §12.4): refused at
	// other_side.channels_per_pass, exit 2, not a panic.
	src := strings.Replace(packSource(milkPoints, "  ratio: 0.9", "60 deg", ""),
		"  product_side: {passes: 8, channels_per_pass: 7}\n  other_side: {passes: 8, channels_per_pass: 7}",
		"  product_side: {channels_per_pass: 7}\n  other_side: {channels_per_pass: 6}", 1)
	_, err := Run(load(t, src))
	var list inputerr.List
	if !errors.As(err, &list) || list[0].Field != "regeneration.other_side.channels_per_pass" || list[0].Pos.Line != 28 ||
		!strings.Contains(list[0].Msg, "cannot alternate") {
		t.Errorf("got %v", err)
	}
}
