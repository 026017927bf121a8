// dense.go: gonum's dense LU, the reference solver and the fastest for small systems.

package solve

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// denseSolver is gonum's dense LU with partial pivoting: the reference
// solver, and the fastest one for small systems.
type denseSolver struct {
	a  *mat.Dense
	lu mat.LU
	x  *mat.VecDense
	b  *mat.VecDense
}

func (d *denseSolver) kind() LinearSolver { return DenseLU }

func (d *denseSolver) direct() (func([]float64), bool) { return d.raw, true }

func (d *denseSolver) factor(s *system) error {
	n := s.n
	if n == 0 {
		return nil // every net is ground
	}
	if d.a == nil {
		d.a = mat.NewDense(n, n, nil)
		d.x = mat.NewVecDense(n, nil)
		d.b = mat.NewVecDense(n, nil)
	} else {
		d.a.Zero()
	}
	raw := d.a.RawMatrix()
	for k, v := range s.val {
		raw.Data[int(s.row[k])*raw.Stride+int(s.col[k])] += v
	}
	d.lu.Factorize(d.a)
	if c := d.lu.Cond(); math.IsInf(c, 0) || math.IsNaN(c) {
		return &singularError{col: d.zeroPivot()}
	}
	return nil
}

// zeroPivot finds the first column whose pivot is negligible: with row
// pivoting only, that column depends on the ones before it.
func (d *denseSolver) zeroPivot() int {
	var u mat.TriDense
	d.lu.UTo(&u)
	n, _ := u.Dims()
	big := 0.0
	for k := 0; k < n; k++ {
		big = math.Max(big, math.Abs(u.At(k, k)))
	}
	for k := 0; k < n; k++ {
		if v := math.Abs(u.At(k, k)); v <= 1e-14*big || math.IsNaN(v) {
			return k
		}
	}
	return n - 1
}

func (d *denseSolver) raw(x []float64) {
	copy(d.b.RawVector().Data, x)
	// The condition error gonum may return is reported by cond, not here.
	_ = d.lu.SolveVecTo(d.x, false, d.b)
	copy(x, d.x.RawVector().Data)
}

func (d *denseSolver) solve(x []float64) error {
	if len(x) == 0 {
		return nil
	}
	refine(x, d.raw, func(y, x []float64) {
		d.x.MulVec(d.a, mat.NewVecDense(len(x), x))
		copy(y, d.x.RawVector().Data)
	})
	return nil
}

func (d *denseSolver) cond() float64 {
	if d.a == nil {
		return 1
	}
	n, _ := d.a.Dims()
	raw := d.a.RawMatrix()
	s := make([]float64, n)
	for i := 0; i < n; i++ {
		m := 0.0
		for _, v := range raw.Data[i*raw.Stride : i*raw.Stride+n] {
			m = math.Max(m, math.Abs(v))
		}
		s[i] = 1
		if m > 0 {
			s[i] = 1 / math.Sqrt(m)
		}
	}
	norm := 0.0
	for j := 0; j < n; j++ {
		c := 0.0
		for i := 0; i < n; i++ {
			c += math.Abs(raw.Data[i*raw.Stride+j]) * s[i] * s[j]
		}
		norm = math.Max(norm, c)
	}
	return equilibratedCond(s, norm, d.raw)
}
