// refresh.go: a plain-aggregation hierarchy's coarse matrices recomputed for new values of A on the same pattern

package sparse

import "fmt"

// galerkinMap returns, for each entry a_ij of the fine matrix A, the index
// of the entry of the coarse matrix Ac = P̂ᵀ·A·P̂ it is summed into: with
// the piecewise-constant prolongator P̂ of plain aggregation,
// (Ac)_{agg[i],agg[j]} = Σ a_ij over i in aggregate agg[i] and j in
// aggregate agg[j], so Ac is the quotient graph of A and each fine entry
// lands in exactly one coarse entry.
func galerkinMap(a *CSC, agg []int32, ac *CSC) []int32 {
	pos := make([]int32, ac.N)
	for i := range pos {
		pos[i] = -1
	}
	// The fine columns of each aggregate, as the coarse columns list them.
	members := tentativeProlongator(a.M, agg, ac.M)
	g := make([]int32, a.Nnz())
	for c := 0; c < ac.M; c++ {
		for q := ac.P[c]; q < ac.P[c+1]; q++ {
			pos[ac.I[q]] = q
		}
		for t := members.P[c]; t < members.P[c+1]; t++ {
			j := members.I[t]
			for q := a.P[j]; q < a.P[j+1]; q++ {
				k := pos[agg[a.I[q]]]
				if k < 0 {
					panic("sparse: Galerkin product misses an entry of the quotient graph")
				}
				g[q] = k
			}
		}
		for q := ac.P[c]; q < ac.P[c+1]; q++ {
			pos[ac.I[q]] = -1
		}
	}
	return g
}

// quotient returns the Galerkin product P̂ᵀ·A·P̂ of plain aggregation, the
// quotient graph of A, in one pass over A: coarse column c sums, for each
// fine column j of aggregate c (the column c of the tentative prolongator
// ph lists them), each entry a_ij into row agg[i], gathered in a dense
// work vector with a marker array as in Gustavson's product (ACM Trans.
// Math. Softw. 4(3), 1978), of which it is the special case for a
// prolongator of ones, without forming A·P̂. It gives up, returning nil and
// false, once the product would hold more than limit entries (no limit
// when limit < 0), as mulCSCLimit does.
func quotient(a, ph *CSC, agg []int32, limit int) (*CSC, bool) {
	nc := ph.M
	c := &CSC{N: nc, M: nc, P: make([]int32, nc+1)}
	capacity := a.Nnz()
	if limit >= 0 {
		capacity = min(capacity, limit)
	}
	c.I = make([]int32, 0, capacity)
	c.X = make([]float64, 0, capacity)
	mark := make([]int32, nc)
	for i := range mark {
		mark[i] = -1
	}
	w := make([]float64, nc)
	for col := 0; col < nc; col++ {
		start := len(c.I)
		for t := ph.P[col]; t < ph.P[col+1]; t++ {
			j := ph.I[t]
			for q := a.P[j]; q < a.P[j+1]; q++ {
				k := agg[a.I[q]]
				if mark[k] != int32(col) {
					mark[k] = int32(col)
					c.I = append(c.I, k)
					w[k] = a.X[q]
				} else {
					w[k] += a.X[q]
				}
			}
		}
		if limit >= 0 && len(c.I) > limit {
			return nil, false
		}
		for q := start; q < len(c.I); q++ {
			c.X = append(c.X, w[c.I[q]])
		}
		checkIndexRange(c.N, c.M, len(c.I))
		c.P[col+1] = int32(len(c.I))
	}
	return c, true
}

// Refresh recomputes a plain-aggregation hierarchy (AMGOptions.Unsmoothed)
// for new values of A on the pattern it was built for: the aggregates and
// prolongators are kept, and each coarse matrix is the Galerkin product
// P̂ᵀ·A·P̂ of the new values, summed in O(nnz) through the map recorded at
// construction, with the coarsest level factorised again numerically. The
// V-cycle is then exactly the one a hierarchy with these aggregates would
// give for the new A, so it stays a symmetric positive-definite
// preconditioner of A; only the aggregates, chosen by the strength of the
// old couplings, may fit the new ones less well, which shows as more
// iterations (the reuse of a multigrid setup across a sequence of related
// matrices; see e.g. Brezina et al., "Adaptive smoothed aggregation (αSA)",
// SIAM J. Sci. Comput. 25(6), 2004, from memory). A is kept by reference
// and used by the finest level. Refresh panics on a hierarchy built with
// smoothing, or a matrix of another pattern; it returns
// *NotPositiveDefinite if a diagonal entry of a level is not positive, and
// the coarsest factorisation's error.
func (m *AMG) Refresh(a *CSC) error {
	if !m.plain {
		panic("sparse: AMG.Refresh on a smoothed hierarchy")
	}
	if a.N != m.levels[0].a.N || a.Nnz() != m.levels[0].a.Nnz() {
		panic("sparse: AMG.Refresh with a different pattern")
	}
	if m.perm != nil {
		m.refreshFinest(a)
	} else {
		if m.levels[0].dpos != nil && a != m.levels[0].a && !sameColumns(a, m.levels[0].a) {
			panic("sparse: AMG.Refresh with a different pattern")
		}
		m.levels[0].a = a
	}
	for l := range m.levels {
		lev := &m.levels[l]
		cur := lev.a
		clear(lev.diag)
		for j := 0; j < cur.M; j++ {
			for q := cur.P[j]; q < cur.P[j+1]; q++ {
				if int(cur.I[q]) == j {
					lev.diag[j] += cur.X[q]
				}
			}
			if !(lev.diag[j] > 0) {
				return &NotPositiveDefinite{Col: j}
			}
		}
		for j, d := range lev.diag {
			lev.invd[j] = 1 / d
		}
		if l == len(m.levels)-1 {
			break
		}
		next := m.levels[l+1].a
		x := next.X[:next.Nnz()]
		clear(x)
		for q, k := range lev.galerkin {
			x[k] += cur.X[q]
		}
	}
	last := m.levels[len(m.levels)-1].a
	if err := m.coarse.Factorize(last); err != nil {
		return fmt.Errorf("sparse: AMG coarsest level: %w", err)
	}
	return nil
}

// refreshFinest copies A's values into the finest level's matrix in colour
// order, Q·A·Qᵀ, through the map recorded by permuted: in A's order, so
// that the reads are sequential, and on both cores for a large matrix
// (each entry of A has its own place in the copy). A must have the
// pattern of the matrix the hierarchy was built for (the same matrix with
// new values, or one with the same columns).
func (m *AMG) refreshFinest(a *CSC) {
	if a != m.fine && !sameColumns(a, m.fine) {
		panic("sparse: AMG.Refresh with a different pattern")
	}
	m.fine = a
	x := m.levels[0].a.X
	a.splitRows(0, a.M, func(lo, hi int) {
		for p := a.P[lo]; p < a.P[hi]; p++ {
			x[m.dst[p]] = a.X[p]
		}
	})
}
