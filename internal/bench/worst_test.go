package bench

import (
	"bytes"
	"fmt"
	"testing"

	"nodal/check"
	"nodal/internal/gen"
	"nodal/rules"
)

// BenchmarkWorstCase times the whole check of random designs with every
// resistor and source toleranced (1 %) and every resistor rated, with the
// worst-case pass and without it (the baseline, in the same run).
func BenchmarkWorstCase(b *testing.B) {
	for _, parts := range []int{200, 2000} {
		var buf bytes.Buffer
		if err := (&gen.Random{Parts: parts, Seed: 1, Tol: 0.01, Rated: 1000}).Write(&buf); err != nil {
			b.Fatal(err)
		}
		src := buf.Bytes()
		var without []*rules.Analyzer
		for _, a := range rules.All {
			if a != rules.CornerOverRating && a != rules.CornersNotJudged && a != rules.NearRating {
				without = append(without, a)
			}
		}
		for _, c := range []struct {
			name string
			as   []*rules.Analyzer
		}{{"with", nil}, {"without", without}} {
			b.Run(fmt.Sprintf("random-%d/%s", parts, c.name), func(b *testing.B) {
				for i := 0; i < b.N; i++ {
					if _, err := check.Source("bench.nodal", src, &check.Options{Rules: c.as}); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
