package regen

import (
	"errors"
	"fmt"
	"math"
)

// SectionKind is what a section does in the line.
type SectionKind int

const (
	RegenerationSection SectionKind = iota + 1 // product to product
	HeatingSection                             // a hot medium heats the product
	CoolingSection                             // a cold medium cools the product (one stage)
)

// SectionKinds lists every kind, in process order.
var SectionKinds = []SectionKind{RegenerationSection, HeatingSection, CoolingSection}

// String is the kind's name as the JSON contract and the tables print it.
func (k SectionKind) String() string {
	switch k {
	case RegenerationSection:
		return "regeneration"
	case HeatingSection:
		return "heating"
	case CoolingSection:
		return "cooling"
	}
	panic(fmt.Sprintf("%sunknown section kind %d", panicPrefix, int(k)))
}

// Section is the computed state of one heat-exchange section.
type Section struct {
	Kind        SectionKind
	Stage       string // cooling stage name; empty otherwise
	Mode        Mode
	Arrangement Arrangement

	Duty          float64 // W
	LMTD          float64 // K
	NTU           float64 // UA/C_min with the installed area in rating, the required area in sizing
	Effectiveness float64 // q / (C_min (T_h,in − T_c,in))
	CapacityRatio float64 // C_min/C_max

	U             float64 // W/(m²·K)
	PlateArea     float64 // m²
	RequiredArea  float64 // m²: q / (U ΔT_lm)
	InstalledArea float64 // m²: plates × plate area
	Plates        int     // sizing: ceil(required / plate area); rating: as entered

	ProductIn, ProductOut float64 // °C; regeneration: the raw side
	OtherIn, OtherOut     float64 // °C; regeneration: the pasteurized side, else the medium
	ProductCapacity       float64 // W/K
	OtherCapacity         float64 // W/K
	MediumMassFlow        float64 // kg/s; 0 for regeneration
	MediumSpecificHeat    float64 // J/(kg·K) at the mean medium temperature; 0 for regeneration

	Pack *PackResult // the section's plate pack (LineInput's SectionPack); nil without one
}

// Area is the area the section reports: the required area when sizing, the
// installed area when rating.
func (s Section) Area() float64 {
	if s.Mode == Rating {
		return s.InstalledArea
	}
	return s.RequiredArea
}

// Label names the section in messages: "heating", "cooling stage 'chilled water'".
func (s Section) Label() string { return label(s.Kind.String(), s.Stage) }

func label(name, stage string) string {
	if stage != "" {
		return fmt.Sprintf("%s stage %q", name, stage)
	}
	return name
}

// streams describes one exchanger's two sides.
type streams struct {
	hotIn, hotOut, coldIn, coldOut float64
	cHot, cCold                    float64
	hot, cold                      string
}

// finish fills the exchanger quantities from the four temperatures and the
// capacity rates: q = C_c (T_c,out − T_c,in), ΔT_lm, required area q/(UΔT_lm),
// ε = q / (C_min (T_h,in − T_c,in)) and NTU = U A / C_min with the area that
// the mode reports.
func finish(sec *Section, s Surface, st streams) error {
	sec.Mode = s.Mode()
	sec.Arrangement = s.Arrangement
	sec.U, sec.PlateArea = s.U, s.PlateArea
	sec.Duty = st.cCold * (st.coldOut - st.coldIn)
	d1, d2 := TerminalDifferences(s.Arrangement, st.hotIn, st.hotOut, st.coldIn, st.coldOut)
	lm, ok := LMTD(d1, d2)
	if !ok || !(sec.Duty > 0) {
		return &CrossError{Section: sec.Label(), Arrangement: s.Arrangement,
			HotIn: st.hotIn, HotOut: st.hotOut, ColdIn: st.coldIn, ColdOut: st.coldOut, Hot: st.hot, Cold: st.cold}
	}
	sec.LMTD = lm
	sec.RequiredArea = sec.Duty / (s.U * lm)
	cmin, cmax := math.Min(st.cHot, st.cCold), math.Max(st.cHot, st.cCold)
	sec.CapacityRatio = cmin / cmax
	sec.Effectiveness = sec.Duty / (cmin * (st.hotIn - st.coldIn))
	if sec.Mode == Rating {
		sec.Plates = s.Plates
	} else {
		sec.Plates = PlatesFor(sec.RequiredArea, s.PlateArea)
	}
	sec.InstalledArea = float64(sec.Plates) * s.PlateArea
	sec.NTU = s.U * sec.Area() / cmin
	return nil
}

