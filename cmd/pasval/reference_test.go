package main

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// TestAgainstReferenceScript compares the demos with an independent
// computation: testdata/reference/line_reference.py, written from the
// textbook relations with water properties from Debian's python3-iapws
// (IAPWS-IF97), and the SI demo's plate packs with plate_pack.py (Martin's
// correlation, docs/METHOD.md §12). CI installs python3-iapws; elsewhere the
// test is skipped when it is missing.
func TestAgainstReferenceScript(t *testing.T) {
	py := "/usr/bin/python3"
	script := "../../testdata/reference/line_reference.py"
	if err := exec.Command(py, "-c", "import iapws").Run(); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("python3-iapws is required in CI: %v", err)
		}
		t.Skip("python3-iapws not installed (apt-get install python3-iapws)")
	}
	raw, err := exec.Command(py, script).Output()
	if err != nil {
		t.Fatal(err)
	}
	var ref map[string]map[string]map[string]float64
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	for demo, sections := range ref {
		r, _ := checkJSON(t, filepath.Join(demoDir, demo+".yaml"))
		for _, s := range r.Sections {
			label := s.Name
			if s.Stage != "" && demo == "cider-us" {
				label = s.Name + ": " + s.Stage
			}
			want, ok := sections[label]
			if !ok {
				t.Errorf("%s: no reference for %s", demo, label)
				continue
			}
			// Map the reference's hot/cold sides to pasval's product/other sides.
			got := map[string]float64{"duty_W": s.DutyKW * 1e3, "lmtd_K": s.LMTDK, "area_m2": s.AreaM2,
				"ntu": s.NTU, "eff": s.Effectiveness, "plates": float64(s.Plates), "u": s.U}
			if s.UClean != nil {
				for k, v := range map[string]float64{"u_clean": *s.UClean, "u_service": *s.UService, "h_p": *s.HProduct, "h_o": *s.HOther,
					"re_p": *s.ReProduct, "re_o": *s.ReOther, "v_p": *s.VProduct, "v_o": *s.VOther,
					"dp_p": *s.DpProductKPa * 1e3, "dp_o": *s.DpOtherKPa * 1e3} {
					got[k] = v
				}
			}
			switch s.Name {
			case "regeneration", "heating":
				got["cold_in"], got["cold_out"], got["hot_in"], got["hot_out"] = s.ProductIn, s.ProductOut, s.OtherIn, s.OtherOut
			default:
				got["hot_in"], got["hot_out"], got["cold_in"], got["cold_out"] = s.ProductIn, s.ProductOut, s.OtherIn, s.OtherOut
			}
			for k, w := range want {
				g, ok := got[k]
				if !ok {
					t.Errorf("%s %s: no pasval value for the reference's %s", demo, label, k)
					continue
				}
				if math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
					t.Errorf("%s %s %s: pasval %.12g, reference %.12g", demo, label, k, g, w)
				}
			}
		}
	}
}

// TestMarginsAgainstNumPy compares pasval margins on the SI demo with an
// independent vectorised computation, testdata/reference/margins_numpy.py
// (Debian's python3-numpy): fed pasval's own samples (--dump-samples), every
// outcome agrees to 1e-9 and no verdict differs; with its own random draws,
// every probability lies within four standard errors of pasval's and the
// percentiles within 1 %. CI installs python3-numpy; elsewhere the test is
// skipped when it is missing.
func TestMarginsAgainstNumPy(t *testing.T) {
	py := "/usr/bin/python3"
	script := "../../testdata/reference/margins_numpy.py"
	if err := exec.Command(py, "-c", "import numpy").Run(); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("python3-numpy is required in CI: %v", err)
		}
		t.Skip("python3-numpy not installed (apt-get install python3-numpy)")
	}
	demo := filepath.Join(demoDir, "htst-milk-si.yaml")
	dump := filepath.Join(t.TempDir(), "samples.csv")
	if _, errs, code := runBinary(t, "margins", demo, "--samples", "20000", "--dump-samples", dump); code != 0 {
		t.Fatalf("margins: exit %d %s", code, errs)
	}
	raw, err := exec.Command(py, script, "--check-dump", dump).Output()
	if err != nil {
		t.Fatal(err)
	}
	var same struct {
		Samples         int     `json:"samples"`
		MaxRelative     float64 `json:"max_relative_difference"`
		VerdictsDiffing int     `json:"verdicts_differing"`
	}
	if err := json.Unmarshal(raw, &same); err != nil {
		t.Fatal(err)
	}
	if same.Samples != 20000 || !(same.MaxRelative <= 1e-9) || same.VerdictsDiffing != 0 {
		t.Errorf("on pasval's samples the reference differs: %+v", same)
	}
	out, _, _ := runBinary(t, "margins", demo, "--json")
	var ours struct {
		MonteCarlo struct {
			Checks []struct {
				ID            string  `json:"id"`
				Organism      string  `json:"organism"`
				Probability   float64 `json:"probability"`
				StandardError float64 `json:"standard_error"`
			} `json:"checks"`
			MinResidence map[string]float64            `json:"min_residence_s"`
			LogReduction map[string]map[string]float64 `json:"log_reduction_by_organism"`
		} `json:"monte_carlo"`
	}
	if err := json.Unmarshal([]byte(out), &ours); err != nil {
		t.Fatal(err)
	}
	raw, err = exec.Command(py, script, "--samples", "100000").Output()
	if err != nil {
		t.Fatal(err)
	}
	var theirs struct {
		Checks []struct {
			Check         string  `json:"check"`
			Probability   float64 `json:"probability"`
			StandardError float64 `json:"standard_error"`
		} `json:"checks"`
		MinResidence map[string]float64            `json:"min_residence_s"`
		LogReduction map[string]map[string]float64 `json:"log_reduction_by_organism"`
	}
	if err := json.Unmarshal(raw, &theirs); err != nil {
		t.Fatal(err)
	}
	if len(theirs.Checks) != len(ours.MonteCarlo.Checks) {
		t.Fatalf("%d checks against %d", len(theirs.Checks), len(ours.MonteCarlo.Checks))
	}
	for i, c := range ours.MonteCarlo.Checks {
		label := c.ID
		if c.Organism != "" {
			label += " (" + c.Organism + ")"
		}
		r := theirs.Checks[i]
		se := math.Hypot(c.StandardError, r.StandardError)
		if r.Check != label || math.Abs(c.Probability-r.Probability) > 4*se+1e-12 {
			t.Errorf("%s: pasval %.5f, reference (%s) %.5f, 4 SE = %.5f", label, c.Probability, r.Check, r.Probability, 4*se)
		}
	}
	for _, q := range []string{"p01", "p05", "p50"} {
		if a, b := ours.MonteCarlo.MinResidence[q], theirs.MinResidence[q]; math.Abs(a-b) > 0.01*b {
			t.Errorf("fastest particle %s: pasval %.4f, reference %.4f", q, a, b)
		}
		for name, p := range theirs.LogReduction {
			if a, b := ours.MonteCarlo.LogReduction[name][q], p[q]; math.Abs(a-b) > 0.01*b {
				t.Errorf("%s %s: pasval %.4f, reference %.4f", name, q, a, b)
			}
		}
	}
}
