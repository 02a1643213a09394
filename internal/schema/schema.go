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

// ID is the schema's identifier.
const ID = "https://pasval.invalid/schema/plant-file.json"

const number = `[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?`

// Patterns for quantities written as strings.
var (
	TemperaturePattern = `^\s*` + number + `\s*(?:°C|degC|℃|°F|degF|℉|K)\s*$`
	QuantityPattern    = `^\s*` + number + `\s*[^\s0-9.,+-][^\n]*$`
	NumberPattern      = `^\s*` + number + `\s*%?\s*$`
)

type obj = map[string]any

func temperature(desc string) obj {
	return obj{"type": "string", "pattern": TemperaturePattern, "description": desc + " (a temperature with its unit: °C, degC, °F, degF or K)"}
}

func quantity(desc, example string) obj {
	return obj{"type": "string", "pattern": QuantityPattern, "description": desc + "; a number and its unit, e.g. " + example}
}

func plain(desc string) obj {
	return obj{"description": desc, "oneOf": []any{obj{"type": "number"}, obj{"type": "string", "pattern": NumberPattern}}}
}

func text(desc string) obj { return obj{"type": "string", "description": desc} }

func object(desc string, props obj, required ...string) obj {
	o := obj{"type": "object", "description": desc, "properties": props, "additionalProperties": false}
	if len(required) > 0 {
		o["required"] = required
	}
	return o
}

func plateProps(extra obj) obj {
	p := obj{
		"arrangement": obj{"enum": []any{"counterflow", "cocurrent"}, "description": "relative direction of the two streams (default counterflow); co-current cannot pass 50 % regeneration"},
		"plates":      obj{"type": "integer", "minimum": 1, "maximum": 100000, "description": "installed thermal plates: rating mode"},
		"plate_area":  quantity("effective heat-transfer area per plate", "0.35 m2 or 3.8 ft2"),
		"u_value":     quantity("overall heat-transfer coefficient", "3300 W/(m2*K) or 580 Btu/(h*ft2*°F)"),
		"fouling":     quantity("fouling resistance, optional: 1/U_eff = 1/U + R_f", "0.00005 m2*K/W"),
	}
	for k, v := range extra {
		p[k] = v
	}
	return p
}

func mediumProps(extra obj) obj {
	m := obj{
		"medium": obj{"description": "water (IAPWS-IF97 properties) or a described medium", "oneOf": []any{
			obj{"const": "water"},
			object("a medium with constant properties", obj{
				"name":          text("medium name"),
				"density":       quantity("density", "1040 kg/m3"),
				"specific_heat": quantity("specific heat", "3.7 kJ/(kg*K)"),
			}, "name", "density", "specific_heat"),
		}},
		"medium_inlet": temperature("medium inlet; in heating rating mode, the hottest available"),
		"medium_rate":  quantity("medium flow, volumetric or by mass", "20000 L/h or 88 gpm"),
	}
	for k, v := range extra {
		m[k] = v
	}
	return plateProps(m)
}

