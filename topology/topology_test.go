package topology

import (
	"fmt"
	"math"
	"sort"
	"testing"

	"gonum.org/v1/gonum/graph/simple"
	"gonum.org/v1/gonum/graph/topo"
	"pgregory.net/rapid"

	"nodal/circuit"
	"nodal/diag"
)

// br is one branch of a test network: a part between nets a and b.
type br struct {
	kind   circuit.Kind
	a, b   int
	value  float64
	closed bool
}

// design builds a network of n nets ("n0" … ) with n0 as ground.
func design(n int, branches []br) *circuit.Design {
	d := circuit.NewDesign("t.nodal")
	for i := 0; i < n; i++ {
		d.Net(fmt.Sprintf("n%d", i), diag.NoPos, diag.NoPos)
	}
	d.Ground = 0
	for i, e := range branches {
		v := e.value
		if v == 0 && e.kind == circuit.Resistor {
			v = 1
		}
		d.AddPart(circuit.Part{Kind: e.kind, Local: fmt.Sprintf("P%d", i), Pins: [circuit.MaxPins]circuit.NetID{circuit.NetID(e.a), circuit.NetID(e.b)}, Value: v, Closed: e.closed, Inst: -1})
	}
	return d
}

func resistors(edges [][2]int) []br {
	out := make([]br, len(edges))
	for i, e := range edges {
		out[i] = br{kind: circuit.Resistor, a: e[0], b: e[1], value: 1}
	}
	return out
}

// The number of independent loops of a connected network with b branches
// and n nodes is b − n + 1 (the cycle rank; any network-topology text, e.g.
// Chua, Desoer & Kuh, Linear and Nonlinear Circuits, 1987, from memory).
func TestCycleRankCompleteGraph(t *testing.T) {
	for n := 2; n <= 12; n++ {
		var edges [][2]int
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				edges = append(edges, [2]int{i, j})
			}
		}
		r := Analyze(design(n, resistors(edges)))
		// K_n: b = n(n−1)/2, so b − n + 1 = (n−1)(n−2)/2.
		if want := (n - 1) * (n - 2) / 2; r.CycleRank != want || r.Components != 1 || r.Branches != len(edges) {
			t.Errorf("K%d: cycle rank %d, components %d; want %d, 1", n, r.CycleRank, r.Components, want)
		}
	}
}

func TestCycleRankCube(t *testing.T) {
	// The cube graph Q3: 8 corners, 12 edges (corners differing in one bit),
	// so 12 − 8 + 1 = 5 independent loops; Euler's polyhedron formula
	// V − E + F = 2 gives the same count as its F − 1 = 5 inner faces.
	var edges [][2]int
	for i := 0; i < 8; i++ {
		for bit := 1; bit < 8; bit <<= 1 {
			if j := i ^ bit; i < j {
				edges = append(edges, [2]int{i, j})
			}
		}
	}
	r := Analyze(design(8, resistors(edges)))
	if r.Branches != 12 || r.Vertices != 8 || r.CycleRank != 5 {
		t.Errorf("cube: b=%d n=%d rank=%d; want 12, 8, 5", r.Branches, r.Vertices, r.CycleRank)
	}
}

func TestCycleRankGrid(t *testing.T) {
	// A k×k grid is a plane graph with (k−1)² square faces inside; by
	// Euler's polyhedron formula (V − E + F = 2) that is its cycle rank.
	for _, k := range []int{2, 3, 5, 10, 40} {
		id := func(r, c int) int { return r*k + c }
		var edges [][2]int
		for r := 0; r < k; r++ {
			for c := 0; c < k; c++ {
				if c+1 < k {
					edges = append(edges, [2]int{id(r, c), id(r, c+1)})
				}
				if r+1 < k {
					edges = append(edges, [2]int{id(r, c), id(r+1, c)})
				}
			}
		}
		r := Analyze(design(k*k, resistors(edges)))
		if want := (k - 1) * (k - 1); r.CycleRank != want {
			t.Errorf("%d×%d grid: rank %d; want %d", k, k, r.CycleRank, want)
		}
		if len(r.Floating) != 0 || len(r.NoDCPath) != 0 || !r.WellPosed() {
			t.Errorf("%d×%d resistor grid is not well posed: %+v", k, k, r)
		}
	}
}

