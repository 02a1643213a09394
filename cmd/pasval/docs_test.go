package main

// Source of the expected values: the project's rule that a refused write of
// a set of pages leaves the folder as it was; no outside reference applies.

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestDocsChecksEveryPageFirst(t *testing.T) {
	// One page path taken by a folder: docs --force writes no page at all,
	// neither into an empty folder nor over an existing set.
	dir := t.TempDir()
	var out, errb bytes.Buffer
	if code := run([]string{"docs", dir}, &out, &errb); code != 0 {
		t.Fatalf("docs: %d %s", code, errb.String())
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	blocked := filepath.Join(dir, "pasval-verify.1")
	for _, e := range entries {
		if err := os.WriteFile(filepath.Join(dir, e.Name()), []byte("old page"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Remove(blocked); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(blocked, 0o755); err != nil {
		t.Fatal(err)
	}
	empty := t.TempDir()
	if err := os.Mkdir(filepath.Join(empty, "pasval-verify.1"), 0o755); err != nil {
		t.Fatal(err)
	}
	for _, d := range []string{dir, empty} {
		errb.Reset()
		code := run([]string{"docs", d, "--force"}, &out, &errb)
		want := filepath.Join(d, "pasval-verify.1") + " is a folder, not a regular file"
		if code != exitInput || !strings.Contains(errb.String(), want) {
			t.Errorf("docs --force %s: exit %d %q; want 2 and %q", d, code, errb.String(), want)
		}
	}
	after, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(after) != len(entries) {
		t.Errorf("%d entries after the refusal, %d before", len(after), len(entries))
	}
	for _, e := range after {
		if e.IsDir() {
			continue
		}
		if b, err := os.ReadFile(filepath.Join(dir, e.Name())); err != nil || string(b) != "old page" {
			t.Errorf("%s rewritten despite the refusal (%v)", e.Name(), err)
		}
	}
	if got, err := os.ReadDir(empty); err != nil || len(got) != 1 {
		t.Errorf("empty folder now holds %v (%v)", got, err)
	}
}
