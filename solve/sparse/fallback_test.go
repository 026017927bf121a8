package sparse

import (
	"errors"
	"math/rand/v2"
	"testing"

	"pgregory.net/rapid"
)

// randomLaplacian returns the grounded weighted Laplacian of a random graph
// on n nodes with about deg·n/2 edges whose conductances span spread
// decades, plus a conductance to ground at every tenth node: a network with
// no small separators, like the random designs. A random graph of this
// degree also has a few small components (isolated nodes and pairs); one
// that holds no tenth node is grounded by a unit conductance at its first
// node, so that every component has a real path to ground. (A floor of
// 1e-9 S on every node, used before, left such components nearly
// floating: a pair joined by 50 S and grounded only by the floor has
// solutions near 1e9 V, and the rounding of A·x alone, ε·‖|A|·|x|‖, is
// then about 4e-8 of ‖b‖, so that no float64 vector, the exactly rounded
// solution included, meets a relative residual of 1e-10; see
// TestPCGReportsUnattainableResidual.)
func randomLaplacian(n, deg int, spread float64, seed uint64) *CSC {
	r := rand.New(rand.NewPCG(seed, 1))
	t := NewTriplet(n, n, 2*deg*n+n)
	diag := make([]float64, n)
	comp := make([]int, n) // union–find over the edges
	for i := range comp {
		comp[i] = i
	}
	find := func(i int) int {
		for comp[i] != i {
			comp[i] = comp[comp[i]]
			i = comp[i]
		}
		return i
	}
	for e := 0; e < deg*n/2; e++ {
		i, j := r.IntN(n), r.IntN(n)
		if i == j {
			continue
		}
		g := 1.0
		for k := 0.0; k < spread; k++ {
			g *= 1 + 9*r.Float64()
		}
		t.Add(i, j, -g)
		t.Add(j, i, -g)
		diag[i] += g
		diag[j] += g
		comp[find(i)] = find(j)
	}
	grounded := make([]bool, n)
	for i := 0; i < n; i += 10 {
		diag[i]++
		grounded[find(i)] = true
	}
	for i := range diag {
		if c := find(i); !grounded[c] {
			diag[i]++ // i is the first node of an ungrounded component
			grounded[c] = true
		}
		t.Add(i, i, diag[i])
	}
	return t.Compress()
}

// PCG does not claim a residual that float64 cannot hold. Two nodes joined
// by 50 S and tied to ground by 1 nS each solve to about 5e8 V (for
// b = (0.3, 0.7) the two equations sum to 1e-9·(x₁ + x₂) = 1, by hand);
// computing A·x then rounds by about ε·50·5e8 ≈ 6e-6 A, so a relative residual of 1e-12 is out of reach
// (attainable accuracy of recursive-residual methods: Greenbaum, SIAM J.
// Matrix Anal. Appl. 18(3), 1997, from memory), and PCG must say
// *NotConverged rather than stop on its drifting recursive residual.
func TestPCGReportsUnattainableResidual(t *testing.T) {
	tr := NewTriplet(2, 2, 4)
	tr.Add(0, 0, 50+1e-9)
	tr.Add(1, 1, 50+1e-9)
	tr.Add(0, 1, -50)
	tr.Add(1, 0, -50)
	a := tr.Compress()
	b := []float64{0.3, 0.7}
	x := make([]float64, 2)
	_, res, err := PCG(a, x, b, nil, 1e-12, 1000)
	var nc *NotConverged
	if !errors.As(err, &nc) {
		t.Fatalf("want *NotConverged, got %v (relative residual %g, x %g)", err, res, x)
	}
	if !(res > 1e-12) || nc.RelResidual != res {
		t.Fatalf("reported residual %g (error says %g), want the true one above 1e-12", res, nc.RelResidual)
	}
}

// The AMG complexity guard fires while the first coarse level is built on a
// random graph (whose smoothed Galerkin product fills in), not after the
// whole hierarchy: the uncapped hierarchy of the same matrix is the
// reference for what the cap stops.
func TestAMGComplexityStopsAtFirstLevel(t *testing.T) {
	a := randomLaplacian(6000, 6, 2, 1)
	full, err := NewAMG(a, &AMGOptions{CoarseSize: 200})
	if err != nil {
		t.Fatal(err)
	}
	if c := full.OperatorComplexity(); !(c > 3) {
		t.Fatalf("uncapped complexity %.2f: the matrix does not exercise the guard", c)
	}
	_, err = NewAMG(a, &AMGOptions{CoarseSize: 200, MaxComplexity: 3})
	var ce *ComplexityExceeded
	if !errors.As(err, &ce) {
		t.Fatalf("want *ComplexityExceeded, got %v", err)
	}
	if ce.Level != 1 {
		t.Fatalf("stopped at level %d, want 1 (levels uncapped: %v)", ce.Level, full.Levels())
	}
	// A grid is not refused (smoothed aggregation stays near 1.5 there).
	g := gridLaplacian(60, 1)
	if _, err := NewAMG(g, &AMGOptions{CoarseSize: 50, MaxComplexity: 3}); err != nil {
		t.Fatalf("grid refused: %v", err)
	}
}

