// Package plantfile reads and validates plant files: YAML descriptions of a
// continuous pasteurizer in which every quantity carries its unit.
//
//	plant, err := plantfile.Load("line2.yaml")   // parse, then validate
//	if err != nil {
//		// err is an inputerr.List: each entry has file:line:column, the field path
//		// and what was expected.
//	}
//
// Reading is strict: an unknown key is an error with a "did you mean" hint, a
// bare number in a dimensional field is an error, anchors and aliases are
// refused, and only one YAML document is allowed. Parse turns bytes into a
// Plant; Validate checks the rules that span fields (raw inlet below the
// setpoint, exactly one of ratio and plates, …). Neither computes anything.
package plantfile

import (
	"errors"
	"fmt"
	"math"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// Quantity is an entered value with its unit, converted to SI.
type Quantity struct {
	SI     float64 // SI value; temperature points in °C
	Text   string  // as written in the file
	System units.System
	Pos    inputerr.Pos
	Set    bool // false when the field was absent
}

// Input is one entered quantity (or plain number), for the record's inputs
// table and for tracing a result back to what was entered.
type Input struct {
	Field  string // dotted path
	Text   string // as entered
	SI     float64
	SIUnit string
	Pos    inputerr.Pos
	// System is the unit system the value was written in (US for °F, lb, …).
	System units.System
}

// Plant is a validated plant file.
type Plant struct {
	File   string // path as given
	SHA256 string // of the file's bytes, hex
	Source []byte // the file's bytes exactly as read (attached to records)
	// LineFile is line_file as written ("" without one) and Line the file it
	// names, which supplies every top-level block this file does not give
	// (docs/METHOD.md §16). Records attach and hash both.
	LineFile    string
	LineFilePos inputerr.Pos // of line_file's value
	Line        *SourceFile
	System      units.System
	Record      []RecordField
	Inputs      []Input // every quantity in file order

	Product      Product
	Flow         Flow
	Process      Process
	Regeneration *Regeneration
	Heating      *Heating
	Cooling      []CoolingStage

	HoldingTube *HoldingTube
	Organisms   []Organism
	// LegalMinimums are the legal rows judged: legal_minimums as entered, or
	// the rows of legal_tables that legal_table picks (LegalTable names it).
	LegalMinimums []LegalRow
	LegalTable    string
	LegalTables   []LegalTable // as given, every class
	// LegalPos are where legal_minimums and legal_tables (their keys) and
	// legal_table (its value) were written; Line 0 when absent.
	LegalPos  struct{ Minimums, Tables, Table inputerr.Pos }
	Economics *Economics
	// Uncertainty holds the tolerances of the uncertainty block, in file
	// order (docs/METHOD.md §14.1).
	Uncertainty []Tolerance

	// Acceptance are the acceptance-test results in file order; Diversion
	// and HACCP are nil when not given (docs/METHOD.md §15).
	Acceptance []AcceptanceTest
	Diversion  *Diversion
	HACCP      *HACCP
}

// SourceFile is one file a plant was read from.
type SourceFile struct {
	File   string // path: as given, or a line file's resolved against the naming file's folder
	SHA256 string // of Source, hex
	Source []byte // the bytes exactly as read
}

// Sources are the files the plant was read from: the plant file, then its
// line file when it names one.
func (p *Plant) Sources() []SourceFile {
	out := []SourceFile{{File: p.File, SHA256: p.SHA256, Source: p.Source}}
	if p.Line != nil {
		out = append(out, *p.Line)
	}
	return out
}

// LegalTable is one product class's legal rows (legal_tables).
type LegalTable struct {
	Name string
	Rows []LegalRow
	Pos  inputerr.Pos // of the name
}

// Economics prices energy and plates for the what-if of added regeneration plates.
type Economics struct {
	Currency              string  // free text, e.g. USD
	OperatingHoursPerYear float64 // h/yr, 0–8784
	HeatPricePerKWh       float64 // per kWh of heat delivered to the heating medium
	CoolingPricePerKWh    float64 // per kWh of heat removed by the cooling medium
	PlateCost             float64 // per added plate, installed
	Pos                   inputerr.Pos
}

// RecordField is a free-text line for reports (site, line, product, …).
type RecordField struct {
	Key, Value string
}

// RecordValue returns the record field with the key, or "".
func (p *Plant) RecordValue(key string) string {
	for _, r := range p.Record {
		if r.Key == key {
			return r.Value
		}
	}
	return ""
}

// Product is the liquid being pasteurized.
type Product struct {
	Name         string
	Density      Quantity // kg/m³ (optional with Composition)
	SpecificHeat Quantity // J/(kg·K) (optional with Composition)
	Conductivity Quantity // W/(m·K), optional
	// FreezingPoint is the product's freezing point, °C, optional: below it
	// (or below 0 °C when not entered) the cooled product is flagged.
	FreezingPoint Quantity
	Composition   *Composition
	Viscosity     []ViscosityPoint // Newtonian points; empty when PowerLaw is set or none entered
	PowerLaw      *PowerLaw
	Pos           inputerr.Pos
}

// Composition is the product make-up by mass fraction, as entered. The
// reader owns it as plain data; assess converts it once for the Choi–Okos
// correlations (internal/props).
type Composition struct {
	Water, Protein, Fat, Carbohydrate, Fiber, Ash float64
	Pos                                           inputerr.Pos
}

// Sum is the total of the mass fractions.
func (c Composition) Sum() float64 {
	return c.Water + c.Protein + c.Fat + c.Carbohydrate + c.Fiber + c.Ash
}

// validate checks that every fraction is in [0, 1] and that they sum to 1
// within 0.5 percentage points.
func (c Composition) validate() error {
	for _, v := range []float64{c.Water, c.Protein, c.Fat, c.Carbohydrate, c.Fiber, c.Ash} {
		if !(v >= 0 && v <= 1) {
			return errors.New("each mass fraction must be between 0 and 1")
		}
	}
	if s := c.Sum(); math.Abs(s-1) > 0.005 {
		return fmt.Errorf("mass fractions sum to %.4f; they must sum to 1 (±0.005)", s)
	}
	return nil
}

// ViscosityPoint is one Newtonian viscosity measurement.
type ViscosityPoint struct {
	At    Quantity // °C
	Value Quantity // Pa·s
}

// PowerLaw is a shear-thinning product: τ = K γ̇ⁿ.
type PowerLaw struct {
	FlowIndex   float64  // n, 0 < n ≤ 1.5
	Consistency Quantity // K, Pa·sⁿ
	Pos         inputerr.Pos
}

// Flow holds the product rates. Each is volumetric or by mass as entered.
type Flow struct {
	Rate    FlowRate // normal rate; defaults to MaxRate
	MaxRate FlowRate // sealed maximum; defaults to Rate
	Pos     inputerr.Pos
}

// FlowRate is a product rate, volumetric or by mass.
type FlowRate struct {
	Quantity
	ByMass bool // SI is kg/s when true, m³/s otherwise
}

// Process holds the temperatures that define the schedule.
type Process struct {
	RawInlet     Quantity // °C
	HoldSetpoint Quantity // °C: diversion setpoint at the holding-tube outlet
	OutletTarget Quantity // °C, optional unless cooling is described
	// SensorAccuracy is the diversion sensor's stated accuracy (a difference, K), optional.
	SensorAccuracy Quantity
	Pos            inputerr.Pos
}

// Arrangement is "counterflow" or "cocurrent".
type Arrangement string

const (
	Counterflow Arrangement = "counterflow"
	Cocurrent   Arrangement = "cocurrent"
)

// Plates describes a plate pack.
type Plates struct {
	Arrangement Arrangement
	// Plates is the thermal plates: as entered, or from the layout of a
	// plate pack whose two sides give their passes (PlatesFromLayout); 0:
	// sizing mode.
	Plates           int
	PlatesPos        inputerr.Pos // where plates was written (from the layout: the product side's passes)
	PlatesEntered    bool         // plates: was written
	PlatesFromLayout bool
	PlateArea        Quantity // m² per thermal plate
	UValue           Quantity // W/(m²·K); optional with a plate pack
	Fouling          Quantity // m²·K/W, optional: 1/U_eff = 1/U + R_f
	Pack             *PlatePack
}

// PlatePack is a section's chevron-plate geometry and the layout of its two
// sides, from which U and the pressure drops are computed (docs/METHOD.md
// §12, plate packs). Pos is where plate: was written.
type PlatePack struct {
	ChevronAngle      Quantity // rad, from the main flow direction
	PressingDepth     Quantity // m
	EnlargementFactor Quantity // developed / projected area (a number)
	ChannelWidth      Quantity // m
	PortToPortLength  Quantity // m
	Thickness         Quantity // m
	Conductivity      Quantity // W/(m·K), the plate metal
	PortDiameter      Quantity // m
	Product, Other    SideLayout
	Geometry          bool         // plate: was written
	Pos               inputerr.Pos // of plate:, or of the section without one
}

// SideLayout is one side's passes and channels per pass. Passes 0 (not
// given) on both sides means sizing: the fewest passes are found.
type SideLayout struct {
	Set             bool // the side's mapping was written
	Passes          int
	PassesPos       inputerr.Pos
	ChannelsPerPass int
	ChannelsPos     inputerr.Pos
	MaxPressureDrop Quantity // Pa, product side only: the pressure-drop check
	Pos             inputerr.Pos
}

// layoutComplete reports whether both sides are given, each with its passes
// or neither with them.
func (p *PlatePack) layoutComplete() bool {
	return p.Product.Set && p.Other.Set && (p.Product.Passes == 0) == (p.Other.Passes == 0)
}

// LayoutPlates is the number of thermal plates the two sides' layouts give
// when both give their passes (ok false otherwise):
//
//	plates = passes_product · channels_product + passes_other · channels_other − 1
//
// The channels of the two sides alternate along the pack, one plate between
// each neighbouring pair (docs/METHOD.md §12, plate packs); regen's
// PlatePack.ThermalPlates counts the same way (a test ties the two).
func (p *PlatePack) LayoutPlates() (int, bool) {
	if p == nil || p.Product.Passes == 0 || p.Other.Passes == 0 {
		return 0, false
	}
	return p.Product.Passes*p.Product.ChannelsPerPass + p.Other.Passes*p.Other.ChannelsPerPass - 1, true
}

// Regeneration is the product-to-product section.
type Regeneration struct {
	Plates
	Ratio    float64 // sizing mode; 0 when rating
	RatioSet bool
	RatioPos inputerr.Pos
	Pressure *Pressure
	Pos      inputerr.Pos
}

// Medium is a heating or cooling medium.
type Medium struct {
	Name         string
	Water        bool
	Density      Quantity
	SpecificHeat Quantity
	Conductivity Quantity     // W/(m·K): a described medium in a plate pack
	Viscosity    Quantity     // Pa·s: a described medium in a plate pack
	Pos          inputerr.Pos // of the medium's mapping (or word)
}

// MediumSide is what heating and cooling stages share.
type MediumSide struct {
	Plates
	Medium      Medium
	MediumInlet Quantity // °C
	MediumRate  FlowRate
}

// Heating is the heating section.
type Heating struct {
	MediumSide
	// MaxMediumToProduct is the burn-on limit on the medium inlet less the
	// product outlet (a difference, K), optional: the cleaning forecast of
	// a recorded run (docs/METHOD.md §17.3).
	MaxMediumToProduct Quantity
	Pos                inputerr.Pos
}

// CoolingStage is one cooling stage.
type CoolingStage struct {
	MediumSide
	Name       string
	ProductOut Quantity // °C; sizing: required for all but the last stage
	Pos        inputerr.Pos
}

// HoldingTube is the holding tube's description.
type HoldingTube struct {
	// Inner and Outer are the diameters the reader resolved, m: as entered, or
	// from the sanitary size (Outer 0 when neither gives it).
	Inner, Outer float64

	InnerDiameter    Quantity // m (or from SanitaryTube)
	SanitaryTube     Quantity // nominal size, m; OD = nominal
	OuterDiameter    Quantity // m, optional (needed for heat loss unless SanitaryTube is given)
	Length           Quantity // m
	Rise             Quantity // m, optional: outlet height above inlet
	MinSlope         float64  // rise/length; 0 when not given (the default applies)
	MinSlopeSet      bool
	FastestToMean    float64 // override of u_max/u_mean; 0 when not given
	Ambient          Quantity
	OuterCoefficient Quantity // W/(m²·K) on the outer surface
	PU               bool     // report brewing pasteurization units
	// CreditHeatLoss judges the log reduction with the heat-loss profile
	// (holding_tube.credit_heat_loss; a process authority's decision).
	CreditHeatLoss bool
	Pos            inputerr.Pos
}

// Organism is a target organism with its kinetics.
type Organism struct {
	Name                 string
	D                    Quantity // s
	DTemperature         Quantity // °C
	Z                    Quantity // K
	RequiredLogReduction float64
	RequiredSet          bool
	Pos                  inputerr.Pos
}

// LegalRow is one user-entered time–temperature minimum.
type LegalRow struct {
	Temperature Quantity
	Time        Quantity
	Pos         inputerr.Pos
	Field       string // concrete path: "legal_minimums[0]", "legal_tables.cream[1]"
}

// Pressure is the regenerator pressure check's inputs.
type Pressure struct {
	RawMax         Quantity // Pa
	PasteurizedMin Quantity // Pa
	RequiredMargin Quantity // Pa; defaults to 1 psi
	Pos            inputerr.Pos
}
