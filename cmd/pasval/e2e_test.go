package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"

	"pasval/internal/units"
)

const demoDir = "../../testdata/demo"

var binPath string

// TestMain builds the pasval binary once so that end-to-end tests run it as a
// user would. testscript also runs this test binary as the pasval command in
// its scripts (testdata/script): then no binary is built.
func TestMain(m *testing.M) {
	// Today is the golden outputs' record date for every command (and the
	// binary the tests build), so that acceptance tests keep their due states.
	os.Setenv("SOURCE_DATE_EPOCH", testEpoch)
	testscript.Main(withBinary{m}, map[string]func(){
		"pasval": func() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) },
	})
}

// testEpoch is 2026-12-01T00:00:00Z (recordDay), in seconds since 1970.
const testEpoch = "1796083200"

// withBinary runs the tests with the binary built.
type withBinary struct{ m *testing.M }

func (w withBinary) Run() int {
	dir, err := os.MkdirTemp("", "pasval-e2e")
	if err != nil {
		panic(err)
	}
	defer os.RemoveAll(dir)
	binPath = filepath.Join(dir, "pasval")
	if out, err := exec.Command("go", "build", "-o", binPath, ".").CombinedOutput(); err != nil {
		os.Stderr.Write(out)
		return 2
	}
	return w.m.Run()
}

func runBinary(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	cmd := exec.Command(binPath, args...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	err := cmd.Run()
	code := 0
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return out.String(), errb.String(), code
}

type jsonResult struct {
	InputSHA256 string `json:"input_sha256"`
	Sections    []struct {
		Name, Stage, Mode  string
		DutyKW             float64 `json:"duty_kW"`
		LMTDK              float64 `json:"lmtd_K"`
		NTU, Effectiveness float64
		AreaM2             float64 `json:"area_m2"`
		Plates             int
		ProductIn          float64 `json:"product_in_C"`
		ProductOut         float64 `json:"product_out_C"`
		OtherIn            float64 `json:"other_in_C"`
		OtherOut           float64 `json:"other_out_C"`
		U                  float64 `json:"u_W_m2K"`
		// A plate pack's figures, when the section has one.
		UClean          *float64 `json:"u_clean_W_m2K"`
		UService        *float64 `json:"u_service_W_m2K"`
		HProduct        *float64 `json:"h_product_W_m2K"`
		HOther          *float64 `json:"h_other_W_m2K"`
		ReProduct       *float64 `json:"reynolds_product"`
		ReOther         *float64 `json:"reynolds_other"`
		VProduct        *float64 `json:"velocity_product_m_s"`
		VOther          *float64 `json:"velocity_other_m_s"`
		DpProductKPa    *float64 `json:"pressure_drop_product_kPa"`
		DpOtherKPa      *float64 `json:"pressure_drop_other_kPa"`
		PassesProduct   *int     `json:"passes_product"`
		ChannelsProduct *int     `json:"channels_per_pass_product"`
		PassesOther     *int     `json:"passes_other"`
		ChannelsOther   *int     `json:"channels_per_pass_other"`
	} `json:"sections"`
	RegenerationRatio *float64 `json:"regeneration_ratio"`
	Checks            []struct {
		ID   string
		Pass bool
	}
	Pass bool
}

func checkJSON(t *testing.T, path string) (jsonResult, int) {
	t.Helper()
	out, errs, code := runBinary(t, "check", "--json", path)
	var r jsonResult
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%s: %v\nstdout %q\nstderr %q", path, err, out, errs)
	}
	return r, code
}

