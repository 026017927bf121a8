// amg.go: z ← M⁻¹r, one V-cycle of smoothed-aggregation algebraic multigrid for SPD A

package sparse

import (
	"fmt"
	"math"
)

// AMGOptions tunes NewAMG. The zero value selects the defaults.
type AMGOptions struct {
	// Eps is the strength-of-connection threshold on the finest level; it
	// is halved on each coarser level, as in Vaněk, Mandel & Brezina (1996,
	// §5, from memory). Default 0.08. With Unsmoothed it is divided by 3
	// on each coarser level instead, and its default is plainEps.
	Eps float64
	// CoarseSize is the size at or below which a level is solved directly
	// by Cholesky. Default 2000.
	CoarseSize int
	// MaxLevels bounds the depth of the hierarchy. Default 25.
	MaxLevels int
	// MaxComplexity, when positive, bounds the operator complexity (see
	// OperatorComplexity). It is checked level by level while the
	// hierarchy is built, and each Galerkin product is capped at what the
	// budget has left, so a coarsening that fills in (graphs without small
	// separators) stops at the first level that passes it, with
	// *ComplexityExceeded, before the product is ever held in full.
	MaxComplexity float64
	// Unsmoothed uses the tentative prolongator P̂ itself, without the
	// Jacobi smoothing step: plain aggregation (Braess, "Towards algebraic
	// multigrid for elliptic problems of second order", Computing 55,
	// 1995, from memory; Notay, "An aggregation-based algebraic multigrid
	// method", ETNA 37, 2010). Each coarse matrix P̂ᵀAP̂ is then the
	// quotient graph of the finer one and holds at most as many entries,
	// so the hierarchy cannot fill in whatever the graph; a V-cycle with
	// it is a weaker preconditioner than the smoothed one, but it still
	// contracts clusters of strongly coupled unknowns, which diagonal
	// scaling alone cannot.
	Unsmoothed bool
}

type amgLevel struct {
	a       *CSC
	diag    []float64
	p, pt   *CSC // prolongator n×nc and its transpose
	x, b, r []float64
	// galerkin maps each entry of a to the entry of the next level's
	// matrix it is summed into (plain aggregation only; see Refresh).
	galerkin []int32
	// dpos holds the position of each column's diagonal entry when every
	// column of a lists its rows in ascending order (nil otherwise), and
	// invd the reciprocals of the diagonal: see smooth.go.
	dpos []int32
	invd []float64
	// start, when not nil, says the level is in colour order: colour c
	// holds the unknowns start[c] … start[c+1]−1, and its sweeps are
	// multicolour Gauss–Seidel on both cores (see colour.go, smooth.go).
	start []int32
}

// AMG is a smoothed-aggregation algebraic multigrid preconditioner for a
// symmetric positive-definite matrix (P. Vaněk, J. Mandel, M. Brezina,
// "Algebraic multigrid by smoothed aggregation for second and fourth order
// elliptic problems", Computing 56, 1996). Each level aggregates strongly
// coupled unknowns (see aggregate), takes the piecewise-constant tentative
// prolongator P̂ (the constants are the near-null space of a nodal
// conductance matrix), smooths it by one damped Jacobi step
// P = (I − ω·D⁻¹A)·P̂ with ω = 4/(3ρ(D⁻¹A)) and forms the Galerkin coarse
// matrix Pᵀ·A·P. ρ(D⁻¹A) is bounded above by Gershgorin's theorem, which can
// only make ω smaller (safer). The V-cycle uses one forward Gauss–Seidel
// sweep before and one backward sweep after the coarse correction, so the
// preconditioner is symmetric, and Cholesky on the coarsest level. A large
// level is put in colour order (colour.go), where the sweeps are
// multicolour Gauss–Seidel with each colour's rows shared between the
// cores (smooth.go); its aggregates are the same as in its own order.
type AMG struct {
	levels []amgLevel
	coarse Cholesky
	plain  bool
	// perm, when not nil, is the colour order of the finest level, whose
	// matrix is then the permuted copy Q·A·Qᵀ (Q = I(perm, :)): r is
	// gathered into it and z scattered back. For Refresh (plain
	// hierarchies only), fine is A, kept by reference, and dst maps each
	// of its entries to the copy's.
	perm, dst []int32
	fine      *CSC
}

