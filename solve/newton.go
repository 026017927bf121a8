// newton.go: the nonlinear solve: Newton–Raphson, then gmin stepping, then source stepping.

package solve

import (
	"errors"
	"fmt"
	"math"

	"nodal/circuit"
)

// linearSolve factors the assembled system and solves it into x + xlo: in
// double-double with certified accuracy for a factorising solver
// (refineDD), in float64 (xlo zero) for an iterative one.
func (m *model) linearSolve(x, xlo []float64) error {
	if err := m.lin.factor(m.sys); err != nil {
		// A float64 factorisation can lose a pivot to rounding alone (a
		// teraohm beside a milliohm); a small system gets a second try
		// in double-double.
		var se *singularError
		if !errors.As(err, &se) || m.n > ddDenseMax {
			return err
		}
		f, ok := factorDD(m.sys)
		if !ok {
			return err
		}
		m.ddFactor = f
		m.refineDD(nil, f, x, xlo)
	} else if raw, ok := m.lin.direct(); ok && m.n > 0 {
		m.ddFactor = nil
		m.refineDD(raw, nil, x, xlo)
	} else {
		copy(x, m.sys.rhs)
		clear(xlo)
		m.uncertified = nil
		if err := m.lin.solve(x); err != nil {
			return err
		}
	}
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return errNotFinite
		}
	}
	return nil
}

var errNotFinite = errors.New("solution not finite")

// newton iterates at fixed lambda and gmin from m.x and the junctions'
// points. It reports whether it converged; a singular system is an error.
func (m *model) newton(lambda, gmin float64) (bool, error) {
	xn := make([]float64, m.n)
	xnlo := make([]float64, m.n)
	// Inexact Newton (Dembo, Eisenstat & Steihaug, "Inexact Newton
	// methods", SIAM J. Numer. Anal. 19(2), 1982): while the iterates are
	// still moving far, an iterative linear solver stops at a loose
	// residual, a forcing term of the residual it starts from
	// (pcgSolver.forcing); convergence is only declared on a step solved
	// tightly.
	pcg, _ := m.lin.(*pcgSolver)
	loose := pcg != nil && m.nonlinear()
	if pcg != nil {
		pcg.startNewton()
	}
	// damped says the last step was cut by junction limiting: the next
	// step's solve then stops at the loosest forcing term (see forcing).
	damped := false
	for it := 0; it < maxNewton && m.iters < maxTotal; it++ {
		m.iters++
		m.assemble(lambda, gmin)
		if pcg != nil {
			pcg.loose, pcg.damped = loose, damped
		}
		if err := m.linearSolve(xn, xnlo); err != nil {
			if err == errNotFinite {
				return false, nil
			}
			return false, err
		}
		// Converged when no node voltage and no junction moves. Branch
		// currents (MNA) are left out: once the junctions' linearisation
		// points stand still the linear system is fixed and so are they,
		// while a small branch current beside a large one can flicker by
		// the rounding of the large one for ever.
		// A node near 0 V beside nets at many volts carries the rounding
		// of those (about κ·ε of the largest voltage): judge every node to
		// at least 1e-12 of the largest, nodeFloor·vTolRel.
		done := true
		xinf := 0.0
		for _, v := range xn[:m.nNodes] {
			xinf = math.Max(xinf, math.Abs(v))
		}
		step := 0.0
		for i := range xn[:m.nNodes] {
			d := math.Abs(xn[i] - m.x[i])
			step = math.Max(step, d)
			if d > vTolRel*math.Max(math.Max(math.Abs(xn[i]), math.Abs(m.x[i])), nodeFloor*xinf)+vTolAbs {
				done = false
			}
		}
		anyLimited := false
		for k := range m.junc {
			j := &m.junc[k]
			vraw := m.jv(xn, j)
			id, gd := j.eval(j.vj)
			j.iLin = id + gd*(vraw-j.vj) + Leakage*vraw
			j.vLast = vraw
			v, limited := j.limit(vraw)
			// A junction voltage is the difference of two node voltages and
			// is known no better than they are: judge its step against the
			// larger of the two, as the node voltages themselves are judged
			// (a junction on a net at a megavolt otherwise never settles).
			scale := math.Max(math.Abs(v), math.Max(math.Abs(m.volt(xn, j.a)+m.lambda*j.oa), math.Abs(m.volt(xn, j.c)+m.lambda*j.oc)))
			j.settled = !limited && math.Abs(v-j.vj) <= vTolRel*scale+vTolAbs
			if !j.settled {
				done = false
			}
			anyLimited = anyLimited || limited
			j.vj = v
		}
		if !m.updateLoads(xn) {
			done = false
		}
		if loose && done {
			done = false // confirm with a tight solve
		}
		loose = pcg != nil && (anyLimited || step > looseStep*xinf)
		damped = anyLimited
		copy(m.x, xn)
		copy(m.xlo, xnlo)
		if !m.nonlinear() || done {
			return true, nil
		}
		m.advanceLoads()
	}
	return false, nil
}

