package solve

import (
	"errors"
	"fmt"
	"math"

	"nodal/circuit"
)

// ErrorKind says why a solve gave no operating point.
type ErrorKind uint8

const (
	// Singular: the equations have no unique solution although the
	// topology checks passed.
	Singular ErrorKind = iota
	// NoConvergence: the nonlinear parts did not settle.
	NoConvergence
	// SelfCheck: the solution fails Kirchhoff's current law or Tellegen's
	// theorem.
	SelfCheck
	// BadPart: a part cannot be modelled (a shorted voltage source, a
	// diode whose series resistance drops more than its vf).
	BadPart
	// TooLarge: the design is too large for the linear solvers available.
	TooLarge
)

// Error is a solve that gave no usable operating point. Nets and Parts name
// what is involved.
type Error struct {
	Kind  ErrorKind
	Nets  []circuit.NetID
	Parts []circuit.PartID
	Msg   string
}

func (e *Error) Error() string { return e.Msg }

// Options change a solve. The zero value is the default.
type Options struct {
	// Temperature in kelvin; 0 means 25 °C.
	Temperature float64
	// Dense forces gonum's dense LU whatever the size.
	Dense bool
}

// Result is a DC operating point. Slices are indexed by NetID and PartID;
// see the package doc for the sign convention.
type Result struct {
	NetV []float64 // volts; 0 for nets no pin touches
	V    []float64 // part voltage V(pin 1) − V(pin 2)
	I    []float64 // part current from pin 1 to pin 2 through the part
	P    []float64 // absorbed power V·I
	// Junction is the junction voltage of each diode and LED (the part
	// voltage less the drop in its series resistance); 0 for other parts.
	Junction []float64

	Unknowns   int
	Iterations int    // Newton iterations in all
	Method     string // "linear", "newton", "gmin stepping" or "source stepping"
	// Cond estimates the 1-norm condition number of the final system.
	Cond float64

	// Self-checks: the largest KCL residual at any net and the largest part
	// current; the sum of the absorbed powers and the sum of their
	// magnitudes.
	KCL, KCLScale        float64
	PowerSum, PowerScale float64
}

// Tolerances of the self-checks (relative).
const (
	KCLTol      = 1e-9
	TellegenTol = 1e-9
)

// MaxDense is the largest system solved with the dense LU when no sparse
// solver is available.
const MaxDense = 600

// Newton iteration caps.
const (
	maxNewton  = 100 // per attempt
	maxTotal   = 3000
	vTolRel    = 1e-9
	vTolAbs    = 1e-12
	gminStart  = 1e-2
	gminFactor = 10
	gminEnd    = 1e-12
)

// model is one design turned into equations.
type model struct {
	d      *circuit.Design
	node   []int32 // per net: its unknown, or -1 for the ground group
	tree   []bool  // per part: a short that joins two groups
	branch []int32 // per part: voltage source current unknown, or diode internal node; -1 otherwise
	nNodes int     // net and internal-node unknowns
	n      int
	junc   []junction
	sys    *system
	lin    linearSolver
	x, dx  []float64
	iters  int
}

// Solve finds the DC operating point of d. It expects a design the
// topology checks accept (topology.Result.WellPosed); a design they would
// reject may come back as an *Error of kind Singular.
func Solve(d *circuit.Design, opt *Options) (*Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	t := opt.Temperature
	if t == 0 {
		t = RoomTemperature
	}
	m, err := build(d, ThermalVoltage(t))
	if err != nil {
		return nil, err
	}
	switch {
	case opt.Dense || m.n <= MaxDense:
		m.lin = &denseSolver{}
	default:
		return nil, &Error{Kind: TooLarge, Msg: fmt.Sprintf("%d unknowns is more than this version solves (%d)", m.n, MaxDense)}
	}
	method, err := m.run()
	if err != nil {
		return nil, err
	}
	r := m.result()
	r.Method = method
	if err := r.selfCheck(d); err != nil {
		return r, err
	}
	return r, nil
}