// Plain aggregation never holds more entries on a coarse level than on the
// finer one (the coarse matrix is the quotient graph).
func TestUnsmoothedAMGLevelsDoNotFill(t *testing.T) {
	a := randomLaplacian(6000, 6, 2, 2)
	m, err := NewAMG(a, &AMGOptions{CoarseSize: 200, Unsmoothed: true})
	if err != nil {
		t.Fatal(err)
	}
	for l := 1; l < len(m.levels); l++ {
		if m.levels[l].a.Nnz() > m.levels[l-1].a.Nnz() {
			t.Fatalf("level %d holds %d entries, level %d %d", l, m.levels[l].a.Nnz(), l-1, m.levels[l-1].a.Nnz())
		}
	}
}

// AnalyzeBudget stops on a budget below the full analysis's nnz(L) (the
// reference) after counting no more than the budget and one row, and
// accepts a budget equal to it with the same counts.
func TestAnalyzeBudgetStopsEarly(t *testing.T) {
	a := randomLaplacian(3000, 6, 1, 3)
	var full Cholesky
	full.Analyze(a)
	nl := full.NnzL()
	var ch Cholesky
	err := ch.AnalyzeBudget(a, nl/4)
	var fe *FillExceeded
	if !errors.As(err, &fe) {
		t.Fatalf("want *FillExceeded for budget %d of %d, got %v", nl/4, nl, err)
	}
	if !(fe.NnzL > nl/4 && fe.NnzL <= nl && fe.Rows < fe.N) {
		t.Fatalf("stopped at %d entries after %d of %d rows; full factor %d, budget %d", fe.NnzL, fe.Rows, fe.N, nl, nl/4)
	}
	if err := ch.AnalyzeBudget(a, nl); err != nil {
		t.Fatalf("budget equal to nnz(L): %v", err)
	}
	if ch.NnzL() != nl {
		t.Fatalf("nnz(L) %d, full analysis %d", ch.NnzL(), nl)
	}
	if err := ch.Factorize(a); err != nil {
		t.Fatal(err)
	}
}

// PCG with the point preconditioners and with plain aggregation against the
// sparse Cholesky solve (itself checked against gonum's dense LU), with the
// forward error bound of TestPCGAMGMatchesCholesky.
func TestCheapPreconditionersMatchCholesky(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		var a *CSC
		switch rapid.IntRange(0, 2).Draw(t, "matrix") {
		case 0:
			a = gridLaplacian(rapid.IntRange(2, 40).Draw(t, "k"), rapid.Float64Range(1e-3, 1).Draw(t, "g"))
		case 1:
			a = randSPD(t, rapid.IntRange(1, 60).Draw(t, "n"))
		default:
			a = randomLaplacian(rapid.IntRange(20, 2000).Draw(t, "n"), 6, 2, rapid.Uint64().Draw(t, "seed"))
		}
		n := a.N
		b := randVec(t, n, "b")
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		want := append([]float64(nil), b...)
		ch.Solve(want)
		var m Preconditioner
		var err error
		switch kind := rapid.IntRange(0, 2).Draw(t, "pre"); kind {
		case 0:
			m, err = NewJacobi(a)
		case 1:
			m, err = NewSymGaussSeidel(a)
		default:
			m, err = NewAMG(a, &AMGOptions{CoarseSize: 10, Unsmoothed: true})
		}
		if err != nil {
			t.Fatal(err)
		}
		x := make([]float64, n)
		const tol = 1e-10
		// The draw must admit the tolerance: the Cholesky solution meets
		// it (see randomLaplacian for draws that cannot).
		if r := relRes2(a, want, b); r > tol {
			t.Fatalf("the Cholesky solution's relative residual %g is above %g: the draw is not solvable to it in float64", r, tol)
		}
		it, res, err := PCG(a, x, b, m, tol, 20*n+100)
		if err != nil {
			t.Fatalf("PCG: %v", err)
		}
		if res > tol {
			t.Fatalf("relative residual %g > %g after %d iterations", res, tol, it)
		}
		if d, bound := relDiff(x, want), 10*ch.Cond1Est()*tol; d > bound {
			t.Fatalf("relative difference from Cholesky %g > bound %g", d, bound)
		}
	})
}
