package props

import (
	"math"
	"testing"
)

func TestIF97Region1Table5(t *testing.T) {
	// Expected values: IAPWS R7-97(2012), Table 5 (verification values for region 1).
	tests := []struct {
		name     string
		T, p     float64 // K, Pa
		v, h, cp float64 // m³/kg, J/kg, J/(kg·K); 0 = not tabulated here
	}{
		{"300 K 3 MPa", 300, 3e6, 0.100215168e-2, 115.331273e3, 4.17301218e3},
		{"300 K 80 MPa", 300, 80e6, 0.971180894e-3, 184.142828e3, 4.01008987e3},
		{"500 K 3 MPa", 500, 3e6, 0.120241800e-2, 975.542239e3, 4.65580682e3},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			w, err := IF97Region1(tc.T, tc.p)
			if err != nil {
				t.Fatal(err)
			}
			// Table 5 prints nine significant digits.
			for _, c := range []struct {
				what      string
				got, want float64
			}{{"v", w.SpecificVolume, tc.v}, {"h", w.Enthalpy, tc.h}, {"cp", w.Cp, tc.cp}} {
				if math.Abs(c.got-c.want) > 1e-8*math.Abs(c.want) {
					t.Errorf("%s = %.10g, want %.10g", c.what, c.got, c.want)
				}
			}
		})
	}
}

func TestSaturationPressure(t *testing.T) {
	// IAPWS R7-97(2012), Table 35: p_s(300 K) = 0.353658941e-2 MPa,
	// p_s(500 K) = 0.263889776e1 MPa, p_s(600 K) = 0.123443146e2 MPa.
	for _, c := range []struct{ T, want float64 }{{300, 0.353658941e4}, {500, 0.263889776e7}, {600, 0.123443146e8}} {
		if got := SaturationPressure(c.T); math.Abs(got-c.want) > 1e-8*c.want {
			t.Errorf("p_s(%g K) = %.10g Pa, want %.10g", c.T, got, c.want)
		}
	}
}

func TestWaterAtMediumConditions(t *testing.T) {
	// Computed with Debian's python3-iapws 1.5.2:
	//   from iapws.iapws97 import _Region1; r = _Region1(T, P)
	// at 0.101325 MPa for 20 °C and 80 °C, and at 1.01·p_sat for 120 °C.
	tests := []struct {
		tempC, rho, cp float64
	}{
		{20, 998.2060925, 4184.794095},
		{80, 971.8028996, 4195.515554},
		{120, 943.1066716, 4246.365635},
	}
	for _, tc := range tests {
		w, err := Water(tc.tempC)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(w.Density-tc.rho) > 1e-6*tc.rho || math.Abs(w.Cp-tc.cp) > 1e-6*tc.cp {
			t.Errorf("%g °C: rho %.7f cp %.6f, want %.7f %.6f", tc.tempC, w.Density, w.Cp, tc.rho, tc.cp)
		}
	}
	if _, err := IF97Region1(200, 1e5); err == nil {
		t.Error("ice accepted")
	}
	if _, err := IF97Region1(450, 1e5); err == nil {
		t.Error("steam at 1 bar accepted as liquid")
	}
}

func TestWaterPressureSensitivity(t *testing.T) {
	// docs/METHOD.md §3.1 (Pressure used) quotes how much one more MPa above
	// the tool's medium pressure changes liquid water. Computed with Debian's
	// python3-iapws 1.5.2 at each whole °C from 1 to 120:
	//   from iapws.iapws97 import _Region1, _PSat_T
	//   p = 0.101325, or max(p, 1.01·_PSat_T(T)) above 99 °C (MPa)
	//   a, b = _Region1(T, p), _Region1(T, p + 1)
	//   ρ: a['v']/b['v'] − 1;  c_p: b['cp']/a['cp'] − 1
	// Over that range ρ rises 0.044–0.053 % and c_p falls 0.052–0.114 % per
	// MPa; the cases below are the ends of both ranges.
	for _, c := range []struct {
		tempC, rho, cp float64
	}{
		{1, 5.045014e-04, -1.142005e-03},   // c_p's largest change
		{40, 4.405532e-04, -5.884180e-04},  // ρ's smallest
		{72, 4.513587e-04, -5.212208e-04},  // near c_p's smallest
		{120, 5.297267e-04, -6.004811e-04}, // ρ's largest (at 1.01·p_s)
	} {
		p := MediumPressure(c.tempC)
		a, err := IF97Region1(c.tempC+273.15, p)
		if err != nil {
			t.Fatal(err)
		}
		b, err := IF97Region1(c.tempC+273.15, p+1e6)
		if err != nil {
			t.Fatal(err)
		}
		if rho, cp := b.Density/a.Density-1, b.Cp/a.Cp-1; math.Abs(rho-c.rho) > 1e-4*math.Abs(c.rho) || math.Abs(cp-c.cp) > 1e-4*math.Abs(c.cp) {
			t.Errorf("%g °C: ρ %+.6e, c_p %+.6e per MPa; want %+.6e, %+.6e", c.tempC, rho, cp, c.rho, c.cp)
		}
	}
}

func TestViscosityIAPWS2008(t *testing.T) {
	// IAPWS R12-08, Table 4 (verification values without critical enhancement):
	// 298.15 K, 998 kg/m³: 889.735100 µPa·s; 373.15 K, 1000 kg/m³: 307.883622 µPa·s.
	for _, c := range []struct{ T, rho, want float64 }{
		{298.15, 998, 889.735100e-6},
		{373.15, 1000, 307.883622e-6},
	} {
		// Table 4 prints nine significant digits.
		if got := ViscosityIAPWS2008(c.T, c.rho); math.Abs(got-c.want) > 2e-9*c.want {
			t.Errorf("μ(%g K, %g kg/m³) = %.9g, want %.9g", c.T, c.rho, got, c.want)
		}
	}
	// At 1 atm and 20 °C: 1.0016 mPa·s (computed with python3-iapws 1.5.2:
	// _Viscosity(1/_Region1(293.15, 0.101325)["v"], 293.15)).
	if mu, err := WaterViscosity(20); err != nil || math.Abs(mu-1.0016e-3) > 0.0001e-3 {
		t.Errorf("water at 20 °C: %g %v", mu, err)
	}
}
