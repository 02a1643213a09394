package runlog

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
)

// FuzzRunReader compares the hand-written field splitter, number and time
// parsers with the standard library on the same input: encoding/csv for the
// fields, strconv.ParseFloat for numbers and time.Parse for times. Where the
// Reader accepts a row, the reference must accept it with bit-identical
// values; where it refuses one, the reference must refuse the same line.
// The grammar the Reader documents (two-digit clock fields, decimal numbers
// only) is applied to the reference as regular expressions, so what is
// compared is the parsing, not the choice of grammar.
//
//	go test ./internal/runlog/ -run '^$' -fuzz '^FuzzRunReader$' -fuzztime 10m
func FuzzRunReader(f *testing.F) {
	seeds := []string{
		base,
		"time;hold_outlet_temperature [°F];flow_rate [gpm];forward\n2026-03-14T06:00:00Z;163,04;44,02874;TRUE\n2026-03-14T06:00:01,5+01:00;162,32;44,1;divert\n",
		"\xef\xbb\xbf\"time\",\"hold_outlet_temperature [°C]\",\"flow_rate [L/h]\",\"forward\"\r\n\"2026-03-14T06:00:00Z\",\"72.8\",\"1e4\",\"1\"\r\n",
		"time\thold_outlet_temperature [K]\tflow_rate [kg/h]\tforward\n0\t345.95\t10310\t0\n1.5\t345.9\t10310.5\t1\n",
		"time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n2026-03-14 06:00:00,72.8,10000,1\n2026-03-14 06:00:00.999999999999,72.8,.5,Forward\n",
		"time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n2026-03-14T06:00:00Z,72.8,\"10,000\",1\n2026-03-14T06:00:01Z,\"7\"\"2\",1,0\n",
	}
	for i, s := range seeds {
		f.Add([]byte(s), uint8(i))
	}
	// Month ends, leap days, daylight-saving changes in Berlin (sel 16:
	// zone-less times read there), fractions and offsets at their limits.
	f.Add([]byte(hdr+"2024-02-29T23:59:59.999999999Z,72.8,10000,1\n2026-04-30T00:00:00+24:00,72.8,10000,1\n2026-12-31 23:59:59,5-00:30,72.8,10000,1\n"), uint8(0))
	f.Add([]byte(hdr+"2026-03-29 01:59:59,72.8,10000,1\n2026-03-29 02:30:00,72.8,10000,1\n2026-10-25 02:30:00,72.8,10000,1\n2026-10-25 03:00:00,72.8,10000,1\n"), uint8(16))
	// Rows in one minute written in every way (the parser's same-minute path).
	f.Add([]byte(hdr+"2026-03-14T06:00:00Z,72.8,10000,1\n2026-03-14T06:00:01Z,72.8,10000,1\n2026-03-14T06:00:02,72.8,10000,1\n"+
		"2026-03-14T06:00:03.5Z,72.8,10000,1\n2026-03-14T06:00:04+00:00,72.8,10000,1\n2026-03-14T06:00:65Z,72.8,10000,1\n"+
		"2026-03-14T06:00:05Zx,72.8,10000,1\n2026-03-14T06:00:06,5,72.8,10000,1\n2026-03-14T06:00:07,72.8,10000,1\n2026-03-14T06:01:00Z,72.8,10000,1\n"), uint8(0))
	f.Add([]byte(hdr+"2026-03-14 06:00:00,72.8,10000,1\n2026-03-14 06:00:01,72.8,10000,1\n2026-03-14 06:00:02Z,72.8,10000,1\n"), uint8(8))
	// Line ends the fast path reads itself: CRLF without quotes, mixed with
	// LF, a lone CR, blank lines and lines of a CR, the last line ending in
	// a CR or nothing; columns the reader does not use, first, between and
	// last; the time as the last column.
	f.Add([]byte(hdr+"2026-03-14T06:00:00Z,72.8,10000,1\r\n2026-03-14T06:00:01Z,72.9,10001.5,0\n\r\n\n2026-03-14T06:00:02Z,72.8\r,10000,1\r\r\n2026-03-14T06:00:03Z,72.8,10000,1\r"), uint8(0))
	f.Add([]byte(hdr+"2026-03-14T06:00:00Z,72.8,10000,1\n2026-03-14T06:00:01Z,72.9,10001.5,forward"), uint8(0))
	f.Add([]byte("note,time,hold_outlet_temperature [°C],x,flow_rate [L/h],forward,y\r\na,2026-03-14T06:00:00Z,72.8,b\r,10000,1,c\r\n,2026-03-14T06:00:01Z,72.8,,10000,1,\r\nz,2026-03-14T06:00:02Z,72.8,,10000,1,\n"), uint8(0))
	f.Add([]byte("forward;flow_rate [L/h];hold_outlet_temperature [°C];time\n1;10000;72,8;2026-03-14 06:00:00\r\n1;10000;72,8;2026-03-14 06:00:01\n0;10000;72,8;2026-03-14 06:00:02Z\r\n1;10000;72,8;2026-03-14 06:00:03\r"), uint8(5))
	f.Add([]byte("forward,flow_rate [L/h],hold_outlet_temperature [°C],time [s]\r\n1,10000,72.8,0\r\n1,10000,72.8,1.5e0\r\n1,10000,72.8,2e\r\n"), uint8(0))
	berlin, _ := time.LoadLocation("Europe/Berlin")
	f.Fuzz(func(t *testing.T, data []byte, sel uint8) {
		opt := Options{Separator: []byte{0, ',', ';', '\t'}[sel&3], DecimalComma: sel&4 != 0}
		switch {
		case sel&24 == 8:
			opt.Location = time.FixedZone("plus2", 7200)
		case sel&24 == 16 && berlin != nil:
			opt.Location = berlin
		}
		if opt.check() != nil {
			return
		}
		r, err := NewReader(bytes.NewReader(data), "f.csv", opt)
		if err != nil {
			return // a header the reader refuses: nothing to compare
		}
		var got []Record
		for r.Next() {
			got = append(got, *r.Record())
		}
		gotLine := errLine(r.Err())

		want, wantLine := referenceRead(t, data, r, opt)
		if len(got) != len(want) || gotLine != wantLine {
			t.Fatalf("reader: %d records, error at line %d (%v); reference: %d records, error at line %d", len(got), gotLine, r.Err(), len(want), wantLine)
		}
		for i := range want {
			g, w := got[i], want[i]
			// Bit-identical: the same text through two parsers.
			if g.Line != w.Line || g.Forward != w.Forward || math.Float64bits(g.Time) != math.Float64bits(w.Time) ||
				math.Float64bits(g.Temperature) != math.Float64bits(w.Temperature) || math.Float64bits(g.Flow) != math.Float64bits(w.Flow) {
				t.Fatalf("record %d: reader %+v, reference %+v", i, g, w)
			}
		}
	})
}

