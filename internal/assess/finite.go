package assess

import (
	"fmt"
	"math"
	"reflect"
	"strings"

	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

// Every number pasval prints, writes to JSON or draws in a record is finite.
// The reader keeps entered values within what pasval computes with, but a
// combination of them can still overflow (kinetics at absolute zero with a
// z of 1 K make the log reduction infinite). Such a result is never shown:
// the computation is refused, and the entered values that cause it are
// found by a sensitivity probe (docs/METHOD.md §19.4, results that are not finite):
//
//	an entered value is blamed when replacing it alone by the typical value
//	of its field (the field table's example: 71.7 °C for a D_temperature,
//	6.3 °C for a z) makes every number of the result finite.
//
// Each blamed value is reported at its line and field. The probe re-reads the
// plant file once per entered value, and runs only when a result is not
// finite. When no single value explains it, the error names the result that
// is not finite and the part of the plant file it comes from.

// nonFinite returns the path of the first number in v that is NaN or
// infinite: struct fields by their JSON names (Go names when they have
// none), list items by index, map entries by key. Functions, channels and
// the plant itself are not walked.
func nonFinite(v any) (string, bool) {
	return walkFinite(reflect.ValueOf(v), "")
}

var plantType = reflect.TypeOf(&plantfile.Plant{})

func walkFinite(v reflect.Value, path string) (string, bool) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			return path, true
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() && v.Type() != plantType {
			return walkFinite(v.Elem(), path)
		}
	case reflect.Struct:
		t := v.Type()
		for i := range t.NumField() {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			name := f.Name
			tag, _, _ := strings.Cut(f.Tag.Get("json"), ",")
			if tag == "-" {
				continue // never printed: the model behind the results may hold NaN for "not applicable"
			}
			if tag != "" {
				name = tag
			}
			if p, bad := walkFinite(v.Field(i), joinPath(path, name)); bad {
				return p, true
			}
		}
	case reflect.Slice, reflect.Array:
		for i := range v.Len() {
			if p, bad := walkFinite(v.Index(i), fmt.Sprintf("%s[%d]", path, i)); bad {
				return p, true
			}
		}
	case reflect.Map:
		iter := v.MapRange()
		for iter.Next() {
			if p, bad := walkFinite(iter.Value(), fmt.Sprintf("%s[%v]", path, iter.Key())); bad {
				return p, true
			}
		}
	}
	return "", false
}

func joinPath(path, name string) string {
	if path == "" {
		return name
	}
	return path + "." + name
}

// finiteOrTraced runs compute on p and returns its result when every number
// in it is finite; otherwise the positioned errors of the sensitivity probe.
func finiteOrTraced[T any](p *plantfile.Plant, compute func(*plantfile.Plant) (T, error)) (T, error) {
	r, err := compute(p)
	if err != nil {
		return r, err
	}
	where, bad := nonFinite(r)
	if !bad {
		return r, nil
	}
	var none T
	return none, traceNonFinite(p, where, func(q *plantfile.Plant) bool {
		r, err := compute(q)
		if err != nil {
			return false
		}
		_, bad := nonFinite(r)
		return !bad
	})
}

// traceNonFinite is the sensitivity probe: the entered values that, each
// replaced alone by its field's typical value, make the result finite.
func traceNonFinite(p *plantfile.Plant, where string, finiteWith func(*plantfile.Plant) bool) error {
	var list inputerr.List
	for _, in := range p.Inputs {
		f, ok := plantfile.Lookup(in.Field)
		if !ok || f.Example == "" || strings.TrimSpace(in.Text) == f.Example {
			continue
		}
		q, err := p.Replaced(in.Field, f.Example)
		if err != nil || !finiteWith(q) {
			continue
		}
		list = append(list, inputerr.At(in.Pos, in.Field,
			"%q leads to a result that is not a finite number (%s); with a typical value here (%s) every result is finite: check the number and its unit",
			in.Text, where, f.Example))
	}
	if len(list) > 0 {
		return list
	}
	return inputerr.List{inputerr.At(inputerr.Pos{File: p.File}, "",
		"the entered values lead to a result that is not a finite number (%s), and no single value explains it: check the magnitudes and units of the values it depends on", where)}
}
