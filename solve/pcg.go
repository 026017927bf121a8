// pcg.go: conjugate gradients preconditioned by multigrid (or Jacobi), with its fallbacks.

package solve

import (
	"errors"
	"math"

	"nodal/solve/sparse"
)

// maxComplexity is the largest AMG operator complexity PCG accepts; past it
// the hierarchy costs more than it saves and the solve falls back to the
// Jacobi preconditioner (common practice: smoothed aggregation aims at well
// below 2).
const maxComplexity = 3

// PCGTol is the default relative residual ‖b − A·x‖₂/‖b‖₂ at which PCG
// stops. Solve tightens it by 1000 and solves again, warm-started, when the
// result misses the KCL self-check.
const PCGTol = 1e-12

// pcgMaxIter caps the PCG iterations of one solve.
const pcgMaxIter = 300

// pcgSolver is conjugate gradients preconditioned by one V-cycle of
// smoothed-aggregation AMG. The hierarchy is built for the first matrix and
// kept while it stays effective: any symmetric positive-definite
// preconditioner keeps PCG convergent, so a hierarchy built for an earlier
// Newton iterate is still valid, only less sharp; it is rebuilt when an
// iteration count grows past twice the first one. Every solve starts from
// the previous solution (warm start).
//
// If the coarsening fills in past maxComplexity (checked level by level
// while the hierarchy is built, so a bad first level stops it at once) the
// solver switches to the Jacobi preconditioner for the rest of the solve,
// with the same acceptance tests and warm starts. If PCG does not converge,
// the solver falls back to the sparse Cholesky factorisation, within
// fillBudget, for the rest of the solve.
type pcgSolver struct {
	m        sparseMatrix
	amg      *sparse.AMG
	jac      *sparse.Jacobi // set once the solver runs on the Jacobi preconditioner
	jacobi   bool           // start on the Jacobi preconditioner (Options.Solver)
	plain    bool           // build plain-aggregation hierarchies
	private  bool           // the matrix will change: the hierarchy is built on a copy
	tol      float64
	x0, b    []float64
	first    int // iterations of the first solve with the current hierarchy
	stale    bool
	fallback *cholSolver
	sys      *system
	diag     []float64
	iters    int  // PCG iterations in all
	loose    bool // the next solve may stop at looseTol (inexact Newton)
	factors  int  // factor calls so far
	builtAt  int  // factor calls before the one that built the hierarchy
}

// plainCoarseSize is the coarsest level of a plain-aggregation hierarchy,
// solved by Cholesky: its quotient graphs grow dense as they shrink, so the
// coarsest is kept small enough that even a dense factor is cheap (500
// unknowns: at most 125 000 entries).
const plainCoarseSize = 500

// plainMaxComplexity bounds a plain-aggregation hierarchy, its coarsest
// factor included. Its coarse matrices never hold more entries than the
// finer ones, but on random networks the last levels shrink slowly as the
// quotient graphs grow dense: 2.8 on a 30 000-part random design and 3.0 on
// a 100 000-part one (measured), so the bound is looser than maxComplexity.
const plainMaxComplexity = 4

// looseTol is the relative residual of a loose PCG solve.
const looseTol = 1e-6

// jacobiMaxIter caps the iterations of one PCG solve with the Jacobi
// preconditioner, which needs more than a multigrid cycle but each costs
// only a product with A.
const jacobiMaxIter = 5000

func (p *pcgSolver) kind() LinearSolver {
	switch {
	case p.fallback != nil:
		return SparseCholesky
	case p.jac != nil:
		return PCGJacobi
	case p.plain:
		return PCGPlainAMG
	}
	return PCGAMG
}

// direct offers the Cholesky fallback's solve once the solver has fallen
// back to it.
func (p *pcgSolver) direct() (func([]float64), bool) {
	if p.fallback != nil {
		return p.fallback.direct()
	}
	return nil, false
}

