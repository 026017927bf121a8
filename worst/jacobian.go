package worst

// jacobian.go: dx/dp = −J⁻¹·∂F/∂p, the first-order change of the DC
// operating point with each parameter, from the Jacobian of the DC
// equations at the nominal point (modified nodal analysis) factored once.

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/solve"
	"nodal/solve/sparse"
)

// jacobian is the linearised DC system of a design at its nominal point.
type jacobian struct {
	d      *circuit.Design // at the nominal temperature
	r      *solve.Result
	tK     float64 // nominal temperature, kelvin
	node   []int32 // per net: its unknown, or -1 (ground, or no pins)
	branch []int32 // per part: its branch-current unknown, or -1
	inner  []int32 // per junction with series resistance: its inner node
	gd     []float64
	n      int
	lu     sparse.LU
	inv    []float64 // columns of J⁻¹, when kept (see invert)
}

// newJacobian builds and factors the Jacobian of d (values at the nominal
// temperature) at its operating point r.
//
// budget is asked, before the numeric factorisation, whether solves of n
// unknowns with factors of about the given fill are affordable.
func newJacobian(d *circuit.Design, r *solve.Result, tK float64, maxUnknowns int, budget func(n, fill int) error) (*jacobian, error) {
	j := &jacobian{d: d, r: r, tK: tK, node: make([]int32, len(d.Nets)),
		branch: make([]int32, len(d.Parts)), inner: make([]int32, len(d.Parts)), gd: make([]float64, len(d.Parts))}
	n := int32(0)
	for i := range d.Nets {
		if circuit.NetID(i) == d.Ground || d.Nets[i].Pins == 0 {
			j.node[i] = -1
			continue
		}
		j.node[i] = n
		n++
	}
	// A short that closes a loop of shorts carries an undetermined share
	// of the current: it gets no branch current (its change reads 0 A).
	uf := make([]int32, len(d.Nets))
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
		j.branch[i], j.inner[i] = -1, -1
		if p.IsShort() {
			ra, rb := find(int32(p.Pins[0])), find(int32(p.Pins[1]))
			if ra == rb {
				continue
			}
			uf[ra] = rb
		}
		if dc := p.DC(); p.Kind == circuit.VoltageSource || dc.Model == circuit.Short || dc.Model == circuit.VoltageDrop {
			j.branch[i] = n
			n++
		}
		if (p.Kind == circuit.Diode || p.Kind == circuit.LED) && p.Series > 0 {
			j.inner[i] = n
			n++
		}
	}
	j.n = int(n)
	if j.n == 0 {
		return j, nil
	}
	if j.n > maxUnknowns {
		return nil, &Skipped{Reason: fmt.Sprintf("its %d unknowns are more than the worst-case analysis takes (%d)", j.n, maxUnknowns)}
	}
	t := sparse.NewTriplet(j.n, j.n, 4*len(d.Parts)+j.n)
	add := func(a, b int32, x float64) {
		if a >= 0 && b >= 0 {
			t.Add(int(a), int(b), x)
		}
	}
	cond := func(a, b int32, g float64) {
		add(a, a, g)
		add(b, b, g)
		add(a, b, -g)
		add(b, a, -g)
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		a, b := j.node[p.Pins[0]], j.node[p.Pins[1]]
		if k := j.branch[i]; k >= 0 {
			add(a, k, 1)
			add(b, k, -1)
			add(k, a, 1)
			add(k, b, -1)
			continue
		}
		switch p.Kind {
		case circuit.Resistor:
			cond(a, b, 1/p.Value)
		case circuit.Inductor, circuit.Fuse:
			if p.DCR > 0 {
				cond(a, b, 1/p.DCR)
			}
		case circuit.Diode, circuit.LED:
			g, err := junctionSlope(d, p, r.Junction[i], tK)
			if err != nil {
				return nil, err
			}
			j.gd[i] = g + solve.Leakage
			if in := j.inner[i]; in >= 0 {
				cond(a, in, 1/p.Series)
				a = in
			}
			cond(a, b, j.gd[i])
		default:
			// Other kinds stamp their DC behaviour: a resistance behind
			// an EMF (a battery, a port's drive) is that conductance, and
			// a constant-power load P at voltage V the slope of
			// I = P/V, dI/dV = −P/V² (the slope is negative).
			switch dc := p.DC(); dc.Model {
			case circuit.Conductance:
				cond(a, b, 1/dc.R)
			case circuit.ConstantPower:
				j.gd[i] = powerSlope(p, r.V[i])
				cond(a, b, j.gd[i])
			}
		}
	}
	a := t.Compress()
	// The symbolic Cholesky analysis of the (symmetric) pattern bounds the
	// fill before anything is factored: networks without small
	// separators (random ones) fill in far past what their sensitivities
	// are worth. A factor of n unknowns has at most n(n+1)/2 entries: when
	// a full one would pass both bounds, the analysis could only say so,
	// and a small design is spared it (it costs as much as the factoring).
	if full := j.n * (j.n + 1) / 2; full > maxFill || budget(j.n, 2*full) != nil {
		var ch sparse.Cholesky
		if err := ch.AnalyzeBudget(a, maxFill); err != nil {
			return nil, &Skipped{Reason: fmt.Sprintf("its linearised equations would fill in past %d entries when factored", maxFill)}
		}
		if err := budget(j.n, 2*ch.NnzL()); err != nil {
			return nil, err
		}
	}
	if err := j.lu.Factor(a); err != nil {
		return nil, &Skipped{Reason: fmt.Sprintf("its linearised equations are singular (%v), as with voltage sources in parallel", err)}
	}
	return j, nil
}

