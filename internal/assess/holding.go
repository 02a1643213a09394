package assess

import (
	"errors"
	"fmt"
	"math"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/units"
	"pasval/lethality"
)

// LegalOut is the judgement against the user's legal table (docs/METHOD.md
// §10.1). RowIndex is the 0-based index in legal_minimums of the row the
// verdict is reported against (the hottest row met, else the hottest row at
// or below the temperature judged), or −1 when no row is at or below that
// temperature: the table is then not met, and TemperatureC, TimeS and the
// margins are the coolest row's, against which the failing holding-time
// check is reported (the index stays −1 so that it never reads as a row that
// applies).
type LegalOut struct {
	Met          bool    `json:"met"`
	RowIndex     int     `json:"row_index"` // in legal_minimums; −1 when no row is at or below the temperature judged
	TemperatureC float64 `json:"row_temperature_C"`
	TimeS        float64 `json:"row_time_s"`
	MarginS      float64 `json:"margin_s"`
	MarginPct    float64 `json:"margin_percent"`
}

// RowOut says what would meet one legal row with this tube and product.
type RowOut struct {
	TemperatureC    float64 `json:"temperature_C"`
	TimeS           float64 `json:"time_s"`
	Applies         bool    `json:"applies"`             // row temperature ≤ judged temperature
	AppliesAtSet    bool    `json:"applies_at_setpoint"` // row temperature ≤ setpoint
	RequiredLengthM float64 `json:"required_length_m"`   // at the worst flow
	MaxFlowM3s      float64 `json:"max_flow_m3_s"`       // largest flow up to which every flow meets the row
	MaxFlowCapped   bool    `json:"max_flow_capped"`     // the search stopped at 20× the sealed maximum: at least this
}

// HoldingTube is the holding tube in the JSON contract. The hydraulics are
// at the sealed maximum; the worst_* keys are at the worst flow in (0, seal]
// (docs/METHOD.md §7.7), where the holding-time and log-reduction checks are
// judged, at judged_temperature_C (docs/METHOD.md §9.4).
type HoldingTube struct {
	InnerDiameterM          float64 `json:"inner_diameter_m"`
	OuterDiameterM          float64 `json:"outer_diameter_m,omitempty"`
	LengthM                 float64 `json:"length_m"`
	VolumeL                 float64 `json:"volume_L"`
	MaxFlowM3s              float64 `json:"max_flow_m3_s"`
	DensityKgM3             float64 `json:"density_at_hold_kg_m3"`
	ViscosityPas            float64 `json:"viscosity_at_hold_Pa_s,omitempty"`
	FlowIndex               float64 `json:"flow_index"`
	MeanVelocity            float64 `json:"mean_velocity_m_s"`
	Reynolds                float64 `json:"reynolds"`
	Regime                  string  `json:"regime"`
	FastestToMean           float64 `json:"fastest_to_mean"`
	FastestToMeanOverridden bool    `json:"fastest_to_mean_overridden"`
	MinResidenceS           float64 `json:"min_residence_s"`
	MeanResidenceS          float64 `json:"mean_residence_s"`
	WorstFlowM3s            float64 `json:"worst_flow_m3_s"`
	WorstFlowRegime         string  `json:"worst_flow_regime"`
	WorstFlowAtSeal         bool    `json:"worst_flow_at_seal"`
	WorstReynolds           float64 `json:"worst_flow_reynolds"`
	WorstFastestToMean      float64 `json:"worst_flow_fastest_to_mean"`
	WorstMinResidenceS      float64 `json:"worst_min_residence_s"`
	SetpointC               float64 `json:"setpoint_C"`
	SensorAccuracyK         float64 `json:"sensor_accuracy_K"`
	JudgedTemperatureC      float64 `json:"judged_temperature_C"`
	CreditHeatLoss          bool    `json:"credit_heat_loss"`
	// RequiredLengthM is L_req = t_row·r·v for the applicable legal row (the
	// hottest at or below the judged temperature) at the worst flow, and
	// RequiredLengthAtSealM the same row's at the sealed maximum, shown
	// beside it (docs/METHOD.md §10.1); both null when no row applies or
	// there are no rows.
	RequiredLengthM       *float64 `json:"required_length_m"`
	RequiredLengthAtSealM *float64 `json:"required_length_at_seal_m"`
	InletTemperatureC     float64  `json:"inlet_temperature_C"`
	HeatingOutletC        float64  `json:"heating_outlet_C"` // tube inlet at the normal rate
	OutletTemperatureC    float64  `json:"outlet_temperature_C"`
	Slope                 *float64 `json:"slope"`
	MinSlope              float64  `json:"min_slope"`
	PasteurizationUnits   *float64 `json:"pasteurization_units,omitempty"`
	// Legal is judged at the judged temperature; LegalAtSetpoint is the same
	// table read at the nominal setpoint (both at the worst flow), shown beside
	// it whether or not a sensor accuracy is entered (without one they are
	// equal). Both are absent without legal rows.
	Legal           *LegalOut  `json:"legal,omitempty"`
	LegalAtSetpoint *LegalOut  `json:"legal_at_setpoint,omitempty"`
	Rows            []RowOut   `json:"rows"`
	Model           *TubeModel `json:"-"`
}

