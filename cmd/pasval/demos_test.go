package main

// Source of the expectations: the demo plants of testdata/demo are the
// specification; what 'init --demo' writes must be those files, byte for byte.

import (
	"bytes"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

const demoRoot = "../../testdata/demo"

// demoPlantFiles are the plant files under a folder (recorded runs and other
// files left out), by path relative to it.
func demoPlantFiles(t *testing.T, fsys fs.FS) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || !strings.HasSuffix(p, ".yaml") {
			return err
		}
		b, err := fs.ReadFile(fsys, p)
		out[p] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// TestDemoCopiesMatchTestdata keeps the embedded copy (demos/) equal to
// testdata/demo; -update copies testdata/demo over it.
func TestDemoCopiesMatchTestdata(t *testing.T) {
	want := demoPlantFiles(t, os.DirFS(demoRoot))
	sub, err := fs.Sub(demoFiles, "demos")
	if err != nil {
		t.Fatal(err)
	}
	got := demoPlantFiles(t, sub)
	if *update {
		if err := os.RemoveAll("demos"); err != nil {
			t.Fatal(err)
		}
		for p, b := range want {
			if err := os.MkdirAll(filepath.Join("demos", filepath.Dir(p)), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join("demos", p), b, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		return
	}
	for p, b := range want {
		if g, ok := got[p]; !ok {
			t.Errorf("testdata/demo/%s is not embedded (go test ./cmd/pasval/ -run Demo -update)", p)
		} else if !bytes.Equal(g, b) {
			t.Errorf("demos/%s differs from testdata/demo/%s (go test ./cmd/pasval/ -run Demo -update)", p, p)
		}
	}
	for p := range got {
		if _, ok := want[p]; !ok {
			t.Errorf("demos/%s has no testdata/demo/%s (go test ./cmd/pasval/ -run Demo -update)", p, p)
		}
	}
	// Every demo plant is in the catalogue: a file at the top, or a set's folder.
	listed := map[string]bool{}
	for _, d := range demos {
		listed[d.path] = true
	}
	var missing []string
	for p := range want {
		top := strings.Split(p, "/")[0]
		if !listed[top] {
			missing = append(missing, p)
		}
	}
	sort.Strings(missing)
	if len(missing) > 0 {
		t.Errorf("demo plants missing from the catalogue (demos.go): %v", missing)
	}
}

// TestInitDemoIsByteIdentical runs 'init --demo' for every demo, to standard
// output and to a file or folder, and compares with testdata/demo.
func TestInitDemoIsByteIdentical(t *testing.T) {
	for _, d := range demos {
		t.Run(d.name, func(t *testing.T) {
			dir := t.TempDir()
			if !d.set {
				want, err := os.ReadFile(filepath.Join(demoRoot, d.path))
				if err != nil {
					t.Fatal(err)
				}
				var out, errb bytes.Buffer
				if code := run([]string{"init", "--demo", d.name}, &out, &errb); code != 0 || !bytes.Equal(out.Bytes(), want) {
					t.Errorf("stdout: exit %d, %d bytes (want %d), stderr %q", code, out.Len(), len(want), errb.String())
				}
				target := filepath.Join(dir, "plant.yaml")
				if code := run([]string{"init", "--demo", d.name, "-o", target}, &out, &errb); code != 0 {
					t.Fatalf("-o: exit %d %s", code, errb.String())
				}
				if got, _ := os.ReadFile(target); !bytes.Equal(got, want) {
					t.Errorf("%s differs from testdata/demo/%s", target, d.path)
				}
				return
			}
			target := filepath.Join(dir, "set")
			var out, errb bytes.Buffer
			if code := run([]string{"init", "--demo", d.name, "-o", target}, &out, &errb); code != 0 {
				t.Fatalf("exit %d %s", code, errb.String())
			}
			want := demoPlantFiles(t, os.DirFS(filepath.Join(demoRoot, d.path)))
			got := demoPlantFiles(t, os.DirFS(target))
			if len(got) != len(want) || len(want) < 2 {
				t.Errorf("wrote %d files, want %d", len(got), len(want))
			}
			for p, b := range want {
				if !bytes.Equal(got[p], b) {
					t.Errorf("%s differs from testdata/demo/%s/%s", p, d.path, p)
				}
			}
			// The product files written check as they are, naming the line beside them.
			for p := range got {
				if p == "line.yaml" {
					continue
				}
				var cout, cerr bytes.Buffer
				if code := run([]string{"check", filepath.Join(target, p)}, &cout, &cerr); code == exitInput {
					t.Errorf("check %s: %s", p, cerr.String())
				}
			}
		})
	}
}

func TestInitDemoRefusals(t *testing.T) {
	dir := t.TempDir()
	single := filepath.Join(dir, "milk.yaml")
	set := filepath.Join(dir, "line3")
	var out, errb bytes.Buffer
	for _, args := range [][]string{{"init", "--demo", "htst-milk-si", "-o", single}, {"init", "--demo", "dairy-line-si", "-o", set}} {
		if code := run(args, &out, &errb); code != 0 {
			t.Fatalf("%v: %d %s", args, code, errb.String())
		}
	}
	// One file of the set edited, another removed: a second write is refused
	// whole without --force (the removed file is not written back either).
	edited := filepath.Join(set, "cream.yaml")
	if err := os.WriteFile(edited, []byte("edited\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Remove(filepath.Join(set, "whole-milk.yaml")); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		args []string
		frag string
	}{
		{[]string{"init", "--demo", "htst-milk-si", "-o", single}, "--force"},
		{[]string{"init", "--demo", "dairy-line-si", "-o", set}, "line.yaml already exists; use --force"},
		{[]string{"init", "--demo", "dairy-line-si"}, "give the folder to write them into, e.g. -o dairy-line-si"},
		{[]string{"init", "--demo", "dairy-line-si", "-o", single}, "is not a folder"},
		{[]string{"init", "--demo", "htst-milk"}, `no demo "htst-milk"; the demos are htst-milk-si, cider-us`},
		{[]string{"init", "--demo", "cider-us", "--units", "si"}, "a demo is written in its own units"},
		{[]string{"init", "--demo", "list", "-o", single}, "--demo list prints the demos"},
	}
	for _, tc := range tests {
		errb.Reset()
		if code := run(tc.args, &out, &errb); code != exitInput || !strings.Contains(errb.String(), tc.frag) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", tc.args, code, errb.String(), tc.frag)
		}
	}
	if b, _ := os.ReadFile(edited); string(b) != "edited\n" {
		t.Error("a refused write changed the set")
	}
	if _, err := os.Stat(filepath.Join(set, "whole-milk.yaml")); err == nil {
		t.Error("a refused write wrote part of the set")
	}
	// With --force the set is written again, whole.
	if code := run([]string{"init", "--demo", "dairy-line-si", "-o", set, "--force"}, &out, &errb); code != 0 {
		t.Fatalf("--force: %d %s", code, errb.String())
	}
	want, _ := os.ReadFile(filepath.Join(demoRoot, "dairy-line-si", "cream.yaml"))
	if got, _ := os.ReadFile(edited); !bytes.Equal(got, want) {
		t.Error("--force did not restore the set")
	}
	// The list names every demo.
	out.Reset()
	if code := run([]string{"init", "--demo", "list"}, &out, &errb); code != 0 {
		t.Fatal(code)
	}
	for _, d := range demos {
		if !strings.Contains(out.String(), d.name+" ") {
			t.Errorf("list lacks %s:\n%s", d.name, out.String())
		}
	}
}
