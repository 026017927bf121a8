package lsp

import (
	"sort"
	"strings"
	"unicode/utf16"
	"unicode/utf8"

	"go.lsp.dev/protocol"
)

// text is a document's content with the start of each line, for turning
// byte offsets into LSP positions and back.
type text struct {
	src   []byte
	lines []int // byte offset of the start of each line
	utf8  bool  // positions count bytes (negotiated) rather than UTF-16 units
}

func newText(src []byte, utf8Positions bool) *text {
	t := &text{src: src, lines: []int{0}, utf8: utf8Positions}
	for i, c := range src {
		if c == '\n' {
			t.lines = append(t.lines, i+1)
		}
	}
	return t
}

// lineEnd returns the offset of the end of line l (0-based), before its
// newline.
func (t *text) lineEnd(l int) int {
	if l+1 < len(t.lines) {
		return t.lines[l+1] - 1
	}
	return len(t.src)
}

// position returns the LSP position of byte offset off, clamped to the
// text.
func (t *text) position(off int) protocol.Position {
	off = min(max(off, 0), len(t.src))
	l := sort.Search(len(t.lines), func(i int) bool { return t.lines[i] > off }) - 1
	l = max(l, 0)
	start := t.lines[l]
	if t.utf8 {
		return protocol.Position{Line: uint32(l), Character: uint32(off - start)}
	}
	return protocol.Position{Line: uint32(l), Character: uint32(utf16Len(t.src[start:off]))}
}

// offset returns the byte offset of an LSP position, clamped to its line
// and to the text.
func (t *text) offset(p protocol.Position) int {
	l := int(p.Line)
	if l >= len(t.lines) {
		return len(t.src)
	}
	start, end := t.lines[l], t.lineEnd(l)
	if t.utf8 {
		return min(start+int(p.Character), end)
	}
	units := int(p.Character)
	i := start
	for i < end && units > 0 {
		r, size := utf8.DecodeRune(t.src[i:end])
		n := 1
		if r != utf8.RuneError || size > 1 {
			n = utf16.RuneLen(r)
			if n < 1 {
				n = 1
			}
		}
		units -= n
		i += size
	}
	return i
}

func (t *text) rangeOf(from, to int) protocol.Range {
	return protocol.Range{Start: t.position(from), End: t.position(max(to, from))}
}

// utf16Len counts the UTF-16 code units of b; a byte that is not UTF-8
// counts as one.
func utf16Len(b []byte) int {
	n := 0
	for len(b) > 0 {
		r, size := utf8.DecodeRune(b)
		if r == utf8.RuneError && size <= 1 {
			n++
		} else if utf16.RuneLen(r) == 2 {
			n += 2
		} else {
			n++
		}
		b = b[size:]
	}
	return n
}

// valid returns s with any bytes that are not UTF-8 replaced: the
// protocol's JSON carries only valid UTF-8, and names and messages quote
// files that may hold anything.
func valid(s string) string { return strings.ToValidUTF8(s, "\uFFFD") }
