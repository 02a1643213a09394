package main

// Source of the expected values: the project's own specification of each
// refusal (line, field and message wording); no outside reference applies.

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// badCase is one file of testdata/bad: the exit code, the line the first
// error points at, the field path it names and a fragment of its message.
// The expectations are the project's own specification of each refusal.
type badCase struct {
	line  int
	field string // "" for errors about the whole file
	frag  string
}

// badCaseIn names, for a case whose first error lies in its line file, that
// file (the error must point into it).
var badCaseIn = map[string]string{
	"line-cycle-a": "line-cycle-b",
	"line-cycle-b": "line-cycle-a",
	"line-chain":   "line-chain-middle",
}

var badCases = map[string]badCase{
	"anchor-alias":                     {15, "regeneration.plate_area", "anchors and aliases"},
	"bad-arrangement":                  {14, "regeneration.arrangement", `did you mean "counterflow"`},
	"below-absolute-zero":              {10, "process.raw_inlet", "below absolute zero"},
	"broken-yaml":                      {3, "name", "not valid YAML"},
	"cocurrent-regenerator":            {15, "regeneration.ratio", "never passes 50 %"},
	"cocurrent-regenerator-half":       {15, "regeneration.ratio", "never passes 50 %"},
	"comments-only":                    {1, "", "no YAML mapping"},
	"composition-sum":                  {4, "product.composition", "sum to 0.9220"},
	"cooling-cross":                    {26, "cooling[0].medium_inlet", "temperature cross"},
	"duplicate-key":                    {13, "process.raw_inlet", "given twice"},
	"empty":                            {1, "", "the plant file is empty"},
	"fractional-plates":                {21, "heating.plates", "whole number"},
	"heating-burn-on-zero":             {21, "heating.max_medium_to_product", "must be greater than zero"},
	"heating-cross":                    {19, "heating.medium_inlet", "temperature cross"},
	"heating-starved":                  {18, "heating", "temperature cross: medium 77.00"},
	"huge-number":                      {15, "regeneration.plate_area", "not a number"},
	"inf-value":                        {7, "flow.rate", "not a number"},
	"intermediate-stage-no-outlet":     {24, "cooling[0].product_out", "sizing stage before the last"},
	"missing-flow":                     {1, "flow.rate", "need the product rate"},
	"missing-product":                  {2, "product", "missing"},
	"missing-setpoint":                 {10, "process.hold_setpoint", "missing"},
	"missing-unit-flow":                {7, "flow.rate", "has no unit"},
	"missing-unit-temperature":         {11, "process.hold_setpoint", "has no unit"},
	"nan-value":                        {4, "product.density", "not a number"},
	"negative-flow":                    {7, "flow.rate", "greater than zero"},
	"negative-viscosity":               {7, "product.viscosity[0].value", "greater than zero"},
	"no-ratio-no-plates":               {14, "regeneration.ratio", "give ratio (sizing"},
	"not-utf8":                         {3, "name", "not valid UTF-8"},
	"null-value":                       {21, "heating.plate_area", "found nothing"},
	"percent-flow":                     {7, "flow.rate", "percentage"},
	"product-is-list":                  {3, "product", "found a list"},
	"rate-above-max":                   {7, "flow.rate", "above the sealed maximum"},
	"rated-stage-with-outlet":          {31, "cooling[0].product_out", "rated stage"},
	"ratio-above-one":                  {14, "regeneration.ratio", "between 0 and 1"},
	"ratio-and-plates":                 {14, "regeneration.ratio", "not both"},
	"ratio-one":                        {14, "regeneration.ratio", "between 0 and 1"},
	"ratio-zero":                       {14, "regeneration.ratio", "between 0 and 1"},
	"raw-above-setpoint":               {10, "process.raw_inlet", "must be below the hold setpoint"},
	"raw-at-setpoint":                  {10, "process.raw_inlet", "must be below the hold setpoint"},
	"setpoint-out-of-range":            {11, "process.hold_setpoint", "outside 30–150 °C"},
	"tab-indent":                       {10, "raw_inlet", "tab is used for indentation"},
	"two-documents":                    {23, "", "second YAML document"},
	"typo-key":                         {11, "process.hold_setpiont", `did you mean "hold_setpoint"`},
	"typo-top-key":                     {13, "regneration", `did you mean "regeneration"`},
	"unknown-medium":                   {18, "heating.medium", `found "oil"`},
	"unknown-unit":                     {29, "cooling[0].u_value", "write °C or degC"},
	"viscosity-bare-temperature":       {7, "product.viscosity[0].at", "has no unit"},
	"water-frozen":                     {26, "cooling[0].medium_inlet", "between 0.5 and 200 °C"},
	"wrong-dimension-density":          {4, "product.density", "wrong dimension"},
	"wrong-dimension-flow":             {8, "flow.max_rate", "not a volumetric flow or mass flow"},
	"wrong-dimension-u":                {16, "regeneration.u_value", "wrong dimension"},
	"zero-flow":                        {8, "flow.max_rate", "greater than zero"},
	"zero-medium-flow":                 {20, "heating.medium_rate", "greater than zero"},
	"holding-ambient-above-setpoint":   {18, "holding_tube.ambient", "would gain heat"},
	"holding-both-diameters":           {15, "holding_tube.sanitary_tube", "not both"},
	"holding-heat-loss-no-od":          {17, "holding_tube.outer_diameter", "needs the outer diameter"},
	"holding-no-viscosity":             {3, "product.viscosity", "flow regime needs viscosity"},
	"holding-ratio-below-one":          {15, "holding_tube.fastest_to_mean", "from 1 to 3"},
	"holding-rise-above-length":        {17, "holding_tube.rise", "more than the tube length"},
	"holding-unknown-sanitary":         {15, "holding_tube.sanitary_tube", "not a listed sanitary size"},
	"holding-zero-length":              {16, "holding_tube.length", "greater than zero"},
	"organism-D-as-temperature":        {20, "organisms[0].D", "wrong dimension for a time"},
	"organism-bare-z":                  {22, "organisms[0].z", "has no unit"},
	"organism-typo-key":                {21, "organisms[0].D_temp", `did you mean "D_temperature"`},
	"organism-zero-z":                  {22, "organisms[0].z", "greater than zero"},
	"organisms-without-tube":           {1, "holding_tube", "judged in the holding tube"},
	"legal-row-bare-time":              {25, "legal_minimums[0].time", "has no unit"},
	"pu-not-boolean":                   {18, "holding_tube.pu", "true or false"},
	"economics-negative-price":         {33, "economics.heat_price_per_kWh", "cannot be negative"},
	"economics-missing-plate-cost":     {31, "economics.plate_cost", "missing"},
	"economics-hours":                  {31, "economics.operating_hours_per_year", "8784 hours"},
	"holding-heat-loss-absurd":         {52, "holding_tube.outer_coefficient", "more than 1000 K"},
	"magnitude-tiny":                   {4, "product.density", "outside the magnitudes"},
	"holding-credit-without-heat-loss": {15, "holding_tube.credit_heat_loss", "needs heat loss"},
	"no-u-value":                       {15, "regeneration.u_value", "or describe the plate pack"},
	"plate-pack-plates-mismatch":       {16, "regeneration.plates", "the layout gives 8 × 7 + 8 × 7 − 1 = 111 (product_side.passes at line 26, other_side.passes at line 27)"},
	"plate-pack-angle-range":           {17, "regeneration.plate.chevron_angle", "must be above 0° and below 90°"},
	"plate-pack-angle-celsius":         {17, "regeneration.plate.chevron_angle", "is a temperature, not an angle"},
	"plate-pack-one-side-passes":       {25, "regeneration.product_side.passes", "give the passes of both sides"},
	"plate-pack-no-conductivity":       {3, "product.conductivity", "needs the product's thermal conductivity"},
	"plate-pack-missing-side":          {15, "regeneration.other_side", "layout of both sides"},
	"plate-pack-unequal-channels":      {26, "regeneration.other_side.channels_per_pass", "may differ by at most one"},
	"plate-pack-missing-port":          {17, "regeneration.plate.port_diameter", "missing"},
	"plate-pack-enlargement":           {19, "regeneration.plate.enlargement_factor", "between 1 and 2"},
	"plate-pack-medium-no-viscosity":   {28, "heating.medium.viscosity", "needs the medium's viscosity"},
	// Reproducers of faults found by adversarial testing (README "Reliability").
	"viscosity-same-temperature":      {8, "product.viscosity[1].at", "the same temperature as viscosity[0]"},
	"temperature-overflow":            {10, "process.raw_inlet", "outside the temperatures pasval computes with"},
	"temperature-beyond-range":        {21, "organisms[0].D_temperature", "outside the temperatures pasval computes with"},
	"economics-price-huge":            {32, "economics.heat_price_per_kWh", "outside the magnitudes"},
	"log-reduction-percent":           {23, "organisms[0].required_log_reduction", "without a unit"},
	"organism-z-tiny":                 {22, "organisms[0].z", "1 to 100 K"},
	"kinetics-non-finite":             {21, "organisms[0].D_temperature", "not a finite number"},
	"rate-above-max-mixed-units":      {7, "flow.rate", "above the sealed maximum"},
	"plates-above-limit":              {14, "regeneration.plates", "from 1 to 10000"},
	"text-forged-verdict":             {3, "record.site", "line break"},
	"text-bidi-override":              {3, "product.name", "U+202E"},
	"yaml-unclosed-bracket":           {12, "outlet_target", "did not find expected ',' or ']'"},
	"yaml-undefined-alias":            {22, "u_value", "unknown anchor"},
	"yaml-control-in-comment":         {13, "regeneration", "control character"},
	"yaml-tag-binary":                 {4, "product.density", "YAML tags"},
	"yaml-tag-custom":                 {4, "product.density", "YAML tags"},
	"yaml-tag-map":                    {17, "heating", "YAML tags"},
	"uncertainty-unknown-path":        {28, "uncertainty.flow.max_rat", `did you mean "flow.max_rate"`},
	"uncertainty-not-scalar":          {28, "uncertainty.product.viscosity", "not a single value"},
	"uncertainty-not-varied":          {28, "uncertainty.process.sensor_accuracy", "cannot carry a tolerance"},
	"uncertainty-wrong-dimension":     {28, "uncertainty.holding_tube.length.tolerance", `"0.2 kg" is not a length`},
	"uncertainty-percent-temperature": {28, "uncertainty.process.hold_setpoint.tolerance", "depends on its scale"},
	"uncertainty-crosses-bound":       {28, "uncertainty.holding_tube.fastest_to_mean.tolerance", "outside the physical range"},
	"uncertainty-not-given":           {28, "uncertainty.holding_tube.inner_diameter", "vary holding_tube.sanitary_tube"},
	"uncertainty-no-sign":             {28, "uncertainty.flow.max_rate.tolerance", "expected ±X %"},
	"uncertainty-bad-distribution":    {28, "uncertainty.flow.max_rate.distribution", `did you mean "normal"`},
	"uncertainty-missing-index":       {28, "uncertainty.organisms[].D", "give the list entry's index"},
	"uncertainty-index-out-of-range":  {28, "uncertainty.organisms[3].D", "not given in the plant file"},
	"line-for-bad":                    {3, "product", "reads as a line file"},
	"line-unknown-table":              {15, "legal_table", `no class "hi-fat" in legal_tables (at ../../testdata/bad/line-for-bad.yaml:16:1) (did you mean "high-fat"?)`},
	"line-cycle-a":                    {3, "line_file", "a cycle: ../../testdata/bad/line-cycle-a.yaml names ../../testdata/bad/line-cycle-b.yaml as its line file, which names ../../testdata/bad/line-cycle-a.yaml back"},
	"line-cycle-b":                    {2, "line_file", "a cycle: ../../testdata/bad/line-cycle-b.yaml names ../../testdata/bad/line-cycle-a.yaml"},
	"line-chain":                      {3, "line_file", "a chain: ../../testdata/bad/line-chain-middle.yaml is the line file of ../../testdata/bad/line-chain.yaml and names another line file"},
	"line-chain-middle":               {3, "product", "missing (neither this file nor its line file ../../testdata/bad/line-for-bad.yaml gives it)"},
	"line-missing":                    {2, "line_file", "cannot read the line file ../../testdata/bad/no-such-line.yaml: no such file or directory"},
	"line-both-legal":                 {16, "legal_table", "give legal_table or legal_minimums, not both (legal_minimums at ../../testdata/bad/line-both-legal.yaml:17:1)"},
	"acceptance-unknown-kind":         {22, "acceptance[0].test", `found "holding-tme" (did you mean "holding-time"?)`},
	"acceptance-future-date":          {22, "acceptance[0].date", "2099-05-12 is after the review date 2026-12-01"},
	"acceptance-missing-value":        {22, "acceptance[0].time", "missing; a holding-time test records fluid, flow and time"},
	"acceptance-interval-no-unit":     {22, "acceptance[0].interval", `"90" has no unit`},
	"acceptance-interval-fraction":    {22, "acceptance[0].interval", "whole number of days, weeks, months or years"},
	"acceptance-interval-hours":       {22, "acceptance[0].interval", `"h" is not a calendar unit`},
	"acceptance-wrong-key":            {22, "acceptance[0].time", "a cut-out test does not record time"},
	"acceptance-bad-date":             {22, "acceptance[0].date", "expected an ISO 8601 date YYYY-MM-DD"},
	"diversion-no-response":           {22, "diversion.response_time", "or enter a valve-response acceptance test"},
}

