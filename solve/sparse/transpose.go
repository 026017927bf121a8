// transpose.go: C ← Aᵀ for A in CSC form (row indices of C come out sorted)

package sparse

// T returns the transpose of A as a new CSC matrix. It is a counting sort by
// row, cost O(n+m+nnz); the columns of the result have sorted row indices.
func (a *CSC) T() *CSC {
	nz := a.Nnz()
	c := &CSC{N: a.M, M: a.N, P: make([]int32, a.N+1), I: make([]int32, nz), X: make([]float64, nz)}
	for _, i := range a.I[:nz] {
		c.P[i+1]++
	}
	for i := 0; i < a.N; i++ {
		c.P[i+1] += c.P[i]
	}
	next := append([]int32(nil), c.P[:a.N]...)
	for j := 0; j < a.M; j++ {
		for p := a.P[j]; p < a.P[j+1]; p++ {
			q := next[a.I[p]]
			next[a.I[p]]++
			c.I[q] = int32(j)
			c.X[q] = a.X[p]
		}
	}
	return c
}
