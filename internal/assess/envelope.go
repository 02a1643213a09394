package assess

import (
	"math"

	"pasval/internal/plantfile"
	"pasval/regen"
)

// The limiting check and the operating envelope of a product on its line
// (docs/METHOD.md §16.3).

// RelativeMargin is a check's margin over the scale of what it judges, so
// that checks of different quantities can be ranked:
//
//	heating-medium:  margin / (required medium inlet − product entering the heating section)
//	cooling-outlet:  margin / (product entering the first cooling stage − outlet target)
//	any other check: margin / |required|
//
// A temperature point has no natural zero (°C and °F would rank it
// differently), so the two temperature checks are scaled by the temperature
// change their section works across. A scale of zero gives ±Inf by the
// margin's sign (+Inf at zero margin).
func RelativeMargin(res *Result, c Check) float64 {
	scale := math.Abs(c.Required)
	switch c.ID {
	case HeatingMedium:
		if s, ok := firstSection(res, regen.HeatingSection); ok {
			scale = c.Required - s.ProductInC
		}
	case CoolingOutlet:
		if s, ok := firstSection(res, regen.CoolingSection); ok {
			scale = s.ProductInC - c.Required
		}
	}
	if !(scale > 0) {
		if c.Margin >= 0 {
			return math.Inf(1)
		}
		return math.Inf(-1)
	}
	return c.Margin / scale
}

func firstSection(res *Result, k regen.SectionKind) (Section, bool) {
	for _, s := range res.Sections {
		if s.Kind == k {
			return s, true
		}
	}
	return Section{}, false
}

// Limiting is the check that limits a product: among the failing checks when
// any fails, else among all, the one with the smallest relative margin
// (RelativeMargin); the first in print order on a tie. ok is false when no
// check applies.
func Limiting(res *Result) (c Check, relative float64, ok bool) {
	anyFail := !res.Pass
	relative = math.Inf(1)
	for _, ch := range res.Checks {
		if anyFail && ch.Pass {
			continue
		}
		if r := RelativeMargin(res, ch); !ok || r < relative {
			c, relative, ok = ch, r, true
		}
	}
	return c, relative, ok
}

// Envelope search ranges and tolerances (docs/METHOD.md §16.3).
const (
	// EnvelopeFlowStep is the ratio between neighbouring seal flows of the
	// scan, 10^(1/100) ≈ 1.023 (the grid of the legal rows' max flow).
	EnvelopeFlowStep = 1.0232929922807541
	// EnvelopeFlowCap and EnvelopeFlowFloor bound the scan, as multiples of
	// the entered seal: up to 20 × when the seal passes, down to 1/1000 ×
	// when it does not.
	EnvelopeFlowCap   = 20.0
	EnvelopeFlowFloor = 1e-3
	// EnvelopeFlowTol is the bisection's end: the passing and failing flows
	// within 1e-9 of each other, relative.
	EnvelopeFlowTol = 1e-9
	// The setpoint scan: from 30 °C up in 0.5 K steps to 150 °C (the range
	// plant files accept), then bisected to 1e-6 K.
	EnvelopeSetpointFrom = 30.0
	EnvelopeSetpointTo   = 150.0
	EnvelopeSetpointStep = 0.5
	EnvelopeSetpointTol  = 1e-6
)

// Bound is one edge of a product's envelope.
type Bound struct {
	// Found is false when nothing in the search range passes ("none in range").
	Found bool
	// Value is the edge: a seal flow in m³/s (volumetric at the setpoint, as
	// the holding tube reports its flow) or a setpoint in °C. It passes.
	Value float64
	// AtRangeEnd is true when the search's end passes: the edge is at least
	// (flow) the value.
	AtRangeEnd bool
	// LimitedBy are the checks that fail just beyond the edge, at the failing
	// end of the bisection; empty when the plant is refused there instead
	// (Refused says why) or at the range's end.
	LimitedBy []Check
	Refused   string
	// At is the whole result at Value (nil when not Found).
	At *Result
}

// Envelope is a product's operating envelope on its line, each edge found
// by bisection on the whole model (every check, as check computes it).
type Envelope struct {
	// MaxSeal is the highest seal flow that passes at the entered setpoint;
	// the normal rate moves with the seal in the entered proportion.
	MaxSeal Bound
	// MinSetpoint is the lowest setpoint that passes at the entered flows.
	MinSetpoint Bound
}

// trial is the plant computed with both rates scaled by k and the setpoint
// at setpoint: its result, whether every check passes, and why it was
// refused (a rule of the plant file or an error of the model) when it was.
func trial(p *plantfile.Plant, k, setpoint float64) (*Result, bool, string) {
	q := *p
	q.Flow.Rate.SI *= k
	q.Flow.MaxRate.SI *= k
	q.Process.HoldSetpoint.SI = setpoint
	if err := plantfile.Validate(&q); err != nil {
		return nil, false, err.Error()
	}
	res, err := Run(&q)
	if err != nil {
		return nil, false, err.Error()
	}
	return res, res.Pass, ""
}

// sealFlow is the seal flow a result computed, in m³/s at the setpoint.
func sealFlow(res *Result) float64 {
	if res.HoldingTube != nil {
		return res.HoldingTube.MaxFlowM3s
	}
	return res.Product.MaxMassFlow / res.Product.Density
}

