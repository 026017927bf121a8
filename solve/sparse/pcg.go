// pcg.go: x ← A⁻¹b for symmetric positive-definite A by preconditioned conjugate gradients

package sparse

import "math"

// Preconditioner applies z ← M⁻¹r for a symmetric positive-definite M ≈ A.
type Preconditioner interface {
	Precondition(z, r []float64)
}

// PCG solves A·x = b for symmetric positive-definite A by the
// preconditioned conjugate gradient method (Hestenes & Stiefel 1952; the
// preconditioned form as in Saad, Iterative Methods for Sparse Linear
// Systems, 2nd ed., SIAM 2003, Alg. 9.1). x holds the initial guess and is
// overwritten with the solution. Iteration stops when
// ‖b − A·x‖₂ ≤ tol·‖b‖₂; m may be nil for no preconditioning. It returns the
// iteration count and the final relative residual, and *NotConverged if
// maxIter iterations did not reach tol. The residual is recomputed
// explicitly at the end, so the reported value is the true one.
func PCG(a *CSC, x, b []float64, m Preconditioner, tol float64, maxIter int) (iter int, relres float64, err error) {
	a.mustSquare("PCG")
	n := a.N
	if len(x) != n || len(b) != n {
		panic("sparse: PCG dimension mismatch")
	}
	bnorm := norm2vec(b)
	if bnorm == 0 {
		clear(x)
		return 0, 0, nil
	}
	if bnorm < 1e-100 || bnorm > 1e100 {
		// The inner products of CG square the residual's scale, so a right
		// side this small or large underflows or overflows them. Solve for
		// b/‖b‖ instead (CG is linear in b) and scale back.
		s := 1 / bnorm
		bs := make([]float64, n)
		for i := range b {
			bs[i] = b[i] * s
			x[i] *= s
		}
		iter, relres, err = pcg(a, x, bs, m, tol, maxIter)
		for i := range x {
			x[i] *= bnorm
		}
		return iter, relres, err
	}
	return pcg(a, x, b, m, tol, maxIter)
}

// pcg is PCG for a right side of moderate norm.
func pcg(a *CSC, x, b []float64, m Preconditioner, tol float64, maxIter int) (iter int, relres float64, err error) {
	n := a.N
	bnorm := norm2vec(b)
	r := make([]float64, n)
	z := make([]float64, n)
	p := make([]float64, n)
	q := make([]float64, n)
	// A is symmetric, so A·x = Aᵀ·x; the transposed product (a gather per
	// column) is the faster loop and is used throughout.
	precond := func() {
		if m == nil {
			copy(z, r)
		} else {
			m.Precondition(z, r)
		}
	}
	trueResidual := func() float64 {
		a.MulVecTrans(r, x)
		for i := range r {
			r[i] = b[i] - r[i]
		}
		return norm2vec(r) / bnorm
	}
	relres = trueResidual()
	for relres > tol && iter < maxIter {
		// (Re)start from the true residual. A restart happens only when
		// the recursively updated residual has drifted below tol while the
		// true one has not (residual replacement; van der Vorst & Ye, SIAM
		// J. Sci. Comput. 22(5), 2000, from memory).
		precond()
		copy(p, z)
		rz := dot(r, z)
		for iter < maxIter {
			a.MulVecTrans(q, p)
			pq := dot(p, q)
			if !(pq > 0) {
				break // A is not positive definite along p, or breakdown
			}
			alpha := rz / pq
			rr := 0.0
			for i := range x {
				x[i] += alpha * p[i]
				r[i] -= alpha * q[i]
				rr += r[i] * r[i]
			}
			iter++
			if math.Sqrt(rr)/bnorm <= tol {
				break
			}
			precond()
			rzNew := dot(r, z)
			beta := rzNew / rz
			rz = rzNew
			for i := range p {
				p[i] = z[i] + beta*p[i]
			}
		}
		prev := relres
		relres = trueResidual()
		if !(relres < prev) && iter < maxIter {
			break // no progress (breakdown); report below
		}
	}
	if !(relres <= tol) {
		return iter, relres, &NotConverged{Iter: iter, RelResidual: relres}
	}
	return iter, relres, nil
}

func dot(x, y []float64) float64 {
	s := 0.0
	for i, v := range x {
		s += v * y[i]
	}
	return s
}

// norm2vec returns ‖x‖₂ without the under- or overflow of a plain sum of
// squares (scaled by the largest entry, as LAPACK's dnrm2 does).
func norm2vec(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	if m == 0 || math.IsInf(m, 0) || math.IsNaN(m) {
		return m
	}
	if m > 1e-100 && m < 1e100 {
		return math.Sqrt(dot(x, x))
	}
	s := 0.0
	for _, v := range x {
		v /= m
		s += v * v
	}
	return m * math.Sqrt(s)
}
