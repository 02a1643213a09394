package main

import (
	"embed"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"

	"pasval/internal/fileout"
)

// The demo plants travel inside the binary, so that a user who installed only
// the binary has plant files to try ('pasval init --demo NAME'). demos/ is a
// copy of testdata/demo (the plant files, not the recorded runs): a test
// keeps the two byte-identical, and 'go test ./cmd/pasval/ -run Demo -update'
// copies testdata/demo over it after a demo changes. (A go:embed reaches only
// files under its package's folder, and testdata/ is none.)
//
//go:embed demos
var demoFiles embed.FS

// demo is one demo of the catalogue: a single plant file, or a set (a line
// file and the product files that name it) written into a folder.
type demo struct {
	name  string
	about string
	// path is the file or, for a set, the folder under demos/ (and testdata/demo/).
	path string
	set  bool
}

// demos is the catalogue, in the order 'init --demo list' prints it.
var demos = []demo{
	{"htst-milk-si", "SI: reduced-fat milk; plate packs, heat loss in the holding tube, acceptance tests (passes)", "htst-milk-si.yaml", false},
	{"cider-us", "US units: apple cider; every section rated from its plates (passes)", "cider-us.yaml", false},
	{"frozen-dessert-si", "SI: a laminar ice-cream mix whose tube was timed with water (fails)", "frozen-dessert-si.yaml", false},
	{"dairy-line-si", "SI: a line file and three products on it, for 'pasval matrix' (cream fails)", "dairy-line-si", true},
}

func findDemo(name string) (demo, bool) {
	for _, d := range demos {
		if d.name == name {
			return d, true
		}
	}
	return demo{}, false
}

// files are the demo's files: name (relative to the set's folder) and bytes,
// in name order with the line file first.
func (d demo) files() ([]demoFile, error) {
	if !d.set {
		b, err := demoFiles.ReadFile(path.Join("demos", d.path))
		return []demoFile{{path.Base(d.path), b}}, err
	}
	entries, err := demoFiles.ReadDir(path.Join("demos", d.path))
	if err != nil {
		return nil, err
	}
	var out []demoFile
	for _, e := range entries {
		b, err := demoFiles.ReadFile(path.Join("demos", d.path, e.Name()))
		if err != nil {
			return nil, err
		}
		f := demoFile{e.Name(), b}
		if e.Name() == "line.yaml" {
			out = append([]demoFile{f}, out...)
		} else {
			out = append(out, f)
		}
	}
	return out, nil
}

type demoFile struct {
	name string
	data []byte
}

// listDemos prints the catalogue.
func listDemos(out io.Writer) error {
	t := newTable("demo", "files", "what it shows")
	for _, d := range demos {
		fs, err := d.files()
		if err != nil {
			return err
		}
		files := fs[0].name
		if d.set {
			files = fmt.Sprintf("a folder of %d files", len(fs))
		}
		t.add(d.name, files, d.about)
	}
	t.write(out)
	fmt.Fprintln(out, "\nWrite one with 'pasval init --demo NAME -o FILE' (a set: -o FOLDER); without -o a single file goes to standard output.")
	return nil
}

// writeDemo writes a demo: a single file to out or to the file output, a set
// into the folder output (made when missing), every target checked before
// any is written, so a refusal leaves nothing half done.
func writeDemo(d demo, output string, force bool, out io.Writer) error {
	files, err := d.files()
	if err != nil {
		return err
	}
	if !d.set {
		if output == "" {
			_, err := out.Write(files[0].data)
			return err
		}
		if err := fileout.Write(output, files[0].data, force); err != nil {
			return usagef("%v", err)
		}
		fmt.Fprintf(out, "wrote %s\n", output)
		return nil
	}
	if output == "" {
		return usagef("the demo %s is a set of %d files (a line file and the product files that name it): give the folder to write them into, e.g. -o %s",
			d.name, len(files), d.name)
	}
	st, err := os.Stat(output)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := os.Mkdir(output, 0o777); err != nil {
			return usagef("cannot make the folder %s: %v", output, err)
		}
	case err != nil:
		return usagef("cannot write into %s: %v", output, err)
	case !st.IsDir():
		return usagef("%s is not a folder; the demo %s is a set of files written into a folder", output, d.name)
	}
	for _, f := range files {
		if err := fileout.Check(filepath.Join(output, f.name), force); err != nil {
			if errors.Is(err, fileout.ErrExists) {
				return usagef("%s already exists; use --force to overwrite the demo's files", filepath.Join(output, f.name))
			}
			return usagef("%v; no file was written", err)
		}
	}
	for _, f := range files {
		p := filepath.Join(output, f.name)
		if err := fileout.Write(p, f.data, force); err != nil {
			return usagef("%v", err)
		}
		fmt.Fprintf(out, "wrote %s\n", p)
	}
	return nil
}
