// Package assess turns a validated plant file into results: it derives the
// product's properties, runs the heat-exchange sections (package regen), and
// judges each check. It is the one place where the plant file meets the
// domain packages; the command line only formats what it returns.
//
//	plant, err := plantfile.Load("line2.yaml")
//	res, err := assess.Run(plant)
//	fmt.Println(res.Pass, res.Checks)
//
// Product properties (documented conventions, see README "Conventions"):
//   - density: as entered, or Choi–Okos at the raw inlet temperature, where the
//     timing pump or flow meter sits (common practice);
//   - specific heat: as entered, or Choi–Okos at the mean of the raw inlet and
//     the hold setpoint; one value serves the whole line so that both sides of
//     the regenerator carry the same capacity (C_r = 1);
//   - a volumetric product rate converts to mass with that density.
package assess

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/props"
	"pasval/internal/units"
	"pasval/internal/version"
	"pasval/regen"
)

// Caution is carried by every verdict the tool prints and every record it writes.
const Caution = "This result supports, and never replaces, the regulatory acceptance tests " +
	"(holding-time test at the sealed maximum flow, flow-diversion and recorder-controller tests, " +
	"thermometer checks), the process authority and the local regulator. Defer to them and to local codes."

// Check is one judged quantity; NewCheck makes it (checks.go).
type Check struct {
	ID       CheckID `json:"id"`
	Organism string  `json:"organism,omitempty"`
	Section  string  `json:"section,omitempty"` // the section judged, as regen labels it (pressure-drop)
	Name     string  `json:"name,omitempty"`    // acceptance-other: the test's name
	// Stale is true for an acceptance test past its interval on the review
	// date: it fails whatever its values (docs/METHOD.md §15.5).
	Stale      bool    `json:"stale,omitempty"`
	Pass       bool    `json:"pass"`
	Required   float64 `json:"required"`
	Actual     float64 `json:"actual"`
	Unit       string  `json:"unit"`
	Margin     float64 `json:"margin"` // positive when passing, in MarginUnit
	MarginUnit string  `json:"margin_unit"`
	// Note is the check's note in words, made by internal/present from ID and
	// Detail (in SI for JSON); assess leaves it empty.
	Note string `json:"note"`
	// Limit says how Actual is judged against Required: "min" (actual ≥ required)
	// or "max" (actual ≤ required).
	Limit  Limit       `json:"limit"`
	Detail CheckDetail `json:"-"`
}

// CheckDetail is what a check's note tells beyond required and actual, in SI.
type CheckDetail struct {
	// holding-time: the row judged (the hottest row met, or else the hottest
	// row at or below the setpoint), or, when the setpoint is below every row,
	// the coolest row.
	RowTemperatureC float64
	BelowEveryRow   bool
	MarginPercent   float64 // of the row time
	// holding-time and log-reduction: where they were judged
	// (docs/METHOD.md §7.7, §9.4): the setpoint, the judged temperature
	// (setpoint − sensor accuracy), the flow and its regime, and whether the
	// heat-loss credit was taken.
	SetpointC, JudgedC, AccuracyK float64
	FlowM3s                       float64
	AtSeal                        bool
	Regime                        string
	CreditHeatLoss                bool
	// SealValue is the holding time at the sealed maximum; NominalValue the
	// judged quantity at the nominal setpoint (holding-time: the worst time).
	SealValue, NominalValue float64
	// holding-time at the nominal setpoint: the row judged there (NaN when
	// none applies) and whether it is met.
	NominalRowC float64
	NominalMet  bool
	// holding-time, failing: the coolest row above the judged temperature
	// whose time the tube holds, and the setpoint rise that reaches it (NaN: none).
	RowToMeetC, RiseToMeetK float64
	// heating-medium: the installed plates.
	Plates int
	// log-reduction: the organism's kinetics as entered.
	DRefS, DTemperatureC, ZK float64
	// acceptance-*: the result judged; diversion-timing: the timing.
	Test      *AcceptanceResult
	Diversion *Diversion
}