// fill returns the entries of the factors: the cost of one solve.
func (j *jacobian) fill() int {
	if j.n == 0 {
		return 0
	}
	return j.lu.L().Nnz() + j.lu.U().Nnz()
}

// junctionSlope returns dI/dV of p's junction at junction voltage v and
// temperature tK: Is·exp(v/(n·Vt))/(n·Vt), continued by its tangent past
// solve.MaxOverdrive as the solver does, plus the slope of its breakdown
// (solve.Breakdown) when it has one.
func junctionSlope(d *circuit.Design, p *circuit.Part, v, tK float64) (float64, error) {
	is, vref, ok := solve.SaturationCurrentAt(p, tK)
	br, _, brOK := solve.BreakdownOf(p)
	if !ok || !brOK {
		return 0, &Skipped{Reason: d.NameOf(p) + " cannot be modelled"}
	}
	nvt := solve.Ideality(p) * solve.ThermalVoltage(tK)
	arg := math.Min(v/nvt, vref/nvt+solve.MaxOverdrive)
	_, gb := br.Eval(v)
	return is*math.Exp(arg)/nvt + gb, nil
}

// rhs fills f with −∂F/∂p for parameter p (a part value at relative
// position s, per unit of s; or the ambient temperature, per kelvin, when
// p.Part < 0), F being Kirchhoff's current law at every node (currents
// leaving) and each branch's voltage equation. orig holds the parts as
// written (values at 25 °C), for tempco.
func (j *jacobian) rhs(f []float64, p Param, orig []circuit.Part) {
	clear(f)
	d, r := j.d, j.r
	inj := func(a int32, x float64) {
		if a >= 0 {
			f[a] -= x
		}
	}
	if p.Part >= 0 {
		i := p.Part
		q := &d.Parts[i]
		a, b := j.node[q.Pins[0]], j.node[q.Pins[1]]
		switch q.Kind {
		case circuit.Resistor:
			// ∂(V/R)/∂s = −(I/R)·R·tol
			inj(a, -r.I[i]*p.Tol)
			inj(b, r.I[i]*p.Tol)
		case circuit.VoltageSource:
			// branch row V_a − V_b − E = 0, ∂/∂s = −E·tol
			f[j.branch[i]] += q.Value * p.Tol
		case circuit.CurrentSource, circuit.CurrentLoad, circuit.CurrentDrive:
			// All three carry their value from their first pin to
			// their second.
			inj(a, p.step(q))
			inj(b, -p.step(q))
		case circuit.PowerLoad:
			// I = P/V: ∂I/∂s = P·tol/V at the operating point
			if v := r.V[i]; v != 0 {
				inj(a, q.Value*p.Tol/v)
				inj(b, -q.Value*p.Tol/v)
			}
		case circuit.Battery, circuit.VoltageDrive:
			// An EMF E behind its series resistance, or an ideal one;
			// one unit of s moves E by dE (E·tol, or half a drive's
			// range).
			dE := p.step(q)
			if k := j.branch[i]; k >= 0 {
				// an ideal EMF's branch row, as a voltage source's
				f[k] += dE
			} else if dc := q.DC(); dc.Model == circuit.Conductance {
				// I = (V − E)/R: ∂I/∂s = −dE/R
				inj(a, -dE/dc.R)
				inj(b, dE/dc.R)
			}
		}
		return
	}
	for i := range d.Parts {
		q := &d.Parts[i]
		a, b := j.node[q.Pins[0]], j.node[q.Pins[1]]
		switch q.Kind {
		case circuit.Resistor:
			if h := orig[i].Heat; h != nil && h.Tempco != 0 {
				dR := orig[i].Value * h.Tempco // ∂R/∂T
				inj(a, -r.I[i]/q.Value*dR)
				inj(b, r.I[i]/q.Value*dR)
			}
		case circuit.Diode, circuit.LED:
			g := solve.JunctionCurrentSlope(q, r.Junction[i], j.tK)
			if in := j.inner[i]; in >= 0 {
				a = in
			}
			inj(a, g)
			inj(b, -g)
		}
	}
}

