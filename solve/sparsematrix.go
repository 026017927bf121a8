// sparsematrix.go: the CSC form of a stamped system, shared by the sparse solvers.

package solve

import (
	"nodal/solve/sparse"
)

// sparseMatrix is the CSC form of a system, built once from its stamps and
// refreshed in O(nnz) after each assembly.
type sparseMatrix struct {
	a    *sparse.CSC
	slot []int32
}

func (m *sparseMatrix) update(s *system) {
	if m.a == nil {
		t := &sparse.Triplet{N: s.n, M: s.n, I: s.row, J: s.col, X: s.val}
		m.a, m.slot = t.CompressMap()
		return
	}
	m.a.SetValues(s.val, m.slot)
}

// mul is y ← A·x; A is symmetric, and the transposed product (a gather per
// column) is the faster loop.
func (m *sparseMatrix) mul(y, x []float64) { m.a.MulVecTrans(y, x) }
