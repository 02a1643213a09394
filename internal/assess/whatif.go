package assess

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/regen"
)

// PlatesOption is the line with a given number of regeneration plates.
type PlatesOption struct {
	AddedPlates            int       `json:"added_plates"`
	Plates                 int       `json:"plates"`
	RegenerationRatio      float64   `json:"regeneration_ratio"`
	RawOutC                float64   `json:"raw_out_C"`         // raw product leaving regeneration
	PasteurizedOutC        float64   `json:"pasteurized_out_C"` // pasteurized product leaving regeneration
	HeatingDutyKW          float64   `json:"heating_duty_kW"`   // the heating section's duty (without one: raw out → heater outlet)
	CoolingDutyKW          float64   `json:"cooling_duty_kW"`   // the cooling stages' duty (without stages: pasteurized out → outlet target)
	HeatingMediumRequiredC *float64  `json:"heating_medium_required_C"`
	CoolingOutletC         *float64  `json:"cooling_outlet_C"`
	HeatingSavedKW         float64   `json:"heating_saved_kW"`
	CoolingSavedKW         float64   `json:"cooling_saved_kW"`
	AnnualEnergySavedKWh   *float64  `json:"annual_energy_saved_kWh"` // heating + cooling; needs economics
	AnnualCostSaved        *float64  `json:"annual_cost_saved"`
	PaybackYears           *float64  `json:"payback_years"`
	ChecksPass             bool      `json:"checks_pass"`
	FailedChecks           []CheckID `json:"failed_checks"`
	// OptionPack is the regenerator's plate pack in this option (absent
	// without one).
	*OptionPack
}

// OptionPack is a what-if option's regenerator plate pack: the layout the
// added plates gave, the U the line used and the product-side pressure drop.
type OptionPack struct {
	// RequestedAddedPlates is the number asked for; AddedPlates is what
	// whole passes or whole channels per pass give (Layout).
	RequestedAddedPlates   int     `json:"requested_added_plates"`
	PassesProduct          int     `json:"passes_product"`
	ChannelsPerPassProduct int     `json:"channels_per_pass_product"`
	PassesOther            int     `json:"passes_other"`
	ChannelsPerPassOther   int     `json:"channels_per_pass_other"`
	UWm2K                  float64 `json:"u_W_m2K"`         // the U the regenerator was computed with
	UServiceWm2K           float64 `json:"u_service_W_m2K"` // the pack's; equal to u_W_m2K unless u_value is entered
	UEntered               bool    `json:"u_entered"`
	VelocityProductMS      float64 `json:"velocity_product_m_s"`
	PressureDropProductKPa float64 `json:"pressure_drop_product_kPa"`
}

// Layout says how plates added to a regenerator with a plate pack are laid
// out (docs/METHOD.md §12.4).
type Layout string

const (
	LayoutNone Layout = "" // a regenerator without a plate pack: plates, U unchanged
	// LayoutPasses adds whole passes to both sides: the channel velocity,
	// and so U, stay; the pressure drop grows with the passes.
	LayoutPasses Layout = "passes"
	// LayoutChannels adds channels per pass to both sides: the velocity
	// falls, and with it U and the pressure drop.
	LayoutChannels Layout = "channels"
)

// Layouts are the layouts a plate pack takes, for flags and messages.
var Layouts = []Layout{LayoutPasses, LayoutChannels}

// LayoutStep is the number of thermal plates one step of the layout adds to
// a pack: one more pass on each side adds both sides' channels per pass; one
// more channel per pass on each side adds both sides' passes.
func LayoutStep(pk *plantfile.PlatePack, l Layout) int {
	switch l {
	case LayoutPasses:
		return pk.Product.ChannelsPerPass + pk.Other.ChannelsPerPass
	case LayoutChannels:
		return pk.Product.Passes + pk.Other.Passes
	}
	panic(fmt.Sprintf("%sno step for layout %q", panicPrefix, l))
}