func TestCycleRankDisconnected(t *testing.T) {
	// With c connected pieces the count is b − n + c: two triangles.
	r := Analyze(design(6, resistors([][2]int{{0, 1}, {1, 2}, {2, 0}, {3, 4}, {4, 5}, {5, 3}})))
	if r.Components != 2 || r.CycleRank != 2 {
		t.Errorf("two triangles: components %d, rank %d; want 2, 2", r.Components, r.CycleRank)
	}
}

// Well-posedness of a network of ideal elements (Chua, Desoer & Kuh,
// Linear and Nonlinear Circuits, 1987, from memory): no loop of voltage
// sources and shorts alone, no cutset of current sources alone.
func TestWellPosedness(t *testing.T) {
	V, I, R, C, W, L := circuit.VoltageSource, circuit.CurrentSource, circuit.Resistor, circuit.Capacitor, circuit.Wire, circuit.Inductor
	cases := []struct {
		name     string
		n        int
		branches []br
		loops    int     // source loops found
		sum      float64 // of the first loop, up to its direction
		balanced bool
		cutsets  int
		cutNet   float64 // of the first cutset, up to sign
		posed    bool
	}{
		{"divider", 3, []br{{V, 1, 0, 5, false}, {R, 1, 2, 1, false}, {R, 2, 0, 1, false}}, 0, 0, false, 0, 0, true},
		{"parallel unequal sources", 2, []br{{V, 1, 0, 5, false}, {V, 1, 0, 3, false}}, 1, 2, false, 0, 0, false},
		{"parallel equal sources", 2, []br{{V, 1, 0, 5, false}, {V, 1, 0, 5, false}, {R, 1, 0, 1, false}}, 1, 0, true, 0, 0, false},
		{"source shorted by a wire", 2, []br{{V, 1, 0, 5, false}, {W, 1, 0, 0, false}}, 1, 5, false, 0, 0, false},
		{"source shorted by an ideal inductor", 2, []br{{V, 1, 0, 5, false}, {L, 0, 1, 1e-6, false}}, 1, 5, false, 0, 0, false},
		{"open switch breaks the loop", 2, []br{{V, 1, 0, 5, false}, {circuit.Switch, 1, 0, 0, false}, {R, 1, 0, 1, false}}, 0, 0, false, 0, 0, true},
		{"closed switch closes it", 2, []br{{V, 1, 0, 5, false}, {circuit.Switch, 1, 0, 0, true}}, 1, 5, false, 0, 0, false},
		// KVL around a triangle of sources: 3 V + 2 V − 5 V = 0.
		{"balanced triangle", 3, []br{{V, 1, 0, 3, false}, {V, 2, 1, 2, false}, {V, 2, 0, 5, false}, {R, 2, 0, 1, false}}, 1, 0, true, 0, 0, false},
		{"unbalanced triangle", 3, []br{{V, 1, 0, 3, false}, {V, 2, 1, 2, false}, {V, 2, 0, 6, false}}, 1, 1, false, 0, 0, false},
		{"series current sources, unequal", 2, []br{{I, 0, 1, 0.01, false}, {I, 1, 0, 0.02, false}}, 0, 0, false, 1, 0.01, false},
		{"series current sources, equal", 2, []br{{I, 0, 1, 0.01, false}, {I, 1, 0, 0.01, false}}, 0, 0, false, 0, 0, false},
		{"current source into a capacitor", 2, []br{{I, 0, 1, 0.001, false}, {C, 1, 0, 1e-6, false}}, 0, 0, false, 1, 0.001, false},
		// A star of three current sources into one node: KCL asks 1 + 2 − 3 = 0.
		{"balanced star", 2, []br{{I, 0, 1, 1, false}, {I, 0, 1, 2, false}, {I, 1, 0, 3, false}}, 0, 0, false, 0, 0, false},
		{"current source into a resistor", 2, []br{{I, 0, 1, 0.001, false}, {R, 1, 0, 1e3, false}}, 0, 0, false, 0, 0, true},
		// A cut through two current sources between two resistive halves, both
		// pushing 1 A into the far half: 2 A in, none out.
		{"cut of two sources", 4, []br{{R, 1, 0, 1, false}, {R, 3, 2, 1, false}, {I, 1, 2, 1, false}, {I, 0, 3, 1, false}}, 0, 0, false, 1, 2, false},
	}
	for _, c := range cases {
		r := Analyze(design(c.n, c.branches))
		if len(r.Loops) != c.loops {
			t.Errorf("%s: %d loops; want %d", c.name, len(r.Loops), c.loops)
		} else if c.loops > 0 {
			l := r.Loops[0]
			if math.Abs(math.Abs(l.Sum)-c.sum) > 1e-12 || l.Balanced() != c.balanced {
				t.Errorf("%s: loop sum %g balanced %v; want ±%g, %v", c.name, l.Sum, l.Balanced(), c.sum, c.balanced)
			}
			checkLoop(t, c.name, design(c.n, c.branches), l)
		}
		if len(r.Cutsets) != c.cutsets {
			t.Errorf("%s: %d cutsets; want %d", c.name, len(r.Cutsets), c.cutsets)
		} else if c.cutsets > 0 && math.Abs(math.Abs(r.Cutsets[0].Net)-c.cutNet) > 1e-12 {
			t.Errorf("%s: cutset current %g; want ±%g", c.name, r.Cutsets[0].Net, c.cutNet)
		}
		if r.WellPosed() != c.posed {
			t.Errorf("%s: well posed %v; want %v", c.name, r.WellPosed(), c.posed)
		}
	}
}

