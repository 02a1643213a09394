// Package schema describes the plant file as a JSON Schema (draft 2020-12),
// for editors that complete and check YAML as it is typed (a YAML language
// server reads it from a "# yaml-language-server: $schema=…" comment).
//
//	data, _ := json.MarshalIndent(schema.PlantFile(), "", "  ")
//
// The schema checks the structure: keys, types, required fields, enums, and
// that every quantity is a number followed by a unit (temperatures with a
// temperature unit). The dimension of a unit, and every rule that spans
// fields, is checked by pasval itself.
package schema

import (
	"fmt"

	"pasval/internal/oneline"
	"pasval/internal/plantfile"
	"pasval/internal/units"
)

// ID is the schema's identifier.
const ID = "https://pasval.invalid/schema/plant-file.json"

const number = `[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?`

// Patterns for quantities written as strings.
var (
	TemperaturePattern = `^\s*` + number + `\s*(?:°C|degC|℃|°F|degF|℉|K)\s*$`
	QuantityPattern    = `^\s*` + number + `\s*[^\s0-9.,+-][^\n]*$`
	// NumberPattern is a fraction written as a string: a number, a
	// percentage or a ratio of like units ("2.1 cm/m"); pasval checks that
	// the unit is dimensionless.
	NumberPattern = `^\s*` + number + `\s*(?:%|[^\s0-9.,+-][^\n]*)?$`
	// PlainNumberPattern is any other number written as a string: no unit.
	PlainNumberPattern = `^\s*` + number + `\s*$`
	// TolerancePattern is a tolerance of the uncertainty block: ±X with a
	// unit or %; PathPattern a field path as its key.
	TolerancePattern = `^\s*(?:±|\+-|\+/-)\s*` + number + `\s*[^\n]*$`
	PathPattern      = `^[A-Za-z_][A-Za-z0-9_]*(?:\[[0-9]+\])?(?:\.[A-Za-z_][A-Za-z0-9_]*(?:\[[0-9]+\])?)*$`
	// DatePattern is an ISO 8601 calendar date; IntervalPattern a calendar
	// interval (docs/METHOD.md §15.5).
	DatePattern     = `^[0-9]{4}-[0-9]{2}-[0-9]{2}$`
	IntervalPattern = `^\s*[0-9]+\s*(?:d|days?|weeks?|months?|years?)\s*$`
)

type obj = map[string]any

// PlantFile returns the JSON Schema of a plant file, made from the reader's
// table of fields (plantfile.Fields), so that the schema and the reader
// cannot disagree on a key.
func PlantFile() map[string]any {
	s := node(plantfile.Field{Value: plantfile.KindMapping,
		Description: "A pasval plant file: a continuous pasteurizer described once, every quantity with its unit."}, "")
	// A file names its line file, or gives product and process itself, or
	// is a line file (neither product nor process): docs/METHOD.md §16.1.
	if req, ok := s["required"]; ok {
		delete(s, "required")
		s["anyOf"] = []any{
			obj{"required": req},
			obj{"required": []any{"line_file"}},
			obj{"not": obj{"anyOf": []any{obj{"required": []any{"product"}}, obj{"required": []any{"process"}}}}},
		}
	}
	s["$schema"] = "https://json-schema.org/draft/2020-12/schema"
	s["$id"] = ID
	s["title"] = "pasval plant file"
	return s
}

// node is the schema of one field; path is its table path ("" for the file).
func node(f plantfile.Field, path string) obj {
	desc := f.Description
	if f.Default != "" {
		desc += " (default " + f.Default + ")"
	}
	switch f.Value {
	case plantfile.KindQuantity:
		if f.Unit.Name == units.Temperature.Name {
			return obj{"type": "string", "pattern": TemperaturePattern,
				"description": desc + " (a temperature with its unit: °C, degC, °F, degF or K, e.g. " + f.Example + ")"}
		}
		return obj{"type": "string", "pattern": QuantityPattern, "description": desc + "; " + units.Article(f.Unit.Name) +
			", a number and its unit, e.g. " + f.Example}
	case plantfile.KindFlow, plantfile.KindConsistency:
		return obj{"type": "string", "pattern": QuantityPattern, "description": desc + "; a number and its unit, e.g. " + f.Example}
	case plantfile.KindNumber:
		pattern := PlainNumberPattern
		if f.Fraction {
			pattern = NumberPattern
		}
		return obj{"description": desc, "oneOf": []any{obj{"type": "number"}, obj{"type": "string", "pattern": pattern}}}
	case plantfile.KindInteger:
		return obj{"type": "integer", "minimum": f.Min, "maximum": f.Max, "description": desc}
	case plantfile.KindText:
		return obj{"type": "string", "pattern": oneline.Pattern, "description": desc + " (one line)"}
	case plantfile.KindBoolean:
		return obj{"type": "boolean", "description": desc}
	case plantfile.KindEnum:
		return obj{"enum": words(f.Values), "description": desc}
	case plantfile.KindMapping:
		return object(desc, path, f.OneOf)
	case plantfile.KindList:
		return obj{"type": "array", "minItems": 1, "description": desc, "items": object(f.Description, path, nil)}
	case plantfile.KindNamed:
		item := plantfile.Children(path)[0]
		return obj{"type": "object", "minProperties": 1, "description": desc, "properties": obj{},
			"propertyNames": obj{"pattern": plantfile.NamePattern}, "additionalProperties": node(item, item.Path)}
	case plantfile.KindDate:
		return obj{"type": "string", "format": "date", "pattern": DatePattern, "description": desc + " (an ISO 8601 date YYYY-MM-DD, e.g. " + f.Example + ")"}
	case plantfile.KindInterval:
		return obj{"type": "string", "pattern": IntervalPattern, "description": desc + " (a whole number and d, week, month or year, e.g. " + f.Example + ")"}
	case plantfile.KindWaterOrMapping:
		return obj{"description": desc, "oneOf": []any{obj{"enum": words(f.Values)}, object(f.Description, path, nil)}}
	case plantfile.KindPathMapping:
		// Its one child is the entry whose key is any field path.
		entry := plantfile.Children(path)[0]
		return obj{"type": "object", "description": desc, "propertyNames": obj{"pattern": PathPattern},
			"additionalProperties": object(entry.Description, entry.Path, nil)}
	case plantfile.KindTolerance:
		return obj{"type": "string", "pattern": TolerancePattern, "description": desc + ", e.g. " + f.Example}
	}
	panic(fmt.Sprintf("schema: no schema for value kind %v of %s", f.Value, f.Path))
}

// object is a mapping of the table's children of path: unknown keys are
// refused, required ones listed, and oneOf keys exclusive.
func object(desc, path string, oneOf []string) obj {
	props, required := obj{}, []string{}
	for _, c := range plantfile.Children(path) {
		props[c.Key()] = node(c, c.Path)
		if c.Required {
			required = append(required, c.Key())
		}
	}
	o := obj{"type": "object", "description": desc, "properties": props, "additionalProperties": false}
	if len(required) > 0 {
		o["required"] = required
	}
	if len(oneOf) > 0 {
		var alts []any
		for _, k := range oneOf {
			var others []any
			for _, x := range oneOf {
				if x != k {
					others = append(others, x)
				}
			}
			alts = append(alts, obj{"required": []any{k}, "not": obj{"required": others}})
		}
		o["oneOf"] = alts
	}
	return o
}

func words(ws []string) []any {
	out := make([]any, len(ws))
	for i, w := range ws {
		out[i] = w
	}
	return out
}
