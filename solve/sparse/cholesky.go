// cholesky.go: P·A·Pᵀ = L·Lᵀ for symmetric positive-definite A (up-looking, by rows of L)

package sparse

import (
	"fmt"
	"math"
)

// DefaultCholeskyTol is the default relative pivot tolerance of Cholesky:
// 1000·ε, so a pivot that has lost all but about three significant digits
// of its diagonal to cancellation counts as zero (common practice for
// rank-revealing thresholds, not a published constant).
const DefaultCholeskyTol = 1000 * 2.220446049250313e-16

// Cholesky is a sparse Cholesky factorisation P·A·Pᵀ = L·Lᵀ of a symmetric
// positive-definite matrix, with P a fill-reducing permutation from AMD.
//
// Analyze does the symbolic work once for a pattern (ordering, elimination
// tree, column counts of L, storage); Factorize computes the numeric factor
// and may be called again with new values on the same pattern.
// Only the upper triangle (i ≤ j) of A is read.
type Cholesky struct {
	// Tol is the relative pivot tolerance: a pivot d_k (the value of
	// c_kk − lᵀl before the square root) with d_k ≤ Tol·c_kk is reported as
	// *NotPositiveDefinite, so a floating sub-network (a singular nodal
	// matrix whose last pivot is only rounding noise) is caught. Zero means
	// DefaultCholeskyTol.
	Tol float64

	n      int
	perm   []int32 // perm[k] = original index of row/column k of L
	pinv   []int32
	parent []int32 // elimination tree of P·A·Pᵀ
	c      *CSC    // upper triangle of P·A·Pᵀ
	slot   []int32 // A entry p → C entry slot[p] (or -1)
	aNnz   int
	l      *CSC
	anorm  float64

	// Workspace, allocated once in Analyze.
	x      []float64
	stack  []int32
	mark   []int32
	colEnd []int32

	analysed, factored bool
}

// Analyze computes the symbolic factorisation of the n×n matrix A: an AMD
// ordering, the elimination tree and the exact column counts of L, and
// allocates L. It panics if A is not square.
//
// Column counts are found by walking the row subtrees of the elimination
// tree (Davis 2006, §4.4, "row counts by traversing row subtrees"), which
// costs O(nnz(L)); the same traversal is repeated by the numeric phase.
func (ch *Cholesky) Analyze(a *CSC) {
	ch.AnalyzePerm(a, AMD(a))
}

// AnalyzePerm is Analyze with a caller-supplied ordering (perm[k] = original
// index eliminated k-th). It panics if perm is not a permutation of 0..n-1.
func (ch *Cholesky) AnalyzePerm(a *CSC, perm []int32) {
	a.mustSquare("Cholesky")
	n := a.N
	if len(perm) != n {
		panic("sparse: Cholesky ordering has wrong length")
	}
	seen := make([]bool, n)
	for _, i := range perm {
		if i < 0 || int(i) >= n || seen[i] {
			panic("sparse: Cholesky ordering is not a permutation")
		}
		seen[i] = true
	}
	ch.n = n
	ch.perm = append([]int32(nil), perm...)
	ch.pinv = invPerm(ch.perm)
	ch.c, ch.slot = symPermUpper(a, ch.pinv)
	ch.aNnz = a.Nnz()
	ch.parent = etree(ch.c)
	ch.stack = make([]int32, n)
	ch.mark = make([]int32, n)
	ch.colEnd = make([]int32, n)
	ch.x = make([]float64, n)

	// counts[j] = nnz(L(:,j)) including the diagonal.
	counts := ch.colEnd
	for j := range counts {
		counts[j] = 1
		ch.mark[j] = -1
	}
	for k := 0; k < n; k++ {
		top := ereach(ch.c, k, ch.parent, ch.stack, ch.mark)
		for _, j := range ch.stack[top:] {
			counts[j]++
		}
	}
	lp := make([]int32, n+1)
	total := 0
	for j := 0; j < n; j++ {
		total += int(counts[j])
		checkIndexRange(n, n, total)
		lp[j+1] = int32(total)
	}
	ch.l = &CSC{N: n, M: n, P: lp, I: make([]int32, total), X: make([]float64, total)}
	ch.analysed = true
	ch.factored = false
}