// partDeltas turns dx (the change of the unknowns for one unit of
// parameter p) into each part's change of voltage and current, dv and di.
func (j *jacobian) partDeltas(dx []float64, p Param, orig []circuit.Part, dv, di []float64) {
	d, r := j.d, j.r
	x := func(k int32) float64 {
		if k < 0 {
			return 0
		}
		return dx[k]
	}
	for i := range d.Parts {
		q := &d.Parts[i]
		v := x(j.node[q.Pins[0]]) - x(j.node[q.Pins[1]])
		dv[i] = v
		if k := j.branch[i]; k >= 0 {
			di[i] = dx[k]
			continue
		}
		switch q.Kind {
		case circuit.Resistor:
			dR := 0.0
			switch {
			case p.Part == circuit.PartID(i):
				dR = q.Value * p.Tol
			case p.Part < 0 && orig[i].Heat != nil:
				dR = orig[i].Value * orig[i].Heat.Tempco
			}
			di[i] = v/q.Value - r.I[i]/q.Value*dR
		case circuit.Inductor, circuit.Fuse:
			di[i] = 0
			if q.DCR > 0 {
				di[i] = v / q.DCR
			}
		case circuit.CurrentSource, circuit.CurrentLoad, circuit.CurrentDrive:
			di[i] = 0
			if p.Part == circuit.PartID(i) {
				di[i] = p.step(q)
			}
		case circuit.PowerLoad:
			di[i] = j.gd[i] * v
			if p.Part == circuit.PartID(i) && r.V[i] != 0 {
				di[i] += q.Value * p.Tol / r.V[i]
			}
		case circuit.Diode, circuit.LED:
			a := j.node[q.Pins[0]]
			if in := j.inner[i]; in >= 0 {
				a = in
			}
			di[i] = j.gd[i] * (x(a) - x(j.node[q.Pins[1]]))
			if p.Part < 0 {
				di[i] += solve.JunctionCurrentSlope(q, r.Junction[i], j.tK)
			}
		default:
			di[i] = 0
			if dc := q.DC(); dc.Model == circuit.Conductance {
				di[i] = v / dc.R
				if p.Part == circuit.PartID(i) && (q.Kind == circuit.Battery || q.Kind == circuit.VoltageDrive) {
					di[i] -= p.step(q) / dc.R
				}
			}
		}
	}
}

// netDeltas copies the change of each net's voltage out of dx.
func (j *jacobian) netDeltas(dx []float64, out []float64) {
	for i, k := range j.node {
		out[i] = 0
		if k >= 0 {
			out[i] = dx[k]
		}
	}
}

// maxFill bounds the entries of the factor's symbolic analysis (4·10⁶,
// 32 MB per factor).
const maxFill = 4_000_000

// maxInverse is the largest system whose inverse is kept (8 MB per 1000
// unknowns squared).
const maxInverse = 3000

// invert computes the columns of J⁻¹, one solve each.
func (j *jacobian) invert() {
	j.inv = make([]float64, j.n*j.n)
	for k := 0; k < j.n; k++ {
		col := j.inv[k*j.n : (k+1)*j.n]
		col[k] = 1
		j.lu.Solve(col)
	}
}

// solve sets dx = J⁻¹·f: from the kept inverse when byInverse is set (f
// then has few entries), else by the factors.
func (j *jacobian) solve(dx, f []float64, byInverse bool) {
	if j.n == 0 {
		return
	}
	if !byInverse || j.inv == nil {
		copy(dx, f)
		j.lu.Solve(dx)
		return
	}
	clear(dx)
	for k, x := range f {
		if x == 0 {
			continue
		}
		col := j.inv[k*j.n : (k+1)*j.n]
		for i, z := range col {
			dx[i] += x * z
		}
	}
}

// powerSlope returns dI/dV = −P/V² of a constant-power load at voltage v
// (I = P/V), or 0 where v is 0 and the load draws nothing.
func powerSlope(p *circuit.Part, v float64) float64 {
	if v == 0 {
		return 0
	}
	return -p.Value / (v * v)
}
