// postorder.go: post ← a depth-first postorder of the forest given by parent pointers

package sparse

// postorder returns the nodes of the forest (parent[j] = −1 for roots) in a
// depth-first postorder: every subtree occupies a contiguous range ending in
// its root. Children are visited in increasing order. Reordering a matrix by
// a postorder of its elimination tree leaves the fill unchanged and makes
// the supernodes of L consecutive columns (Liu, "The role of elimination
// trees in sparse factorization", SIAM J. Matrix Anal. Appl. 11(1), 1990).
// The traversal is iterative.
func postorder(parent []int32) []int32 {
	n := len(parent)
	head := make([]int32, n)
	next := make([]int32, n)
	for j := range head {
		head[j] = -1
	}
	// Insert children in decreasing order so the lists come out increasing.
	for j := n - 1; j >= 0; j-- {
		if p := parent[j]; p >= 0 {
			next[j] = head[p]
			head[p] = int32(j)
		}
	}
	post := make([]int32, 0, n)
	stack := make([]int32, 0, 64)
	for root := 0; root < n; root++ {
		if parent[root] >= 0 {
			continue
		}
		stack = append(stack, int32(root))
		for len(stack) > 0 {
			top := stack[len(stack)-1]
			if c := head[top]; c >= 0 {
				head[top] = next[c] // detach the child, descend
				stack = append(stack, c)
				continue
			}
			stack = stack[:len(stack)-1]
			post = append(post, top)
		}
	}
	return post
}
