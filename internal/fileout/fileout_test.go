package fileout

// Source of the expected values: the project's file-writing rules (atomic
// rename, no overwrite without --force, regular files only, the umask
// honoured, no temporary left behind); no outside reference applies. The
// 255-byte name limit is NAME_MAX of Linux file systems (ext4, tmpfs), from
// memory.

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
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

func TestWriteLongName(t *testing.T) {
	// Any name the file system accepts must work, the longest included: the
	// temporary name must not be longer than the target's.
	for _, n := range []int{244, 255} { // 255: NAME_MAX (from memory)
		dir := t.TempDir()
		p := filepath.Join(dir, strings.Repeat("r", n-4)+".pdf")
		if err := Write(p, []byte("record"), false); err != nil {
			t.Errorf("%d-byte name: %v", n, err)
			continue
		}
		if err := Write(p, []byte("again"), true); err != nil {
			t.Errorf("%d-byte name with force: %v", n, err)
		}
		if b, err := os.ReadFile(p); err != nil || string(b) != "again" {
			t.Errorf("%d-byte name: read back %q, %v", n, b, err)
		}
		assertOnly(t, dir, filepath.Base(p))
	}
}

func TestWriteRefusesWhatIsNotARegularFile(t *testing.T) {
	// A folder, a symbolic link (even to a regular file) and, where the system
	// makes them, a named pipe and a device are never replaced, with or without
	// force, and each refusal says what the path is.
	for _, force := range []bool{false, true} {
		dir := t.TempDir()
		folder := filepath.Join(dir, "folder.pdf")
		if err := os.Mkdir(folder, 0o755); err != nil {
			t.Fatal(err)
		}
		regular := filepath.Join(dir, "regular.pdf")
		if err := os.WriteFile(regular, []byte("kept"), 0o644); err != nil {
			t.Fatal(err)
		}
		link := filepath.Join(dir, "link.pdf")
		if err := os.Symlink(regular, link); err != nil {
			t.Fatal(err)
		}
		cases := map[string]string{folder: "folder", link: "symbolic link"}
		for name, kind := range specialFiles(t, dir) {
			cases[name] = kind
		}
		for path, kind := range cases {
			before, err := os.Lstat(path)
			if err != nil {
				t.Fatal(err)
			}
			err = Write(path, []byte("new"), force)
			if !errors.Is(err, ErrNotRegular) || !strings.Contains(err.Error(), kind) || !strings.Contains(err.Error(), path) {
				t.Errorf("force=%v, %s: error %v; want ErrNotRegular naming the path and %q", force, filepath.Base(path), err, kind)
			}
			if err := Check(path, force); !errors.Is(err, ErrNotRegular) {
				t.Errorf("force=%v, Check(%s): %v", force, filepath.Base(path), err)
			}
			after, err := os.Lstat(path)
			if err != nil || after.Mode() != before.Mode() || !os.SameFile(before, after) {
				t.Errorf("force=%v, %s was replaced (%v, %v)", force, filepath.Base(path), after, err)
			}
		}
		if b, _ := os.ReadFile(regular); string(b) != "kept" {
			t.Errorf("the link's target changed to %q", b)
		}
		assertNoTemporary(t, dir)
	}
}

func TestWriteHonoursTheFolder(t *testing.T) {
	// Check agrees with Write before anything is written.
	dir := t.TempDir()
	p := filepath.Join(dir, "a.1")
	if err := Check(p, false); err != nil {
		t.Errorf("Check of a new path: %v", err)
	}
	if err := Write(p, []byte("a"), false); err != nil {
		t.Fatal(err)
	}
	if err := Check(p, false); !errors.Is(err, ErrExists) {
		t.Errorf("Check of an existing path without force: %v", err)
	}
	if err := Check(p, true); err != nil {
		t.Errorf("Check of an existing path with force: %v", err)
	}
}

func TestStaleTemporariesRemoved(t *testing.T) {
	// A write removes, in its folder, the temporaries of its own pattern that
	// are older than staleAge (left by a killed run); nothing else.
	dir := t.TempDir()
	old := time.Now().Add(-staleAge - time.Minute)
	mk := func(name string, age time.Time) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte("x"), 0o600); err != nil {
			t.Fatal(err)
		}
		if err := os.Chtimes(p, age, age); err != nil {
			t.Fatal(err)
		}
		return p
	}
	stale := mk(".pasval-1234567.tmp", old)
	kept := []string{
		mk(".pasval-7654321.tmp", time.Now()), // a write in progress elsewhere
		mk(".pasval-12a4.tmp", old),           // not the pattern
		mk(".pasval-1234.tmp.bak", old),       // not the pattern
		mk("record.pdf.tmp", old),             // not the pattern
		mk(".report.pdf.tmp-123", old),        // another program's temporary
	}
	staleDir := filepath.Join(dir, ".pasval-99.tmp") // a folder, never removed
	if err := os.Mkdir(staleDir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Chtimes(staleDir, old, old); err != nil {
		t.Fatal(err)
	}
	kept = append(kept, staleDir)
	forgetSwept(dir)
	if err := Write(filepath.Join(dir, "new.pdf"), []byte("n"), false); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Lstat(stale); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("stale temporary kept: %v", err)
	}
	for _, p := range kept {
		if _, err := os.Lstat(p); err != nil {
			t.Errorf("%s removed: %v", filepath.Base(p), err)
		}
	}
}

// forgetSwept lets a test sweep a folder again in the same process.
func forgetSwept(dir string) {
	mu.Lock()
	delete(swept, dir)
	mu.Unlock()
}

func assertOnly(t *testing.T, dir string, names ...string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	if strings.Join(got, "\n") != strings.Join(names, "\n") {
		t.Errorf("folder holds %q, want %q", got, names)
	}
}

func assertNoTemporary(t *testing.T, dir string) {
	t.Helper()
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

func TestExistsSaysItOnce(t *testing.T) {
	// The refusal of an existing file says what to do, and no more: not
	// "…; use --force to overwrite it: file exists".
	p := filepath.Join(t.TempDir(), "a")
	if err := Write(p, []byte("a"), false); err != nil {
		t.Fatal(err)
	}
	err := Write(p, []byte("b"), false)
	if !errors.Is(err, ErrExists) || err.Error() != p+" already exists; use --force to overwrite it" {
		t.Errorf("%v", err)
	}
}