// Section is one heat-exchange section in the JSON contract; every key carries its unit.
type Section struct {
	Kind              regen.SectionKind `json:"-"`
	Name              string            `json:"name"`
	Stage             string            `json:"stage,omitempty"`
	Mode              string            `json:"mode"`
	Arrangement       string            `json:"arrangement"`
	DutyKW            float64           `json:"duty_kW"`
	LMTDK             float64           `json:"lmtd_K"`
	NTU               float64           `json:"ntu"`
	Effectiveness     float64           `json:"effectiveness"`
	AreaM2            float64           `json:"area_m2"`
	RequiredAreaM2    float64           `json:"required_area_m2"`
	InstalledAreaM2   float64           `json:"installed_area_m2"`
	Plates            int               `json:"plates"`
	PlateAreaM2       float64           `json:"plate_area_m2"`
	UWm2K             float64           `json:"u_W_m2K"`
	ProductInC        float64           `json:"product_in_C"`
	ProductOutC       float64           `json:"product_out_C"`
	OtherInC          float64           `json:"other_in_C"`
	OtherOutC         float64           `json:"other_out_C"`
	MediumAvailableC  *float64          `json:"medium_available_in_C,omitempty"`
	MediumMassFlowKgS float64           `json:"medium_mass_flow_kg_s,omitempty"`
	// PackFigures are the plate pack's results (docs/METHOD.md §12), absent
	// without one; u_W_m2K above stays the U the section used.
	*PackFigures

	raw regen.Section
}

// Raw returns the section as the regen package computed it.
func (s Section) Raw() regen.Section { return s.raw }

// ProductProps are the product properties the calculation used.
type ProductProps struct {
	Density         float64 `json:"density_kg_m3"`
	SpecificHeat    float64 `json:"specific_heat_J_kgK"`
	MassFlow        float64 `json:"mass_flow_kg_s"`     // at the normal rate
	MaxMassFlow     float64 `json:"max_mass_flow_kg_s"` // at the sealed maximum
	ProductCapacity float64 `json:"capacity_W_K"`       // ṁ·cp at the normal rate
	FromComposition bool    `json:"from_composition"`
}

// Result is everything check computes, shaped as the JSON contract.
type Result struct {
	Tool              string       `json:"tool"`
	Version           string       `json:"version"`
	InputSHA256       string       `json:"input_sha256"`
	LineFile          *SourceRef   `json:"line_file,omitempty"` // the line file the plant file names
	Product           ProductProps `json:"product"`
	Sections          []Section    `json:"sections"`
	RegenerationRatio *float64     `json:"regeneration_ratio"`
	HoldingTube       *HoldingTube `json:"holding_tube,omitempty"`
	// ArrangementComparison is filled by CompareArrangements (check --compare-arrangements).
	ArrangementComparison []ArrangementComparison `json:"arrangement_comparison,omitempty"`
	Lethality             []Lethality             `json:"lethality"`
	// ReviewDate is the date acceptance tests are judged on (YYYY-MM-DD):
	// absent when the run has none (docs/METHOD.md §15.5).
	ReviewDate string `json:"review_date,omitempty"`
	// Acceptance are the entered acceptance-test results, judged; Diversion
	// the diversion timing (docs/METHOD.md §15).
	Acceptance []AcceptanceResult `json:"acceptance,omitempty"`
	Diversion  *Diversion         `json:"diversion,omitempty"`
	// CriticalLimits is the HACCP plan's critical-limit table from the
	// validated schedule (docs/METHOD.md §15.6): a draft for the HACCP team.
	CriticalLimits []CriticalLimit `json:"critical_limits"`
	Checks         []Check         `json:"checks"`
	Warnings       []Warning       `json:"warnings"`
	Pass           bool            `json:"pass"`
	// Margins are the holding tube's margins under the plant file's
	// uncertainty block (RunMargins with the default samples and seed),
	// filled by the commands that show them; absent without the block.
	Margins *Margins `json:"margins,omitempty"`
	Caution string   `json:"caution"`

	Plant *plantfile.Plant `json:"-"`
}

// SourceRef names an input file and its SHA-256 (hex).
type SourceRef struct {
	File   string `json:"file"`
	SHA256 string `json:"sha256"`
}

// Options are what a run needs besides the plant file.
type Options struct {
	// On is the review date (a civil date, midnight UTC): acceptance tests
	// dated after it are refused, and a latest result past its interval on
	// it is stale and fails its check (docs/METHOD.md §15.5). Zero: no
	// review date; no result is refused or stale.
	On time.Time
}

