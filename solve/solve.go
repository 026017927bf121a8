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
	// Dense forces gonum's dense LU whatever the size (up to MaxDense
	// unknowns); it is Solver: DenseLU.
	Dense bool
	// Solver forces a linear solver; the zero value chooses automatically.
	// SparseCholesky and PCGAMG need the eliminated formulation: where the
	// branch-current formulation is used they are replaced by SparseLU.
	Solver LinearSolver
	// MNA forces the general branch-current formulation (one unknown per
	// voltage source) instead of eliminating the voltage sources.
	MNA bool
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
	// Linear is the linear solver that produced the final solution, and
	// MNA whether the branch-current formulation was used.
	Linear LinearSolver
	MNA    bool
	// PCGIterations counts the conjugate-gradient iterations in all (0 for
	// the direct solvers).
	PCGIterations int
	// Cond estimates the 1-norm condition number of the final system after
	// symmetric diagonal equilibration (see the package doc). It is 0 when
	// no estimate was made (CondEstimated false): the iterative solver
	// makes none.
	Cond          float64
	CondEstimated bool

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

// MaxDense is the largest system solved with the dense LU when it is forced
// (Options.Dense); its n² storage is 128 MB there.
const MaxDense = 4000

// maxStamps bounds the stamps of one system: sparse indices are int32.
const maxStamps = math.MaxInt32

// Newton iteration caps.
const (
	maxNewton  = 100 // per attempt
	maxTotal   = 3000
	vTolRel    = 1e-9
	vTolAbs    = 1e-12
	gminStart  = 1e-2
	gminFactor = 10
	gminEnd    = 1e-12
	nodeFloor  = 1e-3
	// looseStep: a Newton step larger than this fraction of the largest
	// voltage lets the next iterative solve stop loosely (looseTol).
	looseStep = 1e-4
)

// model is one design turned into equations.
type model struct {
	d   *circuit.Design
	mna bool // branch currents for voltage sources; otherwise they are eliminated
	// node gives per net its unknown, or -1 for the ground group, and off
	// its potential above that unknown with every source at full value:
	// V(net) = x[node] + λ·off (x = 0 for the ground group).
	node   []int32
	off    []float64
	tree   []bool  // per part: a short or eliminated source that joins two groups
	branch []int32 // per part: voltage source current unknown, or diode internal node; -1 otherwise
	nNodes int     // net and internal-node unknowns
	n      int
	junc   []junction
	sys    *system
	lin    linearSolver
	lambda float64
	x, dx  []float64
	iters  int
}

// errSourceLoop says that a voltage source closes a loop of sources and
// shorts, which the elimination cannot represent.
var errSourceLoop = errors.New("a voltage source closes a loop of voltage-defining parts")

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
	vt := ThermalVoltage(t)
	m, err := build(d, vt, opt.MNA)
	if err == errSourceLoop {
		m, err = build(d, vt, true)
	}
	if err != nil {
		return nil, err
	}
	kind := opt.Solver
	if opt.Dense {
		kind = DenseLU
	}
	if kind == AutoSolver {
		switch {
		case m.n <= AutoDenseMax:
			kind = DenseLU
		case m.mna:
			kind = SparseLU
		case m.n <= AutoCholeskyMax:
			kind = SparseCholesky
		default:
			kind = PCGAMG
		}
	}
	if m.mna && (kind == SparseCholesky || kind == PCGAMG || kind == PCGJacobi || kind == PCGPlainAMG) {
		kind = SparseLU
	}
	if kind == DenseLU && m.n > MaxDense {
		return nil, &Error{Kind: TooLarge, Msg: fmt.Sprintf("%d unknowns is too many for the dense solver (%d)", m.n, MaxDense)}
	}
	var pcg *pcgSolver
	newPCG := func(jacobi, plain bool) {
		pcg = &pcgSolver{tol: PCGTol, private: len(m.junc) > 0, jacobi: jacobi, plain: plain}
		m.lin = pcg
	}
	switch kind {
	case DenseLU:
		m.lin = &denseSolver{}
	case SparseCholesky:
		c := &cholSolver{}
		m.lin = c
		if opt.Solver == AutoSolver {
			// Chosen by size alone: analyse the pattern first and, if the
			// factor would pass fillBudget (a network without small
			// separators), take the iterative path instead.
			m.assemble(1, 0)
			if err := c.probe(m.sys); err != nil {
				if se := (*Error)(nil); !errors.As(err, &se) || se.Kind != TooLarge {
					return nil, m.singular(err)
				}
				newPCG(false, false)
			}
		}
	case PCGAMG:
		newPCG(false, false)
	case PCGJacobi:
		newPCG(true, false)
	case PCGPlainAMG:
		newPCG(false, true)
	default:
		m.lin = &luSolver{}
	}
	method, err := m.run()
	if err != nil {
		return nil, err
	}
	r := m.result()
	r.Method = method
	err = r.selfCheck(d)
	// An iterative solve stopped on its residual, not on the self-check:
	// if it missed, tighten and solve again from where it stopped.
	for tries := 0; pcg != nil && pcg.fallback == nil && isSelfCheck(err) && tries < 2; tries++ {
		pcg.tol /= 1000
		if method, err = m.run(); err != nil {
			return nil, err
		}
		r = m.result()
		r.Method = method
		err = r.selfCheck(d)
	}
	if pcg != nil {
		r.PCGIterations = pcg.iters
	}
	if err != nil {
		return r, err
	}
	return r, nil
}

