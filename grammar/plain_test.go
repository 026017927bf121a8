package grammar

import (
	"bytes"
	"math/rand/v2"
	"os"
	"reflect"
	"slices"
	"strings"
	"testing"

	"nodal/internal/gen"
)

// ParsePlain keeps plain part lines as records; made into nodes, they and
// the statements it keeps must be exactly the tree the grammar builds
// (ParseReference), with the same errors and comments.

// statements returns every statement of f in file order, the plain lines
// made into nodes of their own (shared nil) or into one reused PlainNodes,
// each compared before the next is made.
func statements(f *File, reuse bool) []*Statement {
	var nodes *PlainNodes
	if reuse {
		nodes = &PlainNodes{}
	}
	out := slices.Clone(f.Stmts)
	for i := range f.PlainLines() {
		st := f.PlainStatement(i, nodes)
		if reuse {
			cp := *st // the nodes are reused: keep a deep copy
			cp.Part = clonePart(st.Part)
			st = &cp
		}
		out = append(out, st)
	}
	slices.SortStableFunc(out, func(a, b *Statement) int { return a.Pos.Offset - b.Pos.Offset })
	return out
}

func clonePart(p *Part) *Part {
	cp := *p
	kind, name := *p.Kind, *p.Name
	cp.Kind, cp.Name = &kind, &name
	cp.Pins = nil
	for _, pin := range p.Pins {
		pc, net := *pin, *pin.Net
		pc.Net = &net
		cp.Pins = append(cp.Pins, &pc)
	}
	if p.Value != nil {
		v := *p.Value
		cp.Value = &v
	}
	cp.Attrs = nil
	for _, a := range p.Attrs {
		ac, key := *a, *a.Key
		ac.Key = &key
		ac.Values = nil
		for _, v := range a.Values {
			vc := *v
			ac.Values = append(ac.Values, &vc)
		}
		cp.Attrs = append(cp.Attrs, &ac)
	}
	return &cp
}

func samePlain(t *testing.T, what string, src []byte) (plain int) {
	t.Helper()
	got, want := ParsePlain("x.nodal", src), ParseReference("x.nodal", src)
	if !reflect.DeepEqual(got.Errors, want.Errors) || !reflect.DeepEqual(got.Comments, want.Comments) {
		t.Fatalf("%s: ParsePlain gives %d errors, %d comments; the grammar %d, %d", what, len(got.Errors), len(got.Comments), len(want.Errors), len(want.Comments))
	}
	for _, reuse := range []bool{false, true} {
		sts := statements(got, reuse)
		if len(sts) != len(want.Stmts) {
			t.Fatalf("%s: ParsePlain gives %d statements (%d plain), the grammar %d", what, len(sts), got.PlainLines(), len(want.Stmts))
		}
		for i := range sts {
			if !reflect.DeepEqual(sts[i], want.Stmts[i]) {
				line := want.Stmts[i].Pos.Line
				t.Fatalf("%s: statement %d (line %d %q) differs from the grammar's (nodes reused: %v)", what, i, line, lineOf(src, line), reuse)
			}
		}
	}
	for i := range got.PlainLines() {
		start, end := got.PlainSpan(i)
		st := got.PlainStatement(i, nil)
		if start != st.Start() || end != st.End() || got.PlainKind(i) != st.Part.Kind.Text || got.PlainName(i) != st.Part.Name.Text {
			t.Fatalf("%s: plain line %d: span %d–%d, kind %q; its statement %d–%d, %q", what, i, start, end, got.PlainKind(i), st.Start(), st.End(), st.Part.Kind.Text)
		}
	}
	return got.PlainLines()
}

func TestPlainMatchesGrammarOnTestdata(t *testing.T) {
	plain := 0
	n := eachNodalFile(t, func(p string, src []byte) { plain += samePlain(t, p, src) })
	if n == 0 || plain == 0 {
		t.Fatalf("%d files, %d plain lines: no test data found", n, plain)
	}
}

