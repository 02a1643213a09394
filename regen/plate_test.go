package regen

import (
	"encoding/csv"
	"errors"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

const deg = math.Pi / 180

// within reports whether got is within a relative tolerance of want.
func within(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// readReference reads a CSV in testdata/reference (comment lines start
// with '#') and returns its header and rows.
func readReference(t *testing.T, name string) ([]string, [][]string) {
	t.Helper()
	f, err := os.Open("../testdata/reference/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 2 {
		t.Fatalf("%s: no data rows", name)
	}
	return rows[0], rows[1:]
}

func parseFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func TestDarcyMartinVDI(t *testing.T) {
	tests := []struct {
		name    string
		re, phi float64
		want    float64
		tol     float64 // relative
	}{
		// Computed from the formula (docs/METHOD.md §12), given to ten digits.
		{"Re 20000, 45°", 20000, 45 * deg, 0.7815890416, 1e-10},
		// Computed from the formula, given to five digits. At 45° an angle
		// measured from the wrong axis gives the same value; at 60° it does not.
		{"Re 1041, 60°", 1041, 60 * deg, 2.0370, 3e-5},
		// The same Re at 30°, what 60° becomes when measured from the
		// perpendicular: four and a half times less (computed from the formula).
		{"Re 1041, 30°", 1041, 30 * deg, 0.45263915333, 1e-10},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := DarcyMartinVDI(tc.re, tc.phi); !within(got, tc.want, tc.tol) {
				t.Errorf("ξ = %.10f, want %.10f", got, tc.want)
			}
		})
	}
}

func TestMartinBranchJump(t *testing.T) {
	// At Re = 2000 both ξ₀ and ξ₁ switch branch. Computed from the formula
	// (an independent Python re-implementation, def vdi(Re, phi) with the constants of
	// DarcyMartinVDI): ξ(2000)/ξ(2000⁻) − 1 = 0.0527513 at 60°, 0.0667523 at 30°.
	for _, c := range []struct{ phi, want float64 }{{60 * deg, 0.0527513}, {30 * deg, 0.0667523}} {
		below := DarcyMartinVDI(math.Nextafter(MartinBranchReynolds, 0), c.phi)
		at := DarcyMartinVDI(MartinBranchReynolds, c.phi)
		if jump := at/below - 1; math.Abs(jump-c.want) > 1e-6 {
			t.Errorf("φ %.0f°: jump %.7f, want %.7f", c.phi/deg, jump, c.want)
		}
	}
}

func TestDarcyMartin1999AgainstFluids(t *testing.T) {
	// testdata/reference/plate-friction-martin1999.csv: python3-fluids 1.0.22
	// friction_plate_Martin_1999(Re, angle in radians), written by
	// plate_friction.py. Same formula, printed to twelve digits: 1e-10.
	header, rows := readReference(t, "plate-friction-martin1999.csv")
	if strings.Join(header, ",") != "Re,phi_deg,darcy" {
		t.Fatalf("header %q", header)
	}
	for _, row := range rows {
		re, phi, want := parseFloat(t, row[0]), parseFloat(t, row[1]), parseFloat(t, row[2])
		if got := DarcyMartin1999(re, phi*deg); !within(got, want, 1e-10) {
			t.Errorf("Re %g φ %g°: ξ = %.12g, python3-fluids %.12g", re, phi, got, want)
		}
	}
	// The 1999 and VDI forms differ only in rounded constants: 0.7818916308
	// against 0.7815890416 at Re 20 000, 45° (both computed; docs/METHOD.md §12).
	if got := DarcyMartin1999(20000, 45*deg); !within(got, 0.7818916308, 1e-10) {
		t.Errorf("1999 form at Re 20000, 45°: %.10f", got)
	}
}

