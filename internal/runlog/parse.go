package runlog

import (
	"math"
	"strconv"
	"time"
)

// The field parsers here are hand-written for speed (a recorded year is some
// 30 million rows); FuzzRunReader checks them against strconv.ParseFloat and
// time.Parse on the same input, so they accept exactly what those accept
// within the grammar documented on each.

// pow10 holds the powers of ten that are exact in float64.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseNumber reads a decimal number:
//
//	[+|-] digits [mark digits] [(e|E) [+|-] digits]
//
// with at least one digit before or after the decimal mark, which is '.' or,
// with decimalComma, ','. Hexadecimal, "Inf", "NaN", digit separators and
// values beyond float64 are refused. The value is the one strconv.ParseFloat
// gives for the same text (with '.' as the mark): when the digits fit in 2⁵³
// and the power of ten is exact, one multiplication or division rounds
// correctly (Clinger 1990, the fast path); anything else goes to strconv.
//
// References: W. D. Clinger, "How to read floating point numbers accurately",
// PLDI 1990.
func parseNumber(b []byte, decimalComma bool) (float64, bool) {
	v, n, ok := scanNumber(b, decimalComma)
	return v, ok && n == len(b)
}

// scanNumber reads the longest number (the grammar of parseNumber) at the
// start of b and says how many bytes it took; the row fast path reads a
// field this way and then expects the separator.
func scanNumber(b []byte, decimalComma bool) (v float64, n int, ok bool) {
	mark := byte('.')
	if decimalComma {
		mark = ','
	}
	i, neg := 0, false
	if len(b) > 0 && (b[0] == '+' || b[0] == '-') {
		neg = b[0] == '-'
		i = 1
	}
	// mant collects every digit, leading zeros included; more than 19 of
	// them may overflow it, and then strconv reads the text instead.
	var mant uint64
	nd, exp := 0, 0
	for ; i < len(b); i++ {
		c := b[i] - '0'
		if c > 9 {
			break
		}
		mant = mant*10 + uint64(c)
		nd++
	}
	if i < len(b) && b[i] == mark {
		i++
		intDigits := nd
		for ; i < len(b); i++ {
			c := b[i] - '0'
			if c > 9 {
				break
			}
			mant = mant*10 + uint64(c)
			nd++
		}
		exp = intDigits - nd
	}
	if nd == 0 {
		return 0, 0, false
	}
	if i < len(b) && (b[i] == 'e' || b[i] == 'E') {
		j := i + 1
		eneg := false
		if j < len(b) && (b[j] == '+' || b[j] == '-') {
			eneg = b[j] == '-'
			j++
		}
		start, e := j, 0
		for ; j < len(b); j++ {
			c := b[j] - '0'
			if c > 9 {
				break
			}
			if e < 100000 {
				e = e*10 + int(c)
			}
		}
		if j > start { // else the number ends before the 'e'
			if eneg {
				e = -e
			}
			exp += e
			i = j
		}
	}
	if nd <= 19 && mant < 1<<53 {
		f := float64(mant)
		ok := true
		switch {
		case mant == 0 || exp == 0:
		case exp > 0 && exp <= 22:
			f *= pow10[exp]
		case exp < 0 && exp >= -22:
			f /= pow10[-exp]
		default:
			ok = false
		}
		if ok {
			if neg {
				f = -f
			}
			return f, i, true
		}
	}
	v, ok = parseNumberSlow(b[:i], mark)
	return v, i, ok
}

// parseNumberSlow hands a number already checked against the grammar to
// strconv, with the decimal mark turned into '.'.
func parseNumberSlow(b []byte, mark byte) (float64, bool) {
	var buf [64]byte
	s := append(buf[:0], b...)
	if mark != '.' {
		for i, c := range s {
			if c == mark {
				s[i] = '.'
			}
		}
	}
	f, err := strconv.ParseFloat(string(s), 64)
	if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
		return 0, false
	}
	return f, true
}

// clock is a parsed date and time.
type clock struct {
	year, month, day, hour, min, sec, nsec int
	offset                                 int  // seconds east of UTC
	zoned                                  bool // the text carries Z or an offset
}

// parseClock reads an RFC 3339 date and time, with or without the offset:
//
//	YYYY-MM-DD (T|space) hh:mm:ss [(.|,) digits] [Z | (+|-) hh:mm]
//
// Ranges are those time.Parse applies to the same layout: month 1–12, the
// day within its month, hour 0–23, minute and second 0–59 (no leap second),
// offset hour up to 24 and minute up to 60; fraction digits past the ninth are
// dropped. It fills *c (a pointer rather than a returned value: copying the
// returned struct stalled on the stores just made, doubling the time).
func parseClock(b []byte, c *clock) bool {
	n, ok := scanClock(b, c)
	return ok && n == len(b)
}

