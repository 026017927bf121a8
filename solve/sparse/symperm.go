// symperm.go: C ← upper (or lower) triangle of P·A·Pᵀ, with P = I(perm,:)

package sparse

// symPermUpper returns the upper triangle (row ≤ column) of P·A·Pᵀ, built
// from the entries of A with i ≤ j (the lower triangle of A is ignored), and
// slot, where slot[p] is the position in C that A's entry p was added into,
// or -1 for an ignored entry. pinv[old] = new. Rows in C's columns are not
// sorted; the factorisation does not need them sorted.
func symPermUpper(a *CSC, pinv []int32) (*CSC, []int32) { return symPerm(a, pinv, false) }

// symPermLower is symPermUpper but stores the lower triangle (row ≥ column)
// of P·A·Pᵀ.
func symPermLower(a *CSC, pinv []int32) (*CSC, []int32) { return symPerm(a, pinv, true) }

func symPerm(a *CSC, pinv []int32, lower bool) (*CSC, []int32) {
	place := func(i2, j2 int32) (row, col int32) {
		if (i2 <= j2) != lower {
			return i2, j2
		}
		return j2, i2
	}
	n := a.M
	c := &CSC{N: n, M: n, P: make([]int32, n+1)}
	for j := 0; j < n; j++ {
		j2 := pinv[j]
		for p := a.P[j]; p < a.P[j+1]; p++ {
			i := a.I[p]
			if int(i) > j {
				continue
			}
			_, col := place(pinv[i], j2)
			c.P[col+1]++
		}
	}
	for j := 0; j < n; j++ {
		c.P[j+1] += c.P[j]
	}
	nz := c.P[n]
	c.I = make([]int32, nz)
	c.X = make([]float64, nz)
	slot := make([]int32, a.Nnz())
	next := append([]int32(nil), c.P[:n]...)
	for j := 0; j < n; j++ {
		j2 := pinv[j]
		for p := a.P[j]; p < a.P[j+1]; p++ {
			i := a.I[p]
			if int(i) > j {
				slot[p] = -1
				continue
			}
			row, col := place(pinv[i], j2)
			q := next[col]
			next[col]++
			c.I[q] = row
			c.X[q] = a.X[p]
			slot[p] = q
		}
	}
	return c, slot
}

// invPerm returns pinv with pinv[perm[k]] = k.
func invPerm(perm []int32) []int32 {
	pinv := make([]int32, len(perm))
	for k, i := range perm {
		pinv[i] = int32(k)
	}
	return pinv
}