// errLine is the line of the error that stopped the reading; −1 for none.
func errLine(err error) int {
	if err == nil {
		return -1
	}
	s := err.Error()
	lines := strings.Split(s, "\n")
	last := lines[len(lines)-1]
	parts := strings.SplitN(last, ":", 3)
	if len(parts) < 2 {
		return 0
	}
	n, err := strconv.Atoi(parts[1])
	if err != nil {
		return 0
	}
	return n
}

var (
	refClock    = regexp.MustCompile(`^[0-9]{4}-[0-9]{2}-[0-9]{2}[T ][0-9]{2}:[0-9]{2}:[0-9]{2}([.,][0-9]+)?(Z|[+-][0-9]{2}:[0-9]{2})?$`)
	refNumDot   = regexp.MustCompile(`^[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?$`)
	refNumComma = regexp.MustCompile(`^[+-]?([0-9]+,?[0-9]*|,[0-9]+)([eE][+-]?[0-9]+)?$`)
)

// referenceRead reads data's rows with the standard library, taking the
// header's interpretation (separator, columns, units) from r.
func referenceRead(t *testing.T, data []byte, r *Reader, opt Options) ([]Record, int) {
	// encoding/csv skips blank lines itself; the byte-order mark at the
	// start of the header line is removed as the reader removes it.
	i := 0
	for {
		if bytes.HasPrefix(data[i:], []byte("\n")) {
			i++
		} else if bytes.HasPrefix(data[i:], []byte("\r\n")) {
			i += 2
		} else {
			break
		}
	}
	if bytes.HasPrefix(data[i:], []byte("\xef\xbb\xbf")) {
		data = append(append([]byte(nil), data[:i]...), data[i+3:]...)
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = rune(r.Separator())
	cr.FieldsPerRecord = -1
	header, err := cr.Read()
	if err != nil {
		t.Fatalf("the reader read a header that encoding/csv refuses: %v", err)
	}
	if len(header) != r.cfg.nfields {
		t.Fatalf("header: %d fields, encoding/csv %d", r.cfg.nfields, len(header))
	}
	cols := r.Columns()
	trim := " \t"
	if r.Separator() == '\t' {
		trim = " "
	}
	loc := opt.Location
	if loc == nil {
		loc = time.UTC
	}
	var recs []Record
	clock, decided := false, false
	prev := 0.0
	for {
		fields, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return recs, pe.StartLine
			}
			t.Fatalf("encoding/csv: %v", err)
		}
		line, _ := cr.FieldPos(0)
		endLine, _ := cr.FieldPos(len(fields) - 1)
		if endLine != line || strings.ContainsAny(strings.Join(fields, ""), "\n") {
			return recs, line // a quoted field across lines: refused by design
		}
		if len(fields) != r.cfg.nfields {
			return recs, line
		}
		rec := Record{Line: line}
		tf := strings.Trim(fields[cols[0].Index], trim)
		if !decided {
			clock, decided = len(tf) >= 5 && tf[4] == '-', true
			if clock && cols[0].Unit != "" {
				return recs, line
			}
		}
		if clock {
			if !refClock.MatchString(tf) {
				return recs, line
			}
			layout := "2006-01-02" + tf[10:11] + "15:04:05"
			var tm time.Time
			if z := tf[len(tf)-1]; z == 'Z' || tf[len(tf)-3] == ':' && (tf[len(tf)-6] == '+' || tf[len(tf)-6] == '-') {
				tm, err = time.Parse(layout+"Z07:00", tf)
			} else {
				tm, err = time.ParseInLocation(layout, tf, loc)
			}
			if err != nil {
				return recs, line
			}
			rec.Time = float64(tm.Unix()-r.Origin()) + float64(tm.Nanosecond())*1e-9
		} else {
			v, ok := refNumber(tf, opt.DecimalComma)
			if !ok {
				return recs, line
			}
			scale := 1.0
			if cols[0].Unit != "" {
				scale = cols[0].Scale
			}
			rec.Time = v * scale
		}
		switch strings.ToLower(strings.Trim(fields[cols[3].Index], trim)) {
		case "1", "true", "forward":
			rec.Forward = true
		case "0", "false", "divert":
		default:
			return recs, line
		}
		for _, c := range []struct {
			col  Found
			dst  *float64
			temp bool
		}{{cols[1], &rec.Temperature, true}, {cols[2], &rec.Flow, false}} {
			v, ok := refNumber(strings.Trim(fields[c.col.Index], trim), opt.DecimalComma)
			if !ok {
				return recs, line
			}
			*c.dst = v*c.col.Scale + c.col.Offset
			if c.temp && *c.dst < -273.15 {
				return recs, line
			}
		}
		if len(recs) > 0 && rec.Time < prev {
			return recs, line
		}
		prev = rec.Time
		recs = append(recs, rec)
	}
	if len(recs) == 0 {
		return recs, r.header + 1
	}
	return recs, -1
}

// refNumber checks the documented grammar and hands the text to strconv.
func refNumber(s string, comma bool) (float64, bool) {
	re := refNumDot
	if comma {
		re = refNumComma
	}
	if !re.MatchString(s) {
		return 0, false
	}
	v, err := strconv.ParseFloat(strings.Replace(s, ",", ".", 1), 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, false
	}
	return v, true
}
