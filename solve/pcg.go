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
// Newton iterate is still valid, only less sharp. A plain-aggregation
// hierarchy is refreshed for every new matrix (its aggregates kept, its
// coarse matrices recomputed: sparse.AMG.Refresh), a smoothed one kept as
// it is for loose solves and rebuilt for a tight one. Either is rebuilt
// when a solve with it converges at less than half the rate measured on
// the first long enough solve after it was built (see rateIters), and at
// once, mid-solve, when a solve takes more than twice the iterations that
// rate predicts. Every solve starts from the previous solution (warm
// start), and a Newton step's solve stops at its forcing term (see
// forcing).
//
// If the coarsening fills in past maxComplexity (checked level by level
// while the hierarchy is built, so a bad first level stops it at once) the
// solver switches to plain aggregation, and past plainMaxComplexity to the
// Jacobi preconditioner for the rest of the solve, with the same
// acceptance tests and warm starts. If PCG does not converge, the solver
// falls back to the sparse Cholesky factorisation, within fillBudget, for
// the rest of the solve.
type pcgSolver struct {
	m        sparseMatrix
	amg      *sparse.AMG
	jac      *sparse.Jacobi // set once the solver runs on the Jacobi preconditioner
	jacobi   bool           // start on the Jacobi preconditioner (Options.Solver)
	plain    bool           // build plain-aggregation hierarchies
	private  bool           // the matrix will change: a smoothed hierarchy is built on a copy
	tol      float64
	x0, b, r []float64
	stale    bool
	fallback *cholSolver
	sys      *system
	diag     []float64
	iters    int  // PCG iterations in all
	loose    bool // the next solve is a Newton step's and may stop at its forcing term
	damped   bool // the Newton step before it was cut by junction limiting (see forcing)
	factors  int  // factor calls so far
	builtAt  int  // factor calls before the one that built (or refreshed) the hierarchy
	// fresh says the hierarchy was built, not refreshed, for the current
	// matrix; rate is the decimal digits of residual reduction per
	// iteration measured on the first solve of at least rateIters
	// iterations after the hierarchy was built (0: not measured yet), and
	// measure says that solve is still to come.
	fresh, measure bool
	rate           float64
	// fprev and eta are the residual at the start of the Newton step's
	// previous solve and its forcing term (fprev 0: none yet in this
	// Newton run); see forcing.
	fprev, eta float64
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

// looseTol is the relative residual of a loose PCG solve with the Jacobi
// preconditioner.
const looseTol = 1e-6

// Forcing terms of inexact Newton (Eisenstat & Walker, "Choosing the
// forcing terms in an inexact Newton method", SIAM J. Sci. Comput. 17(1),
// 1996, choice 2 with its safeguard): etaGamma and etaAlpha are the
// paper's γ = 0.9 and α = 2; etaMax caps the term (the paper's 0.9 is
// lowered to 0.1 here, where a Newton step with its assembly and junction
// updates costs about as much as a few conjugate-gradient iterations).
const (
	etaGamma = 0.9
	etaAlpha = 2
	etaMax   = 0.1
)

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
	if p.amg == nil || p.stale {
		return p.build()
	}
	if p.plain {
		// Only the junctions' conductances change between Newton steps:
		// keep the aggregates and recompute the coarse matrices.
		if err := p.amg.Refresh(p.m.a); err != nil {
			return p.build()
		}
		p.fresh, p.builtAt = false, p.factors-1
		return nil
	}
	// A tight solve is accepted on an error estimate made with the
	// hierarchy (see settled), which is only sound for the matrix it was
	// built for: rebuild it for a tight solve of a changed matrix.
	if !p.loose && p.builtAt != p.factors-1 {
		return p.build()
	}
	p.fresh = false
	return nil
}

