package plantfile

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
)

// MaxFileSize is the largest plant file read (a real one is a few kilobytes).
const MaxFileSize = 1 << 20

// Load reads, parses and validates a plant file, and the line file it names
// (line_file) from the file system.
func Load(path string) (*Plant, error) {
	data, err := ReadFile(path)
	if err != nil {
		// A file that cannot be read has no line to point at: the error names the
		// file alone ("line2.yaml: cannot read line2.yaml: no such file or directory").
		return nil, inputerr.List{inputerr.At(inputerr.Pos{File: path}, "", "cannot read %s: %v", path, err)}
	}
	p, err := ParseWith(path, data, ReadFile)
	if err != nil {
		return nil, err
	}
	if err := Validate(p); err != nil {
		return nil, err
	}
	return p, nil
}

// ReadFile reads a plant or line file from the file system: at most
// MaxFileSize + 1 bytes, so that a larger file is refused by Parse. The
// error is the reason alone ("no such file or directory").
func ReadFile(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, unwrapPathError(err)
	}
	data, err := io.ReadAll(io.LimitReader(f, MaxFileSize+1))
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return nil, unwrapPathError(err)
	}
	return data, nil
}

// LoadLine reads a line file on its own (pasval matrix): every key and
// value is checked as in a plant file, but the blocks a product file gives
// (product, process) are not required and the rules across fields are left
// to each product file that names it.
func LoadLine(path string) (*Plant, error) {
	data, err := ReadFile(path)
	if err != nil {
		return nil, inputerr.List{inputerr.At(inputerr.Pos{File: path}, "", "cannot read %s: %v", path, err)}
	}
	return ParseLine(path, data)
}

