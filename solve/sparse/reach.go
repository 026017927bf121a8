// reach.go: top ← Reach_L(𝒜(:,j)), the rows reachable from column j of A in the graph of L, in topological order

package sparse

// luReach finds the nonzero pattern of x = L⁻¹·A(:,col) during a left-looking
// LU factorisation (Gilbert & Peierls, "Sparse partial pivoting in time
// proportional to arithmetic operations", SIAM J. Sci. Stat. Comput. 9(5),
// 1988). Nodes are original row indices; a row i that is already pivotal
// (pinv[i] = j ≥ 0) has edges to the rows of L(:,j). A depth-first search
// from every nonzero row of A(:,col) leaves the reachable set in
// out[top:n] in reverse postorder, so each node precedes all nodes it
// updates. Where lpend[j] ≥ 0 only L(:,j) entries before lpend[j] are
// followed (symmetric pruning; the rest are reachable another way). The search is iterative with an explicit stack (stack, pstack).
// Nodes visited get mark[i] = stamp.
func luReach(a *CSC, col int, lp, lpend, li, pinv []int32, stack, pstack, out, mark []int32, stamp int32) (top int) {
	top = len(out)
	for p := a.P[col]; p < a.P[col+1]; p++ {
		start := a.I[p]
		if mark[start] == stamp {
			continue
		}
		head := 0
		stack[0] = start
		for head >= 0 {
			i := stack[head]
			j := pinv[i]
			if mark[i] != stamp {
				mark[i] = stamp
				if j >= 0 {
					pstack[head] = lp[j] + 1 // skip the unit diagonal (row i itself)
				}
			}
			descended := false
			if j >= 0 {
				end := lp[j+1]
				if e := lpend[j]; e >= 0 {
					end = e // symmetrically pruned column (see LU.Factorize)
				}
				for q := pstack[head]; q < end; q++ {
					r := li[q]
					if mark[r] == stamp {
						continue
					}
					pstack[head] = q + 1
					head++
					stack[head] = r
					descended = true
					break
				}
			}
			if !descended {
				head--
				top--
				out[top] = i
			}
		}
	}
	return top
}
