package assess

import (
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"

	"pasval/internal/plantfile"
)

// Defaults of margins: the sample count, and the seed every record
// reproduces with (printed beside every result).
const (
	DefaultSamples = 100000
	DefaultSeed    = 14
	// marginBlock is the number of samples drawn from one random stream;
	// part of what makes a result reproducible (changing it changes the draws).
	marginBlock = 4096
)

// MarginOptions set the Monte Carlo run.
type MarginOptions struct {
	Samples int    // ≥ 1
	Seed    uint64 // the random streams are PCG(seed, block index)
	// KeepSamples keeps every sample's drawn inputs and outcome (Result.Samples).
	KeepSamples bool
}

// Margins is margins under uncertainty in the JSON contract (docs/METHOD.md §14).
type Margins struct {
	Organisms   []string      `json:"organisms"` // the keys of the maps by organism, in plant-file order
	Inputs      []MarginInput `json:"inputs"`
	Nominal     MarginValues  `json:"nominal"`
	WorstCase   WorstCase     `json:"worst_case"`
	MonteCarlo  MonteCarlo    `json:"monte_carlo"`
	Sensitivity []Sensitivity `json:"sensitivity"`
	// Samples are every sample's inputs and outcome, kept on request.
	Samples *MarginSamples `json:"-"`
}

// MarginInput is one varied input: nominal, tolerance a (SI) and the ends x ± a.
type MarginInput struct {
	Field        string  `json:"field"`
	Tolerance    string  `json:"tolerance"`
	Distribution string  `json:"distribution"`
	Nominal      float64 `json:"nominal"`
	HalfWidth    float64 `json:"tolerance_si"`
	Low          float64 `json:"low"`
	High         float64 `json:"high"`
	SIUnit       string  `json:"si_unit"`
}

// MarginValues are the judged fastest-particle time and log reductions of one evaluation.
type MarginValues struct {
	MinResidenceS          float64            `json:"min_residence_s"`
	LogReductionByOrganism map[string]float64 `json:"log_reduction_by_organism"`
}

// WorstCase is docs/METHOD.md §14.2: per check, every input at the end that
// lowers its margin.
type WorstCase struct {
	MinResidenceS          float64            `json:"min_residence_s"`
	LogReductionByOrganism map[string]float64 `json:"log_reduction_by_organism"`
	Checks                 []WorstCheck       `json:"checks"`
}

// WorstCheck is one check at its worst case; Ends names each input moved
// off its nominal value: "low" (x − a) or "high" (x + a).
type WorstCheck struct {
	ID       CheckID           `json:"id"`
	Organism string            `json:"organism,omitempty"`
	Pass     bool              `json:"pass"`
	Actual   float64           `json:"actual"`
	Required float64           `json:"required"`
	Margin   float64           `json:"margin"`
	Unit     string            `json:"unit"`
	Ends     map[string]string `json:"ends"`
	check    Check
}

// Check is the check as judged at the worst case.
func (w WorstCheck) Check() Check { return w.check }

// MonteCarlo is docs/METHOD.md §14.3.
type MonteCarlo struct {
	Samples                int                    `json:"samples"`
	Seed                   uint64                 `json:"seed"`
	Checks                 []Probability          `json:"checks"`
	AllChecks              Probability            `json:"all_checks"`
	MinResidenceS          Percentiles            `json:"min_residence_s"`
	LogReductionByOrganism map[string]Percentiles `json:"log_reduction_by_organism"`
}

// Probability is the share of samples in which a check holds, with its
// standard error √(P(1 − P)/N).
type Probability struct {
	ID            CheckID `json:"id,omitempty"`
	Organism      string  `json:"organism,omitempty"`
	Probability   float64 `json:"probability"`
	StandardError float64 `json:"standard_error"`
}

// Percentiles are nearest-rank percentiles (rank ⌈q·N⌉ in ascending order).
type Percentiles struct {
	P01 float64 `json:"p01"`
	P05 float64 `json:"p05"`
	P50 float64 `json:"p50"`
}