func TestPlainMatchesGrammarOnGenerated(t *testing.T) {
	var b bytes.Buffer
	(&gen.Mesh{K: 40, Supplies: 4, Loads: 50, Rated: 1, Seed: 2}).Write(&b)
	lines := bytes.Count(b.Bytes(), []byte("\n"))
	// Every segment and every supply line of a mesh is plain; the
	// design and ground lines are not.
	if plain := samePlain(t, "mesh", b.Bytes()); plain < lines-2 {
		t.Errorf("mesh: %d of %d lines read as plain lines", plain, lines)
	}
	if f := ParsePlain("mesh", b.Bytes()); len(f.plain) < 3 {
		t.Errorf("mesh: %d plain lines in %d chunks; the test is meant to cross chunks", f.PlainLines(), len(f.plain))
	}
	for seed := uint64(1); seed <= 4; seed++ {
		b.Reset()
		(&gen.Random{Parts: 3000, Seed: seed}).Write(&b)
		if samePlain(t, "random", b.Bytes()) == 0 {
			t.Error("random: no plain lines")
		}
	}
	b.Reset()
	(&gen.Ladder{N: 1000, Seed: 3}).Write(&b)
	samePlain(t, "ladder", b.Bytes())
	b.Reset()
	(&gen.Blocks{N: 500, Seed: 3}).Write(&b)
	samePlain(t, "blocks", b.Bytes())
}

func TestPlainMatchesGrammarOnRandomLines(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	valid := validLines("resistor h0_1 (n0_1, n0_2) 10 mΩ rated 1 W", "resistor R2 (a, b) 4k7 tol 1% rated 250 mW",
		"source V1 (a, gnd) -5 V", "resistor R3 (x, y) 1 kΩ tol -1 %", `resistor "R 4" ("+5V", out) 2R2 dcr R47`)
	for round := 0; round < 300; round++ {
		samePlain(t, "random lines", randomSource(r, valid))
	}
}

func FuzzPlain(f *testing.F) {
	td, _ := os.ReadFile("testdata/statements.nodal")
	for _, l := range strings.Split(string(td), "\n") {
		f.Add(l + "\n" + l)
	}
	f.Add("resistor h0_1 (n0_1, n0_2) 10 mΩ rated 1 W # note\n")
	f.Fuzz(func(t *testing.T, src string) {
		samePlain(t, "fuzz", []byte(src))
	})
}

// A file read in pieces is the file read whole, wherever it is cut.
func TestPiecesMatchWhole(t *testing.T) {
	var b bytes.Buffer
	(&gen.Random{Parts: 300, Seed: 5}).Write(&b)
	b.WriteString("resistor R1 (a, b) meg\n\n# comment\nresistor \"\" (a, b) 1 Ω\n\xef\xbb\xbfground gnd\nblock x (a) {\n}\n")
	src := b.String()
	var lineStarts []int
	for i := 0; i < len(src); i++ {
		if i == 0 || src[i-1] == '\n' {
			lineStarts = append(lineStarts, i)
		}
	}
	for _, m := range []mode{modeFast, modePlain} {
		whole := &File{Name: "x", src: src}
		parseRange(whole, src, 0, len(src), 1, true, m)
		whole.indexPlain()
		if m == modeFast && !reflect.DeepEqual(whole, Parse("x", []byte(src))) {
			t.Fatal("parseRange over the whole file is not Parse")
		}
		for k, c := range lineStarts {
			if k > 100 && k < len(lineStarts)-5 {
				continue
			}
			for _, starts := range [][]int{{0, c}, {0, c, lineStarts[(k+len(lineStarts))/2]}} {
				starts = slices.Compact(starts)
				if len(starts) > 2 && starts[2] <= starts[1] {
					starts = starts[:2]
				}
				got := parsePieces("x", src, starts, m)
				got.indexPlain()
				if m == modeFast {
					if !reflect.DeepEqual(got, whole) {
						t.Fatalf("mode %d, cut at %v: the pieces differ from the whole file", m, starts)
					}
					continue
				}
				if !reflect.DeepEqual(statements(got, false), statements(whole, false)) || !reflect.DeepEqual(got.Errors, whole.Errors) || !reflect.DeepEqual(got.Comments, whole.Comments) {
					t.Fatalf("mode %d, cut at %v: the pieces differ from the whole file", m, starts)
				}
			}
		}
	}
	if got := cuts(src, 4); len(got) != 4 || got[0] != 0 {
		t.Errorf("cuts(src, 4) = %v, want 4 line starts from 0", got)
	}
	if got := cuts(strings.Repeat("x", 100), 3); !reflect.DeepEqual(got, []int{0}) {
		t.Errorf("a file of one line is cut at %v; want one piece", got)
	}
}
