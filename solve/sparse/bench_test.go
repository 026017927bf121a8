package sparse

import (
	"fmt"
	"testing"
)

var gridSizes = []int{100, 300, 1000}

// BenchmarkAMDGrid orders the k×k 5-point grid and reports nnz(L) of the
// Cholesky factor under that ordering.
func BenchmarkAMDGrid(b *testing.B) {
	for _, k := range gridSizes {
		b.Run(fmt.Sprintf("k=%d", k), func(b *testing.B) {
			a := gridLaplacian(k, 1e-3)
			b.ReportAllocs()
			var perm []int32
			for b.Loop() {
				perm = AMD(a)
			}
			b.StopTimer()
			var ch Cholesky
			ch.AnalyzePerm(a, perm)
			b.ReportMetric(float64(ch.NnzL()), "nnzL")
		})
	}
}

// BenchmarkCholeskyGrid times the numeric factorisation (Factorize on an
// analysed pattern, as in a Newton loop) of the grounded k×k grid Laplacian.
func BenchmarkCholeskyGrid(b *testing.B) {
	for _, k := range gridSizes {
		b.Run(fmt.Sprintf("k=%d", k), func(b *testing.B) {
			a := gridLaplacian(k, 1e-3)
			var ch Cholesky
			ch.Analyze(a)
			b.ReportAllocs()
			for b.Loop() {
				if err := ch.Factorize(a); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(ch.NnzL()), "nnzL")
		})
	}
}

// BenchmarkCholeskyAnalyzeGrid times the symbolic phase (AMD, etree,
// column counts) of the same matrices.
func BenchmarkCholeskyAnalyzeGrid(b *testing.B) {
	for _, k := range gridSizes {
		b.Run(fmt.Sprintf("k=%d", k), func(b *testing.B) {
			a := gridLaplacian(k, 1e-3)
			var ch Cholesky
			b.ReportAllocs()
			for b.Loop() {
				ch.Analyze(a)
			}
			b.ReportMetric(float64(ch.NnzL()), "nnzL")
		})
	}
}

// BenchmarkLUGrid times LU.Factorize (pivot search included, column order
// from AMD computed once outside the loop) and LU.Refactor on the grounded
// k×k grid Laplacian, reporting nnz(L)+nnz(U).
func BenchmarkLUGrid(b *testing.B) {
	for _, k := range gridSizes {
		a := gridLaplacian(k, 1e-3)
		var f LU
		f.Analyze(a)
		b.Run(fmt.Sprintf("Factorize/k=%d", k), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if err := f.Factorize(a); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(f.L().Nnz()), "nnzL")
			b.ReportMetric(float64(f.U().Nnz()), "nnzU")
		})
		b.Run(fmt.Sprintf("Refactor/k=%d", k), func(b *testing.B) {
			if err := f.Factorize(a); err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := f.Refactor(a); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(f.L().Nnz()), "nnzL")
		})
	}
}

// BenchmarkPCGAMGGrid times the whole iterative solve — AMG setup plus PCG
// to a relative residual of 1e-10 — on the grounded k×k grid Laplacian with
// a point source at the far corner, reporting iterations and levels.
func BenchmarkPCGAMGGrid(b *testing.B) {
	for _, k := range gridSizes {
		b.Run(fmt.Sprintf("k=%d", k), func(b *testing.B) {
			a := gridLaplacian(k, 1e-3)
			rhs := make([]float64, a.N)
			rhs[a.N-1] = 1
			rhs[a.N/2] = -0.5
			x := make([]float64, a.N)
			var it, levels int
			b.ReportAllocs()
			for b.Loop() {
				m, err := NewAMG(a, nil)
				if err != nil {
					b.Fatal(err)
				}
				clear(x)
				if it, _, err = PCG(a, x, rhs, m, 1e-10, 1000); err != nil {
					b.Fatal(err)
				}
				levels = len(m.Levels())
			}
			b.ReportMetric(float64(it), "iters")
			b.ReportMetric(float64(levels), "levels")
		})
	}
}

// BenchmarkAMGCycleRandom times one V-cycle of the plain-aggregation
// hierarchy of a random weighted Laplacian (the preconditioner random
// designs take), with the sweeps on levels in ascending order ("split":
// half a sweep from zero, the residual from the upper triangle) and, as
// the baseline in the same run, the sweeps over whole rows with a full
// product for the residual ("whole").
func BenchmarkAMGCycleRandom(b *testing.B) {
	a := randomLaplacian(300_000, 6, 3, 1)
	m, err := NewAMG(a, &AMGOptions{CoarseSize: 500, Unsmoothed: true})
	if err != nil {
		b.Fatal(err)
	}
	r := make([]float64, a.N)
	for i := range r {
		r[i] = float64(i%7) - 3
	}
	z := make([]float64, a.N)
	split := make([][]int32, len(m.levels))
	for i := range m.levels {
		split[i] = m.levels[i].dpos
	}
	for _, mode := range []string{"split", "whole"} {
		b.Run(mode, func(b *testing.B) {
			for i := range m.levels {
				m.levels[i].dpos = split[i]
				if mode == "whole" {
					m.levels[i].dpos = nil
				}
			}
			for b.Loop() {
				m.Precondition(z, r)
			}
			b.ReportMetric(m.OperatorComplexity(), "complexity")
		})
	}
}

// BenchmarkGalerkinPlain forms the first coarse matrix of a random weighted
// Laplacian's plain-aggregation hierarchy in one pass over A (quotient),
// and, as the baseline in the same run, as the two sparse products
// P̂ᵀ·(A·P̂) (products).
func BenchmarkGalerkinPlain(b *testing.B) {
	a := randomLaplacian(300_000, 6, 3, 1)
	diag := make([]float64, a.N)
	for j := 0; j < a.M; j++ {
		for p := a.P[j]; p < a.P[j+1]; p++ {
			if int(a.I[p]) == j {
				diag[j] += a.X[p]
			}
		}
	}
	agg, nagg := aggregate(a, diag, 0.08, nil)
	ph := tentativeProlongator(a.N, agg, nagg)
	b.Run("quotient", func(b *testing.B) {
		for b.Loop() {
			quotient(a, ph, agg, -1)
		}
	})
	b.Run("products", func(b *testing.B) {
		for b.Loop() {
			pt := ph.T()
			ap, _ := mulCSCLimit(a, ph, -1)
			mulCSCLimit(pt, ap, -1)
		}
	})
}