// Factorize computes the numeric factor L for the values of A, which must
// have the pattern given to Analyze (Analyze is called first if it has not
// been). It returns *NotPositiveDefinite if a pivot is not positive; the
// factor is then unusable until a successful Factorize.
//
// The method is the up-looking algorithm (Davis 2006, §4.8): row k of L is
// found by a sparse triangular solve L(0:k,0:k)·l = C(0:k,k) whose pattern is
// the row subtree given by ereach, then l_kk = √(c_kk − lᵀl).
func (ch *Cholesky) Factorize(a *CSC) error {
	if !ch.analysed {
		ch.Analyze(a)
	}
	if a.N != ch.n || a.M != ch.n || a.Nnz() != ch.aNnz {
		panic(fmt.Sprintf("sparse: Cholesky.Factorize pattern differs from the analysed one (%d×%d, nnz %d)", a.N, a.M, a.Nnz()))
	}
	ch.factored = false
	tol := ch.Tol
	if tol == 0 {
		tol = DefaultCholeskyTol
	}
	c, l, x := ch.c, ch.l, ch.x
	clear(c.X)
	for p, q := range ch.slot {
		if q >= 0 {
			c.X[q] += a.X[p]
		}
	}
	for j := 0; j < ch.n; j++ {
		ch.mark[j] = -1
		ch.colEnd[j] = l.P[j]
	}
	for k := 0; k < ch.n; k++ {
		top := ereach(c, k, ch.parent, ch.stack, ch.mark)
		for p := c.P[k]; p < c.P[k+1]; p++ {
			x[c.I[p]] += c.X[p]
		}
		d := x[k]
		ckk := d
		x[k] = 0
		for _, j := range ch.stack[top:] {
			lkj := x[j] / l.X[l.P[j]]
			x[j] = 0
			end := ch.colEnd[j]
			for p := l.P[j] + 1; p < end; p++ {
				x[l.I[p]] -= l.X[p] * lkj
			}
			d -= lkj * lkj
			l.I[end] = int32(k)
			l.X[end] = lkj
			ch.colEnd[j] = end + 1
		}
		if !(d > tol*ckk) || !(d > 0) || math.IsInf(d, 0) {
			// Clear the workspace for the next Factorize.
			clear(x)
			return &NotPositiveDefinite{Col: int(ch.perm[k])}
		}
		p := ch.colEnd[k]
		l.I[p] = int32(k)
		l.X[p] = math.Sqrt(d)
		ch.colEnd[k] = p + 1
	}
	ch.anorm = symNorm1(c)
	ch.factored = true
	return nil
}

// symNorm1 returns ‖A‖₁ of the symmetric matrix whose upper triangle is C.
func symNorm1(c *CSC) float64 {
	s := make([]float64, c.M)
	for j := 0; j < c.M; j++ {
		for p := c.P[j]; p < c.P[j+1]; p++ {
			v := math.Abs(c.X[p])
			s[j] += v
			if int(c.I[p]) != j {
				s[c.I[p]] += v
			}
		}
	}
	m := 0.0
	for _, v := range s {
		m = math.Max(m, v)
	}
	return m
}

// Cond1Est returns an estimate of κ₁(A) = ‖A‖₁·‖A⁻¹‖₁ by the Hager–Higham
// method (see invNorm1Est); A is symmetric, so A⁻ᵀ = A⁻¹.
func (ch *Cholesky) Cond1Est() float64 {
	if !ch.factored {
		panic("sparse: Cholesky.Cond1Est without a successful Factorize")
	}
	return ch.anorm * invNorm1Est(ch.n, ch.Solve, ch.Solve)
}

// Factor is Analyze followed by Factorize.
func (ch *Cholesky) Factor(a *CSC) error {
	ch.Analyze(a)
	return ch.Factorize(a)
}

// Solve overwrites b with A⁻¹b. It panics if the factorisation is not
// valid or len(b) ≠ n.
func (ch *Cholesky) Solve(b []float64) {
	if !ch.factored {
		panic("sparse: Cholesky.Solve without a successful Factorize")
	}
	if len(b) != ch.n {
		panic("sparse: Cholesky.Solve dimension mismatch")
	}
	x := ch.x
	for k, i := range ch.perm {
		x[k] = b[i]
	}
	lsolve(ch.l, x)
	ltsolve(ch.l, x)
	for k, i := range ch.perm {
		b[i] = x[k]
	}
	clear(x)
}

// L returns the factor L (diagonal first in each column, rows in the
// permuted numbering). It is owned by the receiver.
func (ch *Cholesky) L() *CSC { return ch.l }

// Perm returns the ordering: row/column k of L is unknown Perm()[k] of A.
func (ch *Cholesky) Perm() []int32 { return ch.perm }

// NnzL returns nnz(L) including the diagonal, known after Analyze.
func (ch *Cholesky) NnzL() int { return ch.l.Nnz() }
