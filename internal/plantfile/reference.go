package plantfile

import (
	"fmt"
	"strings"
)

// Reference markers: the README's plant-file table sits between them and is
// written by ReferenceTable (a test compares; -update rewrites).
const (
	ReferenceBegin = "<!-- plant-file fields: generated from internal/plantfile/fields.go by " +
		"'go test ./internal/plantfile/ -update'; do not edit by hand -->"
	ReferenceEnd = "<!-- end of plant-file fields -->"
)

// ReferenceTable is the plant-file reference as a Markdown table, one row per
// key of the field table.
func ReferenceTable() string {
	var b strings.Builder
	b.WriteString("| key | value | required | default | meaning |\n|---|---|---|---|---|\n")
	for _, f := range fields {
		req := ""
		if f.Required {
			req = "yes"
		}
		if len(f.OneOf) > 0 {
			req = "exactly one of `" + strings.Join(f.OneOf, "`, `") + "`"
		}
		def := ""
		if f.Default != "" {
			def = "`" + f.Default + "`"
		}
		fmt.Fprintf(&b, "| `%s` | %s | %s | %s | %s |\n", f.Path, valueText(f), req, def, strings.ReplaceAll(f.Description, "|", "\\|"))
	}
	return b.String()
}

// Markers of the README's list of the fields that may carry a tolerance.
const (
	VariedBegin = "<!-- varied fields: generated from internal/plantfile/fields.go by " +
		"'go test ./internal/plantfile/ -update'; do not edit by hand -->"
	VariedEnd = "<!-- end of varied fields -->"
)

// VariedTable lists the fields that may carry a tolerance in the
// uncertainty block, with their physical range and what moves with them.
func VariedTable() string {
	var b strings.Builder
	b.WriteString("| field | physical range (SI; a range that crosses it is refused) | what moves with it |\n|---|---|---|\n")
	for _, f := range fields {
		if f.Vary == nil {
			continue
		}
		unit := ""
		if f.Value == KindQuantity && f.Vary.Bound.String() != "any value" {
			unit = " " + f.Unit.SIUnit
		}
		fmt.Fprintf(&b, "| `%s` | %s%s | %s |\n", f.Path, f.Vary.Bound, unit, strings.ReplaceAll(f.Vary.Moves, "|", "\\|"))
	}
	return b.String()
}

// valueText says in words what a key holds.
func valueText(f Field) string {
	switch f.Value {
	case KindQuantity:
		return f.Unit.Name + ", e.g. `" + f.Example + "`"
	case KindFlow:
		return "volumetric or mass flow, e.g. `" + f.Example + "`"
	case KindConsistency:
		return "Pa·sⁿ, e.g. `" + f.Example + "`"
	case KindNumber:
		if f.Fraction {
			return "fraction, e.g. `" + f.Example + "` (or a percentage)"
		}
		return "number without a unit, e.g. `" + f.Example + "`"
	case KindInteger:
		return fmt.Sprintf("whole number %g–%g", f.Min, f.Max)
	case KindText:
		return "text"
	case KindBoolean:
		return "`true` or `false`"
	case KindEnum:
		return "`" + strings.Join(f.Values, "` or `") + "`"
	case KindMapping:
		return "mapping"
	case KindList:
		return "list of mappings"
	case KindWaterOrMapping:
		return "`" + strings.Join(f.Values, "` or `") + "`, or a mapping"
	case KindNamed:
		return "mapping of names (`" + NameKey + "` below stands for each)"
	case KindPathMapping:
		return "mapping of field paths"
	case KindTolerance:
		return "tolerance, e.g. `" + f.Example + "`"
	case KindDate:
		return "date YYYY-MM-DD, e.g. `" + f.Example + "`"
	case KindInterval:
		return "interval (d, week, month, year), e.g. `" + f.Example + "`"
	}
	panic(fmt.Sprintf("%sno reference text for value kind %d", panicPrefix, int(f.Value)))
}
