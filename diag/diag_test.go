package diag

import (
	"strings"
	"testing"
)

// Columns count bytes from 1, as the GNU Coding Standards' "Formatting
// Error Messages" section leaves to the tool and as Go's own tools do: an
// editor then lands on the same byte whatever precedes it on the line.
func TestPositionMultiByte(t *testing.T) {
	src := []byte("ground gnd\nresistor R1 (µ1, gnd) 4.7 kΩ\n# Ω comment\nwire W1 (a, b)")
	fs := NewFileSet()
	f := fs.AddFile("x.nodal", src)
	for _, c := range []struct {
		sub       string
		line, col int
	}{
		{"ground", 1, 1},
		{"gnd", 1, 8},
		{"µ1", 2, 14},    // after "resistor R1 (" = 13 bytes
		{", gnd", 2, 17}, // "µ" is two bytes
		{"4.7", 2, 24},
		{"kΩ", 2, 28},
		{"Ω comment", 3, 3},
		{"wire", 4, 1},
		{"b)", 4, 13},
	} {
		off := strings.Index(string(src), c.sub)
		p := fs.Position(f.Pos(off))
		if p.Line != c.line || p.Column != c.col || p.Filename != "x.nodal" {
			t.Errorf("%q at offset %d: got %s, want x.nodal:%d:%d", c.sub, off, p, c.line, c.col)
		}
	}
	// The end-of-file position is still inside the file.
	if p := fs.Position(f.Pos(len(src))); p.Line != 4 || p.Column != 15 {
		t.Errorf("end of file at %s; want 4:15", p)
	}
}

func TestFileSetSeveralFiles(t *testing.T) {
	fs := NewFileSet()
	a := fs.AddFile("a.nodal", []byte("one\ntwo\n"))
	b := fs.AddFile("b.nodal", []byte(""))
	c := fs.AddFile("c.nodal", []byte("x\ny"))
	if got := fs.Position(a.Pos(4)).String(); got != "a.nodal:2:1" {
		t.Errorf("a: %s", got)
	}
	if got := fs.Position(b.Pos(0)).String(); got != "b.nodal:1:1" {
		t.Errorf("empty file: %s", got)
	}
	if got := fs.Position(c.Pos(2)).String(); got != "c.nodal:2:1" {
		t.Errorf("c: %s", got)
	}
	if fs.File(NoPos) != nil || fs.Position(NoPos).IsValid() {
		t.Error("NoPos resolves to a file")
	}
	if got := (Position{}).String(); got != "-" {
		t.Errorf("zero position prints %q", got)
	}
}

func TestSortAndDedup(t *testing.T) {
	fs := NewFileSet()
	a := fs.AddFile("b.nodal", []byte("line one\nline two\nline three\n"))
	z := fs.AddFile("a.nodal", []byte("x\n"))
	l := List{
		{Pos: a.Pos(9), Rule: "zeta", Severity: Warning, Message: "m"},
		{Pos: a.Pos(9), Rule: "alpha", Severity: Error, Message: "m"},
		{Pos: a.Pos(2), Rule: "r", Severity: Note, Message: "m"},
		{Pos: z.Pos(0), Rule: "r", Severity: Error, Message: "first file by name"},
		{Pos: a.Pos(9), Rule: "alpha", Severity: Error, Message: "m"}, // exact repeat
		{Pos: a.Pos(18), Rule: "r", Severity: Error, Message: "b"},
		{Pos: a.Pos(18), Rule: "r", Severity: Error, Message: "a"},
	}
	l.Sort(fs)
	l = l.Dedup()
	var got []string
	for _, d := range l {
		got = append(got, Format(fs, d))
	}
	want := []string{
		"a.nodal:1:1: error: first file by name [r]",
		"b.nodal:1:3: note: m [r]",
		"b.nodal:2:1: error: m [alpha]",
		"b.nodal:2:1: warning: m [zeta]",
		"b.nodal:3:1: error: a [r]",
		"b.nodal:3:1: error: b [r]",
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("sorted:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	e, w, n := l.Count()
	if e != 4 || w != 1 || n != 1 || l.Max() != Error {
		t.Errorf("Count = %d %d %d, Max = %s", e, w, n, l.Max())
	}
	if (List{}).Max() != Off {
		t.Error("empty list has a severity")
	}
}

func TestSeverity(t *testing.T) {
	for _, s := range []Severity{Off, Note, Warning, Error} {
		got, ok := ParseSeverity(s.String())
		if !ok || got != s {
			t.Errorf("ParseSeverity(%q) = %v, %v", s, got, ok)
		}
	}
	if _, ok := ParseSeverity("fatal"); ok {
		t.Error("fatal accepted")
	}
	if !(Note < Warning && Warning < Error) {
		t.Error("severities out of order")
	}
}

// Levenshtein distance (Levenshtein, 1966, from memory): the classic
// kitten → sitting needs three edits.
func TestDistanceAndSuggest(t *testing.T) {
	for _, c := range []struct {
		a, b string
		max  int
		want int
	}{
		{"kitten", "sitting", 5, 3},
		{"flaw", "lawn", 5, 2},
		{"", "abc", 5, 3},
		{"same", "same", 0, 0},
		{"abcdef", "uvwxyz", 2, 3}, // stops early at max+1
	} {
		if got := Distance(c.a, c.b, c.max); got != c.want {
			t.Errorf("Distance(%q, %q, %d) = %d; want %d", c.a, c.b, c.max, got, c.want)
		}
	}
	if s := Suggest("sens", []string{"gnd", "sense", "vcc"}); s != "sense" {
		t.Errorf("Suggest(sens) = %q", s)
	}
	if s := Suggest("resister", []string{"resistor", "capacitor"}); s != "resistor" {
		t.Errorf("Suggest(resister) = %q", s)
	}
	if s := Suggest("vout", []string{"gnd", "vcc"}); s != "" {
		t.Errorf("Suggest(vout) = %q; want none", s)
	}
	if s := Suggest("a", []string{"b"}); s != "" {
		t.Errorf("one-letter names get suggestions: %q", s)
	}
	// Equally close candidates: the first in byte order, in any order of
	// the list (nets come in the order statements name them).
	for _, list := range [][]string{{"n4", "n2", "gnd"}, {"gnd", "n2", "n4"}, {"n4", "gnd", "n2"}} {
		if s := Suggest("n3", list); s != "n2" {
			t.Errorf("Suggest(n3, %q) = %q; want n2", list, s)
		}
	}
}

// Comparing one name against every net of a large design must not
// allocate per comparison.
func TestDistanceDoesNotAllocate(t *testing.T) {
	if n := testing.AllocsPerRun(100, func() { Distance("n123_456", "n123_457", 2) }); n != 0 {
		t.Errorf("Distance allocates %v times per call", n)
	}
	// Past the stack rows, still correct.
	long := strings.Repeat("a", 60)
	if d := Distance(long, long+"b", 2); d != 1 {
		t.Errorf("Distance of 60- and 61-byte names = %d, want 1", d)
	}
}
