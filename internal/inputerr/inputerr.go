// Package inputerr is the one error type for problems in what a user gave
// pasval: a plant file, a recorded-run file, a command-line value. Each error
// names the file, the line and column when there is one, the field (a plant
// file's dotted path such as "cooling[1].medium_inlet", or a CSV column name),
// and says what was expected, like encoding/csv's ParseError.
//
//	err := inputerr.List{inputerr.At(inputerr.Pos{File: "line2.yaml", Line: 11, Column: 3},
//		"process.hold_setpoint", "expected a temperature such as 72 °C, found %q", "72")}
//	fmt.Println(err) // line2.yaml:11:3: process.hold_setpoint: expected a temperature …
//
// The command line maps any List to exit status 2 and prints one line per
// entry; nothing else prints these errors.
package inputerr

import (
	"fmt"
	"strings"

	"pasval/internal/oneline"
)

// Pos is a place in an input file. Line 0 means "the file as a whole" (it
// could not be read, or the problem has no line): String then prints the file
// alone, never a fake position such as FILE:0:0.
type Pos struct {
	File         string
	Line, Column int // 1-based; Column 0 when only the line is known
}

func (p Pos) String() string {
	switch {
	case p.Line <= 0:
		return p.File
	case p.Column <= 0:
		return fmt.Sprintf("%s:%d", p.File, p.Line)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Column)
}

// Error is one problem in an input.
type Error struct {
	Pos   Pos
	Field string // dotted path or column name; empty for the whole file
	Msg   string // what was expected and what was found
}

// At builds an Error; format and args make the message.
func At(pos Pos, field, format string, args ...any) *Error {
	return &Error{Pos: pos, Field: field, Msg: fmt.Sprintf(format, args...)}
}

// Error prints the position, field and message on one line; any control,
// separator or bidirectional formatting character in them (a key, a file name
// or a value quoted from the input) is written as \uXXXX, never raw.
func (e *Error) Error() string {
	if e.Field == "" {
		return oneline.Escape(fmt.Sprintf("%s: %s", e.Pos, e.Msg))
	}
	return oneline.Escape(fmt.Sprintf("%s: %s: %s", e.Pos, e.Field, e.Msg))
}

// List is every problem found in one input, in file order.
type List []*Error

func (l List) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}