// failing are a result's failing checks.
func failing(res *Result) []Check {
	var out []Check
	for _, c := range res.Checks {
		if !c.Pass {
			out = append(out, c)
		}
	}
	return out
}

// edge fills a bound from the passing and failing ends of a bisection.
func edge(pass, fail *Result, why string, value float64) Bound {
	b := Bound{Found: true, Value: value, At: pass, Refused: why}
	if fail != nil {
		b.LimitedBy = failing(fail)
	}
	return b
}

// FindEnvelope searches a validated plant's envelope (docs/METHOD.md §16.3).
//
// Highest seal flow: both rates are scaled by one factor k (so the normal
// rate keeps its entered proportion to the seal, and k = 1 is the plant as
// entered). From k = 1 the scan steps by EnvelopeFlowStep upward while the
// plant passes (to EnvelopeFlowCap), or downward until it passes (to
// EnvelopeFlowFloor: "none in range" below), then bisects between the last
// passing and the first failing factor to EnvelopeFlowTol. Every check
// worsens or stays as the seal rises (docs/METHOD.md §16.3), so the passing
// flows form one interval and the edge is its top.
//
// Lowest setpoint: at k = 1, the setpoint is scanned from
// EnvelopeSetpointFrom upward in EnvelopeSetpointStep steps to the first
// that passes, then bisected to EnvelopeSetpointTol between it and the step
// below; "none in range" when nothing up to EnvelopeSetpointTo passes. A
// passing band narrower than a step can be stepped over.
func FindEnvelope(p *plantfile.Plant) Envelope {
	return Envelope{MaxSeal: maxSeal(p), MinSetpoint: minSetpoint(p)}
}

func maxSeal(p *plantfile.Plant) Bound {
	sp := p.Process.HoldSetpoint.SI
	res, ok, why := trial(p, 1, sp)
	var lo, hi float64 // lo passes, hi fails
	var loRes, hiRes *Result
	var hiWhy string
	if ok {
		lo, loRes = 1, res
		for {
			k := lo * EnvelopeFlowStep
			if k >= EnvelopeFlowCap {
				r, ok, w := trial(p, EnvelopeFlowCap, sp)
				if ok {
					b := edge(r, nil, "", sealFlow(r))
					b.AtRangeEnd = true
					return b
				}
				hi, hiRes, hiWhy = EnvelopeFlowCap, r, w
				break
			}
			r, ok, w := trial(p, k, sp)
			if !ok {
				hi, hiRes, hiWhy = k, r, w
				break
			}
			lo, loRes = k, r
		}
	} else {
		hi, hiRes, hiWhy = 1, res, why
		for {
			k := hi / EnvelopeFlowStep
			if k < EnvelopeFlowFloor {
				return Bound{LimitedBy: failingOf(hiRes), Refused: hiWhy}
			}
			r, ok, w := trial(p, k, sp)
			if ok {
				lo, loRes = k, r
				break
			}
			hi, hiRes, hiWhy = k, r, w
		}
	}
	for hi-lo > EnvelopeFlowTol*lo {
		m := (lo + hi) / 2
		if m <= lo || m >= hi {
			break
		}
		r, ok, w := trial(p, m, sp)
		if ok {
			lo, loRes = m, r
		} else {
			hi, hiRes, hiWhy = m, r, w
		}
	}
	return edge(loRes, hiRes, hiWhy, sealFlow(loRes))
}

func failingOf(res *Result) []Check {
	if res == nil {
		return nil
	}
	return failing(res)
}

func minSetpoint(p *plantfile.Plant) Bound {
	var below *Result
	belowWhy := ""
	prev := math.NaN()
	for t := EnvelopeSetpointFrom; t <= EnvelopeSetpointTo+1e-9; t += EnvelopeSetpointStep {
		res, ok, why := trial(p, 1, t)
		if !ok {
			below, belowWhy, prev = res, why, t
			continue
		}
		if math.IsNaN(prev) {
			b := edge(res, nil, "", t)
			b.AtRangeEnd = true
			return b
		}
		lo, hi := prev, t // lo fails, hi passes
		pass := res
		for hi-lo > EnvelopeSetpointTol {
			m := (lo + hi) / 2
			r, ok, w := trial(p, 1, m)
			if ok {
				hi, pass = m, r
			} else {
				lo, below, belowWhy = m, r, w
			}
		}
		return edge(pass, below, belowWhy, hi)
	}
	return Bound{LimitedBy: failingOf(below), Refused: belowWhy}
}

// OnLine is one product file of a line, computed whole and with its
// envelope: a row of the matrix (pasval matrix).
type OnLine struct {
	Result   *Result
	Envelope Envelope
	// Limiting is the check that limits it (Limiting); LimitingOK is false
	// when no check applies.
	Limiting         Check
	LimitingRelative float64
	LimitingOK       bool
}

// RunOnLine computes a validated product file as check does, its limiting
// check and its envelope.
func RunOnLine(p *plantfile.Plant) (OnLine, error) {
	res, err := Run(p)
	if err != nil {
		return OnLine{}, err
	}
	o := OnLine{Result: res, Envelope: FindEnvelope(p)}
	o.Limiting, o.LimitingRelative, o.LimitingOK = Limiting(res)
	return o, nil
}
