// colour.go: a greedy colouring of a symmetric matrix's graph, and the matrix permuted into colour order

package sparse

// colourOrder colours the graph of the symmetric matrix A (an edge i–j for
// each off-diagonal entry) greedily: unknowns are taken in ascending order
// and each gets the smallest colour none of its neighbours has yet, so no
// two unknowns of one colour are coupled and at most (largest degree + 1)
// colours are used (the multicolour orderings of Saad, Iterative Methods for
// Sparse Linear Systems, 2nd ed., SIAM 2003, §12.4, from memory). It
// returns perm, the unknowns listed colour by colour and ascending within
// each colour (perm[k] is the unknown at position k), and start, where
// colour c occupies positions start[c] to start[c+1]−1.
//
// In this order a Gauss–Seidel sweep is multicolour Gauss–Seidel: the rows
// of one colour read only unknowns of other colours, so they can be
// updated in any order, or at the same time, with the same result.
func colourOrder(a *CSC) (perm, start []int32) {
	n := a.M
	colour := make([]int32, n)
	// seen[c] == i marks colour c as taken by a neighbour of unknown i.
	var seen []int32
	var count []int32
	for i := 0; i < n; i++ {
		for p := a.P[i]; p < a.P[i+1]; p++ {
			if j := int(a.I[p]); j < i {
				seen[colour[j]] = int32(i)
			}
		}
		c := int32(0)
		for int(c) < len(seen) && seen[c] == int32(i) {
			c++
		}
		if int(c) == len(seen) {
			seen = append(seen, -1)
			count = append(count, 0)
		}
		colour[i] = c
		count[c]++
	}
	start = make([]int32, len(count)+1)
	for c, k := range count {
		start[c+1] = start[c] + k
	}
	next := append([]int32(nil), start[:len(count)]...)
	perm = make([]int32, n)
	for i, c := range colour {
		perm[next[c]] = int32(i)
		next[c]++
	}
	return perm, start
}

// sharedOrder colours A (colourOrder) and returns the order and its colour
// blocks if sweeping in it shares at least half the work between the
// cores: if at least half of A's entries lie in colour blocks large enough
// to be split (splitRows). Otherwise it returns nil: a graph with many
// colours (the dense coarse levels of a random network's hierarchy) has
// blocks too small to split, and is swept in its own order. The answer
// depends on A alone, not on the number of cores.
func sharedOrder(a *CSC) (perm, start []int32) {
	if a.Nnz() < colourNnz {
		return nil, nil
	}
	perm, start = colourOrder(a)
	shared := 0
	for c := 0; c+1 < len(start); c++ {
		nz := 0
		for _, i := range perm[start[c]:start[c+1]] {
			nz += int(a.P[i+1] - a.P[i])
		}
		if nz >= 2*splitNnz {
			shared += nz
		}
	}
	if 2*shared < a.Nnz() {
		return nil, nil
	}
	return perm, start
}

// permuted returns C = Q·A·Qᵀ for the symmetric matrix A, where
// Q = I(perm, :), so that c_kl = a_perm[k],perm[l], with the rows of every
// column in ascending order, and, when withDst is set, dst, where dst[p]
// is the entry of C that entry p of A was copied to (nil otherwise). It builds C row by row in the new order,
// reading row perm[r] of A as its column perm[r] (A is symmetric), so
// strictly it holds Q·Aᵀ·Qᵀ; the two are the same matrix for the symmetric
// A it is meant for.
func permuted(a *CSC, perm []int32, withDst bool) (c *CSC, dst []int32) {
	n := a.M
	pinv := invPerm(perm)
	nz := a.Nnz()
	c = &CSC{N: n, M: n, P: make([]int32, n+1), I: make([]int32, nz), X: make([]float64, nz)}
	for _, j := range a.I[:nz] {
		c.P[pinv[j]+1]++
	}
	for k := 0; k < n; k++ {
		c.P[k+1] += c.P[k]
	}
	if withDst {
		dst = make([]int32, nz)
	}
	next := append([]int32(nil), c.P[:n]...)
	for r, i := range perm {
		// Column i of A is row i: the entries a_ji, placed in row r of
		// column pinv[j].
		for p := a.P[i]; p < a.P[i+1]; p++ {
			k := pinv[a.I[p]]
			q := next[k]
			next[k]++
			c.I[q] = int32(r)
			c.X[q] = a.X[p]
			if withDst {
				dst[p] = q
			}
		}
	}
	return c, dst
}

// columnsPermuted returns A·Qᵀ with Q = I(perm, :): column k of the result
// is column perm[k] of A.
func columnsPermuted(a *CSC, perm []int32) *CSC {
	c := &CSC{N: a.N, M: a.M, P: make([]int32, a.M+1), I: make([]int32, 0, a.Nnz()), X: make([]float64, 0, a.Nnz())}
	for k, j := range perm {
		c.I = append(c.I, a.I[a.P[j]:a.P[j+1]]...)
		c.X = append(c.X, a.X[a.P[j]:a.P[j+1]]...)
		c.P[k+1] = int32(len(c.I))
	}
	return c
}