func TestSlitWallShearRate(t *testing.T) {
	// Newtonian slit: 6v/H (the parabolic profile u = 1.5 v (1 − (2y/H)²)
	// has slope 6v/H at the wall; Bird, Stewart and Lightfoot, from memory).
	if got := SlitWallShearRate(0.3, 3e-3, 1); !within(got, 600, 1e-14) {
		t.Errorf("Newtonian: %g, want 600", got)
	}
	// Power law: integrate the exact profile numerically and recover the
	// mean velocity from the wall shear rate the formula returns. With half
	// gap h and γ̇_w, du/dy = −γ̇_w (y/h)^(1/n), so
	// u(y) = γ̇_w h/(1/n + 1) · (1 − (y/h)^(1/n + 1)); v = mean of u over 0…h.
	for _, n := range []float64{0.3, 0.5, 0.8, 1, 1.4} {
		const v, gap = 0.25, 4e-3
		gw := SlitWallShearRate(v, gap, n)
		h := gap / 2
		const steps = 200000
		var sum float64
		for i := range steps {
			y := (float64(i) + 0.5) / steps * h
			sum += gw * h / (1/n + 1) * (1 - math.Pow(y/h, 1/n+1))
		}
		if mean := sum / steps; !within(mean, v, 1e-8) {
			t.Errorf("n %g: the profile with γ̇_w %g carries %.10g m/s, want %g", n, gw, mean, v)
		}
	}
	if got := PowerLawViscosity(12, 0.4, 100); !within(got, 12*math.Pow(100, -0.6), 1e-15) {
		t.Errorf("K γ̇^(n−1): %g", got)
	}
}

func TestSeriesResistance(t *testing.T) {
	// h values entered directly (not from a correlation):
	// 1/5000 + 0.0006/16 + 1/8000 = 2.0e-4 + 3.75e-5 + 1.25e-4 = 3.625e-4 m²K/W,
	// U_clean = 2758.6207 W/(m²K); with 3e-5 fouling 1/3.925e-4 = 2547.7707 (computed).
	uc := CleanU(5000, 8000, 0.6e-3, 16)
	if !within(uc, 1/3.625e-4, 1e-14) {
		t.Errorf("U_clean = %.6f, want %.6f", uc, 1/3.625e-4)
	}
	if us := ServiceU(uc, 3e-5); !within(us, 1/3.925e-4, 1e-14) {
		t.Errorf("U_service = %.6f, want %.6f", us, 1/3.925e-4)
	}
	// Symmetric in the two sides; no fouling leaves U unchanged.
	if a, b := CleanU(5000, 8000, 0.6e-3, 16), CleanU(8000, 5000, 0.6e-3, 16); !within(a, b, 1e-15) {
		t.Errorf("not symmetric: %g %g", a, b)
	}
	if us := ServiceU(uc, 0); !within(us, uc, 1e-15) {
		t.Errorf("zero fouling changed U: %g", us)
	}
}

// demoPlate is the plate of docs/METHOD.md §12's example.
var demoPlate = PlateGeometry{
	ChevronAngle: 60 * deg, PressingDepth: 3e-3, EnlargementFactor: 1.17, ChannelWidth: 0.45,
	PortToPortLength: 0.8, Thickness: 0.6e-3, WallConductivity: 16, PortDiameter: 0.1,
}

func demoPack() PlatePack {
	return PlatePack{Plate: demoPlate, Product: SideLayout{8, 7}, Other: SideLayout{8, 7}, Fouling: 3e-5}
}

