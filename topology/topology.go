// Package topology finds what is wrong with a circuit's wiring before any
// value is solved for: pins alone on a net, sections with no DC path to
// ground, loops of voltage sources, cutsets of current sources, parts
// shorted across themselves.
//
// # Well-posedness
//
// A network of ideal elements has a unique DC solution only if it has no
// loop made of voltage sources and ideal shorts alone, and no cutset made of
// current sources and opens alone (Chua, Desoer & Kuh, Linear and Nonlinear
// Circuits, 1987, from memory). Analyze checks both conditions, plus the
// plainer condition that every net has a DC path to the ground net.
//
// # Cost
//
// Every check is a union–find pass over the parts or a walk over a
// spanning forest, so Analyze runs in near-linear time in the number of
// parts: it is meant for designs with millions of them. Loop reports are
// capped (MaxLoops) so that a pathological design cannot make the report
// itself quadratic.
package topology

import (
	"math"

	"nodal/circuit"
)

// MaxLoops bounds how many source loops are traced and reported.
const MaxLoops = 200

// Island is a set of nets with no DC path to ground.
type Island struct {
	Nets []circuit.NetID // in order of first use
	// AllFloating is set when every net of the island is also a floating
	// net, so that the floating-net finding already says all there is.
	AllFloating bool
}

// Step is one part of a loop, traversed from net From to net To.
type Step struct {
	Part     circuit.PartID
	From, To circuit.NetID
}

// Loop is a loop made only of voltage sources and ideal shorts.
type Loop struct {
	Steps []Step
	// Sum is the sum of the potential rises around the loop, V(To)−V(From)
	// of each step as the sources fix it. Kirchhoff's voltage law needs it
	// to be zero.
	Sum float64
	// Scale is the largest source voltage in the loop, for judging Sum.
	Scale float64
}

// Balanced reports whether the loop's voltages sum to zero (to a relative
// 1e-9 of its largest source).
func (l *Loop) Balanced() bool { return math.Abs(l.Sum) <= 1e-9*math.Max(l.Scale, 1e-300) }

// Cutset is a set of nets joined to the rest of the circuit only by
// current sources (and opens).
type Cutset struct {
	Nets    []circuit.NetID
	Sources []circuit.PartID // the current sources crossing the cut
	// Net is the current the sources push into the set (A). Kirchhoff's
	// current law needs it to be zero.
	Net   float64
	Scale float64 // the largest source current crossing the cut
}

// Balanced reports whether the currents into the set sum to zero.
func (c *Cutset) Balanced() bool { return math.Abs(c.Net) <= 1e-9*math.Max(c.Scale, 1e-300) }

// Result is what Analyze finds.
type Result struct {
	Floating  []circuit.NetID // nets with one pin that are neither a port nor ground
	Shorted   []circuit.PartID
	NoDCPath  []Island
	Loops     []Loop
	LoopsLeft int // loops found beyond MaxLoops and not traced
	Cutsets   []Cutset

	// Graph facts over all parts, with nets as vertices.
	Branches   int // parts, and a part with more pins one more per pin
	Vertices   int // nets touched by at least one pin
	Components int // connected pieces
	// CycleRank is the number of independent loops, b − n + c.
	CycleRank int

	// DCGroup gives, for every net, a representative of the set of nets
	// joined to it by parts that conduct at DC; nets in the ground's set
	// have a DC path to ground.
	DCGroup []int32
	// Grounded reports whether the design has a ground that touches a pin.
	Grounded bool
}

// WellPosed reports whether the solver can be run: no unbalanced loop or
// cutset, every net with a path to ground.
func (r *Result) WellPosed() bool {
	return r.Grounded && len(r.NoDCPath) == 0 && len(r.Loops) == 0 && r.LoopsLeft == 0 && len(r.Cutsets) == 0
}

