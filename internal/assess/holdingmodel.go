package assess

import (
	"fmt"

	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/lethality"
)

// The holding tube in three named steps, so that a caller can re-run the
// model thousands of times (margins under uncertainty, envelopes) without the
// plant file:
//
//	in := GatherHolding(p, res.Product)   // plant file → plain SI inputs
//	ev, err := EvaluateHolding(in)        // pure: hydraulics, profile, legal, lethality, checks
//	runHolding                            // → the Result's holding tube (JSON contract)

// HoldingInputs are the holding tube's inputs as plain SI scalars. Each names
// the plant-file path it comes from; a zero value means "not given" where the
// comment says so.
type HoldingInputs struct {
	MaxMassFlow float64 // kg/s at the sealed maximum: flow.max_rate (volumetric × product.density)
	MassFlow    float64 // kg/s at the normal rate: flow.rate
	Density     float64 // kg/m³ at the setpoint: product.density, or product.composition (Choi–Okos)
	// SpecificHeat is J/(kg·K): product.specific_heat, or product.composition.
	SpecificHeat float64

	InnerDiameter float64 // m: holding_tube.inner_diameter or holding_tube.sanitary_tube
	OuterDiameter float64 // m: holding_tube.outer_diameter or holding_tube.sanitary_tube; 0 unknown
	Length        float64 // m: holding_tube.length
	Rise          float64 // m: holding_tube.rise
	RiseGiven     bool
	MinSlope      float64 // rise/length: holding_tube.min_slope (default 0.25 in/ft)
	FastestToMean float64 // holding_tube.fastest_to_mean; 0: from the regime

	Setpoint       float64 // °C: process.hold_setpoint
	SensorAccuracy float64 // K: process.sensor_accuracy; 0 not given

	// Viscosity points (product.viscosity[].at, .value) for a Newtonian
	// product, or FlowIndex and Consistency (product.power_law.flow_index,
	// .consistency, Pa·sⁿ) for a power-law one (FlowIndex 0: Newtonian).
	Viscosity              []props.ViscosityPoint
	FlowIndex, Consistency float64

	// Heat loss: holding_tube.ambient (°C) and holding_tube.outer_coefficient
	// (W/(m²·K)); HeatLoss false: an isothermal tube.
	HeatLoss                  bool
	Ambient, OuterCoefficient float64

	Organisms []lethality.Organism // organisms[].D, .D_temperature, .z, .required_log_reduction
	Judged    []bool               // organisms[].required_log_reduction given: a log-reduction check
	Legal     []lethality.LegalRow // legal_minimums[].temperature, .time
	PU        bool                 // holding_tube.pu
}

// GatherHolding reads the holding tube's inputs from a validated plant file;
// pp are the product properties the line uses (mass flows, cp).
func GatherHolding(p *plantfile.Plant, pp ProductProps) HoldingInputs {
	h := p.HoldingTube
	in := HoldingInputs{MaxMassFlow: pp.MaxMassFlow, MassFlow: pp.MassFlow, Density: holdDensity(p, pp), SpecificHeat: pp.SpecificHeat,
		InnerDiameter: h.Inner, OuterDiameter: h.Outer, Length: h.Length.SI, Rise: h.Rise.SI, RiseGiven: h.Rise.Set,
		MinSlope: lethality.DefaultMinSlope, FastestToMean: h.FastestToMean, Setpoint: p.Process.HoldSetpoint.SI,
		HeatLoss: h.OuterCoefficient.Set, Ambient: h.Ambient.SI, OuterCoefficient: h.OuterCoefficient.SI, PU: h.PU}
	if h.MinSlopeSet {
		in.MinSlope = h.MinSlope
	}
	if a := p.Process.SensorAccuracy; a.Set {
		in.SensorAccuracy = a.SI
	}
	if pl := p.Product.PowerLaw; pl != nil {
		in.FlowIndex, in.Consistency = pl.FlowIndex, pl.Consistency.SI
	}
	for _, v := range p.Product.Viscosity {
		in.Viscosity = append(in.Viscosity, props.ViscosityPoint{TempC: v.At.SI, Viscosity: v.Value.SI})
	}
	for _, o := range p.Organisms {
		in.Organisms = append(in.Organisms, lethality.Organism{Name: o.Name, D: o.D.SI, DTemperature: o.DTemperature.SI, Z: o.Z.SI,
			RequiredLogReduction: o.RequiredLogReduction})
		in.Judged = append(in.Judged, o.RequiredSet)
	}
	for _, r := range p.LegalMinimums {
		in.Legal = append(in.Legal, lethality.LegalRow{Temperature: r.Temperature.SI, Time: r.Time.SI})
	}
	return in
}

