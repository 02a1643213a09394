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
	mark := byte('.')
	if decimalComma {
		mark = ','
	}
	i, neg := 0, false
	if i < len(b) && (b[i] == '+' || b[i] == '-') {
		neg = b[i] == '-'
		i++
	}
	var mant uint64
	sig, exp, digits := 0, 0, 0
	many := false // more significant digits than mant holds
	for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
		digits++
		if sig < 19 {
			mant = mant*10 + uint64(b[i]-'0')
			if mant != 0 {
				sig++
			}
		} else {
			many = true
		}
	}
	if i < len(b) && b[i] == mark {
		i++
		for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
			digits++
			if sig < 19 {
				mant = mant*10 + uint64(b[i]-'0')
				if mant != 0 {
					sig++
				}
				exp--
			} else {
				many = true
			}
		}
	}
	if digits == 0 {
		return 0, false
	}
	if i < len(b) && (b[i] == 'e' || b[i] == 'E') {
		i++
		eneg := false
		if i < len(b) && (b[i] == '+' || b[i] == '-') {
			eneg = b[i] == '-'
			i++
		}
		start, e := i, 0
		for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
			if e < 100000 {
				e = e*10 + int(b[i]-'0')
			}
		}
		if i == start {
			return 0, false
		}
		if eneg {
			e = -e
		}
		exp += e
	}
	if i != len(b) {
		return 0, false
	}
	if !many && mant < 1<<53 {
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
			return f, true
		}
	}
	return parseNumberSlow(b, mark)
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
// dropped.
func parseClock(b []byte) (clock, bool) {
	var c clock
	if len(b) < 19 || b[4] != '-' || b[7] != '-' || (b[10] != 'T' && b[10] != ' ') || b[13] != ':' || b[16] != ':' {
		return c, false
	}
	var ok1, ok2, ok3, ok4, ok5, ok6 bool
	c.year, ok1 = digitsAt(b, 0, 4)
	c.month, ok2 = digitsAt(b, 5, 2)
	c.day, ok3 = digitsAt(b, 8, 2)
	c.hour, ok4 = digitsAt(b, 11, 2)
	c.min, ok5 = digitsAt(b, 14, 2)
	c.sec, ok6 = digitsAt(b, 17, 2)
	if !(ok1 && ok2 && ok3 && ok4 && ok5 && ok6) {
		return c, false
	}
	if c.month < 1 || c.month > 12 || c.day < 1 || c.day > daysIn(c.month, c.year) ||
		c.hour > 23 || c.min > 59 || c.sec > 59 {
		return c, false
	}
	i := 19
	if i+1 < len(b) && (b[i] == '.' || b[i] == ',') && b[i+1] >= '0' && b[i+1] <= '9' {
		i++
		n := 0
		for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
			if n < 9 {
				c.nsec = c.nsec*10 + int(b[i]-'0')
				n++
			}
		}
		for ; n < 9; n++ {
			c.nsec *= 10
		}
	}
	switch {
	case i == len(b):
		return c, true
	case b[i] == 'Z' && i+1 == len(b):
		c.zoned = true
		return c, true
	case (b[i] == '+' || b[i] == '-') && i+6 == len(b) && b[i+3] == ':':
		h, okh := digitsAt(b, i+1, 2)
		m, okm := digitsAt(b, i+4, 2)
		if !okh || !okm || h > 24 || m > 60 {
			return c, false
		}
		c.offset = (h*60 + m) * 60
		if b[i] == '-' {
			c.offset = -c.offset
		}
		c.zoned = true
		return c, true
	}
	return c, false
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

// seconds gives the clock's instant as seconds since 1970-01-01 UTC. A time
// without an offset is read in loc, exactly as time.Date reads it (in a
// repeated hour at the end of daylight saving time time.Date picks one of the
// two instants; a recorder writing local times without offset cannot say
// which).
func (c clock) seconds(loc *time.Location) float64 {
	var unix int64
	if c.zoned || loc == time.UTC {
		unix = daysFromCivil(c.year, c.month, c.day)*86400 + int64(c.hour*3600+c.min*60+c.sec) - int64(c.offset)
	} else {
		unix = time.Date(c.year, time.Month(c.month), c.day, c.hour, c.min, c.sec, 0, loc).Unix()
	}
	return float64(unix) + float64(c.nsec)*1e-9
}

// parseFlag reads the flow-diversion position: 1, true or forward for
// forward flow; 0, false or divert for diverted flow; any case.
func parseFlag(b []byte) (forward, ok bool) {
	switch len(b) {
	case 1:
		switch b[0] {
		case '1':
			return true, true
		case '0':
			return false, true
		}
	case 4:
		return true, equalFold(b, "true")
	case 5:
		return false, equalFold(b, "false")
	case 6:
		return false, equalFold(b, "divert")
	case 7:
		return true, equalFold(b, "forward")
	}
	return false, false
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
