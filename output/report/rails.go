package report

// rails.go: the power tree. It is drawn from the kinds table and the solved
// operating point alone, never from kind names:
//
//   - a supply is a part whose kind declares a Supply; the net on its Out
//     pin, with every net joined to it by ideal shorts (wires, closed
//     switches, fuses and inductors with no dcr), is the rail it drives;
//     a supply whose Out pin is on ground drives the net on its reference
//     pin instead, a rail below ground;
//   - a supply whose input pin is on a rail hangs under that rail's
//     supply; one whose input is on no rail, and one that draws from no
//     rail (a source, a battery, a port's drive), is a root of the tree;
//   - every other pin on a rail is a part the rail feeds, with the current
//     it takes there (Kirchhoff's current law: these add up to what the
//     rail's supplies deliver). Loads and resistors alike: a part counts
//     by the current it takes, not by its kind. Parts that take nothing
//     at DC and cannot (a capacitor, an open switch) are left out;
//   - past a part that takes current from a rail into a net no rail
//     drives and the tree has not reached yet, the tree goes on: the
//     supplies whose input is on that net hang under the part (a
//     converter behind its input fuse), then the other parts on it, up to
//     maxDepth parts deep, breadth first, so that each part is drawn once
//     (a part on two rails is drawn under both).
//
// Several supplies on one rail are all shown; the first by name lists the
// rail's parts, the others say which one does. Supplies that feed each
// other in a loop are drawn once, and the loop is said where it closes.
// Every figure comes from package rules (Point.SupplyFlow, Point.PinCurrent,
// Judge).

import (
	"sort"

	"nodal/circuit"
	"nodal/rules"
)

// Supply is one supply-like part in the power tree, with the rail it
// drives and what that rail feeds.
type Supply struct {
	Name string
	Kind circuit.Kind
	// Rail is the net the supply drives (at its Out pin, or at its
	// reference for a rail below ground), Ref the net it is held against.
	Rail, Ref string
	// RefGround says Ref is the design's ground (or tied to it by ideal
	// shorts).
	RefGround bool
	// Flow is its energy balance (rules.SupplyFlow), when Judged; a
	// supply whose flow this version cannot work out is listed with it
	// unjudged, and said so.
	Flow   rules.Flow
	Judged bool
	// Set is the part's value, the output it is set to hold.
	Set float64
	// Use is the worst use of its ratings, when HasUse.
	Use    rules.Use
	HasUse bool
	// Input is the net its input pin is on ("" for a supply that draws
	// from no rail); Unfed says no supply drives that net.
	Input string
	Unfed bool
	// Alongside names the supply that lists the parts of a rail this one
	// shares; "" when this one lists them.
	Alongside string
	// Loop says the supply was reached again round a loop of supplies
	// feeding each other: it is drawn in full where it first appears,
	// and here without its children. InLoop marks where a loop is first
	// drawn (none of its supplies is fed from outside the loop).
	Loop, InLoop bool
	// Feeds are the supplies whose input is on this rail, worst use
	// first; Loads the other parts on the rail, worst use first.
	Feeds []*Supply
	Loads []*Load
}

// Load is a part on a rail, other than a supply fed from it.
type Load struct {
	Name string
	Kind circuit.Kind
	// Current is what the part takes from the rail at its pin there
	// (negative when it feeds the rail); Power what the part itself
	// absorbs, as in the parts table.
	Current, Power float64
	// Towards names the nets of its other pins, but ground and the
	// rail's reference: where its current goes on to ("" for a part
	// across the rail).
	Towards                        []string
	CurrentUnknown, VoltageUnknown bool
	Use                            rules.Use
	HasUse                         bool
	// Net is the net the part leads its current on to, when the tree
	// follows it there (the first part to reach it, one net beyond, up
	// to maxDepth deep); Feeds are then the supplies whose input is on
	// that net, and Loads the other parts on it, worst first.
	Net   string
	Feeds []*Supply
	Loads []*Load
}

