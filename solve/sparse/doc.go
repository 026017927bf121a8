// doc.go: package documentation for sparse direct solvers of A·x = b

// Package sparse provides the sparse matrix storage and direct solvers used
// by nodal's DC operating-point analysis (modified nodal analysis).
//
// The package is written to be filled in section by section; see the
// sections below.
package sparse