// checkLoop verifies that l is a closed walk over voltage-defining parts,
// each step along its part, and that Sum is the sum of the source rises.
func checkLoop(t *testing.T, name string, d *circuit.Design, l Loop) {
	t.Helper()
	if len(l.Steps) == 0 {
		t.Errorf("%s: empty loop", name)
		return
	}
	sum := 0.0
	for i, s := range l.Steps {
		p := &d.Parts[s.Part]
		if !p.IsVoltageDefining() {
			t.Errorf("%s: loop goes through %s %s", name, p.Kind, p.Local)
		}
		if !(s.From == p.Pins[0] && s.To == p.Pins[1] || s.From == p.Pins[1] && s.To == p.Pins[0]) {
			t.Errorf("%s: step %d does not follow %s", name, i, p.Local)
		}
		next := l.Steps[(i+1)%len(l.Steps)]
		if s.To != next.From {
			t.Errorf("%s: step %d ends on net %d, step %d starts on %d", name, i, s.To, (i+1)%len(l.Steps), next.From)
		}
		if p.Kind == circuit.VoltageSource {
			if s.To == p.Pins[0] {
				sum += p.Value // neg → pos rises by the source voltage
			} else {
				sum -= p.Value
			}
		}
	}
	if math.Abs(sum-l.Sum) > 1e-9*math.Max(1, l.Scale) {
		t.Errorf("%s: loop sum %g; recomputed %g", name, l.Sum, sum)
	}
}

// Kirchhoff's junction rule applies at junctions of three or more
// conductors; two conductors meeting is just a wire (common practice). A net
// with two pins is an ordinary connection, one with a single pin is left
// open.
func TestTwoPinNetIsNotAJunction(t *testing.T) {
	// A chain V1 → R → R → R back to ground: every inner net has two pins.
	d := design(4, []br{{circuit.VoltageSource, 1, 0, 5, false}, {circuit.Resistor, 1, 2, 1, false}, {circuit.Resistor, 2, 3, 1, false}, {circuit.Resistor, 3, 0, 1, false}})
	r := Analyze(d)
	if len(r.Floating) != 0 || !r.WellPosed() {
		t.Errorf("series chain: floating %v, well posed %v", r.Floating, r.WellPosed())
	}
	// Add a resistor to a fifth net that nothing else touches.
	d = design(5, []br{{circuit.VoltageSource, 1, 0, 5, false}, {circuit.Resistor, 1, 4, 1, false}, {circuit.Resistor, 1, 0, 1, false}})
	r = Analyze(d)
	if len(r.Floating) != 1 || r.Floating[0] != 4 {
		t.Errorf("stub: floating %v; want [4]", r.Floating)
	}
}

