// determinacy.go: what the circuit leaves undetermined: loops of ideal shorts and voltage sources (their currents), sections with no DC path to ground (their voltages), and the parallel groups of ideal shorts whose total current is determined though its split is not

package solve

import (
	"fmt"
	"math"
	"sort"

	"nodal/circuit"
	"nodal/units"
)

// Unknown says which of a part's values the circuit does not determine.
type Unknown uint8

const (
	// UnknownCurrent: the part closes a loop of ideal shorts and voltage
	// sources, around which any current may circulate.
	UnknownCurrent Unknown = 1 << iota
	// UnknownVoltage: a pin of the part is on a net with no DC path to
	// ground, so its voltage is not determined.
	UnknownVoltage
)

// ShortGroup is a set of ideal shorts in parallel between the same two
// nets and no other path of shorts or sources: the current through the
// group is determined, its split between the members is not.
type ShortGroup struct {
	Parts []circuit.PartID // by name
	// I is the group's current from From to To, the pins of Parts[0].
	I        float64
	From, To circuit.NetID
}

// loopTol is the relative mismatch under which the voltages around a
// loop of sources count as summing to zero, as topology.Loop.Balanced
// judges it.
const loopTol = 1e-9

// findClosing returns, per part, whether it closes a loop of ideal shorts
// and voltage sources (nil when none does), by a weighted union–find over
// those parts in statement order (each net carries its potential above its
// parent). A loop whose voltages do not sum to zero is an *Error: no
// solution exists.
func findClosing(d *circuit.Design) ([]bool, error) {
	var closing []bool
	uf := newPotentialUF(len(d.Nets))
	for i := range d.Parts {
		p := &d.Parts[i]
		dc := p.DC()
		if dc.Model != circuit.Short && dc.Model != circuit.VoltageDrop {
			continue
		}
		v := 0.0
		if dc.Model == circuit.VoltageDrop {
			v = p.Value
		}
		if ok, sum, scale := uf.union(int32(p.Pins[0]), int32(p.Pins[1]), v); !ok {
			if math.Abs(sum) > loopTol*scale {
				return nil, &Error{Kind: Singular, Parts: []circuit.PartID{circuit.PartID(i)},
					Msg: fmt.Sprintf("%s closes a loop of voltage sources and ideal shorts whose voltages sum to %s, not zero, so no operating point exists", d.NameOf(p), units.Format(sum, units.Voltage))}
			}
			if closing == nil {
				closing = make([]bool, len(d.Parts))
			}
			closing[i] = true
		}
	}
	return closing, nil
}

// potentialUF is a union–find whose every element carries its potential
// above its parent.
type potentialUF struct {
	parent []int32
	pot    []float64
	// vmax is the largest voltage joined so far: the potentials compared
	// when a loop closes are sums along paths through such voltages, and
	// carry their rounding.
	vmax float64
}

func newPotentialUF(n int) *potentialUF {
	u := &potentialUF{parent: make([]int32, n), pot: make([]float64, n)}
	for i := range u.parent {
		u.parent[i] = int32(i)
	}
	return u
}

// find returns the root of x and V(x) − V(root), compressing the path.
func (u *potentialUF) find(x int32) (int32, float64) {
	r, s := x, 0.0
	for u.parent[r] != r {
		s += u.pot[r]
		r = u.parent[r]
	}
	for y, t := x, s; u.parent[y] != y; {
		next, py := u.parent[y], u.pot[y]
		u.parent[y], u.pot[y] = r, t
		t -= py
		y = next
	}
	return r, s
}

// union joins a and b with V(a) − V(b) = v. When they are already joined
// it returns false, by how much the existing potentials miss v, and the
// scale to judge the miss by: the largest of the voltages compared and of
// those joined so far, whose rounding the potentials carry (two wires in
// parallel on a net 0.3 V below ground, reached through a 5 V source, can
// miss by 1e-16 V with both potentials near 0).
func (u *potentialUF) union(a, b int32, v float64) (joined bool, miss, scale float64) {
	ra, pa := u.find(a)
	rb, pb := u.find(b)
	u.vmax = math.Max(u.vmax, math.Abs(v))
	if ra == rb {
		return false, (pa - pb) - v, math.Max(u.vmax, math.Max(math.Abs(pa), math.Abs(pb)))
	}
	u.parent[ra], u.pot[ra] = rb, v-pa+pb
	return true, 0, 0
}

// findFloating returns, per net, whether it has pins but no DC path to
// ground (nil when every net has one).
func findFloating(d *circuit.Design) []bool {
	if d.Ground == circuit.NoNet {
		return nil
	}
	uf := newPotentialUF(len(d.Nets))
	for i := range d.Parts {
		if p := &d.Parts[i]; p.ConductsDC() {
			uf.union(int32(p.Pins[0]), int32(p.Pins[1]), 0)
		}
	}
	g, _ := uf.find(int32(d.Ground))
	var out []bool
	for i := range d.Nets {
		if r, _ := uf.find(int32(i)); r != g && d.Nets[i].Pins > 0 {
			if out == nil {
				out = make([]bool, len(d.Nets))
			}
			out[i] = true
		}
	}
	return out
}