// scanClock reads the date and time of parseClock at the start of b and
// says how many bytes it took (the row fast path then expects the
// separator).
func scanClock(b []byte, c *clock) (int, bool) {
	*c = clock{}
	if len(b) < 19 {
		return 0, false
	}
	_ = b[18]
	if b[4] != '-' || b[7] != '-' || (b[10] != 'T' && b[10] != ' ') || b[13] != ':' || b[16] != ':' {
		return 0, false
	}
	y0, y1, y2, y3 := b[0]-'0', b[1]-'0', b[2]-'0', b[3]-'0'
	mo0, mo1, d0, d1 := b[5]-'0', b[6]-'0', b[8]-'0', b[9]-'0'
	h0, h1, mi0, mi1, s0, s1 := b[11]-'0', b[12]-'0', b[14]-'0', b[15]-'0', b[17]-'0', b[18]-'0'
	if y0 > 9 || y1 > 9 || y2 > 9 || y3 > 9 || mo0 > 9 || mo1 > 9 || d0 > 9 || d1 > 9 ||
		h0 > 9 || h1 > 9 || mi0 > 9 || mi1 > 9 || s0 > 9 || s1 > 9 {
		return 0, false
	}
	c.year = int(y0)*1000 + int(y1)*100 + int(y2)*10 + int(y3)
	c.month, c.day = int(mo0)*10+int(mo1), int(d0)*10+int(d1)
	c.hour, c.min, c.sec = int(h0)*10+int(h1), int(mi0)*10+int(mi1), int(s0)*10+int(s1)
	if c.month < 1 || c.month > 12 || c.day < 1 || c.day > daysIn(c.month, c.year) ||
		c.hour > 23 || c.min > 59 || c.sec > 59 {
		return 0, false
	}
	i := 19
	if i+1 < len(b) && (b[i] == '.' || b[i] == ',') && b[i+1]-'0' <= 9 {
		i++
		n := 0
		for ; i < len(b); i++ {
			d := b[i] - '0'
			if d > 9 {
				break
			}
			if n < 9 {
				c.nsec = c.nsec*10 + int(d)
				n++
			}
		}
		for ; n < 9; n++ {
			c.nsec *= 10
		}
	}
	switch {
	case i == len(b):
		return i, true
	case b[i] == 'Z':
		c.zoned = true
		return i + 1, true
	case (b[i] == '+' || b[i] == '-') && i+6 <= len(b) && b[i+3] == ':':
		h, okh := digitsAt(b, i+1, 2)
		m, okm := digitsAt(b, i+4, 2)
		if !okh || !okm || h > 24 || m > 60 {
			return 0, false
		}
		c.offset = (h*60 + m) * 60
		if b[i] == '-' {
			c.offset = -c.offset
		}
		c.zoned = true
		return i + 6, true
	}
	return i, true
}

// digitsAt reads n decimal digits at b[at:].
func digitsAt(b []byte, at, n int) (int, bool) {
	v := 0
	for _, c := range b[at : at+n] {
		if c < '0' || c > '9' {
			return 0, false
		}
		v = v*10 + int(c-'0')
	}
	return v, true
}

func daysIn(month, year int) int {
	switch month {
	case 2:
		if year%4 == 0 && (year%100 != 0 || year%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// daysFromCivil is the number of days from 1970-01-01 to the given date of
// the proleptic Gregorian calendar.
//
// References: H. Hinnant, "chrono-Compatible Low-Level Date Algorithms",
// days_from_civil (2013).
func daysFromCivil(y, m, d int) int64 {
	if m <= 2 {
		y--
	}
	era := y / 400
	if y < 0 && y%400 != 0 {
		era--
	}
	yoe := y - era*400
	mp := (m + 9) % 12
	doy := (153*mp+2)/5 + d - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return int64(era)*146097 + int64(doe) - 719468
}

// unix gives the clock's instant as whole seconds since 1970-01-01 UTC (the
// fraction is c.nsec). A time without an offset is read in loc, exactly as
// time.Date reads it (in a repeated hour at the end of daylight saving time
// time.Date picks one of the two instants; a recorder writing local times
// without offset cannot say which).
func (c clock) unix(loc *time.Location) int64 {
	if c.zoned || loc == time.UTC {
		return daysFromCivil(c.year, c.month, c.day)*86400 + int64(c.hour*3600+c.min*60+c.sec) - int64(c.offset)
	}
	return time.Date(c.year, time.Month(c.month), c.day, c.hour, c.min, c.sec, 0, loc).Unix()
}

// parseFlag reads the flow-diversion position: 1, true or forward for
// forward flow; 0, false or divert for diverted flow; any case.
func parseFlag(b []byte) (forward, ok bool) {
	forward, n, ok := scanFlag(b)
	return forward, ok && n == len(b)
}

// flagWords are the words of parseFlag and the position each means.
var flagWords = [...]struct {
	word    string
	forward bool
}{{"1", true}, {"0", false}, {"true", true}, {"false", false}, {"forward", true}, {"divert", false}}

// scanFlag reads a word of parseFlag at the start of b and says how many
// bytes it took. No word is the start of another, so the first that fits is
// the only one.
func scanFlag(b []byte) (forward bool, n int, ok bool) {
	if len(b) > 0 { // the common case first: "1" and "0" begin no other word
		switch b[0] {
		case '1':
			return true, 1, true
		case '0':
			return false, 1, true
		}
	}
	for _, w := range flagWords {
		if len(b) >= len(w.word) && equalFold(b[:len(w.word)], w.word) {
			return w.forward, len(w.word), true
		}
	}
	return false, 0, false
}

// equalFold compares ASCII text ignoring case; lower is lower-case.
func equalFold(b []byte, lower string) bool {
	if len(b) != len(lower) {
		return false
	}
	for i, c := range b {
		if 'A' <= c && c <= 'Z' {
			c += 'a' - 'A'
		}
		if c != lower[i] {
			return false
		}
	}
	return true
}
