// etree.go: parent ← elimination tree of the symmetric matrix whose upper triangle is C

package sparse

// etree returns the elimination tree of a symmetric matrix given by the
// upper-triangular entries (i < j) of C: parent[j] is the row index of the
// first off-diagonal nonzero in column j of the Cholesky factor L, or -1 for
// a root. The method is Liu's algorithm with path compression through a
// virtual-ancestor array (J. W. H. Liu, "A compact row storage scheme for
// Cholesky factors using elimination trees", ACM TOMS 12(2), 1986; see also
// Davis 2006, §4.1). Cost is nearly O(nnz(C)).
func etree(c *CSC) []int32 {
	n := c.M
	parent := make([]int32, n)
	anc := make([]int32, n)
	for k := 0; k < n; k++ {
		parent[k] = -1
		anc[k] = -1
		for p := c.P[k]; p < c.P[k+1]; p++ {
			// Climb from i towards the root, pointing the path at k.
			for r := c.I[p]; r != -1 && int(r) < k; {
				up := anc[r]
				anc[r] = int32(k)
				if up == -1 {
					parent[r] = int32(k)
					break
				}
				r = up
			}
		}
	}
	return parent
}

// ereach computes the nonzero pattern of row k of L (excluding the
// diagonal): the union of the etree paths from each i < k with c_ik ≠ 0 up to
// k. The pattern is left in stack[top:] in an order where every node comes
// before its ancestors (a topological order of the row subtree).
// mark must hold values ≠ k on entry for all nodes; visited nodes get k.
func ereach(c *CSC, k int, parent, stack, mark []int32) (top int) {
	n := c.M
	top = n
	mark[k] = int32(k)
	for p := c.P[k]; p < c.P[k+1]; p++ {
		i := c.I[p]
		if int(i) > k {
			continue
		}
		// Walk up until a marked node; the path lands at stack[0:len].
		l := 0
		for ; mark[i] != int32(k); i = parent[i] {
			stack[l] = i
			l++
			mark[i] = int32(k)
		}
		// Move the path to the top of the output region, keeping order.
		for l > 0 {
			l--
			top--
			stack[top] = stack[l]
		}
	}
	return top
}