// HoldingEval is what the holding-tube model gives for one set of inputs.
type HoldingEval struct {
	Tube     lethality.Tube
	Flow     lethality.Flow // at the sealed maximum, at the setpoint's density
	Rheology lethality.Rheology
	Hyd      lethality.Hydraulics
	// Viscosity is μ at the setpoint (Newtonian), Pa·s; Extrapolated when the
	// setpoint lies outside the points (ViscosityLow to ViscosityHigh, °C).
	Viscosity                   float64
	Extrapolated                bool
	ViscosityLow, ViscosityHigh float64

	Judged lethality.Profile // at the sealed maximum: the judged case
	AtRate lethality.Profile // at the normal rate: what the heater must deliver

	Legal       *lethality.LegalVerdict // nil without legal rows
	LogRed      []float64               // per organism, fastest particle
	EquivTime   []float64               // per organism, s at its D_temperature
	PU          float64                 // pasteurization units, when asked for
	Checks      []Check                 // tube-slope, holding-time, log-reduction, in print order
	Warnings    []Warning
	FastestPath float64 // u_max = ratio · v, m/s
}

// HeatLossError is a tube whose heat loss is beyond any real holding tube.
type HeatLossError struct {
	Loss float64 // K between the heater outlet and the setpoint at the normal rate
}

func (e *HeatLossError) Error() string {
	return fmt.Sprintf("with this heat loss the product would have to enter the holding tube %s above the setpoint to leave it "+
		"at the setpoint; a holding tube loses well under %g K: check outer_coefficient, ambient and the flow", kelvins(e.Loss), MaxTubeHeatLoss)
}

// EvaluateHolding runs the holding-tube model: hydraulics at the sealed
// maximum, the temperature profile, the legal table, each organism's log
// reduction and the holding-tube checks. It reads nothing but in, formats
// nothing, and returns a *HeatLossError for an impossible heat loss.
func EvaluateHolding(in HoldingInputs) (HoldingEval, error) {
	ev := HoldingEval{Tube: lethality.Tube{InnerDiameter: in.InnerDiameter, OuterDiameter: in.OuterDiameter, Length: in.Length}}
	if in.RiseGiven {
		ev.Tube.Rise = in.Rise
	}
	ev.Flow = lethality.Flow{Volumetric: in.MaxMassFlow / in.Density, Density: in.Density}
	if in.FlowIndex > 0 {
		ev.Rheology = lethality.PowerLaw{N: in.FlowIndex, K: in.Consistency}
	} else {
		curve, err := props.NewViscosityCurve(in.Viscosity)
		if err != nil { // validation refuses such points, by the same rule
			return ev, err
		}
		ev.Viscosity, ev.Extrapolated = curve.At(in.Setpoint)
		ev.ViscosityLow, ev.ViscosityHigh = curve.Range()
		ev.Rheology = lethality.Newtonian{Viscosity: ev.Viscosity}
		if ev.Extrapolated {
			ev.Warnings = append(ev.Warnings, Warning{Code: WarnViscosityExtrapolated, Field: "product.viscosity",
				Values: map[string]float64{"setpoint_C": in.Setpoint, "lowest_C": ev.ViscosityLow, "highest_C": ev.ViscosityHigh}})
		}
	}
	ev.Hyd = ev.Tube.Hydraulics(ev.Flow, ev.Rheology, in.FastestToMean)
	ev.FastestPath = ev.Hyd.FastestToMean * ev.Hyd.MeanVelocity
	ev.Judged = in.profile(in.Setpoint, in.MaxMassFlow)
	ev.AtRate = in.profile(in.Setpoint, in.MassFlow)
	if loss := ev.AtRate.Inlet() - in.Setpoint; !(loss <= MaxTubeHeatLoss) {
		return ev, &HeatLossError{Loss: loss}
	}
	if ev.Hyd.Regime != lethality.Turbulent {
		ev.Warnings = append(ev.Warnings, Warning{Code: WarnLaminarFlow,
			Values: map[string]float64{"reynolds": ev.Hyd.Reynolds, "fastest_to_mean": ev.Hyd.FastestToMean}})
	}
	if in.RiseGiven {
		ev.Checks = append(ev.Checks, NewCheck(TubeSlope, in.MinSlope, ev.Tube.Slope()))
	} else {
		ev.Warnings = append(ev.Warnings, Warning{Code: WarnNoRise, Field: "holding_tube.rise"})
	}
	if len(in.Legal) > 0 {
		ev.judgeLegal(in)
	}
	for i, org := range in.Organisms {
		lr := lethality.LogReduction(ev.Judged, ev.FastestPath, org)
		ev.LogRed = append(ev.LogRed, lr)
		ev.EquivTime = append(ev.EquivTime, lethality.EquivalentTime(ev.Judged, ev.FastestPath, org.DTemperature, org.Z))
		if in.Judged[i] {
			c := NewCheck(LogReduction, org.RequiredLogReduction, lr)
			c.Organism = org.Name
			c.Detail = CheckDetail{DRefS: org.D, DTemperatureC: org.DTemperature, ZK: org.Z}
			ev.Checks = append(ev.Checks, c)
		}
	}
	if in.PU {
		ev.PU = lethality.PasteurizationUnits(ev.Judged, ev.FastestPath)
	}
	return ev, nil
}