// WhatIf compares the line with more regeneration plates against its baseline.
type WhatIf struct {
	Baseline     PlatesOption   `json:"baseline"`
	Options      []PlatesOption `json:"options"`
	Currency     string         `json:"currency,omitempty"`
	KneeAdded    *int           `json:"knee_added_plates"` // sweeps: beyond this, each 10 plates save < KneeFraction of the first 10
	KneeFraction float64        `json:"knee_fraction"`
	// Layout and LayoutStep: with a plate pack, how the plates were added
	// and how many plates one whole step adds (options are rounded to it).
	Layout     Layout `json:"layout,omitempty"`
	LayoutStep int    `json:"layout_step_plates,omitempty"`
	// Rounded lists each request that whole steps changed, in the order
	// asked; several may round to one option, which is shown once.
	Rounded []RoundedRequest `json:"rounded,omitempty"`
	// NotRejudged names what the options take from the plant file as it
	// stands rather than judge anew (docs/METHOD.md §18): "acceptance-tests",
	// always (the tests on record were measured on the installed equipment;
	// `check` and `due` judge them, and a change of plates makes them due
	// again), and "regenerator-pressure" when the plant enters the
	// regenerator's pressures (measured or set for the installed plates; more
	// plates change the pressure drops). The words are made in
	// internal/present.
	NotRejudged []string `json:"not_rejudged"`
	Caution     string   `json:"caution"`
}

// What the plates options do not judge anew (WhatIf.NotRejudged).
const (
	NotRejudgedAcceptance          = "acceptance-tests"
	NotRejudgedRegeneratorPressure = "regenerator-pressure"
)

// RoundedRequest is a number of added plates asked for and what whole
// steps of the layout made of it.
type RoundedRequest struct {
	Requested int `json:"requested_added_plates"`
	Added     int `json:"added_plates"`
}

// AddedPlatesError is an option of added plates outside what pasval computes
// with: at least 1, and the regenerator at most plantfile.MaxPlates in all.
type AddedPlatesError struct {
	Installed, Added int
	// Pos is where the installed plates were written: a regenerator
	// already near the limit is a fact of the file, not only of the flag.
	Pos inputerr.Pos
}

func (e *AddedPlatesError) Error() string {
	if e.Added < 1 {
		return fmt.Sprintf("added plates must be at least 1, not %d", e.Added)
	}
	return fmt.Sprintf("%d added plates would give the regenerator %d, above the %d plates pasval computes with (add at most %d)",
		e.Added, e.Installed+e.Added, plantfile.MaxPlates, max(0, plantfile.MaxPlates-e.Installed))
}

// DefaultKneeFraction: the knee is where a further 10 plates save less than
// this fraction of what the first 10 saved.
const DefaultKneeFraction = 0.10

// regenerationNotRated is returned when there is no regenerator, or it is
// sized, not rated: the message suggests the plates the sizing gives.
func regenerationNotRated(p *plantfile.Plant) error {
	if p.Regeneration == nil {
		return inputerr.List{{Pos: inputerr.Pos{File: p.File, Line: 1, Column: 1}, Field: "regeneration",
			Msg: "the plates what-if needs the regenerator in rating mode: this plant has no regeneration section (give one with its installed plates)"}}
	}
	hint := "the installed plates"
	if res, err := run(p); err == nil {
		for _, s := range res.Sections {
			if s.Kind == regen.RegenerationSection {
				hint = fmt.Sprintf("the installed plates (plates: %d is what this sizing gives)", s.Plates)
			}
		}
	}
	return inputerr.List{{Pos: p.Regeneration.Pos, Field: "regeneration.plates",
		Msg: "the plates what-if needs the regenerator in rating mode: replace ratio with " + hint}}
}

// AddPlates computes the baseline and each option of added plates (≥ 1,
// ascending after sorting). A regenerator with a plate pack takes a layout
// (passes or channels): each option is rounded to whole steps of it (at
// least one; options that round alike are shown once) and its U and
// pressure drops are those of the new layout. Each duty is the sections' own
// (a rated cooling stage's is what it removes, down to the outlet it
// reaches); savings are the baseline's duty less the option's, which for
// sized sections is
//
//	heating saved = cooling saved = C · Δratio · (setpoint − raw inlet)
//	annual energy = (heating + cooling saved) · hours;  cost = heating·h·p_heat + cooling·h·p_cool
//	payback = added plates · plate cost / annual cost saved
//
// Every option is the whole line recomputed (sized sections re-sized, rated
// ones re-rated), so its checks say whether the line still holds.
//
// Every number of the result is finite, or the entered values that make one
// infinite are reported (finite.go); the probe re-runs only the option
// concerned.
func AddPlates(p *plantfile.Plant, added []int, kneeFraction float64, layout Layout) (*WhatIf, error) {
	w, err := addPlates(p, added, kneeFraction, layout)
	if err != nil {
		return nil, err
	}
	where, bad := nonFinite(w)
	if !bad {
		return w, nil
	}
	var only []int
	if m := optionPath.FindStringSubmatch(where); m != nil {
		if i, err := strconv.Atoi(m[1]); err == nil && i < len(w.Options) {
			only = []int{w.Options[i].AddedPlates}
		}
	}
	return nil, traceNonFinite(p, where, func(q *plantfile.Plant) bool {
		w, err := addPlates(q, only, kneeFraction, layout)
		if err != nil {
			return false
		}
		_, bad := nonFinite(w)
		return !bad
	})
}

