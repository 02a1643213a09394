package assess

import (
	"fmt"
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
	HeatingDutyKW          float64   `json:"heating_duty_kW"`   // raw out → heater outlet
	CoolingDutyKW          float64   `json:"cooling_duty_kW"`   // pasteurized out → outlet target
	HeatingMediumRequiredC *float64  `json:"heating_medium_required_C"`
	CoolingOutletC         *float64  `json:"cooling_outlet_C"`
	HeatingSavedKW         float64   `json:"heating_saved_kW"`
	CoolingSavedKW         float64   `json:"cooling_saved_kW"`
	AnnualEnergySavedKWh   *float64  `json:"annual_energy_saved_kWh"` // heating + cooling; needs economics
	AnnualCostSaved        *float64  `json:"annual_cost_saved"`
	PaybackYears           *float64  `json:"payback_years"`
	ChecksPass             bool      `json:"checks_pass"`
	FailedChecks           []CheckID `json:"failed_checks"`
}

// WhatIf compares the line with more regeneration plates against its baseline.
type WhatIf struct {
	Baseline     PlatesOption   `json:"baseline"`
	Options      []PlatesOption `json:"options"`
	Currency     string         `json:"currency,omitempty"`
	KneeAdded    *int           `json:"knee_added_plates"` // sweeps: beyond this, each 10 plates save < KneeFraction of the first 10
	KneeFraction float64        `json:"knee_fraction"`
	Caution      string         `json:"caution"`
}

// AddedPlatesError is an option of added plates outside what pasval computes
// with: at least 1, and the regenerator at most plantfile.MaxPlates in all.
type AddedPlatesError struct {
	Installed, Added int
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

// RegenerationNotRated is returned when the regenerator is sized, not rated.
func regenerationNotRated(p *plantfile.Plant) error {
	pos := inputerr.Pos{File: p.File, Line: 1, Column: 1}
	if p.Regeneration != nil {
		pos = p.Regeneration.Pos
	}
	return inputerr.List{{Pos: pos, Field: "regeneration.plates",
		Msg: "the plates what-if needs the regenerator in rating mode: replace ratio with the installed plates (e.g. plates: 112)"}}
}

// AddPlates computes the baseline and each option of added plates (≥ 1,
// ascending after sorting). Savings:
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
func AddPlates(p *plantfile.Plant, added []int, kneeFraction float64) (*WhatIf, error) {
	w, err := addPlates(p, added, kneeFraction)
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
		w, err := addPlates(q, only, kneeFraction)
		if err != nil {
			return false
		}
		_, bad := nonFinite(w)
		return !bad
	})
}

var optionPath = regexp.MustCompile(`^options\[(\d+)\]`)

func addPlates(p *plantfile.Plant, added []int, kneeFraction float64) (*WhatIf, error) {
	if p.Regeneration == nil || p.Regeneration.Plates.Plates == 0 {
		return nil, regenerationNotRated(p)
	}
	added = append([]int(nil), added...)
	sort.Ints(added)
	base, err := option(p, 0, nil)
	if err != nil {
		return nil, err
	}
	w := &WhatIf{Baseline: base, Options: []PlatesOption{}, KneeFraction: kneeFraction, Caution: Caution}
	if p.Economics != nil {
		w.Currency = p.Economics.Currency
	}
	for _, a := range added {
		if a < 1 || p.Regeneration.Plates.Plates+a > plantfile.MaxPlates {
			return nil, &AddedPlatesError{Installed: p.Regeneration.Plates.Plates, Added: a}
		}
		o, err := option(p, a, &base)
		if err != nil {
			return nil, err
		}
		w.Options = append(w.Options, o)
	}
	w.KneeAdded = knee(base, w.Options, kneeFraction)
	return w, nil
}

func option(p *plantfile.Plant, added int, base *PlatesOption) (PlatesOption, error) {
	q := *p
	rg := *p.Regeneration
	rg.Plates.Plates += added
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
	for _, s := range res.Sections {
		switch {
		case s.Kind == regen.RegenerationSection:
			o.RegenerationRatio, o.RawOutC, o.PasteurizedOutC = *res.RegenerationRatio, s.ProductOutC, s.OtherOutC
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
	o.HeatingDutyKW = c * (heatOut - o.RawOutC) / 1e3
	o.CoolingDutyKW = c * (o.PasteurizedOutC - coolTo) / 1e3
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
