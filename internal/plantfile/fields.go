package plantfile

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"pasval/internal/units"
)

// ValueKind is what a plant-file key holds.
type ValueKind int

const (
	KindQuantity       ValueKind = iota + 1 // "number unit" of the field's units.Kind
	KindFlow                                // a product or medium flow, volumetric or by mass
	KindConsistency                         // power-law K in Pa·sⁿ, n from the sibling flow_index
	KindNumber                              // a plain number; a Fraction field may also be written "92 %" or "2.1 cm/m"
	KindInteger                             // a whole number from Min to Max
	KindText                                // free text
	KindBoolean                             // true or false
	KindEnum                                // one of Values
	KindMapping                             // a mapping of the child fields
	KindList                                // a list of mappings of the child fields ("path[].key")
	KindWaterOrMapping                      // the word water, or a mapping of the child fields
	KindNamed                               // a mapping of names the user chooses to values of the one child field NameKey
	KindPathMapping                         // a mapping whose keys are field paths, each of the child fields ("path.<path>.key")
	KindTolerance                           // "±X %" or "±X unit" of the varied field's dimension
	KindDate                                // an ISO 8601 calendar date, YYYY-MM-DD
	KindInterval                            // a calendar interval: a whole number of d, week, month or year
)

// NameKey is the key of a KindNamed field's one child: it stands for any name
// ("legal_tables.*" is every class's list of rows).
const NameKey = "*"

// String names the kind as the reference table does.
func (k ValueKind) String() string {
	switch k {
	case KindQuantity:
		return "quantity"
	case KindFlow:
		return "flow"
	case KindConsistency:
		return "quantity"
	case KindNumber:
		return "number"
	case KindInteger:
		return "whole number"
	case KindText:
		return "text"
	case KindBoolean:
		return "true or false"
	case KindEnum:
		return "one of"
	case KindMapping:
		return "mapping"
	case KindList:
		return "list"
	case KindWaterOrMapping:
		return "water or mapping"
	case KindNamed:
		return "named mapping"
	case KindPathMapping:
		return "mapping of field paths"
	case KindTolerance:
		return "tolerance"
	case KindDate:
		return "date"
	case KindInterval:
		return "interval"
	}
	panic(fmt.Sprintf("%sno name for value kind %d", panicPrefix, int(k)))
}

const panicPrefix = "plantfile: "

// MaxPlates is the most thermal plates a section may have, the one limit of
// the reader, of 'pasval plates' (installed plus added) and of the record's
// what-if page; real plate packs have a few hundred.
const MaxPlates = 10000

// Field is one key of the plant file. The table of fields (Fields) is the one
// definition of the file's keys: the reader's allowed keys and did-you-mean
// hints, the JSON Schema (internal/schema), the README's reference table and
// the record's inputs table all come from it.
type Field struct {
	// Path is the key's place, lists written "[]": "product.viscosity[].at",
	// "cooling[].medium_inlet", "organisms[].D".
	Path     string
	Value    ValueKind
	Unit     units.Kind // Quantity: what it measures
	Values   []string   // Enum: the words allowed; WaterOrMapping: the word
	Min, Max float64    // Integer: the range allowed
	// Fraction is true for a Number that is a ratio of like quantities (a
	// mass fraction, the regeneration ratio, a slope): it may be written as a
	// percentage ("92 %") or a ratio of units ("2.1 cm/m"). Any other Number
	// is a count or a price and takes no unit ("5 %" is refused for a log
	// reduction, not read as 0.05).
	Fraction bool
	Default  string // as a user would write it; "" when there is none
	// Required is true when the key must be given whenever its parent is;
	// rules that span keys (exactly one of ratio and plates) are in Validate
	// and in OneOf.
	Required bool
	// OneOf lists keys of a Mapping of which exactly one must be given.
	OneOf       []string
	Description string
	Example     string // one valid entry
	// Vary is set on a field that may carry a tolerance in the uncertainty
	// block (docs/METHOD.md §14.1): the physical range its varied value must
	// stay in, and what else moves with it. nil: it may not.
	Vary *Variation
}

// Variation says how a field may vary under uncertainty.
type Variation struct {
	Bound Bound
	// Moves says, in words, what else the model moves with the value (for
	// the README's list); "" when nothing does.
	Moves string
}

// Bound is a physical range in SI (temperature points in °C); ±Inf for no end.
type Bound struct {
	Lo, Hi         float64
	LoOpen, HiOpen bool // the end itself is outside the range
}

