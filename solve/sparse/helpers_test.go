package sparse

import (
	"gonum.org/v1/gonum/floats"
	"math"

	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// gridLaplacian returns the k×k 5-point grid Laplacian (unit conductances
// between neighbours) with an extra conductance g to ground at node 0, i.e.
// the nodal matrix of a resistor mesh with one grounded corner.
func gridLaplacian(k int, g float64) *CSC {
	n := k * k
	t := NewTriplet(n, n, 5*n)
	id := func(r, c int) int { return r*k + c }
	stamp := func(a, b int) {
		t.Add(a, a, 1)
		t.Add(b, b, 1)
		t.Add(a, b, -1)
		t.Add(b, a, -1)
	}
	for r := 0; r < k; r++ {
		for c := 0; c < k; c++ {
			if c+1 < k {
				stamp(id(r, c), id(r, c+1))
			}
			if r+1 < k {
				stamp(id(r, c), id(r+1, c))
			}
		}
	}
	t.Add(0, 0, g)
	return t.Compress()
}

// randSPD draws a random sparse symmetric positive-definite matrix as the
// nodal matrix of a random resistor network with every node tied to ground
// through a positive conductance (strictly diagonally dominant, hence SPD:
// Gershgorin's theorem, from memory).
func randSPD(t *rapid.T, n int) *CSC {
	tr := NewTriplet(n, n, 4*n)
	for i := 0; i < n; i++ {
		tr.Add(i, i, rapid.Float64Range(1e-3, 2).Draw(t, "gnd"))
	}
	edges := rapid.IntRange(0, 3*n).Draw(t, "edges")
	for e := 0; e < edges; e++ {
		a := rapid.IntRange(0, n-1).Draw(t, "a")
		b := rapid.IntRange(0, n-1).Draw(t, "b")
		if a == b {
			continue
		}
		g := rapid.Float64Range(1e-2, 10).Draw(t, "g")
		tr.Add(a, a, g)
		tr.Add(b, b, g)
		tr.Add(a, b, -g)
		tr.Add(b, a, -g)
	}
	return tr.Compress()
}

func randVec(t *rapid.T, n int, label string) []float64 {
	b := make([]float64, n)
	for i := range b {
		b[i] = rapid.Float64Range(-1, 1).Draw(t, label)
	}
	return b
}

// gonumSolve solves A·x = b with gonum's dense LU (Gonum authors,
// gonum.org/v1/gonum/mat, LU with partial pivoting, 2024).
func gonumSolve(a *CSC, b []float64) ([]float64, error) {
	var lu mat.LU
	lu.Factorize(denseOf(a))
	var x mat.VecDense
	if err := lu.SolveVecTo(&x, false, mat.NewVecDense(len(b), b)); err != nil {
		return nil, err
	}
	return x.RawVector().Data, nil
}

func norm2(v []float64) float64 {
	// gonum's scaled norm, so tiny or huge test vectors do not underflow.
	return floats.Norm(v, 2)
}

// relDiff returns ‖x − y‖₂ / max(‖y‖₂, tiny).
func relDiff(x, y []float64) float64 {
	d := make([]float64, len(x))
	for i := range x {
		d[i] = x[i] - y[i]
	}
	return norm2(d) / math.Max(norm2(y), 1e-300)
}

// relResidual returns ‖A·x − b‖_∞ / (‖A‖_∞·‖x‖_∞ + ‖b‖_∞), the normwise
// backward error (Higham, Accuracy and Stability of Numerical Algorithms,
// 2nd ed., SIAM 2002, §7.1, from memory).
func relResidual(a *CSC, x, b []float64) float64 {
	r := make([]float64, a.N)
	a.MulVec(r, x)
	inf := func(v []float64) float64 {
		m := 0.0
		for _, e := range v {
			m = math.Max(m, math.Abs(e))
		}
		return m
	}
	for i := range r {
		r[i] -= b[i]
	}
	return inf(r) / (a.T().Norm1()*inf(x) + inf(b))
}

// relRes2 returns ‖b − A·x‖₂ / ‖b‖₂, the quantity PCG stops on.
func relRes2(a *CSC, x, b []float64) float64 {
	r := make([]float64, a.N)
	a.MulVec(r, x)
	for i := range r {
		r[i] = b[i] - r[i]
	}
	return norm2(r) / math.Max(norm2(b), 1e-300)
}
