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
func aggregate(a *CSC, diag []float64, eps float64) (agg []int32, nagg int) {
	n := a.M
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
	for i := 0; i < n; i++ {
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
		best, bestV := int32(-1), 0.0
		for p := a.P[i]; p < a.P[i+1]; p++ {
			if j := a.I[p]; strong(i, p) && first[j] >= 0 {
				if v := math.Abs(a.X[p]); v > bestV {
					best, bestV = first[j], v
				}
			}
		}
		agg[i] = best
	}
	// Pass 3.
	for i := 0; i < n; i++ {
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
