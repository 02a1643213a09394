package units

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
)

// parseUnit evaluates a unit expression such as "Btu/(h*ft2*°F)" or "Pa*s^0.7".
//
// Grammar (left-associative, so "W/m2/K" is W/(m2·K)):
//
//	expr   = term { ("*" | "·" | "/" | juxtaposition) term }
//	term   = factor [ "^" number ]
//	factor = symbol [digits | ² | ³] | "(" expr ")"
//
// A symbol followed by digits is raised to that power ("m2", "ft3").
func parseUnit(s string) (factor float64, dim Dim, us bool, err error) {
	p := &unitParser{src: []rune(s)}
	f, d, u, err := p.expr()
	if err != nil {
		return 0, Dim{}, false, err
	}
	p.skipSpace()
	if p.pos < len(p.src) {
		return 0, Dim{}, false, fmt.Errorf("unexpected %q in unit %q", string(p.src[p.pos]), s)
	}
	return f, d, u, nil
}

type unitParser struct {
	src   []rune
	pos   int
	depth int
}

const maxUnitDepth = 16

func (p *unitParser) skipSpace() {
	for p.pos < len(p.src) && unicode.IsSpace(p.src[p.pos]) {
		p.pos++
	}
}

func (p *unitParser) peek() rune {
	p.skipSpace()
	if p.pos >= len(p.src) {
		return 0
	}
	return p.src[p.pos]
}

func (p *unitParser) expr() (float64, Dim, bool, error) {
	f, d, us, err := p.term()
	if err != nil {
		return 0, Dim{}, false, err
	}
	for {
		r := p.peek()
		var div bool
		switch {
		case r == '*' || r == '·' || r == '⋅':
			p.pos++
		case r == '/':
			p.pos++
			div = true
		case r == '(' || isSymbolStart(r):
			// juxtaposition: "kg K" is kg·K
		default:
			return f, d, us, nil
		}
		f2, d2, us2, err := p.term()
		if err != nil {
			return 0, Dim{}, false, err
		}
		us = us || us2
		if div {
			f /= f2
			for i := range d {
				d[i] -= d2[i]
			}
		} else {
			f *= f2
			for i := range d {
				d[i] += d2[i]
			}
		}
	}
}

func (p *unitParser) term() (float64, Dim, bool, error) {
	f, d, us, err := p.factor()
	if err != nil {
		return 0, Dim{}, false, err
	}
	if p.peek() == '^' {
		p.pos++
		p.skipSpace()
		start := p.pos
		for p.pos < len(p.src) && strings.ContainsRune("+-.0123456789eE", p.src[p.pos]) {
			p.pos++
		}
		e, perr := strconv.ParseFloat(string(p.src[start:p.pos]), 64)
		if perr != nil || math.IsInf(e, 0) || math.IsNaN(e) || math.Abs(e) > 10 {
			return 0, Dim{}, false, fmt.Errorf("bad exponent %q", string(p.src[start:p.pos]))
		}
		f, d = power(f, d, e)
	}
	return f, d, us, nil
}

func power(f float64, d Dim, e float64) (float64, Dim) {
	for i := range d {
		d[i] *= e
	}
	return math.Pow(f, e), d
}

func isSymbolStart(r rune) bool {
	return unicode.IsLetter(r) || r == '°' || r == 'µ' || r == '℃' || r == '℉'
}

func (p *unitParser) factor() (float64, Dim, bool, error) {
	r := p.peek()
	if r == '(' {
		p.depth++
		if p.depth > maxUnitDepth {
			return 0, Dim{}, false, fmt.Errorf("unit nested too deeply")
		}
		p.pos++
		f, d, us, err := p.expr()
		if err != nil {
			return 0, Dim{}, false, err
		}
		if p.peek() != ')' {
			return 0, Dim{}, false, fmt.Errorf("missing ')' in unit")
		}
		p.pos++
		p.depth--
		return f, d, us, nil
	}
	if !isSymbolStart(r) {
		if r == 0 {
			return 0, Dim{}, false, fmt.Errorf("unit ends too early")
		}
		return 0, Dim{}, false, fmt.Errorf("unexpected %q in unit", string(r))
	}
	start := p.pos
	for p.pos < len(p.src) && isSymbolStart(p.src[p.pos]) {
		p.pos++
	}
	name := string(p.src[start:p.pos])
	def, ok := table[name]
	if !ok {
		return 0, Dim{}, false, fmt.Errorf("unknown unit %q%s", name, suggestUnit(name))
	}
	f, d := def.factor, def.dim
	// trailing power: digits or superscripts
	ds := p.pos
	for p.pos < len(p.src) && p.src[p.pos] >= '0' && p.src[p.pos] <= '9' {
		p.pos++
	}
	if p.pos > ds {
		e, err := strconv.Atoi(string(p.src[ds:p.pos]))
		if err != nil || e < 1 || e > 4 {
			return 0, Dim{}, false, fmt.Errorf("bad power %q on %q", string(p.src[ds:p.pos]), name)
		}
		f, d = power(f, d, float64(e))
	} else if p.pos < len(p.src) && (p.src[p.pos] == '²' || p.src[p.pos] == '³') {
		e := 2.0
		if p.src[p.pos] == '³' {
			e = 3
		}
		p.pos++
		f, d = power(f, d, e)
	}
	return f, d, def.us, nil
}

func suggestUnit(name string) string {
	switch strings.ToLower(name) {
	case "c", "deg", "degree", "degrees", "celsius":
		return " (write °C or degC)"
	case "f", "fahrenheit":
		return " (write °F or degF)"
	case "sec", "secs", "second", "seconds":
		return " (write s)"
	case "mins", "minute", "minutes":
		return " (write min)"
	case "hrs", "hour", "hours":
		return " (write h)"
	case "lbs":
		return " (write lb)"
	case "liter", "litre", "liters", "litres":
		return " (write L)"
	case "pas":
		return " (write Pa*s)"
	case "mpas":
		return " (write mPa*s)"
	}
	return ""
}
