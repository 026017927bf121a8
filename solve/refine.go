// refine.go: iterative refinement of a factorised solve, with residuals and the solution in double-double, and the certification of each part's values

package solve

import (
	"math"

	"nodal/circuit"
)

// refine solves A·x = b by x ← A⁻¹b followed by one step of iterative
// refinement, x ← x + A⁻¹(b − A·x) (Wilkinson's classical scheme, from
// memory; Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed.,
// 2002, ch. 12). x holds b on entry. It serves the Cholesky factorisation
// that PCG falls back to within one solve; the model's solves use
// refineDD.
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

// Refinement limits.
const (
	// maxRefine caps the refinement steps of one linear solve.
	maxRefine = 12
	// certTol is the relative error of a part's voltage (and so of the
	// current of a resistive part) that a solve certifies.
	certTol = 1e-10
	// certFloor is the error, relative to the largest net voltage (or the
	// largest current of a resistive part), below which a value counts
	// as certified whatever its own size: far below the 1e-13 of the
	// largest under which the report shows a value as 0.
	certFloor = 1e-15
)

// eachCheck calls f for every voltage the certification judges: between
// the terminals (a, oa) and (b, ob) (see model.conductance) of a part,
// through conductance g (0 where the current does not follow from the
// voltage by a conductance). Ideal shorts and eliminated sources fix their
// voltage exactly and are left out.
func (m *model) eachCheck(f func(part int32, a int32, oa float64, b int32, ob float64, g float64)) {
	d := m.d
	for i := range d.Parts {
		p := &d.Parts[i]
		a, oa := m.node[p.Pins[0]], m.off[p.Pins[0]]
		b, ob := m.node[p.Pins[1]], m.off[p.Pins[1]]
		switch dc := p.DC(); dc.Model {
		case circuit.Conductance:
			f(int32(i), a, oa, b, ob, 1/dc.R)
		case circuit.Open, circuit.CurrentFlow:
			f(int32(i), a, oa, b, ob, 0)
		case circuit.Junction:
			if k := m.branch[i]; k >= 0 {
				f(int32(i), a, oa, k, 0, 1/dc.R)
				f(int32(i), k, 0, b, ob, 0)
			} else {
				f(int32(i), a, oa, b, ob, 0)
			}
		}
	}
}

// refineDD solves the assembled system into x + xlo, the solution kept in
// double-double: x ← A⁻¹b, then x ← x + A⁻¹(b − A·x) with the residual
// evaluated in double-double from the stamps (system.residual) until every
// part's voltage and current are certified (see certify). Residuals in
// extended precision with a working-precision factorisation converge to
// full accuracy when the factorisation's error is small enough, κ·u ≲ 1
// (Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., 2002,
// §12.1); keeping the solution in double-double as well makes the
// accuracy componentwise, down to the small voltage across a milliohm
// between teraohms (Demmel, Hida, Kahan, Li, Mukherjee & Riedy, "Error
// bounds from extra-precise iterative refinement", ACM Trans. Math.
// Softw. 32(2), 2006). When the steps stop shrinking, a system of at most
// ddDenseMax unknowns is factorised again in double-double (ddLU) and the
// refinement continues with it; otherwise the parts not certified are
// recorded in m.uncertified.
//
// raw is nil when the float64 factorisation failed and lu, its
// double-double replacement, solves from the start.
func (m *model) refineDD(raw func([]float64), lu *ddLU, x, xlo []float64) {
	s := m.sys
	n := s.n
	m.uncertified = nil
	if n == 0 {
		return
	}
	var bd []dd
	if lu != nil {
		bd = make([]dd, n)
		solveDD(lu, s, bd, x, xlo)
	} else {
		copy(x, s.rhs)
		raw(x)
		clear(xlo)
	}
	d, dlo := make([]float64, n), make([]float64, n)
	solveCorr := func() {
		if lu == nil {
			raw(d)
			clear(dlo)
			return
		}
		for i := range bd {
			bd[i] = dd{d[i], 0}
		}
		// The residual rounded to float64 keeps 16 digits of itself,
		// which is what the correction needs; its solve, and the
		// correction itself, are in double-double.
		lu.solve(bd)
		for i, v := range bd {
			d[i], dlo[i] = v.hi, v.lo
		}
	}
	// A correction estimates the error of the iterate it corrects only
	// where the steps contract; a poor factorisation makes small steps
	// that shrink slowly. So a solve is certified when a step is within
	// the allowance and at most half the one before it (the contraction
	// test of Demmel et al. 2006, with their threshold 0.5): the error
	// left is then at most the step itself.
	prev := math.Inf(1)
	for step := 0; ; step++ {
		m.refineSteps++
		s.residual(d, x, xlo)
		solveCorr()
		size := m.certify(d, x, xlo)
		contracting := size <= 0.5*prev
		if size <= 1 && contracting {
			addDD(x, xlo, d, dlo)
			return
		}
		if size < prev || step == 0 {
			addDD(x, xlo, d, dlo)
		}
		stalled := !contracting && step > 0 || step >= maxRefine
		prev = math.Min(prev, size)
		if !stalled {
			continue
		}
		if lu == nil && n <= ddDenseMax {
			if f, ok := factorDD(s); ok {
				// Start again from the double-double solve of b: the
				// stalled iterate's error can be so large that the
				// float64 rounding of its residual, spread over every
				// net, would swamp a small voltage for the next step too.
				lu, bd = f, make([]dd, n)
				solveDD(lu, s, bd, x, xlo)
				prev, step = math.Inf(1), -1
				continue
			}
		}
		// Not certified. Where the steps do not contract they do not
		// estimate the error either (a correction that looks small
		// across a part may hide a large error there), so no part's
		// values are certified.
		m.uncertified = make([]bool, len(m.d.Parts))
		for i := range m.uncertified {
			m.uncertified[i] = true
		}
		return
	}
}

