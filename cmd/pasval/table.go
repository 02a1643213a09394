package main

import (
	"fmt"
	"io"
	"pasval/internal/present"
	"strings"
	"unicode/utf8"
)

// table prints aligned columns; numbers right-aligned, text left-aligned.
type table struct {
	headers []string
	right   []bool
	rows    [][]string
	colour  bool // paint PASS green and FAIL red (terminals only)
}

func newTable(headers ...string) *table {
	t := &table{right: make([]bool, len(headers))}
	for i, h := range headers {
		// a leading '>' marks a right-aligned column
		if strings.HasPrefix(h, ">") {
			t.right[i] = true
			h = h[1:]
		}
		t.headers = append(t.headers, h)
	}
	return t
}

func (t *table) add(cells ...string) { t.rows = append(t.rows, cells) }

// tableOf lays a shared grid out for the terminal.
func tableOf(g present.Grid) *table {
	t := &table{headers: g.Headers, right: g.Right, rows: g.Rows}
	return t
}

func (t *table) write(w io.Writer) {
	width := make([]int, len(t.headers))
	for i, h := range t.headers {
		width[i] = utf8.RuneCountInString(h)
	}
	for _, r := range t.rows {
		for i, c := range r {
			if i < len(width) {
				width[i] = max(width[i], utf8.RuneCountInString(c))
			}
		}
	}
	line := func(cells []string) {
		var b strings.Builder
		b.WriteString("  ")
		for i := range t.headers {
			c := ""
			if i < len(cells) {
				c = cells[i]
			}
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			last := i == len(t.headers)-1
			if t.colour {
				// after measuring, so that escape codes never upset the alignment
				switch c {
				case "PASS":
					c = "\x1b[32mPASS\x1b[0m"
				case "FAIL":
					c = "\x1b[1;31mFAIL\x1b[0m"
				}
			}
			switch {
			case t.right[i]:
				b.WriteString(pad + c)
			case last:
				b.WriteString(c)
			default:
				b.WriteString(c + pad)
			}
			if !last {
				b.WriteString("  ")
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
	line(t.headers)
	for _, r := range t.rows {
		line(r)
	}
}

// wrap breaks text into lines of at most width runes, each after the prefix.
func wrap(text, prefix string, width int) string {
	var b strings.Builder
	line := prefix
	for _, word := range strings.Fields(text) {
		if utf8.RuneCountInString(line)+1+utf8.RuneCountInString(word) > width && strings.TrimSpace(line) != "" {
			b.WriteString(strings.TrimRight(line, " ") + "\n")
			line = strings.Repeat(" ", utf8.RuneCountInString(prefix))
		}
		if strings.TrimSpace(line) != "" {
			line += " "
		}
		line += word
	}
	b.WriteString(line + "\n")
	return b.String()
}

// writeBare prints the rows without a header line (key–value blocks).
func (t *table) writeBare(w io.Writer) {
	width := 0
	for _, r := range t.rows {
		width = max(width, utf8.RuneCountInString(r[0]))
	}
	for _, r := range t.rows {
		fmt.Fprintf(w, "  %s%s  %s\n", r[0], strings.Repeat(" ", width-utf8.RuneCountInString(r[0])), r[1])
	}
}
