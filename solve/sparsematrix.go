// sparsematrix.go: the CSC form of a stamped system, shared by the sparse solvers.

package solve

import (
	"nodal/solve/sparse"
)

// sparseMatrix is the CSC form of a system, built once from its stamps and
// refreshed after each assembly.
type sparseMatrix struct {
	a    *sparse.CSC
	slot []int32
	// fixed holds A's values summed from the system's first fixedK
	// stamps, which every assembly writes alike (system.fixed), so that a
	// refresh starts from a copy of it and sums only the stamps after
	// them, in the same order as summing them all: the same values.
	fixed  []float64
	fixedK int
}

func (m *sparseMatrix) update(s *system) {
	if m.a == nil {
		t := &sparse.Triplet{N: s.n, M: s.n, I: s.row, J: s.col, X: s.val}
		m.a, m.slot = t.CompressMap()
		return
	}
	k := s.fixed
	if k == 0 {
		m.a.SetValues(s.val, m.slot)
		return
	}
	x := m.a.X
	if m.fixedK != k || len(m.fixed) != len(x) {
		m.fixed = make([]float64, len(x))
		for q, v := range s.val[:k] {
			m.fixed[m.slot[q]] += v
		}
		m.fixedK = k
	}
	copy(x, m.fixed)
	for q := k; q < len(s.val); q++ {
		x[m.slot[q]] += s.val[q]
	}
}

// mul is y ← A·x; A is symmetric, and the transposed product (a gather per
// column) is the faster loop.
func (m *sparseMatrix) mul(y, x []float64) { m.a.MulVecTrans(y, x) }
