package runlog

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"pasval/internal/units"
)

// Role is what a column holds.
type Role int

const (
	RoleTime   Role = iota // RFC 3339 clock time or seconds from start
	RoleFlag               // the flow-diversion position
	RoleNumber             // a quantity with a unit
)

// Column is a column the reader knows: its key, which is also its default
// header name, and what it holds.
type Column struct {
	Key      string
	Role     Role
	Kinds    []units.Kind // RoleNumber: the kinds its unit may have; the first that fits is taken
	Required bool         // a file without it is refused
}

// The keys of the standard columns.
const (
	KeyTime        = "time"
	KeyTemperature = "hold_outlet_temperature"
	KeyFlow        = "flow_rate"
	KeyForward     = "forward"
)

// Standard is the table of the columns every recorded run has
// (docs/METHOD.md §13 (recorded runs)). Further numeric columns (the heating
// section's temperatures, for instance) are Options.Optional entries: a new
// column is a new Column value, read, converted and positioned in errors like
// these.
var Standard = []Column{
	{Key: KeyTime, Role: RoleTime, Required: true},
	{Key: KeyTemperature, Role: RoleNumber, Kinds: []units.Kind{units.Temperature}, Required: true},
	{Key: KeyFlow, Role: RoleNumber, Kinds: []units.Kind{units.VolumeFlow, units.MassFlow}, Required: true},
	{Key: KeyForward, Role: RoleFlag, Required: true},
}

// Found is a column as found in a file's header.
type Found struct {
	Key    string
	Header string     // the header field as written
	Index  int        // 0-based field index
	Unit   string     // the unit used, from the header or the options; "" for time and flag columns
	Kind   units.Kind // the kind the unit matched (units.MassFlow for a flow by mass)
	// SI = value·Scale + Offset.
	Scale, Offset float64
}

// converter turns a unit into SI = v·scale + offset, through the project's
// unit parser: the SI values of "0 unit" and "1000000 unit" fix the line
// (every unit the parser knows is linear, temperatures with an offset; the
// far point keeps the slope's rounding error near one ulp).
func converter(unit string, kinds []units.Kind) (kind units.Kind, scale, offset float64, err error) {
	_, k, err := units.ParseEither("1 "+unit, kinds...)
	if err != nil {
		return units.Kind{}, 0, 0, err
	}
	zero, err := units.Parse("0 "+unit, k)
	if err != nil {
		return units.Kind{}, 0, 0, err
	}
	far, err := units.Parse("1000000 "+unit, k)
	if err != nil {
		return units.Kind{}, 0, 0, err
	}
	return k, (far.SI - zero.SI) / 1e6, zero.SI, nil
}

// sameConversion says whether two unit conversions agree to rounding.
func sameConversion(s1, o1, s2, o2 float64) bool {
	return math.Abs(s1-s2) <= 1e-12*math.Abs(s1) && math.Abs(o1-o2) <= 1e-9*(1+math.Abs(o1))
}

// splitHeader splits "hold_outlet_temperature [°F]" into name and unit.
func splitHeader(field string) (name, unit string, hasUnit bool) {
	f := strings.TrimSpace(field)
	if strings.HasSuffix(f, "]") {
		if i := strings.LastIndexByte(f, '['); i >= 0 {
			return strings.TrimSpace(f[:i]), strings.TrimSpace(f[i+1 : len(f)-1]), true
		}
	}
	return f, "", false
}

// The command-line flags that set the reader's options (and the review's
// gap limit, time zone and heating windows). Messages name them, so that an
// error says what to change; the command line registers its flags by these
// names (a test there holds each to a registered flag).
const (
	FlagSeparator       = "--separator"
	FlagDecimalComma    = "--decimal-comma"
	FlagColumns         = "--columns"
	FlagTemperatureUnit = "--temperature-unit"
	FlagFlowUnit        = "--flow-unit"
	FlagTimezone        = "--timezone"
	FlagSkipBadRows     = "--skip-bad-rows"
	FlagGap             = "--gap"
	FlagWindow          = "--window"
)

