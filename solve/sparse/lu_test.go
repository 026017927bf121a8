package sparse

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// randDD draws a random sparse unsymmetric matrix that is strictly
// diagonally dominant by columns, hence nonsingular (Levy–Desplanques
// theorem; Horn & Johnson, Matrix Analysis, 1985, Thm 6.1.10, from memory).
func randDD(t *rapid.T, n int) *CSC {
	tr := NewTriplet(n, n, 4*n)
	colSum := make([]float64, n)
	nz := rapid.IntRange(0, 4*n).Draw(t, "nz")
	for s := 0; s < nz; s++ {
		i := rapid.IntRange(0, n-1).Draw(t, "i")
		j := rapid.IntRange(0, n-1).Draw(t, "j")
		if i == j {
			continue
		}
		x := rapid.Float64Range(-1, 1).Draw(t, "x")
		tr.Add(i, j, x)
		colSum[j] += math.Abs(x)
	}
	for j := 0; j < n; j++ {
		sign := 1.0
		if rapid.Bool().Draw(t, "neg") {
			sign = -1
		}
		tr.Add(j, j, sign*(colSum[j]+rapid.Float64Range(0.1, 2).Draw(t, "margin")))
	}
	return tr.Compress()
}

// randMNA draws the modified-nodal matrix [G B; Bᵀ 0] of a random grounded
// resistor network (G symmetric positive definite) with m voltage sources
// whose incidence matrix B has full column rank (each source owns a
// distinct node not touched by any other source's other terminal). Such a
// saddle-point matrix is nonsingular (Benzi, Golub & Liesen, "Numerical
// solution of saddle point problems", Acta Numerica 14, 2005, §3, from
// memory). The zero diagonal of the branch rows forces off-diagonal pivots.
func randMNA(t *rapid.T, nodes int) *CSC {
	g := randSPD(t, nodes)
	m := rapid.IntRange(0, nodes/2).Draw(t, "sources")
	n := nodes + m
	tr := NewTriplet(n, n, g.Nnz()+4*m)
	for j := 0; j < nodes; j++ {
		for p := g.P[j]; p < g.P[j+1]; p++ {
			tr.Add(int(g.I[p]), j, g.X[p])
		}
	}
	// Sources k = 0..m-1 own node k (plus-terminal); the minus terminal is
	// ground or a node ≥ m.
	for k := 0; k < m; k++ {
		br := nodes + k
		tr.Add(k, br, 1)
		tr.Add(br, k, 1)
		if minus := rapid.IntRange(m-1, nodes-1).Draw(t, "minus"); minus >= m {
			tr.Add(minus, br, -1)
			tr.Add(br, minus, -1)
		}
	}
	return tr.Compress()
}

func drawLUMatrix(t *rapid.T) *CSC {
	if rapid.Bool().Draw(t, "mna") {
		return randMNA(t, rapid.IntRange(1, 40).Draw(t, "nodes"))
	}
	return randDD(t, rapid.IntRange(1, 60).Draw(t, "n"))
}

// Reference: gonum dense LU with partial pivoting (Gonum authors,
// gonum.org/v1/gonum/mat, 2024) for A·x = b and Aᵀ·x = b.
func TestLUMatchesGonum(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		a := drawLUMatrix(t)
		n := a.N
		b := randVec(t, n, "b")
		var ref mat.LU
		ref.Factorize(denseOf(a))
		var want, wantT mat.VecDense
		if err := ref.SolveVecTo(&want, false, mat.NewVecDense(n, b)); err != nil {
			t.Fatalf("gonum: %v", err)
		}
		if err := ref.SolveVecTo(&wantT, true, mat.NewVecDense(n, b)); err != nil {
			t.Fatalf("gonum: %v", err)
		}
		var f LU
		if rapid.Bool().Draw(t, "pure partial pivoting") {
			f.Tol = 1
		}
		if err := f.Factor(a); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		x := append([]float64(nil), b...)
		f.Solve(x)
		if d := relDiff(x, want.RawVector().Data); d > 1e-9 {
			t.Fatalf("Solve: relative difference from gonum %g", d)
		}
		if r := relResidual(a, x, b); r > 1e-13 {
			t.Fatalf("Solve: backward error %g", r)
		}
		xt := append([]float64(nil), b...)
		f.SolveTranspose(xt)
		if d := relDiff(xt, wantT.RawVector().Data); d > 1e-9 {
			t.Fatalf("SolveTranspose: relative difference from gonum %g", d)
		}
		if r := relResidual(a.T(), xt, b); r > 1e-13 {
			t.Fatalf("SolveTranspose: backward error %g", r)
		}
	})
}

