package fileout

// Source of the expected values: the project's file-writing rules (atomic
// rename, no overwrite without --force); no outside reference applies.

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func TestWrite(t *testing.T) {
	// Behaviour specified by the project: no overwrite without force, no temp files left.
	dir := t.TempDir()
	p := filepath.Join(dir, "out.yaml")
	if err := Write(p, []byte("a"), false); err != nil {
		t.Fatal(err)
	}
	if err := Write(p, []byte("b"), false); !errors.Is(err, ErrExists) {
		t.Fatalf("overwrite without force: %v", err)
	}
	if b, _ := os.ReadFile(p); string(b) != "a" {
		t.Fatalf("content changed to %q", b)
	}
	if err := Write(p, []byte("c"), true); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(p); string(b) != "c" {
		t.Fatalf("content %q after force", b)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("left behind: %v", entries)
	}
	if err := Write(filepath.Join(dir, "missing", "x"), []byte("a"), false); err == nil {
		t.Fatal("write into a missing folder succeeded")
	}
}
