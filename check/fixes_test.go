package check_test

import (
	"sort"
	"strings"
	"testing"

	"nodal/check"
	"nodal/diag"
)

// TestFixesResolve applies each fix the checker offers and checks again:
// the finding it was offered for is gone and nothing new is wrong.
func TestFixesResolve(t *testing.T) {
	for _, c := range []struct {
		src, rule string
		fixes     int // fixes offered for the finding
	}{
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1meg\n", "unit-mismatch", 1},
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1 meg\n", "unit-mismatch", 1},
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 2.2megohm\n", "unit-mismatch", 1},
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 4.7\n", "unit-mismatch", 1},
		{"ground gnd\nsource V1 (vin, gnd) 5 V\ncapacitor C1 (vin, gnd) 100\n", "unit-mismatch", 1},
		// A misspelt net: the close name, or a port.
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1 kΩ\nresistor R2 (vim, gnd) 1 kΩ\n", "floating-net", 2},
		// A net that leaves the file: a port (quoted as written).
		{"ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, \"+OUT\") 1 kΩ\n", "floating-net", 1},
	} {
		res, err := check.Source("f.nodal", []byte(c.src), nil)
		if err != nil {
			t.Fatal(err)
		}
		var d *diag.Diagnostic
		for i := range res.Diags {
			if res.Diags[i].Rule == c.rule {
				d = &res.Diags[i]
			}
		}
		if d == nil {
			t.Fatalf("%q: no %s finding", c.src, c.rule)
		}
		if len(d.Fixes) != c.fixes {
			t.Fatalf("%q: %d fixes, want %d: %+v", c.src, len(d.Fixes), c.fixes, d.Fixes)
		}
		for _, fix := range d.Fixes {
			fixed := apply(t, res.Fset, c.src, fix)
			after, err := check.Source("f.nodal", []byte(fixed), nil)
			if err != nil {
				t.Fatal(err)
			}
			if len(after.Diags) != 0 {
				t.Errorf("%q fixed by %q is %q, which still has %v", c.src, fix.Message, fixed, after.Diags)
			}
		}
	}
}

// apply makes a fix's edits to src.
func apply(t *testing.T, fset *diag.FileSet, src string, fix diag.Fix) string {
	t.Helper()
	edits := append([]diag.Edit{}, fix.Edits...)
	sort.Slice(edits, func(i, j int) bool { return edits[i].Pos > edits[j].Pos })
	for _, e := range edits {
		p, q := fset.Position(e.Pos), fset.Position(e.End)
		if p.Offset > q.Offset || q.Offset > len(src) {
			t.Fatalf("edit %+v outside %q", e, src)
		}
		src = src[:p.Offset] + e.NewText + src[q.Offset:]
	}
	if !strings.HasSuffix(src, "\n") {
		t.Fatalf("fix broke the last line: %q", src)
	}
	return src
}
