package solve

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// system is a square linear system A·x = b held as a fixed list of stamps:
// entry k adds val[k] to A[row[k]][col[k]]. The list is recorded on the
// first assembly and refilled in the same order afterwards, so the pattern
// never changes between Newton iterations and a factorisation can keep its
// symbolic analysis.
type system struct {
	n        int
	row, col []int32
	val      []float64
	rhs      []float64

	recording bool
	k         int // next stamp when refilling
}

func newSystem(n int) *system {
	return &system{n: n, rhs: make([]float64, n), recording: true}
}

// begin starts a new assembly with the same stamps in the same order.
func (s *system) begin() {
	s.k = 0
	clear(s.rhs)
}

// end finishes an assembly.
func (s *system) end() { s.recording = false }

// add stamps A[i][j] += v; a negative index (ground) drops the stamp.
func (s *system) add(i, j int32, v float64) {
	if i < 0 || j < 0 {
		return
	}
	if s.recording {
		s.row = append(s.row, i)
		s.col = append(s.col, j)
		s.val = append(s.val, v)
		return
	}
	s.val[s.k] = v
	s.k++
}

// conductance stamps g between unknowns a and b (either may be ground).
func (s *system) conductance(a, b int32, g float64) {
	s.add(a, a, g)
	s.add(b, b, g)
	s.add(a, b, -g)
	s.add(b, a, -g)
}

// inject adds current i flowing into unknown a from outside.
func (s *system) inject(a int32, i float64) {
	if a >= 0 {
		s.rhs[a] += i
	}
}

// mulVec sets y = A·x.
func (s *system) mulVec(y, x []float64) {
	clear(y)
	for k, v := range s.val {
		y[s.row[k]] += v * x[s.col[k]]
	}
}

// linearSolver factorises a system and solves with it. The first factor
// call analyses the pattern; later calls refactor numerically on the same
// pattern.
type linearSolver interface {
	factor(s *system) error
	solve(x []float64)
	// cond estimates the 1-norm condition number of the last factorised
	// matrix.
	cond() float64
}

// singularError names the unknown (column) where factorisation broke down.
type singularError struct{ col int }

func (e *singularError) Error() string { return "singular matrix" }

// denseSolver is gonum's dense LU with partial pivoting: the reference
// solver, and the fastest one for small systems.
type denseSolver struct {
	a  *mat.Dense
	lu mat.LU
	x  *mat.VecDense
	b  *mat.VecDense
}

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

func (d *denseSolver) solve(x []float64) {
	if len(x) == 0 {
		return
	}
	copy(d.b.RawVector().Data, x)
	// The condition error gonum may return is reported by cond, not here.
	_ = d.lu.SolveVecTo(d.x, false, d.b)
	copy(x, d.x.RawVector().Data)
}

func (d *denseSolver) cond() float64 {
	if d.a == nil {
		return 1
	}
	return d.lu.Cond()
}
