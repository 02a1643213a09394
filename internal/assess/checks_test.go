package assess

// Source of the expectations: the check definitions (checks.go) and the
// tolerance rule written there; the README's list of checks is generated
// from the registry.

import (
	"flag"
	"go/ast"
	"go/parser"
	"go/token"
	"math"
	"os"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the README's generated list of checks")

// constantsOf lists the names of the constants of a type declared in a file.
func constantsOf(t *testing.T, file, typ string) []string {
	t.Helper()
	f, err := parser.ParseFile(token.NewFileSet(), file, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, d := range f.Decls {
		g, ok := d.(*ast.GenDecl)
		if !ok || g.Tok != token.CONST {
			continue
		}
		for _, s := range g.Specs {
			v := s.(*ast.ValueSpec)
			if id, ok := v.Type.(*ast.Ident); ok && id.Name == typ {
				for _, n := range v.Names {
					names = append(names, n.Name)
				}
			}
		}
	}
	return names
}

func TestEveryCheckIDIsRegistered(t *testing.T) {
	// Every CheckID constant in checks.go has a definition, and the registry
	// holds no other: a check added as a constant only fails here.
	names := constantsOf(t, "checks.go", "CheckID")
	if len(names) != len(checkDefs) {
		t.Errorf("%d CheckID constants, %d definitions", len(names), len(checkDefs))
	}
	for _, d := range CheckDefs() {
		c := NewCheck(d.ID, 10, 10)
		if !c.Pass || c.Margin != 0 || c.Unit == "" || c.MarginUnit == "" || d.PassesWhen == "" {
			t.Errorf("%s: %+v", d.ID, c)
		}
	}
	codes := constantsOf(t, "warnings.go", "WarningCode")
	if len(codes) != len(WarningCodes) {
		t.Errorf("%d WarningCode constants, %d in WarningCodes", len(codes), len(WarningCodes))
	}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), panicPrefix) {
			t.Errorf("an unknown check id: %v", r)
		}
	}()
	DefOf("no-such-check")
}

func TestCheckTolerance(t *testing.T) {
	// The one rule: pass ⇔ margin ≥ −1e-9·|required| (checks.go), for both limits.
	for _, c := range []struct {
		name             string
		id               CheckID
		required, actual float64
		pass             bool
		margin           float64
	}{
		{"at least, above", HoldingTime, 15, 16.34, true, 1.34},
		{"at least, exactly", HoldingTime, 15, 15, true, 0},
		{"at least, rounding below", HoldingTime, 15, 15 * (1 - 1e-12), true, -15e-12},
		{"at least, short", HoldingTime, 15, 14.999, false, -0.001},
		{"at most, below", CoolingOutlet, 4, 3.46, true, 0.54},
		{"at most, rounding above", CoolingOutlet, 4, 4 + 1e-12, true, -1e-12},
		{"at most, above", CoolingOutlet, 4, 4.01, false, -0.01},
		{"zero required", LogReduction, 0, 0, true, 0},
	} {
		got := NewCheck(c.id, c.required, c.actual)
		if got.Pass != c.pass || math.Abs(got.Margin-c.margin) > 1e-9 {
			t.Errorf("%s: pass %v margin %g, want %v %g", c.name, got.Pass, got.Margin, c.pass, c.margin)
		}
	}
}

func TestHoldingChecksComeFromTheRegistry(t *testing.T) {
	var holding []CheckID
	for _, d := range CheckDefs() {
		if d.Holding {
			holding = append(holding, d.ID)
		}
	}
	// The measured holding time converted to the product judges the tube too.
	if len(holding) != 4 || holding[0] != TubeSlope || holding[1] != HoldingTime || holding[2] != LogReduction || holding[3] != AcceptanceHoldingTime {
		t.Errorf("holding checks %v", holding)
	}
}

func TestReadmeChecksTable(t *testing.T) {
	path := "../../README.md"
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s := string(data)
	i, j := strings.Index(s, ChecksBegin), strings.Index(s, ChecksEnd)
	if i < 0 || j < i {
		t.Fatalf("README lacks the markers %q … %q", ChecksBegin, ChecksEnd)
	}
	want := s[:i+len(ChecksBegin)] + "\n" + ChecksTable() + s[j:]
	if want == s {
		return
	}
	if *update {
		if err := os.WriteFile(path, []byte(want), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	t.Error("the README's list of checks differs from the registry (go test ./internal/assess/ -update)")
}
