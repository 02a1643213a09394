package assess

// WarningCode names a warning; its words are made where output is made
// (internal/present), from the code and the values.
type WarningCode string

const (
	// Holding tube and kinetics.
	WarnLaminarFlow           WarningCode = "laminar-flow"           // values: reynolds, fastest_to_mean
	WarnViscosityExtrapolated WarningCode = "viscosity-extrapolated" // setpoint_C, lowest_C, highest_C
	WarnNoRise                WarningCode = "no-rise"                // no values

	// Values outside what the trade sees (typical ranges in sanity.go).
	WarnUValue              WarningCode = "u-value-unusual"         // value_W_m2K, low_W_m2K, high_W_m2K
	WarnPlateArea           WarningCode = "plate-area-unusual"      // value_m2, low_m2, high_m2
	WarnFouling             WarningCode = "fouling-high"            // value_m2K_W, high_m2K_W
	WarnRatioHigh           WarningCode = "regeneration-ratio-high" // ratio
	WarnDensity             WarningCode = "density-unusual"         // value_kg_m3, low_kg_m3, high_kg_m3
	WarnSpecificHeat        WarningCode = "specific-heat-unusual"   // value_J_kgK, low_J_kgK, high_J_kgK
	WarnViscosityBelowWater WarningCode = "viscosity-below-water"   // value_Pa_s, at_C, water_Pa_s
	WarnHoldingTimeLong     WarningCode = "holding-time-long"       // min_residence_s
	WarnTubeVelocity        WarningCode = "tube-velocity-unusual"   // value_m_s, low_m_s, high_m_s
	WarnOuterCoefficient    WarningCode = "outer-coefficient-high"  // value_W_m2K

	// Plate packs (docs/METHOD.md §12.5); each names its section.
	WarnPackReynolds              WarningCode = "plate-pack-reynolds-out-of-range"  // reynolds, low, high
	WarnPackBranch                WarningCode = "plate-pack-near-branch-switch"     // reynolds, switch, low, high
	WarnPackAngle                 WarningCode = "plate-pack-angle-above-range"      // angle_rad, high_rad
	WarnPackApparentViscosity     WarningCode = "plate-pack-apparent-viscosity"     // flow_index
	WarnPackUDiffers              WarningCode = "plate-pack-u-differs"              // entered_W_m2K, computed_clean_W_m2K, difference
	WarnPackViscosityExtrapolated WarningCode = "plate-pack-viscosity-extrapolated" // at_C, lowest_C, highest_C
	// Guard rails (docs/METHOD.md §19.2).
	// WarnKineticsExtrapolated values: organism_index, distance_K, used_at_C,
	// D_temperature_C, log_reduction.
	WarnKineticsExtrapolated WarningCode = "kinetics-extrapolated"
	WarnProductFrozen        WarningCode = "product-below-freezing"       // product_out_C, limit_C, freezing_point_entered (1/0), stage_index
	WarnMediumPressurised    WarningCode = "heating-medium-above-boiling" // medium_in_C, boiling_C
	WarnOutletWarm           WarningCode = "outlet-above-cold-limit"      // outlet_C, limit_C
	// NoteOutletWarm is a note, not a warning: the outlet target is set
	// above the cold limit on purpose. Values: outlet_C, limit_C, target_C.
	NoteOutletWarm WarningCode = "outlet-above-cold-limit-by-target"

	// WarnAcceptanceNotJudged is the latest result of a test that the plant
	// file gives nothing to judge against; Field names what is missing
	// (legal_minimums, process.sensor_accuracy, diversion, or the
	// temperature of a water test outside the property range). Values:
	// test_index.
	WarnAcceptanceNotJudged WarningCode = "acceptance-not-judged"

	// WarnHoldingTimeNotJudged is a holding tube without legal rows: its
	// time is computed and shown, never judged. No values.
	WarnHoldingTimeNotJudged WarningCode = "holding-time-not-judged"
	// NoteSealFromRate and NoteRateFromSeal are notes: one rate is entered
	// and stands for the other (flow.max_rate defaults to flow.rate and
	// back). Values: rate_m3_s, the rate taken (volumetric at the entry
	// density).
	NoteSealFromRate WarningCode = "sealed-maximum-from-rate"
	NoteRateFromSeal WarningCode = "rate-from-sealed-maximum"

	// Unit mix-ups (docs/METHOD.md §19.2).
	// WarnLegalRowCool is a legal row below LegalRowFloorC, below any
	// pasteurization temperature (a °C value written in °F?). Field: the
	// row's temperature. Values: row_index (in the rows judged),
	// temperature_C, floor_C.
	WarnLegalRowCool WarningCode = "legal-row-below-pasteurization"
	// WarnScalesMixed is a plant whose temperature points are written in
	// both °C (or K) and °F; the words name the fields (from the plant's
	// inputs). Values: celsius_fields, fahrenheit_fields (counts).
	WarnScalesMixed WarningCode = "temperature-scales-mixed"
	// WarnTimingTestDiffers is a latest holding-time test whose measured time
	// differs from the model's prediction for it by more than
	// TimingTestTolerance either way. Field: acceptance[i].time. Values:
	// test_index, measured_s, model_s, difference (measured/model − 1).
	WarnTimingTestDiffers WarningCode = "holding-time-test-differs"
	// WarnTimingTestBelowSeal is a latest holding-time test timed at a
	// flow more than TestFlowBelowSeal below the sealed maximum as entered
	// (a seal raised since the test): its time at the seal is the model's
	// scaling, not a measurement. Field: acceptance[i].flow. Values:
	// test_index, test_flow_m3_s, seal_m3_s (volumetric as entered).
	WarnTimingTestBelowSeal WarningCode = "holding-time-test-below-seal"
	// WarnViscosityRises is a Newtonian viscosity point above the point
	// next below it in temperature: liquid foods thin as they warm. Field:
	// the warmer point's value. Values: at_C, value_Pa_s, below_at_C,
	// below_value_Pa_s.
	WarnViscosityRises WarningCode = "viscosity-rises-with-temperature"
	// NoteExactSensor is a holding tube judged at the bare setpoint because
	// process.sensor_accuracy is not given: the judgement assumes an exact
	// diversion sensor. No values.
	NoteExactSensor WarningCode = "judged-at-the-setpoint"
	// WarnLineProductBlock is a line file that gives blocks of a product
	// (product, flow, process, organisms, legal_table; LineBlocks names
	// them): each product file that leaves one out inherits it whole
	// (LineWarnings). Values: inheriting (how many of the products judged
	// take one).
	WarnLineProductBlock WarningCode = "line-file-gives-product-block"
	// Recorded runs (docs/METHOD.md §13.1); File names the run, Field its
	// column's key. The median of the first forward samples lies far from
	// what the plant file says the line runs at: a column read in the wrong
	// unit (°F read as °C, gpm as L/h) passes otherwise unnoticed.
	WarnRunTemperatureUnit WarningCode = "run-temperature-implausible" // median_C, setpoint_C, limit_K
	WarnRunFlowUnit        WarningCode = "run-flow-implausible"        // median_m3_s, normal_m3_s, low_ratio, high_ratio
)

