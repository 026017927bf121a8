package bench_test

import (
	"fmt"
	"math"
	"testing"

	"nodal/solve"
)

// randomSolveSizes are the random designs of BenchmarkSolveRandom, in
// parts: a factor of about 3.16 apart, so that the growth exponent of the
// solve can be fitted up to the million-part design the command checks.
var randomSolveSizes = []int{31_623, 100_000, 316_228, 1_000_000}

// BenchmarkSolveRandom is the DC solve alone (solve.Solve on the built
// design) of the random networks of `nodal-gen random` (resistors over six
// decades, wires, inductors, current sources and about one diode in ten
// parts, so the Newton path), the design whose million-part check the
// solve dominates. It fails if the self-checks fail (Solve returns their
// error) or if the KCL residual misses solve.KCLTol, and reports the
// Newton and conjugate-gradient iterations and the linear solver used.
// The growth exponent is the least-squares slope of log(ns/op) against
// log(parts); a smaller size reproduces the million-part figure's growth:
//
//	go test ./internal/bench -run '^$' -bench 'SolveRandom/parts=(31623|100000|316228)$' -count 5
func BenchmarkSolveRandom(b *testing.B) {
	for _, n := range randomSolveSizes {
		b.Run(fmt.Sprintf("parts=%d", n), func(b *testing.B) {
			_, r := built(b, source(b, "random", n))
			d := r.Design
			b.ReportAllocs()
			var op *solve.Result
			for b.Loop() {
				var err error
				if op, err = solve.Solve(d, nil); err != nil {
					b.Fatal(err)
				}
			}
			if !(op.KCL <= solve.KCLTol*op.KCLScale) || !(math.Abs(op.PowerSum) <= solve.TellegenTol*op.PowerScale) {
				b.Fatalf("self-checks missed: KCL %g of %g, power sum %g of %g", op.KCL, op.KCLScale, op.PowerSum, op.PowerScale)
			}
			b.ReportMetric(op.KCL/op.KCLScale/solve.KCLTol, "kcl/1e-9")
			b.ReportMetric(float64(op.Iterations), "newton")
			b.ReportMetric(float64(op.PCGIterations), "pcg-iters")
			b.ReportMetric(float64(op.Unknowns), "unknowns")
			b.Logf("%d parts: %d unknowns, %s, %s", len(d.Parts), op.Unknowns, op.Method, op.Linear)
		})
	}
}
