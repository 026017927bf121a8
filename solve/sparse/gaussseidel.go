// gaussseidel.go: x ← x + (D+L)⁻¹(b − A·x) (forward) or x + (D+U)⁻¹(b − A·x) (backward), A symmetric

package sparse

// gaussSeidel performs one Gauss–Seidel sweep on A·x = b for a symmetric
// matrix A stored in CSC form, whose column i therefore also lists row i:
// x_i ← (b_i − Σ_{j≠i} a_ij·x_j) / a_ii for i ascending (forward) or
// descending (backward). A forward sweep followed by a backward one is the
// symmetric Gauss–Seidel smoother, which keeps a multigrid V-cycle
// symmetric so that it can precondition conjugate gradients.
func gaussSeidel(a *CSC, diag, x, b []float64, forward bool) {
	n := a.M
	step := func(i int) {
		s := b[i]
		for p := a.P[i]; p < a.P[i+1]; p++ {
			s -= a.X[p] * x[a.I[p]]
		}
		// The loop subtracted a_ii·x_i too; add it back.
		x[i] = (s + diag[i]*x[i]) / diag[i]
	}
	if forward {
		for i := 0; i < n; i++ {
			step(i)
		}
	} else {
		for i := n - 1; i >= 0; i-- {
			step(i)
		}
	}
}
