// aggregate.go: agg ← partition of the unknowns into aggregates of strongly coupled neighbours

package sparse

import "math"

// aggregate partitions the unknowns of the symmetric matrix A into
// aggregates for smoothed-aggregation multigrid (Vaněk, Mandel & Brezina,
// Computing 56, 1996, §3). Unknown j is strongly coupled to i when
// a_ij² ≥ ε²·|a_ii·a_jj|. The three passes of the paper are:
//
//  1. every unknown whose strong neighbourhood is untouched starts a new
//     aggregate made of that whole neighbourhood;
//  2. each remaining unknown joins the pass-1 aggregate of the neighbour it
//     is most strongly coupled to;
//  3. what is still left forms aggregates from its remaining strong
//     neighbourhoods.
//
// agg[i] is the aggregate of unknown i; the number of aggregates is returned.
//
// The passes visit the unknowns in ascending order, or, when perm is not
// nil (A is then a level put in colour order, Q·A·Qᵀ with Q = I(perm, :)),
// in the order they had before: unknown k of A is then the perm[k]-th,
// ties in pass 2 go to the neighbour that came first in that order too,
// and the aggregates are those of the matrix before it was permuted,
// numbered alike.
func aggregate(a *CSC, diag []float64, eps float64, perm []int32) (agg []int32, nagg int) {
	n := a.M
	// visit[t] is the t-th unknown to visit; was[i] is its place in the
	// level's order before colouring.
	visit, was := perm, perm
	if perm != nil {
		visit = invPerm(perm)
	}
	at := func(t int) int {
		if visit == nil {
			return t
		}
		return int(visit[t])
	}
	before := func(j, k int32) bool {
		if was == nil {
			return j < k
		}
		return was[j] < was[k]
	}
	agg = make([]int32, n)
	for i := range agg {
		agg[i] = -1
	}
	eps2 := eps * eps
	strong := func(i int, p int32) bool {
		j := a.I[p]
		return int(j) != i && a.X[p]*a.X[p] >= eps2*math.Abs(diag[i]*diag[j])
	}
	// Pass 1.
	for t := 0; t < n; t++ {
		i := at(t)
		if agg[i] >= 0 {
			continue
		}
		free := true
		for p := a.P[i]; p < a.P[i+1] && free; p++ {
			if strong(i, p) && agg[a.I[p]] >= 0 {
				free = false
			}
		}
		if !free {
			continue
		}
		agg[i] = int32(nagg)
		for p := a.P[i]; p < a.P[i+1]; p++ {
			if strong(i, p) {
				agg[a.I[p]] = int32(nagg)
			}
		}
		nagg++
	}
	// Pass 2: join the most strongly coupled pass-1 aggregate.
	first := append([]int32(nil), agg...)
	for i := 0; i < n; i++ {
		if first[i] >= 0 {
			continue
		}
		best, bestJ, bestV := int32(-1), int32(-1), 0.0
		for p := a.P[i]; p < a.P[i+1]; p++ {
			if j := a.I[p]; strong(i, p) && first[j] >= 0 {
				if v := math.Abs(a.X[p]); v > bestV || v == bestV && before(j, bestJ) {
					best, bestJ, bestV = first[j], j, v
				}
			}
		}
		agg[i] = best
	}
	// Pass 3.
	for t := 0; t < n; t++ {
		i := at(t)
		if agg[i] >= 0 {
			continue
		}
		agg[i] = int32(nagg)
		for p := a.P[i]; p < a.P[i+1]; p++ {
			if j := a.I[p]; strong(i, p) && agg[j] < 0 {
				agg[j] = int32(nagg)
			}
		}
		nagg++
	}
	return agg, nagg
}