func (m *model) reset() {
	clear(m.x)
	clear(m.xlo)
	for k := range m.junc {
		m.junc[k].vj = 0
	}
	for k := range m.loads {
		m.loads[k].i, m.loads[k].next = 0, 0
	}
}

// run finds the operating point: Newton, then gmin stepping, then source
// stepping.
func (m *model) run() (string, error) {
	if !m.nonlinear() {
		m.assemble(1, 0)
		if err := m.linearSolve(m.x, m.xlo); err != nil {
			return "", m.singular(err)
		}
		m.iters = 1
		return "linear", nil
	}
	ok, err := m.newton(1, 0)
	if err != nil {
		return "", m.singular(err)
	}
	if ok {
		return "newton", nil
	}
	if err := m.starvedError(); err != nil {
		return "", err
	}
	// gmin stepping.
	m.reset()
	ok = true
	for g := gminStart; g >= gminEnd && ok; g /= gminFactor {
		if ok, err = m.newton(1, g); err != nil {
			return "", m.singular(err)
		}
	}
	if ok {
		if ok, err = m.newton(1, 0); err != nil {
			return "", m.singular(err)
		}
		if ok {
			return "gmin stepping", nil
		}
	}
	// Source stepping with an adaptive step.
	m.reset()
	saveX := make([]float64, m.n)
	saveV := make([]float64, len(m.junc))
	lambda, step := 0.0, 0.1
	for lambda < 1 && m.iters < maxTotal {
		next := math.Min(1, lambda+step)
		copy(saveX, m.x)
		for k := range m.junc {
			saveV[k] = m.junc[k].vj
		}
		ok, err := m.newton(next, 0)
		if err != nil {
			return "", m.singular(err)
		}
		if ok {
			lambda = next
			step = math.Min(2*step, 0.5)
			continue
		}
		copy(m.x, saveX)
		clear(m.xlo)
		for k := range m.junc {
			m.junc[k].vj = saveV[k]
		}
		step /= 4
		if step < 1e-6 {
			break
		}
	}
	if lambda >= 1 {
		return "source stepping", nil
	}
	var parts []circuit.PartID
	var nets []circuit.NetID
	for k := range m.junc {
		if !m.junc[k].settled {
			p := m.junc[k].part
			parts = append(parts, p)
			nets = append(nets, m.d.Parts[p].Pins[:]...)
		}
	}
	if len(parts) == 0 {
		for k := range m.junc {
			parts = append(parts, m.junc[k].part)
		}
	}
	return "", &Error{Kind: NoConvergence, Parts: parts, Nets: nets,
		Msg: fmt.Sprintf("the operating point did not converge after %d iterations (Newton, gmin stepping, source stepping)", m.iters)}
}

// singular turns a factorisation failure into an *Error naming the nets or
// part of the offending unknown.
func (m *model) singular(err error) error {
	var ours *Error
	if errors.As(err, &ours) {
		return ours // already says what is wrong (TooLarge)
	}
	e := &Error{Kind: Singular, Msg: "the equations are singular"}
	var se *singularError
	if !errors.As(err, &se) {
		e.Msg += ": " + err.Error()
		return e
	}
	col := int32(se.col)
	for i, k := range m.node {
		if k == col {
			e.Nets = append(e.Nets, circuit.NetID(i))
		}
	}
	for i, k := range m.branch {
		if k == col {
			e.Parts = append(e.Parts, circuit.PartID(i))
		}
	}
	return e
}
