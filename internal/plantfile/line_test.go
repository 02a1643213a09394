package plantfile

// Source of the expectations: the project's specification of product files
// on a shared line (docs/METHOD.md §16.1 and §16.2): a block given in the
// product file replaces the line's whole, every error names the file and
// line where the value was written, chains and cycles are refused, and the
// legal rows are given one way.

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/inputerr"
)

// lineFile is an invented line: regeneration and heating sized, a holding
// tube with its rise and heat loss, and legal rows by class.
const lineFile = `record:
  site: Test dairy
  line: line 3
regeneration:
  ratio: 0.9
  plate_area: 0.35 m2
  u_value: 3300 W/(m2*K)
heating:
  medium: water
  medium_inlet: 80 °C
  medium_rate: 20000 L/h
  plate_area: 0.35 m2
  u_value: 3800 W/(m2*K)
holding_tube:
  sanitary_tube: 2 in
  length: 34 m
  rise: 0.8 m
  ambient: 20 °C
  outer_coefficient: 12 W/(m2*K)
legal_tables:
  milk:
    - {temperature: 72 °C, time: 15 s}
    - {temperature: 89 °C, time: 1 s}
  high-fat:
    - {temperature: 75 °C, time: 15 s}
`

// productFile names the line and gives its own holding_tube (no rise, no
// heat loss): the line's holding tube is replaced whole.
const productFile = `line_file: line.yaml
product:
  name: test cream
  density: 1000 kg/m3
  specific_heat: 3.8 kJ/(kg*K)
  viscosity:
    - {at: 75 °C, value: 2 mPa*s}
flow:
  rate: 9000 L/h
  max_rate: 10000 L/h
process:
  raw_inlet: 5 °C
  hold_setpoint: 76 °C
holding_tube:
  sanitary_tube: 2.5 in
  length: 30 m
legal_table: high-fat
`

// files is an in-memory folder for ParseWith.
type files map[string]string

func (f files) read(path string) ([]byte, error) {
	s, ok := f[filepath.ToSlash(path)]
	if !ok {
		return nil, fs.ErrNotExist
	}
	return []byte(s), nil
}

func (f files) load(t *testing.T, name string) (*Plant, error) {
	t.Helper()
	p, err := ParseWith(name, []byte(f[name]), f.read)
	if err != nil {
		return nil, err
	}
	return p, Validate(p)
}

// firstError is the first entry of an inputerr.List (nil otherwise).
func firstError(err error) *inputerr.Error {
	var l inputerr.List
	if errors.As(err, &l) && len(l) > 0 {
		return l[0]
	}
	return nil
}

func TestLineMergeReplacesBlocksWhole(t *testing.T) {
	f := files{"plant/line.yaml": lineFile, "plant/cream.yaml": productFile}
	p, err := f.load(t, "plant/cream.yaml")
	if err != nil {
		t.Fatal(err)
	}
	// The product's holding_tube replaces the line's whole: its own size and
	// length, and nothing of the line's (rise, heat loss) survives.
	h := p.HoldingTube
	if h == nil || !h.SanitaryTube.Set || h.Length.Text != "30 m" || h.Rise.Set || h.Ambient.Set || h.OuterCoefficient.Set {
		t.Errorf("holding tube not the product's own: %+v", h)
	}
	if h.Pos.File != "plant/cream.yaml" {
		t.Errorf("holding tube read from %s", h.Pos.File)
	}
	// Blocks the product does not give come from the line, positioned there.
	if p.Heating == nil || p.Heating.MediumInlet.Text != "80 °C" || p.Heating.MediumInlet.Pos != (inputerr.Pos{File: "plant/line.yaml", Line: 10, Column: 17}) {
		t.Errorf("heating from the line: %+v", p.Heating)
	}
	if p.Regeneration == nil || p.RecordValue("line") != "line 3" {
		t.Errorf("regeneration or record not from the line")
	}
	// legal_table picks the high-fat class.
	if len(p.LegalMinimums) != 1 || p.LegalMinimums[0].Temperature.Text != "75 °C" || p.LegalMinimums[0].Field != "legal_tables.high-fat[0]" {
		t.Errorf("legal rows %+v", p.LegalMinimums)
	}
	// Both files are carried with their hashes.
	src := p.Sources()
	if len(src) != 2 || src[0].File != "plant/cream.yaml" || src[1].File != "plant/line.yaml" || p.LineFile != "line.yaml" {
		t.Fatalf("sources %+v", src)
	}
	for _, s := range src {
		sum := sha256.Sum256([]byte(f[s.File]))
		if s.SHA256 != hex.EncodeToString(sum[:]) || string(s.Source) != f[s.File] {
			t.Errorf("%s: hash or bytes not the file's", s.File)
		}
	}
	// Each entered value names the file it was written in.
	for _, in := range p.Inputs {
		want := "plant/cream.yaml"
		if strings.HasPrefix(in.Field, "heating") || strings.HasPrefix(in.Field, "regeneration") || strings.HasPrefix(in.Field, "legal_tables") {
			want = "plant/line.yaml"
		}
		if in.Pos.File != want {
			t.Errorf("input %s from %s, want %s", in.Field, in.Pos.File, want)
		}
	}
}

