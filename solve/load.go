// load.go: constant-power loads, solved by their closed form against the Thévenin equivalent the rest of the circuit presents.

package solve

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/units"
)

// powerLoad is the iteration state of one constant-power load: a part
// that draws P = V·I from its first pin to its second.
//
// A constant-power load has a negative incremental resistance, −V²/P,
// which a Newton step would stamp into the otherwise positive-definite
// nodal system. Instead each load is stamped as the current it drew at
// the last iterate, and after every linear solve the Thévenin equivalent
// the rest of the circuit presents at its pins (V_th, R_th, the latter by
// one more solve with the same factors) gives its new voltage in closed
// form: V² − V_th·V + P·R_th = 0, whose upper root
// V = (V_th + √(V_th² − 4·P·R_th))/2 is the stable operating point
// (algebra; the maximum power transfer theorem bounds P by V_th²/(4·R_th)).
// A lone load in a linear circuit is exact after one step; loads that
// share a rail settle by repeating it, each seeing the others' currents
// held.
type powerLoad struct {
	part     circuit.PartID
	p        float64 // W
	i        float64 // the current stamped in the last assembly
	next     float64 // the current the closed form gives for the next
	vth, rth float64 // the Thévenin equivalent at the last iterate
	starved  bool    // p > vth²/(4·rth): no operating point can feed it
}

func fmtW(v float64) string { return units.Format(v, units.Power) }
func fmtR(v float64) string { return units.Format(v, units.Resistance) }

// addLoads collects the constant-power loads of the design.
func (m *model) addLoads() {
	for i := range m.d.Parts {
		p := &m.d.Parts[i]
		if p.DC().Model == circuit.ConstantPower {
			m.loads = append(m.loads, powerLoad{part: circuit.PartID(i), p: p.Value})
		}
	}
}

// nonlinear reports whether the design needs iterating: junctions or
// constant-power loads.
func (m *model) nonlinear() bool { return len(m.junc) > 0 || len(m.loads) > 0 }

// stampLoads injects each load's current, scaled like the sources.
func (m *model) stampLoads() {
	for k := range m.loads {
		l := &m.loads[k]
		p := &m.d.Parts[l.part]
		m.sys.inject(m.node[p.Pins[0]], -m.lambda*l.i)
		m.sys.inject(m.node[p.Pins[1]], m.lambda*l.i)
	}
}

// updateLoads works out each load's next current from the solution xn of
// the system just factorised, and reports whether every load settled.
func (m *model) updateLoads(xn []float64) bool {
	if len(m.loads) == 0 {
		return true
	}
	var direct func([]float64)
	if raw, ok := m.lin.direct(); ok && m.ddFactor == nil {
		direct = raw
	}
	z := make([]float64, m.n)
	settled := true
	for k := range m.loads {
		l := &m.loads[k]
		p := &m.d.Parts[l.part]
		a, b := m.node[p.Pins[0]], m.node[p.Pins[1]]
		v := m.netV(xn, p.Pins[0]) - m.netV(xn, p.Pins[1])
		// R_th: the voltage a unit current drawn from pin 0 to pin 1
		// lowers the pins by, from the same factors.
		clear(z)
		if a >= 0 {
			z[a] = -1
		}
		if b >= 0 {
			z[b] = 1
		}
		rth := 0.0
		switch {
		case a == b:
		case direct != nil:
			direct(z)
			rth = m.volt(z, b) - m.volt(z, a)
		default:
			if err := m.lin.solve(z); err == nil {
				rth = m.volt(z, b) - m.volt(z, a)
			}
		}
		pw := m.lambda * l.p
		l.vth, l.rth, l.starved = v+rth*l.i, rth, false
		// Across pins tied by shorts and sources (a == b) the voltage is a
		// difference of offsets: 0 to rounding when the pins are shorted,
		// whatever order the offsets were summed in. The rounding is that
		// of the offsets summed on the way, which may be larger than the
		// two nets' own voltages (two nets at 0 V reached through a 1.8 V
		// source and back), so it is judged against the largest offset
		// too.
		scale := math.Abs(m.netV(xn, p.Pins[0])) + math.Abs(m.netV(xn, p.Pins[1])) + math.Abs(m.lambda)*m.offMax
		if a == b && math.Abs(v) <= 1e-12*scale {
			v = 0
		}
		// Likewise V_th, a sum of terms that may cancel: where it is 0 V
		// to within their rounding, it is 0 V, whatever order the
		// statements put the terms in.
		if math.Abs(l.vth) <= 1e-12*(scale+math.Abs(rth*l.i)) {
			l.vth = 0
		}
		switch disc := l.vth*l.vth - 4*pw*rth; {
		case pw == 0:
			// Asked for no power, it draws nothing at any voltage: not
			// starved where the rail sits at or a rounding below 0 V.
			l.next = 0
		case !(rth > 0) && v == 0:
			// Held at no voltage: no current can draw its power.
			l.vth, l.starved = v, true
			l.next = 0
		case !(rth > 0):
			// Held by a voltage: its current follows at once.
			l.next = pw / v
		case pw > 0 && (disc < 0 || l.vth <= 0):
			// Past what the rail can give: draw the most it can, at half
			// its voltage, and say so if it stays there. (A load that
			// gives power, pw < 0, has a positive upper root always:
			// disc > V_th².)
			l.starved = true
			l.next = l.vth / (2 * rth)
		default:
			l.next = pw / ((l.vth + math.Sqrt(disc)) / 2)
		}
		if math.IsNaN(l.next) || math.IsInf(l.next, 0) {
			l.next = 0
			l.starved = true
		}
		if l.starved || math.Abs(l.next-l.i) > vTolRel*math.Abs(l.next)+1e-18 {
			settled = false
		}
	}
	return settled
}

// advanceLoads stamps each load's next current from the next assembly on.
func (m *model) advanceLoads() {
	for k := range m.loads {
		m.loads[k].i = m.loads[k].next
	}
}

// starvedError names the loads that no operating point can feed, or
// returns nil.
func (m *model) starvedError() error {
	var parts []circuit.PartID
	var msgs []string
	for k := range m.loads {
		l := &m.loads[k]
		if !l.starved {
			continue
		}
		p := &m.d.Parts[l.part]
		parts = append(parts, l.part)
		who, pins := p.Kind.String()+" "+m.d.NameOf(p), "pos not above neg"
		if m.label != nil {
			if s, ok := m.label(l.part); ok {
				who, pins = s, "in not above common"
			}
		}
		if !(l.vth > 0) {
			msgs = append(msgs, fmt.Sprintf("%s demands %s, more power than the rail can deliver: the circuit puts %s across it, %s",
				who, fmtW(l.p), fmtV(l.vth), pins))
			continue
		}
		msgs = append(msgs, fmt.Sprintf("%s demands %s, more power than the rail can deliver: at most %s, from %s behind %s (maximum power transfer)",
			who, fmtW(l.p), fmtW(l.vth*l.vth/(4*l.rth)), fmtV(l.vth), fmtR(l.rth)))
	}
	if len(parts) == 0 {
		return nil
	}
	return &Error{Kind: Starved, Parts: parts, Msg: joinMsgs(msgs)}
}

// loadCurrents records each load's current, the one its last solve used,
// which Kirchhoff's law holds the solution to.
func (m *model) loadCurrents(r *Result) {
	for k := range m.loads {
		r.I[m.loads[k].part] = m.loads[k].i
	}
}
