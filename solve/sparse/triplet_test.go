package sparse

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// randTriplet draws a random n×m triplet with duplicates likely.
func randTriplet(t *rapid.T, n, m int) (*Triplet, *mat.Dense) {
	nz := rapid.IntRange(0, 3*n*m/2+1).Draw(t, "nz")
	tr := NewTriplet(n, m, nz)
	d := mat.NewDense(n, m, nil)
	for s := 0; s < nz; s++ {
		i := rapid.IntRange(0, n-1).Draw(t, "i")
		j := rapid.IntRange(0, m-1).Draw(t, "j")
		x := rapid.Float64Range(-10, 10).Draw(t, "x")
		tr.Add(i, j, x)
		d.Set(i, j, d.At(i, j)+x)
	}
	return tr, d
}

func denseOf(a *CSC) *mat.Dense {
	d := mat.NewDense(a.N, a.M, nil)
	for j := 0; j < a.M; j++ {
		for p := a.P[j]; p < a.P[j+1]; p++ {
			d.Set(int(a.I[p]), j, d.At(int(a.I[p]), j)+a.X[p])
		}
	}
	return d
}

// Reference: gonum mat.Dense (Gonum authors, gonum.org/v1/gonum/mat, 2024)
// holds the same entries summed densely; Compress, T and MulVec must agree.
func TestCompressTransposeMulVec(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 30).Draw(t, "n")
		m := rapid.IntRange(1, 30).Draw(t, "m")
		tr, d := randTriplet(t, n, m)
		a := tr.Compress()
		for j := 0; j < m; j++ {
			for p := a.P[j] + 1; p < a.P[j+1]; p++ {
				if a.I[p-1] >= a.I[p] {
					t.Fatalf("column %d rows not strictly increasing", j)
				}
			}
		}
		if !mat.EqualApprox(denseOf(a), d, 1e-12) {
			t.Fatalf("compressed matrix differs from dense sum")
		}
		if !mat.EqualApprox(denseOf(a.T()), d.T(), 1e-12) {
			t.Fatalf("transpose differs from dense transpose")
		}
		x := make([]float64, m)
		for j := range x {
			x[j] = rapid.Float64Range(-1, 1).Draw(t, "x")
		}
		y := make([]float64, n)
		a.MulVec(y, x)
		var want mat.VecDense
		want.MulVec(d, mat.NewVecDense(m, x))
		for i := range y {
			if math.Abs(y[i]-want.AtVec(i)) > 1e-10 {
				t.Fatalf("MulVec[%d] = %g, gonum %g", i, y[i], want.AtVec(i))
			}
		}
		yt := make([]float64, m)
		xt := make([]float64, n)
		for i := range xt {
			xt[i] = float64(i%5) - 2
		}
		a.MulVecTrans(yt, xt)
		var wantT mat.VecDense
		wantT.MulVec(d.T(), mat.NewVecDense(n, xt))
		for j := range yt {
			if math.Abs(yt[j]-wantT.AtVec(j)) > 1e-10 {
				t.Fatalf("MulVecTrans[%d] = %g, gonum %g", j, yt[j], wantT.AtVec(j))
			}
		}
		if math.Abs(a.Norm1()-mat.Norm(d, 1)) > 1e-10 {
			t.Fatalf("Norm1 %g, gonum %g", a.Norm1(), mat.Norm(d, 1))
		}
	})
}

// Re-stamping through the slot map must give the same matrix as compressing
// the re-stamped triplet afresh (reference: the Compress path itself, checked
// above against gonum).
func TestSetValuesMatchesCompress(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 20).Draw(t, "n")
		tr, _ := randTriplet(t, n, n)
		a, slot := tr.CompressMap()
		for s := range tr.X {
			tr.X[s] = rapid.Float64Range(-5, 5).Draw(t, "x2")
		}
		a.SetValues(tr.X, slot)
		b := tr.Compress()
		if !mat.EqualApprox(denseOf(a), denseOf(b), 1e-12) {
			t.Fatalf("SetValues differs from fresh Compress")
		}
	})
}

// Error values must name the unknown they are about (the message is what a
// user of the checker sees); common practice for diagnostic errors.
func TestErrorMessagesNameTheUnknown(t *testing.T) {
	for _, e := range []error{&Singular{Col: 17}, &NotPositiveDefinite{Col: 17}, &PivotTooSmall{Col: 17, Pivot: 1e-9, Max: 1}} {
		if msg := e.Error(); !strings.Contains(msg, "17") {
			t.Errorf("%T message %q does not name unknown 17", e, msg)
		}
	}
	if msg := (&NotConverged{Iter: 42, RelResidual: 1e-3}).Error(); !strings.Contains(msg, "42") {
		t.Errorf("NotConverged message %q does not give the iteration count", msg)
	}
}

// Misuse panics: dimension mismatches and a changed pattern on refactor.
func TestMisusePanics(t *testing.T) {
	mustPanic := func(name string, f func()) {
		defer func() {
			if recover() == nil {
				t.Errorf("%s did not panic", name)
			}
		}()
		f()
	}
	a := gridLaplacian(4, 1)
	mustPanic("MulVec", func() { a.MulVec(make([]float64, 3), make([]float64, 16)) })
	mustPanic("Triplet.Add", func() { NewTriplet(2, 2, 0).Add(2, 0, 1) })
	mustPanic("AMD non-square", func() { AMD(NewCSC(2, 3, 0)) })
	var ch Cholesky
	if err := ch.Factor(a); err != nil {
		t.Fatal(err)
	}
	mustPanic("Cholesky.Solve", func() { ch.Solve(make([]float64, 3)) })
	b := gridLaplacian(4, 1)
	b.I[1], b.I[2] = b.I[2], b.I[1] // same size, different pattern
	mustPanic("Cholesky.Factorize pattern", func() { _ = ch.Factorize(b) })
	var f LU
	if err := f.Factor(a); err != nil {
		t.Fatal(err)
	}
	mustPanic("LU.Refactor pattern", func() { _ = f.Refactor(b) })
	mustPanic("LU.Solve", func() { f.Solve(make([]float64, 5)) })
}
