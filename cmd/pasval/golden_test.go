package main

// Golden outputs: what the commands print on every demo plant, on the US twin
// of the SI demo and on a few bad inputs, and the content of each demo's
// record. They pin the tool's behaviour, so that a change of structure that
// should change nothing is seen to change nothing. Regenerate after an
// intended change with
//
//	go test ./cmd/pasval/ -run Golden -update
//
// and read the diff before committing it.

import (
	"bytes"
	"crypto/sha256"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/rogpeppe/go-internal/diff"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/record"
	"pasval/report"
)

var update = flag.Bool("update", false, "rewrite the golden files and generated README tables")

const goldenDir = "testdata/golden" // relative to the repository root

var recordDay = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

var goldenDemos = []string{
	"testdata/demo/htst-milk-si.yaml",
	"testdata/demo/cider-us.yaml",
	"testdata/demo/frozen-dessert-si.yaml",
	"testdata/equivalence/htst-milk-us.yaml",
}

// goldenCase is one command line and the file its output is kept in.
type goldenCase struct {
	name string
	args []string
}

func goldenCases() []goldenCase {
	var cases []goldenCase
	for _, plant := range goldenDemos {
		base := strings.TrimSuffix(filepath.Base(plant), ".yaml")
		if strings.HasPrefix(plant, "testdata/equivalence/") {
			base = "equivalence-" + base
		}
		for _, c := range []struct {
			suffix string
			args   []string
		}{
			{"check", []string{"check", plant}},
			{"check-json", []string{"check", "--json", plant}},
			{"check-compare", []string{"check", "--compare-arrangements", plant}},
			{"hold", []string{"hold", plant}},
			{"hold-json", []string{"hold", "--json", plant}},
			{"hold-us", []string{"hold", "--units", "us", plant}},
			{"plates-add", []string{"plates", plant, "--add", "10,20,40"}},
			{"plates-sweep", []string{"plates", plant, "--sweep", "10:150:10"}},
			{"plates-json", []string{"plates", plant, "--add", "5,20", "--json"}},
		} {
			cases = append(cases, goldenCase{base + "." + c.suffix, c.args})
		}
	}
	for _, bad := range []string{"typo-key", "heating-starved", "holding-heat-loss-absurd", "not-utf8", "cooling-cross",
		"economics-hours", "composition-sum", "holding-unknown-sanitary", "organism-typo-key", "wrong-dimension-flow"} {
		cases = append(cases, goldenCase{"bad-" + bad, []string{"check", "testdata/bad/" + bad + ".yaml"}})
	}
	cases = append(cases,
		goldenCase{"bad-missing-file", []string{"check", "testdata/demo/no-such-plant.yaml"}},
		goldenCase{"bad-folder", []string{"hold", "testdata/demo"}},
		goldenCase{"schema", []string{"schema"}},
		goldenCase{"bad-units-flag", []string{"check", "--units", "metric", "testdata/demo/cider-us.yaml"}},
		goldenCase{"htst-milk-si.logs-us", []string{"logs", "--units", "us", "testdata/demo/htst-milk-si.yaml", "testdata/demo/runs/htst-milk-si-shift.csv"}},
		goldenCase{"bad-run-time-backwards", []string{"logs", "testdata/demo/htst-milk-si.yaml", "testdata/bad-runs/time-backwards.csv"}},
	)
	// The SI demo's regenerator has a plate pack: plates added as channels
	// per pass or as whole passes, and --layout where it does not apply.
	for _, plant := range []string{"testdata/demo/htst-milk-si.yaml", "testdata/equivalence/htst-milk-us.yaml"} {
		base := strings.TrimSuffix(filepath.Base(plant), ".yaml")
		if strings.HasPrefix(plant, "testdata/equivalence/") {
			base = "equivalence-" + base
		}
		cases = append(cases,
			goldenCase{base + ".plates-channels", []string{"plates", plant, "--add", "16,32,48", "--layout", "channels"}},
			goldenCase{base + ".plates-passes", []string{"plates", plant, "--add", "10,20,40", "--layout", "passes"}},
			goldenCase{base + ".plates-layout-json", []string{"plates", plant, "--add", "16", "--layout", "channels", "--json"}})
	}
	// Margins under uncertainty: the SI demo and its US twin (the same draws).
	for _, plant := range []string{"testdata/demo/htst-milk-si.yaml", "testdata/equivalence/htst-milk-us.yaml"} {
		base := strings.TrimSuffix(filepath.Base(plant), ".yaml")
		if strings.HasPrefix(plant, "testdata/equivalence/") {
			base = "equivalence-" + base
		}
		cases = append(cases,
			goldenCase{base + ".margins", []string{"margins", plant}},
			goldenCase{base + ".margins-json", []string{"margins", plant, "--json", "--samples", "20000", "--seed", "7"}})
	}
	for _, bad := range []string{"uncertainty-unknown-path", "uncertainty-crosses-bound", "uncertainty-not-varied"} {
		cases = append(cases, goldenCase{"bad-" + bad, []string{"margins", "testdata/bad/" + bad + ".yaml"}})
	}
	cases = append(cases, goldenCase{"bad-layout-without-pack", []string{"plates", "testdata/demo/cider-us.yaml", "--add", "10", "--layout", "channels"}})
	// The line demo: product files on a line file, the matrix, the demos' list.
	const line = "testdata/demo/dairy-line-si/"
	cases = append(cases,
		goldenCase{"dairy-line-si.whole-milk.check", []string{"check", line + "whole-milk.yaml"}},
		goldenCase{"dairy-line-si.whole-milk.check-json", []string{"check", "--json", line + "whole-milk.yaml"}},
		goldenCase{"dairy-line-si.whole-milk.hold", []string{"hold", line + "whole-milk.yaml"}},
		goldenCase{"dairy-line-si.chocolate-milk.check", []string{"check", line + "chocolate-milk.yaml"}},
		goldenCase{"dairy-line-si.cream.check", []string{"check", line + "cream.yaml"}},
		goldenCase{"dairy-line-si.matrix", []string{"matrix", line + "line.yaml", line + "whole-milk.yaml", line + "chocolate-milk.yaml", line + "cream.yaml"}},
		goldenCase{"dairy-line-si.matrix-us", []string{"matrix", "--units", "us", line + "line.yaml", line + "whole-milk.yaml", line + "chocolate-milk.yaml"}},
		goldenCase{"dairy-line-si.matrix-json", []string{"matrix", "--json", line + "line.yaml", line + "whole-milk.yaml", line + "chocolate-milk.yaml", line + "cream.yaml"}},
		goldenCase{"dairy-line-si.line-alone", []string{"check", line + "line.yaml"}},
		goldenCase{"init-demo-list", []string{"init", "--demo", "list"}},
	)
	for _, bad := range []string{"line-unknown-table", "line-cycle-a", "line-chain", "line-missing"} {
		cases = append(cases, goldenCase{"bad-" + bad, []string{"check", "testdata/bad/" + bad + ".yaml"}})
	}
	return cases
}

