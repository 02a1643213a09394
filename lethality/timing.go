package lethality

import "fmt"

// A holding-time test times the fastest particle through the tube as built
// (salt or dye, usually with water). The measured time fixes the hold-up the
// fastest particle sees; the product, with its own velocity profile, moves
// through that hold-up at its own fastest-to-mean ratio
// (docs/METHOD.md §15.2, holding-time test against the model).

// TimingTest is a measured fastest-particle time through the tube.
type TimingTest struct {
	// Flow is the volumetric flow during the test (m³/s), with the tested
	// fluid's density (kg/m³) at the test temperature.
	Flow Flow
	// Fluid is the tested fluid's rheology at the test temperature (water:
	// Newtonian with its viscosity; the product: its own).
	Fluid Rheology
	// Override replaces the tested fluid's fastest-to-mean ratio when > 0
	// (a product test on a plant that enters holding_tube.fastest_to_mean).
	Override float64
	Time     float64 // s, > 0: the measured fastest time
}

// TimedTube is the tube as a test measured it.
type TimedTube struct {
	// Test is the tested fluid's hydraulics at the test flow in the tube as
	// described (its regime and ratio r_test; its times are the model's
	// prediction for that fluid).
	Test Hydraulics
	// Volume is the hold-up the test implies, m³: V_eff = t_meas · r_test · Q_t.
	Volume float64
	// Tube is the described tube with the length that holds Volume in its
	// diameter, L_eff = V_eff/(πD²/4): the model of the tube as measured.
	Tube Tube
}

// Timed is the tube as a timing test measured it:
//
//	V_eff = t_meas · r_test(Q_t) · Q_t        m³
//	L_eff = V_eff / (πD²/4)                  m
//
// r_test is the tested fluid's fastest-to-mean ratio at the test flow in
// this tube's diameter (docs/METHOD.md §7.4: Re with the fluid's density and
// viscosity at the test temperature). The product's fastest time at any flow
// Q is then L_eff/(r_p(Q)·v) (Timed.Tube.Hydraulics), and over every flow up
// to the seal Timed.Tube.WorstFlow: the worst flow does not depend on the
// length, so it is the model's own.
//
// References: docs/METHOD.md §15.2; Dickerson et al. (1968), J. Dairy Sci.
// 51:1731 (water-timed tubes overstate a viscous product's holding time).
func (t Tube) Timed(test TimingTest) TimedTube {
	if !(test.Time > 0) || !(test.Flow.Volumetric > 0) {
		panic(fmt.Sprintf("%sTimed needs a positive time and flow: %+v", panicPrefix, test))
	}
	h := t.Hydraulics(test.Flow, test.Fluid, test.Override)
	vol := test.Time * h.FastestToMean * test.Flow.Volumetric
	timed := t
	timed.Length = vol / t.CrossSection()
	return TimedTube{Test: h, Volume: vol, Tube: timed}
}
