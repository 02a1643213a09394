package assess

import (
	"fmt"
	"strconv"
	"strings"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/lethality"
)

// Margins under uncertainty (docs/METHOD.md §14): the holding-tube model of
// check, run with the inputs of the plant file's uncertainty block at the
// ends of their tolerances (worst case, sensitivity) and drawn from their
// distributions (Monte Carlo). Every evaluation is the judged core of
// EvaluateHolding (HoldingEval.Judge) on inputs changed through holdingSlots,
// the one table of where each varied field lands in HoldingInputs.

// slotSetter writes a varied value (SI, as the plant file's field holds it)
// into the inputs.
type slotSetter func(in *HoldingInputs, v float64)

// slotContext is what a slot needs to know of the plant: the list index of
// the path (organisms[1].D → 1) and the nominal inputs.
type slotContext struct {
	index   int
	nominal *HoldingInputs
	plant   *plantfile.Plant
}

// holdingSlots maps each field that may vary (the field table's Vary) to its
// place in HoldingInputs. The mass flows follow from the rates and the
// density afterwards (HoldingInputs.MassFlows), so that a varied density and
// a varied rate move them together. A test ties the keys to the field table
// and checks each slot against re-reading a plant file with the value changed.
var holdingSlots = map[string]func(c slotContext) slotSetter{
	"flow.max_rate": func(c slotContext) slotSetter {
		follows := !c.plant.Flow.Rate.Set // the normal rate is the sealed maximum
		return func(in *HoldingInputs, v float64) {
			in.MaxRate = v
			if follows {
				in.Rate = v
			}
		}
	},
	"flow.rate": func(c slotContext) slotSetter {
		follows := !c.plant.Flow.MaxRate.Set // the sealed maximum is the normal rate
		return func(in *HoldingInputs, v float64) {
			in.Rate = v
			if follows {
				in.MaxRate = v
			}
		}
	},
	"product.density": func(slotContext) slotSetter {
		// Entered, it is both the density in the tube and the one the rates convert with.
		return func(in *HoldingInputs, v float64) { in.Density, in.FlowDensity = v, v }
	},
	"product.specific_heat": func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.SpecificHeat = v } },
	"product.viscosity[].at": func(c slotContext) slotSetter {
		i := c.index
		return func(in *HoldingInputs, v float64) { in.Viscosity[i].TempC = v }
	},
	"product.viscosity[].value": func(c slotContext) slotSetter {
		i := c.index
		return func(in *HoldingInputs, v float64) { in.Viscosity[i].Viscosity = v }
	},
	"product.power_law.flow_index":  func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.FlowIndex = v } },
	"product.power_law.consistency": func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.Consistency = v } },
	"process.hold_setpoint":         func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.Setpoint = v } },
	"holding_tube.inner_diameter":   func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.InnerDiameter = v } },
	"holding_tube.sanitary_tube": func(c slotContext) slotSetter {
		// The nominal size is the outer diameter; the listed wall is kept.
		wall2 := c.plant.HoldingTube.Outer - c.plant.HoldingTube.Inner
		if c.plant.HoldingTube.OuterDiameter.Set {
			wall2 = c.plant.HoldingTube.SanitaryTube.SI - c.nominal.InnerDiameter
			return func(in *HoldingInputs, v float64) { in.InnerDiameter = v - wall2 }
		}
		return func(in *HoldingInputs, v float64) { in.InnerDiameter, in.OuterDiameter = v-wall2, v }
	},
	"holding_tube.outer_diameter":    func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.OuterDiameter = v } },
	"holding_tube.length":            func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.Length = v } },
	"holding_tube.rise":              func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.Rise = v } },
	"holding_tube.fastest_to_mean":   func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.FastestToMean = v } },
	"holding_tube.ambient":           func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.Ambient = v } },
	"holding_tube.outer_coefficient": func(slotContext) slotSetter { return func(in *HoldingInputs, v float64) { in.OuterCoefficient = v } },
	"organisms[].D": func(c slotContext) slotSetter {
		i := c.index
		return func(in *HoldingInputs, v float64) { in.Organisms[i].D = v }
	},
	"organisms[].D_temperature": func(c slotContext) slotSetter {
		i := c.index
		return func(in *HoldingInputs, v float64) { in.Organisms[i].DTemperature = v }
	},
	"organisms[].z": func(c slotContext) slotSetter {
		i := c.index
		return func(in *HoldingInputs, v float64) { in.Organisms[i].Z = v }
	},
}

// variable is one varied input: its nominal value x, its tolerance a, the
// draws' range (Bound) and where it lands.
type variable struct {
	tol   plantfile.Tolerance
	x, a  float64
	bound plantfile.Bound
	set   slotSetter
}

// marginModel is the nominal holding tube and the inputs that vary.
type marginModel struct {
	nominal       HoldingInputs
	tables        *HoldingTables
	vars          []variable
	varyViscosity bool // a viscosity point varies: each evaluation sets its curve again
	checks        []Check
	names         []string // organism names as JSON keys (unique)
}