// The factors themselves must reproduce P·A·Q (reference: gonum dense
// products, Gonum authors 2024).
func TestLUFactorsReproduceA(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		a := drawLUMatrix(t)
		var f LU
		if err := f.Factor(a); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		var lu mat.Dense
		lu.Mul(denseOf(f.L()), denseOf(f.U()))
		rp, cp := f.RowPerm(), f.ColPerm()
		d := denseOf(a)
		for i := 0; i < a.N; i++ {
			for j := 0; j < a.N; j++ {
				if v, w := lu.At(i, j), d.At(int(rp[i]), int(cp[j])); math.Abs(v-w) > 1e-12*math.Max(1, math.Abs(w)) {
					t.Fatalf("(L·U)[%d,%d] = %g, (P·A·Q) = %g", i, j, v, w)
				}
			}
		}
		// L is unit lower triangular with |l_ij| ≤ 1/τ (threshold pivoting).
		l := f.L()
		for j := 0; j < l.M; j++ {
			if l.I[l.P[j]] != int32(j) || l.X[l.P[j]] != 1 {
				t.Fatalf("column %d of L does not start with a unit diagonal", j)
			}
			for p := l.P[j] + 1; p < l.P[j+1]; p++ {
				if int(l.I[p]) <= j || math.Abs(l.X[p]) > 1/DefaultLUTol+1e-12 {
					t.Fatalf("L[%d,%d] = %g violates the threshold bound", l.I[p], j, l.X[p])
				}
			}
		}
	})
}

// Singular matrices (a structurally empty column, an empty row, or a column
// equal to a multiple of another) are reported as *Singular with the
// column in range — never a panic or a NaN. gonum's condition number of the
// same dense matrix serves as the reference that the matrix is singular
// (Gonum authors, mat.LU.Cond, 2024).
func TestLUSingular(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(2, 40).Draw(t, "n")
		a := randDD(t, n)
		d := denseOf(a)
		c := rapid.IntRange(0, n-1).Draw(t, "c")
		c2 := (c + 1 + rapid.IntRange(0, n-2).Draw(t, "c2")) % n
		switch rapid.IntRange(0, 2).Draw(t, "kind") {
		case 0: // empty column c
			for i := 0; i < n; i++ {
				d.Set(i, c, 0)
			}
		case 1: // empty row c
			for j := 0; j < n; j++ {
				d.Set(c, j, 0)
			}
		case 2: // column c = 2 · column c2 (exact in binary)
			for i := 0; i < n; i++ {
				d.Set(i, c, 2*d.At(i, c2))
			}
		}
		tr := NewTriplet(n, n, 0)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				if v := d.At(i, j); v != 0 || (i+j)%3 == 0 {
					tr.Add(i, j, v) // keep some explicit zeros in the pattern
				}
			}
		}
		s := tr.Compress()
		var ref mat.LU
		ref.Factorize(d)
		if cond := ref.Cond(); cond < 1e12 {
			t.Skip("gonum does not see this matrix as singular")
		}
		var f LU
		err := f.Factor(s)
		var sg *Singular
		if !errors.As(err, &sg) {
			t.Fatalf("want *Singular, got %v", err)
		}
		if sg.Col < 0 || sg.Col >= n {
			t.Fatalf("column %d out of range", sg.Col)
		}
	})
}