// Run computes every section and check the plant file describes, with no
// review date (see RunWith). Errors are inputerr.List values that point at
// the section whose numbers cannot work (a temperature cross, an impossible
// duty), or at the entered values that make a result not a finite number
// (finite.go).
func Run(p *plantfile.Plant) (*Result, error) { return RunWith(p, Options{}) }

// RunWith is Run on the review date opts.On.
func RunWith(p *plantfile.Plant, opts Options) (*Result, error) {
	if err := RefuseFutureTests(p, opts.On); err != nil {
		return nil, err
	}
	return finiteOrTraced(p, func(q *plantfile.Plant) (*Result, error) { return runOn(q, opts.On) })
}

// run is Run without the finiteness check (and without a review date).
func run(p *plantfile.Plant) (*Result, error) { return runOn(p, time.Time{}) }

// runOn is RunWith without the finiteness check.
func runOn(p *plantfile.Plant, on time.Time) (*Result, error) {
	res := &Result{Tool: "pasval", Version: version.Version, InputSHA256: p.SHA256, Plant: p,
		Checks: []Check{}, Warnings: []Warning{}, Sections: []Section{}, Lethality: []Lethality{}, Caution: Caution}
	if !on.IsZero() {
		res.ReviewDate = FormatDate(on)
	}
	if l := p.Line; l != nil {
		res.LineFile = &SourceRef{File: l.File, SHA256: l.SHA256}
	}
	res.Product = productProps(p)
	if err := ratesInOrder(p, res.Product); err != nil {
		return nil, err
	}
	heatingOutlet := p.Process.HoldSetpoint.SI
	if p.HoldingTube != nil {
		var err error
		if heatingOutlet, err = runHolding(p, res); err != nil {
			return nil, err
		}
	}
	if p.Regeneration != nil || p.Heating != nil || len(p.Cooling) > 0 {
		if err := runLine(p, res, heatingOutlet); err != nil {
			return nil, err
		}
	}
	if p.Regeneration != nil && p.Regeneration.Pressure != nil {
		regeneratorPressure(p, res)
	}
	runAcceptance(p, res, on)
	res.CriticalLimits = criticalLimits(p, res, DueList(res, on))
	sanityWarnings(p, res)
	res.Pass = true
	for _, c := range res.Checks {
		res.Pass = res.Pass && c.Pass
	}
	return res, nil
}

// productProps derives density, cp and mass flows (see the package doc).
func productProps(p *plantfile.Plant) ProductProps {
	pp := ProductProps{}
	raw, set := p.Process.RawInlet.SI, p.Process.HoldSetpoint.SI
	if c := p.Product.Composition; c != nil {
		comp := choiOkos(c)
		pp.Density = comp.Density(raw)
		pp.SpecificHeat = comp.SpecificHeat((raw + set) / 2)
		pp.FromComposition = true
	}
	if p.Product.Density.Set {
		pp.Density = p.Product.Density.SI
	}
	if p.Product.SpecificHeat.Set {
		pp.SpecificHeat = p.Product.SpecificHeat.SI
	}
	toMass := func(r plantfile.FlowRate) float64 {
		if r.ByMass {
			return r.SI
		}
		return r.SI * pp.Density
	}
	rate, maxRate := p.Flow.Rate, p.Flow.MaxRate
	if !rate.Set {
		rate = maxRate
	}
	if !maxRate.Set {
		maxRate = rate
	}
	pp.MassFlow, pp.MaxMassFlow = toMass(rate), toMass(maxRate)
	pp.ProductCapacity = pp.MassFlow * pp.SpecificHeat
	return pp
}

// ratesInOrder refuses a normal rate above the sealed maximum, compared as
// mass flows (a volumetric rate × the product density), so that "20000 kg/h"
// is compared with "11000 L/h" too.
func ratesInOrder(p *plantfile.Plant, pp ProductProps) error {
	r, m := p.Flow.Rate, p.Flow.MaxRate
	if !r.Set || !m.Set || !(pp.MassFlow > pp.MaxMassFlow*(1+1e-12)) {
		return nil
	}
	msg := fmt.Sprintf("the normal rate %s is above the sealed maximum %s", r.Text, m.Text)
	if r.ByMass != m.ByMass {
		msg += fmt.Sprintf(" (%.0f kg/h against %.0f kg/h at %.6g kg/m³)", pp.MassFlow*3600, pp.MaxMassFlow*3600, pp.Density)
	}
	return inputerr.List{inputerr.At(r.Pos, "flow.rate", "%s; the timing pump cannot run faster than its seal", msg)}
}