// TubeModel is what the hold command needs to recompute at other setpoints.
type TubeModel struct {
	Inputs HoldingInputs
	Eval   HoldingEval
}

// Lethality is one organism's result, in plant-file order.
type Lethality struct {
	Organism string `json:"organism"`
	// LogReduction is the judged value: at the judged temperature and the
	// worst flow, the tube isothermal unless the heat-loss credit is taken.
	LogReduction float64 `json:"log_reduction"`
	// RequiredLogReduction is organisms[].required_log_reduction; null when
	// none is entered: the reduction is then reported, not judged (Judged
	// false, Pass null).
	RequiredLogReduction *float64 `json:"required_log_reduction"`
	Judged               bool     `json:"judged"`
	LogReductionAtSet    float64  `json:"log_reduction_at_setpoint"`
	LogReductionAtSeal   float64  `json:"log_reduction_at_seal"`
	LogReductionIso      float64  `json:"log_reduction_isothermal"`
	// LogReductionCredit is with the heat-loss profile; absent without heat loss.
	LogReductionCredit *float64 `json:"log_reduction_with_heat_loss_credit,omitempty"`
	FlowM3s            float64  `json:"judged_flow_m3_s"`
	EquivalentTimeS    float64  `json:"equivalent_time_s"` // at the organism's D_temperature, judged case
	DAtSetpointS       float64  `json:"D_at_setpoint_s"`
	DAtJudgedS         float64  `json:"D_at_judged_temperature_s"`
	Pass               *bool    `json:"pass"` // null when not judged
	// Along is the accumulated log reduction of the judged case at
	// AlongStations+1 stations from the tube inlet to its outlet, for the
	// record's plot.
	Along []lethality.ProfilePoint `json:"-"`
}

// AlongStations is the number of steps of Lethality.Along.
const AlongStations = 100

// holdDensity is the product density at the hold setpoint: as entered, or
// Choi–Okos at the setpoint.
func holdDensity(p *plantfile.Plant, pp ProductProps) float64 {
	if c := p.Product.Composition; c != nil && !p.Product.Density.Set {
		return choiOkos(c).Density(p.Process.HoldSetpoint.SI)
	}
	return pp.Density
}

// MaxTubeHeatLoss is the largest temperature drop along the holding tube that
// pasval accepts (K); real tubes lose tenths of a kelvin, and a larger drop
// means a typo in the heat-loss inputs.
const MaxTubeHeatLoss = 10.0

// holdingInputError points an error of EvaluateHolding at the plant-file
// field it comes from.
func holdingInputError(p *plantfile.Plant, err error) error {
	var loss *HeatLossError
	if errors.As(err, &loss) {
		msg := err.Error()
		if p.System == units.US {
			msg = inUSUnits(msg)
		}
		return inputerr.List{inputerr.At(p.HoldingTube.OuterCoefficient.Pos, "holding_tube.outer_coefficient", "%s", msg)}
	}
	return inputerr.List{inputerr.At(p.Product.Pos, "product.viscosity", "%v", err)}
}