// solveDD sets x + xlo to A⁻¹b, b the right side in double-double, by the
// double-double factorisation lu; bd is its workspace.
func solveDD(lu *ddLU, s *system, bd []dd, x, xlo []float64) {
	for i := range bd {
		bd[i] = dd{s.rhs[i], s.rhsLo[i]}
	}
	lu.solve(bd)
	for i, v := range bd {
		x[i], xlo[i] = v.hi, v.lo
	}
}

// addDD adds d + dlo to x + xlo in double-double.
func addDD(x, xlo, d, dlo []float64) {
	for i, v := range d {
		s := dd{x[i], xlo[i]}.add(dd{v, dlo[i]})
		x[i], xlo[i] = s.hi, s.lo
	}
}

// certify judges the correction d, an estimate of the error of x + xlo
// (Higham 2002, §12.1: the next correction estimates the current error),
// against every check: the voltage error |d_a − d_b| must be within
// certTol of the voltage, and for a resistive part within certTol of its
// current over g, or below certFloor of the design's largest voltage or
// current. It returns the largest ratio of error to allowance (≤ 1: all
// within it).
func (m *model) certify(d, x, xlo []float64) float64 {
	volt := func(k int32, o float64) dd {
		if k < 0 {
			return dd{m.lambda * o, 0}
		}
		return dd{x[k], xlo[k]}.add(dd{m.lambda * o, 0})
	}
	corr := func(k int32) float64 {
		if k < 0 {
			return 0
		}
		return d[k]
	}
	vmax, imax := 0.0, 0.0
	for _, v := range x[:m.nNodes] {
		vmax = math.Max(vmax, math.Abs(v))
	}
	for i := range m.off {
		vmax = math.Max(vmax, math.Abs(m.lambda*m.off[i]))
	}
	m.eachCheck(func(_ int32, a int32, oa float64, b int32, ob float64, g float64) {
		if g > 0 {
			imax = math.Max(imax, g*volt(a, oa).sub(volt(b, ob)).abs())
		}
	})
	for k := m.nNodes; k < m.n; k++ {
		imax = math.Max(imax, math.Abs(x[k]))
	}
	// A current source's current is one of the design's currents too,
	// though no conductance carries it: a source feeding a contracted
	// voltage source directly would otherwise leave imax at the rounding
	// noise of currents that are 0, and the floor with it, so that
	// whether the solve is certified would hang on whether that noise is
	// exactly 0 — on the order of the statements.
	imax = math.Max(imax, math.Abs(m.lambda)*m.sourceI)
	worst := 0.0
	judge := func(err, allow float64) {
		if r := err / allow; !(r <= worst) {
			worst = r
			if math.IsNaN(r) {
				worst = math.Inf(1)
			}
		}
	}
	m.eachCheck(func(_ int32, a int32, oa float64, b int32, ob float64, g float64) {
		v := volt(a, oa).sub(volt(b, ob)).abs()
		e := math.Abs(corr(a) - corr(b))
		allow := certTol*v + certFloor*vmax
		if g > 0 {
			allow = math.Min(allow, certTol*v+certFloor*imax/g)
		}
		judge(e, allow+math.SmallestNonzeroFloat64)
	})
	// Branch currents of the general formulation.
	for _, k := range m.branch {
		if k >= int32(m.nNodes) {
			judge(math.Abs(d[k]), certTol*math.Abs(x[k])+certFloor*imax+math.SmallestNonzeroFloat64)
		}
	}
	return worst
}
