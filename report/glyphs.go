package report

import (
	"strings"
	"sync"

	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
)

var (
	glyphOnce sync.Once
	glyphFont *sfnt.Font
)

// printable replaces characters the embedded Go font has no glyph for (a
// site name in another script, say) with '?', so that the record never shows
// an empty box where a reader would expect text.
func printable(s string) string {
	glyphOnce.Do(func() {
		f, err := sfnt.Parse(goregular.TTF)
		if err == nil {
			glyphFont = f
		}
	})
	if glyphFont == nil {
		return s
	}
	var buf sfnt.Buffer
	ok := true
	for _, r := range s {
		if !has(&buf, r) {
			ok = false
			break
		}
	}
	if ok {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if has(&buf, r) {
			b.WriteRune(r)
		} else {
			b.WriteRune('?')
		}
	}
	return b.String()
}

func has(buf *sfnt.Buffer, r rune) bool {
	if r == '\n' || r == '\t' || r == ' ' {
		return true
	}
	gi, err := glyphFont.GlyphIndex(buf, r)
	return err == nil && gi != 0
}