// Sensitivity is one input swung alone across its tolerance (docs/METHOD.md §14.4).
type Sensitivity struct {
	Field                   string             `json:"field"`
	LowMinResidenceS        float64            `json:"low_min_residence_s"`
	HighMinResidenceS       float64            `json:"high_min_residence_s"`
	SwingS                  float64            `json:"swing_s"`
	LowLogReduction         map[string]float64 `json:"low_log_reduction_by_organism"`
	HighLogReduction        map[string]float64 `json:"high_log_reduction_by_organism"`
	SwingLogReduction       map[string]float64 `json:"swing_log_reduction_by_organism"`
	relativeLogReductionMax float64
}

// MarginSamples are the Monte Carlo samples in sample order: Inputs[v][s]
// is variable v (in the uncertainty block's order) in sample s.
type MarginSamples struct {
	Fields       []string
	Inputs       [][]float64
	MinResidence []float64
	LogReduction [][]float64 // [organism][sample]
	Pass         [][]bool    // [check][sample]
	Checks       []Check     // the nominal checks, naming Pass's rows
	Organisms    []string
}

// RunMargins computes the worst case, the Monte Carlo estimates and the
// sensitivity of a plant file's holding tube under its uncertainty block
// (docs/METHOD.md §14); res is the plant's Result from Run. Bad tolerances
// are refused by the reader; an input the model refuses at drawn values is
// an inputerr.List naming the uncertainty block.
func RunMargins(p *plantfile.Plant, res *Result, opts MarginOptions) (*Margins, error) {
	m, err := newMarginModel(p, res)
	if err != nil {
		return nil, err
	}
	if opts.Samples < 1 {
		panic(panicPrefix + "RunMargins needs at least one sample")
	}
	out := &Margins{Organisms: m.names}
	for _, v := range m.vars {
		unit := siUnitOf(p, v.tol.Path)
		out.Inputs = append(out.Inputs, MarginInput{Field: v.tol.Path, Tolerance: v.tol.Text, Distribution: string(v.tol.Distribution),
			Nominal: v.x, HalfWidth: v.a, Low: v.x - v.a, High: v.x + v.a, SIUnit: unit})
	}
	e := m.newEvaluator()
	nominal := m.nominalValues()
	o, err := e.eval(nominal)
	if err != nil {
		return nil, m.sampleError(p, nominal, err)
	}
	out.Nominal = MarginValues{MinResidenceS: o.minResidence, LogReductionByOrganism: m.byName(o.logRed)}
	ends, err := m.ends(p, e)
	if err != nil {
		return nil, err
	}
	out.WorstCase, err = m.worstCase(p, e, ends)
	if err != nil {
		return nil, err
	}
	out.Sensitivity = m.sensitivity(ends, o)
	out.MonteCarlo, out.Samples, err = m.monteCarlo(p, opts)
	if err != nil {
		return nil, err
	}
	return out, nil
}

// siUnitOf is the SI unit of an entered value, as the reader recorded it.
func siUnitOf(p *plantfile.Plant, path string) string {
	for _, in := range p.Inputs {
		if in.Field == path {
			return in.SIUnit
		}
	}
	return ""
}

func (m *marginModel) byName(vals []float64) map[string]float64 {
	out := make(map[string]float64, len(vals))
	for i, v := range vals {
		out[m.names[i]] = v
	}
	return out
}

// endOutcome is an evaluation with one input at an end, the others nominal.
type endOutcome struct {
	minResidence float64
	logRed       []float64
	checks       []Check
}

// ends evaluates each input alone at x − a and x + a: [variable][0 low, 1 high].
func (m *marginModel) ends(p *plantfile.Plant, e *evaluator) ([][2]endOutcome, error) {
	out := make([][2]endOutcome, len(m.vars))
	vals := m.nominalValues()
	for i, v := range m.vars {
		for j, x := range []float64{v.x - v.a, v.x + v.a} {
			vals[i] = x
			o, err := e.eval(vals)
			if err != nil {
				return nil, m.sampleError(p, vals, err)
			}
			out[i][j] = endOutcome{o.minResidence, append([]float64(nil), o.logRed...), append([]Check(nil), o.checks...)}
		}
		vals[i] = v.x
	}
	return out, nil
}

