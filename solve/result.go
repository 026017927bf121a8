package solve

import (
	"fmt"
	"math"
	"sort"

	"nodal/circuit"
	"nodal/units"
)

func fmtV(v float64) string { return units.Format(v, units.Voltage) }
func fmtA(v float64) string { return units.Format(v, units.Current) }

// result turns the solved unknowns into net and part values.
func (m *model) result() *Result {
	d := m.d
	r := &Result{
		NetV: make([]float64, len(d.Nets)),
		V:    make([]float64, len(d.Parts)), I: make([]float64, len(d.Parts)),
		P: make([]float64, len(d.Parts)), Junction: make([]float64, len(d.Parts)),
		Unknowns: m.n, Iterations: m.iters, Linear: m.lin.kind(), MNA: m.mna,
	}
	if m.ddFactor != nil {
		r.Cond = m.ddFactor.cond(m.sys)
	} else {
		r.Cond = m.lin.cond()
	}
	r.CondEstimated = r.Cond > 0
	for i := range m.node {
		v := m.netDD(circuit.NetID(i))
		r.NetV[i] = v.hi + v.lo
	}
	r.Uncertified = m.uncertified
	r.Floating = m.floating
	r.RefineSteps = m.refineSteps
	for k := range m.junc {
		j := &m.junc[k]
		r.I[j.part] = j.iLin
		r.Junction[j.part] = j.vLast
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		// The difference of the double-double net voltages: a microvolt
		// across a milliohm between nets at kilovolts keeps its digits.
		vd := m.netDD(p.Pins[0]).sub(m.netDD(p.Pins[1]))
		v := vd.hi + vd.lo
		r.V[i] = v
		switch dc := p.DC(); dc.Model {
		case circuit.Conductance:
			r.I[i] = (v - dc.E) / dc.R
		case circuit.VoltageDrop:
			if k := m.branch[i]; k >= 0 {
				r.I[i] = m.x[k]
			}
		case circuit.CurrentFlow:
			r.I[i] = p.Value
		}
	}
	m.loadCurrents(r)
	m.shortCurrents(r)
	for i := range d.Parts {
		r.P[i] = r.V[i] * r.I[i]
	}
	return r
}

// netDD returns net i's voltage in double-double from the solution x + xlo.
func (m *model) netDD(i circuit.NetID) dd {
	v := dd{m.lambda * m.off[i], 0}
	if k := m.node[i]; k >= 0 {
		v = v.add(dd{m.x[k], m.xlo[k]})
	}
	return v
}

// shortCurrents recovers the currents of the merged shorts and eliminated
// voltage sources by Kirchhoff's current law over their forest: each
// carries whatever the nets beyond it draw through other parts. Shorts that
// close a loop of shorts carry 0 A.
func (m *model) shortCurrents(r *Result) {
	d := m.d
	nn := len(d.Nets)
	out := make([]float64, nn) // current leaving each net through non-tree parts
	deg := make([]int32, nn+1)
	any := false
	for i := range d.Parts {
		p := &d.Parts[i]
		if m.tree[i] {
			deg[p.Pins[0]+1]++
			deg[p.Pins[1]+1]++
			any = true
			continue
		}
		out[p.Pins[0]] += r.I[i]
		out[p.Pins[1]] -= r.I[i]
	}
	if !any {
		return
	}
	for i := 0; i < nn; i++ {
		deg[i+1] += deg[i]
	}
	adj := make([]int32, deg[nn])
	fill := append([]int32(nil), deg[:nn]...)
	for i := range d.Parts {
		if m.tree[i] {
			p := &d.Parts[i]
			adj[fill[p.Pins[0]]] = int32(i)
			fill[p.Pins[0]]++
			adj[fill[p.Pins[1]]] = int32(i)
			fill[p.Pins[1]]++
		}
	}
	seen := make([]bool, nn)
	via := make([]int32, nn) // the tree part towards the root
	var order []int32
	for s := 0; s < nn; s++ {
		if seen[s] || deg[s] == deg[s+1] {
			continue
		}
		seen[s] = true
		via[s] = -1
		start := len(order)
		order = append(order, int32(s))
		for q := start; q < len(order); q++ {
			u := order[q]
			for _, e := range adj[deg[u]:deg[u+1]] {
				p := &d.Parts[e]
				w := int32(p.Pins[0])
				if w == u {
					w = int32(p.Pins[1])
				}
				if !seen[w] {
					seen[w] = true
					via[w] = e
					order = append(order, w)
				}
			}
		}
	}
	for q := len(order) - 1; q >= 0; q-- {
		u := order[q]
		e := via[u]
		if e < 0 {
			continue
		}
		p := &d.Parts[e]
		f := out[u] // must flow into u through e
		parent := p.Pins[0]
		if int32(parent) == u {
			parent = p.Pins[1]
			r.I[e] = -f
		} else {
			r.I[e] = f
		}
		out[parent] += f
		out[u] = 0
	}
}

