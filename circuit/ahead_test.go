package circuit

import (
	"bytes"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"nodal/diag"
	"nodal/grammar"
	"nodal/internal/gen"
)

// troubled returns a generated design with a troubled line after every
// few lines: repeated names, values in the wrong unit or out of range,
// sources without a usable value, a three-pin kind given two pins, unknown
// and repeated attributes, unknown kinds, quoted names, and instances of a
// block among the plain lines.
func troubled(t *testing.T, parts int) []byte {
	t.Helper()
	var g bytes.Buffer
	if err := (&gen.Random{Parts: parts, Seed: 7}).Write(&g); err != nil {
		t.Fatal(err)
	}
	// In each line # is the line's number, @ and & two nets that recur.
	trouble := []string{
		"resistor r0 (x@, gnd) 1 kΩ",
		"resistor bad# (x@, gnd) 1 V",
		"resistor neg# (x@, gnd) -1 kΩ tol 200%",
		"capacitor cap# (x@, y&) 1 µF rated 5 A",
		"source src# (x@, gnd) 5 Ω",
		"regulator reg# (x@, gnd) 5 V",
		"resistor meg# (x@, gnd) 1 meg",
		"resistr typo# (x@, gnd) 1 kΩ",
		"cell C# (x@, gnd)",
		"resistor \"q x#\" (\"net @\", gnd) 1 kΩ",
		"led led# (x@, gnd) vf 2 V at 20 mA rated 30 mA",
		"resistor w# (x@, gnd) 10 kΩ bogus 5 V",
		"resistor t# (x@, gnd) 10 kΩ tol 5% tol 1%",
		"fuse f# (x@, y&) 2 A dcr 10 mΩ",
		"source s# (x@, gnd) 5 V rated 1 W",
		"resistor z# (x@, x@) 0 Ω",
		"C# cell (x@, gnd)",
	}
	var out bytes.Buffer
	for i, line := range strings.SplitAfter(g.String(), "\n") {
		out.WriteString(line)
		if i > 2 && i%5 == 0 {
			r := strings.NewReplacer("#", strconv.Itoa(i), "@", strconv.Itoa(i%97), "&", strconv.Itoa(i%89))
			out.WriteString(r.Replace(trouble[(i/5)%len(trouble)]) + "\n")
		}
	}
	out.WriteString("block cell (p, q) {\nresistor R (p, q) 1 kΩ\n}\n")
	return out.Bytes()
}

// The plain lines built ahead make the same design and findings however
// they are batched and however many goroutines build them, and the same
// as the whole tree walked in order: parts, nets and their ids, findings
// and their order, flags.
func TestAheadAnySplit(t *testing.T) {
	src := troubled(t, 6000)
	// With a limit below the design's size no part table is reserved,
	// and the walk writes every part itself.
	for _, limit := range []int64{0, 3000} {
		sameAnySplit(t, src, &Options{MaxParts: limit})
	}
}

func sameAnySplit(t *testing.T, src []byte, opt *Options) {
	t.Helper()
	build := func(parse func(string, []byte) *grammar.File) *Result {
		fset := diag.NewFileSet()
		file := fset.AddFile("t.nodal", src)
		o := *opt
		return BuildFile(fset, file, src, parse("t.nodal", src), &o)
	}
	want := build(grammar.ParseShared)
	if len(want.Findings) < 100 || len(want.Design.Parts) < 5000 {
		t.Fatalf("the design has %d findings and %d parts; the test means many of both", len(want.Findings), len(want.Design.Parts))
	}
	saved := aheadSplit
	defer func() { aheadSplit = saved }()
	for _, split := range [][2]int{{1, 0}, {64, 0}, {1, 1}, {7, 2}, {1000, 3}, {1 << 20, 2}, {5, 8}, {333, 2}} {
		aheadSplit = func(stmts, plain int) (int, int) { return split[0], split[1] }
		got := build(grammar.ParsePlain)
		if !reflect.DeepEqual(got.Design, want.Design) {
			t.Fatalf("batches of %d on %d workers: the design differs from the tree's (%d parts, %d nets; %d, %d)", split[0], split[1], len(got.Design.Parts), len(got.Design.Nets), len(want.Design.Parts), len(want.Design.Nets))
		}
		if !reflect.DeepEqual(got.Findings, want.Findings) {
			for i := range min(len(got.Findings), len(want.Findings)) {
				if !reflect.DeepEqual(got.Findings[i], want.Findings[i]) {
					t.Fatalf("batches of %d on %d workers: finding %d is %q, the tree's %q", split[0], split[1], i, got.Findings[i].Message, want.Findings[i].Message)
				}
			}
			t.Fatalf("batches of %d on %d workers: %d findings, the tree's %d", split[0], split[1], len(got.Findings), len(want.Findings))
		}
		if got.Incomplete != want.Incomplete || got.Invalid != want.Invalid || !reflect.DeepEqual(got.Unsure, want.Unsure) {
			t.Fatalf("batches of %d on %d workers: the flags differ from the tree's", split[0], split[1])
		}
	}
}