// Refactor with new values on the same pattern equals a fresh Factor with
// the pivot order fixed (reference: the Factor path, checked against gonum
// above), and its solution agrees with gonum.
func TestLURefactorEqualsFresh(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		a := drawLUMatrix(t)
		n := a.N
		var f LU
		if err := f.Factor(a); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		a2 := a.Copy()
		for p := range a2.X {
			a2.X[p] *= rapid.Float64Range(0.9, 1.1).Draw(t, "scale")
		}
		err := f.Refactor(a2)
		var small *PivotTooSmall
		if errors.As(err, &small) {
			if err := f.Factorize(a2); err != nil {
				t.Fatalf("Factorize after PivotTooSmall: %v", err)
			}
		} else if err != nil {
			t.Fatalf("Refactor: %v", err)
		}
		b := randVec(t, n, "b")
		want, err := gonumSolve(a2, b)
		if err != nil {
			t.Fatalf("gonum: %v", err)
		}
		x := append([]float64(nil), b...)
		f.Solve(x)
		if d := relDiff(x, want); d > 1e-9 {
			t.Fatalf("relative difference from gonum after Refactor %g", d)
		}
		if small == nil {
			// Same pivots and pattern: L and U must match a factorisation
			// that is forced to the same row order with τ = 1 off.
			var g LU
			if err := g.Factor(a2); err == nil && equalInt32(g.RowPerm(), f.RowPerm()) {
				if !mat.EqualApprox(denseOf(g.L()), denseOf(f.L()), 1e-10) ||
					!mat.EqualApprox(denseOf(g.U()), denseOf(f.U()), 1e-10) {
					t.Fatalf("Refactor factors differ from fresh Factor with the same pivots")
				}
			}
		}
	})
}

func equalInt32(a, b []int32) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// A kept pivot that collapses must be refused: [[a, 1], [1, 1]] pivots on
// a = 1 first; with a = 1e-6 the threshold rule |u_kk| ≥ τ·max (common
// practice) fails, and Factorize then picks the other row.
func TestLURefactorPivotTooSmall(t *testing.T) {
	tr := NewTriplet(2, 2, 4)
	tr.Add(0, 0, 1)
	tr.Add(0, 1, 1)
	tr.Add(1, 0, 1)
	tr.Add(1, 1, 3)
	a, slot := tr.CompressMap()
	var f LU
	f.AnalyzePerm(a, []int32{0, 1}) // column 0 first, so a is the first pivot
	if err := f.Factorize(a); err != nil {
		t.Fatal(err)
	}
	tr.X[0] = 1e-6
	a.SetValues(tr.X, slot)
	err := f.Refactor(a)
	var small *PivotTooSmall
	if !errors.As(err, &small) {
		t.Fatalf("want *PivotTooSmall, got %v", err)
	}
	if err := f.Factorize(a); err != nil {
		t.Fatal(err)
	}
	b := []float64{1, 2}
	want, _ := gonumSolve(a, b)
	f.Solve(b)
	if d := relDiff(b, want); d > 1e-12 {
		t.Fatalf("after re-factorisation relative difference %g", d)
	}
}

// exactCond1 returns κ₁(A) = ‖A‖₁·‖A⁻¹‖₁ from gonum's explicit dense
// inverse (Gonum authors, mat.Dense.Inverse and mat.Norm, 2024). gonum's
// mat.Cond(A, 1) is itself an estimate (LAPACK dgecon), so it is not used as
// the reference.
func exactCond1(t *rapid.T, d *mat.Dense) float64 {
	var inv mat.Dense
	if err := inv.Inverse(d); err != nil {
		var c mat.Condition
		if !errors.As(err, &c) {
			t.Fatalf("gonum inverse: %v", err)
		}
	}
	return mat.Norm(d, 1) * mat.Norm(&inv, 1)
}

