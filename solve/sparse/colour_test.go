package sparse

import (
	"math"
	"runtime"
	"testing"

	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// checkColouring fails unless perm is a permutation of A's unknowns, each
// colour block is in ascending order, and no two unknowns of one colour
// are coupled (the definition of a proper colouring).
func checkColouring(t testing.TB, a *CSC, perm, start []int32) {
	t.Helper()
	n := a.M
	if len(perm) != n || start[0] != 0 || int(start[len(start)-1]) != n {
		t.Fatalf("perm of %d for %d unknowns, blocks %v", len(perm), n, start)
	}
	colour := make([]int, n)
	for i := range colour {
		colour[i] = -1
	}
	for c := 0; c+1 < len(start); c++ {
		if start[c+1] <= start[c] {
			t.Fatalf("colour %d is empty", c)
		}
		for k := start[c]; k < start[c+1]; k++ {
			i := perm[k]
			if colour[i] >= 0 {
				t.Fatalf("unknown %d listed twice", i)
			}
			colour[i] = c
			if k > start[c] && perm[k-1] >= i {
				t.Fatalf("colour %d not in ascending order", c)
			}
		}
	}
	for j := 0; j < n; j++ {
		for p := a.P[j]; p < a.P[j+1]; p++ {
			if i := int(a.I[p]); i != j && colour[i] == colour[j] {
				t.Fatalf("unknowns %d and %d are coupled and share colour %d", i, j, colour[i])
			}
		}
	}
}

// The greedy colouring is proper on random graphs, and on the 5-point grid
// in natural order it is the red–black colouring: two colours, by the
// parity of row + column (the grid graph is bipartite; Saad, Iterative
// Methods for Sparse Linear Systems, 2nd ed., SIAM 2003, §12.4, from
// memory).
func TestColourOrder(t *testing.T) {
	for seed := uint64(1); seed <= 3; seed++ {
		a := randomLaplacian(2000, 6, 2, seed)
		perm, start := colourOrder(a)
		checkColouring(t, a, perm, start)
	}
	const k = 30
	a := gridLaplacian(k, 1)
	perm, start := colourOrder(a)
	checkColouring(t, a, perm, start)
	if len(start) != 3 {
		t.Fatalf("grid: %d colours, want 2", len(start)-1)
	}
	for c := 0; c < 2; c++ {
		for _, i := range perm[start[c]:start[c+1]] {
			if (int(i)/k+int(i)%k)%2 != c {
				t.Fatalf("grid node %d in colour %d", i, c)
			}
		}
	}
}

// permuted gives Q·A·Qᵀ, computed densely with gonum as the reference,
// with every column in ascending order and each of A's entries traced to
// its own entry of C.
func TestPermuted(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		a := randSPD(t, rapid.IntRange(1, 40).Draw(t, "n"))
		n := a.N
		perm := make([]int32, n)
		for i, k := range rapid.Permutation(seq(n)).Draw(t, "perm") {
			perm[i] = int32(k)
		}
		c, dst := permuted(a, perm, true)
		q := mat.NewDense(n, n, nil)
		for k, i := range perm {
			q.Set(k, int(i), 1)
		}
		var qa, want mat.Dense
		qa.Mul(q, denseOf(a))
		want.Mul(&qa, q.T())
		if !mat.Equal(denseOf(c), &want) {
			t.Fatalf("permuted differs from Q·A·Qᵀ")
		}
		for k := 0; k < n; k++ {
			for p := c.P[k]; p < c.P[k+1]; p++ {
				if p > c.P[k] && c.I[p] <= c.I[p-1] {
					t.Fatalf("column %d not in ascending order", k)
				}
			}
		}
		seen := make([]bool, c.Nnz())
		for j := 0; j < n; j++ {
			for p := a.P[j]; p < a.P[j+1]; p++ {
				q := dst[p]
				if seen[q] || c.X[q] != a.X[p] {
					t.Fatalf("entry %d of A not traced to C", p)
				}
				seen[q] = true
			}
		}
	})
}

