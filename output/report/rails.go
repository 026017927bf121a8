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
//     at DC and cannot (a capacitor, an open switch) are left out.
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
	Loads []Load
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

// buildRails draws the power tree of d at the operating point pt, with
// uses the judged ratings of every part (by PartID). It returns the roots,
// and how many parts (not supplies, not ideal shorts) touch no rail.
func buildRails(d *circuit.Design, pt *rules.Point, uses [][]rules.Use) (roots []*Supply, offRail int) {
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
	railOf := make([]int32, 0, len(supplies))
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
			RefGround: sets.find(ref) == ground, Flow: flow, Judged: ok}
		if w := rules.Worst(uses[id]); w >= 0 {
			n.Use, n.HasUse = uses[id][w], true
		}
		if s.HasInput() {
			n.Input = d.NetNameOf(&d.Nets[q.Pins[s.In]])
		}
		nodes[id] = n
		refOf[id] = sets.find(ref)
		r := sets.find(out)
		railOf = append(railOf, r)
		if p, seen := primary[r]; !seen || d.CompareParts(id, p) < 0 {
			primary[r] = id
		}
	}
	// Each supply's parent: the supply listing the rail its input is on.
	parent := make(map[circuit.PartID]circuit.PartID, len(supplies))
	for k, id := range supplies {
		q, n := &d.Parts[id], nodes[id]
		if p := primary[railOf[k]]; p != id {
			n.Alongside = d.NameOf(&d.Parts[p])
		}
		s := q.Kind.Info().Supply
		if !s.HasInput() {
			continue
		}
		if p, ok := primary[sets.find(q.Pins[s.In])]; ok {
			parent[id] = p
		} else {
			n.Unfed = true
		}
	}
	// The parts each rail feeds: every pin on a rail, but the supply's
	// own output and a fed supply's input.
	isSupply := func(id circuit.PartID) bool { _, ok := nodes[id]; return ok }
	loads := map[circuit.PartID][]Load{}
	for i := range d.Parts {
		id, q := circuit.PartID(i), &d.Parts[i]
		if q.IsShort() {
			continue
		}
		qs := pt.Part(id)
		skip := [2]int{-1, -1}
		if s := q.Kind.Info().Supply; s != nil {
			skip[0] = railPin[id]
			if _, fed := parent[id]; fed {
				skip[1] = s.In
			}
		}
		onRail := false
		for pin, net := range q.Nets() {
			r := sets.find(net)
			p, ok := primary[r]
			if !ok {
				continue
			}
			onRail = true
			if pin == skip[0] || pin == skip[1] || sameRail(sets, q, r, pin) {
				continue
			}
			c, known := pt.PinCurrent(q, id, pin)
			if known && c == 0 && !qs.CurrentUnknown && q.DC().Model == circuit.Open {
				continue // a capacitor or an open switch: nothing at DC
			}
			l := Load{Name: d.NameOf(q), Kind: q.Kind, Current: c, Power: qs.P,
				CurrentUnknown: qs.CurrentUnknown || !known, VoltageUnknown: qs.VoltageUnknown}
			for k, n := range q.Nets() {
				if o := sets.find(n); k != pin && o != ground && o != refOf[p] {
					l.Towards = append(l.Towards, d.NetNameOf(&d.Nets[n]))
				}
			}
			if w := rules.Worst(uses[id]); w >= 0 {
				l.Use, l.HasUse = uses[id][w], true
			}
			loads[p] = append(loads[p], l)
		}
		if !onRail && !isSupply(id) {
			offRail++
		}
	}
	for p, ls := range loads {
		sortLoads(ls)
		nodes[p].Loads = ls
	}
	children := map[circuit.PartID][]*Supply{}
	for id, p := range parent {
		children[p] = append(children[p], nodes[id])
	}
	for p, cs := range children {
		sortSupplies(cs)
		nodes[p].Feeds = cs
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
	return roots, offRail
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

// walk marks n and everything below it seen, and replaces a supply
// reached a second time (round a loop) by a copy without children.
func walk(n *Supply, seen map[*Supply]bool) *Supply {
	seen[n] = true
	for k, c := range n.Feeds {
		if seen[c] {
			cp := *c
			cp.Feeds, cp.Loads, cp.Loop = nil, nil, true
			n.Feeds[k] = &cp
			continue
		}
		n.Feeds[k] = walk(c, seen)
	}
	return n
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

func sortLoads(ls []Load) {
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