func isSelfCheck(err error) bool {
	var se *Error
	return errors.As(err, &se) && se.Kind == SelfCheck
}

// build turns d into equations. Ideal shorts always, and voltage sources
// unless mna is set, are contracted by a union–find whose every element
// carries its potential above its parent (a weighted union–find; the
// potentials of a tree of sources are the sums of the source voltages along
// its paths). Each group of nets tied by shorts and sources becomes one
// unknown plus known offsets, and the group holding ground becomes known
// voltages. What remains — conductances and current injections — is a
// weighted graph Laplacian with grounding: symmetric positive definite when
// every group has a conducting path to ground, which the topology checks
// guarantee (Leakage keeps a net behind a junction connected).
func build(d *circuit.Design, vt float64, mna bool) (*model, error) {
	nn := len(d.Nets)
	m := &model{d: d, mna: mna, node: make([]int32, nn), off: make([]float64, nn),
		tree: make([]bool, len(d.Parts)), branch: make([]int32, len(d.Parts)), lambda: 1}
	uf := make([]int32, nn)
	pot := make([]float64, nn) // V(x) − V(uf[x])
	for i := range uf {
		uf[i] = int32(i)
	}
	// find returns the root of x and V(x) − V(root), compressing the path.
	find := func(x int32) (int32, float64) {
		r, s := x, 0.0
		for uf[r] != r {
			s += pot[r]
			r = uf[r]
		}
		for y, t := x, s; uf[y] != y; {
			next, py := uf[y], pot[y]
			uf[y], pot[y] = r, t
			t -= py
			y = next
		}
		return r, s
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		src := !mna && p.Kind == circuit.VoltageSource
		if !p.IsShort() && !src {
			continue
		}
		v := 0.0
		if src {
			v = p.Value
		}
		ra, pa := find(int32(p.Pins[0]))
		rb, pb := find(int32(p.Pins[1]))
		if ra == rb {
			if !src && pa == pb {
				continue // a short in parallel with shorts: carries 0 A
			}
			return nil, errSourceLoop
		}
		// V(pin 0) − V(pin 1) = v, V(pin) = V(root) + potential.
		uf[ra], pot[ra] = rb, v-pa+pb
		m.tree[i] = true
	}
	groundRoot, groundPot := int32(-1), 0.0
	if d.Ground != circuit.NoNet {
		groundRoot, groundPot = find(int32(d.Ground))
	}
	idx := make([]int32, nn)
	for i := range idx {
		idx[i] = -1
	}
	for i := range d.Nets {
		r, o := find(int32(i))
		switch {
		case r == groundRoot:
			m.node[i], m.off[i] = -1, o-groundPot
		case d.Nets[i].Pins == 0:
			m.node[i] = -1
		default:
			if idx[r] < 0 {
				idx[r] = int32(m.nNodes)
				m.nNodes++
			}
			m.node[i], m.off[i] = idx[r], o
		}
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
		a, oa := m.node[p.Pins[0]], m.off[p.Pins[0]]
		if p.Series > 0 {
			m.branch[i] = int32(m.nNodes)
			a, oa = int32(m.nNodes), 0
			m.nNodes++
		}
		m.junc = append(m.junc, junction{part: circuit.PartID(i), a: a, c: m.node[p.Pins[1]], oa: oa, oc: m.off[p.Pins[1]],
			is: is, nvt: n * vt, vref: vref, vj: vref})
	}
	m.n = m.nNodes
	for i := range d.Parts {
		p := &d.Parts[i]
		if p.Kind != circuit.VoltageSource || !mna {
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
	if 4*len(d.Parts)+m.n > maxStamps {
		return nil, &Error{Kind: TooLarge, Msg: fmt.Sprintf("%d parts need more matrix entries than one system holds (%d)", len(d.Parts), maxStamps)}
	}
	m.sys = newSystem(m.n, 2*len(d.Parts))
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
	m.lambda = lambda
	d := m.d
	for i := range d.Parts {
		p := &d.Parts[i]
		switch p.Kind {
		case circuit.Resistor:
			m.netConductance(p.Pins[0], p.Pins[1], 1/p.Value)
		case circuit.Inductor, circuit.Fuse:
			if p.DCR > 0 {
				m.netConductance(p.Pins[0], p.Pins[1], 1/p.DCR)
			}
		case circuit.VoltageSource:
			if k := m.branch[i]; k >= 0 {
				a, b := m.node[p.Pins[0]], m.node[p.Pins[1]]
				s.add(a, k, 1)
				s.add(b, k, -1)
				s.add(k, a, 1)
				s.add(k, b, -1)
				s.rhs[k] = lambda*p.Value - lambda*(m.off[p.Pins[0]]-m.off[p.Pins[1]])
			}
		case circuit.CurrentSource:
			s.inject(m.node[p.Pins[0]], -lambda*p.Value)
			s.inject(m.node[p.Pins[1]], lambda*p.Value)
		case circuit.Diode, circuit.LED:
			if k := m.branch[i]; k >= 0 {
				m.conductance(m.node[p.Pins[0]], m.off[p.Pins[0]], k, 0, 1/p.Series)
			}
		}
	}
	for k := range m.junc {
		j := &m.junc[k]
		id, gd := j.eval(j.vj)
		m.conductance(j.a, j.oa, j.c, j.oc, gd+Leakage)
		ieq := id - gd*j.vj
		s.inject(j.a, -ieq)
		s.inject(j.c, ieq)
	}
	for k := 0; k < m.nNodes; k++ {
		s.add(int32(k), int32(k), gmin)
	}
	s.end()
}

func (m *model) netConductance(a, b circuit.NetID, g float64) {
	m.conductance(m.node[a], m.off[a], m.node[b], m.off[b], g)
}

// conductance stamps g between the terminals (a, oa) and (b, ob): unknowns
// a and b (−1 for the ground group) with potentials λ·oa and λ·ob above
// them. The part carries g·(x_a − x_b) + g·λ·(oa − ob) from a to b; the
// known second term is a current injection. A conductance within one group
// carries a known current into and out of the same unknown and stamps
// nothing.
func (m *model) conductance(a int32, oa float64, b int32, ob float64, g float64) {
	if a == b {
		return
	}
	s := m.sys
	s.conductance(a, b, g)
	if dv := m.lambda * (oa - ob); dv != 0 {
		s.inject(a, -g*dv)
		s.inject(b, g*dv)
	}
}

// netV returns the voltage of net i from the unknowns x.
func (m *model) netV(x []float64, i circuit.NetID) float64 {
	return m.volt(x, m.node[i]) + m.lambda*m.off[i]
}

// jv returns junction j's voltage from the unknowns x.
func (m *model) jv(x []float64, j *junction) float64 {
	return m.volt(x, j.a) + m.lambda*j.oa - m.volt(x, j.c) - m.lambda*j.oc
}

func (m *model) volt(x []float64, k int32) float64 {
	if k < 0 {
		return 0
	}
	return x[k]
}

// linearSolve factors the assembled system and solves it into x.
func (m *model) linearSolve(x []float64) error {
	if err := m.lin.factor(m.sys); err != nil {
		return err
	}
	copy(x, m.sys.rhs)
	if err := m.lin.solve(x); err != nil {
		return err
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
	// Inexact Newton (Dembo, Eisenstat & Steihaug, "Inexact Newton
	// methods", SIAM J. Numer. Anal. 19(2), 1982): while the iterates are
	// still moving far, an iterative linear solver stops at a loose
	// residual; convergence is only declared on a step solved tightly.
	pcg, _ := m.lin.(*pcgSolver)
	loose := pcg != nil && len(m.junc) > 0
	for it := 0; it < maxNewton && m.iters < maxTotal; it++ {
		m.iters++
		m.assemble(lambda, gmin)
		if pcg != nil {
			pcg.loose = loose
		}
		if err := m.linearSolve(xn); err != nil {
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
		if loose && done {
			done = false // confirm with a tight solve
		}
		loose = pcg != nil && (anyLimited || step > looseStep*xinf)
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