// OptionFlag is the flag that sets an Options field (OptionError.Option);
// "" for one the command line does not set (Optional).
func OptionFlag(option string) string {
	return map[string]string{"Separator": FlagSeparator, "DecimalComma": FlagDecimalComma, "Columns": FlagColumns,
		"TemperatureUnit": FlagTemperatureUnit, "FlowUnit": FlagFlowUnit, "SkipBadRows": FlagSkipBadRows, "Location": FlagTimezone}[option]
}

// OptionError is a problem in the reader's options themselves (a mapping to
// an unknown column, a decimal comma with the comma separator); the command
// line names the option.
type OptionError struct {
	Option string // the Options field: "Separator", "DecimalComma", "Columns", "TemperatureUnit", "FlowUnit", "Optional", "SkipBadRows"
	Msg    string
}

func (e *OptionError) Error() string { return e.Msg }

// Validate checks the options alone, before any file is read: an
// *OptionError, or nil. Open and NewReader check them too.
func (o Options) Validate() error { return o.check() }

// check validates the options before any file is read.
func (o *Options) check() error {
	switch o.Separator {
	case 0, ',', ';', '\t':
	default:
		return &OptionError{"Separator", fmt.Sprintf("the separator must be ',', ';' or a tab, not %q", o.Separator)}
	}
	if o.DecimalComma && o.Separator == ',' {
		return &OptionError{"DecimalComma", "a decimal comma cannot be read with ',' as the separator: give " + FlagSeparator + " ';' or tab"}
	}
	if o.SkipBadRows < 0 {
		return &OptionError{"SkipBadRows", fmt.Sprintf("the number of bad rows to skip must be 0 or more, not %d", o.SkipBadRows)}
	}
	known := map[string]bool{}
	for _, c := range o.columns() {
		if known[c.Key] {
			return &OptionError{"Optional", fmt.Sprintf("the column %q is listed twice", c.Key)}
		}
		if c.Role == RoleNumber && len(c.Kinds) == 0 {
			return &OptionError{"Optional", fmt.Sprintf("the column %q has no kind of quantity", c.Key)}
		}
		known[c.Key] = true
	}
	keys := make([]string, 0, len(o.Columns))
	for k := range o.Columns {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if !known[k] {
			names := make([]string, 0, len(known))
			for _, c := range o.columns() {
				names = append(names, c.Key)
			}
			return &OptionError{"Columns", fmt.Sprintf("no column is called %q; the columns are %s", k, strings.Join(names, ", "))}
		}
		if strings.TrimSpace(o.Columns[k]) == "" {
			return &OptionError{"Columns", fmt.Sprintf("the header name for %q is empty", k)}
		}
	}
	for _, u := range []struct {
		opt, unit string
		kinds     []units.Kind
	}{
		{"TemperatureUnit", o.TemperatureUnit, []units.Kind{units.Temperature}},
		{"FlowUnit", o.FlowUnit, []units.Kind{units.VolumeFlow, units.MassFlow}},
	} {
		if u.unit == "" {
			continue
		}
		if _, _, _, err := converter(u.unit, u.kinds); err != nil {
			return &OptionError{u.opt, fmt.Sprintf("%q is not a unit of %s: %v", u.unit, u.kinds[0].Name, err)}
		}
	}
	return nil
}

// columns is the standard table followed by the optional columns.
func (o *Options) columns() []Column {
	return append(append([]Column(nil), Standard...), o.Optional...)
}

// fallbackUnit is the unit the options give for a column without one in the
// header.
func (o *Options) fallbackUnit(c Column) string {
	for _, k := range c.Kinds {
		switch k {
		case units.Temperature:
			return o.TemperatureUnit
		case units.VolumeFlow, units.MassFlow:
			return o.FlowUnit
		}
	}
	return ""
}

// headerName is the name the file uses for a column.
func (o *Options) headerName(c Column) string {
	if h, ok := o.Columns[c.Key]; ok {
		return strings.TrimSpace(h)
	}
	return c.Key
}
