// smooth.go: the V-cycle's Gauss–Seidel sweeps on a level whose columns list their rows in ascending order

package sparse

import (
	"runtime"
	"sort"
	"sync"
)

// setDiagonal records the level's reciprocal diagonal and, when every
// column of A lists its rows in strictly ascending order, the position of
// each diagonal entry, which splits column i (row i: A is symmetric) into
// the strictly lower part, the entries a_ij with j < i, and the strictly
// upper part. lev.diag must hold the diagonal.
func (lev *amgLevel) setDiagonal() {
	a := lev.a
	lev.invd = make([]float64, a.M)
	for j, d := range lev.diag {
		lev.invd[j] = 1 / d
	}
	dpos := make([]int32, a.M)
	for j := 0; j < a.M; j++ {
		dpos[j] = -1
		for p := a.P[j]; p < a.P[j+1]; p++ {
			if p > a.P[j] && a.I[p] <= a.I[p-1] {
				return // not in ascending order: the general sweeps
			}
			if int(a.I[p]) == j {
				dpos[j] = p
			}
		}
		if dpos[j] < 0 {
			return
		}
	}
	lev.dpos = dpos
}

// sameColumns reports whether a and b have the same pattern.
func sameColumns(a, b *CSC) bool {
	if a.N != b.N || a.M != b.M {
		return false
	}
	for j := 0; j <= a.M; j++ {
		if a.P[j] != b.P[j] {
			return false
		}
	}
	for p := 0; p < a.Nnz(); p++ {
		if a.I[p] != b.I[p] {
			return false
		}
	}
	return true
}

// forwardFromZero is the forward Gauss–Seidel sweep on A·x = b from x = 0:
// x_i ← (b_i − Σ_{j<i} a_ij·x_j)/a_ii for i ascending. The unknowns above i
// are still 0 when row i is reached, so only the strictly lower part is
// read: half the work of a sweep over the whole row. On a level in colour
// order the first colour reads nothing, and each colour's rows are shared
// between the cores (see sweep).
func (lev *amgLevel) forwardFromZero(x, b []float64) {
	a, dpos, invd := lev.a, lev.dpos, lev.invd
	lev.sweep(false, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			s := b[i]
			for p := a.P[i]; p < dpos[i]; p++ {
				s -= a.X[p] * x[a.I[p]]
			}
			x[i] = s * invd[i]
		}
	})
}

// upperResidual sets r ← b − A·x after forwardFromZero, which is −U·x:
// each row i was solved exactly with the unknowns below it at their final
// values and those above it at 0, so what remains of it is the strictly
// upper part times the values those took since. (The identity is that of
// the residual of a Gauss–Seidel sweep; Saad, Iterative Methods for Sparse
// Linear Systems, 2nd ed., SIAM 2003, §4.1, from memory.) Rows are
// independent, so large levels are split over the cores.
func (lev *amgLevel) upperResidual(r, x []float64) {
	a, dpos := lev.a, lev.dpos
	a.splitRows(0, a.M, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			s := 0.0
			for p := dpos[i] + 1; p < a.P[i+1]; p++ {
				s -= a.X[p] * x[a.I[p]]
			}
			r[i] = s
		}
	})
}

// backward is the backward Gauss–Seidel sweep on A·x = b:
// x_i ← (b_i − Σ_{j≠i} a_ij·x_j)/a_ii for i descending (colour by colour,
// last first, on a level in colour order).
func (lev *amgLevel) backward(x, b []float64) {
	a, dpos, invd := lev.a, lev.dpos, lev.invd
	lev.sweep(true, func(lo, hi int) {
		for i := hi - 1; i >= lo; i-- {
			s := b[i]
			d := dpos[i]
			for p := a.P[i]; p < d; p++ {
				s -= a.X[p] * x[a.I[p]]
			}
			for p := d + 1; p < a.P[i+1]; p++ {
				s -= a.X[p] * x[a.I[p]]
			}
			x[i] = s * invd[i]
		}
	})
}

// sweep calls rows(lo, hi) on the level's colour blocks in order, or in
// reverse order, each block's rows split between the cores when it is
// large (splitRows): the rows of one colour are not coupled to each other,
// so every split, one core included, computes the same numbers
// (multicolour Gauss–Seidel; Saad 2003, §12.4, from memory; its use as a
// parallel multigrid smoother: Adams, Brezina, Hu, Tuminaro, "Parallel
// multigrid smoothing: polynomial versus Gauss–Seidel", J. Comput. Phys.
// 188, 2003). A level without colours is one block, swept on one core in
// its own order.
func (lev *amgLevel) sweep(reverse bool, rows func(lo, hi int)) {
	if lev.start == nil {
		rows(0, lev.a.M)
		return
	}
	nc := len(lev.start) - 1
	for t := 0; t < nc; t++ {
		c := t
		if reverse {
			c = nc - 1 - t
		}
		lev.a.splitRows(int(lev.start[c]), int(lev.start[c+1]), rows)
	}
}

// splitNnz is the fewest entries each core's share of a range of rows must
// hold: some tens of microseconds of work, well above the microsecond or
// so that starting a goroutine and waiting for it costs (a choice, not a
// published rule).
const splitNnz = 1 << 14

// splitRows calls rows(lo, hi) on the columns lo … hi−1 of A, read as rows
// (A is symmetric), in contiguous pieces of about equal numbers of entries,
// one per core, run at the same time, when the range holds at least
// 2·splitNnz entries and there is more than one core; otherwise it calls
// rows(lo, hi) itself. The caller guarantees that the rows are independent.
func (a *CSC) splitRows(lo, hi int, rows func(lo, hi int)) {
	nz := int(a.P[hi] - a.P[lo])
	w := min(runtime.GOMAXPROCS(0), nz/splitNnz)
	if w <= 1 {
		rows(lo, hi)
		return
	}
	var wg sync.WaitGroup
	from := lo
	for t := 1; t <= w; t++ {
		to := hi
		if t < w {
			// The first row whose entries start at or past t/w of the range.
			target := a.P[lo] + int32(nz*t/w)
			to = from + sort.Search(hi-from, func(k int) bool { return a.P[from+k] >= target })
		}
		if t == w {
			rows(from, to)
			break
		}
		wg.Add(1)
		go func(lo, hi int) {
			defer wg.Done()
			rows(lo, hi)
		}(from, to)
		from = to
	}
	wg.Wait()
}