func TestDemoMilkSI(t *testing.T) {
	// Expected values are worked by hand from the plant file (docs/METHOD.md §2, §6, §12 conventions):
	// C = 10 000 L/h × 1.031 kg/L × 3930 J/(kg·K) / 3600 s/h = 11 254.90 W/K.
	// The regenerator is rated from its layout: 8 passes × 7 channels a side give
	// 8·7 + 8·7 − 1 = 111 plates, 111 × 0.42 m² = 46.62 m². With the U the plate
	// pack gives (checked against the independent reference in reference_test.go),
	// NTU = U·46.62/C and the ratio is ε = NTU/(1 + NTU) at C_r = 1; the raw side
	// leaves at 5 + ratio·67.5 °C, the pasteurized side at 72.5 − ratio·67.5 °C.
	path := filepath.Join(demoDir, "htst-milk-si.yaml")
	r, code := checkJSON(t, path)
	if code != 0 || !r.Pass {
		t.Fatalf("exit %d pass %v", code, r.Pass)
	}
	c := 10000.0 / 3600 * 1.031 * 3930
	rg := r.Sections[0]
	ntu := rg.U * 46.62 / c
	ratio := ntu / (1 + ntu)
	rawOut, pastOut := 5+ratio*67.5, 72.5-ratio*67.5
	for _, v := range []struct {
		what      string
		got, want float64
	}{
		{"NTU", rg.NTU, ntu},
		{"ratio", *r.RegenerationRatio, ratio},
		{"raw out", rg.ProductOut, rawOut},
		{"pasteurized out", rg.OtherOut, pastOut},
		{"area", rg.AreaM2, 46.62},
		{"duty", rg.DutyKW, c * ratio * 67.5 / 1e3},
		// Heat loss in the holding tube (docs/METHOD.md §8): the heater delivers the tube inlet at the
		// normal rate, 20 + 52.5·exp(12·π·0.0508·34/(ṁ·cp)) °C, ṁ = 10 000 L/h × 1.031 kg/L.
		{"heating duty", r.Sections[1].DutyKW, c * (20 + 52.5*math.Exp(12*math.Pi*0.0508*34/c) - rawOut) / 1e3},
		{"cooling duty", r.Sections[2].DutyKW, c * (pastOut - 4) / 1e3},
		// Heating keeps its entered U with fouling: 1/(1/3800 + 0.00003) W/(m²·K).
		{"heating U", r.Sections[1].U, 1 / (1.0/3800 + 3e-5)},
	} {
		if math.Abs(v.got-v.want) > 1e-9*math.Max(1, math.Abs(v.want)) {
			t.Errorf("%s = %.12g, want %.12g", v.what, v.got, v.want)
		}
	}
	// The layout (8 × 7 a side) asked for about 92 %; a ratio far from it
	// means U went wrong.
	if rg.Plates != 111 || math.Abs(ratio-0.92) > 0.005 {
		t.Errorf("regeneration plates %d, ratio %.4f; want 111 and about 0.92", rg.Plates, ratio)
	}
	// Heating is sized: 5 + 6 channels a pass, so P passes give 11P − 1 plates,
	// the fewest covering the required area.
	h := r.Sections[1]
	if h.PassesProduct == nil || *h.PassesProduct != *h.PassesOther || h.Plates != 11**h.PassesProduct-1 ||
		float64(h.Plates)*0.42 < h.AreaM2 || float64(h.Plates-11)*0.42 >= h.AreaM2 {
		t.Errorf("heating: %d plates for %g m², passes %v", h.Plates, h.AreaM2, h.PassesProduct)
	}
	// Text output: tables, ratio and the caution; exit 0.
	out, _, code := runBinary(t, "check", path)
	for _, want := range []string{"regeneration", "heating", "cooling: chilled water", "Regeneration ratio  92.0 %", "Caution:", "never replaces"} {
		if !strings.Contains(out, want) {
			t.Errorf("text output lacks %q", want)
		}
	}
	if code != 0 {
		t.Errorf("exit %d", code)
	}
}

func TestDemoCiderUS(t *testing.T) {
	// Rated line in US units. Regeneration: 40 plates × 2.7 ft² × 520 Btu/(h·ft²·°F)
	// on C = 18 gpm × 65.2 lb/ft³ × 0.91 Btu/(lb·°F): NTU = UA/C, ratio = NTU/(1+NTU)
	// (C_r = 1, docs/METHOD.md §6.2), computed below from exact NIST SP 811 factors.
	path := filepath.Join(demoDir, "cider-us.yaml")
	r, code := checkJSON(t, path)
	if code != 0 || !r.Pass || len(r.Checks) != 4 {
		t.Fatalf("exit %d pass %v checks %v", code, r.Pass, r.Checks)
	}
	c := units.ToSI(18, units.VolumeFlow, "gpm") * units.ToSI(65.2, units.Density, "lb/ft3") * units.ToSI(0.91, units.SpecificHeat, "Btu/(lb*°F)")
	ua := 40 * units.ToSI(2.7, units.Area, "ft2") * units.ToSI(520, units.HeatTransferCoefficient, "Btu/(h*ft2*°F)")
	ntu := ua / c
	if want := ntu / (1 + ntu); math.Abs(*r.RegenerationRatio-want) > 1e-12 {
		t.Errorf("ratio %.12g, want %.12g", *r.RegenerationRatio, want)
	}
	var ids []string
	for _, c := range r.Checks {
		ids = append(ids, c.ID)
	}
	if !reflect.DeepEqual(ids, []string{"tube-slope", "log-reduction", "heating-medium", "cooling-outlet"}) {
		t.Errorf("checks %v", ids)
	}
	out, _, _ := runBinary(t, "check", path)
	for _, want := range []string{"°F", "Btu/h", "ft²", "in/ft", "Result: PASS, all 4 checks pass"} {
		if !strings.Contains(out, want) {
			t.Errorf("US text output lacks %q", want)
		}
	}
	// --units si switches the display only.
	out, _, _ = runBinary(t, "check", "--units", "si", path)
	if !strings.Contains(out, "Temperatures (°C)") || !strings.Contains(out, "raw 4.4 °C") || strings.Contains(out, "Btu/h") {
		t.Errorf("--units si output still in °F")
	}
}