// WarningCodes lists every code (tests walk each through the wording).
var WarningCodes = []WarningCode{WarnLaminarFlow, WarnViscosityExtrapolated, WarnNoRise,
	WarnUValue, WarnPlateArea, WarnFouling, WarnRatioHigh, WarnDensity, WarnSpecificHeat, WarnViscosityBelowWater,
	WarnHoldingTimeLong, WarnTubeVelocity, WarnOuterCoefficient,
	WarnPackReynolds, WarnPackBranch, WarnPackAngle, WarnPackApparentViscosity, WarnPackUDiffers, WarnPackViscosityExtrapolated,
	WarnKineticsExtrapolated, WarnProductFrozen, WarnMediumPressurised, WarnOutletWarm, NoteOutletWarm,
	WarnAcceptanceNotJudged, WarnHoldingTimeNotJudged, NoteSealFromRate, NoteRateFromSeal,
	WarnLegalRowCool, WarnScalesMixed, WarnTimingTestDiffers, WarnTimingTestBelowSeal, WarnViscosityRises, NoteExactSensor, WarnLineProductBlock,
	WarnRunTemperatureUnit, WarnRunFlowUnit}

// Warning is something the user should look at that is not a failed check.
// assess fills Code, Field and Values (SI, each key naming its unit);
// Message is made by internal/present (in SI for JSON).
type Warning struct {
	Code WarningCode `json:"code"`
	// File is the recorded run concerned, for a run review's warnings.
	File  string `json:"file,omitempty"`
	Field string `json:"field,omitempty"` // the plant-file path concerned, or a recorded run's column key
	// Section names the heat-exchange section concerned, as regen labels it
	// ("regeneration", "cooling stage \"chilled water\""), when there is one.
	Section string             `json:"section,omitempty"`
	Message string             `json:"message"`
	Values  map[string]float64 `json:"values,omitempty"`
	// Note is true for a note: something stated for the record that needs no
	// action (printed under "Notes", not "Warnings").
	Note bool `json:"note,omitempty"`
}

func (r *Result) warn(code WarningCode, field string, values map[string]float64) {
	r.Warnings = append(r.Warnings, Warning{Code: code, Field: field, Values: values})
}

func (r *Result) warnSection(code WarningCode, section, field string, values map[string]float64) {
	r.Warnings = append(r.Warnings, Warning{Code: code, Section: section, Field: field, Values: values})
}