var optionPath = regexp.MustCompile(`^options\[(\d+)\]`)

func addPlates(p *plantfile.Plant, added []int, kneeFraction float64, layout Layout) (*WhatIf, error) {
	if p.Regeneration == nil || p.Regeneration.Plates.Plates == 0 {
		return nil, regenerationNotRated(p)
	}
	added = append([]int(nil), added...)
	sort.Ints(added)
	base, err := option(p, 0, 0, layout, nil)
	if err != nil {
		return nil, err // the plant's own errors first
	}
	if err := CheckLayout(p, layout); err != nil {
		return nil, err
	}
	w := &WhatIf{Baseline: base, Options: []PlatesOption{}, KneeFraction: kneeFraction, Layout: layout, Caution: Caution,
		NotRejudged: []string{NotRejudgedAcceptance}}
	if p.Regeneration.Pressure != nil {
		w.NotRejudged = append(w.NotRejudged, NotRejudgedRegeneratorPressure)
	}
	if p.Economics != nil {
		w.Currency = p.Economics.Currency
	}
	step := 1
	if layout != LayoutNone {
		step = LayoutStep(p.Regeneration.Pack, layout)
		w.LayoutStep = step
	}
	for _, a := range added {
		if a < 1 || p.Regeneration.Plates.Plates+a > plantfile.MaxPlates {
			return nil, &AddedPlatesError{Installed: p.Regeneration.Plates.Plates, Added: a, Pos: p.Regeneration.Plates.PlatesPos}
		}
		steps := max(1, int(math.Round(float64(a)/float64(step))))
		if steps*step != a {
			w.Rounded = append(w.Rounded, RoundedRequest{Requested: a, Added: steps * step})
		}
		if n := len(w.Options); n > 0 && w.Options[n-1].AddedPlates == steps*step {
			continue // rounds to the option before
		}
		o, err := option(p, a, steps, layout, &base)
		if err != nil {
			return nil, err
		}
		w.Options = append(w.Options, o)
	}
	w.KneeAdded = knee(base, w.Options, kneeFraction)
	return w, nil
}

// CheckLayout says whether a layout suits the plant's regenerator: one
// with a plate pack needs passes or channels, one without takes none.
func CheckLayout(p *plantfile.Plant, layout Layout) error {
	pack := p.Regeneration != nil && p.Regeneration.Pack != nil
	switch {
	case pack && layout != LayoutPasses && layout != LayoutChannels:
		return fmt.Errorf("the regenerator has a plate pack: say how the added plates are laid out, as whole passes (same U, more pressure drop) " +
			"or as more channels per pass (lower velocity, U and pressure drop): --layout passes or --layout channels")
	case !pack && layout != LayoutNone:
		return fmt.Errorf("--layout applies to a regenerator with a plate pack (plate, product_side, other_side); this one has none, so its U stays as entered")
	}
	return nil
}