// Contains reports whether v lies in the range.
func (b Bound) Contains(v float64) bool {
	lo := v > b.Lo || !b.LoOpen && v == b.Lo
	hi := v < b.Hi || !b.HiOpen && v == b.Hi
	return lo && hi
}

// String is the range in words, SI units left to the caller.
func (b Bound) String() string {
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	switch {
	case math.IsInf(b.Lo, -1) && math.IsInf(b.Hi, 1):
		return "any value"
	case math.IsInf(b.Hi, 1) && b.LoOpen:
		return "greater than " + g(b.Lo)
	case math.IsInf(b.Hi, 1):
		return "at least " + g(b.Lo)
	case !b.LoOpen && !b.HiOpen:
		return "from " + g(b.Lo) + " to " + g(b.Hi)
	case b.LoOpen && !b.HiOpen:
		return "above " + g(b.Lo) + " and at most " + g(b.Hi)
	}
	return fmt.Sprintf("between %s and %s", g(b.Lo), g(b.Hi))
}

var (
	positive    = Bound{Lo: 0, Hi: math.Inf(1), LoOpen: true}
	nonNegative = Bound{Lo: 0, Hi: math.Inf(1)}
	anyValue    = Bound{Lo: math.Inf(-1), Hi: math.Inf(1)}
)

func closed(lo, hi float64) Bound { return Bound{Lo: lo, Hi: hi} }

// varies lets a field carry a tolerance within bound; moves says what moves with it.
func (f Field) varies(b Bound, moves string) Field {
	f.Vary = &Variation{Bound: b, Moves: moves}
	return f
}

// Key is the last element of the path.
func (f Field) Key() string { return f.Path[strings.LastIndex(f.Path, ".")+1:] }

// Parent is the path of the mapping or list the key sits in ("" at the top).
func (f Field) Parent() string {
	i := strings.LastIndex(f.Path, ".")
	if i < 0 {
		return ""
	}
	return strings.TrimSuffix(f.Path[:i], "[]")
}

// Container reports whether the field holds other fields.
func (f Field) Container() bool {
	return f.Value == KindMapping || f.Value == KindList || f.Value == KindWaterOrMapping || f.Value == KindNamed || f.Value == KindPathMapping
}

// Fields returns the table of plant-file keys in the order the documentation
// gives them (parents before their children).
func Fields() []Field { return append([]Field(nil), fields...) }

var listIndex = regexp.MustCompile(`\[\d+\]`)

// Lookup finds the field of a concrete path such as "organisms[0].D",
// "cooling[1].medium_inlet" or "legal_tables.cream[0].time" (indices are
// dropped, a user's name under a KindNamed field is NameKey) or of a table
// path.
func Lookup(path string) (Field, bool) {
	if rest, ok := strings.CutPrefix(path, UncertaintyKey+"."); ok {
		// uncertainty.<path>.tolerance: the key is any field path.
		for _, k := range []string{"tolerance", "distribution"} {
			if strings.HasSuffix(rest, "."+k) {
				return byPath[uncertaintyEntry+"."+k], true
			}
		}
		return byPath[uncertaintyEntry], true
	}
	f, ok := byPath[tableOf(path)]
	return f, ok
}

// UncertaintyKey is the top-level key of the tolerances; uncertaintyEntry is
// the table path of one of its entries, whose key is a field path.
const (
	UncertaintyKey   = "uncertainty"
	uncertaintyEntry = UncertaintyKey + ".<path>"
)

// tableOf turns a concrete path into its table path: list indices become
// "[]" and a name under a KindNamed field becomes NameKey
// ("legal_tables.cream[2]" → "legal_tables.*[]").
func tableOf(concrete string) string {
	s := listIndex.ReplaceAllString(concrete, "[]")
	if !strings.Contains(s, ".") {
		return s
	}
	parts := strings.Split(s, ".")
	out := parts[0]
	for _, seg := range parts[1:] {
		name, suffix := seg, ""
		if i := strings.Index(seg, "["); i >= 0 {
			name, suffix = seg[:i], seg[i:]
		}
		parent := strings.TrimSuffix(out, "[]")
		if f, ok := byPath[parent]; ok && f.Value == KindNamed {
			name = NameKey
		}
		out += "." + name + suffix
	}
	return out
}

// Children are the fields directly inside the mapping or list at path (a
// table path, "" for the top level), in table order.
func Children(path string) []Field {
	return children[path]
}

