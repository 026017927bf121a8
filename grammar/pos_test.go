package grammar

import (
	"testing"

	"nodal/diag"
)

// Every position grammar hands out is a byte offset into the parsed file;
// these name the bytes by hand.
func TestPositionsAreOffsets(t *testing.T) {
	src := []byte("ground gnd  # ref\n  # nodal: accept x because y\nresistor R1 (a, gnd) 4.7 kΩ tol 1%\nresistor R2 (a, b) (2 * rtop)\nresistor R3 (a, gnd) @\n")
	f := Parse("t.nodal", src)
	if len(f.Stmts) != 3 || len(f.Errors) != 1 || len(f.Comments) != 2 {
		t.Fatalf("got %d statements, %d errors, %d comments", len(f.Stmts), len(f.Errors), len(f.Comments))
	}
	text := func(from, to Offset) string { return string(src[from:to]) }

	if c := f.Comments[0]; text(c.Pos, c.End()) != "# ref" || c.Alone {
		t.Errorf("first comment: %q, alone %v", text(c.Pos, c.End()), c.Alone)
	}
	if c := f.Comments[1]; text(c.Pos, c.End()) != "# nodal: accept x because y" || !c.Alone || c.Line != 2 {
		t.Errorf("second comment: %q, alone %v, line %d", text(c.Pos, c.End()), c.Alone, c.Line)
	}

	r1 := f.Stmts[1]
	if got := text(r1.Start(), r1.End()); got != "resistor R1 (a, gnd) 4.7 kΩ tol 1%" {
		t.Errorf("statement: %q", got)
	}
	if p := r1.Part; text(p.Name.Start(), p.Name.End()) != "R1" || text(p.Pins[1].Start(), p.Pins[1].Net.End()) != "gnd" {
		t.Errorf("name %q, pin %q", text(p.Name.Start(), p.Name.End()), text(p.Pins[1].Start(), p.Pins[1].Net.End()))
	}
	if v := r1.Part.Value; text(v.Start(), v.End(src)) != "4.7 kΩ" || v.End(nil) != v.Start() {
		t.Errorf("value %q; without the source it ends at %d, not its start %d", text(v.Start(), v.End(src)), v.End(nil), v.Start())
	}
	if n, ok := r1.Part.Value.NumStart(src); !ok || text(n, n+3) != "4.7" {
		t.Errorf("number at %d (%v)", n, ok)
	}
	if _, ok := r1.Part.Value.NumStart(nil); ok {
		t.Error("a number found without the source")
	}
	if a := r1.Part.Attrs[0]; text(a.Start(), a.Values[0].End(src)) != "tol 1%" {
		t.Errorf("attribute %q", text(a.Start(), a.Values[0].End(src)))
	}
	v := f.Stmts[2].Part.Value
	if s, ok := v.ExprSource(src); !ok || s != "(2 * rtop)" || text(v.Start(), v.End(src)) != s {
		t.Errorf("expression %q, %v; value %q", s, ok, text(v.Start(), v.End(src)))
	}
	if e := f.Errors[0]; text(e.Pos, e.End) != "@" || e.Line != 5 {
		t.Errorf("syntax error at %q on line %d", text(e.Pos, e.End), e.Line)
	}

	// At places an offset in the file set, and an offset past the file at
	// its end.
	fset := diag.NewFileSet()
	fset.AddFile("first.nodal", []byte("ground g\n"))
	file := fset.AddFile("t.nodal", src)
	if p := fset.Position(r1.Part.Name.Start().At(file)); p.Filename != "t.nodal" || p.Line != 3 || p.Column != 10 {
		t.Errorf("R1 at %v, want t.nodal:3:10", p)
	}
	if got, want := Offset(len(src)+7).At(file), file.Pos(len(src)); got != want {
		t.Errorf("past the end: %d, want %d", got, want)
	}
}
