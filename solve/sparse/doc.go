// doc.go: package documentation — sparse direct (and iterative) solution of A·x = b

// Package sparse provides the sparse matrix storage and linear solvers used
// by nodal's DC operating-point analysis, where modified nodal analysis
// (MNA) produces one equation per circuit node plus one per branch whose
// current is an unknown (voltage sources, shorts).
//
// # Storage
//
// Stamps are collected in a Triplet (row i, column j, value x; duplicates
// allowed) and compressed to a CSC matrix: compressed sparse column form
// with N rows, M columns, column pointers P (len M+1), row indices I and
// values X. Indices are int32 to halve the memory of the index arrays on
// designs with millions of unknowns; a matrix may therefore hold at most
// 2³¹−1 entries and so may each factor. Compression sums duplicates and
// sorts rows within columns in O(n+nnz) by two bucket passes.
//
// Triplet.CompressMap also returns the map from each triplet slot to its CSC
// slot. A Newton iteration re-stamps the same devices in the same order with
// new values and refreshes the matrix with CSC.SetValues in O(nnz), with no
// sorting, then refactors (see LU.Refactor and Cholesky.Factorize).
// CSC offers MulVec (y ← A·x), MulVecTrans (y ← Aᵀ·x), T (transpose),
// Norm1 and At.
//
// # Orderings
//
// AMD computes a fill-reducing symmetric ordering of the pattern of A + Aᵀ
// by the approximate minimum degree method (Amestoy, Davis & Duff 1996) on a
// quotient graph, with element and aggressive absorption, mass elimination,
// supervariables and deferral of dense rows. Its cost is near-linear in
// nnz(A) on circuit and grid matrices; see BenchmarkAMDGrid. No postorder
// of the assembly tree is applied.
//
// # LU
//
// LU factors a square, possibly unsymmetric matrix as P·A·Q = L·U. Analyze
// chooses the column order Q by AMD on A + Aᵀ; Factorize is the left-looking
// method of Gilbert & Peierls (1988): each column is a sparse triangular
// solve whose nonzero pattern is found by a depth-first search in the graph
// of L, so the work is proportional to the arithmetic; the search runs on
// a symmetrically pruned graph of L (Eisenstat & Liu 1992). Pivots are
// chosen by threshold partial pivoting: the diagonal is kept when
// |a_jj| ≥ τ·max_i|a_ij| (τ = LU.Tol, default 0.1), which keeps the
// symmetric structure of MNA matrices and the benefit of the symmetric
// ordering; otherwise the largest candidate is taken (branch rows of voltage
// sources, whose diagonal is zero, need this).
//
// Refactor recomputes the factors for new values on the same pattern with
// the same pivot order and no allocation or graph search. If a kept pivot
// fails the threshold test it returns *PivotTooSmall and the caller calls
// Factorize. Solve and SolveTranspose overwrite b with A⁻¹b and A⁻ᵀb.
// Cond1Est estimates κ₁(A) = ‖A‖₁‖A⁻¹‖₁ by Hager's method with Higham's
// refinements, using a handful of solves.
//
// # Cholesky
//
// After voltage sources and shorts are eliminated, the nodal matrix of a
// resistor network with a path to ground from every node is symmetric
// positive definite. Cholesky factors P·A·Pᵀ = L·Lᵀ with P from AMD. Analyze
// computes the ordering, the elimination tree (Liu 1986) and the exact
// column counts of L, postorders the tree (same fill, contiguous
// supernodes), finds the supernodes — runs of columns sharing one row
// structure — and allocates L once as dense blocks. Factorize is the
// left-looking supernodal method (Ng & Peyton 1993): block updates from
// descendant supernodes, large ones through gonum's Dgemm, then a blocked
// dense factorisation of each panel. It can be repeated for new values on
// the analysed pattern. Only the upper triangle of A is read. Solve
// overwrites b with A⁻¹b; Cond1Est estimates κ₁(A); L returns the factor in
// CSC form.
//
// # Iterative solution
//
// For very large SPD systems PCG runs the preconditioned conjugate gradient
// method; NewAMG builds a smoothed-aggregation algebraic multigrid
// preconditioner (Vaněk, Mandel & Brezina 1996) whose V-cycle is used as
// the preconditioner; AMGOptions.Unsmoothed builds plain aggregation
// instead, and AMGOptions.MaxComplexity bounds the hierarchy level by
// level. Levels large enough are put in colour order (a greedy colouring
// of their graph), so that the Gauss–Seidel sweeps are multicolour: each
// colour's rows are updated on both cores, with the same result on any
// number of cores. AMG.Refresh recomputes a plain-aggregation hierarchy's coarse
// matrices for new values of A on the same pattern, keeping its
// aggregates. Jacobi and SymGaussSeidel are the point preconditioners.
// Cholesky.AnalyzeBudget stops the symbolic analysis once nnz(L) passes a
// budget.
//
// # Errors
//
// Programmer misuse — dimension mismatches, non-square input, an ordering
// that is not a permutation, Refactor with a different pattern, Solve
// before a successful factorisation — panics. Trouble caused by the data is
// returned as an error value:
//
//   - *Singular{Col}: LU found no usable pivot for unknown Col of the
//     original matrix (structurally empty, or every candidate at most
//     LU.SingularTol times the column's largest entry). For a circuit this
//     names an unknown that is undetermined: a floating node, a loop of
//     voltage sources, a cut-set of current sources.
//   - *NotPositiveDefinite{Col}: Cholesky met a pivot d ≤ Cholesky.Tol·a_kk
//     at unknown Col (indefinite matrix, or a floating sub-network).
//   - *PivotTooSmall{Col, Pivot, Max}: LU.Refactor's kept pivot failed the
//     threshold test; factorise again.
//   - *NotConverged{Iter, RelResidual}: PCG stopped at its iteration limit.
//   - *FillExceeded{NnzL, Budget, Rows, N}: Cholesky.AnalyzeBudget counted
//     more than Budget entries of L.
//   - *ComplexityExceeded{Level, Max}: NewAMG's hierarchy passed
//     AMGOptions.MaxComplexity.
//
// No factorisation returns NaN results for a matrix it accepted: every
// accepted pivot is finite and non-zero.
//
// # References
//
//   - T. A. Davis, Direct Methods for Sparse Linear Systems, SIAM, 2006.
//   - P. R. Amestoy, T. A. Davis, I. S. Duff, "An approximate minimum degree
//     ordering algorithm", SIAM J. Matrix Anal. Appl. 17(4), 1996.
//   - J. R. Gilbert, T. Peierls, "Sparse partial pivoting in time
//     proportional to arithmetic operations", SIAM J. Sci. Stat. Comput.
//     9(5), 1988.
//   - S. C. Eisenstat, J. W. H. Liu, "Exploiting structural symmetry in
//     unsymmetric sparse symbolic factorization", SIAM J. Matrix Anal. Appl.
//     13(1), 1992.
//   - J. W. H. Liu, "A compact row storage scheme for Cholesky factors using
//     elimination trees", ACM Trans. Math. Softw. 12(2), 1986.
//   - J. W. H. Liu, "The role of elimination trees in sparse factorization",
//     SIAM J. Matrix Anal. Appl. 11(1), 1990.
//   - E. G. Ng, B. W. Peyton, "Block sparse Cholesky algorithms on advanced
//     uniprocessor computers", SIAM J. Sci. Comput. 14(5), 1993.
//   - F. G. Gustavson, "Two fast algorithms for sparse matrices:
//     multiplication and permuted transposition", ACM Trans. Math. Softw.
//     4(3), 1978.
//   - W. W. Hager, "Condition estimates", SIAM J. Sci. Stat. Comput. 5(2),
//     1984.
//   - N. J. Higham, "FORTRAN codes for estimating the one-norm of a real or
//     complex matrix, with applications to condition estimation", ACM
//     Trans. Math. Softw. 14(4), 1988.
//   - P. Vaněk, J. Mandel, M. Brezina, "Algebraic multigrid by smoothed
//     aggregation for second and fourth order elliptic problems", Computing
//     56, 1996.
//   - M. F. Adams, M. Brezina, J. Hu, R. Tuminaro, "Parallel multigrid
//     smoothing: polynomial versus Gauss–Seidel", J. Comput. Phys. 188,
//     2003.
//   - Y. Saad, Iterative Methods for Sparse Linear Systems, 2nd ed., SIAM,
//     2003.
//   - M. R. Hestenes, E. Stiefel, "Methods of conjugate gradients for
//     solving linear systems", J. Res. Nat. Bur. Standards 49, 1952.
package sparse