// colourNnz is the fewest entries of a level that may be put in colour
// order, so that its sweeps can share the cores (see sharedOrder); smaller
// levels are swept in their own order on one core, and their colour blocks
// would be too small to split (see splitNnz). The choice depends on the
// matrix alone, never on the number of cores, so the preconditioner, and
// every result, is the same on any machine.
const colourNnz = 1 << 17

// fillSample is about how many columns of a smoothed Galerkin product are
// formed to estimate its size before it is formed in full (see
// galerkinNnzEstimate).
const fillSample = 2048

// plainEps is the default strength threshold of plain aggregation. Its
// aggregates are only contracted, never smoothed, so they must not join
// unknowns a weak coupling holds apart: a threshold well above smoothed
// aggregation's 0.08 on the finest level, divided by 3 (not 2) on each
// coarser one. On the nodal matrices of random networks (resistors over
// six decades; 100 000 and 316 000 unknowns) 0.3 and 3 took conjugate
// gradients from 69 and 90 iterations to 32 and 39 for a residual of
// 1e-10, for an operator complexity of 3.4 and 3.6 in place of 3.2 and
// 3.35: about half the work of a solve (measured; values near these did
// about as well, smaller ones worse, and larger ones passed the complexity
// that package solve accepts).
const plainEps = 0.3

