package assess

import (
	"fmt"
	"math"

	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/lethality"
)

// The holding tube in three named steps, so that a caller can re-run the
// model thousands of times (margins under uncertainty, envelopes) without the
// plant file:
//
//	in := GatherHolding(p, res.Product)   // plant file → plain SI inputs
//	ev, err := EvaluateHolding(in)        // pure: hydraulics, worst flow, profile, legal, lethality, checks
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
	// CreditHeatLoss is holding_tube.credit_heat_loss: judge the log
	// reduction with the heat-loss profile (a process authority's decision).
	CreditHeatLoss bool
}

// GatherHolding reads the holding tube's inputs from a validated plant file;
// pp are the product properties the line uses (mass flows, cp).
func GatherHolding(p *plantfile.Plant, pp ProductProps) HoldingInputs {
	h := p.HoldingTube
	in := HoldingInputs{MaxMassFlow: pp.MaxMassFlow, MassFlow: pp.MassFlow, Density: holdDensity(p, pp), SpecificHeat: pp.SpecificHeat,
		InnerDiameter: h.Inner, OuterDiameter: h.Outer, Length: h.Length.SI, Rise: h.Rise.SI, RiseGiven: h.Rise.Set,
		MinSlope: lethality.DefaultMinSlope, FastestToMean: h.FastestToMean, Setpoint: p.Process.HoldSetpoint.SI,
		HeatLoss: h.OuterCoefficient.Set, Ambient: h.Ambient.SI, OuterCoefficient: h.OuterCoefficient.SI, PU: h.PU,
		CreditHeatLoss: h.CreditHeatLoss}
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
	Hyd      lethality.Hydraulics // at the sealed maximum
	// Worst is the flow in (0, seal] with the shortest fastest-particle time
	// (docs/METHOD.md §7.7): the holding time and log reductions are judged there.
	Worst lethality.WorstFlow
	// JudgedC is the judged temperature, °C: the setpoint less the sensor
	// accuracy (docs/METHOD.md §9.4).
	JudgedC float64
	// Viscosity is μ at the setpoint (Newtonian), Pa·s; Extrapolated when the
	// setpoint lies outside the points (ViscosityLow to ViscosityHigh, °C).
	Viscosity                   float64
	Extrapolated                bool
	ViscosityLow, ViscosityHigh float64

	Seal   lethality.Profile // at the sealed maximum, outlet at the setpoint: the reported tube inlet
	AtRate lethality.Profile // at the normal rate: what the heater must deliver

	Legal        *lethality.LegalVerdict // at the judged temperature and the worst flow; nil without legal rows
	LegalNominal *lethality.LegalVerdict // the same at the setpoint
	Organisms    []OrganismEval          // per organism, in plant-file order
	PU           float64                 // pasteurization units of the judged case, when asked for
	Checks       []Check                 // tube-slope, holding-time, log-reduction, in print order
	Warnings     []Warning
}

// OrganismEval is one organism's lethality: the judged value and the others
// shown beside it.
type OrganismEval struct {
	LogReduction float64 // judged: at the judged temperature and the worst flow (with the credit only when opted in)
	AtSetpoint   float64 // the same at the nominal setpoint
	AtSeal       float64 // the same at the sealed maximum
	Isothermal   float64 // tube isothermal at the judged temperature, worst flow
	// Credit is the log reduction with the heat-loss profile (outlet at the
	// judged temperature), the lower of the candidate flows; NaN without heat loss.
	Credit    float64
	FlowM3s   float64 // the flow at which the judged value is found
	EquivTime float64 // s at the organism's D_temperature, judged case
	Along     []lethality.ProfilePoint
}

// passage is the fastest particle's way through the tube at one candidate flow.
type passage struct {
	flow, massFlow, uMax float64
	atSeal               bool
}

// passages are the candidate flows of docs/METHOD.md §7.7: the seal, then the
// worst flow when it lies below the seal.
func (ev *HoldingEval) passages(in HoldingInputs) []passage {
	ps := []passage{{flow: ev.Flow.Volumetric, massFlow: in.MaxMassFlow, uMax: ev.Hyd.FastestToMean * ev.Hyd.MeanVelocity, atSeal: true}}
	if w := ev.Worst; !w.AtSeal {
		ps = append(ps, passage{flow: w.Volumetric, massFlow: w.Volumetric * in.Density, uMax: w.FastestToMean * w.MeanVelocity})
	}
	return ps
}