// Analyze runs every topology check on d.
func Analyze(d *circuit.Design) *Result {
	r := &Result{Branches: len(d.Parts)}
	n := len(d.Nets)
	for i := range d.Nets {
		net := &d.Nets[i]
		if net.Pins > 0 {
			r.Vertices++
		}
		if net.Pins == 1 && !net.Port && circuit.NetID(i) != d.Ground {
			r.Floating = append(r.Floating, circuit.NetID(i))
		}
	}
	all := newUnionFind(n)
	dc := newUnionFind(n)
	for i := range d.Parts {
		p := &d.Parts[i]
		na, nb := p.Ends()
		a, b := int32(na), int32(nb)
		if a == b {
			r.Shorted = append(r.Shorted, circuit.PartID(i))
		}
		if !all.union(a, b) {
			r.CycleRank++
		}
		if p.ConductsDC() {
			dc.union(a, b)
		}
		if p.Multi() {
			// Its other pins are branches to its second end (a
			// regulator's input is a load between input and common):
			// they join the graph but give no DC path.
			for _, n := range p.Nets() {
				if n != na && n != nb {
					r.Branches++
					if !all.union(int32(n), b) {
						r.CycleRank++
					}
				}
			}
		}
	}
	roots := 0
	for i := range d.Nets {
		if d.Nets[i].Pins > 0 && all.find(int32(i)) == int32(i) {
			roots++
		}
	}
	r.Components = roots
	r.DCGroup = make([]int32, n)
	for i := range r.DCGroup {
		r.DCGroup[i] = dc.find(int32(i))
	}
	r.Grounded = d.Ground != circuit.NoNet && d.Nets[d.Ground].Pins > 0
	findLoops(d, r)
	if d.Ground != circuit.NoNet {
		findIslands(d, r)
		findCutsets(d, r)
	}
	return r
}

// findIslands groups the nets outside ground's DC set.
func findIslands(d *circuit.Design, r *Result) {
	g := r.DCGroup[d.Ground]
	index := map[int32]int{}
	floating := make(map[circuit.NetID]bool, len(r.Floating))
	for _, f := range r.Floating {
		floating[f] = true
	}
	for i := range d.Nets {
		if d.Nets[i].Pins == 0 || r.DCGroup[i] == g {
			continue
		}
		k, ok := index[r.DCGroup[i]]
		if !ok {
			k = len(r.NoDCPath)
			index[r.DCGroup[i]] = k
			r.NoDCPath = append(r.NoDCPath, Island{AllFloating: true})
		}
		is := &r.NoDCPath[k]
		is.Nets = append(is.Nets, circuit.NetID(i))
		if !floating[circuit.NetID(i)] {
			is.AllFloating = false
		}
	}
}

// findCutsets sums, for every DC set but ground's, the current that current
// sources push into it. Every such set is bounded by current sources and
// opens alone, so each must balance for Kirchhoff's current law to hold;
// unions of sets then balance too.
func findCutsets(d *circuit.Design, r *Result) {
	g := r.DCGroup[d.Ground]
	type acc struct {
		net, scale float64
		sources    []circuit.PartID
	}
	sets := map[int32]*acc{}
	get := func(k int32) *acc {
		a := sets[k]
		if a == nil {
			a = &acc{}
			sets[k] = a
		}
		return a
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		if p.DC().Branch() != circuit.CurrentDefining {
			continue
		}
		a, b := p.Ends()
		from, to := r.DCGroup[a], r.DCGroup[b]
		if from == to {
			continue
		}
		for _, side := range [2]struct {
			k    int32
			sign float64
		}{{to, 1}, {from, -1}} {
			if side.k == g {
				continue
			}
			a := get(side.k)
			a.net += side.sign * p.Value
			a.scale = math.Max(a.scale, math.Abs(p.Value))
			a.sources = append(a.sources, circuit.PartID(i))
		}
	}
	if len(sets) == 0 {
		return
	}
	members := map[int32][]circuit.NetID{}
	for i := range d.Nets {
		k := r.DCGroup[i]
		if a := sets[k]; a != nil && d.Nets[i].Pins > 0 {
			members[k] = append(members[k], circuit.NetID(i))
		}
	}
	// Report in order of each set's first net, for deterministic output.
	seen := map[int32]bool{}
	for i := range d.Nets {
		k := r.DCGroup[i]
		a := sets[k]
		if a == nil || seen[k] {
			continue
		}
		seen[k] = true
		c := Cutset{Nets: members[k], Sources: a.sources, Net: a.net, Scale: a.scale}
		if !c.Balanced() {
			r.Cutsets = append(r.Cutsets, c)
		}
	}
}
