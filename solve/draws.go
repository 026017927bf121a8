// draws.go: what each regulator and converter draws from its input rail,
// settled to a fixed point: the plain step j ← g(j), then Newton's method
// on g(j) − j with its Jacobian by differences (the textbook method for a
// system of equations; any numerical analysis text).

package solve

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"nodal/circuit"
)

// solveAt solves the stand-ins with the draws j and returns the solution
// and the draws it implies (next).
func (s *multiSolve) solveAt(o *Options, j []float64, iters *int) (*Result, []float64, error) {
	for k := range s.sup {
		s.sup[k].draw = j[k]
	}
	rs, err := solveTwoPin(s.standIns(), o)
	if rs != nil {
		*iters += rs.Iterations
	}
	if err != nil {
		return nil, nil, s.mapError(err)
	}
	return rs, s.next(rs), nil
}

// settleDraws finds the draws that reproduce themselves: j = g(j), where
// g(j) is what the solution with the draws j implies. It takes the plain
// step j ← g(j) twice, which settles a power tree (no output feeds its own
// input: g does not depend on j then, and the second solve confirms the
// first), and then Newton's method on g(j) − j with its Jacobian by
// differences, one more solve per supply: exact in one step where the
// circuit is linear (g affine), as a regulator with its common pin lifted
// on a resistor is, whose plain step only shrinks the error by the share
// of its output current that returns through that resistor. A singular
// Jacobian (a supply whose draw feeds itself one for one, which no
// operating point balances) or maxDrawSolves solves end it unsettled.
func (s *multiSolve) settleDraws(o *Options, iters *int) (*Result, bool, error) {
	n := len(s.sup)
	j := make([]float64, n)
	for k := range s.sup {
		j[k] = s.sup[k].draw
	}
	for solves := 0; solves < maxDrawSolves; {
		rs, g, err := s.solveAt(o, j, iters)
		solves++
		if err != nil {
			return nil, false, err
		}
		if drawsSettled(j, g) {
			return rs, true, nil
		}
		if solves <= 2 {
			j = g
			continue
		}
		// Newton: (S − I)·Δ = −(g − j), S = ∂g/∂j by differences,
		// over the draws in use (a regulator out of regulation draws
		// its quiescent current only).
		var act []int
		for k := range s.sup {
			if st := &s.sup[k]; st.conv == circuit.Switched || st.region == Regulating {
				act = append(act, k)
			}
		}
		m := len(act)
		if m == 0 {
			return rs, false, nil // every draw is in its place already
		}
		a := mat.NewDense(m, m, nil)
		f := mat.NewVecDense(m, nil)
		for c, kc := range act {
			h := 1e-4 * math.Max(math.Abs(j[kc]), 1e-6)
			jc := append([]float64(nil), j...)
			jc[kc] += h
			_, gc, err := s.solveAt(o, jc, iters)
			solves++
			if err != nil {
				return nil, false, err
			}
			for r, kr := range act {
				v := (gc[kr] - g[kr]) / h
				if r == c {
					v--
				}
				a.Set(r, c, v)
			}
		}
		for r, kr := range act {
			f.SetVec(r, j[kr]-g[kr])
		}
		// A Jacobian near singular means a draw that feeds itself one
		// for one: no draw balances it, and a step would only run off
		// to where the tolerance, relative to the draw, is met by
		// accident. ‖(S − I)⁻¹‖ is how far a step can run.
		var lu mat.LU
		lu.Factorize(a)
		if inv := lu.Cond() / mat.Norm(a, 1); !(inv < maxDrawGain) {
			return rs, false, nil
		}
		var dx mat.VecDense
		if err := lu.SolveVecTo(&dx, false, f); err != nil {
			return rs, false, nil
		}
		for r, kr := range act {
			j[kr] += dx.AtVec(r)
			if math.IsNaN(j[kr]) || math.IsInf(j[kr], 0) {
				return rs, false, nil
			}
		}
	}
	return nil, false, nil
}

// drawsSettled reports whether the draws g implied by the solution with
// the draws j are j, to drawTol.
func drawsSettled(j, g []float64) bool {
	for k := range j {
		if !(math.Abs(g[k]-j[k]) <= drawTol*math.Max(math.Abs(g[k]), math.Abs(j[k]))+1e-30) {
			return false
		}
	}
	return true
}

// next works out each supply's output current from the stand-ins'
// solution rs, and returns what each then draws from its input rail: a
// regulator regulating its output current plus its quiescent current, a
// converter its output power over its efficiency; a regulator in dropout
// or limit keeps its draw, which its stand-ins do not use.
func (s *multiSolve) next(rs *Result) []float64 {
	out := make([]float64, len(s.sup))
	for k := range s.sup {
		st := &s.sup[k]
		p := &s.d.Parts[st.part]
		sp := p.Kind.Info().Supply
		i := st.part
		switch {
		case st.conv == circuit.Linear && st.region == Limiting:
			st.iout = p.Conv.Limit
		case st.conv == circuit.Linear && st.region == Backfed:
			st.iout = 0
		case st.conv == circuit.Linear && st.region == InDropout:
			st.iout = rs.I[i] // in → out through the stand-in
		default:
			st.iout = -rs.I[i] // out → common through the stand-in: delivered out of out
		}
		out[k] = st.draw
		switch {
		case st.conv == circuit.Switched:
			vout := rs.NetV[p.Pins[sp.Out]] - rs.NetV[p.Pins[sp.OutRef]]
			out[k] = vout * st.iout / p.Conv.Efficiency
		case st.region == Regulating:
			out[k] = st.iout + quiescent(p)
		}
	}
	return out
}
