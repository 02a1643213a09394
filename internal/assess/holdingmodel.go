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
	// The rates as entered, from which the mass flows follow (MassFlows): a
	// volumetric rate (m³/s) times FlowDensity, a rate by mass (kg/s) as it
	// is. Each is the other when only one is entered (flow.rate defaults to
	// flow.max_rate and back). FlowDensity is product.density, or Choi–Okos
	// at the raw inlet (docs/METHOD.md §2.3). A margin that varies a rate or
	// the density moves the mass flows through these (docs/METHOD.md §14.1).
	MaxRate, Rate             float64
	MaxRateByMass, RateByMass bool
	FlowDensity               float64
	Density                   float64 // kg/m³ at the setpoint: product.density, or product.composition (Choi–Okos)
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
		FlowDensity:   pp.Density,
		InnerDiameter: h.Inner, OuterDiameter: h.Outer, Length: h.Length.SI, Rise: h.Rise.SI, RiseGiven: h.Rise.Set,
		MinSlope: lethality.DefaultMinSlope, FastestToMean: h.FastestToMean, Setpoint: p.Process.HoldSetpoint.SI,
		HeatLoss: h.OuterCoefficient.Set, Ambient: h.Ambient.SI, OuterCoefficient: h.OuterCoefficient.SI, PU: h.PU,
		CreditHeatLoss: h.CreditHeatLoss}
	if h.MinSlopeSet {
		in.MinSlope = h.MinSlope
	}
	rate, maxRate := p.Flow.Rate, p.Flow.MaxRate
	if !rate.Set {
		rate = maxRate
	}
	if !maxRate.Set {
		maxRate = rate
	}
	in.MaxRate, in.MaxRateByMass, in.Rate, in.RateByMass = maxRate.SI, maxRate.ByMass, rate.SI, rate.ByMass
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

// MassFlows sets MaxMassFlow and MassFlow from the rates as entered
// (productProps converts them the same way for the line).
func (in *HoldingInputs) MassFlows() {
	in.MaxMassFlow, in.MassFlow = in.MaxRate, in.Rate
	if !in.MaxRateByMass {
		in.MaxMassFlow = in.MaxRate * in.FlowDensity
	}
	if !in.RateByMass {
		in.MassFlow = in.Rate * in.FlowDensity
	}
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
	// legal and legalNominal are the verdicts as the judged core finds them
	// (Legal and LegalNominal point to copies once the report is made).
	legal, legalNominal lethality.LegalVerdict
	// newtonian and powerLaw hold the value Rheology points to.
	newtonian lethality.Newtonian
	powerLaw  lethality.PowerLaw
	Organisms []OrganismEval // per organism, in plant-file order
	PU        float64        // pasteurization units of the judged case, when asked for
	Checks    []Check        // tube-slope, holding-time, log-reduction, in print order
	Warnings  []Warning
}

// OrganismEval is one organism's lethality: the judged value and the others
// shown beside it.
type OrganismEval struct {
	LogReduction float64 // judged: at the judged temperature and the worst flow (with the credit only when opted in)
	AtSetpoint   float64 // the same at the nominal setpoint (same rule: with the credit only when opted in)
	AtSeal       float64 // the same at the sealed maximum (likewise)
	Isothermal   float64 // tube isothermal at the judged temperature, worst flow
	// Credit is the log reduction with the heat-loss profile at the sealed
	// maximum (outlet at the judged temperature), the lower of the candidate
	// flows (docs/METHOD.md §9.4); NaN without heat loss.
	Credit    float64
	FlowM3s   float64 // the flow at which the judged value is found
	EquivTime float64 // s at the organism's D_temperature, judged case
	Along     []lethality.ProfilePoint
	at        passage // where the judged value is found
}

// passage is the fastest particle's way through the tube at one candidate flow.
type passage struct {
	flow, uMax float64
	atSeal     bool
}