// TestGoldenLineRecords keeps the record of a product file on a line (both
// files attached) and the matrix record of the line demo, as text and as the
// SHA-256 of the PDF bytes with a fixed date.
func TestGoldenLineRecords(t *testing.T) {
	t.Chdir("../..")
	const line = "testdata/demo/dairy-line-si/"
	day := recordDay.Format("2006-01-02")
	for _, c := range []struct {
		name string
		args []string
		doc  func() (*report.Document, error)
	}{
		{"record-dairy-line-si-whole-milk", []string{"report", line + "whole-milk.yaml", "--date", day, "-o"}, func() (*report.Document, error) {
			p, err := plantfile.Load(line + "whole-milk.yaml")
			if err != nil {
				return nil, err
			}
			res, err := assess.Run(p)
			if err != nil {
				return nil, err
			}
			return record.Build(res, record.Options{Date: recordDay, PlantName: "whole-milk.yaml"})
		}},
		{"record-dairy-line-si-matrix", []string{"matrix", line + "line.yaml", line + "whole-milk.yaml", line + "chocolate-milk.yaml", line + "cream.yaml",
			"--date", day, "--record"}, func() (*report.Document, error) {
			l, err := plantfile.LoadLine(line + "line.yaml")
			if err != nil {
				return nil, err
			}
			var rows []assess.OnLine
			for _, n := range []string{"whole-milk", "chocolate-milk", "cream"} {
				p, err := plantfile.Load(line + n + ".yaml")
				if err != nil {
					return nil, err
				}
				o, err := assess.RunOnLine(p)
				if err != nil {
					return nil, err
				}
				rows = append(rows, o)
			}
			return record.BuildMatrix(l, rows, record.Options{Date: recordDay}), nil
		}},
	} {
		t.Run(c.name, func(t *testing.T) {
			doc, err := c.doc()
			if err != nil {
				t.Fatal(err)
			}
			text := dumpDocument(doc)
			rec := filepath.Join(t.TempDir(), "r.pdf")
			var out, errb bytes.Buffer
			if code := run(append(c.args, rec), &out, &errb); code > 1 {
				t.Fatalf("exit %d %s", code, errb.String())
			}
			pdf, err := os.ReadFile(rec)
			if err != nil {
				t.Fatal(err)
			}
			text += fmt.Sprintf("-- pdf --\nsha256 %x\n", sha256.Sum256(pdf))
			compareGolden(t, filepath.Join(goldenDir, c.name+".txt"), []byte(text))
		})
	}
}

