package sparse

import (
	"errors"
	"testing"

	"pgregory.net/rapid"
)

// A floating node — one with no DC path to anything — has an all-zero row
// and column in the DC nodal matrix (common knowledge of nodal analysis,
// from memory). Both factorisations must name exactly that unknown, which
// is what the design-rule checker reports to the user. gonum's dense LU
// (Gonum authors, 2024) confirms the matrix is singular.
func TestFloatingNodeIsNamed(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(2, 50).Draw(t, "n")
		float := rapid.IntRange(0, n-1).Draw(t, "float")
		g := randSPD(t, n)
		tr := NewTriplet(n, n, g.Nnz())
		for j := 0; j < n; j++ {
			for p := g.P[j]; p < g.P[j+1]; p++ {
				if i := int(g.I[p]); i != float && j != float {
					tr.Add(i, j, g.X[p])
				}
			}
		}
		a := tr.Compress()
		if _, err := gonumSolve(a, make([]float64, n)); err == nil {
			t.Fatalf("gonum does not see the matrix as singular")
		}
		var f LU
		err := f.Factor(a)
		var sg *Singular
		if !errors.As(err, &sg) || sg.Col != float {
			t.Fatalf("LU: want *Singular{Col: %d}, got %v", float, err)
		}
		var ch Cholesky
		err = ch.Factor(a)
		var npd *NotPositiveDefinite
		if !errors.As(err, &npd) || npd.Col != float {
			t.Fatalf("Cholesky: want *NotPositiveDefinite{Col: %d}, got %v", float, err)
		}
	})
}
