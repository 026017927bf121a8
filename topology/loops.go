package topology

// loops.go: fundamental loops of the subgraph of voltage-defining parts.
// A spanning forest is grown with union–find; every part that closes a
// cycle gives one fundamental loop, the part plus the forest path between
// its ends, found by walking both ends up to their lowest common ancestor.
// The forest is kept in flat slices indexed by net, so the cost is linear
// in parts and nets however many voltage-defining parts there are.

import (
	"sort"

	"nodal/circuit"
)

func findLoops(d *circuit.Design, r *Result) {
	n := len(d.Nets)
	uf := newUnionFind(n)
	var closing []circuit.PartID
	// Forest adjacency over the tree parts, as linked lists in slices:
	// head[net] is the first edge, next[e] the one after it.
	type edge struct {
		to   int32
		part circuit.PartID
	}
	var edges []edge
	var next []int32
	var head []int32
	link := func(a, b int32, part circuit.PartID) {
		if head == nil {
			head = make([]int32, n)
			for i := range head {
				head[i] = -1
			}
		}
		edges = append(edges, edge{b, part})
		next = append(next, head[a])
		head[a] = int32(len(edges) - 1)
	}
	// The parts in name order, not statement order, so that which parts
	// close loops, and so the loops reported, do not depend on the order
	// the statements are written in (names are unique).
	var order []circuit.PartID
	for i := range d.Parts {
		if p := &d.Parts[i]; p.IsVoltageDefining() && !p.ShortedAcross() {
			order = append(order, circuit.PartID(i))
		}
	}
	sort.Slice(order, func(x, y int) bool { return d.CompareParts(order[x], order[y]) < 0 })
	for _, i := range order {
		na, nb := d.Parts[i].Ends()
		a, b := int32(na), int32(nb)
		if uf.union(a, b) {
			link(a, b, i)
			link(b, a, i)
			continue
		}
		closing = append(closing, i)
	}
	if len(closing) == 0 {
		return
	}
	// Parent pointers and depths by a breadth-first walk of each tree,
	// rooted at the first pin that reaches it, in part order.
	parent := make([]int32, n)
	via := make([]circuit.PartID, n)
	depth := make([]int32, n)
	for i := range depth {
		depth[i] = -1
	}
	var queue []int32
	for _, i := range order {
		na, nb := d.Parts[i].Ends()
		for _, start := range [2]circuit.NetID{na, nb} {
			s := int32(start)
			if depth[s] >= 0 || head[s] < 0 {
				continue
			}
			depth[s] = 0
			parent[s] = -1
			queue = append(queue[:0], s)
			for len(queue) > 0 {
				x := queue[0]
				queue = queue[1:]
				for e := head[x]; e >= 0; e = next[e] {
					to := edges[e].to
					if depth[to] >= 0 {
						continue
					}
					depth[to] = depth[x] + 1
					parent[to] = x
					via[to] = edges[e].part
					queue = append(queue, to)
				}
			}
		}
	}
	for k, c := range closing {
		if k >= MaxLoops {
			r.LoopsLeft = len(closing) - MaxLoops
			break
		}
		na, nb := d.Parts[c].Ends()
		a, b := int32(na), int32(nb)
		// The loop: a → (p) → b, then the forest path b → lca → a.
		var up, down []Step // up: from b towards the lca; down: from a towards the lca
		x, y := b, a
		for depth[x] > depth[y] {
			up = append(up, Step{Part: via[x], From: circuit.NetID(x), To: circuit.NetID(parent[x])})
			x = parent[x]
		}
		for depth[y] > depth[x] {
			down = append(down, Step{Part: via[y], From: circuit.NetID(parent[y]), To: circuit.NetID(y)})
			y = parent[y]
		}
		for x != y {
			up = append(up, Step{Part: via[x], From: circuit.NetID(x), To: circuit.NetID(parent[x])})
			x = parent[x]
			down = append(down, Step{Part: via[y], From: circuit.NetID(parent[y]), To: circuit.NetID(y)})
			y = parent[y]
		}
		steps := make([]Step, 0, 1+len(up)+len(down))
		steps = append(steps, Step{Part: c, From: circuit.NetID(a), To: circuit.NetID(b)})
		steps = append(steps, up...)
		for i := len(down) - 1; i >= 0; i-- {
			steps = append(steps, down[i])
		}
		l := Loop{Steps: steps}
		hasSource := false
		for _, s := range steps {
			q := &d.Parts[s.Part]
			if q.DC().Model != circuit.VoltageDrop {
				continue
			}
			hasSource = true
			// V(pos) − V(neg) = Value; a step from neg to pos rises by Value.
			rise := q.Value
			if pos, _ := q.Ends(); s.From == pos {
				rise = -rise
			}
			l.Sum += rise
			l.Scale = max(l.Scale, abs(q.Value))
		}
		if hasSource {
			r.Loops = append(r.Loops, l)
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
