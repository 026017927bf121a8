// errors.go: error values returned when the data (not the caller) makes A⁻¹ unavailable

package sparse

import "fmt"

// Singular reports a matrix that is structurally or numerically singular.
// Col is the column of the original matrix (the unknown) for which no
// acceptable pivot could be found.
type Singular struct {
	Col int
}

func (e *Singular) Error() string {
	return fmt.Sprintf("sparse: matrix is singular: no usable pivot for unknown %d", e.Col)
}

// NotPositiveDefinite reports that a Cholesky factorisation met a
// non-positive pivot. Col is the column of the original matrix at which the
// leading principal submatrix (in the elimination order) stopped being
// positive definite.
type NotPositiveDefinite struct {
	Col int
}

func (e *NotPositiveDefinite) Error() string {
	return fmt.Sprintf("sparse: matrix is not positive definite at unknown %d", e.Col)
}

// PivotTooSmall is returned by LU.Refactor when, with the new values, the
// pivot kept from the original factorisation fails the threshold test
// |u_kk| ≥ τ·max|l_ik|. The caller should call Factorize again, which is free
// to choose a new pivot sequence. Col is the column of the original matrix.
type PivotTooSmall struct {
	Col   int
	Pivot float64 // the offending pivot value
	Max   float64 // largest magnitude among the candidate entries of the column
}

func (e *PivotTooSmall) Error() string {
	return fmt.Sprintf("sparse: refactor pivot %g for unknown %d is below threshold (column max %g); factorise again", e.Pivot, e.Col, e.Max)
}

// NotConverged is returned by PCG when the iteration limit is reached before
// the requested relative residual.
type NotConverged struct {
	Iter        int
	RelResidual float64
}

func (e *NotConverged) Error() string {
	return fmt.Sprintf("sparse: PCG did not converge: relative residual %g after %d iterations", e.RelResidual, e.Iter)
}

// FillExceeded is returned by Cholesky.AnalyzeBudget when the column counts
// of L pass the budget. NnzL is the count reached when the analysis
// stopped (a lower bound on nnz(L)), Rows how many rows of L it had
// counted by then, of N.
type FillExceeded struct {
	NnzL, Budget, Rows, N int
}

func (e *FillExceeded) Error() string {
	return fmt.Sprintf("sparse: Cholesky factor would hold more than %d entries (%d counted after %d of %d rows)", e.Budget, e.NnzL, e.Rows, e.N)
}

// ComplexityExceeded is returned by NewAMG when the operator complexity
// Σ nnz(A_l)/nnz(A_0) of the levels built so far, or of the next Galerkin
// product, passes AMGOptions.MaxComplexity. Level is the level whose
// construction stopped (1 = the first coarse level).
type ComplexityExceeded struct {
	Level int
	Max   float64
}

func (e *ComplexityExceeded) Error() string {
	return fmt.Sprintf("sparse: AMG operator complexity passes %g while building level %d", e.Max, e.Level)
}