// rate returns the duty of an exchanger of area A between two inlets:
//
//	q = ε(NTU, C_r) C_min (T_h,in − T_c,in),  NTU = U A / C_min
func rate(s Surface, area, cHot, cCold, hotIn, coldIn float64) float64 {
	cmin, cmax := math.Min(cHot, cCold), math.Max(cHot, cCold)
	return Effectiveness(s.Arrangement, s.U*area/cmin, cmin/cmax) * cmin * (hotIn - coldIn)
}

// RegenSpec describes the regeneration section: ratio in sizing mode, plates
// (in Surface) in rating mode.
type RegenSpec struct {
	Surface
	Ratio float64      // sizing: the regeneration ratio, 0 < ratio < 1 (co-current: < 0.5)
	Pack  *SectionPack // Line: U and pressure drops from a plate pack; nil without one (Regeneration ignores it)
}

// Regeneration computes the product-to-product section. Raw product enters
// at rawIn and pasteurized product at hotIn (the setpoint); both sides carry
// capacity c (W/K), so C_r = 1 and the ratio equals ε:
//
//	ratio = (T_raw,out − T_raw,in) / (T_past,in − T_raw,in)
//	sizing: NTU = NTU(ε = ratio, C_r = 1), A = NTU·C/U
//	rating: A = plates × plate area, ratio = ε(U A / C, 1)
//
// References: docs/METHOD.md §6.2 (Regeneration); Incropera et al. (2007), §11.4.
func Regeneration(spec RegenSpec, c, rawIn, hotIn float64) (Section, error) {
	sec := Section{Kind: RegenerationSection}
	span := hotIn - rawIn
	if !(span > 0) {
		return sec, sectionErrorf("regeneration", "the pasteurized product (%.2f °C) must be hotter than the raw product (%.2f °C)", hotIn, rawIn)
	}
	var ratio float64
	if spec.Mode() == Rating {
		ratio = Effectiveness(spec.Arrangement, spec.U*float64(spec.Plates)*spec.PlateArea/c, 1)
	} else {
		ratio = spec.Ratio
		if _, err := NTU(spec.Arrangement, ratio, 1); err != nil {
			return sec, sectionErrorf("regeneration", "a ratio of %.4f is impossible: %w", ratio, err)
		}
	}
	sec.ProductIn, sec.ProductOut = rawIn, rawIn+ratio*span
	sec.OtherIn, sec.OtherOut = hotIn, hotIn-ratio*span
	sec.ProductCapacity, sec.OtherCapacity = c, c
	err := finish(&sec, spec.Surface, streams{hotIn: sec.OtherIn, hotOut: sec.OtherOut, coldIn: sec.ProductIn, coldOut: sec.ProductOut,
		cHot: c, cCold: c, hot: "pasteurized product", cold: "raw product"})
	return sec, err
}

// MediumSpec is a heating or cooling section's medium side.
type MediumSpec struct {
	Surface
	Medium Medium
	Flow   Flow
	Inlet  float64      // °C: the medium inlet (heating in rating mode: the hottest available)
	Pack   *SectionPack // Line: U and pressure drops from a plate pack; nil without one (Heating and Cooling ignore it)
}

// Heating computes the heating section, which brings product of capacity c
// from productIn to productOut.
//
//	sizing: q = C_p (T_p,out − T_p,in), medium outlet from q, A = q / (U ΔT_lm)
//	rating: A given; the medium inlet T_m,in *required* solves
//	        q = ε(U A / C_min, C_r) C_min (T_m,in − T_p,in)
//	        (C_m depends on T_m,in through ρ and cp: fixed-point iteration)
//
// In rating mode OtherIn is the required medium inlet; the caller compares it
// with spec.Inlet, the hottest available.
func Heating(spec MediumSpec, c, productIn, productOut float64) (Section, error) {
	sec := Section{Kind: HeatingSection, ProductIn: productIn, ProductOut: productOut, ProductCapacity: c}
	q := c * (productOut - productIn)
	if !(q > 0) {
		return sec, sectionErrorf("heating", "the product leaves regeneration at %.2f °C, already at or above the %.2f °C it must reach; there is nothing to heat",
			productIn, productOut)
	}
	mediumIn := spec.Inlet
	var cap capacity
	var mediumOut float64
	var err error
	if spec.Mode() == Rating {
		area := float64(spec.Plates) * spec.PlateArea
		mediumIn, err = settle(math.Max(spec.Inlet, productOut+1), func(mediumIn float64) (float64, error) {
			_, cap, err := spec.Medium.outletForDuty(spec.Flow, mediumIn, q)
			if err != nil {
				return 0, err
			}
			cmin := math.Min(c, cap.c)
			eps := Effectiveness(spec.Arrangement, spec.U*area/cmin, cmin/math.Max(c, cap.c))
			next := productIn + q/(eps*cmin)
			if math.IsInf(next, 0) || math.IsNaN(next) || next > 1000 {
				return 0, fmt.Errorf("%d plates cannot bring the product to %.2f °C with any medium temperature: %w",
					spec.Plates, productOut, ErrInfeasible)
			}
			return next, nil
		})
		if err != nil {
			return sec, sectionErrorf("heating", "%w", err)
		}
	}
	mediumOut, cap, err = spec.Medium.outletForDuty(spec.Flow, mediumIn, q)
	if err != nil {
		return sec, sectionErrorf("heating", "%w", err)
	}
	sec.OtherIn, sec.OtherOut = mediumIn, mediumOut
	sec.OtherCapacity, sec.MediumMassFlow, sec.MediumSpecificHeat = cap.c, cap.mass, cap.cp
	err = finish(&sec, spec.Surface, streams{hotIn: mediumIn, hotOut: mediumOut, coldIn: productIn, coldOut: productOut,
		cHot: cap.c, cCold: c, hot: "medium", cold: "product"})
	return sec, err
}