// TestGoldenOutputs runs each case in-process from the repository root, so
// that file names print as a user at the root would see them.
func TestGoldenOutputs(t *testing.T) {
	t.Chdir("../..")
	for _, c := range goldenCases() {
		t.Run(c.name, func(t *testing.T) {
			var out, errb bytes.Buffer
			code := run(c.args, &out, &errb)
			got := fmt.Sprintf("$ pasval %s\nexit %d\n-- stdout --\n%s-- stderr --\n%s", strings.Join(c.args, " "), code, out.String(), errb.String())
			compareGolden(t, filepath.Join(goldenDir, c.name+".txt"), []byte(got))
		})
	}
}

// TestGoldenRecords keeps each demo's record as readable text (the document
// model, block by block) and the SHA-256 of its PDF bytes with a fixed date.
func TestGoldenRecords(t *testing.T) {
	t.Chdir("../..")
	for _, plant := range goldenDemos[:3] {
		name := strings.TrimSuffix(filepath.Base(plant), ".yaml")
		t.Run(name, func(t *testing.T) {
			p, err := plantfile.Load(plant)
			if err != nil {
				t.Fatal(err)
			}
			res, err := assess.RunWith(p, assess.Options{On: recordDay})
			if err != nil {
				t.Fatal(err)
			}
			doc, err := record.Build(res, record.Options{Date: recordDay, PlantName: filepath.Base(plant)})
			if err != nil {
				t.Fatal(err)
			}
			text := dumpDocument(doc)
			rec := filepath.Join(t.TempDir(), "r.pdf")
			var out, errb bytes.Buffer
			if code := run([]string{"report", plant, "-o", rec, "--date", recordDay.Format("2006-01-02")}, &out, &errb); code > 1 {
				t.Fatalf("report: exit %d %s", code, errb.String())
			}
			pdf, err := os.ReadFile(rec)
			if err != nil {
				t.Fatal(err)
			}
			text += fmt.Sprintf("-- pdf --\nsha256 %x\n", sha256.Sum256(pdf))
			compareGolden(t, filepath.Join(goldenDir, "record-"+name+".txt"), []byte(text))
		})
	}
	// The run review of the demo shift: its document and the PDF's hash.
	t.Run("run-review", func(t *testing.T) {
		plant, shift := "testdata/demo/htst-milk-si.yaml", "testdata/demo/runs/htst-milk-si-shift.csv"
		p, err := plantfile.Load(plant)
		if err != nil {
			t.Fatal(err)
		}
		rev, err := reviewRunsTraced(p, []string{shift}, runFlags{quiet: true}, io.Discard, record.TraceBuckets)
		if err != nil {
			t.Fatal(err)
		}
		doc := record.BuildRunReview(rev, record.RunOptions{Date: recordDay, PlantName: filepath.Base(plant), Reading: runFlags{}.reading()})
		text := dumpDocument(doc)
		rec := filepath.Join(t.TempDir(), "r.pdf")
		var out, errb bytes.Buffer
		if code := run([]string{"report", plant, "--log", shift, "-o", rec, "--date", recordDay.Format("2006-01-02")}, &out, &errb); code > 1 {
			t.Fatalf("report: exit %d %s", code, errb.String())
		}
		pdf, err := os.ReadFile(rec)
		if err != nil {
			t.Fatal(err)
		}
		text += fmt.Sprintf("-- pdf --\nsha256 %x\n", sha256.Sum256(pdf))
		compareGolden(t, filepath.Join(goldenDir, "record-run-review.txt"), []byte(text))
	})
}

