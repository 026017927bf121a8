// lu.go: the general sparse LU solver for the indefinite branch-current equations.

package solve

import (
	"errors"

	"nodal/solve/sparse"
)

// luSolver is the general sparse LU: the ordering is computed once, the
// first factorisation chooses the pivots and later ones reuse them
// (Refactor) until a pivot fails its threshold test.
type luSolver struct {
	m        sparseMatrix
	lu       sparse.LU
	factored bool
}

func (l *luSolver) kind() LinearSolver { return SparseLU }

func (l *luSolver) direct() (func([]float64), bool) { return l.lu.Solve, true }

func (l *luSolver) factor(s *system) error {
	l.m.update(s)
	if s.n == 0 {
		return nil
	}
	var err error
	if l.factored {
		var pt *sparse.PivotTooSmall
		if err = l.lu.Refactor(l.m.a); errors.As(err, &pt) {
			err = l.lu.Factorize(l.m.a)
		}
	} else {
		l.lu.SingularTol = pivotTol
		l.lu.Analyze(l.m.a)
		err = l.lu.Factorize(l.m.a)
	}
	l.factored = err == nil
	var sg *sparse.Singular
	if errors.As(err, &sg) {
		return &singularError{col: sg.Col}
	}
	return err
}

func (l *luSolver) solve(x []float64) error {
	if len(x) > 0 {
		refine(x, l.lu.Solve, l.m.mul)
	}
	return nil
}

func (l *luSolver) cond() float64 { return l.m.cond(l.lu.Solve) }