// NewAMG builds the multigrid hierarchy for the symmetric positive-definite
// matrix A (both triangles stored). opt may be nil. It returns an error if a
// level has a non-positive diagonal or the coarsest matrix is not positive
// definite.
func NewAMG(a *CSC, opt *AMGOptions) (*AMG, error) {
	a.mustSquare("NewAMG")
	var o AMGOptions
	if opt != nil {
		o = *opt
	}
	shrink := 2.0
	if o.Unsmoothed {
		shrink = 3
	}
	if o.Eps == 0 {
		o.Eps = 0.08
		if o.Unsmoothed {
			o.Eps = plainEps
		}
	}
	if o.CoarseSize == 0 {
		o.CoarseSize = 2000
	}
	if o.MaxLevels == 0 {
		o.MaxLevels = 25
	}
	m := &AMG{plain: o.Unsmoothed}
	cur := a
	// start is the colour blocks of the level about to be made, and order
	// its colour order (nil: the level is not in colour order).
	var start, order []int32
	if a.N > o.CoarseSize && o.MaxLevels > 1 {
		if m.perm, start = sharedOrder(a); m.perm != nil {
			order = m.perm
			// Only a plain hierarchy is refreshed, through dst.
			var dst []int32
			cur, dst = permuted(a, m.perm, o.Unsmoothed)
			if o.Unsmoothed {
				m.fine, m.dst = a, dst
			}
		}
	}
	eps := o.Eps
	// budget is how many entries all levels together may hold (−1: any).
	budget, total := -1, 0
	if o.MaxComplexity > 0 {
		budget = int(o.MaxComplexity * float64(max(a.Nnz(), 1)))
	}
	for {
		n := cur.N
		lev := amgLevel{a: cur, diag: make([]float64, n), start: start,
			x: make([]float64, n), b: make([]float64, n), r: make([]float64, n)}
		start = nil
		for j := 0; j < n; j++ {
			for p := cur.P[j]; p < cur.P[j+1]; p++ {
				if int(cur.I[p]) == j {
					lev.diag[j] += cur.X[p]
				}
			}
			if !(lev.diag[j] > 0) {
				return nil, &NotPositiveDefinite{Col: j}
			}
		}
		lev.setDiagonal()
		total += cur.Nnz()
		if budget >= 0 && total > budget {
			return nil, &ComplexityExceeded{Level: len(m.levels), Max: o.MaxComplexity}
		}
		if n <= o.CoarseSize || len(m.levels)+1 >= o.MaxLevels {
			m.levels = append(m.levels, lev)
			break
		}
		agg, nagg := aggregate(cur, lev.diag, eps, order)
		if nagg >= n-n/20 || nagg == 0 {
			// Coarsening stalled; solve this level directly.
			m.levels = append(m.levels, lev)
			break
		}
		if o.Unsmoothed {
			lev.p = tentativeProlongator(n, agg, nagg)
		} else {
			lev.p = smoothedProlongator(cur, lev.diag, agg, nagg)
		}
		lev.pt = lev.p.T()
		// The coarse matrix may hold what the budget has left; the
		// intermediate A·P is capped at the whole budget (common practice,
		// not a published rule).
		left, apLimit := -1, -1
		if budget >= 0 {
			left, apLimit = budget-total, budget
		}
		var ok bool
		if o.Unsmoothed {
			cur, ok = quotient(cur, lev.p, agg, left)
		} else {
			// A product that would hold twice what the budget has left, by
			// a sample of its columns, is refused before it is formed:
			// forming it up to the cap costs most of a set-up on graphs
			// that fill in.
			if left >= 0 && galerkinNnzEstimate(cur, lev.p, lev.pt, max(1, nagg/fillSample)) > 2*left {
				return nil, &ComplexityExceeded{Level: len(m.levels) + 1, Max: o.MaxComplexity}
			}
			var ap *CSC
			ap, ok = mulCSCLimit(cur, lev.p, apLimit)
			if ok {
				cur, ok = mulCSCLimit(lev.pt, ap, left)
			}
		}
		if !ok {
			return nil, &ComplexityExceeded{Level: len(m.levels) + 1, Max: o.MaxComplexity}
		}
		// The product lists each column's rows in the order met; its
		// transpose (the same matrix, the pattern being symmetric) lists
		// them in ascending order, which the smoother relies on. A coarse
		// level large enough to share its sweeps is put in colour order
		// instead, which sorts it too: the aggregates are renumbered, and
		// the prolongator's columns permuted, to match.
		var perm []int32
		if cur.N > o.CoarseSize && len(m.levels)+2 < o.MaxLevels {
			perm, start = sharedOrder(cur)
		}
		order = perm
		if perm != nil {
			cur, _ = permuted(cur, perm, false)
			pinv := invPerm(perm)
			for i, c := range agg {
				agg[i] = pinv[c]
			}
			if o.Unsmoothed {
				lev.p = tentativeProlongator(n, agg, nagg)
			} else {
				lev.p = columnsPermuted(lev.p, perm)
			}
			lev.pt = lev.p.T()
		} else {
			cur = cur.T()
		}
		if o.Unsmoothed {
			lev.galerkin = galerkinMap(lev.a, agg, cur)
		}
		m.levels = append(m.levels, lev)
		eps /= shrink
	}
	last := m.levels[len(m.levels)-1].a
	if budget >= 0 {
		// The coarsest factor counts against the budget too.
		if err := m.coarse.AnalyzeBudget(last, max(budget-total, 0)+last.Nnz()); err != nil {
			return nil, &ComplexityExceeded{Level: len(m.levels) - 1, Max: o.MaxComplexity}
		}
	} else {
		m.coarse.Analyze(last)
	}
	if err := m.coarse.Factorize(last); err != nil {
		return nil, fmt.Errorf("sparse: AMG coarsest level: %w", err)
	}
	return m, nil
}

