package regen

// Source of the expectations: the section kinds as the JSON contract names
// them (README, "What it prints").

import (
	"go/ast"
	"go/parser"
	"go/token"
	"strings"
	"testing"
)

func TestEverySectionKind(t *testing.T) {
	// Every SectionKind constant is in SectionKinds and has its name; the zero
	// kind panics with the package prefix.
	f, err := parser.ParseFile(token.NewFileSet(), "sections.go", nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	// An iota group: the first spec names the type, the others follow it.
	for _, d := range f.Decls {
		g, ok := d.(*ast.GenDecl)
		if !ok || g.Tok != token.CONST || len(g.Specs) == 0 {
			continue
		}
		if id, ok := g.Specs[0].(*ast.ValueSpec).Type.(*ast.Ident); ok && id.Name == "SectionKind" {
			for _, s := range g.Specs {
				n += len(s.(*ast.ValueSpec).Names)
			}
		}
	}
	if n != len(SectionKinds) {
		t.Errorf("%d SectionKind constants, %d in SectionKinds", n, len(SectionKinds))
	}
	want := []string{"regeneration", "heating", "cooling"}
	for i, k := range SectionKinds {
		if k.String() != want[i] {
			t.Errorf("%d: %q", i, k)
		}
	}
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), panicPrefix) {
			t.Errorf("zero kind: %v", r)
		}
	}()
	_ = SectionKind(0).String()
}
