// utsolve.go: x ← U⁻ᵀx for upper-triangular U in CSC form with the diagonal last in each column

package sparse

// utsolve overwrites x with U⁻ᵀx by forward substitution, using each column
// of U as a row of Uᵀ.
func utsolve(u *CSC, x []float64) {
	for j := 0; j < u.M; j++ {
		p0, p1 := u.P[j], u.P[j+1]
		s := x[j]
		for p := p0; p < p1-1; p++ {
			s -= u.X[p] * x[u.I[p]]
		}
		x[j] = s / u.X[p1-1]
	}
}
