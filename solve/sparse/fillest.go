// fillest.go: the number of entries of a Galerkin product Pᵀ·A·P estimated from a sample of its columns

package sparse

// galerkinNnzEstimate estimates nnz(Pᵀ·A·P) from every step-th of its
// columns, each formed as Pᵀ·(A·p_j) with marker arrays (Gustavson's
// column-by-column product; ACM Trans. Math. Softw. 4(3), 1978), counted
// and scaled by the sampling: the columns of a Galerkin product of an
// aggregation hierarchy are alike in size, so a sample of a few thousand
// spread over the matrix (a fixed choice: the same on every run) tells a
// product that fills in from one that does not, at a small part of the
// product's cost. pt is Pᵀ. step = 1 counts exactly.
func galerkinNnzEstimate(a, p, pt *CSC, step int) int {
	n, nc := a.N, p.M
	markW := make([]int32, n)  // rows of A·p_j seen for column j
	markV := make([]int32, nc) // rows of Pᵀ·(A·p_j) seen for column j
	for i := range markW {
		markW[i] = -1
	}
	for i := range markV {
		markV[i] = -1
	}
	var rows []int32
	total := 0
	for j := 0; j < nc; j += step {
		rows = rows[:0]
		for q := p.P[j]; q < p.P[j+1]; q++ {
			k := p.I[q]
			for r := a.P[k]; r < a.P[k+1]; r++ {
				if i := a.I[r]; markW[i] != int32(j) {
					markW[i] = int32(j)
					rows = append(rows, i)
				}
			}
		}
		for _, i := range rows {
			// Column i of Pᵀ lists the aggregates row i of P reaches.
			for r := pt.P[i]; r < pt.P[i+1]; r++ {
				if c := pt.I[r]; markV[c] != int32(j) {
					markV[c] = int32(j)
					total++
				}
			}
		}
	}
	sampled := (nc + step - 1) / step
	if sampled == 0 {
		return 0
	}
	return int(float64(total) * float64(nc) / float64(sampled))
}
