package main

// Source of the expected values: the project's file-writing rules (any name
// the file system accepts, regular files only); the 255-byte limit is
// NAME_MAX of Linux file systems (from memory).

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestOutputFileRules(t *testing.T) {
	// The file rules seen from the command line: the longest name a file
	// system accepts (255 bytes, NAME_MAX of Linux file systems, from memory)
	// is written; a named pipe is refused even with --force and stays a pipe.
	dir := t.TempDir()
	long := filepath.Join(dir, strings.Repeat("s", 250)+".yaml")
	if _, errs, code := runBinary(t, "init", "-o", long); code != 0 {
		t.Errorf("init -o a 255-byte name: exit %d %q", code, errs)
	}
	fifo, ok := makeFIFO(t, dir)
	if !ok {
		return
	}
	for _, args := range [][]string{{"init", "-o", fifo}, {"init", "-o", fifo, "--force"}} {
		_, errs, code := runBinaryGuarded(t, args...)
		if want := fifo + " is a named pipe, not a regular file"; code != exitInput || !strings.Contains(errs, want) {
			t.Errorf("%v: exit %d %q; want 2 and %q", args, code, errs, want)
		}
	}
	if st, err := os.Lstat(fifo); err != nil || st.Mode()&os.ModeNamedPipe == 0 {
		t.Errorf("the named pipe was replaced: %v %v", st, err)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".") {
			t.Errorf("temporary left: %s", e.Name())
		}
	}
}