// TestHandWorkedChannel follows one side through the correlations for
// water at 60 °C and 101.325 kPa, isothermal (μ_w = μ), in the demo plate:
// φ 60°, b 3 mm, Φ 1.17, w 0.45 m, L_p 0.8 m, d_port 100 mm; 2.8 kg/s in
// 8 passes of 7 channels. Arithmetic by hand-held calculation, checked
// with an independent Python re-implementation.
func TestHandWorkedChannel(t *testing.T) {
	// Water at 60 °C (python3-iapws 1.5.2, IAPWS97(T=333.15, P=0.101325)):
	//   ρ = 983.210610 kg/m³, cp = 4182.76355 J/(kg·K),
	//   k = 0.65101796 W/(m·K), μ = 4.66043208e-4 Pa·s.
	st := PackStream{Fluid: WaterFluid{}, MassFlow: 2.8, In: 60, Out: 60}
	var s SideRating
	if err := s.bulk(demoPlate, SideLayout{8, 7}, st); err != nil {
		t.Fatal(err)
	}
	s.transfer(demoPlate)
	s.pressureDrop(demoPlate, SideLayout{8, 7})
	steps := []struct {
		what      string
		got, want float64
		tol       float64 // relative
	}{
		{"ρ", s.Density, 983.210610, 1e-9},
		{"cp", s.SpecificHeat, 4182.76355, 1e-9},
		{"k", s.Conductivity, 0.65101796, 1e-8},
		{"μ", s.Viscosity, 4.66043208e-4, 1e-8},
		// d_h = 2b/Φ = 2 × 0.003 / 1.17 = 0.00512821 m
		{"d_h", demoPlate.HydraulicDiameter(), 0.00512820513, 1e-9},
		// v = ṁ/(n ρ b w) = 2.8 / (7 × 983.2106 × 0.003 × 0.45) = 2.8 / 9.291340 = 0.3013559 m/s
		{"v", s.Velocity, 0.3013559, 3e-7},
		// γ̇_w = 6v/b (n = 1) = 6 × 0.3013559 / 0.003 = 602.712 1/s
		{"γ̇_w", s.ShearRate, 602.712, 1e-6},
		// Re = ρ v d_h/μ = 983.2106 × 0.3013559 × 0.00512821 / 4.660432e-4 = 3260.36
		{"Re", s.Reynolds, 3260.36, 2e-6},
		// Pr = cp μ/k = 4182.764 × 4.660432e-4 / 0.651018 = 2.99431
		{"Pr", s.Prandtl, 2.99431, 2e-6},
		// Re ≥ 2000: log₁₀ Re = 3.513265; ξ₀ = (1.8 × 3.513265 − 1.5)⁻² = 4.823878⁻² = 0.0429742;
		//   ξ₁ = 39 × 3260.36^−0.289 = 3.764705
		// 0.18 tan 60° + 0.36 sin 60° + ξ₀/cos 60° = 0.311769 + 0.311769 + 0.085948 = 0.709487
		// 1/√ξ = 0.5/√0.709487 + 0.5/√(3.8 × 3.764705) = 0.593605 + 0.132194 = 0.725800
		// ξ = 0.725800⁻² = 1.898306
		{"ξ", s.Darcy, 1.898306, 1e-6},
		// ξ Re² sin 120° = 1.898306 × 3260.36² × 0.866025 = 1.747543e7; (…)^0.374 = 511.2908
		// Nu = 0.122 × 2.99431^(1/3) × 1 × 511.2908 = 0.122 × 1.441337 × 511.2908 = 89.9070
		{"Nu", s.Nusselt, 89.9070, 2e-6},
		// h = Nu k/d_h = 89.9070 × 0.651018 / 0.00512821 = 11413.55 W/(m²·K)
		{"h", s.H, 11413.55, 1e-6},
		// Δp_channel = ξ (8 × 0.8/0.00512821) ρv²/2 = 1.898306 × 1248 × 44.64532 = 105768.6 Pa
		{"Δp channel", s.ChannelPressureDrop, 105768.6, 1e-6},
		// v_port = (2.8/983.2106)/(π 0.1²/4) = 0.3625948 m/s;
		// Δp_port = 1.4 × 8 × 983.2106 × 0.3625948²/2 = 723.899 Pa
		{"v_port", s.PortVelocity, 0.3625948, 3e-7},
		{"Δp port", s.PortPressureDrop, 723.899, 1e-6},
		{"Δp", s.PressureDrop, 105768.6 + 723.899, 1e-6},
	}
	for _, c := range steps {
		if !within(c.got, c.want, c.tol) {
			t.Errorf("%s = %.9g, want %.9g (±%g relative)", c.what, c.got, c.want, c.tol)
		}
	}
}

func TestThermalPlates(t *testing.T) {
	tests := []struct {
		name           string
		product, other SideLayout
		want           int
	}{
		// 2·passes·channels − 1 = 2 × 8 × 7 − 1 (docs/METHOD.md §12).
		{"8×7 both sides", SideLayout{8, 7}, SideLayout{8, 7}, 111},
		{"1×1 both sides", SideLayout{1, 1}, SideLayout{1, 1}, 1},
		// 10 + 9 alternating channels: 18 plates between neighbours.
		{"10 and 9 channels", SideLayout{1, 10}, SideLayout{1, 9}, 18},
		{"2×5 and 3×3", SideLayout{2, 5}, SideLayout{3, 3}, 18},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := PlatePack{Plate: demoPlate, Product: tc.product, Other: tc.other}
			if err := p.Validate(); err != nil {
				t.Fatal(err)
			}
			if got := p.ThermalPlates(); got != tc.want {
				t.Errorf("%d thermal plates, want %d", got, tc.want)
			}
		})
	}
}