// keptEnds picks, for one quantity, each input's end that makes it worse
// than nominal (the worse of the two when both do; nominal when neither
// does): -1 low, +1 high, 0 nominal. worseThan(o, nominal) compares.
func (m *marginModel) keptEnds(ends [][2]endOutcome, worseThan func(a, b endOutcome) bool, nominal endOutcome) []int {
	kept := make([]int, len(m.vars))
	for i := range m.vars {
		lo, hi := ends[i][0], ends[i][1]
		switch wl, wh := worseThan(lo, nominal), worseThan(hi, nominal); {
		case wl && wh && worseThan(hi, lo):
			kept[i] = 1
		case wl:
			kept[i] = -1
		case wh:
			kept[i] = 1
		}
	}
	return kept
}

// atEnds evaluates with every input at its kept end.
func (m *marginModel) atEnds(p *plantfile.Plant, e *evaluator, kept []int) (outcome, map[string]string, error) {
	vals := m.nominalValues()
	names := map[string]string{}
	for i, v := range m.vars {
		switch kept[i] {
		case -1:
			vals[i], names[v.tol.Path] = v.x-v.a, "low"
		case 1:
			vals[i], names[v.tol.Path] = v.x+v.a, "high"
		}
	}
	o, err := e.eval(vals)
	if err != nil {
		return o, nil, m.sampleError(p, vals, err)
	}
	return o, names, nil
}

// worstCase is docs/METHOD.md §14.2.
func (m *marginModel) worstCase(p *plantfile.Plant, e *evaluator, ends [][2]endOutcome) (WorstCase, error) {
	o0, err := e.eval(m.nominalValues())
	if err != nil {
		return WorstCase{}, m.sampleError(p, m.nominalValues(), err)
	}
	nominal := endOutcome{o0.minResidence, append([]float64(nil), o0.logRed...), append([]Check(nil), o0.checks...)}
	wc := WorstCase{LogReductionByOrganism: map[string]float64{}, Checks: []WorstCheck{}}
	for k, c := range nominal.checks {
		kept := m.keptEnds(ends, func(a, b endOutcome) bool { return worse(a.checks[k], b.checks[k]) }, nominal)
		o, names, err := m.atEnds(p, e, kept)
		if err != nil {
			return wc, err
		}
		w := o.checks[k]
		wc.Checks = append(wc.Checks, WorstCheck{ID: c.ID, Organism: c.Organism, Pass: w.Pass, Actual: w.Actual, Required: w.Required,
			Margin: w.Margin, Unit: w.Unit, Ends: names, check: w})
	}
	// The fastest-particle time with the ends kept for holding-time (those that
	// shorten it, without legal rows); each log reduction with the ends kept
	// for its check (those that lower it, without a required value).
	kept := m.keptEnds(ends, func(a, b endOutcome) bool { return a.minResidence < b.minResidence }, nominal)
	if k := checkIndex(nominal.checks, HoldingTime, ""); k >= 0 {
		kept = m.keptEnds(ends, func(a, b endOutcome) bool { return worse(a.checks[k], b.checks[k]) }, nominal)
	}
	o, _, err := m.atEnds(p, e, kept)
	if err != nil {
		return wc, err
	}
	wc.MinResidenceS = o.minResidence
	for i := range m.nominal.Organisms {
		kept := m.keptEnds(ends, func(a, b endOutcome) bool { return a.logRed[i] < b.logRed[i] }, nominal)
		if m.nominal.Judged[i] {
			k := checkIndex(nominal.checks, LogReduction, m.nominal.Organisms[i].Name)
			kept = m.keptEnds(ends, func(a, b endOutcome) bool { return worse(a.checks[k], b.checks[k]) }, nominal)
		}
		o, _, err := m.atEnds(p, e, kept)
		if err != nil {
			return wc, err
		}
		wc.LogReductionByOrganism[m.names[i]] = o.logRed[i]
	}
	return wc, nil
}

