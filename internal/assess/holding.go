package assess

import (
	"fmt"
	"math"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/internal/units"
	"pasval/lethality"
)

// LegalOut is the judgement against the user's legal table.
type LegalOut struct {
	Met          bool    `json:"met"`
	RowIndex     int     `json:"row_index"` // in legal_minimums; −1 when no row is at or below the setpoint
	TemperatureC float64 `json:"row_temperature_C"`
	TimeS        float64 `json:"row_time_s"`
	MarginS      float64 `json:"margin_s"`
	MarginPct    float64 `json:"margin_percent"`
}

// RowOut says what would meet one legal row with this tube and product.
type RowOut struct {
	TemperatureC    float64 `json:"temperature_C"`
	TimeS           float64 `json:"time_s"`
	Applies         bool    `json:"applies"` // row temperature ≤ setpoint
	RequiredLengthM float64 `json:"required_length_m"`
	MaxFlowM3s      float64 `json:"max_flow_m3_s"`   // largest flow up to which every flow meets the row
	MaxFlowCapped   bool    `json:"max_flow_capped"` // the search stopped at 20× the sealed maximum: at least this
}

// HoldingTube is the holding tube in the JSON contract.
type HoldingTube struct {
	InnerDiameterM          float64    `json:"inner_diameter_m"`
	OuterDiameterM          float64    `json:"outer_diameter_m,omitempty"`
	LengthM                 float64    `json:"length_m"`
	VolumeL                 float64    `json:"volume_L"`
	MaxFlowM3s              float64    `json:"max_flow_m3_s"`
	DensityKgM3             float64    `json:"density_at_hold_kg_m3"`
	ViscosityPas            float64    `json:"viscosity_at_hold_Pa_s,omitempty"`
	FlowIndex               float64    `json:"flow_index"`
	MeanVelocity            float64    `json:"mean_velocity_m_s"`
	Reynolds                float64    `json:"reynolds"`
	Regime                  string     `json:"regime"`
	FastestToMean           float64    `json:"fastest_to_mean"`
	FastestToMeanOverridden bool       `json:"fastest_to_mean_overridden"`
	MinResidenceS           float64    `json:"min_residence_s"`
	MeanResidenceS          float64    `json:"mean_residence_s"`
	RequiredLengthM         float64    `json:"required_length_m"` // for the applicable legal row; 0 without one
	InletTemperatureC       float64    `json:"inlet_temperature_C"`
	HeatingOutletC          float64    `json:"heating_outlet_C"` // tube inlet at the normal rate
	OutletTemperatureC      float64    `json:"outlet_temperature_C"`
	Slope                   *float64   `json:"slope"`
	MinSlope                float64    `json:"min_slope"`
	PasteurizationUnits     *float64   `json:"pasteurization_units,omitempty"`
	Legal                   *LegalOut  `json:"legal,omitempty"`
	Rows                    []RowOut   `json:"rows"`
	Model                   *TubeModel `json:"-"`
}

// TubeModel is what the hold command needs to recompute at other setpoints.
type TubeModel struct {
	Tube      lethality.Tube
	Rheology  lethality.Rheology
	Flow      lethality.Flow
	Hyd       lethality.Hydraulics
	Profile   lethality.Profile // at the sealed maximum (the judged case)
	Organisms []lethality.Organism
	Override  float64
	// ProfileAt rebuilds the judged profile with the outlet at another setpoint.
	ProfileAt func(setpoint float64) lethality.Profile
}