const badDir = "../../testdata/bad"

func TestBadInputCorpus(t *testing.T) {
	files, err := filepath.Glob(filepath.Join(badDir, "*.yaml"))
	if err != nil || len(files) < 25 {
		t.Fatalf("bad-input corpus has %d files (%v); at least 25 expected", len(files), err)
	}
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".yaml")
		if _, ok := badCases[name]; !ok {
			t.Errorf("%s has no expectation in badCases", f)
		}
	}
	for name, want := range badCases {
		t.Run(name, func(t *testing.T) {
			path := filepath.Join(badDir, name+".yaml")
			for _, args := range [][]string{{"check", path}, {"check", "--json", path}} {
				var out, errb bytes.Buffer
				code := run(args, &out, &errb)
				if code != exitInput {
					t.Fatalf("%v: exit %d, want 2; stderr %q", args, code, errb.String())
				}
				first := strings.SplitN(errb.String(), "\n", 2)[0]
				in := name
				if other, ok := badCaseIn[name]; ok {
					in = other
				}
				loc := fmt.Sprintf("%s.yaml:%d:", in, want.line)
				if !strings.Contains(first, loc) {
					t.Errorf("first error %q does not point at %s", first, loc)
				}
				if want.field != "" && !strings.Contains(first, ": "+want.field+": ") {
					t.Errorf("first error %q does not name field %s", first, want.field)
				}
				if !strings.Contains(first, want.frag) {
					t.Errorf("first error %q lacks %q", first, want.frag)
				}
				if strings.Contains(errb.String(), "goroutine") || strings.Contains(errb.String(), "panic") {
					t.Errorf("stack trace in %q", errb.String())
				}
				if out.Len() != 0 {
					t.Errorf("output written for bad input: %q", out.String())
				}
			}
		})
	}
}

