package check

import (
	"fmt"
	"strings"
	"testing"
)

// deepLongNames is a design of depth levels of blocks, each holding one
// instance with a name of nameLen bytes, a leaf of leafParts parts, and
// top instances of the outermost level: every part's name carries the
// whole chain of long names. The top level holds one instance of a block
// that holds top instances of the outermost level.
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
		fmt.Fprintf(&b, "  l%d T%d (p, q)\n", depth, i)
	}
	b.WriteString("}\nground gnd\nw W (gnd, gnd)\n")
	return b.String()
}

// The design of the report: 888 KB, 60 levels of 4 000-byte names and
// 16 000 parts made 3.8 GB of names (10.9 GB in all) before the check
// died. The name limit refuses it before anything is expanded: the
// top-level instance alone would make 3.8 GB of names.
func TestDeepLongNamesRefused(t *testing.T) {
	src := deepLongNames(60, 4000, 160, 100)
	if len(src) > 1<<20 {
		t.Fatalf("the design is %d bytes; the report's was under 1 MB", len(src))
	}
	res, err := Source("deep.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	wantOne(t, res, "expansion-limit", "names", "over the limit of 256.0 MiB")
	if n := len(res.Build.Design.Parts); n != 0 {
		t.Errorf("%d parts made; the refused instance is the only statement", n)
	}
	var bytes int
	for _, p := range res.Build.Design.Parts {
		bytes += len(p.Name)
	}
	if bytes > 0 {
		t.Errorf("%d bytes of part names made", bytes)
	}
}

// The name budget counts exactly the bytes of the names that instances
// make: part names, local nets and instance paths. A limit of that many
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
		n += int64(len(p.Name))
	}
	for _, in := range d.Instances {
		n += int64(len(in.Path))
	}
	for _, net := range d.Nets {
		if net.Inst >= 0 {
			n += int64(len(net.Name))
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
