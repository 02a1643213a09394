package main

// The README's examples are tests: every pasval command shown in a README
// code block runs in a script of testdata/script (testscript), with its
// output compared, and the output the README shows must be the script's.

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
	"github.com/rogpeppe/go-internal/txtar"
)

const scriptDir = "../../testdata/script"

func TestScripts(t *testing.T) {
	root, err := filepath.Abs("../..")
	if err != nil {
		t.Fatal(err)
	}
	testscript.Run(t, testscript.Params{
		Dir: scriptDir,
		// -update rewrites the compared outputs inside the scripts (review
		// the diff); TestReadmeCommandsAreScripts then carries them into the
		// README.
		UpdateScripts: *update,
		Setup: func(env *testscript.Env) error {
			// The demos and the bad-input corpus, where the README's commands expect them.
			for _, d := range []string{"demo", "bad", "bad-runs", "equivalence", "judging"} {
				if err := os.CopyFS(filepath.Join(env.WorkDir, "testdata", d), os.DirFS(filepath.Join(root, "testdata", d))); err != nil {
					return err
				}
			}
			env.Setenv("NO_COLOR", "1")
			env.Setenv("SOURCE_DATE_EPOCH", testEpoch) // the README's outputs are as of 2026-12-01
			return nil
		},
	})
}

// readmeCommand is a pasval command shown in the README and the output shown
// under it ("$ pasval …" blocks), if any.
type readmeCommand struct {
	line   string
	output []string
}

var spaces = regexp.MustCompile(`\s+`)

// normalize drops a trailing comment and "go run ./cmd/pasval", and folds spaces.
func normalize(cmd string) string {
	if i := strings.Index(cmd, " #"); i >= 0 {
		cmd = cmd[:i]
	}
	cmd = strings.Replace(cmd, "go run ./cmd/pasval ", "pasval ", 1)
	return strings.TrimSpace(spaces.ReplaceAllString(cmd, " "))
}

// readmeCommands reads every fenced code block of the README.
func readmeCommands(t *testing.T) []readmeCommand {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	var out []readmeCommand
	var cur *readmeCommand
	in := false
	for _, l := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(l, "```") {
			in, cur = !in, nil
			continue
		}
		if !in {
			continue
		}
		switch {
		case strings.HasPrefix(l, "$ pasval "):
			out = append(out, readmeCommand{line: normalize(l[2:])})
			cur = &out[len(out)-1]
		case cur != nil:
			cur.output = append(cur.output, l)
		case strings.HasPrefix(l, "pasval ") || strings.HasPrefix(l, "go run ./cmd/pasval "):
			out = append(out, readmeCommand{line: normalize(l)})
		}
	}
	return out
}

// scriptCommand is an exec line of a script with the file its output is
// compared with.
type scriptCommand struct {
	script, compared string
	archive          *txtar.Archive
}

func scriptCommands(t *testing.T) map[string]scriptCommand {
	files, _ := filepath.Glob(filepath.Join(scriptDir, "*.txtar"))
	cmds := map[string]scriptCommand{}
	for _, f := range files {
		a, err := txtar.ParseFile(f)
		if err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(string(a.Comment), "\n")
		for i, l := range lines {
			l = strings.TrimPrefix(l, "! ")
			if !strings.HasPrefix(l, "exec pasval ") {
				continue
			}
			sc := scriptCommand{script: f, archive: a}
			if i+1 < len(lines) && strings.HasPrefix(lines[i+1], "cmp ") {
				sc.compared = strings.Fields(lines[i+1])[2]
			}
			cmds[normalize(strings.TrimPrefix(l, "exec "))] = sc
		}
	}
	return cmds
}

func TestReadmeCommandsAreScripts(t *testing.T) {
	scripts := scriptCommands(t)
	if *update {
		syncReadme(t, scripts)
	}
	shown := readmeCommands(t)
	if len(shown) < 10 {
		t.Fatalf("only %d commands found in the README", len(shown))
	}
	for _, c := range shown {
		sc, ok := scripts[c.line]
		if !ok {
			t.Errorf("README command %q runs in no script of testdata/script", c.line)
			continue
		}
		if len(c.output) == 0 {
			continue
		}
		var want string
		for _, f := range sc.archive.Files {
			if f.Name == sc.compared {
				want = string(f.Data)
			}
		}
		if want == "" {
			t.Errorf("%s: %q has no compared output", sc.script, c.line)
			continue
		}
		if !shownIn(c.output, strings.Split(want, "\n")) {
			t.Errorf("the README's output of %q is not what %s expects:\n%s", c.line, sc.script, strings.Join(c.output, "\n"))
		}
	}
}

// shownIn reports whether the README's lines are the script's output, where
// a "..." line in the README stands for lines left out.
func shownIn(shown, full []string) bool {
	for len(shown) > 0 && strings.TrimSpace(shown[len(shown)-1]) == "" {
		shown = shown[:len(shown)-1]
	}
	j := 0
	gap := false
	for _, l := range shown {
		if l == "..." {
			gap = true
			continue
		}
		for gap && j < len(full) && full[j] != l {
			j++
		}
		if j >= len(full) || full[j] != l {
			return false
		}
		j, gap = j+1, false
	}
	return true
}

// syncReadme rewrites, with -update, the output the README shows under a
// "$ pasval …" line when it no longer matches what its script expects,
// with the script's whole output (a block with a "..." gap is left for a
// person to edit, and the test then says whether it still matches).
func syncReadme(t *testing.T, scripts map[string]scriptCommand) {
	const path = "../../README.md"
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(data), "\n")
	var out []string
	in := false
	for i := 0; i < len(lines); i++ {
		l := lines[i]
		out = append(out, l)
		if strings.HasPrefix(l, "```") {
			in = !in
			continue
		}
		if !in || !strings.HasPrefix(l, "$ pasval ") {
			continue
		}
		end := i + 1
		for end < len(lines) && !strings.HasPrefix(lines[end], "```") && !strings.HasPrefix(lines[end], "$ pasval ") {
			end++
		}
		shown := lines[i+1 : end]
		sc, ok := scripts[normalize(l[2:])]
		if !ok || len(shown) == 0 || sc.compared == "" || contains(shown, "...") {
			continue
		}
		for _, f := range sc.archive.Files {
			if f.Name == sc.compared && !shownIn(shown, strings.Split(string(f.Data), "\n")) {
				out = append(out, strings.Split(strings.TrimRight(string(f.Data), "\n"), "\n")...)
				i = end - 1
			}
		}
	}
	if err := os.WriteFile(path, []byte(strings.Join(out, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