func TestFailingCheckExitsOne(t *testing.T) {
	// The cider demo with its hot water limited to 160 °F cannot reach the 161 °F
	// setpoint with any plates: the heating-medium check fails, exit 1.
	data, err := os.ReadFile(filepath.Join(demoDir, "cider-us.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	s := strings.Replace(string(data), "medium_inlet: 180 °F", "medium_inlet: 165 °F", 1)
	p := filepath.Join(t.TempDir(), "cold-hot-set.yaml")
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, code := runBinary(t, "check", p)
	if code != 1 || !regexp.MustCompile(`heating-medium +FAIL`).MatchString(out) || !strings.Contains(out, "Result: FAIL, 1 of 4") || !strings.Contains(out, "Caution:") {
		t.Errorf("exit %d, output:\n%s", code, out)
	}
}

// flatten collects every number in a JSON document by path.
func flatten(prefix string, v any, out map[string]float64) {
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			flatten(prefix+"."+k, e, out)
		}
	case []any:
		for i, e := range x {
			flatten(prefix+"["+strconv.Itoa(i)+"]", e, out)
		}
	case float64:
		out[prefix] = x
	}
}

func TestSIAndUSGiveTheSameNumbers(t *testing.T) {
	// testdata/equivalence/htst-milk-us.yaml is the SI demo converted with exact
	// NIST SP 811 factors; every JSON number must agree to 1e-9 relative.
	get := func(path string) map[string]float64 {
		out, errs, code := runBinary(t, "check", "--json", path)
		if code != 0 {
			t.Fatalf("%s: exit %d %s", path, code, errs)
		}
		var v any
		if err := json.Unmarshal([]byte(out), &v); err != nil {
			t.Fatal(err)
		}
		m := map[string]float64{}
		flatten("", v, m)
		return m
	}
	si := get(filepath.Join(demoDir, "htst-milk-si.yaml"))
	us := get("../../testdata/equivalence/htst-milk-us.yaml")
	if len(si) < 40 || len(si) != len(us) {
		t.Fatalf("%d numbers in SI, %d in US", len(si), len(us))
	}
	for k, a := range si {
		b, ok := us[k]
		if !ok {
			t.Errorf("%s missing in US output", k)
			continue
		}
		if math.Abs(a-b) > 1e-9*math.Max(1e-6, math.Abs(a)) {
			t.Errorf("%s: SI %.15g, US %.15g", k, a, b)
		}
	}
}

func TestHelpForEveryCommand(t *testing.T) {
	// Every command's help parses (so clashing flags fail the build) and has
	// examples and the exit-status section.
	root := newRootCmd(&bytes.Buffer{}, &bytes.Buffer{})
	for _, c := range root.Commands() {
		if c.Name() == "help" || c.Name() == "completion" {
			continue
		}
		var out, errb bytes.Buffer
		if code := run([]string{c.Name(), "--help"}, &out, &errb); code != 0 {
			t.Errorf("%s --help: exit %d %s", c.Name(), code, errb.String())
		}
		for _, want := range []string{"Usage:", "Examples:", "Exit status:"} {
			if !strings.Contains(out.String(), want) {
				t.Errorf("%s --help lacks %q", c.Name(), want)
			}
		}
	}
	var out bytes.Buffer
	if code := run([]string{"--version"}, &out, &bytes.Buffer{}); code != 0 || !strings.HasPrefix(out.String(), "pasval ") {
		t.Errorf("--version: %d %q", code, out.String())
	}
}

func TestStarterFilesCheck(t *testing.T) {
	// The starter files of 'pasval init' are valid plant files as written.
	for _, u := range []string{"si", "us"} {
		var out, errb bytes.Buffer
		if code := run([]string{"init", "--units", u}, &out, &errb); code != 0 {
			t.Fatalf("init %s: %d", u, code)
		}
		if !strings.HasPrefix(out.String(), "# yaml-language-server: $schema=pasval-plant.schema.json\n# pasval plant file") {
			t.Errorf("init %s output starts %q", u, out.String()[:40])
		}
		p := filepath.Join(t.TempDir(), "starter.yaml")
		if err := os.WriteFile(p, out.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		out.Reset()
		if code := run([]string{"check", p}, &out, &errb); code != 0 {
			t.Errorf("starter %s: exit %d %s", u, code, errb.String())
		}
	}
}

func BenchmarkCheckDemo(b *testing.B) {
	// Parse, validate, compute and format the SI demo, as 'pasval check' does.
	path := filepath.Join(demoDir, "htst-milk-si.yaml")
	for b.Loop() {
		var out bytes.Buffer
		if code := run([]string{"check", path}, &out, &out); code != 0 {
			b.Fatal(out.String())
		}
	}
}

func writeFile(t *testing.T, path, content string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
}
