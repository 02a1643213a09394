package runlog

import "bytes"

// splitter cuts one line into fields, as encoding/csv would with the same
// separator (LazyQuotes off), except that a quoted field may not run past the
// end of its line: recorder exports never need that, and refusing it keeps
// every row on one line, so line numbers in messages are the editor's.
type splitter struct {
	sep    byte
	fields [][]byte // field contents, quotes removed
	starts []int    // byte offset of each field's first byte in the line
	buf    []byte   // unquoted contents of quoted fields
}

// splitError says what is wrong with a line and where (a byte offset).
type splitError struct {
	at  int
	msg string
}

// split fills s.fields and s.starts; the slices are valid until the next call.
func (s *splitter) split(line []byte) *splitError {
	s.fields, s.starts = s.fields[:0], s.starts[:0]
	if bytes.IndexByte(line, '"') < 0 {
		start := 0
		for {
			i := bytes.IndexByte(line[start:], s.sep)
			if i < 0 {
				s.fields = append(s.fields, line[start:])
				s.starts = append(s.starts, start)
				return nil
			}
			s.fields = append(s.fields, line[start:start+i])
			s.starts = append(s.starts, start)
			start += i + 1
		}
	}
	return s.splitQuoted(line)
}

// splitQuoted handles a line with a quote character in it: a field that
// starts with '"' runs to the next lone '"', inside which '""' is one quote
// and the separator is text; a quote anywhere else is an error.
func (s *splitter) splitQuoted(line []byte) *splitError {
	s.buf = s.buf[:0]
	// Contents of quoted fields go into s.buf; record offsets first and
	// slice at the end, since s.buf may move while it grows.
	type span struct{ from, to int }
	var quoted []span
	var kinds []bool // true: span in s.buf; false: span in line
	pos := 0
	for {
		start := pos
		if pos < len(line) && line[pos] == '"' {
			from := len(s.buf)
			pos++
			for {
				i := bytes.IndexByte(line[pos:], '"')
				if i < 0 {
					return &splitError{at: start, msg: "a quoted field runs past the end of the line (a line break inside quotes is not read)"}
				}
				s.buf = append(s.buf, line[pos:pos+i]...)
				pos += i + 1
				if pos < len(line) && line[pos] == '"' {
					s.buf = append(s.buf, '"')
					pos++
					continue
				}
				break
			}
			quoted = append(quoted, span{from, len(s.buf)})
			kinds = append(kinds, true)
			s.starts = append(s.starts, start)
			if pos == len(line) {
				break
			}
			if line[pos] != s.sep {
				return &splitError{at: pos, msg: `unexpected text after a closing quote (write a quote inside a quoted field as "")`}
			}
			pos++
			continue
		}
		i := bytes.IndexByte(line[pos:], s.sep)
		end := len(line)
		if i >= 0 {
			end = pos + i
		}
		if q := bytes.IndexByte(line[pos:end], '"'); q >= 0 {
			return &splitError{at: pos + q, msg: `a quote inside a field that does not start with one (quote the whole field and write the quote as "")`}
		}
		quoted = append(quoted, span{pos, end})
		kinds = append(kinds, false)
		s.starts = append(s.starts, start)
		if i < 0 {
			break
		}
		pos = end + 1
	}
	for k, sp := range quoted {
		if kinds[k] {
			s.fields = append(s.fields, s.buf[sp.from:sp.to])
		} else {
			s.fields = append(s.fields, line[sp.from:sp.to])
		}
	}
	return nil
}

// trim removes the spaces (and tabs, unless tab separates fields) around a
// field.
func (s *splitter) trim(b []byte) []byte {
	for len(b) > 0 && (b[0] == ' ' || (b[0] == '\t' && s.sep != '\t')) {
		b = b[1:]
	}
	for len(b) > 0 && (b[len(b)-1] == ' ' || (b[len(b)-1] == '\t' && s.sep != '\t')) {
		b = b[:len(b)-1]
	}
	return b
}

// detectSeparator picks the separator the header line uses most, outside
// quotes, among ',', ';' and tab; ok is false when none occurs or two tie.
func detectSeparator(header []byte) (sep byte, ok bool) {
	var n [3]int
	in := false
	for _, c := range header {
		switch {
		case c == '"':
			in = !in
		case in:
		case c == ',':
			n[0]++
		case c == ';':
			n[1]++
		case c == '\t':
			n[2]++
		}
	}
	seps := [3]byte{',', ';', '\t'}
	best, tie := 0, false
	for i := 1; i < 3; i++ {
		switch {
		case n[i] > n[best]:
			best, tie = i, false
		case n[i] == n[best]:
			tie = true
		}
	}
	if n[best] == 0 || tie {
		return 0, false
	}
	return seps[best], true
}
