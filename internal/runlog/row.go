package runlog

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"time"

	"pasval/internal/inputerr"
)

// rowConfig is what parsing a data row needs; fixed once the header is read
// and the first row has settled the time format, then shared read-only by
// the parsing goroutines.
type rowConfig struct {
	name      string
	nfields   int
	sep       byte
	timeField int
	flagField int
	timeUnit  string  // a unit of time from the header, "" for none
	timeScale float64 // seconds per unit of a numeric time
	clock     bool    // times are RFC 3339 clock times
	// origin is the Unix second clock times count from (Record.Time): the
	// start of the first row's date, so that a time keeps its nanoseconds
	// in a float64 (Unix seconds in a float64 are rounded to 0.24 µs).
	origin    int64
	numeric   []numField
	roles     []fieldRole // per field of a line, for the fast path
	nOptional int
	// noOptional holds nOptional NaNs, shared by every record when the
	// header has none of the optional columns (nothing to store per row).
	noOptional   []float64
	decimalComma bool
	loc          *time.Location
}

// numField is a numeric column to convert.
type numField struct {
	field    int    // index in the line
	key      string // for messages
	target   int    // targetTemperature, targetFlow or the Optional index
	scale    float64
	offset   float64
	optional bool // empty cells read as NaN
	temp     bool // a temperature point: refuse below absolute zero
}

const (
	targetTemperature = -1
	targetFlow        = -2
)

// store puts a column's SI value where its target says in rec.
func (n *numField) store(rec *Record, si float64) {
	switch n.target {
	case targetTemperature:
		rec.Temperature = si
	case targetFlow:
		rec.Flow = si
	default:
		rec.Optional[n.target] = si
	}
}

// fieldRole is what a field of a line holds.
type fieldRole struct {
	kind fieldKind
	num  int // fieldNumber: index in rowConfig.numeric
}

type fieldKind uint8

const (
	fieldOther fieldKind = iota // a column the reader does not use
	fieldTime
	fieldFlag
	fieldNumber
)

// setRoles fills c.roles from the field indexes.
func (c *rowConfig) setRoles() {
	c.roles = make([]fieldRole, c.nfields)
	c.roles[c.timeField] = fieldRole{kind: fieldTime}
	c.roles[c.flagField] = fieldRole{kind: fieldFlag}
	for i, n := range c.numeric {
		c.roles[n.field] = fieldRole{kind: fieldNumber, num: i}
	}
}

func (c *rowConfig) pos(line, byteOffset int) inputerr.Pos {
	return inputerr.Pos{File: c.name, Line: line, Column: byteOffset + 1}
}

// parser parses rows; each parsing goroutine has its own.
type parser struct {
	cfg     *rowConfig
	sp      splitter
	lineLen int // bytes per line in the blocks so far, for sizing batches
	// The last date seen and its day number: consecutive rows share a date.
	dateY, dateM, dateD int
	dateDays            int64
	dateOK              bool
	// The minute of the last clock time read in UTC (sameMinute): its
	// first 17 bytes, as two little-endian words and a byte.
	minText0, minText8 uint64
	minText16          byte
	minBase            int64 // Unix seconds at the minute's start
	minZ               bool  // written with Z
	minOK              bool
}

func newParser(cfg *rowConfig) *parser {
	return &parser{cfg: cfg, sp: splitter{sep: cfg.sep}, lineLen: 32}
}

// rowResult is what parseRow says besides the record.
type rowResult struct {
	err      *inputerr.Error
	fatal    bool   // stops the reading whatever Options.SkipBadRows says
	timeCol  int    // byte offset of the time field
	timeText []byte // the time field, valid until the next call
	zoneLess bool   // a clock time without offset
}