var (
	fields   = table()
	byPath   = map[string]Field{}
	children = map[string][]Field{}
)

func init() {
	for _, f := range fields {
		if _, dup := byPath[f.Path]; dup {
			panic(panicPrefix + "field listed twice: " + f.Path)
		}
		byPath[f.Path] = f
		children[f.Parent()] = append(children[f.Parent()], f)
	}
}

// allowedKeys are the keys of the mapping at a table path, in table order.
func allowedKeys(path string) []string {
	var keys []string
	for _, f := range children[path] {
		keys = append(keys, f.Key())
	}
	return keys
}

// field builders: one line per key in table().

func q(path string, k units.Kind, desc, example string) Field {
	return Field{Path: path, Value: KindQuantity, Unit: k, Description: desc, Example: example}
}

func flow(path, desc, example string) Field {
	return Field{Path: path, Value: KindFlow, Description: desc, Example: example}
}

func num(path, desc, example string) Field {
	return Field{Path: path, Value: KindNumber, Description: desc, Example: example}
}

func text(path, desc, example string) Field {
	return Field{Path: path, Value: KindText, Description: desc, Example: example}
}

func mapping(path, desc string) Field {
	return Field{Path: path, Value: KindMapping, Description: desc}
}

func list(path, desc string) Field { return Field{Path: path, Value: KindList, Description: desc} }

func (f Field) required() Field { f.Required = true; return f }

func (f Field) byDefault(d string) Field { f.Default = d; return f }

func (f Field) exactlyOne(keys ...string) Field { f.OneOf = keys; return f }

func (f Field) withExample(e string) Field { f.Example = e; return f }
func (f Field) fraction() Field            { f.Fraction = true; return f }

// platePack is the plate-pack keys every heat-exchange section has.
func platePack(section string) []Field {
	return []Field{
		{Path: section + ".arrangement", Value: KindEnum, Values: []string{string(Counterflow), string(Cocurrent)}, Default: "counterflow",
			Description: "relative direction of the two streams; co-current cannot pass 50 % regeneration", Example: "counterflow"},
		{Path: section + ".plates", Value: KindInteger, Min: 1, Max: MaxPlates,
			Description: "installed thermal plates: given, the section is rated (rating mode); with a plate pack, equal to its layout's", Example: "112"},
		q(section+".plate_area", units.Area, "effective heat-transfer area per plate", "0.35 m2").required(),
		q(section+".u_value", units.HeatTransferCoefficient, "overall heat-transfer coefficient (optional with a plate pack, which computes it)", "3300 W/(m2*K)"),
		q(section+".fouling", units.FoulingResistance, "fouling resistance: 1/U_eff = 1/U + R_f", "0.00005 m2*K/W").byDefault("0 m2*K/W"),
		mapping(section+".plate", "chevron-plate geometry, for U and pressure drop from the plates and the fluids (with product_side and other_side)"),
		q(section+".plate.chevron_angle", units.Angle, "corrugation angle from the main flow direction (toward 90°: more friction and transfer)", "60 deg").required(),
		q(section+".plate.pressing_depth", units.Length, "pressing depth: the mean channel gap", "3 mm").required(),
		num(section+".plate.enlargement_factor", "enlargement factor: developed over projected plate area, 1 to 2", "1.17").required(),
		q(section+".plate.channel_width", units.Length, "channel width inside the gasket", "0.45 m").required(),
		q(section+".plate.port_to_port_length", units.Length, "port centre to port centre: the friction length of one pass", "0.8 m").required(),
		q(section+".plate.thickness", units.Length, "plate metal thickness", "0.6 mm").required(),
		q(section+".plate.conductivity", units.ThermalConductivity, "thermal conductivity of the plate metal", "16 W/(m*K)").required(),
		q(section+".plate.port_diameter", units.Length, "port diameter", "100 mm").required(),
		mapping(section+".product_side", "the plate pack's product side (in regeneration the raw product): its layout"),
		passes(section + ".product_side"), channels(section + ".product_side"),
		q(section+".product_side.max_pressure_drop", units.Pressure,
			"largest product-side pressure drop the pumps allow: the pressure-drop check", "150 kPa"),
		mapping(section+".other_side", "the plate pack's other side (the medium; in regeneration the pasteurized product): its layout"),
		passes(section + ".other_side"), channels(section + ".other_side"),
	}
}