// newMarginModel builds the model of a plant with an uncertainty block.
func newMarginModel(p *plantfile.Plant, res *Result) (*marginModel, error) {
	if res.HoldingTube == nil || res.HoldingTube.Model == nil {
		return nil, inputerr.List{inputerr.At(p.Uncertainty[0].Pos, plantfile.UncertaintyKey,
			"margins judge the holding tube; the plant file describes none")}
	}
	m := &marginModel{nominal: res.HoldingTube.Model.Inputs}
	var err error
	if m.tables, err = NewHoldingTables(&m.nominal); err != nil {
		return nil, err
	}
	m.checks = res.HoldingTube.Model.Eval.Checks
	seen := map[string]bool{}
	for i, o := range m.nominal.Organisms {
		name := o.Name
		if seen[name] {
			name = fmt.Sprintf("%s [%d]", o.Name, i)
		}
		seen[name] = true
		m.names = append(m.names, name)
	}
	for _, t := range p.Uncertainty {
		build, ok := holdingSlots[t.Field.Path]
		if !ok {
			panic(fmt.Sprintf("%sno slot in HoldingInputs for %s", panicPrefix, t.Field.Path))
		}
		x, _ := p.Nominal(t.Path)
		c := slotContext{index: listIndexOf(t.Path), nominal: &m.nominal, plant: p}
		m.vars = append(m.vars, variable{tol: t, x: x, a: t.Half(x), bound: t.Field.Vary.Bound, set: build(c)})
		m.varyViscosity = m.varyViscosity || strings.HasPrefix(t.Field.Path, "product.viscosity[]")
	}
	return m, nil
}

// listIndexOf is the list index in a concrete path ("organisms[1].D" → 1), 0 without one.
func listIndexOf(path string) int {
	i := strings.IndexByte(path, '[')
	if i < 0 {
		return 0
	}
	j := strings.IndexByte(path[i:], ']')
	n, err := strconv.Atoi(path[i+1 : i+j])
	if err != nil {
		panic(panicPrefix + "a varied path with a bad index: " + path) // the reader checked it
	}
	return n
}

// evaluator evaluates the model at given values of the variables; each
// worker has its own (its inputs' slices and the evaluation are reused).
type evaluator struct {
	m      *marginModel
	in     HoldingInputs
	orgs   []lethality.Organism
	visc   []props.ViscosityPoint
	tables HoldingTables
	ev     HoldingEval
	lr     []float64
}

func (m *marginModel) newEvaluator() *evaluator {
	e := &evaluator{m: m, tables: *m.tables, in: m.nominal}
	// The evaluator's own copies of what the slots write into; every
	// evaluation sets every variable's slots again, so nothing else is reset.
	e.orgs = append([]lethality.Organism(nil), m.nominal.Organisms...)
	e.visc = append([]props.ViscosityPoint(nil), m.nominal.Viscosity...)
	e.in.Organisms, e.in.Viscosity = e.orgs, e.visc
	if m.varyViscosity {
		e.tables.Curve = props.ViscosityCurve{}
	}
	return e
}

// outcome is one evaluation: the fastest particle's judged time, each
// organism's judged log reduction (valid until the next evaluation) and the
// checks, in the nominal check's order.
type outcome struct {
	minResidence float64
	logRed       []float64
	checks       []Check
}

// eval runs the judged core at the values vals (one per variable, SI).
func (e *evaluator) eval(vals []float64) (outcome, error) {
	in := &e.in
	for i := range e.m.vars {
		e.m.vars[i].set(in, vals[i])
	}
	in.MassFlows()
	if e.m.varyViscosity {
		if err := e.tables.Curve.Set(in.Viscosity); err != nil {
			return outcome{}, err
		}
	}
	if err := e.ev.Judge(in, &e.tables); err != nil {
		return outcome{}, err
	}
	return outcome{minResidence: e.ev.Worst.MinResidence, checks: e.ev.Checks, logRed: e.logReductions()}, nil
}

// logReductions are the judged log reductions of the last evaluation (in
// the evaluator's slice, valid until the next).
func (e *evaluator) logReductions() []float64 {
	e.lr = e.lr[:0]
	for _, o := range e.ev.Organisms {
		e.lr = append(e.lr, o.LogReduction)
	}
	return e.lr
}

// nominalValues are the variables at their nominal values.
func (m *marginModel) nominalValues() []float64 {
	vals := make([]float64, len(m.vars))
	for i, v := range m.vars {
		vals[i] = v.x
	}
	return vals
}

// sampleError is an evaluation the model refused at drawn or end values.
func (m *marginModel) sampleError(p *plantfile.Plant, vals []float64, err error) error {
	var parts []string
	for i, v := range m.vars {
		if vals[i] != v.x {
			parts = append(parts, fmt.Sprintf("%s = %.6g", v.tol.Path, vals[i]))
		}
	}
	return inputerr.List{inputerr.At(p.Uncertainty[0].Pos, plantfile.UncertaintyKey,
		"with these tolerances the holding-tube model refuses some inputs (%s, SI): %v; narrow the tolerances", strings.Join(parts, ", "), err)}
}

// worse reports whether check a is in a worse state than b: failing is
// worse than passing, then the smaller margin is worse.
func worse(a, b Check) bool {
	if a.Pass != b.Pass {
		return !a.Pass
	}
	return a.Margin < b.Margin
}