func (p *pcgSolver) factor(s *system) error {
	p.sys = s
	if p.fallback != nil {
		return p.fallback.factor(s)
	}
	p.m.update(s)
	if p.x0 == nil {
		p.x0 = make([]float64, s.n)
		p.b = make([]float64, s.n)
	}
	p.factors++
	if p.jac != nil {
		return p.jac.Update(p.m.a)
	}
	if p.jacobi {
		return p.toJacobi()
	}
	// A tight solve is accepted on an error estimate made with the
	// hierarchy (see settled), which is only sound for the matrix it was
	// built for: rebuild it for a tight solve of a changed matrix.
	if p.amg == nil || p.stale || !p.loose && p.builtAt != p.factors-1 {
		return p.build()
	}
	return nil
}

func (p *pcgSolver) build() error {
	a := p.m.a
	if p.private {
		// The finest level smooths with the matrix itself: keep it the
		// matrix the hierarchy was built for.
		a = a.Copy()
	}
	opt := &sparse.AMGOptions{MaxComplexity: maxComplexity}
	if p.plain {
		opt.Unsmoothed, opt.CoarseSize, opt.MaxComplexity = true, plainCoarseSize, plainMaxComplexity
	}
	amg, err := sparse.NewAMG(a, opt)
	var ce *sparse.ComplexityExceeded
	if errors.As(err, &ce) {
		if !p.plain {
			// The smoothed prolongators fill the coarse matrices in:
			// aggregate without smoothing, which cannot.
			p.plain = true
			return p.build()
		}
		return p.toJacobi()
	}
	if err != nil {
		return p.toCholesky()
	}
	p.amg, p.stale, p.first = amg, false, 0
	p.builtAt = p.factors - 1
	return nil
}

func (p *pcgSolver) toJacobi() error {
	p.amg = nil
	jac, err := sparse.NewJacobi(p.m.a)
	if err != nil {
		return p.toCholesky()
	}
	p.jac = jac
	return nil
}

func (p *pcgSolver) toCholesky() error {
	was := p.kind()
	p.amg, p.jac = nil, nil
	p.fallback = &cholSolver{}
	err := p.fallback.factor(p.sys)
	var e *Error
	if errors.As(err, &e) && e.Kind == TooLarge {
		msg := "conjugate gradients did not converge"
		if was != PCGAMG {
			msg += " (" + was.String() + ")"
		}
		e.Msg = msg + ", and " + e.Msg
	}
	return err
}

// pre is the current preconditioner.
func (p *pcgSolver) pre() sparse.Preconditioner {
	if p.jac != nil {
		return p.jac
	}
	return p.amg
}

func (p *pcgSolver) maxIter() int {
	if p.jac != nil {
		return jacobiMaxIter
	}
	return pcgMaxIter
}

func (p *pcgSolver) solve(x []float64) error {
	if p.fallback != nil {
		return p.fallback.solve(x)
	}
	a := p.m.a
	copy(p.b, x)
	copy(x, p.x0)
	p.diag = diagonal(a, p.diag)
	tol := p.tol
	if p.loose {
		tol = math.Max(tol, looseTol)
	}
	for round := 0; ; round++ {
		it, _, err := sparse.PCG(a, x, p.b, p.pre(), tol, p.maxIter())
		p.iters += it
		var nc *sparse.NotConverged
		if errors.As(err, &nc) && p.amg != nil && p.first > 0 && round == 0 {
			// The hierarchy is from an earlier matrix: rebuild and retry.
			if err := p.build(); err != nil {
				return err
			}
			if p.fallback == nil {
				copy(x, p.x0)
				it, _, err = sparse.PCG(a, x, p.b, p.pre(), tol, p.maxIter())
				p.iters += it
			}
		}
		if err == nil && p.fallback == nil {
			if p.amg != nil {
				if p.first == 0 {
					p.first = max(it, 1)
				} else if it > 2*p.first+5 {
					p.stale = true
				}
			}
			symmetricGaussSeidel(a, p.diag, x, p.b)
			// Only the smoothed hierarchy's error estimate is sharp enough
			// to judge by (see settled); with the weaker preconditioners
			// the residual and then Solve's KCL self-check decide.
			if p.loose || p.plain || p.jac != nil || p.settled(x) {
				copy(p.x0, x)
				return nil
			}
		}
		if err != nil || p.fallback != nil || round == 3 || tol < 1e-15 {
			if p.fallback == nil {
				if err := p.toCholesky(); err != nil {
					return err
				}
			}
			copy(x, p.b)
			return p.fallback.solve(x)
		}
		tol /= 100
	}
}

