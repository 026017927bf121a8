package topology

// loops.go: fundamental loops of the subgraph of voltage-defining parts.
// A spanning forest is grown with union–find; every part that closes a
// cycle gives one fundamental loop, the part plus the forest path between
// its ends, found by walking both ends up to their lowest common ancestor.

import (
	"nodal/circuit"
)

func findLoops(d *circuit.Design, r *Result) {
	n := len(d.Nets)
	uf := newUnionFind(n)
	var closing []circuit.PartID
	// Forest adjacency, built only over the tree parts.
	type edge struct {
		to   int32
		part circuit.PartID
	}
	adj := map[int32][]edge{}
	for i := range d.Parts {
		p := &d.Parts[i]
		if !p.IsVoltageDefining() || p.Pins[0] == p.Pins[1] {
			continue
		}
		a, b := int32(p.Pins[0]), int32(p.Pins[1])
		if uf.union(a, b) {
			adj[a] = append(adj[a], edge{b, circuit.PartID(i)})
			adj[b] = append(adj[b], edge{a, circuit.PartID(i)})
			continue
		}
		closing = append(closing, circuit.PartID(i))
	}
	if len(closing) == 0 {
		return
	}
	// Parent pointers and depths by a breadth-first walk of each tree.
	parent := map[int32]int32{}
	via := map[int32]circuit.PartID{}
	depth := map[int32]int32{}
	for i := range d.Parts {
		p := &d.Parts[i]
		for _, start := range p.Pins {
			s := int32(start)
			if _, ok := depth[s]; ok || len(adj[s]) == 0 {
				continue
			}
			depth[s] = 0
			parent[s] = -1
			queue := []int32{s}
			for len(queue) > 0 {
				x := queue[0]
				queue = queue[1:]
				for _, e := range adj[x] {
					if _, ok := depth[e.to]; ok {
						continue
					}
					depth[e.to] = depth[x] + 1
					parent[e.to] = x
					via[e.to] = e.part
					queue = append(queue, e.to)
				}
			}
		}
	}
	for k, c := range closing {
		if k >= MaxLoops {
			r.LoopsLeft = len(closing) - MaxLoops
			break
		}
		p := &d.Parts[c]
		a, b := int32(p.Pins[0]), int32(p.Pins[1])
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
			if q.Kind != circuit.VoltageSource {
				continue
			}
			hasSource = true
			// V(pos) − V(neg) = Value; a step from neg to pos rises by Value.
			rise := q.Value
			if s.From == q.Pins[0] {
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