// lowest is the lowest log reduction over the passages with the outlet at
// outlet °C: isothermal, or with the heat-loss profile when credit.
func (in HoldingInputs) lowest(outlet float64, ps []passage, credit bool, org lethality.Organism) (float64, passage, lethality.Profile) {
	best, bp, bprof := math.Inf(1), ps[0], lethality.Profile{}
	for _, p := range ps {
		prof := lethality.Isothermal(outlet, in.Length)
		if credit {
			prof = in.profile(outlet, p.massFlow)
		}
		if lr := lethality.LogReduction(prof, p.uMax, org); lr < best {
			best, bp, bprof = lr, p, prof
		}
	}
	return best, bp, bprof
}

// KineticsRange is how far from its D_temperature an organism's kinetics are
// used before a warning (K): beyond it they are an extrapolation
// (docs/METHOD.md §9.5).
const KineticsRange = 10.0

// HeatLossError is a tube whose heat loss is beyond any real holding tube.
type HeatLossError struct {
	Loss float64 // K between the heater outlet and the setpoint at the normal rate
}

func (e *HeatLossError) Error() string {
	return fmt.Sprintf("with this heat loss the product would have to enter the holding tube %s above the setpoint to leave it "+
		"at the setpoint; a holding tube loses well under %g K: check outer_coefficient, ambient and the flow", kelvins(e.Loss), MaxTubeHeatLoss)
}

// EvaluateHolding runs the holding-tube model: hydraulics at the sealed
// maximum and at the worst flow below it, the temperature profile, the legal
// table and each organism's log reduction at the judged temperature, and the
// holding-tube checks. It reads nothing but in, formats nothing, and returns
// a *HeatLossError for an impossible heat loss.
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
	ev.Worst = ev.Tube.WorstFlow(ev.Flow, ev.Rheology, in.FastestToMean)
	ev.JudgedC = in.Setpoint - in.SensorAccuracy
	ev.Seal = in.profile(in.Setpoint, in.MaxMassFlow)
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
	ev.lethality(in)
	return ev, nil
}

// lethality fills each organism's log reductions, its check and the kinetics
// warning, and the pasteurization units.
func (ev *HoldingEval) lethality(in HoldingInputs) {
	ps := ev.passages(in)
	credit := in.CreditHeatLoss && in.HeatLoss
	for i, org := range in.Organisms {
		var o OrganismEval
		var p passage
		var prof lethality.Profile
		o.LogReduction, p, prof = in.lowest(ev.JudgedC, ps, credit, org)
		o.AtSetpoint, _, _ = in.lowest(in.Setpoint, ps, credit, org)
		o.AtSeal, _, _ = in.lowest(ev.JudgedC, ps[:1], credit, org)
		o.Isothermal, _, _ = in.lowest(ev.JudgedC, ps, false, org)
		o.Credit = math.NaN()
		if in.HeatLoss {
			o.Credit, _, _ = in.lowest(ev.JudgedC, ps, true, org)
		}
		o.FlowM3s = p.flow
		o.EquivTime = lethality.EquivalentTime(prof, p.uMax, org.DTemperature, org.Z)
		o.Along = lethality.Accumulated(prof, p.uMax, org, AlongStations)
		ev.Organisms = append(ev.Organisms, o)
		if dist := math.Abs(ev.JudgedC - org.DTemperature); dist > KineticsRange {
			ev.Warnings = append(ev.Warnings, Warning{Code: WarnKineticsExtrapolated, Field: fmt.Sprintf("organisms[%d].D_temperature", i),
				Values: map[string]float64{"organism_index": float64(i), "distance_K": dist, "used_at_C": ev.JudgedC,
					"D_temperature_C": org.DTemperature, "log_reduction": o.LogReduction}})
		}
		if in.Judged[i] {
			c := NewCheck(LogReduction, org.RequiredLogReduction, o.LogReduction)
			c.Organism = org.Name
			c.Detail = CheckDetail{DRefS: org.D, DTemperatureC: org.DTemperature, ZK: org.Z}
			ev.judgedAt(in, &c.Detail, p.flow, p.atSeal)
			c.Detail.NominalValue = o.AtSetpoint
			ev.Checks = append(ev.Checks, c)
		}
	}
	if in.PU {
		ev.PU = math.Inf(1)
		for _, p := range ps {
			prof := lethality.Isothermal(ev.JudgedC, in.Length)
			if credit {
				prof = in.profile(ev.JudgedC, p.massFlow)
			}
			ev.PU = math.Min(ev.PU, lethality.PasteurizationUnits(prof, p.uMax))
		}
	}
}

