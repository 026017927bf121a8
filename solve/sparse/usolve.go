// usolve.go: x ← U⁻¹x for upper-triangular U in CSC form with the diagonal last in each column

package sparse

// usolve overwrites x with U⁻¹x by column-oriented back substitution. Each
// column of U must store its diagonal entry last.
func usolve(u *CSC, x []float64) {
	for j := u.M - 1; j >= 0; j-- {
		p0, p1 := u.P[j], u.P[j+1]
		xj := x[j] / u.X[p1-1]
		x[j] = xj
		if xj == 0 {
			continue
		}
		for p := p0; p < p1-1; p++ {
			x[u.I[p]] -= u.X[p] * xj
		}
	}
}
