// lu.go: P·A·Q = L·U by left-looking sparse LU with threshold partial pivoting (Gilbert–Peierls)

package sparse

import (
	"fmt"
	"math"
)

// DefaultLUTol is the default threshold τ of LU's partial pivoting: the
// diagonal entry is kept as pivot when |a_jj| ≥ τ·max_i|a_ij| over the
// candidate rows (common practice for sparse LU; 0.1 bounds the growth per
// step by 1 + 1/τ = 11).
const DefaultLUTol = 0.1

// DefaultSingularTol is the default relative singularity tolerance of LU:
// a column whose largest candidate pivot is at most 1000·ε times the
// largest magnitude in the original column is numerically singular (common
// practice, not a published constant).
const DefaultSingularTol = 1000 * 2.220446049250313e-16

// LU is a sparse LU factorisation P·A·Q = L·U of a square matrix, with Q a
// fill-reducing column order from AMD on A + Aᵀ and P chosen by threshold
// partial pivoting. L is unit lower triangular (diagonal stored first in each
// column), U is upper triangular (diagonal stored last).
//
// Analyze chooses Q; Factorize computes L, U and the pivot order P; Refactor
// recomputes the values for a matrix with the same pattern, keeping P and the
// patterns of L and U, which is what a Newton iteration wants.
type LU struct {
	// Tol is the pivot threshold τ ∈ (0, 1]; zero means DefaultLUTol. τ = 1
	// is ordinary partial pivoting. Refactor applies the same test to its
	// kept pivots.
	Tol float64
	// SingularTol is the relative tolerance for declaring a column
	// numerically singular; zero means DefaultSingularTol.
	SingularTol float64

	n     int
	q     []int32 // column order: column k of L·U is column q[k] of A
	pinv  []int32 // pinv[i] = k: row i of A is row k of L·U
	l, u  *CSC
	aP    []int32 // pattern of A at Factorize, checked by Refactor
	aI    []int32
	anorm float64

	x                          []float64
	stack, pstack, out, mark   []int32
	lpend                      []int32
	analysed, factored, hasPat bool
}

func (f *LU) tol() float64 {
	if f.Tol == 0 {
		return DefaultLUTol
	}
	if f.Tol < 0 || f.Tol > 1 {
		panic(fmt.Sprintf("sparse: LU.Tol %g outside (0, 1]", f.Tol))
	}
	return f.Tol
}

func (f *LU) singularTol() float64 {
	if f.SingularTol == 0 {
		return DefaultSingularTol
	}
	return f.SingularTol
}

// Analyze chooses the column pre-order Q by AMD on the pattern of A + Aᵀ and
// allocates the workspace. It panics if A is not square.
func (f *LU) Analyze(a *CSC) {
	f.AnalyzePerm(a, AMD(a))
}

// AnalyzePerm is Analyze with a caller-supplied column order q (q[k] is the
// column of A factored k-th).
func (f *LU) AnalyzePerm(a *CSC, q []int32) {
	a.mustSquare("LU")
	n := a.N
	if !isPermutation(q, n) {
		panic("sparse: LU column order is not a permutation")
	}
	f.n = n
	f.q = append([]int32(nil), q...)
	f.pinv = make([]int32, n)
	f.x = make([]float64, n)
	f.stack = make([]int32, n)
	f.pstack = make([]int32, n)
	f.out = make([]int32, n)
	f.mark = make([]int32, n)
	f.lpend = make([]int32, n)
	f.analysed = true
	f.factored = false
	f.hasPat = false
}

func isPermutation(p []int32, n int) bool {
	if len(p) != n {
		return false
	}
	seen := make([]bool, n)
	for _, i := range p {
		if i < 0 || int(i) >= n || seen[i] {
			return false
		}
		seen[i] = true
	}
	return true
}

// Factor is Analyze followed by Factorize.
func (f *LU) Factor(a *CSC) error {
	f.Analyze(a)
	return f.Factorize(a)
}