// choiOkos is the one conversion of the entered composition for the
// Choi–Okos correlations.
func choiOkos(c *plantfile.Composition) props.Composition {
	return props.Composition{Water: c.Water, Protein: c.Protein, Fat: c.Fat, Carbohydrate: c.Carbohydrate, Fiber: c.Fiber, Ash: c.Ash}
}

func surface(pl plantfile.Plates) regen.Surface {
	u := pl.UValue.SI // 0 with a plate pack and no u_value: the pack sets U
	if pl.Fouling.Set && pl.Fouling.SI > 0 && u > 0 {
		u = 1 / (1/u + pl.Fouling.SI)
	}
	s := regen.Surface{U: u, PlateArea: pl.PlateArea.SI, Plates: pl.Plates}
	if pl.Arrangement == plantfile.Cocurrent {
		s.Arrangement = regen.Cocurrent
	}
	return s
}

func mediumSpec(m plantfile.MediumSide) regen.MediumSpec {
	spec := regen.MediumSpec{Surface: surface(m.Plates), Inlet: m.MediumInlet.SI,
		Medium: regen.Medium{Name: m.Medium.Name, Water: m.Medium.Water, Density: m.Medium.Density.SI, SpecificHeat: m.Medium.SpecificHeat.SI}}
	if m.MediumRate.ByMass {
		spec.Flow.Mass = m.MediumRate.SI
	} else {
		spec.Flow.Volumetric = m.MediumRate.SI
	}
	return spec
}

func runLine(p *plantfile.Plant, res *Result, heatingOutlet float64) error {
	in := regen.LineInput{
		ProductCapacity: res.Product.ProductCapacity,
		RawInlet:        p.Process.RawInlet.SI,
		Setpoint:        p.Process.HoldSetpoint.SI,
		HeatingOutlet:   heatingOutlet,
		OutletTarget:    p.Process.OutletTarget.SI,
	}
	if r := p.Regeneration; r != nil {
		in.Regeneration = &regen.RegenSpec{Surface: surface(r.Plates), Ratio: r.Ratio}
	}
	if h := p.Heating; h != nil {
		spec := mediumSpec(h.MediumSide)
		in.Heating = &spec
	}
	for _, c := range p.Cooling {
		cs := regen.CoolingSpec{MediumSpec: mediumSpec(c.MediumSide), Stage: c.Name, ProductOut: math.NaN()}
		if c.ProductOut.Set {
			cs.ProductOut = c.ProductOut.SI
		}
		in.Cooling = append(in.Cooling, cs)
	}
	if err := linePacks(p, res.Product, &in); err != nil {
		return err
	}
	line, err := regen.Line(in)
	if err != nil {
		return sectionError(p, err)
	}
	for _, s := range line.Sections {
		out := Section{
			Kind: s.Kind, Name: s.Kind.String(), Stage: s.Stage, Mode: s.Mode.String(), Arrangement: s.Arrangement.String(),
			DutyKW: s.Duty / 1e3, LMTDK: s.LMTD, NTU: s.NTU, Effectiveness: s.Effectiveness,
			AreaM2: s.Area(), RequiredAreaM2: s.RequiredArea, InstalledAreaM2: s.InstalledArea,
			Plates: s.Plates, PlateAreaM2: s.PlateArea, UWm2K: s.U,
			ProductInC: s.ProductIn, ProductOutC: s.ProductOut, OtherInC: s.OtherIn, OtherOutC: s.OtherOut,
			MediumMassFlowKgS: s.MediumMassFlow, PackFigures: packFigures(s.Pack), raw: s,
		}
		if s.Kind == regen.HeatingSection && s.Mode == regen.Rating {
			avail := line.HeatingMediumAvailable
			out.MediumAvailableC = &avail
			c := NewCheck(HeatingMedium, s.OtherIn, avail)
			c.Detail.Plates = s.Plates
			res.Checks = append(res.Checks, c)
		}
		res.Sections = append(res.Sections, out)
		packResults(p, res, out)
	}
	if !math.IsNaN(line.RegenerationRatio) {
		r := line.RegenerationRatio
		res.RegenerationRatio = &r
	}
	if n := len(p.Cooling); n > 0 && anyRated(p.Cooling) {
		res.Checks = append(res.Checks, NewCheck(CoolingOutlet, p.Process.OutletTarget.SI, line.FinalProductOut))
	}
	lineWarnings(p, res, line)
	return nil
}

