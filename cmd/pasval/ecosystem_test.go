package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestBadInputAcrossCommands(t *testing.T) {
	// Every bad plant file is refused the same way (exit 2, same first error) by
	// every command that reads a plant file; report writes nothing.
	dir := t.TempDir()
	for name, want := range badCases {
		path := filepath.Join(badDir, name+".yaml")
		rec := filepath.Join(dir, name+".pdf")
		for _, args := range [][]string{
			{"hold", path},
			{"report", path, "-o", rec},
			{"plates", path, "--add", "10"},
			{"due", path},
			{"check", "--compare-arrangements", path},
			{"margins", "--samples", "100", path},
		} {
			var out, errb bytes.Buffer
			code := run(args, &out, &errb)
			first := strings.SplitN(errb.String(), "\n", 2)[0]
			// A fault found only by computing (heating-starved) lets hold and plates
			// refuse first for their own reason (no tube, a sized regenerator).
			own := strings.Contains(first, "describes no holding tube") || strings.Contains(first, "needs the regenerator in rating mode") ||
				strings.Contains(first, "has no uncertainty block")
			in := name
			if other, ok := badCaseIn[name]; ok {
				in = other // the error lies in the line file
			}
			if code != exitInput || !(strings.Contains(first, want.frag) || own) || !strings.Contains(first, in+".yaml:") {
				t.Errorf("%v: exit %d, first error %q; want 2 and %q", args, code, first, want.frag)
			}
		}
		if _, err := os.Stat(rec); err == nil {
			t.Errorf("%s: a record was written", name)
		}
	}
	// Bad records for verify: not a PDF, an empty file, a PDF without a plant file.
	for name, content := range map[string]string{"not-a-pdf.pdf": "plant: no", "empty.pdf": "", "bare.pdf": "%PDF-1.4\n%%EOF\n"} {
		p := filepath.Join(dir, name)
		writeFile(t, p, content)
		var out, errb bytes.Buffer
		if code := run([]string{"verify", p}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "not") {
			t.Errorf("verify %s: exit %d %q", name, code, errb.String())
		}
	}
}

func TestSchemaCommand(t *testing.T) {
	var out bytes.Buffer
	if code := run([]string{"schema"}, &out, &bytes.Buffer{}); code != 0 {
		t.Fatalf("exit %d", code)
	}
	var s map[string]any
	if err := json.Unmarshal(out.Bytes(), &s); err != nil {
		t.Fatal(err)
	}
	if s["$schema"] != "https://json-schema.org/draft/2020-12/schema" || s["title"] != "pasval plant file" {
		t.Errorf("schema head %v %v", s["$schema"], s["title"])
	}
	if !strings.Contains(out.String(), "°C") || strings.Contains(out.String(), `\u00b0`) {
		t.Error("schema text escaped or missing the degree sign")
	}
}

func TestDocsCommand(t *testing.T) {
	dir := t.TempDir()
	var out, errb bytes.Buffer
	if code := run([]string{"docs", dir}, &out, &errb); code != 0 {
		t.Fatalf("docs: %d %s", code, errb.String())
	}
	root := newRootCmd(&bytes.Buffer{}, &bytes.Buffer{})
	for _, c := range append(root.Commands(), root) {
		if !c.IsAvailableCommand() && c != root {
			continue
		}
		page, err := os.ReadFile(filepath.Join(dir, manPageName(c)))
		if err != nil {
			t.Errorf("no man page for %q", c.CommandPath())
			continue
		}
		if !bytes.Contains(page, []byte(".TH \"PASVAL\"")) || !bytes.Contains(page, []byte(strings.ReplaceAll(c.Name(), "-", "\\-"))) {
			t.Errorf("%s: page lacks its header or name", manPageName(c))
		}
	}
	// No overwrite without --force.
	errb.Reset()
	if code := run([]string{"docs", dir}, &out, &errb); code != exitInput || !strings.Contains(errb.String(), "--force") {
		t.Errorf("second docs: %d %q", code, errb.String())
	}
	if code := run([]string{"docs", dir, "--force"}, &out, &errb); code != 0 {
		t.Errorf("docs --force: %d", code)
	}
	if code := run([]string{"docs", filepath.Join(dir, "missing")}, &out, &errb); code != exitInput {
		t.Errorf("docs into a missing folder: %d", code)
	}
}

func TestCompletionAndVersion(t *testing.T) {
	// Plant-file arguments complete to *.yaml/*.yml; records to *.pdf.
	var out bytes.Buffer
	run([]string{"__complete", "check", ""}, &out, &bytes.Buffer{})
	if !strings.HasPrefix(out.String(), "yaml\nyml\n:8") {
		t.Errorf("check completion: %q", out.String())
	}
	out.Reset()
	run([]string{"__complete", "verify", ""}, &out, &bytes.Buffer{})
	if !strings.HasPrefix(out.String(), "pdf\n:8") {
		t.Errorf("verify completion: %q", out.String())
	}
	for _, sh := range []string{"bash", "zsh", "fish"} {
		out.Reset()
		if code := run([]string{"completion", sh}, &out, &bytes.Buffer{}); code != 0 || !strings.Contains(out.String(), "pasval") {
			t.Errorf("completion %s: %d", sh, code)
		}
	}
	out.Reset()
	run([]string{"--version"}, &out, &bytes.Buffer{})
	if !strings.Contains(out.String(), "pasval 0.") || !strings.Contains(out.String(), "go go1.") {
		t.Errorf("--version: %q", out.String())
	}
}

func TestColourOnlyOnATerminal(t *testing.T) {
	// Output to a pipe or file has no escape codes; NO_COLOR turns colour off everywhere.
	out, _, _ := runBinary(t, "check", filepath.Join(demoDir, "frozen-dessert-si.yaml"))
	if strings.Contains(out, "\x1b[") {
		t.Error("escape codes in piped output")
	}
	// /dev/null is a character device but not a terminal: no colour codes.
	devNull, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer devNull.Close()
	if useColour(devNull) {
		t.Error("colour on /dev/null")
	}
	t.Setenv("NO_COLOR", "1")
	if useColour(os.Stdout) {
		t.Error("colour with NO_COLOR set")
	}
	// On a terminal the verdicts are painted after alignment, so columns still line up.
	tb := newTable("check", "result", "note")
	tb.colour = true
	tb.add("holding-time", "FAIL", "x")
	tb.add("tube-slope", "PASS", "y")
	var b bytes.Buffer
	tb.write(&b)
	lines := strings.Split(strings.TrimSpace(b.String()), "\n")
	plain := func(s string) string {
		for _, c := range []string{"\x1b[32m", "\x1b[1;31m", "\x1b[0m"} {
			s = strings.ReplaceAll(s, c, "")
		}
		return s
	}
	if !strings.Contains(lines[1], "\x1b[1;31mFAIL\x1b[0m") || len(plain(lines[1])) != len(plain(lines[2])) {
		t.Errorf("coloured table:\n%q", lines)
	}
}