func TestLineErrorsPointIntoTheRightFile(t *testing.T) {
	badLine := strings.Replace(lineFile, "medium_rate: 20000 L/h", "medium_rate: 20000 L", 1)
	badProduct := strings.Replace(productFile, "raw_inlet: 5 °C", "raw_inlet: 5", 1)
	crossLine := strings.Replace(lineFile, "medium_inlet: 80 °C", "medium_inlet: 70 °C", 1) // below the product's 76 °C setpoint
	tests := []struct {
		name         string
		line, prod   string
		file, field  string
		lineNo, col  int
		frag         string
		wantNoOthers bool
	}{
		{"unit in the line", badLine, productFile, "line.yaml", "heating.medium_rate", 11, 16, "not a volumetric flow", false},
		{"unit in the product", lineFile, badProduct, "cream.yaml", "process.raw_inlet", 12, 14, "has no unit", false},
		{"cross-field rule on a line value", crossLine, productFile, "line.yaml", "heating.medium_inlet", 10, 17, "temperature cross", false},
		{"typo in the line", strings.Replace(lineFile, "  rise: 0.8 m", "  rize: 0.8 m", 1),
			strings.Replace(productFile, "holding_tube:\n  sanitary_tube: 2.5 in\n  length: 30 m\n", "", 1),
			"line.yaml", "holding_tube.rize", 17, 3, `did you mean "rise"`, false},
		{"required block nowhere", lineFile, strings.Replace(productFile, "process:\n  raw_inlet: 5 °C\n  hold_setpoint: 76 °C\n", "", 1),
			"cream.yaml", "process", 1, 1, "neither this file nor its line file line.yaml gives it", false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := files{"line.yaml": tc.line, "cream.yaml": tc.prod}.load(t, "cream.yaml")
			e := firstError(err)
			if e == nil {
				t.Fatalf("accepted (err %v)", err)
			}
			if e.Pos != (inputerr.Pos{File: tc.file, Line: tc.lineNo, Column: tc.col}) || e.Field != tc.field || !strings.Contains(e.Msg, tc.frag) {
				t.Errorf("got %v; want %s:%d:%d %s …%s…", e, tc.file, tc.lineNo, tc.col, tc.field, tc.frag)
			}
		})
	}
}

func TestLineChainsAndCyclesRefused(t *testing.T) {
	withLine := func(src, name string) string { return "line_file: " + name + "\n" + src }
	tests := []struct {
		name  string
		f     files
		first inputerr.Pos
		frag  string
	}{
		{"a names itself", files{"a.yaml": withLine(productFile[len("line_file: line.yaml\n"):], "a.yaml")},
			inputerr.Pos{File: "a.yaml", Line: 1, Column: 12}, "names this file itself (a cycle)"},
		{"a and b name each other", files{"a.yaml": withLine(productFile[len("line_file: line.yaml\n"):], "b.yaml"), "b.yaml": withLine(lineFile, "a.yaml")},
			inputerr.Pos{File: "b.yaml", Line: 1, Column: 1}, "a cycle: a.yaml names b.yaml as its line file, which names a.yaml back"},
		{"a chain of three", files{"a.yaml": withLine(productFile[len("line_file: line.yaml\n"):], "sub/b.yaml"), "sub/b.yaml": withLine(lineFile, "c.yaml"), "sub/c.yaml": lineFile},
			inputerr.Pos{File: "sub/b.yaml", Line: 1, Column: 1}, "a chain: sub/b.yaml is the line file of a.yaml and names another line file, sub/c.yaml"},
		{"missing line file", files{"a.yaml": withLine(productFile[len("line_file: line.yaml\n"):], "nowhere.yaml")},
			inputerr.Pos{File: "a.yaml", Line: 1, Column: 12}, "cannot read the line file nowhere.yaml: file does not exist"},
		{"empty line file", files{"a.yaml": productFile, "line.yaml": "\n"},
			inputerr.Pos{File: "line.yaml", Line: 1, Column: 1}, "the line file is empty"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := tc.f.load(t, "a.yaml")
			e := firstError(err)
			if e == nil {
				t.Fatalf("accepted (err %v)", err)
			}
			if e.Pos != tc.first || !strings.Contains(e.Msg, tc.frag) {
				t.Errorf("got %v; want %v …%s…", e, tc.first, tc.frag)
			}
		})
	}
	// Parse has no files to read: a line file is refused, with a position.
	if _, err := Parse("cream.yaml", []byte(productFile)); firstError(err) == nil || firstError(err).Field != "line_file" {
		t.Errorf("Parse with line_file: %v", err)
	}
}