// checkIndex finds a check in the evaluation's list (-1: none).
func checkIndex(cs []Check, id CheckID, organism string) int {
	for k, c := range cs {
		if c.ID == id && c.Organism == organism {
			return k
		}
	}
	return -1
}

// sensitivity is docs/METHOD.md §14.4: ranked by the swing of the
// fastest-particle time, then by the largest swing of a log reduction
// relative to its nominal value, then in the block's order.
func (m *marginModel) sensitivity(ends [][2]endOutcome, nominal outcome) []Sensitivity {
	out := []Sensitivity{}
	for i, v := range m.vars {
		lo, hi := ends[i][0], ends[i][1]
		s := Sensitivity{Field: v.tol.Path, LowMinResidenceS: lo.minResidence, HighMinResidenceS: hi.minResidence,
			SwingS: math.Abs(hi.minResidence - lo.minResidence), LowLogReduction: m.byName(lo.logRed), HighLogReduction: m.byName(hi.logRed),
			SwingLogReduction: map[string]float64{}}
		for j, name := range m.names {
			sw := math.Abs(hi.logRed[j] - lo.logRed[j])
			s.SwingLogReduction[name] = sw
			if nominal.logRed[j] > 0 {
				s.relativeLogReductionMax = math.Max(s.relativeLogReductionMax, sw/nominal.logRed[j])
			}
		}
		out = append(out, s)
	}
	sort.SliceStable(out, func(a, b int) bool {
		if out[a].SwingS != out[b].SwingS {
			return out[a].SwingS > out[b].SwingS
		}
		return out[a].relativeLogReductionMax > out[b].relativeLogReductionMax
	})
	return out
}

// draw is one value of a variable from the stream r (docs/METHOD.md §14.1):
// uniform on x ± a; triangular on x ± a with its mode at x (the sum of two
// uniforms); normal with σ = a/2, drawn again outside x ± 1.5a or the bounds.
func (v *variable) draw(r *rand.Rand) float64 {
	switch v.tol.Distribution {
	case plantfile.Uniform:
		return v.x + v.a*(2*r.Float64()-1)
	case plantfile.Triangular:
		return v.x + v.a*(r.Float64()+r.Float64()-1)
	case plantfile.Normal:
		for {
			z := r.NormFloat64()
			if z < -3 || z > 3 {
				continue
			}
			if x := v.x + v.a/2*z; v.bound.Contains(x) {
				return x
			}
		}
	}
	panic(panicPrefix + "unknown distribution " + string(v.tol.Distribution))
}

