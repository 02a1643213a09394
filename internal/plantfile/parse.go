package plantfile

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"regexp"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"pasval/internal/inputerr"
)

// MaxFileSize is the largest plant file read (a real one is a few kilobytes).
const MaxFileSize = 1 << 20

// Load reads, parses and validates a plant file.
func Load(path string) (*Plant, error) {
	// A file that cannot be read has no line to point at: the error names the
	// file alone ("line2.yaml: cannot read line2.yaml: no such file or directory").
	cannotRead := func(err error) error {
		return inputerr.List{inputerr.At(inputerr.Pos{File: path}, "", "cannot read %s: %v", path, unwrapPathError(err))}
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, cannotRead(err)
	}
	data, err := io.ReadAll(io.LimitReader(f, MaxFileSize+1))
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return nil, cannotRead(err)
	}
	p, err := Parse(path, data)
	if err != nil {
		return nil, err
	}
	if err := Validate(p); err != nil {
		return nil, err
	}
	return p, nil
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// Parse turns plant-file bytes into a Plant, checking the schema and every
// unit but no rule that spans fields (see Validate). file names the source in
// error positions.
func Parse(file string, data []byte) (p *Plant, err error) {
	return parseWith(&decoder{file: file}, data)
}

func parseWith(d *decoder, data []byte) (p *Plant, err error) {
	file := d.file
	first := func(line, col int, msg string) error {
		return inputerr.List{{Pos: inputerr.Pos{File: file, Line: line, Column: col}, Field: keyOnLine(data, line), Msg: msg}}
	}
	if len(data) > MaxFileSize {
		return nil, first(1, 1, fmt.Sprintf("the file is larger than %d bytes; a plant file is a few kilobytes", MaxFileSize))
	}
	if len(bytes.TrimSpace(data)) == 0 {
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
		return nil, first(1, 1, "the plant file holds no YAML mapping; expected at least 'product' and 'process'")
	}
	if n, path, msg := findUnsupported(root, ""); n != nil {
		return nil, inputerr.List{{Pos: inputerr.Pos{File: file, Line: n.Line, Column: n.Column}, Field: path, Msg: msg}}
	}
	sum := sha256.Sum256(data)
	p = &Plant{File: file, SHA256: hex.EncodeToString(sum[:]), Source: data}
	top := d.object(root, "")
	if top != nil {
		d.decodePlant(p, top)
	}
	p.Inputs = d.inputs
	if len(d.errs) > 0 {
		sortErrors(d.errs)
		return nil, d.errs
	}
	p.System = p.Process.HoldSetpoint.System
	return p, nil
}

// Replaced reads the plant again from its source with the value at path (a
// concrete path of one of p.Inputs, such as "organisms[1].D_temperature")
// replaced by text, and validates it. It serves the tracing of a result that
// is not finite back to an entered value (internal/assess).
func (p *Plant) Replaced(path, text string) (*Plant, error) {
	if p.Source == nil {
		return nil, fmt.Errorf("%sthe plant has no source to read again", panicPrefix)
	}
	q, err := parseWith(&decoder{file: p.File, replace: map[string]string{path: text}}, p.Source)
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