func TestLineFileAlone(t *testing.T) {
	// check refuses a line file: it reads as one, and says what to run.
	_, err := files{"line.yaml": lineFile}.load(t, "line.yaml")
	if e := firstError(err); e == nil || e.Field != "product" || !strings.Contains(e.Msg, "reads as a line file") ||
		!strings.Contains(e.Msg, "pasval matrix line.yaml PRODUCT.yaml") {
		t.Errorf("line alone: %v", err)
	}
	if l := err.(inputerr.List); len(l) != 1 {
		t.Errorf("%d errors, want the one: %v", len(l), err)
	}
	// matrix reads it on its own.
	dir := t.TempDir()
	path := filepath.Join(dir, "line.yaml")
	writeFile(t, path, lineFile)
	p, err := LoadLine(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.LegalTables) != 2 || p.LegalTables[1].Name != "high-fat" || p.Heating == nil {
		t.Errorf("line %+v", p)
	}
	// A product file is not a line.
	prod := filepath.Join(dir, "cream.yaml")
	writeFile(t, prod, productFile)
	if _, err := LoadLine(prod); firstError(err) == nil || !strings.Contains(firstError(err).Msg, "it is a product file") {
		t.Errorf("LoadLine of a product file: %v", err)
	}
	// Load reads the line from disk.
	q, err := Load(prod)
	if err != nil || q.Line == nil || q.Line.File != path {
		t.Fatalf("Load: %v %+v", err, q)
	}
}

func TestLegalTableChoice(t *testing.T) {
	noPick := strings.Replace(productFile, "legal_table: high-fat\n", "", 1)
	tests := []struct {
		name   string
		line   string
		prod   string
		file   string
		lineNo int
		field  string
		frag   string
	}{
		{"unknown class with a suggestion", lineFile, strings.Replace(productFile, "legal_table: high-fat", "legal_table: highfat", 1),
			"cream.yaml", 17, "legal_table", `no class "highfat" in legal_tables (at line.yaml:20:1) (did you mean "high-fat"?); the classes are milk, high-fat`},
		{"no pick", lineFile, noPick, "cream.yaml", 1, "legal_table", "pick this product's with legal_table: NAME, one of milk, high-fat"},
		{"pick and legal_minimums", lineFile, productFile + "legal_minimums:\n  - {temperature: 72 °C, time: 15 s}\n",
			"cream.yaml", 17, "legal_table", "give legal_table or legal_minimums, not both (legal_minimums at cream.yaml:18:1)"},
		{"pick without tables", strings.Split(lineFile, "legal_tables:")[0], productFile, "cream.yaml", 17, "legal_table",
			`"high-fat" names a class of legal_tables, but neither this file nor its line file line.yaml gives legal_tables`},
		{"tables and legal_minimums", lineFile, noPick + "legal_minimums:\n  - {temperature: 72 °C, time: 15 s}\n",
			"cream.yaml", 17, "legal_minimums", "not both: legal_minimums at cream.yaml:17:1, legal_tables at line.yaml:20:1"},
		{"bad class name", strings.Replace(lineFile, "  high-fat:", "  high fat:", 1), noPick, "line.yaml", 24, "legal_tables.high fat", "letters, digits, - and _"},
		{"bad row in an unpicked class", strings.Replace(lineFile, "time: 1 s", "time: 0 s", 1), productFile, "line.yaml", 23, "legal_tables.milk[1].time", "greater than zero"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := files{"line.yaml": tc.line, "cream.yaml": tc.prod}.load(t, "cream.yaml")
			e := firstError(err)
			if e == nil {
				t.Fatalf("accepted (err %v)", err)
			}
			if e.Pos.File != tc.file || e.Pos.Line != tc.lineNo || e.Field != tc.field || !strings.Contains(e.Msg, tc.frag) {
				t.Errorf("got %v; want %s:%d %s …%s…", e, tc.file, tc.lineNo, tc.field, tc.frag)
			}
		})
	}
	// A plant file without a line may hold legal_tables and pick from them.
	own := strings.Replace(productFile, "line_file: line.yaml\n", "", 1) + "legal_tables:\n  own:\n    - {temperature: 75 °C, time: 20 s}\n"
	own = strings.Replace(own, "legal_table: high-fat", "legal_table: own", 1)
	p, err := Parse("own.yaml", []byte(own))
	if err == nil {
		err = Validate(p)
	}
	if err != nil || len(p.LegalMinimums) != 1 || p.LegalMinimums[0].Time.Text != "20 s" {
		t.Errorf("own tables: %v %+v", err, p)
	}
}

func writeFile(t *testing.T, path, content string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
}
