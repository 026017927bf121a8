// ddlu.go: dense LU factorisation with partial pivoting in double-double arithmetic, for small systems that float64 cannot resolve

package solve

import "nodal/solve/sparse"

// ddDenseMax is the largest system that gets a double-double LU when the
// refinement against the float64 factors does not converge: n³/3
// double-double multiply–adds (about 20 flops each) are some 0.2 s at 300
// unknowns.
const ddDenseMax = 300

// ddLU is P·A = L·U of a dense matrix held in double-double, by Gaussian
// elimination with partial pivoting (Golub & Van Loan, Matrix
// Computations, 4th ed., 2013, Alg. 3.4.1, from memory). It resolves
// systems whose float64 factors lose every digit (κ·u ≥ 1, u = 2⁻⁵³) while
// κ·u² stays small.
type ddLU struct {
	n    int
	a    []dd // row-major, L below the diagonal (unit diagonal), U on and above
	perm []int
}

// factorDD factors the system as stamped, its diagonal in double-double.
// It returns false when a pivot is zero.
func factorDD(s *system) (*ddLU, bool) {
	n := s.n
	f := &ddLU{n: n, a: make([]dd, n*n), perm: make([]int, n)}
	off := len(s.val) - n
	for k, v := range s.val[:off] {
		e := &f.a[int(s.row[k])*n+int(s.col[k])]
		*e = e.add(dd{v, 0})
	}
	for i := 0; i < n; i++ {
		e := &f.a[i*n+i]
		*e = e.add(dd{s.diag[i], s.diagLo[i]})
		f.perm[i] = i
	}
	a := f.a
	for k := 0; k < n; k++ {
		p, big := k, a[k*n+k].abs()
		for i := k + 1; i < n; i++ {
			if v := a[i*n+k].abs(); v > big {
				p, big = i, v
			}
		}
		if !(big > 0) {
			return nil, false
		}
		if p != k {
			for j := 0; j < n; j++ {
				a[k*n+j], a[p*n+j] = a[p*n+j], a[k*n+j]
			}
			f.perm[k], f.perm[p] = f.perm[p], f.perm[k]
		}
		piv := a[k*n+k]
		for i := k + 1; i < n; i++ {
			if a[i*n+k].hi == 0 {
				continue
			}
			l := a[i*n+k].div(piv)
			a[i*n+k] = l
			for j := k + 1; j < n; j++ {
				if a[k*n+j].hi != 0 {
					a[i*n+j] = a[i*n+j].sub(l.mul(a[k*n+j]))
				}
			}
		}
	}
	return f, true
}

// solve overwrites b with A⁻¹b.
func (f *ddLU) solve(b []dd) {
	n, a := f.n, f.a
	y := make([]dd, n)
	for i := 0; i < n; i++ {
		s := b[f.perm[i]]
		for j := 0; j < i; j++ {
			s = s.sub(a[i*n+j].mul(y[j]))
		}
		y[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		s := y[i]
		for j := i + 1; j < n; j++ {
			s = s.sub(a[i*n+j].mul(y[j]))
		}
		y[i] = s.div(a[i*n+i])
	}
	copy(b, y)
}

// cond estimates the equilibrated condition number of the system s that
// f factorises, as the float64 solvers do (equilibratedCond).
func (f *ddLU) cond(s *system) float64 {
	t := &sparse.Triplet{N: s.n, M: s.n, I: s.row, J: s.col, X: s.val}
	d, norm := scaling(t.Compress())
	b := make([]dd, s.n)
	return equilibratedCond(d, norm, func(v []float64) {
		for i := range v {
			b[i] = dd{v[i], 0}
		}
		f.solve(b)
		for i := range v {
			v[i] = b[i].hi + b[i].lo
		}
	})
}
