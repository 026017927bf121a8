package bench_test

import (
	"fmt"
	"math"
	"testing"

	"nodal/internal/gen"
	"nodal/solve/sparse"
)

// BenchmarkMeshSystem solves the nodal equations of K×K supply meshes, the
// matrix our generator writes for the SciPy comparison (scripts/
// scipy-compare.sh), with the sparse solvers of package solve/sparse
// directly: supernodal Cholesky with an AMD ordering, and conjugate
// gradients preconditioned by smoothed-aggregation multigrid. Each
// iteration is the whole solve from the assembled matrix: ordering,
// factorisation or hierarchy set-up, and the solve. It fails if the
// solution breaks Kirchhoff's current law at any net by more than 1e-9 of
// the largest current in the mesh (the target), and reports that
// ratio over the target as kcl/target (below 1 passes).
func BenchmarkMeshSystem(b *testing.B) {
	for _, k := range []int{100, 300, 700, 1000} {
		m := &gen.Mesh{K: k, Supplies: 4, Loads: k, Seed: 1}
		n, rows, cols, vals, rhs := m.System()
		t := sparse.NewTriplet(n, n, len(vals))
		for i := range vals {
			t.Add(int(rows[i]), int(cols[i]), vals[i])
		}
		a := t.Compress()
		for _, method := range []string{"cholesky", "amg-pcg"} {
			b.Run(fmt.Sprintf("k=%d/%s", k, method), func(b *testing.B) {
				b.ReportAllocs()
				x := make([]float64, n)
				for b.Loop() {
					switch method {
					case "cholesky":
						var ch sparse.Cholesky
						ch.Analyze(a)
						if err := ch.Factorize(a); err != nil {
							b.Fatal(err)
						}
						copy(x, rhs)
						ch.Solve(x)
					case "amg-pcg":
						pre, err := sparse.NewAMG(a, nil)
						if err != nil {
							b.Fatal(err)
						}
						clear(x)
						if _, _, err := sparse.PCG(a, x, rhs, pre, 1e-13, 1000); err != nil {
							b.Fatal(err)
						}
					}
				}
				rel := kclResidual(m, a, x, rhs)
				if !(rel <= 1e-9) {
					b.Fatalf("KCL residual %.3g of the largest current", rel)
				}
				b.ReportMetric(rel/1e-9, "kcl/target")
				b.ReportMetric(float64(n), "unknowns")
			})
		}
	}
}

// kclResidual is the largest current imbalance at a net, |G·v − b|, over
// the largest current through any segment or pad.
func kclResidual(m *gen.Mesh, a *sparse.CSC, v, rhs []float64) float64 {
	r := make([]float64, len(v))
	a.MulVec(r, v)
	worst := 0.0
	for i := range r {
		worst = math.Max(worst, math.Abs(r[i]-rhs[i]))
	}
	// Segment currents: off-diagonal entries are −g between neighbours.
	scale := 0.0
	for j := 0; j < a.M; j++ {
		for p := a.P[j]; p < a.P[j+1]; p++ {
			i := int(a.I[p])
			if i != j {
				scale = math.Max(scale, math.Abs(a.X[p]*(v[i]-v[j])))
			}
		}
	}
	// Pad currents: 1 V through each 1 mΩ pad, less the pad net's voltage.
	for _, s := range []int{0, m.K*m.K - 1, m.K - 1, (m.K - 1) * m.K} {
		scale = math.Max(scale, math.Abs(1-v[s])/0.001)
	}
	return worst / scale
}
