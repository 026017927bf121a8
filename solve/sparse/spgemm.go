// spgemm.go: C ← A·B for sparse A, B in CSC form (column-by-column, Gustavson)

package sparse

import "fmt"

// mulCSC returns C = A·B. Column j of C is Σ_k A(:,k)·b_kj over the nonzeros
// of B(:,j), accumulated in a dense work vector with a marker array
// (F. G. Gustavson, "Two fast algorithms for sparse matrices: multiplication
// and permuted transposition", ACM Trans. Math. Softw. 4(3), 1978). Work is
// proportional to the flops plus n+m.
func mulCSC(a, b *CSC) *CSC {
	c, _ := mulCSCLimit(a, b, -1)
	return c
}

// mulCSCLimit is mulCSC that gives up, returning nil and false, as soon as
// C would hold more than limit entries (no limit when limit < 0). It stops
// within one column of passing the limit, so a product that would fill in
// costs no more memory than the limit.
func mulCSCLimit(a, b *CSC, limit int) (*CSC, bool) {
	if a.M != b.N {
		panic(fmt.Sprintf("sparse: product of %d×%d and %d×%d", a.N, a.M, b.N, b.M))
	}
	c := &CSC{N: a.N, M: b.M, P: make([]int32, b.M+1)}
	capacity := a.Nnz() + b.Nnz()
	if limit >= 0 {
		capacity = min(capacity, limit)
	}
	c.I = make([]int32, 0, capacity)
	c.X = make([]float64, 0, capacity)
	mark := make([]int32, a.N)
	for i := range mark {
		mark[i] = -1
	}
	w := make([]float64, a.N)
	for j := 0; j < b.M; j++ {
		start := len(c.I)
		for q := b.P[j]; q < b.P[j+1]; q++ {
			k, bkj := b.I[q], b.X[q]
			for p := a.P[k]; p < a.P[k+1]; p++ {
				i := a.I[p]
				if mark[i] != int32(j) {
					mark[i] = int32(j)
					c.I = append(c.I, i)
					w[i] = a.X[p] * bkj
				} else {
					w[i] += a.X[p] * bkj
				}
			}
		}
		if limit >= 0 && len(c.I) > limit {
			return nil, false
		}
		for p := start; p < len(c.I); p++ {
			c.X = append(c.X, w[c.I[p]])
		}
		checkIndexRange(c.N, c.M, len(c.I))
		c.P[j+1] = int32(len(c.I))
	}
	return c, true
}
