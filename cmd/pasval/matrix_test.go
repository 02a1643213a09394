package main

// Sources of the expected values: the matrix's specification
// (docs/METHOD.md §16) and the tool's own commands on the same files — the
// highest seal flow of a tube-limited product is the max flow 'hold' prints
// for its legal row, each product's verdict is what 'check' gives it — and
// the demo set's invented numbers; the refusals are the project's own
// contract (exit 2, file, line and field).

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

const lineDemo = "../../testdata/demo/dairy-line-si"

func lineDemoFile(name string) string { return filepath.Join(lineDemo, name+".yaml") }

type matrixJSONOut struct {
	LineFile struct {
		File   string `json:"file"`
		SHA256 string `json:"sha256"`
	} `json:"line_file"`
	Products []struct {
		File           string            `json:"file"`
		Name           string            `json:"name"`
		Pass           bool              `json:"pass"`
		LimitingCheck  string            `json:"limiting_check"`
		Checks         []json.RawMessage `json:"checks"`
		MaxSealFlowM3s *float64          `json:"max_seal_flow_m3_s"`
		MinSetpointC   *float64          `json:"min_setpoint_C"`
		JudgedC        *float64          `json:"judged_temperature_C"`
		LimitedBy      []struct {
			ID string `json:"id"`
		} `json:"max_seal_flow_limited_by"`
	} `json:"products"`
	Pass    bool   `json:"pass"`
	Caution string `json:"caution"`
}

func TestMatrixOfTheDemoLine(t *testing.T) {
	args := []string{"matrix", "--json", lineDemoFile("line"), lineDemoFile("whole-milk"), lineDemoFile("chocolate-milk"), lineDemoFile("cream")}
	out, errs, code := runBinary(t, args...)
	if code != 1 {
		t.Fatalf("exit %d, want 1 (cream fails); stderr %s", code, errs)
	}
	var m matrixJSONOut
	if err := json.Unmarshal([]byte(out), &m); err != nil {
		t.Fatal(err)
	}
	if len(m.Products) != 3 || m.Pass || !strings.Contains(m.Caution, "never replaces") || len(m.LineFile.SHA256) != 64 {
		t.Fatalf("matrix %+v", m)
	}
	want := []struct {
		name, limiting, limitedBy string
		pass, minSetpoint         bool
	}{
		{"whole milk 3.5 %", "holding-time", "holding-time", true, true},
		{"chocolate milk 1 %", "heating-medium", "heating-medium", true, true},
		{"whipping cream 36 %", "pressure-drop", "pressure-drop", false, false},
	}
	for i, w := range want {
		p := m.Products[i]
		if p.Name != w.name || p.Pass != w.pass || p.LimitingCheck != w.limiting || len(p.Checks) != 7 || p.MaxSealFlowM3s == nil ||
			len(p.LimitedBy) != 1 || p.LimitedBy[0].ID != w.limitedBy || (p.MinSetpointC != nil) != w.minSetpoint || p.JudgedC == nil {
			t.Errorf("product %d: %+v, want %+v", i, p, w)
		}
		// Each product's verdict is check's.
		_, _, code := runBinary(t, "check", p.File)
		if (code == 0) != w.pass {
			t.Errorf("check %s: exit %d, matrix says pass %v", p.File, code, w.pass)
		}
	}
	// Whole milk is tube-limited: its highest seal flow is the max flow hold
	// prints for the judged legal row, to 1e-6.
	hout, _, _ := runBinary(t, "hold", "--json", lineDemoFile("whole-milk"))
	var h struct {
		HoldingTube struct {
			Legal struct {
				RowIndex int `json:"row_index"`
			} `json:"legal"`
			Rows []struct {
				MaxFlow float64 `json:"max_flow_m3_s"`
			} `json:"rows"`
		} `json:"holding_tube"`
	}
	if err := json.Unmarshal([]byte(hout), &h); err != nil {
		t.Fatal(err)
	}
	rowMax := h.HoldingTube.Rows[h.HoldingTube.Legal.RowIndex].MaxFlow
	if got := *m.Products[0].MaxSealFlowM3s; math.Abs(got-rowMax) > 1e-6*rowMax {
		t.Errorf("highest seal flow %.9g m³/s, hold's max flow %.9g", got, rowMax)
	}
	// Without cream every product passes: exit 0, and the text names the result.
	text, errs, code := runBinary(t, "matrix", lineDemoFile("line"), lineDemoFile("whole-milk"), lineDemoFile("chocolate-milk"))
	if code != 0 || !strings.Contains(text, "Result: PASS, all 2 products pass") || !strings.Contains(text, "Caution:") {
		t.Errorf("two products: exit %d\n%s%s", code, text, errs)
	}
}

