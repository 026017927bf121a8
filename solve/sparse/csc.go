// csc.go: A ∈ ℝ^{n×m} in compressed sparse column form; y ← A·x, y ← Aᵀ·x, ‖A‖₁

package sparse

import (
	"fmt"
	"math"
	"runtime"
	"sync"
)

// CSC is a sparse matrix in compressed sparse column form. Column j holds
// the entries I[P[j]:P[j+1]] (row indices) and X[P[j]:P[j+1]] (values).
// Row indices within a column are sorted and unique when the matrix comes
// from Compress; the factorisations do not require sorted columns.
type CSC struct {
	N, M int       // rows, columns
	P    []int32   // column pointers, len M+1
	I    []int32   // row indices, len P[M]
	X    []float64 // values, len P[M]
}

// NewCSC returns an n×m matrix with room for nnz entries and all column
// pointers zero.
func NewCSC(n, m, nnz int) *CSC {
	if n < 0 || m < 0 || nnz < 0 {
		panic("sparse: negative dimension")
	}
	checkIndexRange(n, m, nnz)
	return &CSC{N: n, M: m, P: make([]int32, m+1), I: make([]int32, nnz), X: make([]float64, nnz)}
}

// checkIndexRange panics if the sizes do not fit the int32 index arrays.
func checkIndexRange(n, m, nnz int) {
	if n > math.MaxInt32 || m > math.MaxInt32 || nnz > math.MaxInt32 {
		panic("sparse: dimension or entry count exceeds int32 index range")
	}
}

// Dims returns the number of rows and columns.
func (a *CSC) Dims() (r, c int) { return a.N, a.M }

// Nnz returns the number of stored entries.
func (a *CSC) Nnz() int { return int(a.P[a.M]) }

// At returns A[i,j] (summing duplicates if any). It costs O(nnz of column j).
func (a *CSC) At(i, j int) float64 {
	if i < 0 || i >= a.N || j < 0 || j >= a.M {
		panic(fmt.Sprintf("sparse: index (%d,%d) out of range %d×%d", i, j, a.N, a.M))
	}
	s := 0.0
	for p := a.P[j]; p < a.P[j+1]; p++ {
		if int(a.I[p]) == i {
			s += a.X[p]
		}
	}
	return s
}

// MulVec sets y ← A·x. It panics if len(x) ≠ M or len(y) ≠ N.
func (a *CSC) MulVec(y, x []float64) {
	if len(x) != a.M || len(y) != a.N {
		panic("sparse: MulVec dimension mismatch")
	}
	clear(y)
	for j := 0; j < a.M; j++ {
		xj := x[j]
		if xj == 0 {
			continue
		}
		for p := a.P[j]; p < a.P[j+1]; p++ {
			y[a.I[p]] += a.X[p] * xj
		}
	}
}

// parallelNnz is the number of entries from which MulVecTrans splits its
// columns between the processors: below it, starting goroutines costs more
// than it saves.
const parallelNnz = 1 << 18

// MulVecTrans sets y ← Aᵀ·x. It panics if len(x) ≠ N or len(y) ≠ M. Each
// y_j is a gather over column j, so large products are split into column
// ranges computed concurrently; the result does not depend on the split.
func (a *CSC) MulVecTrans(y, x []float64) {
	if len(x) != a.N || len(y) != a.M {
		panic("sparse: MulVecTrans dimension mismatch")
	}
	if w := runtime.GOMAXPROCS(0); w > 1 && a.Nnz() >= parallelNnz {
		var wg sync.WaitGroup
		for t := 0; t < w; t++ {
			lo, hi := a.M*t/w, a.M*(t+1)/w
			wg.Add(1)
			go func() {
				defer wg.Done()
				a.mulTransRange(y, x, lo, hi)
			}()
		}
		wg.Wait()
		return
	}
	a.mulTransRange(y, x, 0, a.M)
}

func (a *CSC) mulTransRange(y, x []float64, lo, hi int) {
	for j := lo; j < hi; j++ {
		s := 0.0
		for p := a.P[j]; p < a.P[j+1]; p++ {
			s += a.X[p] * x[a.I[p]]
		}
		y[j] = s
	}
}

// Norm1 returns ‖A‖₁ = max_j Σ_i |a_ij|.
func (a *CSC) Norm1() float64 {
	nrm := 0.0
	for j := 0; j < a.M; j++ {
		s := 0.0
		for p := a.P[j]; p < a.P[j+1]; p++ {
			s += math.Abs(a.X[p])
		}
		nrm = max(nrm, s)
	}
	return nrm
}

// SetValues re-stamps the values of A on its fixed pattern: A.X is cleared
// and x[s] is added into A.X[slot[s]] for every triplet slot s, where slot is
// the map returned by Triplet.CompressMap. It costs O(nnz) and never sorts.
func (a *CSC) SetValues(x []float64, slot []int32) {
	if len(x) != len(slot) {
		panic("sparse: SetValues length mismatch")
	}
	clear(a.X)
	for s, v := range x {
		a.X[slot[s]] += v
	}
}

// Copy returns a deep copy of A.
func (a *CSC) Copy() *CSC {
	return &CSC{N: a.N, M: a.M,
		P: append([]int32(nil), a.P...),
		I: append([]int32(nil), a.I[:a.Nnz()]...),
		X: append([]float64(nil), a.X[:a.Nnz()]...)}
}

func (a *CSC) mustSquare(op string) {
	if a.N != a.M {
		panic(fmt.Sprintf("sparse: %s needs a square matrix, have %d×%d", op, a.N, a.M))
	}
}