func anyRated(stages []plantfile.CoolingStage) bool {
	for _, c := range stages {
		if c.Plates.Plates > 0 {
			return true
		}
	}
	return false
}

// sectionError points a computation error at the section it came from.
func sectionError(p *plantfile.Plant, err error) error {
	name, msg := "", err.Error()
	var ce *regen.CrossError
	var se *regen.SectionError
	var pe *regen.PackError
	switch {
	case errors.As(err, &ce):
		name, msg = ce.Section, ce.Detail()
	case errors.As(err, &pe):
		if field, pl := sectionPlates(p, pe.Section); pl != nil {
			if e := packInputError(field, *pl, pe.Err); e != nil {
				return e
			}
		}
		name, msg = pe.Section, pe.Err.Error()
	case errors.As(err, &se):
		name, msg = se.Section, se.Err.Error()
	}
	pos, field := p.Process.Pos, "process"
	switch {
	case name == "regeneration" && p.Regeneration != nil:
		pos, field = p.Regeneration.Pos, "regeneration"
	case name == "heating" && p.Heating != nil:
		pos, field = p.Heating.Pos, "heating"
	default:
		for i, c := range p.Cooling {
			if name == (regen.Section{Kind: regen.CoolingSection, Stage: c.Name}).Label() {
				pos, field = c.Pos, fmt.Sprintf("cooling[%d]", i)
			}
		}
	}
	if field == "process" {
		msg = err.Error()
	}
	if p.System == units.US {
		msg = inUSUnits(msg)
	}
	return inputerr.List{{Pos: pos, Field: field, Msg: msg}}
}

var (
	celsiusRe = regexp.MustCompile(`(-?\d+(?:\.\d+)?) °C`)
	arrowRe   = regexp.MustCompile(`(-?\d+(?:\.\d+)?) → (-?\d+(?:\.\d+)?) °C`)
	kelvinRe  = regexp.MustCompile(`(-?\d+(?:\.\d+)?) K\b`)
)

// inUSUnits rewrites the temperatures of an engine's message for a plant
// written in °F: the engines word their errors in SI ("72.00 °C", "3.50 K"),
// and a user of a °F file reads them in °F (points and differences).
func inUSUnits(msg string) string {
	conv := func(re *regexp.Regexp, s string, f func(float64) float64) string {
		return re.ReplaceAllStringFunc(s, func(m string) string {
			num := re.FindStringSubmatch(m)[1]
			v, err := strconv.ParseFloat(num, 64)
			if err != nil {
				return m
			}
			return fmt.Sprintf("%.*f °F", decimals(num), f(v))
		})
	}
	toF := func(c float64) float64 { return c*9/5 + 32 }
	// "A → B °C": the unit follows the second of a pair.
	msg = arrowRe.ReplaceAllStringFunc(msg, func(m string) string {
		g := arrowRe.FindStringSubmatch(m)
		a, err1 := strconv.ParseFloat(g[1], 64)
		b, err2 := strconv.ParseFloat(g[2], 64)
		if err1 != nil || err2 != nil {
			return m
		}
		return fmt.Sprintf("%.*f → %.*f °F", decimals(g[1]), toF(a), decimals(g[2]), toF(b))
	})
	msg = conv(celsiusRe, msg, toF)
	return conv(kelvinRe, msg, func(k float64) float64 { return k * 9 / 5 })
}

// decimals is the number of digits after the point in a formatted number.
func decimals(num string) int {
	if i := strings.IndexByte(num, '.'); i >= 0 {
		return len(num) - i - 1
	}
	return 0
}
