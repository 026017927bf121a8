// linear.go: the linear solvers' common interface, their names and the automatic choice's crossovers.

package solve

// LinearSolver names a method for the linear systems of a solve.
type LinearSolver uint8

const (
	// AutoSolver chooses by size and structure (see the package doc).
	AutoSolver LinearSolver = iota
	// DenseLU is gonum's dense LU with partial pivoting, the reference.
	DenseLU
	// SparseCholesky is the supernodal sparse Cholesky factorisation; it
	// needs the symmetric positive-definite equations of the eliminated
	// formulation.
	SparseCholesky
	// PCGAMG is conjugate gradients preconditioned by smoothed-aggregation
	// algebraic multigrid; it also needs the eliminated formulation.
	PCGAMG
	// SparseLU is the general sparse LU with threshold partial pivoting.
	SparseLU
	// PCGJacobi is conjugate gradients preconditioned by the diagonal
	// (Jacobi): the last iterative fallback, for when neither multigrid
	// hierarchy stays within maxComplexity. It needs the eliminated
	// formulation.
	PCGJacobi
	// PCGPlainAMG is conjugate gradients preconditioned by plain
	// (unsmoothed) aggregation multigrid, whose coarse matrices cannot
	// fill in: what PCGAMG falls back to when the smoothed coarsening
	// fills in past maxComplexity (networks without small separators), and
	// so also what a sparse Cholesky chosen automatically becomes when its
	// factor would pass fillBudget. It needs the eliminated formulation.
	PCGPlainAMG
)

func (k LinearSolver) String() string {
	switch k {
	case DenseLU:
		return "dense LU"
	case SparseCholesky:
		return "sparse Cholesky"
	case PCGAMG:
		return "PCG+AMG"
	case SparseLU:
		return "sparse LU"
	case PCGJacobi:
		return "PCG+Jacobi"
	case PCGPlainAMG:
		return "PCG+plain-aggregation AMG"
	}
	return "auto"
}

// Crossovers of the automatic choice, measured by BenchmarkSolverCrossover
// (solve/bench_test.go) on k×k resistor meshes on a shared two-core
// machine (whole Solve, medians of 3, load average about 2.5):
//
//   - dense LU and sparse Cholesky cost the same at 36 unknowns (80 µs);
//     at 64 Cholesky is 1.1× faster, at 144 2.9×, at 900 15×.
//   - PCG+AMG (which makes no condition estimate) beats Cholesky with its
//     estimate at every size past the dense range: 1.4× at 10 000
//     unknowns, 1.6× at 22 500, 2.6× at 40 000, 2.2× at 90 000. Cholesky is
//     kept up to 20 000 unknowns, where it costs at most about 1.5× as much,
//     for the condition estimate that only it gives.
const (
	// AutoDenseMax is the largest system the automatic choice gives the
	// dense LU.
	AutoDenseMax = 50
	// AutoCholeskyMax is the largest symmetric positive-definite system the
	// automatic choice gives the sparse Cholesky factorisation; larger ones
	// go to PCG+AMG.
	AutoCholeskyMax = 20_000
)

// linearSolver factorises (or otherwise prepares) a system and solves with
// it. The first factor call analyses the pattern; later calls refactor
// numerically on the same pattern.
type linearSolver interface {
	factor(s *system) error
	// solve overwrites x, holding the right-hand side, with the solution.
	solve(x []float64) error
	// cond estimates the 1-norm condition number of the equilibrated last
	// factorised matrix, or returns 0 when the method makes no estimate.
	cond() float64
	kind() LinearSolver
	// direct returns the solve with the current factors, x ← A⁻¹x without
	// refinement, for a factorising solver; ok is false for an iterative
	// one.
	direct() (solve func([]float64), ok bool)
}

// singularError names the unknown (column) where factorisation broke down.
type singularError struct{ col int }

func (e *singularError) Error() string { return "singular matrix" }

// pivotTol is the relative pivot size below which the sparse
// factorisations call a system singular: 4ε, so a pivot keeps at least a
// couple of bits above the rounding of its own diagonal. The topology rules
// have already excluded the structurally singular designs (floating
// networks), so a smaller pivot is a genuinely ill-conditioned but solvable
// system, which the ill-conditioned rule should name rather than the solve
// refuse (common practice; the sparse package's default of 1000ε is meant
// for matrices nothing else has checked).
const pivotTol = 4 * 2.220446049250313e-16