// profile is the tube's temperature profile with the outlet at setpoint for a
// mass flow (isothermal without heat loss).
func (in HoldingInputs) profile(setpoint, massFlow float64) lethality.Profile {
	if !in.HeatLoss {
		return lethality.Isothermal(setpoint, in.Length)
	}
	return lethality.HeatLossProfile(setpoint, in.Ambient, in.OuterCoefficient, in.OuterDiameter, massFlow, in.SpecificHeat, in.Length)
}

// judgeLegal adds the holding-time check and the sensor-accuracy warnings.
func (ev *HoldingEval) judgeLegal(in HoldingInputs) {
	v := lethality.JudgeLegal(in.Legal, in.Setpoint, ev.Hyd.MinResidence, Tolerance)
	ev.Legal = &v
	var c Check
	if v.RowIndex < 0 {
		coolest := in.Legal[0]
		for _, r := range in.Legal {
			if r.Temperature < coolest.Temperature {
				coolest = r
			}
		}
		c = NewCheck(HoldingTime, coolest.Time, ev.Hyd.MinResidence)
		c.Pass = false // no row applies at this setpoint: the table is not met, whatever the time
		c.Detail = CheckDetail{RowTemperatureC: coolest.Temperature, BelowEveryRow: true, SetpointC: in.Setpoint}
	} else {
		c = NewCheck(HoldingTime, v.Row.Time, ev.Hyd.MinResidence)
		c.Detail = CheckDetail{RowTemperatureC: v.Row.Temperature, SetpointC: in.Setpoint, MarginPercent: v.MarginPct}
	}
	ev.Checks = append(ev.Checks, c)
	if in.SensorAccuracy > 0 {
		for _, r := range in.Legal {
			if r.Temperature <= in.Setpoint+1e-9 && in.Setpoint-in.SensorAccuracy <= r.Temperature+1e-9 {
				ev.Warnings = append(ev.Warnings, Warning{Code: WarnSensorAccuracy, Field: "process.sensor_accuracy",
					Values: map[string]float64{"setpoint_C": in.Setpoint, "accuracy_K": in.SensorAccuracy, "row_temperature_C": r.Temperature}})
			}
		}
	}
}

// Check is the evaluation's check with the id (the first, for log-reduction).
func (ev HoldingEval) Check(id CheckID) (Check, bool) {
	for _, c := range ev.Checks {
		if c.ID == id {
			return c, true
		}
	}
	return Check{}, false
}