// ParseLine is LoadLine of bytes already read.
func ParseLine(file string, data []byte) (*Plant, error) {
	return parseWith(&decoder{file: file, lineOnly: true}, data)
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// ReadFunc reads a line file named by line_file; path is resolved against
// the folder of the file that names it.
type ReadFunc func(path string) ([]byte, error)

// Parse turns plant-file bytes into a Plant, checking the schema and every
// unit but no rule that spans fields (see Validate). file names the source in
// error positions. A plant file that names a line file is refused: ParseWith
// reads one.
func Parse(file string, data []byte) (p *Plant, err error) {
	return ParseWith(file, data, nil)
}

// ParseWith is Parse with a line file (line_file) read through read (nil:
// refused): the line file supplies every top-level block the plant file does
// not give, and a block given in both is the plant file's, whole
// (docs/METHOD.md §16.1).
func ParseWith(file string, data []byte, read ReadFunc) (p *Plant, err error) {
	return parseWith(&decoder{file: file, read: read}, data)
}

func parseWith(d *decoder, data []byte) (p *Plant, err error) {
	what := "plant file"
	if d.lineOnly {
		what = "line file"
	}
	root, err := readTree(d.file, data, what)
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256(data)
	p = &Plant{File: d.file, SHA256: hex.EncodeToString(sum[:]), Source: data}
	top := d.object(root, "")
	if top != nil {
		top = d.withLine(p, top)
	}
	if top != nil {
		d.decodePlant(p, top)
	}
	p.Inputs = d.inputs
	if len(d.errs) > 0 {
		sortErrors(d.errs, d.file)
		return nil, d.errs
	}
	p.System = p.Process.HoldSetpoint.System
	return p, nil
}

// readTree checks a file's bytes (size, text, indentation, one YAML document
// holding a mapping, no anchors) and returns its root node; what names the
// file in messages ("plant file", "line file").
func readTree(file string, data []byte, what string) (*yaml.Node, error) {
	first := func(line, col int, msg string) error {
		return inputerr.List{{Pos: inputerr.Pos{File: file, Line: line, Column: col}, Field: keyOnLine(data, line), Msg: msg}}
	}
	if len(data) > MaxFileSize {
		return nil, first(1, 1, fmt.Sprintf("the file is larger than %d bytes; a %s is a few kilobytes", MaxFileSize, what))
	}
	if len(bytes.TrimSpace(data)) == 0 {
		if what == "line file" {
			return nil, first(1, 1, "the line file is empty; expected the line's blocks (regeneration, heating, cooling, holding_tube, …)")
		}
		return nil, first(1, 1, "the plant file is empty; expected at least 'product' and 'process' (run 'pasval init' for a starter file)")
	}
	if !utf8.Valid(data) {
		line, col := invalidUTF8At(data)
		return nil, first(line, col, "the file is not valid UTF-8 text; save it as UTF-8")
	}
	if line, col, r, ok := controlCharacterAt(data); ok {
		return nil, first(line, col, fmt.Sprintf("the file holds a control character (%U); a plant file is printable text", r))
	}
	if line, col, ok := tabIndent(data); ok {
		return nil, first(line, col, "a tab is used for indentation; YAML needs spaces")
	}
	root, err := decodeYAML(data)
	if err != nil {
		line, col, msg := yamlErrorPos(data, err)
		return nil, first(line, col, msg)
	}
	if root == nil {
		if what == "line file" {
			return nil, first(1, 1, "the line file holds no YAML mapping; expected the line's blocks (regeneration, heating, cooling, holding_tube, …)")
		}
		return nil, first(1, 1, "the plant file holds no YAML mapping; expected at least 'product' and 'process'")
	}
	if n, path, msg := findUnsupported(root, ""); n != nil {
		return nil, inputerr.List{{Pos: inputerr.Pos{File: file, Line: n.Line, Column: n.Column}, Field: path, Msg: msg}}
	}
	return root, nil
}

// lineBlocks are the top-level blocks that make a file without product and
// process read as a line file.
var lineBlocks = []string{"regeneration", "heating", "cooling", "holding_tube", "legal_tables"}

// withLine merges the line file that top names (line_file) under it: the
// result holds every top-level block of this file and, for each block this
// file does not give, the line file's (docs/METHOD.md §16.1). Without
// line_file it returns top. It returns nil, with the error recorded, when
// the line file cannot be read, names a line file itself (a chain or a
// cycle), or when a file without product and process is given alone.
func (d *decoder) withLine(p *Plant, top *object) *object {
	name := top.text("line_file")
	if name == "" {
		if !d.lineOnly && !top.has("product") && !top.has("process") && !top.has("line_file") {
			for _, b := range lineBlocks {
				if top.has(b) {
					d.errorf(top.node, "product", "missing, and so is process: this file reads as a line file (the equipment product files name with line_file: PATH); "+
						"check a product file that names it, or judge the line's products with 'pasval matrix %s PRODUCT.yaml…'", d.file)
					return nil
				}
			}
		}
		return top
	}
	at := top.values["line_file"]
	p.LineFile, p.LineFilePos = name, d.pos(at)
	if d.lineOnly {
		d.errorf(at, "line_file", "this file names a line file itself, so it is a product file; give pasval matrix the line file first (%s), then the product files", name)
		return nil
	}
	path := resolve(d.file, name)
	switch {
	case d.read == nil:
		d.errorf(at, "line_file", "a line file is read only from the file system (pasval check, hold, report, …)")
		return nil
	case samePath(path, d.file):
		d.errorf(at, "line_file", "%q names this file itself (a cycle); name the line file that holds the line's blocks", name)
		return nil
	}
	data, err := d.read(path)
	if err != nil {
		d.errorf(at, "line_file", "cannot read the line file %s: %v", path, err)
		return nil
	}
	root, err := readTree(path, data, "line file")
	if err != nil {
		var l inputerr.List
		if errors.As(err, &l) {
			d.errs = append(d.errs, l...)
		}
		return nil
	}
	sum := sha256.Sum256(data)
	p.Line = &SourceFile{File: path, SHA256: hex.EncodeToString(sum[:]), Source: data}
	d.lineFile, d.lineNodes = path, map[*yaml.Node]bool{}
	markNodes(root, d.lineNodes)
	line := d.object(root, "")
	if line == nil {
		return nil
	}
	if next := line.values["line_file"]; next != nil {
		target := resolve(path, next.Value)
		if samePath(target, d.file) {
			d.errorf(line.keys["line_file"], "line_file", "a cycle: %s names %s as its line file, which names %s back; a line file names no other file",
				d.file, path, d.file)
		} else {
			d.errorf(line.keys["line_file"], "line_file", "a chain: %s is the line file of %s and names another line file, %s; a line file names no other file (copy the blocks it needs into it)",
				path, d.file, target)
		}
		return nil
	}
	merged := &object{d: d, path: "", table: "", node: top.node,
		values: map[string]*yaml.Node{}, keys: map[string]*yaml.Node{}, suggested: map[string]bool{}}
	for _, o := range []*object{line, top} { // this file's blocks last: they replace the line's whole
		for k, v := range o.values {
			merged.values[k], merged.keys[k] = v, o.keys[k]
		}
		for k := range o.suggested {
			merged.suggested[k] = true
		}
	}
	return merged
}

// resolve is the path of a file named in the file at from: relative to
// from's folder unless absolute.
func resolve(from, name string) string {
	if filepath.IsAbs(name) {
		return filepath.Clean(name)
	}
	return filepath.Join(filepath.Dir(from), name)
}

// samePath reports whether two paths name the same file: the same cleaned
// absolute path, or one file on disk (os.SameFile, through links).
func samePath(a, b string) bool {
	aa, err1 := filepath.Abs(a)
	bb, err2 := filepath.Abs(b)
	if err1 == nil && err2 == nil && aa == bb {
		return true
	}
	sa, err1 := os.Stat(a)
	sb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(sa, sb)
}

// markNodes puts every node of a tree in set.
func markNodes(n *yaml.Node, set map[*yaml.Node]bool) {
	set[n] = true
	for _, c := range n.Content {
		markNodes(c, set)
	}
}

// Replaced reads the plant again from its source with the value at path (a
// concrete path of one of p.Inputs, such as "organisms[1].D_temperature")
// replaced by text, and validates it. It serves the tracing of a result that
// is not finite back to an entered value (internal/assess).
func (p *Plant) Replaced(path, text string) (*Plant, error) {
	if p.Source == nil {
		return nil, fmt.Errorf("%sthe plant has no source to read again", panicPrefix)
	}
	d := &decoder{file: p.File, replace: map[string]string{path: text}}
	if p.Line != nil {
		// The value may sit in the line file: it is read again from its bytes.
		line := p.Line.Source
		d.read = func(string) ([]byte, error) { return line, nil }
	}
	q, err := parseWith(d, p.Source)
	if err != nil {
		return nil, err
	}
	if err := Validate(q); err != nil {
		return nil, err
	}
	return q, nil
}

// decodeYAML parses exactly one YAML document. yaml.v3 has panicked on some
// malformed inputs in the past; a panic is turned into an error here so that
// bad input never produces a stack trace.
func decodeYAML(data []byte) (root *yaml.Node, err error) {
	defer func() {
		if r := recover(); r != nil {
			root, err = nil, fmt.Errorf("yaml: the file could not be parsed (%v)", r)
		}
	}()
	dec := yaml.NewDecoder(bytes.NewReader(data))
	var doc yaml.Node
	if err := dec.Decode(&doc); err != nil {
		if err == io.EOF {
			return nil, nil
		}
		return nil, err
	}
	var extra yaml.Node
	if err := dec.Decode(&extra); err != io.EOF {
		if err != nil {
			return nil, err
		}
		return nil, fmt.Errorf("yaml: line %d: a second YAML document starts here; a plant file holds one", secondDocumentLine(data, extra.Line))
	}
	if doc.Kind != yaml.DocumentNode || len(doc.Content) == 0 {
		return nil, nil
	}
	return doc.Content[0], nil
}

var docStart = regexp.MustCompile(`^---(\s|$)`)

// secondDocumentLine is the line of the "---" that opens the second document
// (the last separator before the second document's first node).
func secondDocumentLine(data []byte, contentLine int) int {
	found := max(contentLine, 1)
	for i, l := range bytes.Split(data, []byte("\n")) {
		if i+1 > contentLine {
			break
		}
		if docStart.Match(l) && i > 0 {
			found = i + 1
		}
	}
	return found
}

// findUnsupported returns the first node that uses a YAML feature plant files
// refuse (an anchor, an alias or an explicit tag such as !!binary, !!map or
// !name), its field path and the message.
func findUnsupported(n *yaml.Node, path string) (*yaml.Node, string, string) {
	if n.Kind == yaml.AliasNode || n.Anchor != "" {
		return n, path, "anchors and aliases (& and *) are not supported in plant files; write each value out"
	}
	if n.Style&yaml.TaggedStyle != 0 {
		return n, path, fmt.Sprintf("YAML tags (here %q) are not supported in plant files; write the plain value", n.Tag)
	}
	for i, c := range n.Content {
		p := path
		switch n.Kind {
		case yaml.MappingNode:
			if i%2 == 1 {
				p = join(path, n.Content[i-1].Value)
			} else {
				p = join(path, c.Value)
			}
		case yaml.SequenceNode:
			p = fmt.Sprintf("%s[%d]", path, i)
		}
		if a, ap, msg := findUnsupported(c, p); a != nil {
			return a, ap, msg
		}
	}
	return nil, "", ""
}

var keyPattern = regexp.MustCompile(`^\s*(?:-\s+)?([A-Za-z_][A-Za-z0-9_]*)\s*:`)

// keyOnLine names the key written on a line, for errors found before the
// YAML tree exists (tabs, bad bytes, syntax); "" when the line has none.
func keyOnLine(data []byte, line int) string {
	lines := bytes.Split(data, []byte("\n"))
	if line < 1 || line > len(lines) {
		return ""
	}
	if m := keyPattern.FindSubmatch(lines[line-1]); m != nil {
		return string(m[1])
	}
	return ""
}

func invalidUTF8At(data []byte) (int, int) {
	line, col := 1, 1
	for i := 0; i < len(data); {
		r, size := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && size <= 1 {
			return line, col
		}
		if r == '\n' {
			line, col = line+1, 1
		} else {
			col++
		}
		i += size
	}
	return line, col
}

// tabIndent finds a tab in a line's leading white space.
func tabIndent(data []byte) (int, int, bool) {
	for i, l := range strings.Split(string(data), "\n") {
		for j, r := range l {
			if r == '\t' {
				return i + 1, j + 1, true
			}
			if r != ' ' {
				break
			}
		}
	}
	return 0, 0, false
}