// smoothedProlongator returns P = (I − ω·D⁻¹A)·P̂ where P̂(i, agg[i]) = 1.
func smoothedProlongator(a *CSC, diag []float64, agg []int32, nagg int) *CSC {
	n := a.N
	// ρ(D⁻¹A) ≤ max_i Σ_j |a_ij| / a_ii (Gershgorin, from memory).
	rho := 0.0
	for j := 0; j < n; j++ {
		s := 0.0
		for p := a.P[j]; p < a.P[j+1]; p++ {
			s += math.Abs(a.X[p])
		}
		rho = math.Max(rho, s/diag[j])
	}
	omega := 4 / (3 * rho)
	ph := tentativeProlongator(n, agg, nagg)
	// A·P̂ contains the pattern of P̂ (every a_ii ≠ 0), so P is A·P̂ scaled
	// by −ω/a_ii per row plus 1 on P̂'s entries.
	p := mulCSC(a, ph)
	for c := 0; c < nagg; c++ {
		for q := p.P[c]; q < p.P[c+1]; q++ {
			i := p.I[q]
			p.X[q] *= -omega / diag[i]
			if agg[i] == int32(c) {
				p.X[q]++
			}
		}
	}
	return p
}

// tentativeProlongator returns P̂ (n×nagg) with P̂(i, agg[i]) = 1.
func tentativeProlongator(n int, agg []int32, nagg int) *CSC {
	ph := &CSC{N: n, M: nagg, P: make([]int32, nagg+1), I: make([]int32, n), X: make([]float64, n)}
	for _, c := range agg {
		ph.P[c+1]++
	}
	for c := 0; c < nagg; c++ {
		ph.P[c+1] += ph.P[c]
	}
	next := append([]int32(nil), ph.P[:nagg]...)
	for i, c := range agg {
		ph.I[next[c]] = int32(i)
		ph.X[next[c]] = 1
		next[c]++
	}
	return ph
}

// Levels returns the number of unknowns on each level, finest first.
func (m *AMG) Levels() []int {
	s := make([]int, len(m.levels))
	for i, l := range m.levels {
		s[i] = l.a.N
	}
	return s
}

// Precondition sets z ← M⁻¹r by one V(1,1)-cycle from a zero initial guess.
func (m *AMG) Precondition(z, r []float64) {
	if len(z) != m.levels[0].a.N || len(r) != len(z) {
		panic("sparse: AMG.Precondition dimension mismatch")
	}
	if m.perm == nil {
		m.cycle(0, z, r)
		return
	}
	lev := &m.levels[0]
	for k, i := range m.perm {
		lev.b[k] = r[i]
	}
	m.cycle(0, lev.x, lev.b)
	for k, i := range m.perm {
		z[i] = lev.x[k]
	}
}

func (m *AMG) cycle(l int, x, b []float64) {
	lev := &m.levels[l]
	if l == len(m.levels)-1 {
		copy(x, b)
		m.coarse.Solve(x)
		return
	}
	if lev.dpos != nil {
		// From x = 0 the forward sweep reads only the lower triangle,
		// and leaves the residual −U·x (see smooth.go).
		lev.forwardFromZero(x, b)
		lev.upperResidual(lev.r, x)
	} else {
		clear(x)
		gaussSeidel(lev.a, lev.diag, x, b, true)
		// r ← b − A·x (A symmetric: use the gather form).
		lev.a.MulVecTrans(lev.r, x)
		for i := range lev.r {
			lev.r[i] = b[i] - lev.r[i]
		}
	}
	nx := &m.levels[l+1]
	lev.p.MulVecTrans(nx.b, lev.r) // restriction Pᵀr
	m.cycle(l+1, nx.x, nx.b)
	lev.pt.MulVecTrans(lev.r, nx.x) // prolongation P·x_c
	for i := range x {
		x[i] += lev.r[i]
	}
	if lev.dpos != nil {
		lev.backward(x, b)
	} else {
		gaussSeidel(lev.a, lev.diag, x, b, false)
	}
}

// OperatorComplexity returns Σ nnz(A_l) / nnz(A_0) over the levels: the
// storage and work of one V-cycle relative to one product with A. Smoothed
// aggregation keeps it near 1.5 on grid-like matrices; on graphs without
// geometry (random networks) the Galerkin products fill in and it grows.
func (m *AMG) OperatorComplexity() float64 {
	s := 0.0
	for _, l := range m.levels {
		s += float64(l.a.Nnz())
	}
	return s / float64(max(m.levels[0].a.Nnz(), 1))
}
