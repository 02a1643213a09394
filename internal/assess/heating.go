package assess

import (
	"math"
	"sort"

	"pasval/fouling"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/regen"
)

// The heating section over recorded runs (docs/METHOD.md §17): a run with
// the heating section's temperatures is gathered into windows as it is read
// (fouling.Windower); the review then builds the section from the plant
// file as check computes it and analyses each run (fouling.Analyse).

// HeatingWindows are one run's windows of the heating section's columns.
type HeatingWindows struct {
	Windows    []fouling.Window
	Width      float64 // s
	MediumMass bool    // the recorded medium flow is a mass flow
}

// HeatingRun is one run's analysis.
type HeatingRun struct {
	Path   string
	Result *fouling.Result
}

// HeatingReview is the heating section over the runs that have its columns.
type HeatingReview struct {
	Section fouling.Section
	Width   float64 // s, the windows' width
	// Runs in date order (by first sample; as given for seconds from a
	// start); the last is the one the fits and the forecast are shown of.
	Runs []HeatingRun
	// Pack says U_clean comes from the plate pack (else from each run's fit).
	Pack bool
	// EnteredU is the section's entered u_value with its fouling, W/(m²·K),
	// when it has one (0 otherwise): the design figure, for comparison.
	EnteredU float64
}

// Latest is the run the fits and the forecast are shown of: the last in
// date order.
func (h *HeatingReview) Latest() HeatingRun { return h.Runs[len(h.Runs)-1] }

// HeatingSection is the plant's heating section as the cleaning forecast
// needs it, from the same computation as check: the installed plates (a
// sized section: the plates check finds, with its plate pack's passes), the
// product entering it and the outlet it must deliver at the normal rate,
// the medium and its hottest available inlet (docs/METHOD.md §17). A plant
// without a heating section is refused at its first line; one whose line
// does not compute, with check's error.
func HeatingSection(p *plantfile.Plant) (fouling.Section, error) {
	if p.Heating == nil {
		return fouling.Section{}, inputerr.List{inputerr.At(inputerr.Pos{File: p.File, Line: 1, Column: 1}, "heating",
			"the recorded runs have the heating section's temperatures, but the plant file describes no heating section; "+
				"add heating, or leave the columns out")}
	}
	res, err := Run(p)
	if err != nil {
		return fouling.Section{}, err
	}
	var raw regen.Section
	for _, s := range res.Sections {
		if s.Kind == regen.HeatingSection {
			raw = s.raw
		}
	}
	h := p.Heating
	spec := mediumSpec(h.MediumSide)
	spec.Surface.Plates = raw.Plates
	s := fouling.Section{Spec: spec, SpecificHeat: res.Product.SpecificHeat, ProductMassFlow: res.Product.MassFlow,
		ProductIn: raw.ProductIn, ProductOut: raw.ProductOut}
	if h.MaxMediumToProduct.Set {
		s.MaxMediumToProduct = h.MaxMediumToProduct.SI
	}
	if raw.Pack != nil {
		pack := raw.Pack.Pack
		s.Pack = &pack
		s.ProductFluid = productFluid(p, res.Product)
		s.MediumFluid = mediumFluid(h.Medium)
	}
	return s, nil
}

// newHeatingReview analyses the runs that have heating windows; nil when
// none has.
func newHeatingReview(p *plantfile.Plant, files []RunFile, clock bool) (*HeatingReview, error) {
	var with []RunFile
	for _, f := range files {
		if f.Heating != nil {
			with = append(with, f)
		}
	}
	if len(with) == 0 {
		return nil, nil
	}
	sec, err := HeatingSection(p)
	if err != nil {
		return nil, err
	}
	h := &HeatingReview{Section: sec, Width: with[0].Heating.Width, Pack: sec.Pack != nil}
	if pl := p.Heating.Plates; pl.UValue.Set {
		h.EnteredU = surface(pl).U
	}
	for _, f := range with {
		first, last := f.Result.Summary.Start, f.Result.Summary.End
		res := fouling.Analyse(sec, fouling.Run{Windows: f.Heating.Windows, MediumMass: f.Heating.MediumMass, First: first, Last: last})
		h.Runs = append(h.Runs, HeatingRun{Path: f.Path, Result: res})
	}
	if clock {
		sort.SliceStable(h.Runs, func(i, j int) bool { return h.Runs[i].Result.First < h.Runs[j].Result.First })
	}
	return h, nil
}

// CleanBefore is the review's forecast: the earliest time among the latest
// run's limits at which to clean (s), and the limit it comes from; a limit
// already reached gives the run's last sample. ok is false when no limit is
// reached or forecast.
func (h *HeatingReview) CleanBefore() (t float64, limit fouling.Forecast, ok bool) {
	res := h.Latest().Result
	t = math.Inf(1)
	for _, fc := range res.Forecasts {
		at := math.NaN()
		switch fc.State {
		case fouling.Reached:
			at = res.Last
		case fouling.Ahead:
			at = fc.CleanBefore
		}
		if at < t {
			t, limit, ok = at, fc, true
		}
	}
	return t, limit, ok
}