// selfCheck verifies Kirchhoff's current law at every net and Tellegen's
// theorem, and records the residuals.
func (r *Result) selfCheck(d *circuit.Design) error {
	res := make([]float64, len(d.Nets))
	for i := range d.Parts {
		p := &d.Parts[i]
		if mp := r.multiAt(circuit.PartID(i)); mp != nil {
			for k, n := range p.Nets() {
				res[n] += mp.I[k]
				r.KCLScale = math.Max(r.KCLScale, math.Abs(mp.I[k]))
			}
			r.PowerSum += r.P[i]
			r.PowerScale += math.Abs(r.P[i])
			continue
		}
		res[p.Pins[0]] += r.I[i]
		res[p.Pins[1]] -= r.I[i]
		r.KCLScale = math.Max(r.KCLScale, math.Abs(r.I[i]))
		// A current worked out from two node voltages is only as precise
		// as the voltages: scale by what the part would carry with one end
		// at 0 V.
		if g := conductance(p); g > 0 {
			r.KCLScale = math.Max(r.KCLScale, g*math.Max(math.Abs(r.NetV[p.Pins[0]]), math.Abs(r.NetV[p.Pins[1]])))
		}
		r.PowerSum += r.P[i]
		r.PowerScale += math.Abs(r.P[i])
	}
	tol := KCLTol*r.KCLScale + 1e-18 // an attoampere floor for circuits with no current at all
	var bad []circuit.NetID
	for i, v := range res {
		if r.Floating != nil && r.Floating[i] {
			continue // its voltage, and so its balance, is not solved for
		}
		r.KCL = math.Max(r.KCL, math.Abs(v))
		if math.Abs(v) > tol || math.IsNaN(v) {
			bad = append(bad, circuit.NetID(i))
		}
	}
	if len(bad) > 0 {
		sort.Slice(bad, func(a, b int) bool { return math.Abs(res[bad[a]]) > math.Abs(res[bad[b]]) })
		return &Error{Kind: SelfCheck, Nets: bad,
			Msg: fmt.Sprintf("the solution breaks Kirchhoff's current law: %s does not balance at net %s (largest part current %s)", fmtA(res[bad[0]]), d.NetName(bad[0]), fmtA(r.KCLScale))}
	}
	vmax := 0.0
	for _, v := range r.NetV {
		vmax = math.Max(vmax, math.Abs(v))
	}
	// The powers of a solution that meets KCL to within its residual sum
	// to at most the largest voltage times the residuals.
	if math.Abs(r.PowerSum) > TellegenTol*math.Max(r.PowerScale, vmax*r.KCLScale)+1e-24 || math.IsNaN(r.PowerSum) {
		return &Error{Kind: SelfCheck,
			Msg: fmt.Sprintf("the part powers sum to %s, not zero (Tellegen's theorem)", units.Format(r.PowerSum, units.Power))}
	}
	return nil
}

// conductance returns the DC conductance of a linear resistive part, or 0.
func conductance(p *circuit.Part) float64 {
	if dc := p.DC(); (dc.Model == circuit.Conductance || dc.Model == circuit.Junction) && dc.R > 0 {
		return 1 / dc.R
	}
	return 0
}

// Span returns the parts with the smallest and largest resistance in d
// (resistors, dcr of inductors and fuses, series resistance of junctions),
// for saying why a system is ill-conditioned. ok is false when d has fewer
// than two such values.
func Span(d *circuit.Design) (lo, hi circuit.PartID, rlo, rhi float64, ok bool) {
	rlo, rhi = math.Inf(1), 0
	n := 0
	for i := range d.Parts {
		p := &d.Parts[i]
		var v float64
		if dc := p.DC(); dc.Model == circuit.Conductance || dc.Model == circuit.Junction {
			v = dc.R
		}
		if v <= 0 {
			continue
		}
		n++
		if v < rlo {
			rlo, lo = v, circuit.PartID(i)
		}
		if v > rhi {
			rhi, hi = v, circuit.PartID(i)
		}
	}
	return lo, hi, rlo, rhi, n >= 2
}
