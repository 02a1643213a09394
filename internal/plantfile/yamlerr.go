package plantfile

import (
	"bytes"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Positions of YAML syntax errors. go.yaml.in/yaml/v3 reports an error as
// "yaml: line N: problem"; the line is that of the construct the library was
// reading (the context: an unclosed '[' or '{', the list or mapping being
// read) or, without one, of the problem. Its scanner counts that line from 1,
// but its parser gives the 0-based line of its mark (go.yaml.in/yaml/v3
// decode.go, parser.fail), one less than the line meant. pasval reports the
// line the library means: it adds one for the parser's problems (listed below
// from parserc.go), keeps the scanner's, and keeps within the file. Errors the
// library reports without a line are positioned by pasval itself: control
// characters (its reader's refusals) are found before parsing, an undefined
// alias by renaming candidates until the library names the new name.

// parserProblems are the problems go.yaml.in/yaml/v3's parser (parserc.go)
// reports with a 0-based line; every other problem comes from its scanner,
// whose line counts from 1.
var parserProblems = []string{
	"did not find expected <stream-start>",
	"did not find expected <document start>",
	"found undefined tag handle",
	"did not find expected node content",
	"did not find expected '-' indicator",
	"did not find expected key",
	"did not find expected ',' or ']'",
	"did not find expected ',' or '}'",
	"found duplicate %YAML directive",
	"found incompatible YAML document",
	"found duplicate %TAG directive",
}

var yamlLine = regexp.MustCompile(`^line (\d+): `)

// yamlErrorPos turns a go.yaml.in/yaml/v3 error into the line the library
// means, a column at that line's first non-blank character, and a message.
func yamlErrorPos(data []byte, err error) (int, int, string) {
	msg := strings.TrimPrefix(err.Error(), "yaml: ")
	line := 1
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		n, convErr := strconv.Atoi(m[1])
		if convErr == nil {
			line = n
		}
		msg = msg[len(m[0]):]
		for _, p := range parserProblems {
			if msg == p {
				line++ // the parser's 0-based line
				break
			}
		}
	} else if line, col, ok := undefinedAliasAt(data, msg); ok {
		return line, col, "the file is not valid YAML: " + msg
	}
	lines := strings.Split(strings.TrimRight(string(data), "\n"), "\n")
	line = max(1, min(line, len(lines))) // an end-of-file problem: the last line
	col := len(lines[line-1]) - len(strings.TrimLeft(lines[line-1], " ")) + 1
	return line, col, "the file is not valid YAML: " + msg
}

var unknownAnchor = regexp.MustCompile(`^unknown anchor '(.*)' referenced$`)

// undefinedAliasAt finds the alias the library names in "unknown anchor 'x'
// referenced", which it reports without a line. Each "*x" in the file is a
// candidate (it may be inside a comment or a quoted string); the first one
// whose renaming makes the library name the new name instead is the alias.
func undefinedAliasAt(data []byte, msg string) (int, int, bool) {
	m := unknownAnchor.FindStringSubmatch(msg)
	if m == nil || m[1] == "" {
		return 0, 0, false
	}
	alias := []byte("*" + m[1])
	renamed := "*" + strings.Repeat("q", utf8.RuneCountInString(m[1]))
	if renamed[1:] == m[1] {
		renamed = "*" + strings.Repeat("z", utf8.RuneCountInString(m[1]))
	}
	for from := 0; ; {
		i := bytes.Index(data[from:], alias)
		if i < 0 {
			return 0, 0, false
		}
		at := from + i
		probe := append(append(append([]byte(nil), data[:at]...), renamed...), data[at+len(alias):]...)
		if _, err := decodeYAML(probe); err != nil && strings.Contains(err.Error(), "'"+renamed[1:]+"'") {
			line := bytes.Count(data[:at], []byte("\n")) + 1
			col := utf8.RuneCount(data[bytes.LastIndexByte(data[:at], '\n')+1:at]) + 1
			return line, col, true
		}
		from = at + len(alias)
	}
}

// controlCharacterAt finds the first character the YAML reader refuses (YAML
// 1.2 §5.1: only tab, line feed, carriage return, printable ASCII, NEL and
// U+00A0 onwards, without U+FFFE and U+FFFF), which the library reports
// without a position. data is valid UTF-8.
func controlCharacterAt(data []byte) (line, col int, r rune, found bool) {
	line, col = 1, 1
	for _, r := range string(data) {
		switch {
		case r == '\n':
			line, col = line+1, 1
			continue
		case r == '\t' || r == '\r' || (r >= 0x20 && r <= 0x7E) || r == 0x85 || (r >= 0xA0 && r <= 0xD7FF) ||
			(r >= 0xE000 && r <= 0xFFFD) || r >= 0x10000:
		default:
			return line, col, r, true
		}
		col++
	}
	return 0, 0, 0, false
}