func TestMatrixRefusals(t *testing.T) {
	dir := t.TempDir()
	other := filepath.Join(dir, "other")
	if err := os.Mkdir(other, 0o755); err != nil {
		t.Fatal(err)
	}
	lineData, _ := os.ReadFile(lineDemoFile("line"))
	writeFile(t, filepath.Join(other, "line.yaml"), string(lineData))
	milk, _ := os.ReadFile(lineDemoFile("whole-milk"))
	writeFile(t, filepath.Join(other, "milk.yaml"), string(milk)) // names other/line.yaml
	alone := filepath.Join(dir, "alone.yaml")
	htst, _ := os.ReadFile(filepath.Join(demoDir, "htst-milk-si.yaml"))
	writeFile(t, alone, string(htst))
	tests := []struct {
		name string
		args []string
		frag string
	}{
		{"no product", []string{"matrix", lineDemoFile("line")}, "at least one product file"},
		{"another line", []string{"matrix", lineDemoFile("line"), filepath.Join(other, "milk.yaml")},
			"milk.yaml:4:12: line_file: names the line file " + filepath.Join(other, "line.yaml") + ", not " + lineDemoFile("line")},
		{"no line_file", []string{"matrix", lineDemoFile("line"), alone}, "alone.yaml:1:1: line_file: missing; matrix judges the products of"},
		{"a product as the line", []string{"matrix", lineDemoFile("cream"), lineDemoFile("whole-milk")}, "it is a product file"},
		{"the line as a product", []string{"matrix", lineDemoFile("line"), lineDemoFile("line")}, "reads as a line file"},
		{"bad units", []string{"matrix", "--units", "metric", lineDemoFile("line"), lineDemoFile("cream")}, "--units must be si or us"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out, errs, code := runBinary(t, tc.args...)
			if code != 2 || !strings.Contains(errs, tc.frag) || out != "" {
				t.Errorf("exit %d, stdout %q, stderr %q; want 2 and %q", code, out, errs, tc.frag)
			}
		})
	}
}

func TestMatrixRecordVerifies(t *testing.T) {
	// The matrix record carries the line file and every product file, each
	// hashed; verify re-renders it from them and finds an edited input.
	dir := t.TempDir()
	for _, f := range []string{"line", "whole-milk", "cream"} {
		b, _ := os.ReadFile(lineDemoFile(f))
		writeFile(t, filepath.Join(dir, f+".yaml"), string(b))
	}
	rec := filepath.Join(dir, "matrix.pdf")
	in := func(n string) string { return filepath.Join(dir, n+".yaml") }
	_, errs, code := runBinary(t, "matrix", in("line"), in("whole-milk"), in("cream"), "--record", rec, "--date", "2026-12-01")
	if code != 1 || !strings.Contains(errs, "line file sha256") {
		t.Fatalf("matrix --record: exit %d %s", code, errs)
	}
	out, _, code := runBinary(t, "verify", rec, in("line"), in("whole-milk"), in("cream"))
	if code != 0 || strings.Count(out, "matches") != 6 || !strings.Contains(out, "identical, byte for byte") || !strings.Contains(out, "(2 products)") {
		t.Errorf("verify: exit %d\n%s", code, out)
	}
	// The files in any order: each is matched to the attachment with its
	// content, and named by the product it is.
	out, _, code = runBinary(t, "verify", rec, in("cream"), in("line"), in("whole-milk"))
	if code != 0 || strings.Count(out, "matches") != 6 || !strings.Contains(out, "\nMATCH\n") {
		t.Errorf("verify, files in another order: exit %d\n%s", code, out)
	}
	// The paths given are long (a temporary folder): the hashes still line
	// up in one column.
	hash := regexp.MustCompile(`[0-9a-f]{64}`)
	for _, l := range strings.Split(out, "\n") {
		if loc := hash.FindStringIndex(l); loc != nil && loc[0] != 28 {
			t.Errorf("a hash at column %d, not 28: %q", loc[0], l)
		}
	}
	for _, want := range []string{"whole milk 3.5 % (whole-milk.yaml)", "whipping cream 36 % (cream.yaml)",
		"re-rendered from its line and product files"} {
		if !strings.Contains(out, want) {
			t.Errorf("verify does not say %q:\n%s", want, out)
		}
	}
	// An input edited after the record: its hash differs, exit 1; the file
	// given is at fault, not the record.
	b, _ := os.ReadFile(in("cream"))
	writeFile(t, in("cream"), string(b)+"# edited\n")
	if out, _, code := runBinary(t, "verify", rec, in("line"), in("whole-milk"), in("cream")); code != 1 ||
		!strings.Contains(out, "DIFFERS: this file is not one the record carries") || strings.Contains(out, "not what its") {
		t.Errorf("edited input: exit %d\n%s", code, out)
	}
	// More files than the record carries: a usage error.
	if _, errs, code := runBinary(t, "verify", rec, in("line"), in("whole-milk"), in("cream"), in("cream")); code != 2 || !strings.Contains(errs, "carries 3 input files") {
		t.Errorf("too many files: exit %d %s", code, errs)
	}
}