// passes and channels are a plate-pack side's layout keys.
func passes(side string) Field {
	return Field{Path: side + ".passes", Value: KindInteger, Min: 1, Max: 1000,
		Description: "passes in series; given on both sides the section is rated (plates = both sides' channels − 1), omitted on both it is sized with the fewest passes",
		Example:     "8"}
}

func channels(side string) Field {
	return Field{Path: side + ".channels_per_pass", Value: KindInteger, Min: 1, Max: 1000, Required: true,
		Description: "channels in parallel in each pass", Example: "7"}
}

// mediumSide is the medium keys of heating and of each cooling stage.
func mediumSide(section, inletMeaning string) []Field {
	return []Field{
		{Path: section + ".medium", Value: KindWaterOrMapping, Values: []string{"water"}, Required: true,
			Description: "water (IAPWS-IF97 properties) or a medium with constant properties", Example: "water"},
		text(section+".medium.name", "medium name", "propylene glycol 30 %").required(),
		q(section+".medium.density", units.Density, "medium density", "1040 kg/m3").required(),
		q(section+".medium.specific_heat", units.SpecificHeat, "medium specific heat", "3.7 kJ/(kg*K)").required(),
		q(section+".medium.conductivity", units.ThermalConductivity, "medium thermal conductivity (needed with a plate pack)", "0.45 W/(m*K)"),
		q(section+".medium.viscosity", units.Viscosity, "medium viscosity (needed with a plate pack)", "4 mPa*s"),
		q(section+".medium_inlet", units.Temperature, inletMeaning, "77 °C").required(),
		flow(section+".medium_rate", "medium flow, volumetric or by mass", "20000 L/h").required(),
	}
}