// Factorize computes P·A·Q = L·U with the column order from Analyze (called
// first if needed). Column k is computed as x = L⁻¹·A(:,q[k]) by a sparse
// triangular solve whose pattern comes from luReach (Gilbert & Peierls
// 1988; Davis 2006, §6.3), so the work is proportional to the flops. The
// pivot is the diagonal row q[k] if it passes the threshold test, otherwise
// the candidate of largest magnitude. Entries that are structurally nonzero
// are kept even when their value is zero, so Refactor can reuse the pattern.
//
// It returns *Singular naming the column of A that has no usable pivot.
func (f *LU) Factorize(a *CSC) error {
	if !f.analysed {
		f.Analyze(a)
	}
	if a.N != f.n || a.M != f.n {
		panic(fmt.Sprintf("sparse: LU.Factorize dimension %d×%d, analysed %d", a.N, a.M, f.n))
	}
	n := f.n
	tau := f.tol()
	stol := f.singularTol()
	f.factored = false
	f.hasPat = false
	f.anorm = a.Norm1()
	nz := a.Nnz()
	// Storage of a previous factorisation of this size is reused (a Newton
	// loop that must re-pivot then allocates nothing new); otherwise start
	// from a guess of 4·nnz(A)+n entries per factor and let append grow it.
	var lp, up, li, ui []int32
	var lx, ux []float64
	if f.l != nil && f.l.M == n {
		lp, up = f.l.P, f.u.P
		li, lx, ui, ux = f.l.I[:0], f.l.X[:0], f.u.I[:0], f.u.X[:0]
	} else {
		lp = make([]int32, n+1)
		up = make([]int32, n+1)
		li = make([]int32, 0, 4*nz+n)
		lx = make([]float64, 0, 4*nz+n)
		ui = make([]int32, 0, 4*nz+n)
		ux = make([]float64, 0, 4*nz+n)
	}
	f.l, f.u = nil, nil
	pinv, x, out, mark, lpend := f.pinv, f.x, f.out, f.mark, f.lpend
	for i := range pinv {
		pinv[i] = -1
		mark[i] = 0
		lpend[i] = -1
	}
	for k := 0; k < n; k++ {
		col := int(f.q[k])
		stamp := int32(k + 1)
		top := luReach(a, col, lp, lpend, li, pinv, f.stack, f.pstack, out, mark, stamp)
		colMax := 0.0
		for p := a.P[col]; p < a.P[col+1]; p++ {
			x[a.I[p]] += a.X[p]
			colMax = math.Max(colMax, math.Abs(a.X[p]))
		}
		// Sparse triangular solve in topological order.
		for _, i := range out[top:] {
			j := pinv[i]
			if j < 0 {
				continue
			}
			xi := x[i]
			if xi == 0 {
				continue
			}
			for p := lp[j] + 1; p < lp[j+1]; p++ {
				x[li[p]] -= lx[p] * xi
			}
		}
		// U(:,k) above the diagonal, and the pivot search.
		ipiv := int32(-1)
		amax := -1.0
		for _, i := range out[top:] {
			if j := pinv[i]; j >= 0 {
				ui = append(ui, j)
				ux = append(ux, x[i])
			} else if v := math.Abs(x[i]); v > amax {
				amax = v
				ipiv = i
			}
		}
		if ipiv < 0 || amax <= stol*colMax || math.IsNaN(amax) || math.IsInf(amax, 0) {
			for _, i := range out[top:] {
				x[i] = 0
			}
			return &Singular{Col: col}
		}
		if pinv[col] < 0 && mark[col] == stamp && math.Abs(x[col]) >= tau*amax {
			ipiv = int32(col)
		}
		pivot := x[ipiv]
		ui = append(ui, int32(k))
		ux = append(ux, pivot)
		up[k+1] = int32(len(ui))
		pinv[ipiv] = int32(k)
		// Symmetric pruning (S. C. Eisenstat and J. W. H. Liu, "Exploiting
		// structural symmetry in unsymmetric sparse symbolic factorization",
		// SIAM J. Matrix Anal. Appl. 13(1), 1992): if u_jk ≠ 0 and
		// l_(ipiv)j ≠ 0, every row of L(:,j) not yet pivotal is also in
		// L(:,k), so later searches through j need only its pivotal rows.
		// Those are moved to the front of L(:,j) and the rest skipped.
		for _, i := range out[top:] {
			j := pinv[i]
			if j < 0 || j == int32(k) || lpend[j] >= 0 {
				continue
			}
			lo, hi := lp[j]+1, lp[j+1]
			found := false
			for p := lo; p < hi; p++ {
				if li[p] == ipiv {
					found = true
					break
				}
			}
			if !found {
				continue
			}
			for lo < hi {
				if pinv[li[lo]] >= 0 {
					lo++
					continue
				}
				hi--
				li[lo], li[hi] = li[hi], li[lo]
				lx[lo], lx[hi] = lx[hi], lx[lo]
			}
			lpend[j] = lo
		}
		// L(:,k): unit diagonal first, then the multipliers.
		li = append(li, ipiv)
		lx = append(lx, 1)
		for _, i := range out[top:] {
			if pinv[i] < 0 {
				li = append(li, i)
				lx = append(lx, x[i]/pivot)
			}
			x[i] = 0
		}
		lp[k+1] = int32(len(li))
		checkIndexRange(n, n, max(len(li), len(ui)))
	}
	// Renumber the rows of L into pivot order.
	for p, i := range li {
		li[p] = pinv[i]
	}
	f.l = &CSC{N: n, M: n, P: lp, I: li, X: lx}
	f.u = &CSC{N: n, M: n, P: up, I: ui, X: ux}
	f.aP = append(f.aP[:0], a.P...)
	f.aI = append(f.aI[:0], a.I[:nz]...)
	f.factored = true
	f.hasPat = true
	return nil
}