// option is the line with the regenerator's plates increased: by added
// plates (no pack), or by steps of the layout (a pack; requested is the
// number asked for).
func option(p *plantfile.Plant, requested, steps int, layout Layout, base *PlatesOption) (PlatesOption, error) {
	q := *p
	rg := *p.Regeneration
	added := requested
	if pk := rg.Pack; pk != nil {
		grown := *pk
		switch layout {
		case LayoutPasses:
			grown.Product.Passes += steps
			grown.Other.Passes += steps
		case LayoutChannels:
			grown.Product.ChannelsPerPass += steps
			grown.Other.ChannelsPerPass += steps
		}
		rg.Pack = &grown
		n, _ := grown.LayoutPlates()
		added = n - rg.Plates.Plates
		rg.Plates.Plates = n
	} else {
		rg.Plates.Plates += added
	}
	q.Regeneration = &rg
	res, err := run(&q) // unchecked: AddPlates checks the whole what-if
	if err != nil {
		return PlatesOption{}, err
	}
	o := PlatesOption{AddedPlates: added, Plates: rg.Plates.Plates, ChecksPass: res.Pass, FailedChecks: []CheckID{}}
	c := res.Product.ProductCapacity
	heatOut := p.Process.HoldSetpoint.SI
	if res.HoldingTube != nil {
		heatOut = res.HoldingTube.HeatingOutletC
	}
	coolTo := p.Process.RawInlet.SI
	if p.Process.OutletTarget.Set {
		coolTo = p.Process.OutletTarget.SI
	}
	heating, cooling, heaters, coolers := 0.0, 0.0, 0, 0
	for _, s := range res.Sections {
		switch s.Kind {
		case regen.HeatingSection:
			heating, heaters = heating+s.DutyKW, heaters+1
		case regen.CoolingSection:
			cooling, coolers = cooling+s.DutyKW, coolers+1
		}
		switch {
		case s.Kind == regen.RegenerationSection:
			o.RegenerationRatio, o.RawOutC, o.PasteurizedOutC = *res.RegenerationRatio, s.ProductOutC, s.OtherOutC
			if f := s.PackFigures; f != nil {
				o.OptionPack = &OptionPack{RequestedAddedPlates: requested,
					PassesProduct: f.PassesProduct, ChannelsPerPassProduct: f.ChannelsPerPassProduct,
					PassesOther: f.PassesOther, ChannelsPerPassOther: f.ChannelsPerPassOther,
					UWm2K: s.UWm2K, UServiceWm2K: f.UServiceWm2K, UEntered: s.raw.Pack.EnteredU,
					VelocityProductMS: f.VelocityProductMS, PressureDropProductKPa: f.PressureDropProductKPa}
			}
		case s.Kind == regen.HeatingSection && s.MediumAvailableC != nil:
			v := s.OtherInC
			o.HeatingMediumRequiredC = &v
		}
	}
	for _, ch := range res.Checks {
		if ch.ID == CoolingOutlet {
			v := ch.Actual
			o.CoolingOutletC = &v
		}
		if !ch.Pass {
			o.FailedChecks = append(o.FailedChecks, ch.ID)
		}
	}
	// The duties are the sections' own, as check prints them (what rated
	// stages actually remove, down to the outlet they reach); a line without
	// a heating or cooling section counts the duty it would need.
	o.HeatingDutyKW, o.CoolingDutyKW = heating, cooling
	if heaters == 0 {
		o.HeatingDutyKW = c * (heatOut - o.RawOutC) / 1e3
	}
	if coolers == 0 {
		o.CoolingDutyKW = c * (o.PasteurizedOutC - coolTo) / 1e3
	}
	if base != nil {
		o.HeatingSavedKW = base.HeatingDutyKW - o.HeatingDutyKW
		o.CoolingSavedKW = base.CoolingDutyKW - o.CoolingDutyKW
		if e := p.Economics; e != nil {
			energy := (o.HeatingSavedKW + o.CoolingSavedKW) * e.OperatingHoursPerYear
			cost := (o.HeatingSavedKW*e.HeatPricePerKWh + o.CoolingSavedKW*e.CoolingPricePerKWh) * e.OperatingHoursPerYear
			o.AnnualEnergySavedKWh, o.AnnualCostSaved = &energy, &cost
			if cost > 0 {
				pb := float64(added) * e.PlateCost / cost
				o.PaybackYears = &pb
			}
		}
	}
	return o, nil
}

// knee is the added plates beyond which each further 10 plates save less than
// fraction of what the first 10 plates saved (per 10 plates, heating plus
// cooling); nil when the options never get there.
func knee(base PlatesOption, opts []PlatesOption, fraction float64) *int {
	if len(opts) < 2 {
		return nil
	}
	per10 := func(a, b PlatesOption) float64 {
		return (b.HeatingSavedKW + b.CoolingSavedKW - a.HeatingSavedKW - a.CoolingSavedKW) / float64(b.AddedPlates-a.AddedPlates) * 10
	}
	first := per10(base, opts[0])
	if first <= 0 {
		return nil
	}
	for i := 0; i+1 < len(opts); i++ {
		if per10(opts[i], opts[i+1]) < fraction*first {
			k := opts[i].AddedPlates
			return &k
		}
	}
	return nil
}