// PlantFile returns the JSON Schema of a plant file.
func PlantFile() map[string]any {
	record := object("free text for reports", obj{
		"site": text("site"), "line": text("line"), "product": text("product as named on the record"),
		"schedule": text("the thermal schedule in words"), "prepared_by": text("who prepared the file"), "notes": text("notes"),
	})
	product := object("the liquid being pasteurized", obj{
		"name":          text("product name"),
		"density":       quantity("density (or give composition)", "1030 kg/m3 or 64.3 lb/ft3"),
		"specific_heat": quantity("specific heat (or give composition)", "3.93 kJ/(kg*K) or 0.94 Btu/(lb*°F)"),
		"conductivity":  quantity("thermal conductivity, optional", "0.6 W/(m*K)"),
		"composition": object("mass fractions for Choi–Okos properties (summing to 1)", obj{
			"water": plain("water fraction"), "protein": plain("protein fraction"), "fat": plain("fat fraction"),
			"carbohydrate": plain("carbohydrate fraction"), "fiber": plain("fiber fraction"), "ash": plain("ash fraction"),
		}),
		"viscosity": obj{"type": "array", "minItems": 1, "description": "Newtonian viscosity points; ln μ is linear in T between them",
			"items": object("one measured viscosity", obj{
				"at":    temperature("temperature of the measurement"),
				"value": quantity("viscosity", "2.9 mPa*s or 2.9 cP"),
			}, "at", "value")},
		"power_law": object("power-law product at the holding temperature (instead of viscosity)", obj{
			"flow_index":  plain("flow index n (0 < n ≤ 1.5)"),
			"consistency": quantity("consistency index K", "0.35 Pa*s^0.7"),
		}, "flow_index", "consistency"),
	}, "name")
	flow := object("product rates, volumetric or by mass", obj{
		"rate":     quantity("normal rate: sizes and rates the sections (defaults to max_rate)", "10000 L/h or 44 gpm"),
		"max_rate": quantity("sealed maximum: sets the holding time (defaults to rate)", "11000 L/h or 48 gpm"),
	})
	process := object("the schedule's temperatures", obj{
		"raw_inlet":       temperature("raw product inlet"),
		"hold_setpoint":   temperature("diversion setpoint at the holding-tube outlet"),
		"outlet_target":   temperature("product outlet target (required with cooling)"),
		"sensor_accuracy": quantity("stated accuracy of the diversion sensor, a temperature difference", "0.5 °C or 0.9 °F"),
	}, "raw_inlet", "hold_setpoint")
	regeneration := object("product-to-product regeneration: ratio (sizing) or plates (rating)", plateProps(obj{
		"ratio": plain("regeneration ratio, 0 < ratio < 1 (sizing mode)"),
		"pressure": object("regenerator pressures for the regenerator-pressure check", obj{
			"raw_max":         quantity("highest raw-side pressure", "95 kPa or 14 psi"),
			"pasteurized_min": quantity("lowest pasteurized-side pressure", "130 kPa or 19 psi"),
			"required_margin": quantity("required margin (default 1 psi = 6.9 kPa)", "6.9 kPa or 1 psi"),
		}, "raw_max", "pasteurized_min"),
	}), "plate_area", "u_value")
	regeneration["oneOf"] = []any{obj{"required": []any{"ratio"}, "not": obj{"required": []any{"plates"}}},
		obj{"required": []any{"plates"}, "not": obj{"required": []any{"ratio"}}}}
	heating := object("heating with a hot medium", mediumProps(nil), "medium", "medium_inlet", "medium_rate", "plate_area", "u_value")
	stage := object("one cooling stage", mediumProps(obj{
		"name":        text("stage name"),
		"product_out": temperature("product outlet this sizing stage must reach (the last stage defaults to outlet_target)"),
	}), "medium", "medium_inlet", "medium_rate", "plate_area", "u_value")
	tube := object("the holding tube", obj{
		"inner_diameter":    quantity("inner diameter (or sanitary_tube)", "47.5 mm or 1.87 in"),
		"sanitary_tube":     quantity("sanitary tube size, OD = nominal: 1.5, 2, 2.5, 3, 4 or 6 in", "2 in"),
		"outer_diameter":    quantity("outer diameter (for heat loss)", "50.8 mm"),
		"length":            quantity("length from the heater outlet to the diversion sensor", "34 m or 110 ft"),
		"rise":              quantity("rise of the outlet above the inlet", "0.8 m or 28 in"),
		"min_slope":         plain("minimum slope, rise/length (default 0.25 in/ft)"),
		"fastest_to_mean":   plain("override of the fastest-to-mean velocity ratio (1 to 3)"),
		"ambient":           temperature("ambient air around the tube (heat loss)"),
		"outer_coefficient": quantity("outer heat-transfer coefficient (heat loss)", "10 W/(m2*K)"),
		"pu":                obj{"type": "boolean", "description": "also report brewing pasteurization units (60 °C, z = 7 °C)"},
	}, "length")
	tube["oneOf"] = []any{obj{"required": []any{"inner_diameter"}, "not": obj{"required": []any{"sanitary_tube"}}},
		obj{"required": []any{"sanitary_tube"}, "not": obj{"required": []any{"inner_diameter"}}}}
	organism := object("a target organism's kinetics, as the process authority accepts them", obj{
		"name":                   text("organism"),
		"D":                      quantity("D-value at D_temperature", "0.9 s or 18 min"),
		"D_temperature":          temperature("reference temperature of D"),
		"z":                      quantity("z-value, a temperature difference", "6.3 °C or 11.3 °F"),
		"required_log_reduction": plain("required log reduction; without it the reduction is reported, not judged"),
	}, "name", "D", "D_temperature", "z")
	row := object("one legal minimum", obj{
		"temperature": temperature("row temperature"),
		"time":        quantity("row time", "15 s or 30 min"),
	}, "temperature", "time")
	economics := object("prices for the added-plates what-if", obj{
		"currency":                 text("currency name"),
		"operating_hours_per_year": plain("operating hours a year (0–8784)"),
		"heat_price_per_kWh":       plain("price per kWh of heat delivered to the heating medium"),
		"cooling_price_per_kWh":    plain("price per kWh of heat removed by the cooling medium"),
		"plate_cost":               plain("cost per added plate, installed"),
	}, "operating_hours_per_year", "heat_price_per_kWh", "cooling_price_per_kWh", "plate_cost")

	s := object("A pasval plant file: a continuous pasteurizer described once, every quantity with its unit.", obj{
		"record":         record,
		"product":        product,
		"flow":           flow,
		"process":        process,
		"regeneration":   regeneration,
		"heating":        heating,
		"cooling":        obj{"type": "array", "minItems": 1, "items": stage, "description": "cooling stages in flow order"},
		"holding_tube":   tube,
		"organisms":      obj{"type": "array", "minItems": 1, "items": organism, "description": "target organisms"},
		"legal_minimums": obj{"type": "array", "minItems": 1, "items": row, "description": "the legal time–temperature rows your regulator applies"},
		"economics":      economics,
	}, "product", "process")
	s["$schema"] = "https://json-schema.org/draft/2020-12/schema"
	s["$id"] = ID
	s["title"] = "pasval plant file"
	return s
}
