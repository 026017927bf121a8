package sparse

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// Reference: gonum dense LU (Gonum authors, gonum.org/v1/gonum/mat, 2024).
// Random SPD nodal matrices; solutions must agree to 1e-9 relative.
func TestCholeskyMatchesGonum(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 60).Draw(t, "n")
		a := randSPD(t, n)
		b := randVec(t, n, "b")
		want, err := gonumSolve(a, b)
		if err != nil {
			t.Fatalf("gonum: %v", err)
		}
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		x := append([]float64(nil), b...)
		ch.Solve(x)
		if d := relDiff(x, want); d > 1e-9 {
			t.Fatalf("relative difference from gonum %g", d)
		}
		if r := relResidual(a, x, b); r > 1e-13 {
			t.Fatalf("backward error %g", r)
		}
	})
}

// Reference: gonum mat.Cholesky (Gonum authors, 2024) on the permuted dense
// matrix. Our symbolic analysis predicts nnz(L); the dense factor of the
// permuted matrix must have exactly that many nonzeros (random values make
// exact cancellation improbable; common practice) and the same values.
func TestCholeskyPatternAndValuesMatchGonum(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 40).Draw(t, "n")
		a := randSPD(t, n)
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatalf("Factor: %v", err)
		}
		perm := ch.Perm()
		d := mat.NewSymDense(n, nil)
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				d.SetSym(i, j, a.At(int(perm[i]), int(perm[j])))
			}
		}
		var dc mat.Cholesky
		if !dc.Factorize(d) {
			t.Fatalf("gonum says not positive definite")
		}
		var u mat.TriDense
		dc.UTo(&u) // A = UᵀU, so L = Uᵀ
		nz := 0
		l := denseOf(ch.L())
		for i := 0; i < n; i++ {
			for j := 0; j <= i; j++ {
				ref := u.At(j, i)
				if ref != 0 {
					nz++
				}
				if math.Abs(l.At(i, j)-ref) > 1e-10*math.Max(1, math.Abs(ref)) {
					t.Fatalf("L[%d,%d] = %g, gonum %g", i, j, l.At(i, j), ref)
				}
			}
		}
		if nz != ch.NnzL() {
			t.Fatalf("symbolic nnz(L) %d, gonum dense factor has %d nonzeros", ch.NnzL(), nz)
		}
	})
}

// An indefinite or singular-Laplacian matrix must be reported as
// *NotPositiveDefinite, never a panic or NaN. The floating grid Laplacian
// (no ground) is singular: its rows sum to zero (common knowledge of nodal
// analysis, from memory).
func TestCholeskyNotPositiveDefinite(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 30).Draw(t, "n")
		a := randSPD(t, n)
		bad := rapid.IntRange(0, n-1).Draw(t, "bad")
		// Make the matrix indefinite: a_bb ← −|a_bb|.
		for p := a.P[bad]; p < a.P[bad+1]; p++ {
			if int(a.I[p]) == bad {
				a.X[p] = -math.Abs(a.X[p]) - 1
			}
		}
		var ch Cholesky
		err := ch.Factor(a)
		var npd *NotPositiveDefinite
		if !errors.As(err, &npd) {
			t.Fatalf("want *NotPositiveDefinite, got %v", err)
		}
		if npd.Col < 0 || npd.Col >= n {
			t.Fatalf("column %d out of range", npd.Col)
		}
	})
	var ch Cholesky
	err := ch.Factor(gridLaplacian(6, 0))
	var npd *NotPositiveDefinite
	if !errors.As(err, &npd) {
		t.Fatalf("floating grid Laplacian: want *NotPositiveDefinite, got %v", err)
	}
}

// Refactorising with new values on the analysed pattern must equal a fresh
// factorisation (reference: the fresh Factor path, itself checked against
// gonum above).
func TestCholeskyRefactorEqualsFresh(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 40).Draw(t, "n")
		a := randSPD(t, n)
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		a2 := a.Copy()
		for p := range a2.X {
			a2.X[p] *= 1.5
		}
		if err := ch.Factorize(a2); err != nil {
			t.Fatal(err)
		}
		var fresh Cholesky
		if err := fresh.Factor(a2); err != nil {
			t.Fatal(err)
		}
		if !mat.EqualApprox(denseOf(ch.L()), denseOf(fresh.L()), 1e-12) {
			t.Fatalf("refactor differs from fresh factor")
		}
	})
}

// Wide supernodes: a dense SPD matrix (every column one supernode) exercises
// the blocked panel factorisation and the Dgemm update path. Reference:
// gonum dense LU (Gonum authors, 2024).
func TestCholeskyDenseBlocks(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(50, 200).Draw(t, "n")
		tr := NewTriplet(n, n, n*n)
		m := mat.NewDense(n, n, nil)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				m.Set(i, j, rapid.Float64Range(-1, 1).Draw(t, "m"))
			}
		}
		var g mat.Dense
		g.Mul(m, m.T()) // M·Mᵀ + I is SPD
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				v := g.At(i, j)
				if i == j {
					v++
				}
				tr.Add(i, j, v)
			}
		}
		a := tr.Compress()
		b := randVec(t, n, "b")
		want, err := gonumSolve(a, b)
		if err != nil {
			t.Fatal(err)
		}
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		x := append([]float64(nil), b...)
		ch.Solve(x)
		if d := relDiff(x, want); d > 1e-9 {
			t.Fatalf("relative difference from gonum %g", d)
		}
	})
}