func TestShorted(t *testing.T) {
	r := Analyze(design(2, []br{{circuit.VoltageSource, 1, 0, 5, false}, {circuit.Resistor, 1, 1, 1, false}, {circuit.Resistor, 1, 0, 1, false}}))
	if len(r.Shorted) != 1 || r.Shorted[0] != 1 {
		t.Errorf("shorted %v; want [1]", r.Shorted)
	}
}

// partition turns a membership function into a canonical sorted list of
// sorted groups.
func partition(groups [][]int) [][]int {
	for _, g := range groups {
		sort.Ints(g)
	}
	sort.Slice(groups, func(i, j int) bool { return groups[i][0] < groups[j][0] })
	return groups
}

func samePartition(a, b [][]int) bool {
	a, b = partition(a), partition(b)
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if len(a[i]) != len(b[i]) {
			return false
		}
		for j := range a[i] {
			if a[i][j] != b[i][j] {
				return false
			}
		}
	}
	return true
}

// gonumComponents returns the connected components, by gonum's
// graph/topo, of the nets joined by the branches keep accepts; every net
// touched by any branch is a vertex.
func gonumComponents(n int, branches []br, keep func(br) bool) [][]int {
	g := simple.NewUndirectedGraph()
	touched := make([]bool, n)
	for _, e := range branches {
		touched[e.a], touched[e.b] = true, true
	}
	for i := 0; i < n; i++ {
		if touched[i] {
			g.AddNode(simple.Node(i))
		}
	}
	for _, e := range branches {
		if e.a != e.b && keep(e) {
			g.SetEdge(simple.Edge{F: simple.Node(e.a), T: simple.Node(e.b)})
		}
	}
	var out [][]int
	for _, c := range topo.ConnectedComponents(g) {
		var ids []int
		for _, v := range c {
			ids = append(ids, int(v.ID()))
		}
		out = append(out, ids)
	}
	return out
}

var testKinds = []circuit.Kind{circuit.Resistor, circuit.Capacitor, circuit.Inductor, circuit.VoltageSource, circuit.CurrentSource, circuit.Diode, circuit.Fuse, circuit.Switch, circuit.Wire}

func randomNetwork(t *rapid.T) (int, []br) {
	n := rapid.IntRange(1, 30).Draw(t, "nets")
	m := rapid.IntRange(0, 60).Draw(t, "parts")
	branches := make([]br, m)
	for i := range branches {
		branches[i] = br{
			kind:   rapid.SampledFrom(testKinds).Draw(t, "kind"),
			a:      rapid.IntRange(0, n-1).Draw(t, "a"),
			b:      rapid.IntRange(0, n-1).Draw(t, "b"),
			value:  float64(rapid.IntRange(1, 5).Draw(t, "value")),
			closed: rapid.Bool().Draw(t, "closed"),
		}
	}
	return n, branches
}

// Property: the pieces Analyze finds, over all parts and over the parts
// that conduct at DC, are the connected components gonum finds on the same
// graph; the islands are the DC pieces that do not hold ground; the cycle
// rank is b − n + c.
func TestIslandsMatchGonum(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n, branches := randomNetwork(t)
		d := design(n, branches)
		r := Analyze(d)

		all := gonumComponents(n, branches, func(br) bool { return true })
		if r.Components != len(all) {
			t.Fatalf("components %d; gonum %d", r.Components, len(all))
		}
		if want := len(branches) - r.Vertices + len(all); r.CycleRank != want {
			t.Fatalf("cycle rank %d; b − n + c = %d", r.CycleRank, want)
		}

		conducts := func(e br) bool {
			p := circuit.Part{Kind: e.kind, Closed: e.closed}
			return p.ConductsDC()
		}
		dcComps := gonumComponents(n, branches, conducts)
		groups := map[int32][]int{}
		for _, c := range dcComps {
			for _, v := range c {
				groups[r.DCGroup[v]] = append(groups[r.DCGroup[v]], v)
			}
		}
		var ours [][]int
		for _, g := range groups {
			ours = append(ours, g)
		}
		if !samePartition(ours, dcComps) {
			t.Fatalf("DC groups %v; gonum %v", partition(ours), partition(dcComps))
		}

		var islands [][]int
		for _, c := range dcComps {
			hasGround := false
			for _, v := range c {
				if v == 0 {
					hasGround = true
				}
			}
			if !hasGround {
				islands = append(islands, c)
			}
		}
		var got [][]int
		for _, is := range r.NoDCPath {
			var ids []int
			for _, v := range is.Nets {
				ids = append(ids, int(v))
			}
			got = append(got, ids)
		}
		if !samePartition(got, islands) {
			t.Fatalf("islands %v; gonum %v", partition(got), partition(islands))
		}
	})
}