func TestPackValidate(t *testing.T) {
	tests := []struct {
		name   string
		change func(*PlatePack)
		field  PackField
	}{
		{"angle 90°", func(p *PlatePack) { p.Plate.ChevronAngle = 90 * deg }, FieldChevronAngle},
		{"angle 0", func(p *PlatePack) { p.Plate.ChevronAngle = 0 }, FieldChevronAngle},
		{"angle NaN", func(p *PlatePack) { p.Plate.ChevronAngle = math.NaN() }, FieldChevronAngle},
		{"depth 0", func(p *PlatePack) { p.Plate.PressingDepth = 0 }, FieldPressingDepth},
		{"Φ below 1", func(p *PlatePack) { p.Plate.EnlargementFactor = 0.9 }, FieldEnlargementFactor},
		{"Φ typo 11.7", func(p *PlatePack) { p.Plate.EnlargementFactor = 11.7 }, FieldEnlargementFactor},
		{"width negative", func(p *PlatePack) { p.Plate.ChannelWidth = -0.45 }, FieldChannelWidth},
		{"length infinite", func(p *PlatePack) { p.Plate.PortToPortLength = math.Inf(1) }, FieldPortToPortLength},
		{"thickness 0", func(p *PlatePack) { p.Plate.Thickness = 0 }, FieldThickness},
		{"conductivity 0", func(p *PlatePack) { p.Plate.WallConductivity = 0 }, FieldWallConductivity},
		{"port 0", func(p *PlatePack) { p.Plate.PortDiameter = 0 }, FieldPortDiameter},
		{"fouling negative", func(p *PlatePack) { p.Fouling = -1e-5 }, FieldFouling},
		{"product passes 0", func(p *PlatePack) { p.Product.Passes = 0 }, FieldProductPasses},
		{"product channels 0", func(p *PlatePack) { p.Product.ChannelsPerPass = 0 }, FieldProductChannelsPerPass},
		{"other passes 0", func(p *PlatePack) { p.Other.Passes = 0 }, FieldOtherPasses},
		{"other channels −1", func(p *PlatePack) { p.Other.ChannelsPerPass = -1 }, FieldOtherChannelsPerPass},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := demoPack()
			tc.change(&p)
			var ve *PackValueError
			err := p.Validate()
			if !errors.As(err, &ve) || ve.Field != tc.field {
				t.Fatalf("error %v, want a PackValueError on %s", err, tc.field)
			}
			if !strings.Contains(err.Error(), tc.field.String()) {
				t.Errorf("message %q does not name %q", err, tc.field)
			}
		})
	}
	// The angle is reported in degrees as well.
	p := demoPack()
	p.Plate.ChevronAngle = 95 * deg
	if err := p.Validate(); err == nil || !strings.Contains(err.Error(), "95°") {
		t.Errorf("angle message: %v", err)
	}
	// Enlargement factor bounds are inclusive.
	for _, phi := range []float64{1, 2} {
		p := demoPack()
		p.Plate.EnlargementFactor = phi
		if err := p.Validate(); err != nil {
			t.Errorf("Φ %g refused: %v", phi, err)
		}
	}
	// Channels that cannot alternate: 8×7 = 56 against 8×6 = 48.
	p = demoPack()
	p.Other.ChannelsPerPass = 6
	var le *LayoutError
	if err := p.Validate(); !errors.As(err, &le) || le.Product.Channels() != 56 || le.Other.Channels() != 48 {
		t.Errorf("layout error %v", err)
	}
}

func TestCorrelationPanics(t *testing.T) {
	// Caller bugs panic with the package prefix.
	for name, f := range map[string]func(){
		"Re 0":          func() { DarcyMartinVDI(0, 45*deg) },
		"φ 90°":         func() { DarcyMartin1999(1000, 90*deg) },
		"Pr 0":          func() { NusseltMartin(1000, 0, 1, 45*deg, 1) },
		"h 0":           func() { CleanU(0, 1000, 1e-3, 16) },
		"fouling −1":    func() { ServiceU(1000, -1) },
		"shear v 0":     func() { SlitWallShearRate(0, 3e-3, 1) },
		"power-law K 0": func() { PowerLawViscosity(0, 0.5, 10) },
	} {
		t.Run(name, func(t *testing.T) {
			defer func() {
				r := recover()
				if s, ok := r.(string); !ok || !strings.HasPrefix(s, panicPrefix) {
					t.Errorf("recovered %v, want a panic starting %q", r, panicPrefix)
				}
			}()
			f()
		})
	}
}