// passages are the candidate flows of docs/METHOD.md §7.7: the seal, then the
// worst flow when it lies below the seal (n of them; an array, so that the
// judged core does not allocate).
func (ev *HoldingEval) passages() (ps [2]passage, n int) {
	ps[0] = passage{flow: ev.Flow.Volumetric, uMax: ev.Hyd.FastestToMean * ev.Hyd.MeanVelocity, atSeal: true}
	if w := ev.Worst; !w.AtSeal {
		ps[1] = passage{flow: w.Volumetric, uMax: w.FastestToMean * w.MeanVelocity}
		return ps, 2
	}
	return ps, 1
}

// lethalProfile is the temperature profile a log reduction is computed with,
// outlet at outlet °C: the tube isothermal, or with the heat-loss credit the
// profile of docs/METHOD.md §8 at ṁ(max_rate) whatever the flow the particle
// moves at (docs/METHOD.md §9.4). With the outlet held, a smaller mass flow
// cools faster and so needs a hotter inlet: every flow up to the seal has a
// profile at least as hot at every point, and the seal's is the flattest, the
// least credit.
func (in *HoldingInputs) lethalProfile(outlet float64, credit bool) lethality.Profile {
	if !credit {
		return lethality.Isothermal(outlet, in.Length)
	}
	return in.profile(outlet, in.MaxMassFlow)
}

