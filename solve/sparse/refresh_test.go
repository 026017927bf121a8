package sparse

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// rescaled returns D·A·D for a random positive diagonal D with entries in
// [0.1, 10): the same pattern, still symmetric positive definite (a
// congruence), with every coupling changed by its own factor.
func rescaled(a *CSC, seed uint64) *CSC {
	r := rand.New(rand.NewPCG(seed, 7))
	d := make([]float64, a.N)
	for i := range d {
		d[i] = math.Pow(10, 2*r.Float64()-1)
	}
	b := a.Copy()
	for j := 0; j < b.M; j++ {
		for p := b.P[j]; p < b.P[j+1]; p++ {
			b.X[p] *= d[b.I[p]] * d[j]
		}
	}
	return b
}

// denseGalerkin returns Pᵀ·A·P for the dense fine matrix a and the
// prolongator p, by gonum's dense products (the reference).
func denseGalerkin(a *mat.Dense, p *CSC) *mat.Dense {
	pd := denseOf(p)
	var ap, g mat.Dense
	ap.Mul(a, pd)
	g.Mul(pd.T(), &ap)
	return &g
}

// A refreshed plain-aggregation hierarchy holds, on every level, the
// Galerkin product P̂ᵀ·A·P̂ of the new values, computed here densely with
// gonum from the same prolongators (the reference), and PCG with it solves
// the new system to the solution of gonum's dense LU.
func TestAMGRefreshMatchesDenseGalerkin(t *testing.T) {
	for _, seed := range []uint64{1, 2, 3} {
		a := randomLaplacian(600, 6, 2, seed)
		m, err := NewAMG(a, &AMGOptions{CoarseSize: 20, Unsmoothed: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(m.levels) < 3 {
			t.Fatalf("seed %d: only %d levels", seed, len(m.levels))
		}
		// As built, and after a refresh for new values.
		fine := denseOf(a)
		for l := 0; l+1 < len(m.levels); l++ {
			want := denseGalerkin(fine, m.levels[l].p)
			got := denseOf(m.levels[l+1].a)
			if !mat.EqualApprox(got, want, 1e-13*mat.Norm(want, math.Inf(1))) {
				t.Fatalf("seed %d, level %d as built differs from the dense Galerkin product", seed, l+1)
			}
			fine = got
		}
		b := rescaled(a, seed)
		if err := m.Refresh(b); err != nil {
			t.Fatal(err)
		}
		fine = denseOf(b)
		for l := 0; l+1 < len(m.levels); l++ {
			want := denseGalerkin(fine, m.levels[l].p)
			got := denseOf(m.levels[l+1].a)
			r, c := want.Dims()
			scale := mat.Norm(want, math.Inf(1))
			for i := 0; i < r; i++ {
				for j := 0; j < c; j++ {
					if d := math.Abs(got.At(i, j) - want.At(i, j)); d > 1e-13*scale {
						t.Fatalf("seed %d, level %d: entry (%d, %d) %g, dense Galerkin product %g", seed, l+1, i, j, got.At(i, j), want.At(i, j))
					}
				}
			}
			fine = got
		}
		rhs := make([]float64, b.N)
		for i := range rhs {
			rhs[i] = math.Sin(float64(i))
		}
		var lu mat.LU
		lu.Factorize(denseOf(b))
		var ref mat.VecDense
		if err := lu.SolveVecTo(&ref, false, mat.NewVecDense(b.N, append([]float64(nil), rhs...))); err != nil {
			t.Fatal(err)
		}
		x := make([]float64, b.N)
		const tol = 1e-10
		if _, _, err := PCG(b, x, rhs, m, tol, 500); err != nil {
			t.Fatalf("seed %d: PCG with the refreshed hierarchy: %v", seed, err)
		}
		var ch Cholesky
		if err := ch.Factor(b); err != nil {
			t.Fatal(err)
		}
		// Forward error ≤ κ·(relative residual), with a margin of 10 (as
		// TestPCGAMGMatchesCholesky bounds it; Golub & Van Loan, Matrix
		// Computations, 4th ed., 2013, §2.6, from memory).
		if d, bound := relDiff(x, ref.RawVector().Data), 10*ch.Cond1Est()*tol; d > bound {
			t.Fatalf("seed %d: relative difference from gonum's LU %g > bound %g", seed, d, bound)
		}
	}
}

// Refresh refuses a smoothed hierarchy and a matrix of another pattern:
// programmer misuse, so it panics.
func TestAMGRefreshMisusePanics(t *testing.T) {
	a := gridLaplacian(20, 1)
	for name, f := range map[string]func(){
		"smoothed": func() {
			m, err := NewAMG(a, &AMGOptions{CoarseSize: 20})
			if err != nil {
				t.Fatal(err)
			}
			_ = m.Refresh(a)
		},
		"pattern": func() {
			m, err := NewAMG(a, &AMGOptions{CoarseSize: 20, Unsmoothed: true})
			if err != nil {
				t.Fatal(err)
			}
			_ = m.Refresh(gridLaplacian(21, 1))
		},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: no panic", name)
				}
			}()
			f()
		}()
	}
}