func TestMissingFileAndUsage(t *testing.T) {
	// Exit codes are the project's contract: 2 for bad input or usage.
	tests := []struct {
		args []string
		frag string
	}{
		{[]string{"check", "no-such-file.yaml"}, "cannot read no-such-file.yaml"},
		{[]string{"check"}, "exactly one plant file"},
		{[]string{"check", "a.yaml", "b.yaml"}, "exactly one plant file"},
		{[]string{"check", "--units", "metric", filepath.Join(demoDir, "htst-milk-si.yaml")}, "--units must be si or us"},
		{[]string{"check", "--bogus", filepath.Join(demoDir, "htst-milk-si.yaml")}, "unknown flag"},
		{[]string{"frobnicate"}, "unknown command"},
		{[]string{"init", "--units", "metric"}, "--units must be si or us"},
		{[]string{"check", badDir}, "../../testdata/bad: cannot read ../../testdata/bad: is a directory"},
		// A flag's value that is not a number says what is expected, in words
		// (not the parser's "strconv.ParseUint: parsing …").
		{[]string{"margins", "--seed", "abc", filepath.Join(demoDir, "htst-milk-si.yaml")},
			`invalid argument "abc" for "--seed" flag: expected a whole number, 0 or more (see 'pasval margins --help')`},
		{[]string{"margins", "--samples", "1e99", filepath.Join(demoDir, "htst-milk-si.yaml")}, `for "--samples" flag: expected a whole number`},
	}
	for _, tc := range tests {
		var out, errb bytes.Buffer
		if code := run(tc.args, &out, &errb); code != exitInput || !strings.Contains(errb.String(), tc.frag) || strings.Contains(errb.String(), "strconv") {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", tc.args, code, errb.String(), tc.frag)
		}
	}
}

func TestInitRefusesOverwrite(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "line.yaml")
	var out, errb bytes.Buffer
	if code := run([]string{"init", "-o", p}, &out, &errb); code != 0 {
		t.Fatalf("init: %d %s", code, errb.String())
	}
	before, _ := os.ReadFile(p)
	errb.Reset()
	if code := run([]string{"init", "--units", "us", "-o", p}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "--force") {
		t.Fatalf("second init: %d %q", code, errb.String())
	}
	after, _ := os.ReadFile(p)
	if !bytes.Equal(before, after) {
		t.Fatal("file changed without --force")
	}
	if code := run([]string{"init", "--units", "us", "-o", p, "--force"}, &out, &errb); code != 0 {
		t.Fatalf("init --force: %d", code)
	}
}