// runHolding computes the holding tube and lethality into res (gather,
// evaluate, then the JSON contract); it returns the product temperature the
// heating section must deliver at the normal rate.
func runHolding(p *plantfile.Plant, res *Result) (float64, error) {
	in := GatherHolding(p, res.Product)
	ev, err := EvaluateHolding(in)
	if err != nil {
		return 0, holdingInputError(p, err)
	}
	tube, hyd, worst := ev.Tube, ev.Hyd, ev.Worst
	out := &HoldingTube{InnerDiameterM: tube.InnerDiameter, OuterDiameterM: tube.OuterDiameter, LengthM: tube.Length,
		VolumeL: tube.Volume() * 1e3, MaxFlowM3s: ev.Flow.Volumetric, DensityKgM3: in.Density, OutletTemperatureC: in.Setpoint,
		ViscosityPas: ev.Viscosity, FlowIndex: ev.Rheology.FlowIndex(), Rows: []RowOut{}, MinSlope: in.MinSlope,
		MeanVelocity: hyd.MeanVelocity, Reynolds: hyd.Reynolds, Regime: hyd.Regime.String(),
		FastestToMean: hyd.FastestToMean, FastestToMeanOverridden: hyd.Overridden,
		MinResidenceS: hyd.MinResidence, MeanResidenceS: hyd.MeanResidence,
		WorstFlowM3s: worst.Volumetric, WorstFlowRegime: worst.Regime.String(), WorstFlowAtSeal: worst.AtSeal,
		WorstReynolds: worst.Reynolds, WorstFastestToMean: worst.FastestToMean, WorstMinResidenceS: worst.MinResidence,
		SetpointC: in.Setpoint, SensorAccuracyK: in.SensorAccuracy, JudgedTemperatureC: ev.JudgedC,
		CreditHeatLoss:    in.CreditHeatLoss && in.HeatLoss,
		InletTemperatureC: ev.Seal.Inlet(), HeatingOutletC: ev.AtRate.Inlet()}
	if in.RiseGiven {
		s := tube.Slope()
		out.Slope = &s
	}
	for _, r := range in.Legal {
		limit := 20 * ev.Flow.Volumetric
		q := tube.MaxFlowFor(r.Time, in.Density, ev.Rheology, in.FastestToMean, limit)
		out.Rows = append(out.Rows, RowOut{TemperatureC: r.Temperature, TimeS: r.Time, Applies: r.Temperature <= ev.JudgedC+1e-9,
			AppliesAtSet:    r.Temperature <= in.Setpoint+1e-9,
			RequiredLengthM: worst.RequiredLength(r.Time), MaxFlowM3s: q, MaxFlowCapped: q >= limit})
	}
	if v := ev.Legal; v != nil {
		c, _ := ev.Check(HoldingTime)
		out.Legal = legalOut(*v, c)
		if v.RowIndex >= 0 {
			l, s := worst.RequiredLength(v.Applicable.Time), hyd.RequiredLength(v.Applicable.Time)
			out.RequiredLengthM, out.RequiredLengthAtSealM = &l, &s
		}
		// With no row at or below the setpoint there is none at or below the
		// judged temperature either: c is then reported against the coolest
		// row, and so is the setpoint's reading.
		nc := c
		if ev.LegalNominal.RowIndex >= 0 {
			nc = NewCheck(HoldingTime, ev.LegalNominal.Row.Time, c.Actual)
		}
		out.LegalAtSetpoint = legalOut(*ev.LegalNominal, nc)
	}
	for i, org := range in.Organisms {
		o := ev.Organisms[i]
		l := Lethality{Organism: org.Name, LogReduction: o.LogReduction,
			LogReductionAtSet: o.AtSetpoint, LogReductionAtSeal: o.AtSeal, LogReductionIso: o.Isothermal, FlowM3s: o.FlowM3s,
			EquivalentTimeS: o.EquivTime, DAtSetpointS: org.DAt(in.Setpoint), DAtJudgedS: org.DAt(ev.JudgedC), Along: o.Along}
		if in.Judged[i] {
			req, pass := org.RequiredLogReduction, NewCheck(LogReduction, org.RequiredLogReduction, o.LogReduction).Pass
			l.RequiredLogReduction, l.Judged, l.Pass = &req, true, &pass
		}
		if !math.IsNaN(o.Credit) {
			c := o.Credit
			l.LogReductionCredit = &c
		}
		res.Lethality = append(res.Lethality, l)
	}
	if in.PU {
		pu := ev.PU
		out.PasteurizationUnits = &pu
	}
	res.Checks = append(res.Checks, ev.Checks...)
	res.Warnings = append(res.Warnings, ev.Warnings...)
	out.Model = &TubeModel{Inputs: in, Eval: ev}
	res.HoldingTube = out
	return out.HeatingOutletC, nil
}

// legalOut is a verdict of the legal table in the JSON contract; c is the
// holding-time check it gave.
func legalOut(v lethality.LegalVerdict, c Check) *LegalOut {
	if v.RowIndex < 0 {
		return &LegalOut{RowIndex: -1, TemperatureC: c.Detail.RowTemperatureC, TimeS: c.Required, MarginS: c.Margin,
			MarginPct: c.Margin / c.Required * 100}
	}
	return &LegalOut{Met: v.Met, RowIndex: v.RowIndex, TemperatureC: v.Row.Temperature, TimeS: v.Row.Time,
		MarginS: v.Margin, MarginPct: v.MarginPct}
}

// regeneratorPressure adds the regenerator-pressure check: the pasteurized side
// must exceed the raw side by the margin (1 psi by default; 7 Pa. Code §59.216c,
// 1 NYCRR §3.26, which carry the PMO wording).
func regeneratorPressure(p *plantfile.Plant, res *Result) {
	pr := p.Regeneration.Pressure
	margin := units.ToSI(1, units.Pressure, "psi")
	if pr.RequiredMargin.Set {
		margin = pr.RequiredMargin.SI
	}
	res.Checks = append(res.Checks, NewCheck(RegeneratorPressure, margin, pr.PasteurizedMin.SI-pr.RawMax.SI))
}

func kelvins(k float64) string {
	if math.IsInf(k, 0) || math.IsNaN(k) || k > 1000 {
		return "more than 1000 K"
	}
	return fmt.Sprintf("%.3g K", k)
}