func seq(n int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = i
	}
	return s
}

// colouredSystems are matrices large enough for the hierarchy to put
// levels in colour order: a grid (smoothed aggregation) and a random
// network (plain aggregation, as package solve builds for such graphs).
func colouredSystems() []struct {
	name  string
	a     *CSC
	plain bool
} {
	return []struct {
		name  string
		a     *CSC
		plain bool
	}{
		{"grid", gridLaplacian(200, 0.5), false},
		{"random", randomLaplacian(25000, 6, 2, 4), true},
	}
}

// On a hierarchy in colour order the V-cycle is the same to the last bit
// on one core and on several (each colour's rows are uncoupled, so the
// split cannot matter), it matches the cycle swept row by row over whole
// rows in the same order (TestSplitSweepsMatchWholeRows's reference), and
// PCG with it meets its residual, and on the grid reaches the solution of
// sparse Cholesky within the forward
// error bound ‖x − x*‖/‖x*‖ ≤ κ·‖r‖/‖b‖ (Golub & Van Loan, Matrix
// Computations, 4th ed., 2013, §2.6, from memory).
func TestColouredCycleSameOnAnyCores(t *testing.T) {
	for _, s := range colouredSystems() {
		a := s.a
		m, err := NewAMG(a, &AMGOptions{Unsmoothed: s.plain, CoarseSize: 500})
		if err != nil {
			t.Fatal(err)
		}
		if m.perm == nil || m.levels[0].start == nil {
			t.Fatalf("%s: finest level not in colour order", s.name)
		}
		checkColouring(t, a, m.perm, m.levels[0].start)
		r := make([]float64, a.N)
		for i := range r {
			r[i] = math.Sin(float64(7 * i))
		}
		run := func(procs int) []float64 {
			defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
			z := make([]float64, a.N)
			m.Precondition(z, r)
			return z
		}
		one, four := run(1), run(4)
		for i := range one {
			if one[i] != four[i] {
				t.Fatalf("%s: z[%d] = %g on one core, %g on four", s.name, i, one[i], four[i])
			}
		}
		for l := range m.levels {
			m.levels[l].dpos = nil
		}
		whole := run(1)
		if d := relDiff(one, whole); d > 1e-12 {
			t.Fatalf("%s: coloured sweeps differ from whole rows by %g", s.name, d)
		}
		for l := range m.levels {
			m.levels[l].setDiagonal()
		}
		x := make([]float64, a.N)
		const tol = 1e-10
		if _, _, err := PCG(a, x, r, m, tol, 300); err != nil {
			t.Fatalf("%s: %v", s.name, err)
		}
		if res := relRes2(a, x, r); !(res <= tol) {
			t.Fatalf("%s: relative residual %g", s.name, res)
		}
		if s.plain {
			// A random graph has no small separators: its Cholesky factor
			// is nearly dense, too large to compare with here.
			continue
		}
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		want := append([]float64(nil), r...)
		ch.Solve(want)
		if d, bound := relDiff(x, want), 10*ch.Cond1Est()*tol; d > bound {
			t.Fatalf("%s: relative difference from Cholesky %g > bound %g", s.name, d, bound)
		}
	}
}

