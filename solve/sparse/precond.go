// precond.go: z ← M⁻¹r for the point preconditioners Jacobi (M = D) and symmetric Gauss–Seidel (M = (D+L)·D⁻¹·(D+U))

package sparse

// Jacobi is the diagonal preconditioner M = diag(A) for a symmetric
// positive-definite A: no set-up beyond the diagonal and no coarsening, so
// it costs O(n) memory whatever the graph of A. On graphs without geometry
// (random, expander-like networks) the diagonally scaled matrix D⁻¹ᐟ²AD⁻¹ᐟ²
// is well conditioned and conjugate gradients with it converge in few
// iterations (Saad, Iterative Methods for Sparse Linear Systems, 2nd ed.,
// SIAM 2003, §10.2, from memory).
type Jacobi struct {
	inv []float64
}

// NewJacobi returns the Jacobi preconditioner of A (both triangles stored,
// or at least the diagonal). It returns *NotPositiveDefinite if a diagonal
// entry is not positive.
func NewJacobi(a *CSC) (*Jacobi, error) {
	j := &Jacobi{}
	return j, j.Update(a)
}

// Update refreshes the preconditioner for new values of A on the same
// dimension.
func (j *Jacobi) Update(a *CSC) error {
	a.mustSquare("Jacobi")
	if len(j.inv) != a.N {
		j.inv = make([]float64, a.N)
	}
	clear(j.inv)
	for c := 0; c < a.M; c++ {
		for p := a.P[c]; p < a.P[c+1]; p++ {
			if int(a.I[p]) == c {
				j.inv[c] += a.X[p]
			}
		}
	}
	for c, d := range j.inv {
		if !(d > 0) {
			return &NotPositiveDefinite{Col: c}
		}
		j.inv[c] = 1 / d
	}
	return nil
}

// Precondition sets z ← D⁻¹r.
func (j *Jacobi) Precondition(z, r []float64) {
	if len(z) != len(j.inv) || len(r) != len(z) {
		panic("sparse: Jacobi.Precondition dimension mismatch")
	}
	for i, v := range r {
		z[i] = v * j.inv[i]
	}
}

// SymGaussSeidel is the symmetric Gauss–Seidel preconditioner
// M = (D+L)·D⁻¹·(D+U) of a symmetric positive-definite A = L + D + U,
// applied as one forward and one backward sweep from z = 0 (Saad 2003,
// §10.2, from memory). It keeps a reference to A, whose values may be
// refreshed in place followed by Update.
type SymGaussSeidel struct {
	a    *CSC
	diag []float64
}

// NewSymGaussSeidel returns the symmetric Gauss–Seidel preconditioner of A
// (both triangles stored). It returns *NotPositiveDefinite if a diagonal
// entry is not positive.
func NewSymGaussSeidel(a *CSC) (*SymGaussSeidel, error) {
	g := &SymGaussSeidel{}
	return g, g.Update(a)
}

// Update takes the current values of A.
func (g *SymGaussSeidel) Update(a *CSC) error {
	a.mustSquare("SymGaussSeidel")
	g.a = a
	if len(g.diag) != a.N {
		g.diag = make([]float64, a.N)
	}
	clear(g.diag)
	for c := 0; c < a.M; c++ {
		for p := a.P[c]; p < a.P[c+1]; p++ {
			if int(a.I[p]) == c {
				g.diag[c] += a.X[p]
			}
		}
		if !(g.diag[c] > 0) {
			return &NotPositiveDefinite{Col: c}
		}
	}
	return nil
}

// Precondition sets z ← M⁻¹r.
func (g *SymGaussSeidel) Precondition(z, r []float64) {
	if len(z) != len(g.diag) || len(r) != len(z) {
		panic("sparse: SymGaussSeidel.Precondition dimension mismatch")
	}
	clear(z)
	gaussSeidel(g.a, g.diag, z, r, true)
	gaussSeidel(g.a, g.diag, z, r, false)
}