// netSets joins the nets that ideal shorts tie together (union–find).
type netSets []int32

func (s netSets) find(n circuit.NetID) int32 {
	i := int32(n)
	for s[i] != i {
		s[i] = s[s[i]]
		i = s[i]
	}
	return i
}

func (s netSets) union(a, b circuit.NetID) {
	ra, rb := s.find(a), s.find(b)
	if ra != rb {
		s[max(ra, rb)] = min(ra, rb)
	}
}

// maxDepth is how many parts deep the tree follows current past a rail.
const maxDepth = 8

// pinRef is one pin of one part.
type pinRef struct {
	part circuit.PartID
	pin  int32
}

// buildRails draws the power tree of d at the operating point pt, with
// uses the judged ratings of every part (by PartID). It returns the roots,
// and how many parts (not supplies, not ideal shorts) the tree does not
// reach.
func buildRails(d *circuit.Design, pt *rules.Point, uses [][]rules.Use) (roots []*Supply, offTree int) {
	sets := make(netSets, len(d.Nets))
	for i := range sets {
		sets[i] = int32(i)
	}
	var supplies []circuit.PartID
	for i := range d.Parts {
		q := &d.Parts[i]
		switch {
		case q.Kind.Info().Supply != nil:
			supplies = append(supplies, circuit.PartID(i))
		case q.IsShort():
			sets.union(q.Ends())
		}
	}
	if len(supplies) == 0 {
		return nil, 0
	}
	ground := int32(-1)
	if d.Ground != circuit.NoNet {
		ground = sets.find(d.Ground)
	}
	// The nodes, and the rail (a set of nets) each drives.
	nodes := make(map[circuit.PartID]*Supply, len(supplies))
	railOf := make(map[circuit.PartID]int32, len(supplies))
	railPin := make(map[circuit.PartID]int, len(supplies)) // the pin on the rail it drives
	primary := map[int32]circuit.PartID{}                  // rail → the supply that lists its parts
	refOf := map[circuit.PartID]int32{}                    // supply → its reference's set
	for _, id := range supplies {
		q := &d.Parts[id]
		s := q.Kind.Info().Supply
		out, ref := q.Pins[s.Out], q.Pins[s.OutRef]
		railPin[id] = s.Out
		flow, ok := pt.SupplyFlow(q, id)
		if sets.find(out) == ground && sets.find(ref) != ground {
			// A rail below ground: the supply holds its reference net
			// at −VOut, and delivers its current out of ground.
			out, ref = ref, out
			railPin[id] = s.OutRef
			flow.VOut, flow.IOut = 0-flow.VOut, 0-flow.IOut
		}
		n := &Supply{Name: d.NameOf(q), Kind: q.Kind, Rail: d.NetNameOf(&d.Nets[out]), Ref: d.NetNameOf(&d.Nets[ref]),
			RefGround: sets.find(ref) == ground, Flow: flow, Judged: ok, Set: q.Value}
		if w := rules.Worst(uses[id]); w >= 0 {
			n.Use, n.HasUse = uses[id][w], true
		}
		if s.HasInput() {
			n.Input = d.NetNameOf(&d.Nets[q.Pins[s.In]])
		}
		nodes[id] = n
		refOf[id] = sets.find(ref)
		r := sets.find(out)
		railOf[id] = r
		if p, seen := primary[r]; !seen || d.CompareParts(id, p) < 0 {
			primary[r] = id
		}
	}
	// Each supply's parent: the supply listing the rail its input is on,
	// or (found below) the one whose tree reaches its input's net.
	parent := make(map[circuit.PartID]circuit.PartID, len(supplies))
	for _, id := range supplies {
		q, n := &d.Parts[id], nodes[id]
		if p := primary[railOf[id]]; p != id {
			n.Alongside = d.NameOf(&d.Parts[p])
		}
		if s := q.Kind.Info().Supply; s.HasInput() {
			if p, ok := primary[sets.find(q.Pins[s.In])]; ok {
				parent[id] = p
				nodes[p].Feeds = append(nodes[p].Feeds, n)
			}
		}
	}
	// The pins on each set of nets, in the order of their parts' names.
	start := make([]int32, len(d.Nets)+1)
	for i := range d.Parts {
		for _, n := range d.Parts[i].Nets() {
			start[sets.find(n)+1]++
		}
	}
	for i := range len(d.Nets) {
		start[i+1] += start[i]
	}
	at := make([]pinRef, start[len(d.Nets)])
	fill := append([]int32(nil), start[:len(d.Nets)]...)
	for i := range d.Parts {
		for k, n := range d.Parts[i].Nets() {
			r := sets.find(n)
			at[fill[r]] = pinRef{circuit.PartID(i), int32(k)}
			fill[r]++
		}
	}
	// Walk out from every rail, breadth first: the parts on a rail, then
	// past each part that takes current from it into a net no rail or
	// part has reached yet, the parts on that net, up to maxDepth deep.
	type step struct {
		set   int32
		owner *Load // nil on a rail
		top   circuit.PartID
		depth int
	}
	reached := make([]bool, len(d.Nets))
	if ground >= 0 {
		reached[ground] = true
	}
	tops := make([]circuit.PartID, 0, len(primary))
	for r, p := range primary {
		reached[r] = true
		tops = append(tops, p)
	}
	sort.Slice(tops, func(a, b int) bool { return d.CompareParts(tops[a], tops[b]) < 0 })
	var queue []step
	for _, p := range tops {
		queue = append(queue, step{set: railOf[p], top: p})
	}
	listed := make([]bool, len(d.Parts))
	for len(queue) > 0 {
		st := queue[0]
		queue = queue[1:]
		pins := append([]pinRef(nil), at[start[st.set]:start[st.set+1]]...)
		sort.Slice(pins, func(a, b int) bool {
			if c := d.CompareParts(pins[a].part, pins[b].part); c != 0 {
				return c < 0
			}
			return pins[a].pin < pins[b].pin
		})
		for _, pr := range pins {
			id, pin, q := pr.part, int(pr.pin), &d.Parts[pr.part]
			if q.IsShort() || st.owner != nil && listed[id] {
				continue
			}
			if s := q.Kind.Info().Supply; s != nil {
				if pin == railPin[id] {
					continue // its own output
				}
				if s.HasInput() && pin == s.In {
					if _, fed := parent[id]; !fed && st.owner != nil {
						// Fed through the part that reached this net.
						parent[id] = st.top
						st.owner.Feeds = append(st.owner.Feeds, nodes[id])
					}
					continue
				}
			}
			if sameRail(sets, q, st.set, pin) {
				continue
			}
			qs := pt.Part(id)
			c, known := pt.PinCurrent(q, id, pin)
			if known && c == 0 && !qs.CurrentUnknown && q.DC().Model == circuit.Open {
				listed[id] = true // reached, but not drawn: a capacitor or an open switch takes nothing at DC
				continue
			}
			l := &Load{Name: d.NameOf(q), Kind: q.Kind, Current: c, Power: qs.P,
				CurrentUnknown: qs.CurrentUnknown || !known, VoltageUnknown: qs.VoltageUnknown}
			next := int32(-1)
			for k, n := range q.Nets() {
				if o := sets.find(n); k != pin && o != ground && o != refOf[st.top] {
					l.Towards = append(l.Towards, d.NetNameOf(&d.Nets[n]))
					if next == -1 {
						next = o
					} else {
						next = -2 // more than one way on: followed no further
					}
				}
			}
			if w := rules.Worst(uses[id]); w >= 0 {
				l.Use, l.HasUse = uses[id][w], true
			}
			listed[id] = true
			if st.owner == nil {
				nodes[st.top].Loads = append(nodes[st.top].Loads, l)
			} else {
				st.owner.Loads = append(st.owner.Loads, l)
			}
			if next >= 0 && !reached[next] && known && c > 0 && !qs.CurrentUnknown && st.depth+1 < maxDepth {
				reached[next] = true
				l.Net = d.NetNameOf(&d.Nets[next])
				queue = append(queue, step{set: next, owner: l, top: st.top, depth: st.depth + 1})
			}
		}
	}
	for _, id := range supplies {
		if _, fed := parent[id]; !fed && nodes[id].Input != "" {
			nodes[id].Unfed = true
		}
	}
	for i := range d.Parts {
		if !listed[i] && !d.Parts[i].IsShort() && d.Parts[i].Kind.Info().Supply == nil {
			offTree++
		}
	}
	// Roots: the supplies fed by no other. Supplies left unvisited after
	// walking down from them feed each other in a loop; each loop is
	// drawn from its first supply by name.
	byName := append([]circuit.PartID(nil), supplies...)
	sort.Slice(byName, func(a, b int) bool { return d.CompareParts(byName[a], byName[b]) < 0 })
	seen := map[*Supply]bool{}
	for _, id := range byName {
		if _, fed := parent[id]; !fed {
			roots = append(roots, walk(nodes[id], seen))
		}
	}
	for _, id := range byName {
		if seen[nodes[id]] {
			continue
		}
		// Up the parents as many steps as there are supplies lands on
		// the loop above id; it is drawn from its first supply by name.
		x := id
		for range supplies {
			p, ok := parent[x]
			if !ok {
				break // cannot happen: a chain that ends is walked from its root
			}
			x = p
		}
		first := x
		for y := parent[x]; y != x; y = parent[y] {
			if d.CompareParts(y, first) < 0 {
				first = y
			}
		}
		n := walk(nodes[first], seen)
		n.InLoop = true
		roots = append(roots, n)
	}
	return roots, offTree
}

