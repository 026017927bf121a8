// refine.go: iterative refinement of a factorised solve.

package solve

// refine solves A·x = b by x ← A⁻¹b followed by one step of iterative
// refinement, x ← x + A⁻¹(b − A·x) (Wilkinson's classical scheme, from
// memory; Higham, Accuracy and Stability of Numerical Algorithms, 2002,
// ch. 12). x holds b on entry.
func refine(x []float64, solve func([]float64), mul func(y, x []float64)) {
	b := append([]float64(nil), x...)
	solve(x)
	r := make([]float64, len(x))
	mul(r, x)
	for i := range r {
		r[i] = b[i] - r[i]
	}
	solve(r)
	for i := range x {
		x[i] += r[i]
	}
}
