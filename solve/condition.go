// condition.go: the equilibrated 1-norm condition estimate shared by the factorising solvers.

package solve

import (
	"math"

	"nodal/solve/sparse"
)

// equilibratedCond estimates κ₁(S) of the symmetric scaling S = D·A·D with
// D = diag(1/√(max_j |a_ij|)), given ‖S‖₁, the scaling d and a routine that
// overwrites v with A⁻¹v for the symmetric matrix A. Scaling the rows and
// columns of A by the same diagonal does not change the solution's
// sensitivity to the circuit's values but removes the part of κ(A) that
// comes only from unknowns of very different scale (a net tied to the rest
// by a picoampere leakage beside nets tied by milliohms): van der Sluis,
// "Condition numbers and equilibration of matrices", Numer. Math. 14, 1969,
// shows that for a symmetric positive-definite A the Jacobi scaling is
// within a factor n of the best diagonal scaling in κ₂. S⁻¹ = D⁻¹A⁻¹D⁻¹,
// so each solve with S is one with A between two scalings.
func equilibratedCond(d []float64, snorm float64, solve func([]float64)) float64 {
	n := len(d)
	if n == 0 {
		return 1
	}
	f := func(v []float64) {
		for i := range v {
			v[i] /= d[i]
		}
		solve(v)
		for i := range v {
			v[i] /= d[i]
		}
	}
	return snorm * sparse.InvNorm1Est(n, f, f)
}

// cond estimates the equilibrated condition number of the matrix last
// compressed, given a solve with its factors (1 for an empty system). The
// estimate solves with A and Aᵀ; A is symmetric, so one solve serves both.
func (m *sparseMatrix) cond(solve func([]float64)) float64 {
	if m.a == nil || m.a.N == 0 {
		return 1
	}
	d, norm := scaling(m.a)
	return equilibratedCond(d, norm, solve)
}

// scaling returns d_i = 1/√(max_j |a_ij|) (1 for an empty row) for the
// symmetric matrix a in CSC form, and ‖D·A·D‖₁.
func scaling(a *sparse.CSC) ([]float64, float64) {
	n := a.M
	d := make([]float64, n)
	for j := 0; j < n; j++ {
		m := 0.0
		for p := a.P[j]; p < a.P[j+1]; p++ {
			m = math.Max(m, math.Abs(a.X[p]))
		}
		d[j] = 1
		if m > 0 {
			d[j] = 1 / math.Sqrt(m)
		}
	}
	norm := 0.0
	for j := 0; j < n; j++ {
		s := 0.0
		for p := a.P[j]; p < a.P[j+1]; p++ {
			s += math.Abs(a.X[p]) * d[a.I[p]] * d[j]
		}
		norm = math.Max(norm, s)
	}
	return d, norm
}
