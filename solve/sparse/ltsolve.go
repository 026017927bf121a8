// ltsolve.go: x ← L⁻ᵀx for lower-triangular L in CSC form with the diagonal first in each column

package sparse

// ltsolve overwrites x with L⁻ᵀx by backward substitution, using each
// column of L as a row of Lᵀ (a dot product per unknown).
func ltsolve(l *CSC, x []float64) {
	for j := l.M - 1; j >= 0; j-- {
		p0, p1 := l.P[j], l.P[j+1]
		s := x[j]
		for p := p0 + 1; p < p1; p++ {
			s -= l.X[p] * x[l.I[p]]
		}
		x[j] = s / l.X[p0]
	}
}