// dumpDocument writes a record's content as text, block by block.
func dumpDocument(doc *report.Document) string {
	var b strings.Builder
	fmt.Fprintf(&b, "title %s\nheader %s\npage %s\n", doc.Title, doc.Header, doc.PageSize)
	for _, f := range doc.Cover.Fields {
		fmt.Fprintf(&b, "cover %s: %s\n", f[0], f[1])
	}
	for _, v := range doc.Cover.Verdicts {
		fmt.Fprintf(&b, "verdict %s %v\n", v.Check, v.Pass)
	}
	fmt.Fprintf(&b, "overall %s (%v)\nstatement %s\n", doc.Cover.Overall, doc.Cover.Pass, doc.Cover.Statement)
	for _, s := range doc.Sections {
		fmt.Fprintf(&b, "\n## %s\n", s.Heading)
		for _, blk := range s.Blocks {
			dumpBlock(&b, blk)
		}
	}
	return b.String()
}

func dumpBlock(b *strings.Builder, blk report.Block) {
	switch v := blk.(type) {
	case report.Paragraph:
		fmt.Fprintf(b, "paragraph (emphasis %v): %s\n", v.Emphasis, v.Text)
	case report.Bullets:
		for _, it := range v.Items {
			fmt.Fprintf(b, "- %s\n", it)
		}
	case report.KeyValues:
		for _, p := range v.Pairs {
			fmt.Fprintf(b, "%s: %s\n", p[0], p[1])
		}
	case report.Table:
		fmt.Fprintf(b, "table %q\n", v.Caption)
		var cols []string
		for _, c := range v.Columns {
			cols = append(cols, fmt.Sprintf("%s(%v)", c.Title, c.Right))
		}
		fmt.Fprintf(b, "  | %s\n", strings.Join(cols, " | "))
		for _, r := range v.Rows {
			fmt.Fprintf(b, "  | %s\n", strings.Join(r, " | "))
		}
	case report.Diagram:
		fmt.Fprintf(b, "diagram %q unit %s setpoint %.6g\n", v.Caption, v.Unit, v.Setpoint)
		for _, s := range v.Segments {
			fmt.Fprintf(b, "  %+v\n", s)
		}
	case report.Plot:
		fmt.Fprintf(b, "plot %q x %q y %q\n", v.Caption, v.XLabel, v.YLabel)
		for _, s := range v.Series {
			mark := ""
			if s.Markers {
				mark = " (markers)"
			}
			fmt.Fprintf(b, "  series %s%s:", s.Name, mark)
			for i := range s.X {
				fmt.Fprintf(b, " (%.6g, %.6g)", s.X[i], s.Y[i])
			}
			b.WriteString("\n")
		}
	case report.BarChart:
		fmt.Fprintf(b, "bar chart %q unit %q\n", v.Caption, v.Unit)
		for _, bar := range v.Bars {
			fmt.Fprintf(b, "  %s: %.6g\n", bar.Label, bar.Value)
		}
	case report.SignOff:
		fmt.Fprintf(b, "sign-off %s\n", strings.Join(v.Roles, ", "))
	case report.Trend:
		fmt.Fprintf(b, "trend %q y %q limit %.6g %q, %.6f to %.6f s, states %q\n", v.Caption, v.YLabel, v.Limit, v.LimitLabel, v.Start, v.End, v.StateLabels)
		for _, tk := range v.Ticks {
			fmt.Fprintf(b, "  tick %.6f %s\n", tk.At, tk.Label)
		}
		for _, bd := range v.Bands {
			fmt.Fprintf(b, "  band %.6f to %.6f shade %d %s\n", bd.Start, bd.End, bd.Shade, bd.Name)
		}
		lo, hi, first, second := math.Inf(1), math.Inf(-1), 0, 0
		for _, k := range v.Buckets {
			lo, hi = math.Min(lo, k.Min), math.Max(hi, k.Max)
			first, second = first+k.First, second+k.Second
		}
		fmt.Fprintf(b, "  %d buckets from %.6g to %.6g, %d + %d samples\n", len(v.Buckets), lo, hi, first, second)
	default:
		panic(fmt.Sprintf("golden: no dump for block %T", blk))
	}
}

// compareGolden compares got with the golden file, or rewrites it with -update.
func compareGolden(t *testing.T, path string, got []byte) {
	t.Helper()
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	if !bytes.Equal(want, got) {
		t.Errorf("output differs from %s (run with -update after checking the change):\n%s", path, diff.Diff(path, want, "got", got))
	}
}
