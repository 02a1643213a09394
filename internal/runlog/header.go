package runlog

import (
	"bytes"
	"fmt"
	"math"
	"strings"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// readHeader reads the header line: separator, columns, units.
func (r *Reader) readHeader() error {
	line, ok := r.readLine()
	if !ok {
		if len(r.err) > 0 {
			return r.err
		}
		return r.listAt(inputerr.Pos{File: r.name, Line: r.line + 1, Column: 1}, "", "expected a header row naming the columns (%s), found the end of the file: the file is empty", standardNames())
	}
	r.header = r.line
	line = bytes.TrimPrefix(line, []byte("\xef\xbb\xbf"))
	sp := splitter{sep: r.opt.Separator}
	if sp.sep == 0 {
		sep, ok := detectSeparator(line)
		if !ok {
			return r.listAt(inputerr.Pos{File: r.name, Line: r.line, Column: 1}, "", "cannot tell the separator from the header %q: expected columns (%s) separated by ',', ';' or tabs; give %s if the header uses several", clip(line), standardNames(), FlagSeparator)
		}
		sp.sep = sep
	}
	r.cfg.sep = sp.sep
	if sp.sep == ',' && r.opt.DecimalComma {
		return r.listAt(inputerr.Pos{File: r.name, Line: r.line, Column: 1}, "", "the header is separated by ',', which cannot go with decimal commas: export with ';' or tabs between columns, or read without %s", FlagDecimalComma)
	}
	if serr := sp.split(line, true); serr != nil {
		return r.listAt(r.cfg.pos(r.line, serr.at), "", "in the header: %s", serr.msg)
	}
	r.cfg.nfields = sp.n
	cols := r.opt.columns()
	r.found = make([]Found, len(cols))
	var errs inputerr.List
	names := make([]string, r.cfg.nfields)
	for i := range names {
		names[i] = string(trim(sp.field(i), sp.sep))
	}
	for c, col := range cols {
		want := r.opt.headerName(col)
		r.found[c] = Found{Key: col.Key, Index: -1}
		for i, h := range names {
			name, unit, hasUnit := splitHeader(h)
			if !strings.EqualFold(name, want) {
				continue
			}
			if r.found[c].Index >= 0 {
				errs = append(errs, inputerr.At(r.cfg.pos(r.line, sp.start(i)), col.Key, "a second column named %q (the first is column %d): keep one", name, r.found[c].Index+1))
				continue
			}
			r.found[c] = Found{Key: col.Key, Header: h, Index: i}
			if err := r.setUnit(&r.found[c], col, unit, hasUnit, sp.start(i)); err != nil {
				errs = append(errs, err)
			}
		}
		if r.found[c].Index < 0 && col.Required {
			errs = append(errs, inputerr.At(inputerr.Pos{File: r.name, Line: r.line, Column: 1}, col.Key,
				"the header has no column %q (it has %s); name the file's column for it with %s %s=NAME", want, quoteList(names), FlagColumns, col.Key))
		}
	}
	if len(errs) > 0 {
		return errs
	}
	r.cfg.timeField, r.cfg.flagField = r.found[0].Index, r.found[3].Index
	r.cfg.timeUnit, r.cfg.timeScale = r.found[0].Unit, 1
	if r.cfg.timeUnit != "" {
		r.cfg.timeScale = r.found[0].Scale
	}
	for c, col := range cols {
		if col.Role != RoleNumber || r.found[c].Index < 0 {
			continue
		}
		n := numField{field: r.found[c].Index, key: col.Key, scale: r.found[c].Scale, offset: r.found[c].Offset,
			optional: !col.Required, temp: r.found[c].Kind == units.Temperature}
		switch {
		case c >= len(Standard):
			n.target = c - len(Standard)
		case col.Key == KeyTemperature:
			n.target = targetTemperature
		case col.Key == KeyFlow:
			n.target = targetFlow
		default:
			panic(panicPrefix + "a standard numeric column without a Record field: " + col.Key)
		}
		r.cfg.numeric = append(r.cfg.numeric, n)
	}
	r.cfg.setRoles()
	if r.cfg.nOptional > 0 {
		r.cfg.noOptional = make([]float64, r.cfg.nOptional)
		for c := range r.opt.Optional {
			if r.found[len(Standard)+c].Index >= 0 {
				r.cfg.noOptional = nil // some are read: each record has its own
				break
			}
		}
		for i := range r.cfg.noOptional {
			r.cfg.noOptional[i] = math.NaN()
		}
	}
	return nil
}

// setUnit settles a column's unit from its header and the options.
func (r *Reader) setUnit(f *Found, col Column, unit string, hasUnit bool, at int) *inputerr.Error {
	pos := r.cfg.pos(r.line, at)
	switch col.Role {
	case RoleFlag:
		if hasUnit {
			return inputerr.At(pos, col.Key, "the forward/divert column takes no unit, found [%s]", unit)
		}
		return nil
	case RoleTime:
		// A unit is allowed for seconds-from-start times ("time [min]");
		// it is checked against the first row.
		if hasUnit {
			v, err := units.Parse("1 "+unit, units.Time)
			if err != nil {
				return inputerr.At(pos, col.Key, "the time column's unit [%s] is not a unit of time: write [s] or [min], or no unit for clock times", unit)
			}
			f.Unit, f.Kind, f.Scale = unit, units.Time, v.SI
		}
		return nil
	}
	opt := r.opt.fallbackUnit(col)
	if hasUnit && unit == "" {
		hasUnit = false
	}
	if !hasUnit && opt == "" {
		return inputerr.At(pos, col.Key, "no unit for %s: write it in the header, as %q, or give %s",
			col.Kinds[0].Name, col.Key+" ["+exampleUnit(col.Kinds[0])+"]", unitFlag(col))
	}
	use := unit
	if !hasUnit {
		use = opt
	}
	kind, scale, offset, err := converter(use, col.Kinds)
	if err != nil {
		names := make([]string, len(col.Kinds))
		for i, k := range col.Kinds {
			names[i] = k.Name
		}
		return inputerr.At(pos, col.Key, "[%s] is not a unit of %s: expected e.g. [%s]", use, strings.Join(names, " or "), exampleUnit(col.Kinds[0]))
	}
	if hasUnit && opt != "" {
		k2, s2, o2, err := converter(opt, col.Kinds)
		if err != nil || k2 != kind || !sameConversion(scale, offset, s2, o2) {
			return inputerr.At(pos, col.Key, "the header says [%s] but %s says %q: remove one", unit, unitFlag(col), opt)
		}
	}
	f.Unit, f.Kind, f.Scale, f.Offset = use, kind, scale, offset
	return nil
}

// unitFlag is the flag that gives a column's unit when its header has none
// (Options.fallbackUnit).
func unitFlag(c Column) string {
	for _, k := range c.Kinds {
		switch k {
		case units.Temperature:
			return FlagTemperatureUnit
		case units.VolumeFlow, units.MassFlow:
			return FlagFlowUnit
		}
	}
	panic(panicPrefix + "no unit flag for the column " + c.Key)
}

func exampleUnit(k units.Kind) string {
	switch k {
	case units.Temperature:
		return "°C"
	case units.VolumeFlow:
		return "L/h"
	}
	return units.DisplayUnit(k, units.SI)
}

func standardNames() string {
	names := make([]string, len(Standard))
	for i, c := range Standard {
		names[i] = c.Key
	}
	return strings.Join(names, ", ")
}

func quoteList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	return strings.Join(q, ", ")
}

func clip(b []byte) string {
	if len(b) > 80 {
		return string(b[:80]) + "…"
	}
	return string(b)
}