// Lethality is one organism's result, in plant-file order.
type Lethality struct {
	Organism             string  `json:"organism"`
	LogReduction         float64 `json:"log_reduction"`
	RequiredLogReduction float64 `json:"required_log_reduction"`
	EquivalentTimeS      float64 `json:"equivalent_time_s"` // at the organism's D_temperature
	DAtSetpointS         float64 `json:"D_at_setpoint_s"`
	Pass                 bool    `json:"pass"`
	// Along is the accumulated log reduction at AlongStations+1 stations from
	// the tube inlet to its outlet, for the record's plot.
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

// runHolding computes the holding tube and lethality; it returns the product
// temperature the heating section must deliver at the normal rate.
func runHolding(p *plantfile.Plant, res *Result) (float64, error) {
	h := p.HoldingTube
	setpoint := p.Process.HoldSetpoint.SI
	tube := lethality.Tube{Length: h.Length.SI, InnerDiameter: h.Inner, OuterDiameter: h.Outer}
	if h.Rise.Set {
		tube.Rise = h.Rise.SI
	}
	rho := holdDensity(p, res.Product)
	flow := lethality.Flow{Volumetric: res.Product.MaxMassFlow / rho, Density: rho}
	out := &HoldingTube{InnerDiameterM: tube.InnerDiameter, OuterDiameterM: tube.OuterDiameter, LengthM: tube.Length,
		VolumeL: tube.Volume() * 1e3, MaxFlowM3s: flow.Volumetric, DensityKgM3: rho, OutletTemperatureC: setpoint, Rows: []RowOut{}}

	var rheo lethality.Rheology
	if pl := p.Product.PowerLaw; pl != nil {
		rheo = lethality.PowerLaw{N: pl.FlowIndex, K: pl.Consistency.SI}
	} else {
		pts := make([]props.ViscosityPoint, len(p.Product.Viscosity))
		for i, v := range p.Product.Viscosity {
			pts[i] = props.ViscosityPoint{TempC: v.At.SI, Viscosity: v.Value.SI}
		}
		curve, _ := props.NewViscosityCurve(pts) // validated: points exist, distinct, positive
		mu, extrapolated := curve.At(setpoint)
		if extrapolated {
			lo, hi := curve.Range()
			res.warn(WarnViscosityExtrapolated, "product.viscosity", map[string]float64{"setpoint_C": setpoint, "lowest_C": lo, "highest_C": hi})
		}
		rheo = lethality.Newtonian{Viscosity: mu}
		out.ViscosityPas = mu
	}
	out.FlowIndex = rheo.FlowIndex()

	hyd := tube.Hydraulics(flow, rheo, h.FastestToMean)
	out.MeanVelocity, out.Reynolds, out.Regime = hyd.MeanVelocity, hyd.Reynolds, hyd.Regime.String()
	out.FastestToMean, out.FastestToMeanOverridden = hyd.FastestToMean, hyd.Overridden
	out.MinResidenceS, out.MeanResidenceS = hyd.MinResidence, hyd.MeanResidence
	uMax := hyd.FastestToMean * hyd.MeanVelocity

	cp := res.Product.SpecificHeat
	profileAt := func(sp, massFlow float64) lethality.Profile {
		if !h.OuterCoefficient.Set {
			return lethality.Isothermal(sp, tube.Length)
		}
		return lethality.HeatLossProfile(sp, h.Ambient.SI, h.OuterCoefficient.SI, tube.OuterDiameter, massFlow, cp, tube.Length)
	}
	judged := profileAt(setpoint, res.Product.MaxMassFlow)
	out.InletTemperatureC = judged.Inlet()
	out.HeatingOutletC = profileAt(setpoint, res.Product.MassFlow).Inlet()
	if loss := out.HeatingOutletC - setpoint; !(loss <= MaxTubeHeatLoss) {
		return 0, inputerr.List{{Pos: h.OuterCoefficient.Pos, Field: "holding_tube.outer_coefficient",
			Msg: fmt.Sprintf("with this heat loss the product would have to enter the holding tube %s above the setpoint to leave it at the setpoint; a holding tube loses well under %g K: check outer_coefficient, ambient and the flow",
				kelvins(loss), MaxTubeHeatLoss)}}
	}

	if hyd.Regime != lethality.Turbulent {
		res.warn(WarnLaminarFlow, "", map[string]float64{"reynolds": hyd.Reynolds, "fastest_to_mean": hyd.FastestToMean})
	}

	// Slope.
	minSlope := lethality.DefaultMinSlope
	if h.MinSlopeSet {
		minSlope = h.MinSlope
	}
	out.MinSlope = minSlope
	if h.Rise.Set {
		s := tube.Slope()
		out.Slope = &s
		res.Checks = append(res.Checks, NewCheck(TubeSlope, minSlope, s))
	} else {
		res.warn(WarnNoRise, "holding_tube.rise", nil)
	}

	// Legal table.
	if len(p.LegalMinimums) > 0 {
		rows := make([]lethality.LegalRow, len(p.LegalMinimums))
		for i, r := range p.LegalMinimums {
			rows[i] = lethality.LegalRow{Temperature: r.Temperature.SI, Time: r.Time.SI}
		}
		v := lethality.JudgeLegal(rows, setpoint, hyd.MinResidence, Tolerance)
		for _, r := range rows {
			cap := 20 * flow.Volumetric
			q := tube.MaxFlowFor(r.Time, rho, rheo, h.FastestToMean, cap)
			out.Rows = append(out.Rows, RowOut{TemperatureC: r.Temperature, TimeS: r.Time, Applies: r.Temperature <= setpoint+1e-9,
				RequiredLengthM: hyd.RequiredLength(r.Time), MaxFlowM3s: q, MaxFlowCapped: q >= cap})
		}
		var c Check
		if v.RowIndex < 0 {
			coolest := rows[0]
			for _, r := range rows {
				if r.Temperature < coolest.Temperature {
					coolest = r
				}
			}
			c = NewCheck(HoldingTime, coolest.Time, hyd.MinResidence)
			c.Pass = false // no row applies at this setpoint: the table is not met, whatever the time
			c.Detail = CheckDetail{RowTemperatureC: coolest.Temperature, BelowEveryRow: true, SetpointC: setpoint}
			out.Legal = &LegalOut{RowIndex: -1, TemperatureC: coolest.Temperature, TimeS: coolest.Time, MarginS: c.Margin,
				MarginPct: c.Margin / coolest.Time * 100}
		} else {
			c = NewCheck(HoldingTime, v.Row.Time, hyd.MinResidence)
			c.Detail = CheckDetail{RowTemperatureC: v.Row.Temperature, SetpointC: setpoint, MarginPercent: v.MarginPct}
			out.Legal = &LegalOut{Met: v.Met, RowIndex: v.RowIndex, TemperatureC: v.Row.Temperature, TimeS: v.Row.Time,
				MarginS: v.Margin, MarginPct: v.MarginPct}
			out.RequiredLengthM = hyd.RequiredLength(v.Applicable.Time)
		}
		res.Checks = append(res.Checks, c)
		if acc := p.Process.SensorAccuracy; acc.Set && acc.SI > 0 {
			for _, r := range rows {
				if r.Temperature <= setpoint+1e-9 && setpoint-acc.SI <= r.Temperature+1e-9 {
					res.warn(WarnSensorAccuracy, "process.sensor_accuracy",
						map[string]float64{"setpoint_C": setpoint, "accuracy_K": acc.SI, "row_temperature_C": r.Temperature})
				}
			}
		}
	}

	// Kinetics.
	model := &TubeModel{Tube: tube, Rheology: rheo, Flow: flow, Hyd: hyd, Profile: judged, Override: h.FastestToMean,
		ProfileAt: func(sp float64) lethality.Profile { return profileAt(sp, res.Product.MaxMassFlow) }}
	for _, o := range p.Organisms {
		org := lethality.Organism{Name: o.Name, D: o.D.SI, DTemperature: o.DTemperature.SI, Z: o.Z.SI, RequiredLogReduction: o.RequiredLogReduction}
		model.Organisms = append(model.Organisms, org)
		lr := lethality.LogReduction(judged, uMax, org)
		l := Lethality{Organism: o.Name, LogReduction: lr, RequiredLogReduction: o.RequiredLogReduction,
			EquivalentTimeS: lethality.EquivalentTime(judged, uMax, org.DTemperature, org.Z),
			DAtSetpointS:    org.DAt(setpoint), Pass: lr >= o.RequiredLogReduction,
			Along: lethality.Accumulated(judged, uMax, org, AlongStations)}
		res.Lethality = append(res.Lethality, l)
		if o.RequiredSet {
			c := NewCheck(LogReduction, o.RequiredLogReduction, lr)
			c.Organism = o.Name
			c.Detail = CheckDetail{DRefS: o.D.SI, DTemperatureC: o.DTemperature.SI, ZK: o.Z.SI}
			res.Checks = append(res.Checks, c)
		}
	}
	if h.PU {
		pu := lethality.PasteurizationUnits(judged, uMax)
		out.PasteurizationUnits = &pu
	}
	out.Model = model
	res.HoldingTube = out
	return out.HeatingOutletC, nil
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