// sameRail reports whether the part's other pins are on rail r too: a part
// inside one rail takes nothing from it.
func sameRail(sets netSets, q *circuit.Part, r int32, pin int) bool {
	for k, n := range q.Nets() {
		if k != pin && sets.find(n) != r {
			return false
		}
	}
	return true
}

// walk marks n and everything below it seen, sorts what each rail and
// part feeds worst first, and replaces a supply reached a second time
// (round a loop) by a copy without children.
func walk(n *Supply, seen map[*Supply]bool) *Supply {
	seen[n] = true
	n.Feeds = walkFeeds(n.Feeds, seen)
	walkLoads(n.Loads, seen)
	return n
}

func walkFeeds(fs []*Supply, seen map[*Supply]bool) []*Supply {
	sortSupplies(fs)
	for k, c := range fs {
		if seen[c] {
			cp := *c
			cp.Feeds, cp.Loads, cp.Loop = nil, nil, true
			fs[k] = &cp
			continue
		}
		fs[k] = walk(c, seen)
	}
	return fs
}

func walkLoads(ls []*Load, seen map[*Supply]bool) {
	sortLoads(ls)
	for _, l := range ls {
		l.Feeds = walkFeeds(l.Feeds, seen)
		walkLoads(l.Loads, seen)
	}
}

// worse orders uses worst first, parts with no rating last, then by name,
// so that the order never depends on the order of statements.
func worse(ua, ub rules.Use, oka, okb bool, na, nb string) bool {
	if oka != okb {
		return oka
	}
	if oka && ua.Frac != ub.Frac {
		return ua.Frac > ub.Frac
	}
	return na < nb
}

func sortLoads(ls []*Load) {
	sort.Slice(ls, func(a, b int) bool {
		if ls[a].Name == ls[b].Name {
			return ls[a].Current > ls[b].Current
		}
		return worse(ls[a].Use, ls[b].Use, ls[a].HasUse, ls[b].HasUse, ls[a].Name, ls[b].Name)
	})
}

func sortSupplies(ss []*Supply) {
	sort.Slice(ss, func(a, b int) bool {
		return worse(ss[a].Use, ss[b].Use, ss[a].HasUse, ss[b].HasUse, ss[a].Name, ss[b].Name)
	})
}