// CoolingSpec is one cooling stage.
type CoolingSpec struct {
	MediumSpec
	Stage      string  // the stage's name
	ProductOut float64 // sizing: the product outlet this stage must reach, °C (NaN: not given)
}

// Cooling computes one cooling stage for product of capacity c entering at productIn.
//
//	sizing: q = C_p (T_p,in − T_p,out), medium outlet from q, A = q / (U ΔT_lm)
//	rating: q = ε(U A / C_min, C_r) C_min (T_p,in − T_m,in), with the medium cp
//	        at its mean temperature (fixed-point iteration)
func Cooling(spec CoolingSpec, c, productIn float64) (Section, error) {
	sec := Section{Kind: CoolingSection, Stage: spec.Stage, ProductIn: productIn, ProductCapacity: c}
	if !(spec.Inlet < productIn) {
		return sec, sectionErrorf(sec.Label(), "the medium enters at %.2f °C, not below the product entering at %.2f °C; it cannot cool it",
			spec.Inlet, productIn)
	}
	var q float64
	if spec.Mode() == Rating {
		area := float64(spec.Plates) * spec.PlateArea
		mass, err := spec.Medium.massFlow(spec.Flow, spec.Inlet)
		if err != nil {
			return sec, sectionErrorf(sec.Label(), "%w", err)
		}
		_, err = settle(spec.Inlet, func(mediumOut float64) (float64, error) {
			cp, err := spec.Medium.cp((spec.Inlet + mediumOut) / 2)
			if err != nil {
				return 0, err
			}
			q = rate(spec.Surface, area, c, mass*cp, productIn, spec.Inlet)
			return spec.Inlet + q/(mass*cp), nil
		})
		if err != nil {
			return sec, sectionErrorf(sec.Label(), "%w", err)
		}
		sec.ProductOut = productIn - q/c
	} else {
		if math.IsNaN(spec.ProductOut) {
			return sec, sectionErrorf(sec.Label(), "a sizing stage needs the product outlet it must reach")
		}
		sec.ProductOut = spec.ProductOut
		q = c * (productIn - spec.ProductOut)
		if !(q > 0) {
			return sec, sectionErrorf(sec.Label(), "the product enters at %.2f °C, already at or below its %.2f °C outlet; there is nothing to cool",
				productIn, spec.ProductOut)
		}
	}
	mediumOut, cap, err := spec.Medium.outletForDuty(spec.Flow, spec.Inlet, -q)
	if err != nil {
		return sec, sectionErrorf(sec.Label(), "%w", err)
	}
	sec.OtherIn, sec.OtherOut = spec.Inlet, mediumOut
	sec.OtherCapacity, sec.MediumMassFlow, sec.MediumSpecificHeat = cap.c, cap.mass, cap.cp
	err = finish(&sec, spec.Surface, streams{hotIn: productIn, hotOut: sec.ProductOut, coldIn: spec.Inlet, coldOut: mediumOut,
		cHot: c, cCold: cap.c, hot: "product", cold: "medium"})
	if err == nil {
		// finish measures the duty on the cold side; for cooling report it as heat removed from the product.
		sec.Duty = c * (productIn - sec.ProductOut)
	}
	return sec, err
}

// SectionError is an error in one section's calculation.
type SectionError struct {
	Section string // the section's label: "regeneration", "heating", "cooling stage \"chilled water\""
	Err     error
}

func (e *SectionError) Error() string { return e.Section + ": " + e.Err.Error() }
func (e *SectionError) Unwrap() error { return e.Err }

func sectionErrorf(section, format string, args ...any) error {
	return &SectionError{Section: section, Err: fmt.Errorf(format, args...)}
}

// IsInfeasible reports whether err says a duty cannot be met by any area.
func IsInfeasible(err error) bool { return errors.Is(err, ErrInfeasible) }
