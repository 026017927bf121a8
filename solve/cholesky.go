// cholesky.go: the supernodal sparse Cholesky solver for the eliminated, symmetric positive-definite equations.

package solve

import (
	"errors"
	"fmt"

	"nodal/solve/sparse"
)

// cholSolver is the supernodal sparse Cholesky factorisation: analysed once,
// refactored numerically at every Newton iteration.
type cholSolver struct {
	m        sparseMatrix
	ch       sparse.Cholesky
	analysed bool
}

// fillBudget is the most entries the Cholesky factor of a matrix with nnz
// entries may hold: 40 times the matrix (grid-like networks under AMD stay
// near 10), at least 4 M and at most 100 M (1.2 GB of factor); common
// practice for keeping a direct solve within memory, not a published rule.
func fillBudget(nnz int) int {
	return min(max(40*nnz, 4_000_000), 100_000_000)
}

func (c *cholSolver) kind() LinearSolver { return SparseCholesky }

func (c *cholSolver) direct() (func([]float64), bool) { return c.ch.Solve, true }

func (c *cholSolver) factor(s *system) error {
	c.m.update(s)
	if s.n == 0 {
		return nil
	}
	if !c.analysed {
		if err := c.analyse(); err != nil {
			return err
		}
	}
	err := c.ch.Factorize(c.m.a)
	var np *sparse.NotPositiveDefinite
	if errors.As(err, &np) {
		return &singularError{col: np.Col}
	}
	return err
}

// analyse makes the symbolic analysis of the compressed matrix, refusing it
// with TooLarge as soon as the column counts pass fillBudget: before the
// factor's structure is allocated or any numeric work is done.
func (c *cholSolver) analyse() error {
	c.ch.Tol = pivotTol
	na := c.m.a.Nnz()
	err := c.ch.AnalyzeBudget(c.m.a, fillBudget(na))
	var fe *sparse.FillExceeded
	if errors.As(err, &fe) {
		return &Error{Kind: TooLarge, Msg: fmt.Sprintf("the Cholesky factor of these %d equations would hold more than %d entries, %.0f times the matrix (%d counted after %d of %d rows): this design's network has no small separators (it looks random rather than laid out), which is more fill than the direct solver takes on", c.m.a.N, fe.Budget, float64(fe.Budget)/float64(na), fe.NnzL, fe.Rows, fe.N)}
	}
	if err != nil {
		return err
	}
	c.analysed = true
	return nil
}

// probe compresses the assembled system s and analyses it. A nil error
// means the solver is ready to factor s's pattern; TooLarge means its
// factor would pass fillBudget.
func (c *cholSolver) probe(s *system) error {
	c.m.update(s)
	if s.n == 0 {
		return nil
	}
	return c.analyse()
}

func (c *cholSolver) solve(x []float64) error {
	if len(x) > 0 {
		refine(x, c.ch.Solve, c.m.mul)
	}
	return nil
}

func (c *cholSolver) cond() float64 { return c.m.cond(c.ch.Solve) }
