// triplet.go: A = Σ_s x_s·e_{i_s}e_{j_s}ᵀ in coordinate form, and its compression to CSC

package sparse

import "fmt"

// Triplet holds a sparse n×m matrix as a list of (i, j, x) entries, the form
// in which device stamps are accumulated. Duplicate (i, j) entries are summed
// when the triplet is compressed.
type Triplet struct {
	N, M int
	I, J []int32
	X    []float64
}

// NewTriplet returns an empty n×m triplet matrix with room for capacity
// entries.
func NewTriplet(n, m, capacity int) *Triplet {
	if n < 0 || m < 0 {
		panic("sparse: negative dimension")
	}
	checkIndexRange(n, m, 0)
	return &Triplet{N: n, M: m,
		I: make([]int32, 0, capacity), J: make([]int32, 0, capacity), X: make([]float64, 0, capacity)}
}

// Add appends the entry a_ij += x. It panics if (i, j) is out of range.
func (t *Triplet) Add(i, j int, x float64) {
	if i < 0 || i >= t.N || j < 0 || j >= t.M {
		panic(fmt.Sprintf("sparse: triplet index (%d,%d) out of range %d×%d", i, j, t.N, t.M))
	}
	t.I = append(t.I, int32(i))
	t.J = append(t.J, int32(j))
	t.X = append(t.X, x)
}

// Len returns the number of entries (slots) added so far.
func (t *Triplet) Len() int { return len(t.X) }

// Compress returns the CSC form of t with duplicates summed and row indices
// sorted within each column.
func (t *Triplet) Compress() *CSC {
	a, _ := t.CompressMap()
	return a
}

// CompressMap is Compress that also returns slot, where slot[s] is the
// position in the CSC arrays that triplet entry s was summed into. When the
// same stamps are later made with new values (same order of Add calls), the
// CSC values are refreshed in O(nnz) by a.SetValues(t.X, slot).
//
// The method is two stable bucket passes (by row, then by column), so the
// row indices come out sorted without a comparison sort; cost O(n+m+nnz).
func (t *Triplet) CompressMap() (*CSC, []int32) {
	nz := len(t.X)
	checkIndexRange(t.N, t.M, nz)
	// Pass 1: bucket slots by row.
	rowStart := make([]int32, t.N+1)
	for _, i := range t.I {
		rowStart[i+1]++
	}
	for i := 0; i < t.N; i++ {
		rowStart[i+1] += rowStart[i]
	}
	byRow := make([]int32, nz)
	next := append([]int32(nil), rowStart[:t.N]...)
	for s, i := range t.I {
		byRow[next[i]] = int32(s)
		next[i]++
	}
	// Pass 2: bucket the row-ordered slots by column; each column then lists
	// its rows in nondecreasing order.
	colStart := make([]int32, t.M+1)
	for _, j := range t.J {
		colStart[j+1]++
	}
	for j := 0; j < t.M; j++ {
		colStart[j+1] += colStart[j]
	}
	byCol := make([]int32, nz)
	nextc := append([]int32(nil), colStart[:t.M]...)
	for _, s := range byRow {
		j := t.J[s]
		byCol[nextc[j]] = s
		nextc[j]++
	}
	// Pass 3: merge equal rows within each column.
	a := &CSC{N: t.N, M: t.M, P: make([]int32, t.M+1), I: make([]int32, 0, nz), X: make([]float64, 0, nz)}
	slot := make([]int32, nz)
	for j := 0; j < t.M; j++ {
		first := int32(len(a.I))
		for q := colStart[j]; q < colStart[j+1]; q++ {
			s := byCol[q]
			i := t.I[s]
			if last := len(a.I) - 1; int32(last) >= first && a.I[last] == i {
				a.X[last] += t.X[s]
				slot[s] = int32(last)
				continue
			}
			slot[s] = int32(len(a.I))
			a.I = append(a.I, i)
			a.X = append(a.X, t.X[s])
		}
		a.P[j+1] = int32(len(a.I))
	}
	return a, slot
}