// parseRow parses one data line (its number is line) into rec and says how
// in *res (a pointer, for the reason parseClock takes one). quotes says
// whether the line may hold a quote character.
func (p *parser) parseRow(line []byte, lineNo int, rec *Record, quotes bool, res *rowResult) {
	*res = rowResult{}
	c := p.cfg
	if serr := p.sp.split(line, quotes); serr != nil {
		res.err = inputerr.At(c.pos(lineNo, serr.at), "", "%s", serr.msg)
		return
	}
	if p.sp.n != c.nfields {
		res.err = p.fieldCountError(line, lineNo)
		return
	}
	rec.Line = lineNo

	// Time.
	tb := trim(p.sp.field(c.timeField), c.sep)
	res.timeCol, res.timeText = p.sp.start(c.timeField), tb
	if c.clock {
		if c.timeUnit != "" {
			res.err = inputerr.At(c.pos(lineNo, res.timeCol), KeyTime, "a clock time under a header with a unit of time [%s]: remove the unit", c.timeUnit)
			res.fatal = true
			return
		}
		var cl clock
		if !parseClock(tb, &cl) {
			res.err = inputerr.At(c.pos(lineNo, res.timeCol), KeyTime, "expected an RFC 3339 date and time such as 2026-03-14T06:00:00Z (as in the first row), found %q", clip(tb))
			return
		}
		res.zoneLess = !cl.zoned
		rec.Time = p.seconds(&cl)
	} else {
		v, ok := parseNumber(tb, c.decimalComma)
		if !ok {
			res.err = inputerr.At(c.pos(lineNo, res.timeCol), KeyTime, "expected seconds from the start as a number (as in the first row), found %q", clip(tb))
			return
		}
		rec.Time = v * c.timeScale
	}

	// Flag.
	fb := trim(p.sp.field(c.flagField), c.sep)
	fwd, ok := parseFlag(fb)
	if !ok {
		res.err = inputerr.At(c.pos(lineNo, p.sp.start(c.flagField)), KeyForward, "expected 1/0, true/false or forward/divert, found %q", clip(fb))
		return
	}
	rec.Forward = fwd

	// Numbers.
	for i := range c.numeric {
		n := &c.numeric[i]
		b := trim(p.sp.field(n.field), c.sep)
		var si float64
		if len(b) == 0 && n.optional {
			si = math.NaN()
		} else {
			v, ok := parseNumber(b, c.decimalComma)
			if !ok {
				res.err = p.numberError(n, b, lineNo)
				return
			}
			si = v*n.scale + n.offset
			if n.temp && si < -273.15 {
				res.err = inputerr.At(c.pos(lineNo, p.sp.start(n.field)), n.key, "%q is below absolute zero in this column's unit", clip(b))
				return
			}
		}
		n.store(rec, si)
	}
}

