// cholesky.go: P·A·Pᵀ = L·Lᵀ for symmetric positive-definite A — symbolic analysis, driver and solve

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
	c      *CSC    // upper triangle of P·A·Pᵀ (pattern for the symbolic phase)
	cl     *CSC    // lower triangle of P·A·Pᵀ (values for the numeric phase)
	slot   []int32 // A entry p → cl entry slot[p] (or -1)
	aNnz   int
	aP, aI []int32 // pattern of A at Analyze, checked by Factorize
	sn     supernodes
	l      *CSC // CSC copy of L, built on demand
	anorm  float64

	// Workspace, allocated once in Analyze.
	x                  []float64
	dorig              []float64
	stack, mark        []int32
	relpos             []int32
	link, nextSN, kpos []int32
	wbuf               []float64

	analysed, factored bool
}

// Analyze computes the symbolic factorisation of the n×n matrix A: an AMD
// ordering, the elimination tree and the exact column counts of L, and
// allocates L. It panics if A is not square.
//
// Column counts are found by walking the row subtrees of the elimination
// tree (Davis 2006, §4.4), which costs O(nnz(L)); a second walk lists the
// row structure of each supernode (see buildSupernodes).
func (ch *Cholesky) Analyze(a *CSC) {
	ch.AnalyzePerm(a, AMD(a))
}

// AnalyzePerm is Analyze with a caller-supplied ordering (perm[k] = original
// index eliminated k-th), which is then refined by a postorder of its
// elimination tree (same fill; see Perm for the order actually used). It
// panics if perm is not a permutation of 0..n-1.
func (ch *Cholesky) AnalyzePerm(a *CSC, perm []int32) {
	_ = ch.analyzePerm(a, perm, -1)
}

// AnalyzeBudget is Analyze that stops as soon as the column counts of L
// pass maxNnzL entries, returning *FillExceeded before the row structure of
// L (the costly part of the symbolic analysis on a matrix that fills in) is
// built or any numeric work is done. The column counts are accumulated row
// by row (row k of L is the reach of row k of A in the elimination tree),
// so the analysis stops after O(maxNnzL) work, not O(nnz(L)). After an
// error the Cholesky is not analysed.
func (ch *Cholesky) AnalyzeBudget(a *CSC, maxNnzL int) error {
	return ch.analyzePerm(a, AMD(a), maxNnzL)
}

func (ch *Cholesky) analyzePerm(a *CSC, perm []int32, limit int) error {
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
	// Compose the ordering with a postorder of its elimination tree: same
	// fill, but supernodes become runs of consecutive columns.
	c, _ := symPermUpper(a, invPerm(perm))
	post := postorder(etree(c))
	ch.perm = make([]int32, n)
	for k, j := range post {
		ch.perm[k] = perm[j]
	}
	ch.pinv = invPerm(ch.perm)
	ch.c, _ = symPermUpper(a, ch.pinv)
	ch.cl, ch.slot = symPermLower(a, ch.pinv)
	ch.aNnz = a.Nnz()
	ch.aP = append(ch.aP[:0], a.P...)
	ch.aI = append(ch.aI[:0], a.I[:a.Nnz()]...)
	ch.parent = etree(ch.c)
	ch.stack = make([]int32, n)
	ch.mark = make([]int32, n)
	ch.x = make([]float64, n)
	ch.dorig = make([]float64, n)
	ch.relpos = make([]int32, n)

	// counts[j] = nnz(L(:,j)) including the diagonal.
	counts := make([]int32, n)
	for j := range counts {
		counts[j] = 1
		ch.mark[j] = -1
	}
	total := n
	for k := 0; k < n; k++ {
		top := ereach(ch.c, k, ch.parent, ch.stack, ch.mark)
		for _, j := range ch.stack[top:] {
			counts[j]++
		}
		total += len(ch.stack) - top
		if limit >= 0 && total > limit {
			ch.analysed, ch.factored, ch.l = false, false, nil
			ch.sn = supernodes{}
			return &FillExceeded{NnzL: total, Budget: limit, Rows: k + 1, N: n}
		}
	}
	checkIndexRange(n, n, total)
	ch.sn = buildSupernodes(ch.c, ch.parent, counts, ch.stack, ch.mark)
	ns := len(ch.sn.super) - 1
	ch.link = make([]int32, ns)
	ch.nextSN = make([]int32, ns)
	ch.kpos = make([]int32, ns)
	ch.l = nil
	ch.analysed = true
	ch.factored = false
	return nil
}

// Factorize computes the numeric factor L for the values of A, which must
// have the pattern given to Analyze (Analyze is called first if it has not
// been). It returns *NotPositiveDefinite if a pivot is not positive; the
// factor is then unusable until a successful Factorize.
//
// The numeric work is the left-looking supernodal method (see
// factorSupernodal): columns with a shared row structure are factorised
// together as dense blocks, and large block updates go to gonum's Dgemm.
// Factorize allocates nothing after the first call on a pattern beyond the
// update buffer, which only grows.
func (ch *Cholesky) Factorize(a *CSC) error {
	if !ch.analysed {
		ch.Analyze(a)
	}
	if !ch.samePattern(a) {
		panic(fmt.Sprintf("sparse: Cholesky.Factorize pattern differs from the analysed one (%d×%d, nnz %d)", a.N, a.M, a.Nnz()))
	}
	ch.factored = false
	tol := ch.Tol
	if tol == 0 {
		tol = DefaultCholeskyTol
	}
	cl := ch.cl
	clear(cl.X)
	for p, q := range ch.slot {
		if q >= 0 {
			cl.X[q] += a.X[p]
		}
	}
	ch.l = nil
	if k := ch.factorSupernodal(cl, tol); k >= 0 {
		return &NotPositiveDefinite{Col: int(ch.perm[k])}
	}
	ch.anorm = symNorm1(cl)
	ch.factored = true
	return nil
}

// symNorm1 returns ‖A‖₁ of the symmetric matrix whose upper or lower triangle is C.
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

// samePattern reports whether A has the pattern given to Analyze (O(nnz)).
func (ch *Cholesky) samePattern(a *CSC) bool {
	if a.N != ch.n || a.M != ch.n || a.Nnz() != ch.aNnz {
		return false
	}
	for j, p := range a.P {
		if p != ch.aP[j] {
			return false
		}
	}
	for p, i := range a.I[:ch.aNnz] {
		if i != ch.aI[p] {
			return false
		}
	}
	return true
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
	ch.sn.solve(x)
	for k, i := range ch.perm {
		b[i] = x[k]
	}
	clear(x)
}

// L returns the factor L in CSC form (diagonal first in each column, rows in
// the permuted numbering). It is built from the supernodal storage on the
// first call after each Factorize and owned by the receiver.
func (ch *Cholesky) L() *CSC {
	if !ch.factored {
		panic("sparse: Cholesky.L without a successful Factorize")
	}
	if ch.l == nil {
		ch.l = ch.sn.toCSC(ch.n)
	}
	return ch.l
}

// Perm returns the ordering: row/column k of L is unknown Perm()[k] of A.
func (ch *Cholesky) Perm() []int32 { return ch.perm }

// NnzL returns nnz(L) including the diagonal, known after Analyze.
func (ch *Cholesky) NnzL() int { return ch.sn.nnzL }