func build(d *circuit.Design, vt float64) (*model, error) {
	nn := len(d.Nets)
	m := &model{d: d, node: make([]int32, nn), tree: make([]bool, len(d.Parts)), branch: make([]int32, len(d.Parts))}
	uf := make([]int32, nn)
	for i := range uf {
		uf[i] = int32(i)
	}
	find := func(x int32) int32 {
		for uf[x] != x {
			uf[x] = uf[uf[x]]
			x = uf[x]
		}
		return x
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		if !p.IsShort() {
			continue
		}
		a, b := find(int32(p.Pins[0])), find(int32(p.Pins[1]))
		if a != b {
			uf[a] = b
			m.tree[i] = true
		}
	}
	groundRoot := int32(-1)
	if d.Ground != circuit.NoNet {
		groundRoot = find(int32(d.Ground))
	}
	idx := make([]int32, nn)
	for i := range idx {
		idx[i] = -1
	}
	for i := range d.Nets {
		r := find(int32(i))
		if r == groundRoot || d.Nets[i].Pins == 0 {
			m.node[i] = -1
			continue
		}
		if idx[r] < 0 {
			idx[r] = int32(m.nNodes)
			m.nNodes++
		}
		m.node[i] = idx[r]
	}
	// Internal nodes of diodes with series resistance, then source currents.
	var badParts []circuit.PartID
	var msgs []string
	for i := range d.Parts {
		p := &d.Parts[i]
		m.branch[i] = -1
		if p.Kind != circuit.Diode && p.Kind != circuit.LED {
			continue
		}
		n := Ideality(p)
		is, vref, ok := SaturationCurrent(p, vt)
		if !ok {
			badParts = append(badParts, circuit.PartID(i))
			msgs = append(msgs, fmt.Sprintf("%s %s: its series resistance drops %s at %s, at least its vf", p.Kind, p.Name, fmtV(p.VFAt*p.Series), fmtA(p.VFAt)))
			continue
		}
		a := m.node[p.Pins[0]]
		if p.Series > 0 {
			m.branch[i] = int32(m.nNodes)
			a = int32(m.nNodes)
			m.nNodes++
		}
		m.junc = append(m.junc, junction{part: circuit.PartID(i), a: a, c: m.node[p.Pins[1]], is: is, nvt: n * vt, vref: vref, vj: vref})
	}
	m.n = m.nNodes
	for i := range d.Parts {
		p := &d.Parts[i]
		if p.Kind != circuit.VoltageSource {
			continue
		}
		if m.node[p.Pins[0]] == m.node[p.Pins[1]] {
			badParts = append(badParts, circuit.PartID(i))
			msgs = append(msgs, fmt.Sprintf("voltage source %s has both pins on the same net", p.Name))
			continue
		}
		m.branch[i] = int32(m.n)
		m.n++
	}
	if len(badParts) > 0 {
		return nil, &Error{Kind: BadPart, Parts: badParts, Msg: joinMsgs(msgs)}
	}
	m.sys = newSystem(m.n)
	m.x = make([]float64, m.n)
	m.dx = make([]float64, m.n)
	return m, nil
}

func joinMsgs(s []string) string {
	out := s[0]
	for _, x := range s[1:] {
		out += "; " + x
	}
	return out
}

// assemble stamps the equations linearised at the junctions' current
// points, with sources scaled by lambda and gmin from every node to ground.
func (m *model) assemble(lambda, gmin float64) {
	s := m.sys
	s.begin()
	d := m.d
	for i := range d.Parts {
		p := &d.Parts[i]
		a, b := m.node[p.Pins[0]], m.node[p.Pins[1]]
		switch p.Kind {
		case circuit.Resistor:
			s.conductance(a, b, 1/p.Value)
		case circuit.Inductor, circuit.Fuse:
			if p.DCR > 0 {
				s.conductance(a, b, 1/p.DCR)
			}
		case circuit.VoltageSource:
			k := m.branch[i]
			s.add(a, k, 1)
			s.add(b, k, -1)
			s.add(k, a, 1)
			s.add(k, b, -1)
			s.rhs[k] = lambda * p.Value
		case circuit.CurrentSource:
			s.inject(a, -lambda*p.Value)
			s.inject(b, lambda*p.Value)
		case circuit.Diode, circuit.LED:
			if k := m.branch[i]; k >= 0 {
				s.conductance(a, k, 1/p.Series)
			}
		}
	}
	for k := range m.junc {
		j := &m.junc[k]
		id, gd := j.eval(j.vj)
		s.conductance(j.a, j.c, gd+Leakage)
		ieq := id - gd*j.vj
		s.inject(j.a, -ieq)
		s.inject(j.c, ieq)
	}
	for k := 0; k < m.nNodes; k++ {
		s.add(int32(k), int32(k), gmin)
	}
	s.end()
}

func (m *model) volt(x []float64, k int32) float64 {
	if k < 0 {
		return 0
	}
	return x[k]
}

// linearSolve factors the assembled system and solves it into x, with one
// step of iterative refinement.
func (m *model) linearSolve(x []float64) error {
	if err := m.lin.factor(m.sys); err != nil {
		return err
	}
	copy(x, m.sys.rhs)
	m.lin.solve(x)
	r := m.dx
	m.sys.mulVec(r, x)
	for i := range r {
		r[i] = m.sys.rhs[i] - r[i]
	}
	m.lin.solve(r)
	for i := range x {
		x[i] += r[i]
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
	for it := 0; it < maxNewton && m.iters < maxTotal; it++ {
		m.iters++
		m.assemble(lambda, gmin)
		if err := m.linearSolve(xn); err != nil {
			if err == errNotFinite {
				return false, nil
			}
			return false, err
		}
		done := true
		for i := range xn {
			if math.Abs(xn[i]-m.x[i]) > vTolRel*math.Max(math.Abs(xn[i]), math.Abs(m.x[i]))+vTolAbs {
				done = false
				break
			}
		}
		for k := range m.junc {
			j := &m.junc[k]
			vraw := m.volt(xn, j.a) - m.volt(xn, j.c)
			id, gd := j.eval(j.vj)
			j.iLin = id + gd*(vraw-j.vj) + Leakage*vraw
			j.vLast = vraw
			v, limited := j.limit(vraw)
			j.settled = !limited && math.Abs(v-j.vj) <= vTolRel*math.Abs(v)+vTolAbs
			if !j.settled {
				done = false
			}
			j.vj = v
		}
		copy(m.x, xn)
		if len(m.junc) == 0 || done {
			return true, nil
		}
	}
	return false, nil
}

func (m *model) reset() {
	clear(m.x)
	for k := range m.junc {
		m.junc[k].vj = 0
	}
}

// run finds the operating point: Newton, then gmin stepping, then source
// stepping.
func (m *model) run() (string, error) {
	if len(m.junc) == 0 {
		m.assemble(1, 0)
		if err := m.linearSolve(m.x); err != nil {
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
