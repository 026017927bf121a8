// smooth.go: the V-cycle's Gauss–Seidel sweeps on a level whose columns list their rows in ascending order

package sparse

import (
	"runtime"
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
// read: half the work of a sweep over the whole row.
func (lev *amgLevel) forwardFromZero(x, b []float64) {
	a, dpos, invd := lev.a, lev.dpos, lev.invd
	for i := 0; i < a.M; i++ {
		s := b[i]
		for p := a.P[i]; p < dpos[i]; p++ {
			s -= a.X[p] * x[a.I[p]]
		}
		x[i] = s * invd[i]
	}
}

// upperResidual sets r ← b − A·x after forwardFromZero, which is −U·x:
// each row i was solved exactly with the unknowns below it at their final
// values and those above it at 0, so what remains of it is the strictly
// upper part times the values those took since. (The identity is that of
// the residual of a Gauss–Seidel sweep; Saad, Iterative Methods for Sparse
// Linear Systems, 2nd ed., SIAM 2003, §4.1, from memory.) Rows are
// independent, so large levels are split over the cores as
// CSC.MulVecTrans splits its rows.
func (lev *amgLevel) upperResidual(r, x []float64) {
	a := lev.a
	rows := func(lo, hi int) {
		for i := lo; i < hi; i++ {
			s := 0.0
			for p := lev.dpos[i] + 1; p < a.P[i+1]; p++ {
				s -= a.X[p] * x[a.I[p]]
			}
			r[i] = s
		}
	}
	if w := runtime.GOMAXPROCS(0); w > 1 && a.Nnz() >= 2*parallelNnz {
		var wg sync.WaitGroup
		for t := 0; t < w; t++ {
			lo, hi := a.M*t/w, a.M*(t+1)/w
			wg.Add(1)
			go func() {
				defer wg.Done()
				rows(lo, hi)
			}()
		}
		wg.Wait()
		return
	}
	rows(0, a.M)
}

// backward is the backward Gauss–Seidel sweep on A·x = b:
// x_i ← (b_i − Σ_{j≠i} a_ij·x_j)/a_ii for i descending.
func (lev *amgLevel) backward(x, b []float64) {
	a, dpos, invd := lev.a, lev.dpos, lev.invd
	for i := a.M - 1; i >= 0; i-- {
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
}