// fastRow parses the line at the start of data (the rest of a block) when
// it has the common shape — no quotes (the caller knows), no spaces around
// fields, every field well-formed — straight into rec, reading each field
// where it starts instead of finding the line's end and splitting it first.
// It says how many bytes the line took with its line break ("\n" or
// "\r\n"; none for a last line without one). It says false whenever it is
// not sure, and then parseRow reads the line and gives any error; where it
// says true the values are those parseRow would give (the same field
// parsers, none of which reads a line break into a field; FuzzRunReader
// checks both paths).
func (p *parser) fastRow(data []byte, lineNo int, rec *Record, res *rowResult) (int, bool) {
	c := p.cfg
	*res = rowResult{}
	pos, last := 0, len(c.roles)-1
	for i, role := range c.roles {
		switch role.kind {
		case fieldNumber:
			n := &c.numeric[role.num]
			v, k, ok := scanNumber(data[pos:], c.decimalComma)
			if !ok {
				return 0, false
			}
			si := v*n.scale + n.offset
			if n.temp && si < -273.15 {
				return 0, false
			}
			n.store(rec, si)
			pos += k
		case fieldTime:
			tb := data[pos:]
			if c.clock {
				if c.timeUnit != "" {
					return 0, false
				}
				t, k, zoneLess, ok := p.sameMinute(tb)
				if !ok {
					var cl clock
					k, ok = scanClock(tb, &cl)
					// A fraction written "06:00:00,5" would take the
					// separator ',' into the time.
					if !ok || k > 19 && tb[19] == c.sep {
						return 0, false
					}
					t, zoneLess = p.seconds(&cl), !cl.zoned
					p.rememberMinute(tb, k, &cl)
				}
				rec.Time, res.zoneLess = t, zoneLess
				tb = tb[:k]
			} else {
				v, k, ok := scanNumber(tb, c.decimalComma)
				if !ok {
					return 0, false
				}
				rec.Time = v * c.timeScale
				tb = tb[:k]
			}
			res.timeCol, res.timeText = pos, tb
			pos += len(tb)
		case fieldFlag:
			fwd, k, ok := scanFlag(data[pos:])
			if !ok {
				return 0, false
			}
			rec.Forward = fwd
			pos += k
		default:
			pos = fieldEnd(data, pos, c.sep)
		}
		if i == last {
			break
		}
		if pos >= len(data) || data[pos] != c.sep {
			return 0, false
		}
		pos++
	}
	rec.Line = lineNo
	// The line ends here: at a line break, or at the end of the data (the
	// file's last line), a "\r" before either not being the line's.
	switch {
	case pos == len(data):
		return pos, true
	case data[pos] == '\n':
		return pos + 1, true
	case data[pos] == '\r' && (pos+1 == len(data) || data[pos+1] == '\n'):
		return min(pos+2, len(data)), true
	}
	return 0, false
}

// fieldEnd is the offset of the separator ending the field that starts at
// pos in data, or of the end of its line (the line break, less a "\r"
// before it; the end of data).
func fieldEnd(data []byte, pos int, sep byte) int {
	for i := pos; i < len(data); i++ {
		switch data[i] {
		case sep:
			return i
		case '\n':
			if i > pos && data[i-1] == '\r' {
				return i - 1
			}
			return i
		}
	}
	if n := len(data); n > pos && data[n-1] == '\r' {
		return n - 1
	}
	return len(data)
}

// seconds is a clock's instant in seconds since the file's origin
// (rowConfig.origin; see clock.unix), remembering the last date's day number.
func (p *parser) seconds(cl *clock) float64 {
	var unix int64
	if !cl.zoned && p.cfg.loc != time.UTC {
		unix = cl.unix(p.cfg.loc)
	} else {
		if !p.dateOK || cl.year != p.dateY || cl.month != p.dateM || cl.day != p.dateD {
			p.dateY, p.dateM, p.dateD, p.dateOK = cl.year, cl.month, cl.day, true
			p.dateDays = daysFromCivil(cl.year, cl.month, cl.day)
		}
		unix = p.dateDays*86400 + int64(cl.hour*3600+cl.min*60+cl.sec) - int64(cl.offset)
	}
	return float64(unix-p.cfg.origin) + float64(cl.nsec)*1e-9
}

// sameMinute reads a clock time in the minute of the last one
// rememberMinute kept, when it is written as that one was (the same first
// 17 bytes, "2026-03-14T06:00:", and then two digits of seconds and the
// same ending, Z or none): then only the seconds differ, and the time is
// the minute's start plus them, as scanClock and seconds would give it.
// ok is false for anything else, which the full parser then reads.
func (p *parser) sameMinute(tb []byte) (t float64, k int, zoneLess, ok bool) {
	if !p.minOK || len(tb) < 19 || binary.LittleEndian.Uint64(tb) != p.minText0 ||
		binary.LittleEndian.Uint64(tb[8:]) != p.minText8 || tb[16] != p.minText16 {
		return 0, 0, false, false
	}
	s0, s1 := tb[17]-'0', tb[18]-'0'
	if s0 > 5 || s1 > 9 {
		return 0, 0, false, false
	}
	if p.minZ {
		if len(tb) < 20 || tb[19] != 'Z' {
			return 0, 0, false, false
		}
		k = 20
	} else {
		// Zone-less, read in UTC: the time ends at the separator (a ','
		// followed by a digit is a fraction, which scanClock reads).
		sep := p.cfg.sep
		if len(tb) > 19 && (tb[19] != sep || sep == ',' && len(tb) > 20 && tb[20]-'0' <= 9) {
			return 0, 0, false, false
		}
		k = 19
	}
	unix := p.minBase + int64(s0)*10 + int64(s1)
	return float64(unix - p.cfg.origin), k, !p.minZ, true
}