// Refactor recomputes L and U for new values of a matrix with the same
// pattern as the last successful Factorize, reusing its pivot order and the
// patterns of L and U (no search, no allocation). If a kept pivot fails the
// threshold test |u_kk| ≥ τ·max_i|l_ik·u_kk| it returns *PivotTooSmall and the
// factorisation is invalid until the caller calls Factorize. It panics if the
// pattern of A differs from the one factorised.
func (f *LU) Refactor(a *CSC) error {
	if !f.hasPat {
		panic("sparse: LU.Refactor before a successful Factorize")
	}
	if a.N != f.n || a.M != f.n || a.Nnz() != len(f.aI) {
		panic("sparse: LU.Refactor pattern differs from the factorised one")
	}
	for j, p := range a.P {
		if p != f.aP[j] {
			panic("sparse: LU.Refactor pattern differs from the factorised one")
		}
	}
	for p, i := range a.I[:len(f.aI)] {
		if i != f.aI[p] {
			panic("sparse: LU.Refactor pattern differs from the factorised one")
		}
	}
	tau := f.tol()
	f.factored = false
	f.anorm = a.Norm1()
	l, u, x, pinv := f.l, f.u, f.x, f.pinv
	for k := 0; k < f.n; k++ {
		col := f.q[k]
		for p := a.P[col]; p < a.P[col+1]; p++ {
			x[pinv[a.I[p]]] += a.X[p]
		}
		// U(:,k) was stored in topological order, so each x_j is final
		// when it is read.
		uend := u.P[k+1] - 1
		for p := u.P[k]; p < uend; p++ {
			j := u.I[p]
			xj := x[j]
			x[j] = 0
			u.X[p] = xj
			if xj == 0 {
				continue
			}
			for q := l.P[j] + 1; q < l.P[j+1]; q++ {
				x[l.I[q]] -= l.X[q] * xj
			}
		}
		pivot := x[k]
		x[k] = 0
		amax := math.Abs(pivot)
		for q := l.P[k] + 1; q < l.P[k+1]; q++ {
			amax = math.Max(amax, math.Abs(x[l.I[q]]))
		}
		if pivot == 0 || math.Abs(pivot) < tau*amax || math.IsNaN(amax) || math.IsInf(amax, 0) {
			for q := l.P[k] + 1; q < l.P[k+1]; q++ {
				x[l.I[q]] = 0
			}
			return &PivotTooSmall{Col: int(col), Pivot: pivot, Max: amax}
		}
		u.X[uend] = pivot
		for q := l.P[k] + 1; q < l.P[k+1]; q++ {
			r := l.I[q]
			l.X[q] = x[r] / pivot
			x[r] = 0
		}
	}
	f.factored = true
	return nil
}

func (f *LU) mustFactored(op string, b []float64) {
	if !f.factored {
		panic("sparse: LU." + op + " without a successful factorisation")
	}
	if len(b) != f.n {
		panic("sparse: LU." + op + " dimension mismatch")
	}
}

// Solve overwrites b with A⁻¹b: A = Pᵀ·L·U·Qᵀ, so x = Q·U⁻¹·L⁻¹·P·b.
func (f *LU) Solve(b []float64) {
	f.mustFactored("Solve", b)
	x := f.x
	for i, k := range f.pinv {
		x[k] = b[i]
	}
	lsolve(f.l, x)
	usolve(f.u, x)
	for k, j := range f.q {
		b[j] = x[k]
	}
	clear(x)
}

// SolveTranspose overwrites b with A⁻ᵀb: x = Pᵀ·L⁻ᵀ·U⁻ᵀ·Qᵀ·b.
func (f *LU) SolveTranspose(b []float64) {
	f.mustFactored("SolveTranspose", b)
	x := f.x
	for k, j := range f.q {
		x[k] = b[j]
	}
	utsolve(f.u, x)
	ltsolve(f.l, x)
	for i, k := range f.pinv {
		b[i] = x[k]
	}
	clear(x)
}

// L returns the unit lower-triangular factor (rows in pivot order). It is
// owned by the receiver and overwritten by the next Factorize or Refactor.
func (f *LU) L() *CSC { return f.l }

// U returns the upper-triangular factor. It is owned by the receiver and
// overwritten by the next Factorize or Refactor.
func (f *LU) U() *CSC { return f.u }

// ColPerm returns Q as an order: column k of L·U is column ColPerm()[k] of A.
func (f *LU) ColPerm() []int32 { return f.q }

// RowPerm returns P as an order: row k of L·U is row RowPerm()[k] of A.
func (f *LU) RowPerm() []int32 {
	p := make([]int32, f.n)
	for i, k := range f.pinv {
		p[k] = int32(i)
	}
	return p
}

// Cond1Est returns an estimate of the 1-norm condition number
// κ₁(A) = ‖A‖₁·‖A⁻¹‖₁ of the factorised matrix (see cond1est).
func (f *LU) Cond1Est() float64 {
	if !f.factored {
		panic("sparse: LU.Cond1Est without a successful factorisation")
	}
	return f.anorm * invNorm1Est(f.n, f.Solve, f.SolveTranspose)
}