func TestRecordOfAProductOnALine(t *testing.T) {
	// report on a product file attaches it and its line file, each with its
	// hash; verify checks both and the re-render.
	dir := t.TempDir()
	for _, f := range []string{"line", "whole-milk"} {
		b, _ := os.ReadFile(lineDemoFile(f))
		writeFile(t, filepath.Join(dir, f+".yaml"), string(b))
	}
	rec := filepath.Join(dir, "milk.pdf")
	prod, line := filepath.Join(dir, "whole-milk.yaml"), filepath.Join(dir, "line.yaml")
	wrote, errs, code := runBinary(t, "report", prod, "-o", rec, "--date", "2026-12-01")
	if code != 0 || !strings.Contains(wrote, ", line file sha256 ") {
		t.Fatalf("report: %d %s%s", code, wrote, errs)
	}
	out, _, code := runBinary(t, "verify", rec, prod, line)
	if code != 0 || !strings.Contains(out, "attached line-file sha256") || strings.Count(out, "matches") != 4 {
		t.Errorf("verify: exit %d\n%s", code, out)
	}
	// The files are matched by content: the line file alone, or both in the
	// other order, match; a plant file the record does not carry differs.
	if out, _, code := runBinary(t, "verify", rec, line, prod); code != 0 || strings.Count(out, "matches") != 4 {
		t.Errorf("swapped files: exit %d\n%s", code, out)
	}
	if out, _, code := runBinary(t, "verify", rec, filepath.Join(demoDir, "htst-milk-si.yaml")); code != 1 ||
		!strings.Contains(out, "DIFFERS: this file is not one the record carries") {
		t.Errorf("another plant file: exit %d\n%s", code, out)
	}
	// A record refuses to overwrite the line file.
	if _, errs, code := runBinary(t, "report", prod, "-o", line, "--force"); code != 2 || !strings.Contains(errs, "would overwrite the line file") {
		t.Errorf("record over the line file: exit %d %s", code, errs)
	}
	if b, _ := os.ReadFile(line); !bytes.Contains(b, []byte("legal_tables")) {
		t.Error("the line file was overwritten")
	}
}

func TestMatrixWarnsOfProductBlocksInTheLineFile(t *testing.T) {
	// A line file that gives organisms (a product's block): the cream left
	// without its own inherits the line's whole, which matrix warns of,
	// naming the block and the product file; the whole milk gives its own.
	dir := t.TempDir()
	for _, f := range []string{"line", "whole-milk", "cream"} {
		b, _ := os.ReadFile(lineDemoFile(f))
		text := string(b)
		switch f {
		case "line":
			text += "organisms:\n  - {name: Listeria monocytogenes, D: 0.9 s, D_temperature: 71.7 °C, z: 6.3 °C, required_log_reduction: 5}\n"
		case "cream":
			i, j := strings.Index(text, "organisms:"), strings.Index(text, "legal_table:")
			text = text[:i] + text[j:]
		}
		writeFile(t, filepath.Join(dir, f+".yaml"), text)
	}
	in := func(n string) string { return filepath.Join(dir, n+".yaml") }
	out, _, _ := runBinary(t, "matrix", in("line"), in("whole-milk"), in("cream"))
	flat := strings.Join(strings.Fields(out), " ")
	if !strings.Contains(flat, "line.yaml gives organisms, a block of a product") || !strings.Contains(flat, "(1 of the products here do)") ||
		!strings.Contains(flat, "cream.yaml takes organisms") || strings.Contains(flat, "whole-milk.yaml takes") {
		t.Errorf("matrix:\n%s", out)
	}
	js, _, _ := runBinary(t, "matrix", in("line"), in("whole-milk"), in("cream"), "--json")
	var r struct {
		LineWarnings []struct{ Code, Field, Message string } `json:"line_warnings"`
	}
	if err := json.Unmarshal([]byte(js), &r); err != nil {
		t.Fatal(err)
	}
	if len(r.LineWarnings) != 1 || r.LineWarnings[0].Code != "line-file-gives-product-block" || !strings.Contains(r.LineWarnings[0].Message, "gives organisms") {
		t.Errorf("JSON line warnings %+v", r.LineWarnings)
	}
	// The demo line gives none.
	out, _, _ = runBinary(t, "matrix", lineDemoFile("line"), lineDemoFile("whole-milk"))
	if strings.Contains(out, "a block of a product") {
		t.Errorf("the demo line:\n%s", out)
	}
}
