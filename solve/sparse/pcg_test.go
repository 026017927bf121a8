package sparse

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"
)

// PCG with the AMG preconditioner against the sparse Cholesky path (itself
// checked against gonum's dense LU). The forward error bound
// ‖x − x*‖/‖x*‖ ≤ κ(A)·‖r‖/‖b‖ (Golub & Van Loan, Matrix Computations,
// 4th ed., 2013, §2.6, from memory) sets the tolerance, with κ from our
// Cholesky condition estimate and a factor 10 for the estimate's slack.
func TestPCGAMGMatchesCholesky(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		var a *CSC
		if rapid.Bool().Draw(t, "grid") {
			a = gridLaplacian(rapid.IntRange(2, 70).Draw(t, "k"), rapid.Float64Range(1e-3, 1).Draw(t, "g"))
		} else {
			a = randSPD(t, rapid.IntRange(1, 60).Draw(t, "n"))
		}
		n := a.N
		b := randVec(t, n, "b")
		var ch Cholesky
		if err := ch.Factor(a); err != nil {
			t.Fatal(err)
		}
		want := append([]float64(nil), b...)
		ch.Solve(want)
		// Small CoarseSize so that several levels are exercised.
		m, err := NewAMG(a, &AMGOptions{CoarseSize: 10})
		if err != nil {
			t.Fatal(err)
		}
		x := make([]float64, n)
		const tol = 1e-10
		it, res, err := PCG(a, x, b, m, tol, 500)
		if err != nil {
			t.Fatalf("PCG: %v (levels %v)", err, m.Levels())
		}
		if res > tol {
			t.Fatalf("relative residual %g > %g after %d iterations", res, tol, it)
		}
		if d, bound := relDiff(x, want), 10*ch.Cond1Est()*tol; d > bound {
			t.Fatalf("relative difference from Cholesky %g > bound %g", d, bound)
		}
	})
}

// PCG without preconditioning reports non-convergence as an error value.
func TestPCGNotConverged(t *testing.T) {
	a := gridLaplacian(30, 1e-3)
	b := make([]float64, a.N)
	b[a.N-1] = 1
	x := make([]float64, a.N)
	_, _, err := PCG(a, x, b, nil, 1e-12, 3)
	var nc *NotConverged
	if !errors.As(err, &nc) || nc.Iter != 3 {
		t.Fatalf("want *NotConverged after 3 iterations, got %v", err)
	}
}

// A right side near the bottom of the float64 range: the solution of
// 0.5·x = b is 2b (checked by hand), which a plain sum of squares would
// lose to underflow.
func TestPCGTinyRightSide(t *testing.T) {
	tr := NewTriplet(2, 2, 2)
	tr.Add(0, 0, 0.5)
	tr.Add(1, 1, 2)
	a := tr.Compress()
	b := []float64{1e-162, 3e-170}
	x := make([]float64, 2)
	if _, _, err := PCG(a, x, b, nil, 1e-12, 10); err != nil {
		t.Fatal(err)
	}
	if math.Abs(x[0]-2e-162) > 1e-174 || math.Abs(x[1]-1.5e-170) > 1e-182 {
		t.Fatalf("x = %g, want [2e-162 1.5e-170]", x)
	}
}
