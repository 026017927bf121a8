package sparse

import (
	"math"
	"testing"
)

// The V-cycle's sweeps on levels whose columns are in ascending order
// (half a sweep from zero, the residual from the upper triangle) give the
// cycle of the plain sweeps over whole rows with a full product for the
// residual, up to rounding, for smoothed and plain hierarchies; both are
// symmetric Gauss–Seidel as defined in Saad, Iterative Methods for Sparse
// Linear Systems, 2nd ed., SIAM 2003, §4.1 (from memory).
func TestSplitSweepsMatchWholeRows(t *testing.T) {
	for _, plain := range []bool{false, true} {
		a := randomLaplacian(3000, 6, 2, 5)
		if !plain {
			a = gridLaplacian(60, 0.5)
		}
		m, err := NewAMG(a, &AMGOptions{CoarseSize: 50, Unsmoothed: plain})
		if err != nil {
			t.Fatal(err)
		}
		for l := range m.levels[:len(m.levels)-1] {
			if m.levels[l].dpos == nil {
				t.Fatalf("plain %v: level %d has no split", plain, l)
			}
		}
		r := make([]float64, a.N)
		for i := range r {
			r[i] = math.Cos(float64(3 * i))
		}
		split := make([]float64, a.N)
		m.Precondition(split, r)
		for l := range m.levels {
			m.levels[l].dpos = nil
		}
		whole := make([]float64, a.N)
		m.Precondition(whole, r)
		if d := relDiff(split, whole); d > 1e-12 {
			t.Fatalf("plain %v: split sweeps differ from whole rows by %g", plain, d)
		}
	}
}

// A matrix whose columns are not in ascending order gets the whole-row
// sweeps, and PCG with it still meets its tolerance.
func TestUnsortedColumnsSweepWholeRows(t *testing.T) {
	a := gridLaplacian(20, 1)
	// Reverse the rows of every column: the same matrix, out of order.
	for j := 0; j < a.M; j++ {
		for p, q := a.P[j], a.P[j+1]-1; p < q; p, q = p+1, q-1 {
			a.I[p], a.I[q] = a.I[q], a.I[p]
			a.X[p], a.X[q] = a.X[q], a.X[p]
		}
	}
	m, err := NewAMG(a, &AMGOptions{CoarseSize: 20})
	if err != nil {
		t.Fatal(err)
	}
	if m.levels[0].dpos != nil {
		t.Fatal("reversed columns taken as ascending")
	}
	b := make([]float64, a.N)
	b[7] = 1
	x := make([]float64, a.N)
	if _, res, err := PCG(a, x, b, m, 1e-10, 200); err != nil || res > 1e-10 {
		t.Fatalf("PCG: residual %g, %v", res, err)
	}
}