// judgedAt fills the part of a check's detail that says where it was judged.
func (ev *HoldingEval) judgedAt(in HoldingInputs, x *CheckDetail, flow float64, atSeal bool) {
	x.SetpointC, x.JudgedC, x.AccuracyK = in.Setpoint, ev.JudgedC, in.SensorAccuracy
	x.FlowM3s, x.AtSeal = flow, atSeal
	x.Regime = ev.Hyd.Regime.String()
	if !x.AtSeal {
		x.Regime = ev.Worst.Regime.String()
	}
	x.CreditHeatLoss = in.CreditHeatLoss && in.HeatLoss
}

// profile is the tube's temperature profile with the outlet at setpoint for a
// mass flow (isothermal without heat loss).
func (in HoldingInputs) profile(setpoint, massFlow float64) lethality.Profile {
	if !in.HeatLoss {
		return lethality.Isothermal(setpoint, in.Length)
	}
	return lethality.HeatLossProfile(setpoint, in.Ambient, in.OuterCoefficient, in.OuterDiameter, massFlow, in.SpecificHeat, in.Length)
}

// judgeLegal adds the holding-time check: the fastest particle at the worst
// flow against the table at the judged temperature (docs/METHOD.md §10.1).
func (ev *HoldingEval) judgeLegal(in HoldingInputs) {
	t := ev.Worst.MinResidence
	v := lethality.JudgeLegal(in.Legal, ev.JudgedC, t, Tolerance)
	nominal := lethality.JudgeLegal(in.Legal, in.Setpoint, t, Tolerance)
	ev.Legal, ev.LegalNominal = &v, &nominal
	var c Check
	if v.RowIndex < 0 {
		coolest := in.Legal[0]
		for _, r := range in.Legal {
			if r.Temperature < coolest.Temperature {
				coolest = r
			}
		}
		c = NewCheck(HoldingTime, coolest.Time, t)
		c.Pass = false // no row applies at this temperature: the table is not met, whatever the time
		c.Detail = CheckDetail{RowTemperatureC: coolest.Temperature, BelowEveryRow: true}
	} else {
		c = NewCheck(HoldingTime, v.Row.Time, t)
		c.Detail = CheckDetail{RowTemperatureC: v.Row.Temperature, MarginPercent: v.MarginPct}
	}
	ev.judgedAt(in, &c.Detail, ev.Worst.Volumetric, ev.Worst.AtSeal)
	c.Detail.CreditHeatLoss = false // the holding time takes no lethality credit
	c.Detail.SealValue = ev.Hyd.MinResidence
	if nominal.RowIndex >= 0 {
		c.Detail.NominalRowC, c.Detail.NominalMet = nominal.Row.Temperature, nominal.Met
	} else {
		c.Detail.NominalRowC = math.NaN()
	}
	c.Detail.NominalValue = t
	c.Detail.RiseToMeetK, c.Detail.RowToMeetC = math.NaN(), math.NaN()
	if !c.Pass {
		// The coolest row above the judged temperature whose time this tube holds.
		for _, r := range in.Legal {
			if r.Temperature > ev.JudgedC+1e-9 && r.Time-t <= Tolerance*r.Time &&
				(math.IsNaN(c.Detail.RowToMeetC) || r.Temperature < c.Detail.RowToMeetC) {
				c.Detail.RowToMeetC, c.Detail.RiseToMeetK = r.Temperature, r.Temperature-ev.JudgedC
			}
		}
	}
	ev.Checks = append(ev.Checks, c)
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