func (p *pcgSolver) build() error {
	a := p.m.a
	if p.private && !p.plain {
		// The finest level smooths with the matrix itself: keep it the
		// matrix the hierarchy was built for. (A plain hierarchy is
		// refreshed with every new matrix instead; see factor.)
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
			a = p.m.a
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
	p.amg, p.stale, p.fresh, p.measure = amg, false, true, true
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
	bnorm := norm2(p.b)
	f := p.residual(x)
	tol := p.tol
	switch {
	case p.loose && p.amg != nil && bnorm > 0:
		tol = math.Max(tol, p.forcing(f)*f/bnorm)
	case p.loose:
		// Jacobi, the last resort, keeps a fixed loose tolerance: its
		// error at a given residual is up to κ(D⁻¹A) times larger, and
		// the many Newton steps of a fixed tolerance, each ending on a
		// Gauss–Seidel sweep, are what has kept it within the accuracy
		// TestRandomNetworkFallbacksMatchDense asks of it.
		tol = math.Max(tol, looseTol)
	}
	for round := 0; ; round++ {
		rel0 := 0.0
		if bnorm > 0 {
			rel0 = f / bnorm
		}
		err := p.run(x, tol, rel0)
		if err == nil && p.fallback == nil {
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
		f = p.residual(x)
		tol /= 100
	}
}

// run is PCG from x to the relative residual tol, rel0 being x's. With a
// hierarchy reused from an earlier matrix (refreshed, or kept for a loose
// solve) it allows twice the iterations a freshly built one would need at
// its measured rate, plus 5; if that does not do, it builds a hierarchy for
// the matrix and goes on from where the iteration stopped.
func (p *pcgSolver) run(x []float64, tol, rel0 float64) error {
	a := p.m.a
	limit := p.maxIter()
	reused := p.amg != nil && !p.fresh
	if reused && p.rate > 0 && rel0 > tol {
		limit = min(limit, int(2*math.Log10(rel0/tol)/p.rate)+5)
	}
	it, rel, err := sparse.PCG(a, x, p.b, p.pre(), tol, limit)
	p.iters += it
	var nc *sparse.NotConverged
	if errors.As(err, &nc) && reused {
		if err := p.build(); err != nil || p.fallback != nil {
			return err
		}
		rel0 = rel
		it, rel, err = sparse.PCG(a, x, p.b, p.pre(), tol, p.maxIter())
		p.iters += it
	}
	// A rate is taken, and judged, over at least rateIters iterations.
	if err == nil && p.amg != nil && it >= rateIters && rel > 0 && rel0 > rel {
		r := math.Log10(rel0/rel) / float64(it)
		switch {
		case p.measure:
			p.rate, p.measure = math.Min(r, 1), false
		case r < p.rate/2:
			p.stale = true
		}
	}
	return err
}

// rateIters is the fewest iterations a convergence rate is taken or
// judged by. Fewer overstate it: the first iterations of a warm-started
// solve remove the rough part of the residual faster than the rest (on the
// million-part random network, with the same aggregates, 1.2 decimal
// digits over one iteration and 0.23 an iteration over 5, against 0.11–0.16
// over 16–32; measured), and a rate overstated by half as much again
// judged a hierarchy stale that was not, whose rebuild cost more than the
// iterations it saved.
const rateIters = 10

// residual sets p.r ← b − A·x and returns its 2-norm.
func (p *pcgSolver) residual(x []float64) float64 {
	if len(p.r) != len(x) {
		p.r = make([]float64, len(x))
	}
	p.m.mul(p.r, x)
	for i := range p.r {
		p.r[i] = p.b[i] - p.r[i]
	}
	return norm2(p.r)
}

// forcing returns the forcing term η of a Newton step whose linear system
// has the residual f at the previous iterate, and records f: the step's
// solve may stop once its residual is η·f (Eisenstat & Walker 1996, choice
// 2): η = γ·(f/f_prev)^α, kept at least γ·η_prev^α when that exceeds 0.1
// (so that η does not fall too fast while the residual still stalls), at
// most etaMax, and etaMax for a Newton run's first step. The residual at
// the previous iterate is the nonlinear residual there (the equations are
// linearised at the junctions' last points), so the steps' solves tighten
// as Newton converges, and the solve that ends the run is a tight one
// (see newton).
//
// While junction limiting cuts the Newton steps (p.damped: the step before
// was cut) the term stays at etaMax: the iterates then move by the
// limits, not by the Newton step, whose digits past the first are thrown
// away, and the residual's fall from one such step to the next says
// nothing of how close Newton is (on a million-part random network the
// terms of choice 2 fell to 1e-2 during the limited steps and those
// solves took 36 and 48 iterations, 84 of its 206; measured).
func (p *pcgSolver) forcing(f float64) float64 {
	eta := etaMax
	if p.fprev > 0 && !p.damped {
		eta = etaGamma * math.Pow(f/p.fprev, etaAlpha)
		if s := etaGamma * math.Pow(p.eta, etaAlpha); s > 0.1 {
			eta = math.Max(eta, s)
		}
		eta = math.Min(eta, etaMax)
	}
	p.fprev, p.eta = f, eta
	return eta
}

// norm2 returns ‖x‖₂, scaled by the largest entry so that the squares
// neither underflow nor overflow (as LAPACK's dnrm2 does).
func norm2(x []float64) float64 {
	m := 0.0
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	if m == 0 || math.IsInf(m, 0) || math.IsNaN(m) {
		return m
	}
	s := 0.0
	for _, v := range x {
		v /= m
		s += v * v
	}
	return m * math.Sqrt(s)
}

// startNewton begins a new sequence of forcing terms.
func (p *pcgSolver) startNewton() { p.fprev = 0 }

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