// markUndetermined records in r what the circuit leaves open, once the
// self-checks have passed on the particular solution (which puts the whole
// current of a loop in one of its parts): the currents of every ideal
// short and voltage source in a loop of them — the parts of the graph of
// such parts that are not bridges — read 0 and are marked; a group of
// parallel shorts gets its determined total; parts touching a net with no
// DC path get their voltage (and, unless the part fixes it, current)
// marked.
func (m *model) markUndetermined(r *Result) {
	d := m.d
	mark := func(i int, u Unknown) {
		if r.Undetermined == nil {
			r.Undetermined = make([]Unknown, len(d.Parts))
		}
		r.Undetermined[i] |= u
	}
	if m.floating != nil {
		for i := range d.Parts {
			p := &d.Parts[i]
			if !m.floating[p.Pins[0]] && !m.floating[p.Pins[1]] {
				continue
			}
			u := UnknownVoltage
			switch p.DC().Model {
			case circuit.Open, circuit.CurrentFlow:
			default:
				u |= UnknownCurrent
			}
			mark(i, u)
		}
	}
	if m.closing != nil {
		inLoop := m.loopParts()
		groups := map[int32][]circuit.PartID{} // by a net of each 2-edge-connected component
		comp := newPotentialUF(len(d.Nets))
		for i, in := range inLoop {
			if in {
				p := &d.Parts[i]
				comp.union(int32(p.Pins[0]), int32(p.Pins[1]), 0)
			}
		}
		for i, in := range inLoop {
			if in {
				c, _ := comp.find(int32(d.Parts[i].Pins[0]))
				groups[c] = append(groups[c], circuit.PartID(i))
			}
		}
		keys := make([]int32, 0, len(groups))
		for k := range groups {
			keys = append(keys, k)
		}
		sort.Slice(keys, func(a, b int) bool { return keys[a] < keys[b] })
		for _, k := range keys {
			if g, ok := m.parallelGroup(r, groups[k]); ok {
				r.Groups = append(r.Groups, g)
			}
		}
		sort.Slice(r.Groups, func(a, b int) bool { return d.CompareParts(r.Groups[a].Parts[0], r.Groups[b].Parts[0]) < 0 })
		for i, in := range inLoop {
			if in {
				mark(i, UnknownCurrent)
			}
		}
	}
	for i, u := range r.Undetermined {
		if u&UnknownCurrent != 0 {
			r.I[i] = 0
		}
		if u&UnknownVoltage != 0 {
			r.V[i] = 0
		}
		if u != 0 {
			r.P[i] = 0
		}
	}
}

// parallelGroup returns the group of shorts that parts form when they are
// all ideal shorts between the same two nets, with its total current.
func (m *model) parallelGroup(r *Result, parts []circuit.PartID) (ShortGroup, bool) {
	d := m.d
	sort.Slice(parts, func(a, b int) bool { return d.CompareParts(parts[a], parts[b]) < 0 })
	first := &d.Parts[parts[0]]
	g := ShortGroup{Parts: parts, From: first.Pins[0], To: first.Pins[1]}
	if g.From == g.To {
		return g, false
	}
	for _, id := range parts {
		p := &d.Parts[id]
		if p.DC().Model != circuit.Short {
			return g, false
		}
		switch [2]circuit.NetID{p.Pins[0], p.Pins[1]} {
		case [2]circuit.NetID{g.From, g.To}:
			g.I += r.I[id]
		case [2]circuit.NetID{g.To, g.From}:
			g.I -= r.I[id]
		default:
			return g, false
		}
	}
	return g, true
}

// loopParts returns, per part, whether it lies on a loop of ideal shorts
// and voltage sources: the closing parts and every part of the spanning
// forest on the path between a closing part's ends. Paths are marked by
// walking both ends up to where they meet; an edge marked once is jumped
// over afterwards (a union–find over marked edges), so the whole costs
// near-linear time (Tarjan, "Efficiency of a good but not linear set union
// algorithm", J. ACM 22(2), 1975, from memory).
func (m *model) loopParts() []bool {
	d := m.d
	n := len(d.Nets)
	in := make([]bool, len(d.Parts))
	// The forest: voltage-defining parts that do not close a loop.
	head := make([]int32, n)
	for i := range head {
		head[i] = -1
	}
	next := make([]int32, 0, 2*len(d.Parts))
	to := make([]int32, 0, 2*len(d.Parts))
	via := make([]int32, 0, 2*len(d.Parts))
	link := func(a, b int32, part int32) {
		to = append(to, b)
		via = append(via, part)
		next = append(next, head[a])
		head[a] = int32(len(to) - 1)
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		if !p.IsVoltageDefining() || m.closing[i] {
			continue
		}
		a, b := int32(p.Pins[0]), int32(p.Pins[1])
		link(a, b, int32(i))
		link(b, a, int32(i))
	}
	parent := make([]int32, n)
	edge := make([]int32, n)
	depth := make([]int32, n)
	for i := range depth {
		depth[i] = -1
	}
	var queue []int32
	for s := 0; s < n; s++ {
		if depth[s] >= 0 {
			continue
		}
		depth[s], parent[s], edge[s] = 0, int32(s), -1
		queue = append(queue[:0], int32(s))
		for q := 0; q < len(queue); q++ {
			u := queue[q]
			for e := head[u]; e >= 0; e = next[e] {
				if w := to[e]; depth[w] < 0 {
					depth[w], parent[w], edge[w] = depth[u]+1, u, via[e]
					queue = append(queue, w)
				}
			}
		}
	}
	up := make([]int32, n) // up[x] = x until x's edge to its parent is marked
	for i := range up {
		up[i] = int32(i)
	}
	var top func(x int32) int32
	top = func(x int32) int32 {
		for up[x] != x {
			up[x] = up[up[x]]
			x = up[x]
		}
		return x
	}
	for i, c := range m.closing {
		if !c {
			continue
		}
		in[i] = true
		p := &d.Parts[i]
		a, b := top(int32(p.Pins[0])), top(int32(p.Pins[1]))
		for a != b {
			if depth[a] < depth[b] {
				a, b = b, a
			}
			in[edge[a]] = true
			up[a] = parent[a]
			a = top(a)
		}
	}
	return in
}
