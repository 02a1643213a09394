package oneline

// Source of the expected sets: the Unicode Character Database as Go's unicode
// package carries it (category Cc, property Bidi_Control, categories Zl and Zp).

import (
	"fmt"
	"regexp"
	"strings"
	"testing"
	"unicode"
)

func TestRefusedIsTheDocumentedSet(t *testing.T) {
	re := regexp.MustCompile(Pattern)
	for r := rune(0); r <= unicode.MaxRune; r++ {
		if r >= 0xD800 && r <= 0xDFFF {
			continue // surrogates are not characters
		}
		want := unicode.Is(unicode.Cc, r) || unicode.Is(unicode.Bidi_Control, r) || unicode.In(r, unicode.Zl, unicode.Zp)
		if Refused(r) != want {
			t.Fatalf("Refused(%U) = %v, want %v", r, Refused(r), want)
		}
		if r < 0x3000 && re.MatchString("a"+string(r)+"b") == want {
			t.Fatalf("Pattern on %U: %v, want %v", r, !want, !want)
		}
	}
}

func TestFindAndEscape(t *testing.T) {
	for _, tc := range []struct {
		in      string
		pos     int
		r       rune
		escaped string
	}{
		{"Dairy\nResult: PASS", 6, '\n', `Dairy\u000AResult: PASS`},
		{"milk\x1b[2K", 5, 0x1b, `milk\u001B[2K`},
		{"test \u202Emilk", 6, 0x202E, `test \u202Emilk`},
		{"\u009b31m", 1, 0x9b, `\u009B31m`},
		{"a\x00b", 2, 0, `a\u0000b`},
		{"a\x7fb", 2, 0x7f, `a\u007Fb`},
		// Allowed: letters of any script, a soft hyphen, joiners in an emoji.
		{"Müller Käserei · 北海道 · ﻣﻦ · co\u00ADop · 👩\u200D🔬", 0, 0, ""},
	} {
		pos, r, bad := Find(tc.in)
		if pos != tc.pos || r != tc.r || bad != (tc.pos > 0) {
			t.Errorf("Find(%q) = %d %U %v, want %d %U", tc.in, pos, r, bad, tc.pos, tc.r)
		}
		want := tc.escaped
		if want == "" {
			want = tc.in
		}
		if got := Escape(tc.in); got != want {
			t.Errorf("Escape(%q) = %q, want %q", tc.in, got, want)
		}
		if got := EscapeLines(tc.in + "\n"); !strings.Contains(tc.in, "\n") && got != want+"\n" {
			t.Errorf("EscapeLines(%q) = %q, want %q", tc.in+"\n", got, want+"\n")
		}
		if bad && !strings.Contains(Describe(r), fmt.Sprintf("(%U)", r)) {
			t.Errorf("Describe(%U) = %q", r, Describe(r))
		}
	}
}
