// build.go: a design turned into equations: shorts and sources contracted by a weighted union–find, then the stamps of every part.

package solve

import (
	"fmt"
	"math"

	"nodal/circuit"
)

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
	var err error
	if m.closing, err = findClosing(d); err != nil {
		return nil, err
	}
	m.floating = findFloating(d)
	uf := newPotentialUF(nn)
	for i := range d.Parts {
		p := &d.Parts[i]
		dc := p.DC()
		src := !mna && dc.Model == circuit.VoltageDrop
		if dc.Model != circuit.Short && !src || m.closing != nil && m.closing[i] {
			continue
		}
		v := 0.0
		if src {
			v = p.Value
		}
		// V(pin 0) − V(pin 1) = v. The parts that close loops are left
		// out, so the rest form a forest.
		uf.union(int32(p.Pins[0]), int32(p.Pins[1]), v)
		m.tree[i] = true
	}
	find := uf.find
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
		case d.Nets[i].Pins == 0 || m.floating != nil && m.floating[i]:
			m.node[i] = -1 // no voltage of its own to solve for
		default:
			if idx[r] < 0 {
				idx[r] = int32(m.nNodes)
				m.nNodes++
			}
			m.node[i], m.off[i] = idx[r], o
		}
		m.offMax = math.Max(m.offMax, math.Abs(m.off[i]))
	}
	// Internal nodes of diodes with series resistance, then source currents.
	var badParts []circuit.PartID
	var msgs []string
	for i := range d.Parts {
		p := &d.Parts[i]
		m.branch[i] = -1
		if p.DC().Model != circuit.Junction || m.floating != nil && m.floating[p.Pins[0]] {
			continue
		}
		n := Ideality(p)
		is, vref, ok := SaturationCurrentAt(p, vt*Charge/Boltzmann)
		if !ok {
			badParts = append(badParts, circuit.PartID(i))
			msgs = append(msgs, fmt.Sprintf("%s %s: its series resistance drops %s at %s, at least its vf", p.Kind, d.NameOf(p), fmtV(p.VFAt*p.Series), fmtA(p.VFAt)))
			continue
		}
		br, _, brOK := BreakdownOf(p)
		if !brOK {
			badParts = append(badParts, circuit.PartID(i))
			msgs = append(msgs, fmt.Sprintf("%s %s: its series resistance drops %s at %s, at least its breakdown voltage", p.Kind, d.NameOf(p), fmtV(p.BreakdownAt*p.Series), fmtA(p.BreakdownAt)))
			continue
		}
		a, oa := m.node[p.Pins[0]], m.off[p.Pins[0]]
		if p.Series > 0 {
			m.branch[i] = int32(m.nNodes)
			a, oa = int32(m.nNodes), 0
			m.nNodes++
		}
		// Newton starts with the junction off, linearised at 0 V: the
		// first step solves the network without it, and a junction the
		// step forward-biases comes up at once to at most its vf point
		// (junction.limit). Started at its vf point instead, every junction
		// conducts at first and the steps turn them off a share at a time:
		// on the million-part random network (33 465 diodes, 36 of them
		// past 0.5 V at the solution) 14 Newton steps against 12, and
		// with every step up of more than 2·n·Vt damped, 15 against 16
		// (measured).
		m.junc = append(m.junc, junction{part: circuit.PartID(i), a: a, c: m.node[p.Pins[1]], oa: oa, oc: m.off[p.Pins[1]],
			is: is, nvt: n * vt, vref: vref, br: br})
	}
	m.n = m.nNodes
	m.addLoads()
	for i := range d.Parts {
		p := &d.Parts[i]
		if p.DC().Model != circuit.VoltageDrop || !mna || m.closing != nil && m.closing[i] || m.floating != nil && m.floating[p.Pins[0]] {
			continue
		}
		if m.node[p.Pins[0]] == m.node[p.Pins[1]] {
			badParts = append(badParts, circuit.PartID(i))
			msgs = append(msgs, fmt.Sprintf("voltage source %s has both pins on the same net", d.NameOf(p)))
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
	m.xlo = make([]float64, m.n)
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
// The parts whose stamps do not depend on the junctions' points come first
// and are stamped once for each lambda (see linearStamps); each Newton step
// then adds only the junctions, the constant-power loads and gmin.
func (m *model) assemble(lambda, gmin float64) {
	s := m.sys
	m.lambda = lambda
	if !m.linear.restore(s, lambda) {
		s.begin()
		m.stampLinear(lambda)
		m.linear.save(s, lambda)
	}
	m.stampLoads()
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

// stampLinear stamps the parts whose equations are fixed for a given
// lambda: conductances, eliminated and branch-current sources, current
// sources and the series resistance of junctions.
func (m *model) stampLinear(lambda float64) {
	s := m.sys
	d := m.d
	for i := range d.Parts {
		p := &d.Parts[i]
		switch dc := p.DC(); dc.Model {
		case circuit.Conductance:
			g := 1 / dc.R
			m.netConductance(p.Pins[0], p.Pins[1], g)
			if dc.E != 0 {
				// An EMF behind the resistance: the part carries g·(V − E),
				// a conductance and a current of −g·E from its first pin to
				// its second (Norton's theorem).
				s.inject(m.node[p.Pins[0]], lambda*g*dc.E)
				s.inject(m.node[p.Pins[1]], -lambda*g*dc.E)
			}
		case circuit.VoltageDrop:
			if k := m.branch[i]; k >= 0 {
				a, b := m.node[p.Pins[0]], m.node[p.Pins[1]]
				s.add(a, k, 1)
				s.add(b, k, -1)
				s.add(k, a, 1)
				s.add(k, b, -1)
				s.rhs[k] = lambda*p.Value - lambda*(m.off[p.Pins[0]]-m.off[p.Pins[1]])
			}
		case circuit.CurrentFlow:
			m.sourceI = math.Max(m.sourceI, math.Abs(p.Value))
			s.inject(m.node[p.Pins[0]], -lambda*p.Value)
			s.inject(m.node[p.Pins[1]], lambda*p.Value)
		case circuit.Junction:
			if k := m.branch[i]; k >= 0 {
				m.conductance(m.node[p.Pins[0]], m.off[p.Pins[0]], k, 0, 1/dc.R)
			}
		}
	}
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
		s.injectProd(a, -g, dv)
		s.injectProd(b, g, dv)
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
