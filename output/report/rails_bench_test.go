package report

import (
	"bytes"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/internal/gen"
	"nodal/rules"
)

// BenchmarkReport builds the report table of a 300×300 mesh (about 180 k
// parts, four supplies) whole, and its power tree alone, to see what the
// tree adds:
//
//	go test -run='^$' -bench=Report -benchmem ./output/report
func BenchmarkReport(b *testing.B) {
	var src bytes.Buffer
	m := gen.Mesh{K: 300, Supplies: 4}
	if err := m.Write(&src); err != nil {
		b.Fatal(err)
	}
	res, err := check.Source("mesh.nodal", src.Bytes(), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil {
		b.Fatalf("no operating point: %v", err)
	}
	d, r := res.Build.Design, res.Solved.OP
	b.Run("table", func(b *testing.B) {
		for b.Loop() {
			New("mesh.nodal", d, r, rules.DefaultDerating())
		}
	})
	b.Run("tree", func(b *testing.B) {
		pt := rules.NewPoint(r)
		uses := make([][]rules.Use, len(d.Parts))
		for i := range d.Parts {
			uses[i] = rules.Judge(&d.Parts[i], pt.Part(circuit.PartID(i)), rules.DefaultDerating())
		}
		for b.Loop() {
			buildRails(d, pt, uses)
		}
	})
}