// lowest is the lowest log reduction over the passages with the outlet at
// outlet °C: isothermal, or with the heat-loss credit when credit (one
// profile, lethalProfile, for every passage; the fastest particle at each
// passage's speed).
func (in *HoldingInputs) lowest(outlet float64, ps []passage, credit bool, org lethality.Organism) (float64, passage) {
	prof := in.lethalProfile(outlet, credit)
	best, bp := math.Inf(1), ps[0]
	for _, p := range ps {
		if lr := lethality.LogReduction(prof, p.uMax, org); lr < best {
			best, bp = lr, p
		}
	}
	return best, bp
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
//
// It is the judged core (Judge: every value a verdict rests on) followed by
// the report's extras (the values shown beside the judged ones, warnings,
// equivalent times, the accumulated log reduction, PU). Margins under
// uncertainty run the core alone, thousands of times.
func EvaluateHolding(in HoldingInputs) (HoldingEval, error) {
	var ev HoldingEval
	tables, err := NewHoldingTables(&in)
	if err != nil { // validation refuses such points, by the same rule
		return ev, err
	}
	if err := ev.Judge(&in, tables); err != nil {
		return ev, err
	}
	ev.report(&in)
	return ev, nil
}

// HoldingTables are what the judged core prepares once and reads many times:
// the viscosity curve and the legal table in the order the rule reads it.
type HoldingTables struct {
	Curve props.ViscosityCurve // of in.Viscosity; empty for a power-law product
	Legal lethality.LegalTable
}

// NewHoldingTables prepares the tables of in; it refuses viscosity points
// that are none, not positive or at one temperature.
func NewHoldingTables(in *HoldingInputs) (*HoldingTables, error) {
	t := &HoldingTables{Legal: lethality.NewLegalTable(in.Legal)}
	if in.FlowIndex == 0 {
		if err := t.Curve.Set(in.Viscosity); err != nil {
			return nil, err
		}
	}
	return t, nil
}

// Judge is the judged core of the holding-tube model (docs/METHOD.md §7–§10):
// the tube, the hydraulics at the seal and at the worst flow, the judged
// temperature, the heat-loss refusal, the holding-time verdict and each
// organism's judged log reduction, and the checks (tube-slope, holding-time,
// log-reduction) with what their notes need. It reuses ev's slices and does
// not allocate once they have grown; t must be the tables of in (a caller
// that varies the viscosity points sets t.Curve again).
func (ev *HoldingEval) Judge(in *HoldingInputs, t *HoldingTables) error {
	ev.Tube = lethality.Tube{InnerDiameter: in.InnerDiameter, OuterDiameter: in.OuterDiameter, Length: in.Length}
	if in.RiseGiven {
		ev.Tube.Rise = in.Rise
	}
	ev.Flow = lethality.Flow{Volumetric: in.MaxMassFlow / in.Density, Density: in.Density}
	// The rheology is kept in ev and pointed to, so that a loop over Judge
	// does not allocate an interface value each time.
	if in.FlowIndex > 0 {
		ev.powerLaw = lethality.PowerLaw{N: in.FlowIndex, K: in.Consistency}
		ev.Rheology = &ev.powerLaw
	} else {
		ev.Viscosity, ev.Extrapolated = t.Curve.At(in.Setpoint)
		ev.ViscosityLow, ev.ViscosityHigh = t.Curve.Range()
		ev.newtonian = lethality.Newtonian{Viscosity: ev.Viscosity}
		ev.Rheology = &ev.newtonian
	}
	ev.Hyd = ev.Tube.Hydraulics(ev.Flow, ev.Rheology, in.FastestToMean)
	ev.Worst = ev.Tube.WorstFlowFrom(ev.Flow, ev.Hyd, ev.Rheology, in.FastestToMean)
	ev.JudgedC = in.Setpoint - in.SensorAccuracy
	ev.AtRate = in.profile(in.Setpoint, in.MassFlow)
	if loss := ev.AtRate.Inlet() - in.Setpoint; !(loss <= MaxTubeHeatLoss) {
		return &HeatLossError{Loss: loss}
	}
	ev.Checks = ev.Checks[:0]
	if in.RiseGiven {
		ev.Checks = append(ev.Checks, newCheck(defTubeSlope, in.MinSlope, ev.Tube.Slope()))
	}
	if len(in.Legal) > 0 {
		ev.judgeLegal(in, &t.Legal)
	}
	ev.judgeLethality(in)
	return nil
}

// judgeLethality finds each organism's judged log reduction and its check.
func (ev *HoldingEval) judgeLethality(in *HoldingInputs) {
	arr, n := ev.passages()
	ps := arr[:n]
	credit := in.CreditHeatLoss && in.HeatLoss
	ev.Organisms = ev.Organisms[:0]
	for i, org := range in.Organisms {
		o := OrganismEval{}
		o.LogReduction, o.at = in.lowest(ev.JudgedC, ps, credit, org)
		o.FlowM3s = o.at.flow
		ev.Organisms = append(ev.Organisms, o)
		if in.Judged[i] {
			ev.Checks = append(ev.Checks, newCheck(defLogReduction, org.RequiredLogReduction, o.LogReduction))
			c := &ev.Checks[len(ev.Checks)-1]
			c.Organism = org.Name
			c.Detail = CheckDetail{DRefS: org.D, DTemperatureC: org.DTemperature, ZK: org.Z}
			ev.judgedAt(in, &c.Detail, o.at.flow, o.at.atSeal)
		}
	}
}

// report adds what is shown beside the judged values: the legal verdicts as
// pointers, the log reductions at the setpoint, at the seal, isothermal and
// with the heat-loss credit, equivalent times, the accumulated log
// reduction, PU, the profile at the seal, and the warnings.
func (ev *HoldingEval) report(in *HoldingInputs) {
	if len(in.Legal) > 0 {
		v, nominal := ev.legal, ev.legalNominal
		ev.Legal, ev.LegalNominal = &v, &nominal
	}
	ev.Seal = in.profile(in.Setpoint, in.MaxMassFlow)
	if in.FlowIndex == 0 && ev.Extrapolated {
		ev.Warnings = append(ev.Warnings, Warning{Code: WarnViscosityExtrapolated, Field: "product.viscosity",
			Values: map[string]float64{"setpoint_C": in.Setpoint, "lowest_C": ev.ViscosityLow, "highest_C": ev.ViscosityHigh}})
	}
	if ev.Hyd.Regime != lethality.Turbulent {
		ev.Warnings = append(ev.Warnings, Warning{Code: WarnLaminarFlow,
			Values: map[string]float64{"reynolds": ev.Hyd.Reynolds, "fastest_to_mean": ev.Hyd.FastestToMean}})
	}
	if !in.RiseGiven {
		ev.Warnings = append(ev.Warnings, Warning{Code: WarnNoRise, Field: "holding_tube.rise"})
	}
	arr, n := ev.passages()
	ps := arr[:n]
	credit := in.CreditHeatLoss && in.HeatLoss
	prof := in.lethalProfile(ev.JudgedC, credit) // the judged case's
	for i, org := range in.Organisms {
		o := &ev.Organisms[i]
		// Beside the judged value, under its rule (isothermal, or with the
		// credit when opted in): at the setpoint, and at the seal's flow.
		o.AtSetpoint, _ = in.lowest(in.Setpoint, ps, credit, org)
		o.AtSeal, _ = in.lowest(ev.JudgedC, ps[:1], credit, org)
		o.Isothermal, _ = in.lowest(ev.JudgedC, ps, false, org)
		o.Credit = math.NaN()
		if in.HeatLoss {
			o.Credit, _ = in.lowest(ev.JudgedC, ps, true, org)
		}
		o.EquivTime = lethality.EquivalentTime(prof, o.at.uMax, org.DTemperature, org.Z)
		o.Along = lethality.Accumulated(prof, o.at.uMax, org, AlongStations)
		if dist := math.Abs(ev.JudgedC - org.DTemperature); dist > KineticsRange {
			ev.Warnings = append(ev.Warnings, Warning{Code: WarnKineticsExtrapolated, Field: fmt.Sprintf("organisms[%d].D_temperature", i),
				Values: map[string]float64{"organism_index": float64(i), "distance_K": dist, "used_at_C": ev.JudgedC,
					"D_temperature_C": org.DTemperature, "log_reduction": o.LogReduction}})
		}
	}
	// The log-reduction checks' notes give the value at the nominal setpoint.
	k := 0
	for i := range in.Organisms {
		if !in.Judged[i] {
			continue
		}
		for ; k < len(ev.Checks); k++ {
			if ev.Checks[k].ID == LogReduction {
				ev.Checks[k].Detail.NominalValue = ev.Organisms[i].AtSetpoint
				k++
				break
			}
		}
	}
	if in.PU {
		ev.PU = math.Inf(1)
		for _, p := range ps {
			ev.PU = math.Min(ev.PU, lethality.PasteurizationUnits(prof, p.uMax))
		}
	}
}

// judgedAt fills the part of a check's detail that says where it was judged.
func (ev *HoldingEval) judgedAt(in *HoldingInputs, x *CheckDetail, flow float64, atSeal bool) {
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
func (in *HoldingInputs) profile(setpoint, massFlow float64) lethality.Profile {
	if !in.HeatLoss {
		return lethality.Isothermal(setpoint, in.Length)
	}
	return lethality.HeatLossProfile(setpoint, in.Ambient, in.OuterCoefficient, in.OuterDiameter, massFlow, in.SpecificHeat, in.Length)
}

// judgeLegal adds the holding-time check: the fastest particle at the worst
// flow against the table at the judged temperature (docs/METHOD.md §10.1).
func (ev *HoldingEval) judgeLegal(in *HoldingInputs, table *lethality.LegalTable) {
	t := ev.Worst.MinResidence
	v := table.Judge(ev.JudgedC, t, Tolerance)
	nominal := table.Judge(in.Setpoint, t, Tolerance)
	ev.legal, ev.legalNominal = v, nominal
	var c Check
	if v.RowIndex < 0 {
		coolest := in.Legal[0]
		for _, r := range in.Legal {
			if r.Temperature < coolest.Temperature {
				coolest = r
			}
		}
		c = newCheck(defHoldingTime, coolest.Time, t)
		c.Pass = false // no row applies at this temperature: the table is not met, whatever the time
		c.Detail = CheckDetail{RowTemperatureC: coolest.Temperature, BelowEveryRow: true}
	} else {
		c = newCheck(defHoldingTime, v.Row.Time, t)
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
