// lsolve.go: x ← L⁻¹x for lower-triangular L in CSC form with the diagonal first in each column

package sparse

// lsolve overwrites x with L⁻¹x by column-oriented forward substitution.
// Each column of L must store its diagonal entry first.
func lsolve(l *CSC, x []float64) {
	for j := 0; j < l.M; j++ {
		p0, p1 := l.P[j], l.P[j+1]
		xj := x[j] / l.X[p0]
		x[j] = xj
		if xj == 0 {
			continue
		}
		for p := p0 + 1; p < p1; p++ {
			x[l.I[p]] -= l.X[p] * xj
		}
	}
}