// table is the plant file, key by key. Adding a key is one entry here and its
// decoding in parse.go (and a rule in validate.go when it spans keys).
func table() []Field {
	var t []Field
	add := func(fs ...Field) { t = append(t, fs...) }
	add(mapping("record", "free text for the record's cover and page headers"))
	for _, k := range [][3]string{{"site", "site name", "Larkspur Meadow Dairy"}, {"line", "line name", "HTST line 2"},
		{"product", "product as named on the record", "reduced-fat milk 2 %"},
		{"schedule", "the thermal schedule in words", "72.5 °C at the diversion valve, 15 s"},
		{"prepared_by", "who prepared the file", "J. Doe"}, {"notes", "notes", "sizing run for a plate pack change"}} {
		add(text("record."+k[0], k[1], k[2]))
	}
	add(mapping("product", "the liquid being pasteurized").required(),
		text("product.name", "product name", "whole milk").required(),
		q("product.density", units.Density, "density as entered (or give composition)", "1030 kg/m3").
			varies(positive, "the mass flow of each volumetric rate (ṁ = Q·ρ); the tube's volumetric flow of a rate entered by mass (Q = ṁ/ρ)"),
		q("product.specific_heat", units.SpecificHeat, "specific heat (or give composition)", "3.93 kJ/(kg*K)").
			varies(positive, "the heat-loss profile"),
		q("product.conductivity", units.ThermalConductivity, "thermal conductivity, for plate packs (or give composition: Choi–Okos)", "0.6 W/(m*K)"),
		mapping("product.composition", "mass fractions summing to 1, for Choi–Okos properties instead of density and specific heat"))
	for _, c := range []string{"water", "protein", "fat", "carbohydrate", "fiber", "ash"} {
		add(num("product.composition."+c, c+" mass fraction", "0.035").byDefault("0").fraction())
	}
	add(list("product.viscosity", "Newtonian viscosity points; ln μ is linear in T between them, the nearest end held outside (with a warning)"),
		q("product.viscosity[].at", units.Temperature, "temperature of the measurement", "72 °C").required().
			varies(anyValue, "the interpolated viscosity at the setpoint (the points must keep their order)"),
		q("product.viscosity[].value", units.Viscosity, "viscosity", "0.72 mPa*s").required().
			varies(positive, "the interpolated viscosity at the setpoint"),
		mapping("product.power_law", "a power-law product at the holding temperature, instead of viscosity points"),
		num("product.power_law.flow_index", "flow index n, 0 < n ≤ 1.5", "0.65").required().
			varies(Bound{Lo: 0, Hi: 1.5, LoOpen: true}, "the Metzner–Reed Reynolds number and the laminar ratio (3n+1)/(n+1); K keeps its value in Pa·sⁿ"),
		Field{Path: "product.power_law.consistency", Value: KindConsistency, Required: true,
			Description: "consistency index K, in Pa·sⁿ with n the flow index", Example: "0.28 Pa*s^0.65"}.varies(positive, ""),
		mapping("flow", "product rates, each volumetric or by mass"),
		flow("flow.rate", "normal rate: sizes and rates the sections", "10000 L/h").byDefault("max_rate").
			varies(positive, "the heat-loss profile the heater must match; the sealed maximum too when max_rate is not entered"),
		flow("flow.max_rate", "sealed maximum: sets the holding time", "11000 L/h").byDefault("rate").
			varies(positive, "the normal rate too when rate is not entered"),
		mapping("process", "the schedule's temperatures").required(),
		q("process.raw_inlet", units.Temperature, "raw product inlet", "5 °C").required(),
		q("process.hold_setpoint", units.Temperature, "diversion setpoint at the holding-tube outlet", "72.5 °C").required().
			varies(closed(30, 150), "the judged temperature (less process.sensor_accuracy), the viscosity at the setpoint, the legal row, the profile's outlet"),
		q("process.outlet_target", units.Temperature, "product outlet target (required with cooling)", "4 °C"),
		q("process.sensor_accuracy", units.TemperatureDifference,
			"stated accuracy of the diversion sensor, a difference: the holding time, log reductions and legal row are judged at the setpoint less it", "0.5 °C"),
		mapping("regeneration", "product-to-product regeneration: ratio (sizing), or plates or a plate pack's passes (rating)"))
	pack := platePack("regeneration")
	add(pack[0], num("regeneration.ratio", "regeneration ratio, 0 < ratio < 1: given, the section is sized (sizing mode)", "0.92").fraction())
	add(pack[1:]...)
	add(mapping("regeneration.pressure", "regenerator pressures, for the regenerator-pressure check"),
		q("regeneration.pressure.raw_max", units.Pressure, "highest raw-side pressure", "95 kPa").required(),
		q("regeneration.pressure.pasteurized_min", units.Pressure, "lowest pasteurized-side pressure", "130 kPa").required(),
		q("regeneration.pressure.required_margin", units.Pressure, "margin the pasteurized side must keep", "6.9 kPa").byDefault("1 psi"),
		mapping("heating", "heating with a hot medium"))
	add(platePack("heating")...)
	add(mediumSide("heating", "medium inlet: when sizing, the inlet used; when rating, the hottest available")...)
	add(list("cooling", "cooling stages in flow order"),
		text("cooling[].name", "stage name", "chilled water").byDefault("stage N"),
		q("cooling[].product_out", units.Temperature,
			"product outlet this sizing stage must reach; the last stage defaults to process.outlet_target", "20 °C"))
	add(platePack("cooling[]")...)
	add(mediumSide("cooling[]", "medium inlet")...)
	add(mapping("holding_tube", "the holding tube").exactlyOne("inner_diameter", "sanitary_tube"),
		q("holding_tube.inner_diameter", units.Length, "inner diameter (or sanitary_tube)", "47.5 mm").varies(positive, ""),
		q("holding_tube.sanitary_tube", units.Length,
			"sanitary tube size, OD = nominal: 1.5, 2, 2.5, 3 in (0.065 in wall), 4 in (0.083 in), 6 in (0.109 in)", "2 in").
			varies(positive, "varied, it is the outer diameter: the inner diameter moves with it, the listed wall kept"),
		q("holding_tube.outer_diameter", units.Length, "outer diameter, for heat loss (a sanitary size gives it)", "50.8 mm").
			varies(positive, ""),
		q("holding_tube.length", units.Length, "length from the heater outlet to the diversion sensor", "34 m").required().
			varies(positive, "the slope (rise/length)"),
		q("holding_tube.rise", units.Length, "rise of the outlet above the inlet, for the tube-slope check", "0.8 m").varies(anyValue, ""),
		num("holding_tube.min_slope", "minimum slope, rise/length; may be written 2.1 cm/m", "0.021").byDefault("0.25 in/ft").fraction(),
		num("holding_tube.fastest_to_mean", "override of the fastest-to-mean velocity ratio, 1 to 3", "2").varies(closed(1, 3), ""),
		q("holding_tube.ambient", units.Temperature, "ambient air around the tube, for heat loss (with outer_coefficient)", "20 °C").
			varies(anyValue, "the heat-loss profile (it must stay below the setpoint)"),
		q("holding_tube.outer_coefficient", units.HeatTransferCoefficient, "outer heat-transfer coefficient, for heat loss (with ambient)",
			"12 W/(m2*K)").varies(nonNegative, "the heat-loss profile"),
		Field{Path: "holding_tube.pu", Value: KindBoolean, Default: "false",
			Description: "also report brewing pasteurization units (60 °C, z = 7 °C)", Example: "true"},
		list("organisms", "target organisms, with kinetics the process authority accepts"),
		text("organisms[].name", "organism", "Listeria monocytogenes").required(),
		q("organisms[].D", units.Time, "D-value at D_temperature", "0.9 s").required().varies(positive, ""),
		q("organisms[].D_temperature", units.Temperature, "reference temperature of D", "71.7 °C").required().varies(anyValue, ""),
		q("organisms[].z", units.TemperatureDifference, "z-value, a temperature difference", "6.3 °C").required().varies(positive, ""),
		num("organisms[].required_log_reduction", "required log reduction; without it the reduction is reported, not judged", "5"),
		list("legal_minimums", "the legal time–temperature rows the regulator applies (never interpolated)"),
		q("legal_minimums[].temperature", units.Temperature, "row temperature", "72 °C").required(),
		q("legal_minimums[].time", units.Time, "row time", "15 s").required(),
		mapping("economics", "prices for the added-plates what-if (pasval plates and the record's what-if page)"),
		text("economics.currency", "currency name", "USD").byDefault("currency units"),
		num("economics.operating_hours_per_year", "operating hours a year, 0 to 8784", "2600").required(),
		num("economics.heat_price_per_kWh", "price per kWh of heat delivered to the heating medium", "0.048").required(),
		num("economics.cooling_price_per_kWh", "price per kWh of heat removed by the cooling media", "0.029").required(),
		num("economics.plate_cost", "cost per added plate, installed", "340").required())
	add(Field{Path: "holding_tube.credit_heat_loss", Value: KindBoolean, Default: "false",
		Description: "judge the log reduction with the heat-loss profile (hotter upstream) instead of the tube isothermal at the judged temperature: a process authority's decision", Example: "true"},
		q("product.freezing_point", units.Temperature, "freezing point, for the warning on product cooled below it (default 0 °C)", "-0.5 °C"))
	// Products on a shared line (docs/METHOD.md §16).
	add(text("line_file", "the line file (path relative to this file) that supplies every top-level block this file does not give; a block given here replaces the line's whole", "line.yaml"),
		Field{Path: "legal_tables", Value: KindNamed,
			Description: "legal rows by product class: each class's name (letters, digits, - and _) and its rows; a product picks one with legal_table"},
		list("legal_tables."+NameKey, "one product class's legal time–temperature rows (never interpolated)"),
		q("legal_tables."+NameKey+"[].temperature", units.Temperature, "row temperature", "75 °C").required(),
		q("legal_tables."+NameKey+"[].time", units.Time, "row time", "15 s").required(),
		text("legal_table", "the product class whose rows of legal_tables apply (instead of legal_minimums)", "high-fat"))
	add(Field{Path: UncertaintyKey, Value: KindPathMapping,
		Description: "tolerances for pasval margins (docs/METHOD.md §14): each key a field path as errors print it, e.g. flow.max_rate or organisms[1].D"},
		mapping(uncertaintyEntry, "one field's tolerance and distribution; the fields that may carry one are listed under Margins").withExample("flow.max_rate"),
		Field{Path: uncertaintyEntry + ".tolerance", Value: KindTolerance, Required: true,
			Description: "±X % of the nominal value, or ±X in a unit of the field's dimension (a temperature's is a difference); normal: the tolerance is 2σ",
			Example:     "±2 %"},
		Field{Path: uncertaintyEntry + ".distribution", Value: KindEnum, Values: []string{"uniform", "normal", "triangular"}, Required: true,
			Description: "uniform on ±X, normal with σ = X/2 truncated at ±1.5X and at the physical bounds, or triangular on ±X", Example: "uniform"})
	add(acceptanceFields()...)
	// The cleaning forecast of a recorded run (docs/METHOD.md §17).
	add(q("heating.max_medium_to_product", units.TemperatureDifference,
		"burn-on limit: the largest medium inlet less product outlet of the heating section, a difference; logs forecasts when fouling makes it needed", "6 °C"))
	return t
}
