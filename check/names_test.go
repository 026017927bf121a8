package check

import (
	"fmt"
	"runtime"
	"strings"
	"testing"

	"nodal/circuit"
)

// deepLongNames is a design of depth levels of blocks, each holding one
// instance with a name of nameLen bytes, a leaf of leafParts parts, and
// top instances of the outermost level, named with nameLen bytes too:
// every part's name carries the whole chain of long names. The top level
// holds one instance of a block that holds the top instances.
func deepLongNames(depth, nameLen, leafParts, top int) string {
	var b strings.Builder
	b.WriteString("block l0 (p, q) {\n")
	for i := 0; i < leafParts; i++ {
		fmt.Fprintf(&b, "  resistor R%d (p, q) 1 kΩ\n", i)
	}
	b.WriteString("}\n")
	for lv := 1; lv <= depth; lv++ {
		name := fmt.Sprintf("N%d%s", lv, strings.Repeat("x", nameLen))
		fmt.Fprintf(&b, "block l%d (p, q) {\n  l%d %s (p, m)\n  resistor RM (m, q) 1 kΩ\n}\n", lv, lv-1, name)
	}
	fmt.Fprintf(&b, "block w (p, q) {\n")
	for i := 0; i < top; i++ {
		fmt.Fprintf(&b, "  l%d T%d%s (p, q)\n", depth, i, strings.Repeat("x", nameLen))
	}
	b.WriteString("}\nground gnd\nw W (gnd, gnd)\n")
	return b.String()
}

// The design of the report: 888 KB, 60 levels of 4 000-byte names and
// 16 000 parts made 3.8 GB of names (10.9 GB in all) before the check
// died, since every part kept its whole instance path. Names are kept
// once, as written (circuit/names.go), so it is checked, and what the
// check allocates in all, garbage included, grows with the parts and the
// text: the bound below is some 60 times the source and 2 KB a part,
// against the 3.8 GB that whole paths would take.
func TestDeepLongNamesChecked(t *testing.T) {
	src := deepLongNames(60, 4000, 100, 100)
	if len(src) > 1<<20 {
		t.Fatalf("the design is %d bytes; the report's was under 1 MB", len(src))
	}
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	res, err := Source("deep.nodal", []byte(src), nil)
	runtime.ReadMemStats(&after)
	if err != nil {
		t.Fatal(err)
	}
	d := res.Build.Design
	if n := len(d.Parts); n != 16_000 {
		t.Fatalf("%d parts, want 16 000", n)
	}
	if f := findings(res, "expansion-limit"); len(f) != 0 {
		t.Fatalf("refused: %v", f)
	}
	// The names the model keeps: each part's and net's own, each
	// instance's own; none is longer than a name written in the source.
	var kept int64
	for _, p := range d.Parts {
		kept += int64(len(p.Local))
	}
	for _, in := range d.Instances {
		kept += int64(len(in.Local))
	}
	for _, net := range d.Nets {
		kept += int64(len(net.Local))
	}
	// 100 chains of 61 instances named with 4 001 or 4 002 bytes, and
	// short part and net names.
	if want := int64(100 * 61 * 4001); kept < want || kept > want+int64(len(d.Parts)+len(d.Nets))*8 {
		t.Errorf("the model holds %d bytes of names; want %d and a few bytes a part", kept, want)
	}
	// Every dotted name is still there to be asked for: a leaf part's
	// path runs through the 62 instances above it (W, a top instance and
	// 60 levels).
	deep := circuit.PartID(0)
	for i := range d.Parts {
		if d.PathLen(d.Parts[i].Inst) > d.PathLen(d.Parts[deep].Inst) {
			deep = circuit.PartID(i)
		}
	}
	name := d.PartName(deep)
	if strings.Count(name, ".") != 62 || len(name) < 61*4001 || !strings.HasPrefix(name, "W.T") || !strings.HasSuffix(name, ".R0") {
		t.Errorf("the deepest part is named %d bytes with %d dots", len(name), strings.Count(name, "."))
	}
	alloc := after.TotalAlloc - before.TotalAlloc
	bound := uint64(60*len(src) + 2048*len(d.Parts))
	t.Logf("%d bytes of source, %d parts, %d instances: %d MB allocated (bound %d MB)", len(src), len(d.Parts), len(d.Instances), alloc>>20, bound>>20)
	if alloc > bound {
		t.Errorf("checking the design allocated %d MB, over %d MB: the names are not shared", alloc>>20, bound>>20)
	}
}

// The name budget counts each name the instances make once, at the length
// written: part names, local nets and instance names. A limit of that many
// bytes admits the design; one byte less refuses it.
func TestNameBytesCountedExactly(t *testing.T) {
	src := deepLongNames(4, 7, 3, 5) +
		"block pair (a, b) {\n  resistor R1 (a, mid) 1 kΩ\n  resistor R2 (mid, b) 1 kΩ\n}\npair PX (gnd, gnd)\n"
	res, err := Source("d.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	d := res.Build.Design
	var n int64
	for _, p := range d.Parts {
		if p.Inst >= 0 {
			n += int64(len(p.Local))
		}
	}
	for _, in := range d.Instances {
		n += int64(len(in.Local))
	}
	for _, net := range d.Nets {
		if net.Inst >= 0 {
			n += int64(len(net.Local))
		}
	}
	if len(findings(res, "expansion-limit")) != 0 || n == 0 {
		t.Fatalf("the design is refused by default (%d name bytes)", n)
	}
	ok, err := Source("d.nodal", []byte(src), &Options{MaxNameBytes: n})
	if err != nil {
		t.Fatal(err)
	}
	if len(findings(ok, "expansion-limit")) != 0 {
		t.Errorf("a limit of exactly %d bytes refuses a design of %d bytes of names", n, n)
	}
	over, err := Source("d.nodal", []byte(src), &Options{MaxNameBytes: n - 1})
	if err != nil {
		t.Fatal(err)
	}
	wantOne(t, over, "expansion-limit", "names")
}

// A caller is told the parts a design expands to before they are made,
// once, so that it can wait for the memory they take; not when the design
// is refused for size.
func TestExpandingToldFirst(t *testing.T) {
	src := deepLongNames(3, 5, 4, 2)
	var told []int64
	res, err := Source("d.nodal", []byte(src), &Options{Expanding: func(parts int64) {
		told = append(told, parts)
	}})
	if err != nil {
		t.Fatal(err)
	}
	if n := len(res.Build.Design.Parts); len(told) != 1 || told[0] != int64(n) || n != 2*(4+3) {
		t.Errorf("told %v for a design of %d parts, want once 14", told, n)
	}
	told = nil
	if _, err := Source("d.nodal", []byte(src), &Options{MaxParts: 5, Expanding: func(parts int64) { told = append(told, parts) }}); err != nil {
		t.Fatal(err)
	}
	if len(told) != 0 {
		t.Errorf("told %v for a design past the size limit", told)
	}
}