// monteCarlo is docs/METHOD.md §14.3: fixed blocks of samples, each from
// its own stream PCG(seed, block), taken by the workers in any order and
// written to the samples' own places, so that the result does not depend on
// the number of cores.
func (m *marginModel) monteCarlo(p *plantfile.Plant, opts MarginOptions) (MonteCarlo, *MarginSamples, error) {
	n := opts.Samples
	nChecks := len(m.checks)
	tmin := make([]float64, n)
	lr := make([][]float64, len(m.names))
	for i := range lr {
		lr[i] = make([]float64, n)
	}
	var kept *MarginSamples
	if opts.KeepSamples {
		kept = &MarginSamples{Inputs: make([][]float64, len(m.vars)), Pass: make([][]bool, nChecks), Checks: m.checks, Organisms: m.names}
		for i, v := range m.vars {
			kept.Fields = append(kept.Fields, v.tol.Path)
			kept.Inputs[i] = make([]float64, n)
		}
		for k := range kept.Pass {
			kept.Pass[k] = make([]bool, n)
		}
	}
	blocks := (n + marginBlock - 1) / marginBlock
	counts := make([][]int, blocks) // per block: each check, then all checks together
	errs := make([]error, blocks)
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), blocks) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			e := m.newEvaluator()
			vals := make([]float64, len(m.vars))
			for {
				b := int(next.Add(1) - 1)
				if b >= blocks {
					return
				}
				r := rand.New(rand.NewPCG(opts.Seed, uint64(b)))
				c := make([]int, nChecks+1)
				for s := b * marginBlock; s < min(n, (b+1)*marginBlock); s++ {
					for i := range m.vars {
						vals[i] = m.vars[i].draw(r)
					}
					o, err := e.eval(vals)
					if err != nil {
						errs[b] = m.sampleError(p, vals, err)
						break
					}
					tmin[s] = o.minResidence
					for i, v := range o.logRed {
						lr[i][s] = v
					}
					all := true
					for k := range o.checks { // by index: a Check is large to copy
						if o.checks[k].Pass {
							c[k]++
						} else {
							all = false
						}
					}
					if all {
						c[nChecks]++
					}
					if kept != nil {
						for i := range vals {
							kept.Inputs[i][s] = vals[i]
						}
						for k := range o.checks {
							kept.Pass[k][s] = o.checks[k].Pass
						}
					}
				}
				counts[b] = c
			}
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return MonteCarlo{}, nil, err
		}
	}
	total := make([]int, nChecks+1)
	for _, c := range counts { // in block order
		for k := range total {
			total[k] += c[k]
		}
	}
	if kept != nil {
		kept.MinResidence = append([]float64(nil), tmin...)
		for _, x := range lr {
			kept.LogReduction = append(kept.LogReduction, append([]float64(nil), x...))
		}
	}
	mc := MonteCarlo{Samples: n, Seed: opts.Seed, Checks: []Probability{}, LogReductionByOrganism: map[string]Percentiles{}}
	for k, c := range m.checks {
		pr := probability(total[k], n)
		pr.ID, pr.Organism = c.ID, c.Organism
		mc.Checks = append(mc.Checks, pr)
	}
	mc.AllChecks = probability(total[nChecks], n)
	mc.MinResidenceS = percentiles(tmin)
	for i, name := range m.names {
		mc.LogReductionByOrganism[name] = percentiles(lr[i])
	}
	return mc, kept, nil
}

// probability is P̂ = k/N with SE = √(P̂(1 − P̂)/N).
func probability(k, n int) Probability {
	p := float64(k) / float64(n)
	return Probability{Probability: p, StandardError: math.Sqrt(p * (1 - p) / float64(n))}
}

// percentiles are the nearest-rank p01, p05 and p50 of x (reordered in place).
func percentiles(x []float64) Percentiles {
	rank := func(perCent int) int { return (len(x)*perCent+99)/100 - 1 } // ⌈q·N⌉, 0-based
	k50, k05, k01 := rank(50), rank(5), rank(1)
	p50 := selectKth(x, k50)
	p05 := selectKth(x[:k50+1], k05)
	p01 := selectKth(x[:k05+1], k01)
	return Percentiles{P01: p01, P05: p05, P50: p50}
}

// selectKth puts the k-th smallest value of x (0-based) at x[k], the smaller
// before it and the larger after, and returns it: quickselect with a
// median-of-three pivot, falling back to a sort of what is left after 64 rounds.
func selectKth(x []float64, k int) float64 {
	lo, hi := 0, len(x)-1
	for round := 0; hi > lo; round++ {
		if round == 64 {
			sort.Float64s(x[lo : hi+1])
			break
		}
		mid := lo + (hi-lo)/2
		if x[mid] < x[lo] {
			x[mid], x[lo] = x[lo], x[mid]
		}
		if x[hi] < x[lo] {
			x[hi], x[lo] = x[lo], x[hi]
		}
		if x[hi] < x[mid] {
			x[hi], x[mid] = x[mid], x[hi]
		}
		pivot := x[mid]
		i, j := lo, hi
		for i <= j {
			for x[i] < pivot {
				i++
			}
			for x[j] > pivot {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}
