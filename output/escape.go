package output

// escape.go: user text made safe for the line-oriented forms. File names,
// net names, titles and messages come from files that may be hostile: a
// newline in a name must not start a second finding, an escape sequence
// must not reach the terminal, and no line may begin with a CI system's
// workflow command ("::error file=…::"). JSON and SARIF are escaped by
// their encoder; Markdown puts user text in code spans (markdown.go).

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// TextSafe returns s with every control character (C0, DEL, C1), line or
// paragraph separator, bidirectional control and invalid byte shown as an
// escape (\n, \t, \x1b, \u202e, \xff), so that it prints as part of one
// line and changes nothing on a terminal. Other text is unchanged.
func TextSafe(s string) string {
	if plain(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && n == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x80 && unicode.IsControl(r):
			fmt.Fprintf(&b, `\x%02x`, r)
		case unsafeRune(r):
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}

// plain reports whether s is printable ASCII, the common case.
func plain(s string) bool {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c >= 0x7f {
			return false
		}
	}
	return true
}

// unsafeRune reports a rune past ASCII that can break a line or reorder
// what a reader sees.
func unsafeRune(r rune) bool {
	switch {
	case unicode.IsControl(r): // C1
		return true
	case r == 0x2028 || r == 0x2029: // line and paragraph separators
		return true
	case r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069, r == 0x200e, r == 0x200f, r == 0x061c:
		return true // bidirectional controls
	case r == 0x85 || r == 0xfeff:
		return true
	}
	return false
}

// PathSafe is TextSafe for a file name that may begin a line: a relative
// name that begins with "::" (which a CI log would take for a workflow
// command) is written "./::…", the same file.
func PathSafe(name string) string {
	name = TextSafe(name)
	if strings.HasPrefix(strings.TrimLeft(name, " \t"), "::") {
		return "./" + name
	}
	return name
}

// LineSafe is TextSafe for text that may begin a line and is not a path:
// a leading "::" is written "\x3a:".
func LineSafe(s string) string {
	s = TextSafe(s)
	if t := strings.TrimLeft(s, " "); strings.HasPrefix(t, "::") {
		i := len(s) - len(t)
		return s[:i] + `\x3a` + s[i+1:]
	}
	return s
}