// Property: every reported loop is a closed walk of voltage-defining parts
// with its sum of source voltages right; none is reported when those parts
// form a forest. On simple graphs of resistors, gonum's cycle basis (Paton,
// "An algorithm for finding a fundamental set of cycles of a graph", CACM
// 12(9), 1969) has as many cycles as the cycle rank.
func TestLoopsAndCutsets(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n, branches := randomNetwork(t)
		d := design(n, branches)
		r := Analyze(d)
		for i, l := range r.Loops {
			for k, s := range l.Steps {
				if s.To != l.Steps[(k+1)%len(l.Steps)].From {
					t.Fatalf("loop %d is not closed", i)
				}
				if !d.Parts[s.Part].IsVoltageDefining() {
					t.Fatalf("loop %d goes through %s", i, d.Parts[s.Part].Kind)
				}
			}
		}
		var vd []br
		for i, e := range branches {
			if d.Parts[i].IsVoltageDefining() && e.a != e.b {
				vd = append(vd, e)
			}
		}
		verts := map[int]bool{}
		for _, e := range vd {
			verts[e.a], verts[e.b] = true, true
		}
		comps := gonumComponents(n, vd, func(br) bool { return true })
		forest := len(vd) == len(verts)-len(comps)
		if forest && len(r.Loops) != 0 {
			t.Fatalf("%d loops reported in a forest of voltage-defining parts", len(r.Loops))
		}
		for _, c := range r.Cutsets {
			in := map[circuit.NetID]bool{}
			for _, v := range c.Nets {
				in[v] = true
				if v == d.Ground {
					t.Fatalf("cutset holds ground")
				}
			}
			net := 0.0
			for i := range d.Parts {
				p := &d.Parts[i]
				if p.Kind == circuit.CurrentSource && in[p.Pins[1]] != in[p.Pins[0]] {
					if in[p.Pins[1]] {
						net += p.Value
					} else {
						net -= p.Value
					}
				}
				if p.ConductsDC() && in[p.Pins[0]] != in[p.Pins[1]] {
					t.Fatalf("a %s crosses the cut", p.Kind)
				}
			}
			if math.Abs(net-c.Net) > 1e-9 || c.Balanced() {
				t.Fatalf("cutset current %g; recomputed %g", c.Net, net)
			}
		}
	})
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(2, 20).Draw(t, "nets")
		g := simple.NewUndirectedGraph()
		var edges [][2]int
		for i := 0; i < n; i++ {
			g.AddNode(simple.Node(i))
		}
		m := rapid.IntRange(0, 50).Draw(t, "edges")
		for k := 0; k < m; k++ {
			a, b := rapid.IntRange(0, n-1).Draw(t, "a"), rapid.IntRange(0, n-1).Draw(t, "b")
			if a == b || g.HasEdgeBetween(int64(a), int64(b)) {
				continue
			}
			g.SetEdge(simple.Edge{F: simple.Node(a), T: simple.Node(b)})
			edges = append(edges, [2]int{a, b})
		}
		r := Analyze(design(n, resistors(edges)))
		if basis := topo.UndirectedCyclesIn(g); len(basis) != r.CycleRank {
			t.Fatalf("cycle rank %d; gonum's cycle basis has %d cycles", r.CycleRank, len(basis))
		}
	})
}
