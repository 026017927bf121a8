package solve

import (
	"fmt"
	"testing"
)

// BenchmarkSolverCrossover solves k×k resistor meshes (see mesh) with each
// linear solver forced, to find where the automatic choice should switch:
// compare ns/op across solvers at equal k. Dense is skipped past MaxDense.
//
//	go test ./solve -run '^$' -bench SolverCrossover -count 5
func BenchmarkSolverCrossover(b *testing.B) {
	for _, k := range []int{4, 6, 8, 12, 30, 100, 150, 200, 300} {
		m := mesh(k, 0.01, false)
		for _, kind := range []LinearSolver{DenseLU, SparseCholesky, PCGAMG} {
			if kind == DenseLU && k*k > 2000 {
				continue
			}
			b.Run(fmt.Sprintf("k=%d/%v", k, kind), func(b *testing.B) {
				b.ReportAllocs()
				var r *Result
				for b.Loop() {
					var err error
					if r, err = Solve(m.d, &Options{Solver: kind}); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(r.Unknowns), "unknowns")
			})
		}
	}
}