// settled reports whether the error estimate z = M⁻¹(b − A·x), the
// preconditioner applied to the residual, is at most pcgVoltTol·max|x| at
// every unknown. A residual norm alone does not bound the error where a
// cluster of nets is tied to the rest only by tiny conductances (a
// junction's leakage, a megohm): there a femtoampere of residual is a
// millivolt of error. The preconditioned residual approximates the error
// A⁻¹r itself, a multigrid cycle's coarse levels catching such clusters
// (stopping on an estimate of the error rather than the residual: Arioli,
// "A stopping criterion for the conjugate gradient algorithm in a finite
// element method framework", Numer. Math. 97, 2004, from memory); with the
// Jacobi preconditioner it is the error of each unknown with its
// neighbours held, the KCL self-check then having the last word.
func (p *pcgSolver) settled(x []float64) bool {
	n := len(x)
	r := make([]float64, n)
	z := make([]float64, n)
	p.m.mul(r, x)
	xmax := 0.0
	for i, v := range x {
		xmax = math.Max(xmax, math.Abs(v))
		r[i] = p.b[i] - r[i]
	}
	p.pre().Precondition(z, r)
	lim := pcgVoltTol*xmax + 1e-15
	for _, v := range z {
		if !(math.Abs(v) <= lim) {
			return false
		}
	}
	return true
}

// pcgVoltTol bounds the estimated error of an accepted PCG solution,
// relative to the largest unknown.
const pcgVoltTol = 1e-11

// diagonal returns the diagonal of a, reusing d.
func diagonal(a *sparse.CSC, d []float64) []float64 {
	if len(d) != a.M {
		d = make([]float64, a.M)
	}
	for j := 0; j < a.M; j++ {
		d[j] = 0
		for q := a.P[j]; q < a.P[j+1]; q++ {
			if int(a.I[q]) == j {
				d[j] += a.X[q]
			}
		}
	}
	return d
}

// symmetricGaussSeidel makes one forward and one backward Gauss–Seidel
// sweep on A·x = b (A symmetric, so column i lists row i). Each sweep
// leaves every equation satisfied for the values of its neighbours at that
// moment, which settles unknowns tied to the rest only by tiny
// conductances; for a symmetric positive-definite A it never increases the
// energy norm of the error (Saad, Iterative Methods for Sparse Linear
// Systems, 2nd ed., 2003, §4.1, from memory).
func symmetricGaussSeidel(a *sparse.CSC, diag, x, b []float64) {
	step := func(i int) {
		s := b[i]
		for q := a.P[i]; q < a.P[i+1]; q++ {
			s -= a.X[q] * x[a.I[q]]
		}
		x[i] += s / diag[i]
	}
	for i := 0; i < a.M; i++ {
		step(i)
	}
	for i := a.M - 1; i >= 0; i-- {
		step(i)
	}
}

// cond makes no estimate on the iterative path: an estimate of ‖A⁻¹‖₁
// would cost several more solves of the whole system, which on the designs
// that take this path is several times the solve itself.
func (p *pcgSolver) cond() float64 {
	if p.fallback != nil {
		return p.fallback.cond()
	}
	return 0
}
