// Package oneline decides what a line of free text from a plant file (a site,
// a product or organism name, a currency) may hold, so that no value can start
// a new line, move the cursor, change colours or reverse the order of what a
// terminal, a JSON reader or a PDF shows; a site name cannot print a second
// "Result: PASS" line above the real verdict.
//
//	if i, r, bad := oneline.Find("Dairy\nResult: PASS"); bad {
//		fmt.Printf("character %d is %s\n", i, oneline.Describe(r)) // character 6 is a line break (U+000A)
//	}
//
// Refused: every Unicode control character (category Cc: C0 U+0000–U+001F,
// which holds tab, line feed, carriage return and escape; DEL U+007F; C1
// U+0080–U+009F, which holds NEL and the single-byte CSI), the line and
// paragraph separators U+2028 and U+2029, and the bidirectional formatting
// characters U+061C, U+200E, U+200F, U+202A–U+202E and U+2066–U+2069 (Unicode
// UAX #9; the reordering behind CVE-2021-42574). Other format characters (soft
// hyphen, zero-width joiner and non-joiner) stay allowed: names in many
// scripts need them, and they move nothing.
package oneline

import (
	"fmt"
	"strings"
	"unicode"
)

// ranges are the refused runes, inclusive pairs.
var ranges = [][2]rune{
	{0x00, 0x1F}, {0x7F, 0x9F}, // Cc
	{0x2028, 0x2029},                   // line and paragraph separators
	{0x061C, 0x061C}, {0x200E, 0x200F}, // Arabic letter mark, LRM, RLM
	{0x202A, 0x202E}, {0x2066, 0x2069}, // embeddings and overrides, isolates
}

// Refused reports whether r may not appear in free text.
func Refused(r rune) bool {
	for _, g := range ranges {
		if r >= g[0] && r <= g[1] {
			return true
		}
	}
	return false
}

// Find returns the 1-based character position and the rune of the first
// refused character of s.
func Find(s string) (pos int, r rune, found bool) {
	for _, r := range s {
		pos++
		if Refused(r) {
			return pos, r, true
		}
	}
	return 0, 0, false
}

// Describe names a refused rune for a message: "a line break (U+000A)".
func Describe(r rune) string {
	var what string
	switch {
	case r == '\n':
		what = "a line break"
	case r == '\r':
		what = "a carriage return"
	case r == '\t':
		what = "a tab"
	case r == 0x1B:
		what = "an escape, which starts terminal control sequences"
	case r == 0x85 || r == 0x2028 || r == 0x2029:
		what = "a line or paragraph separator"
	case r >= 0x80 && r <= 0x9F:
		what = "a C1 control character"
	case unicode.Is(unicode.Bidi_Control, r):
		what = "a bidirectional formatting character, which reorders the text shown"
	default:
		what = "a control character"
	}
	return fmt.Sprintf("%s (%U)", what, r)
}

// Escape returns s with every refused rune written as \uXXXX, for
// diagnostics that quote what a user wrote.
func Escape(s string) string { return escape(s, false) }

// EscapeLines is Escape for text of several lines made by the program (JSON
// output): its line feeds are kept.
func EscapeLines(s string) string { return escape(s, true) }

func escape(s string, keepLines bool) string {
	if _, _, bad := Find(s); !bad {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if Refused(r) && !(keepLines && r == '\n') {
			fmt.Fprintf(&b, `\u%04X`, r)
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// Pattern is a regular expression (RE2 and ECMA-262 alike) that matches text
// with no refused rune, for the JSON Schema.
var Pattern = func() string {
	var b strings.Builder
	b.WriteString("^[^")
	for _, g := range ranges {
		b.WriteRune(g[0])
		if g[1] != g[0] {
			b.WriteByte('-')
			b.WriteRune(g[1])
		}
	}
	b.WriteString("]*$")
	return b.String()
}()
