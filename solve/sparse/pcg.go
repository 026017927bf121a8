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

func norm2vec(x []float64) float64 { return math.Sqrt(dot(x, x)) }
