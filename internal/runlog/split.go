package runlog

import "bytes"

// splitter cuts one line into fields, as encoding/csv would with the same
// separator (LazyQuotes off), except that a quoted field may not run past the
// end of its line: recorder exports never need that, and refusing it keeps
// every row on one line, so line numbers in messages are the editor's.
type splitter struct {
	sep byte
	n   int     // fields in the last line split
	src []byte  // the line, or the unquoted copy of a line with quotes
	st  []int32 // field i is src[st[i]:en[i]]
	en  []int32
	at  []int32 // byte offset of field i's first byte in the line
	buf []byte  // the unquoted copy
}

// splitError says what is wrong with a line and where (a byte offset).
type splitError struct {
	at  int
	msg string
}

// field is the i-th field of the last line split, quotes removed; valid
// until the next split.
func (s *splitter) field(i int) []byte { return s.src[s.st[i]:s.en[i]] }

// start is the byte offset of the i-th field in its line.
func (s *splitter) start(i int) int { return int(s.at[i]) }

// add records a field.
func (s *splitter) add(st, en, at int) {
	if s.n == len(s.st) {
		s.st, s.en, s.at = append(s.st, 0), append(s.en, 0), append(s.at, 0)
	}
	s.st[s.n], s.en[s.n], s.at[s.n] = int32(st), int32(en), int32(at)
	s.n++
}

// split cuts line into fields. quotes false promises that the line holds no
// quote character (the caller looked at a whole block of lines at once).
func (s *splitter) split(line []byte, quotes bool) *splitError {
	s.n = 0
	if !quotes || bytes.IndexByte(line, '"') < 0 {
		s.src = line
		start := 0
		for {
			i := bytes.IndexByte(line[start:], s.sep)
			if i < 0 {
				s.add(start, len(line), start)
				return nil
			}
			s.add(start, start+i, start)
			start += i + 1
		}
	}
	return s.splitQuoted(line)
}

// splitQuoted handles a line with a quote character in it: a field that
// starts with '"' runs to the next lone '"', inside which '""' is one quote
// and the separator is text; a quote anywhere else is an error. The fields'
// contents are copied, unquoted, into s.buf.
func (s *splitter) splitQuoted(line []byte) *splitError {
	s.buf = s.buf[:0]
	pos := 0
	for {
		start := pos
		from := len(s.buf)
		if pos < len(line) && line[pos] == '"' {
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
			s.add(from, len(s.buf), start)
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
		s.buf = append(s.buf, line[pos:end]...)
		s.add(from, len(s.buf), start)
		if i < 0 {
			break
		}
		pos = end + 1
	}
	s.src = s.buf
	return nil
}

// trim removes the spaces (and tabs, unless tab separates fields) around a
// field.
func trim(b []byte, sep byte) []byte {
	if len(b) > 0 && b[0] > ' ' && b[len(b)-1] > ' ' {
		return b
	}
	for len(b) > 0 && (b[0] == ' ' || (b[0] == '\t' && sep != '\t')) {
		b = b[1:]
	}
	for len(b) > 0 && (b[len(b)-1] == ' ' || (b[len(b)-1] == '\t' && sep != '\t')) {
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