// A refreshed plain hierarchy whose finest level is in colour order holds
// Q·A·Qᵀ of the new values there and the Galerkin product P̂ᵀ·A_l·P̂ on
// every coarser level (the reference: the general sparse product mulCSC),
// and a matrix of another pattern with as many entries is refused.
func TestRefreshColouredFinest(t *testing.T) {
	a := randomLaplacian(25000, 6, 2, 5)
	m, err := NewAMG(a, &AMGOptions{Unsmoothed: true, CoarseSize: 500})
	if err != nil {
		t.Fatal(err)
	}
	if m.perm == nil {
		t.Fatal("finest level not in colour order")
	}
	b := rescaled(a, 5)
	if err := m.Refresh(b); err != nil {
		t.Fatal(err)
	}
	want, _ := permuted(b, m.perm, false)
	if !sameColumns(want, m.levels[0].a) {
		t.Fatal("refreshed finest level has another pattern")
	}
	for q := range want.X {
		if want.X[q] != m.levels[0].a.X[q] {
			t.Fatalf("finest entry %d: %g, want %g", q, m.levels[0].a.X[q], want.X[q])
		}
	}
	for l := 0; l+1 < len(m.levels); l++ {
		lev := &m.levels[l]
		ref := mulCSC(lev.pt, mulCSC(lev.a, lev.p)).T()
		got := m.levels[l+1].a
		scale := ref.Norm1()
		for j := 0; j < got.M; j++ {
			for p := got.P[j]; p < got.P[j+1]; p++ {
				if d := math.Abs(got.X[p] - ref.At(int(got.I[p]), j)); d > 1e-13*scale {
					t.Fatalf("level %d entry (%d, %d): %g, product %g", l+1, got.I[p], j, got.X[p], ref.At(int(got.I[p]), j))
				}
			}
		}
		if got.Nnz() != ref.Nnz() {
			t.Fatalf("level %d holds %d entries, the product %d", l+1, got.Nnz(), ref.Nnz())
		}
	}
	// The same number of entries, one moved to another row.
	c := b.Copy()
	for p := c.P[1]; p < c.P[2]; p++ {
		if c.I[p] != 1 {
			c.I[p] = (c.I[p] + 1) % int32(c.N)
			break
		}
	}
	func() {
		defer func() {
			if recover() == nil {
				t.Fatal("Refresh with another pattern did not panic")
			}
		}()
		_ = m.Refresh(c)
	}()
}

// Aggregating a level in colour order, visiting it in its former order,
// gives the aggregates of the level before it was permuted, numbered
// alike, so that colouring changes the smoother and nothing else.
func TestAggregatesIgnoreColourOrder(t *testing.T) {
	for _, a := range []*CSC{gridLaplacian(40, 0.5), randomLaplacian(3000, 6, 2, 6)} {
		diag := make([]float64, a.N)
		for j := 0; j < a.M; j++ {
			diag[j] = a.At(j, j)
		}
		want, nwant := aggregate(a, diag, 0.08, nil)
		perm, _ := colourOrder(a)
		c, _ := permuted(a, perm, false)
		cdiag := make([]float64, a.N)
		for k, i := range perm {
			cdiag[k] = diag[i]
		}
		got, ngot := aggregate(c, cdiag, 0.08, perm)
		if ngot != nwant {
			t.Fatalf("%d aggregates in colour order, %d before", ngot, nwant)
		}
		for k, i := range perm {
			if got[k] != want[i] {
				t.Fatalf("unknown %d (%d before colouring) in aggregate %d, %d before", k, i, got[k], want[i])
			}
		}
	}
}

// columnsPermuted gives A·Qᵀ, computed densely with gonum as the
// reference, on rectangular matrices like the prolongators it permutes.
func TestColumnsPermuted(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 30).Draw(t, "n")
		m := rapid.IntRange(1, 30).Draw(t, "m")
		tr := NewTriplet(n, m, 3*m)
		for e := rapid.IntRange(0, 3*m).Draw(t, "entries"); e > 0; e-- {
			tr.Add(rapid.IntRange(0, n-1).Draw(t, "i"), rapid.IntRange(0, m-1).Draw(t, "j"), rapid.Float64Range(-1, 1).Draw(t, "x"))
		}
		a := tr.Compress()
		perm := make([]int32, m)
		for k, j := range rapid.Permutation(seq(m)).Draw(t, "perm") {
			perm[k] = int32(j)
		}
		q := mat.NewDense(m, m, nil)
		for k, j := range perm {
			q.Set(k, int(j), 1)
		}
		var want mat.Dense
		want.Mul(denseOf(a), q.T())
		if !mat.Equal(denseOf(columnsPermuted(a, perm)), &want) {
			t.Fatalf("columnsPermuted differs from A·Qᵀ")
		}
	})
}