// rememberMinute keeps the minute of a clock time that scanClock read as
// tb[:k] (cl), for sameMinute: one in UTC ('Z') or zone-less read in UTC,
// without a fraction. Others are not kept (a zone's change of offset need
// not fall on a minute).
func (p *parser) rememberMinute(tb []byte, k int, cl *clock) {
	z := k == 20 && tb[19] == 'Z'
	if cl.nsec != 0 || !(z || k == 19 && !cl.zoned && p.cfg.loc == time.UTC) {
		p.minOK = false
		return
	}
	p.minText0, p.minText8, p.minText16 = binary.LittleEndian.Uint64(tb), binary.LittleEndian.Uint64(tb[8:]), tb[16]
	p.minBase = cl.unix(time.UTC) - int64(cl.sec)
	p.minZ, p.minOK = z, true
}

func (p *parser) numberError(n *numField, b []byte, lineNo int) *inputerr.Error {
	c := p.cfg
	pos := c.pos(lineNo, p.sp.start(n.field))
	switch {
	case len(b) == 0:
		return inputerr.At(pos, n.key, "empty: expected a number")
	case !c.decimalComma && bytes.IndexByte(b, ',') >= 0:
		if _, ok := parseNumber(b, true); ok {
			how := "read it with " + FlagDecimalComma
			if c.sep == ',' {
				how = "export it with ';' or tabs between columns and read it with " + FlagDecimalComma
			}
			return inputerr.At(pos, n.key, "expected a number with '.' as the decimal mark, found %q: if the file is written with decimal commas, %s", clip(b), how)
		}
	case c.decimalComma && bytes.IndexByte(b, '.') >= 0:
		return inputerr.At(pos, n.key, "expected a number with ',' as the decimal mark, found %q ('.' could be a thousands separator)", clip(b))
	}
	return inputerr.At(pos, n.key, "expected a number, found %q", clip(b))
}

// fieldCountError explains a row with the wrong number of fields, naming
// another separator when the row seems to use it.
func (p *parser) fieldCountError(line []byte, lineNo int) *inputerr.Error {
	c := p.cfg
	got := p.sp.n
	for _, other := range []byte{',', ';', '\t'} {
		if other == c.sep {
			continue
		}
		if bytes.Count(line, []byte{other})+1 == c.nfields {
			// At the first of the other separators.
			return inputerr.At(c.pos(lineNo, bytes.IndexByte(line, other)), "", "%s where the header has %d: this row seems separated by %s, the header by %s (mixed separators)",
				fieldCount(got), c.nfields, sepName(other), sepName(c.sep))
		}
	}
	// At the first field too many, or at the end of the line where the
	// next field was expected.
	at := len(line)
	if got > c.nfields {
		at = p.sp.start(c.nfields)
	}
	return inputerr.At(c.pos(lineNo, at), "", "%s where the header has %d (separated by %s)", fieldCount(got), c.nfields, sepName(c.sep))
}

func fieldCount(n int) string {
	if n == 1 {
		return "1 field"
	}
	return fmt.Sprintf("%d fields", n)
}

func sepName(sep byte) string {
	if sep == '\t' {
		return "tabs"
	}
	return fmt.Sprintf("'%c'", sep)
}

// looksLikeClock is the rule by which the first row fixes the time format:
// a date has '-' after its four-digit year.
func looksLikeClock(tb []byte) bool { return len(tb) >= 5 && tb[4] == '-' }