// Reference: the exact 1-norm condition number from gonum's dense inverse
// (exactCond1). Hager's estimate is a lower bound on every matrix (it is
// ‖A‖₁ times the norm of one column combination of A⁻¹), and in practice
// within a factor of 3 (Higham 1988, from memory), though no bound holds for
// every matrix. So: the lower bound always, a factor of 10 on all but a few
// per cent of random matrices.
func TestLUCond1Est(t *testing.T) {
	cases, far := 0, 0
	rapid.Check(t, func(t *rapid.T) {
		a := drawLUMatrix(t)
		var f LU
		if err := f.Factor(a); err != nil {
			t.Fatal(err)
		}
		est := f.Cond1Est()
		exact := exactCond1(t, denseOf(a))
		if est > exact*(1+1e-8) {
			t.Fatalf("Cond1Est %g exceeds gonum's exact κ₁ %g", est, exact)
		}
		cases++
		if est < exact/10 {
			far++
		}
	})
	if cases > 0 && far*100 > 3*cases {
		t.Fatalf("Cond1Est under a tenth of the exact κ₁ on %d of %d random matrices", far, cases)
	}
}

// Nearly singular: column c = column c2 + δ·e_c with δ small; gonum's κ₁ and
// our estimate must both be large, and agree within 10×.
func TestLUCond1EstNearlySingular(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(2, 30).Draw(t, "n")
		a := denseOf(randDD(t, n))
		c := rapid.IntRange(0, n-1).Draw(t, "c")
		c2 := (c + 1) % n
		for i := 0; i < n; i++ {
			a.Set(i, c, a.At(i, c2))
		}
		a.Set(c, c, a.At(c, c)+1e-9)
		tr := NewTriplet(n, n, 0)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				if v := a.At(i, j); v != 0 {
					tr.Add(i, j, v)
				}
			}
		}
		var f LU
		if err := f.Factor(tr.Compress()); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		est := f.Cond1Est()
		exact := exactCond1(t, a)
		if est < 1e8 {
			t.Fatalf("estimate %g not large (gonum %g)", est, exact)
		}
		if est > exact*(1+1e-6) || est < exact/10 {
			t.Fatalf("Cond1Est %g, gonum exact κ₁ %g", est, exact)
		}
	})
}

// Cholesky's estimate against the same reference on SPD matrices.
func TestCholeskyCond1Est(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		a := randSPD(t, rapid.IntRange(1, 60).Draw(t, "n"))
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		est := ch.Cond1Est()
		exact := exactCond1(t, denseOf(a))
		if est > exact*(1+1e-8) || est < exact/10 {
			t.Fatalf("Cond1Est %g, gonum exact κ₁ %g", est, exact)
		}
	})
}

// A supply net touching every other node gives A a dense row and column,
// which AMD defers to the end; the LU solution must still agree with gonum's
// dense LU (Gonum authors, 2024).
func TestLUDenseHub(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(250, 400).Draw(t, "n")
		hub := rapid.IntRange(0, n-1).Draw(t, "hub")
		tr := NewTriplet(n, n, 6*n)
		for i := 0; i < n; i++ {
			tr.Add(i, i, 1e-3)
			if i == hub {
				continue
			}
			g := rapid.Float64Range(0.1, 1).Draw(t, "g")
			tr.Add(i, i, g)
			tr.Add(hub, hub, g)
			tr.Add(i, hub, -g)
			tr.Add(hub, i, -0.5*g) // unsymmetric, as a controlled source would make it
			if j := (i + 1) % n; j != hub {
				tr.Add(i, j, -0.1)
				tr.Add(i, i, 0.1)
			}
		}
		a := tr.Compress()
		b := randVec(t, n, "b")
		want, err := gonumSolve(a, b)
		if err != nil {
			t.Fatal(err)
		}
		var f LU
		if err := f.Factor(a); err != nil {
			t.Fatal(err)
		}
		x := append([]float64(nil), b...)
		f.Solve(x)
		if d := relDiff(x, want); d > 1e-9 {
			t.Fatalf("relative difference from gonum %g", d)
		}
	})
}
