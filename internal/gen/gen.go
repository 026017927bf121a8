// Package gen writes large synthetic designs in the nodal language, for
// benchmarks and for trying the tool on sizes no one writes by hand. Every
// design is a scenario made up for the purpose and is fully determined by
// its parameters and seed. Every generated design is well posed: each net
// has a DC path to ground, no loop is made of voltage sources and shorts
// alone, no net is touched by a single pin, and no two names differ only in
// letter case, so `nodal check` finds nothing in it.
package gen

import (
	"bufio"
	"io"
	"math/rand/v2"
	"strconv"
)

// Mesh describes a square power-distribution mesh: K×K nets joined to their
// neighbours by segment resistors, fed from supply pads at one or more
// corners and loaded by current sinks spread over the mesh.
type Mesh struct {
	K        int     // nets per side; the mesh has K·K nets and 2·K·(K−1) segments
	Supplies int     // supply pads at the corners, 1 to 4 (0 means 1)
	Loads    int     // current sinks (0 means K, at least 1)
	Volts    float64 // supply voltage (0 means 1 V)
	Segment  float64 // segment resistance in Ω (0 means 10 mΩ)
	Pad      float64 // pad-to-mesh resistance in Ω (0 means 1 mΩ)
	Load     float64 // current of each sink in A (0 means 1 mA)
	Rated    float64 // power rating of every segment in W, as real meshes carry (0 writes none)
	Seed     uint64  // places the loads
}

func (m *Mesh) defaults() Mesh {
	c := *m
	if c.K < 2 {
		c.K = 2
	}
	if c.Supplies <= 0 {
		c.Supplies = 1
	}
	if c.Supplies > 4 {
		c.Supplies = 4
	}
	if c.Loads <= 0 {
		c.Loads = c.K
	}
	if c.Volts == 0 {
		c.Volts = 1
	}
	if c.Segment == 0 {
		c.Segment = 0.01
	}
	if c.Pad == 0 {
		c.Pad = 0.001
	}
	if c.Load == 0 {
		c.Load = 0.001
	}
	return c
}

// MeshSide returns the side of the mesh whose part count is nearest parts.
func MeshSide(parts int) int {
	k := 2
	for 2*(k+1)*k <= parts {
		k++
	}
	if k < 2 {
		k = 2
	}
	return k
}

// Parts returns how many parts the mesh has.
func (m *Mesh) Parts() int {
	c := m.defaults()
	return 2*c.K*(c.K-1) + 2*c.Supplies + c.Loads
}

// corner returns the mesh coordinates of supply pad s.
func corner(s, k int) (int, int) {
	switch s {
	case 1:
		return k - 1, k - 1
	case 2:
		return 0, k - 1
	case 3:
		return k - 1, 0
	}
	return 0, 0
}

// LoadSites returns the mesh coordinates (row, column) of each load, in the
// order the loads are written.
func (m *Mesh) LoadSites() [][2]int {
	c := m.defaults()
	r := rand.New(rand.NewPCG(c.Seed, 0x6d657368))
	out := make([][2]int, c.Loads)
	for i := range out {
		out[i] = [2]int{r.IntN(c.K), r.IntN(c.K)}
	}
	return out
}

// w is a small buffered writer that formats without allocating.
type w struct {
	b   *bufio.Writer
	buf []byte
	err error
}

func newW(out io.Writer) *w { return &w{b: bufio.NewWriterSize(out, 1<<16), buf: make([]byte, 0, 256)} }

func (x *w) s(s string) *w   { x.buf = append(x.buf, s...); return x }
func (x *w) i(i int) *w      { x.buf = strconv.AppendInt(x.buf, int64(i), 10); return x }
func (x *w) f(f float64) *w  { x.buf = strconv.AppendFloat(x.buf, f, 'g', -1, 64); return x }
func (x *w) net(r, c int) *w { return x.s("n").i(r).s("_").i(c) }
func (x *w) end()            { x.buf = append(x.buf, '\n'); x.flushLine() }
func (x *w) flushLine() {
	if x.err == nil {
		_, x.err = x.b.Write(x.buf)
	}
	x.buf = x.buf[:0]
}
func (x *w) done() error {
	if x.err != nil {
		return x.err
	}
	return x.b.Flush()
}

// ohms writes a resistance with a prefix chosen so the number stays short.
func (x *w) ohms(v float64) *w {
	switch {
	case v < 1:
		return x.f(v * 1e3).s(" mΩ")
	case v >= 1e3:
		return x.f(v / 1e3).s(" kΩ")
	}
	return x.f(v).s(" Ω")
}

func (x *w) amps(v float64) *w {
	if v < 1 {
		return x.f(v * 1e3).s(" mA")
	}
	return x.f(v).s(" A")
}

// Write writes the mesh design. Nets are n<row>_<col>; horizontal segments
// are h<row>_<col>, vertical ones v<row>_<col>; pads p<s>, supplies vdd<s>,
// loads i<n>. With Rated set, every segment line ends in `rated <W> W`.
func (m *Mesh) Write(out io.Writer) error {
	c := m.defaults()
	x := newW(out)
	x.s("design mesh").i(c.K).s(" \"generated ").i(c.K).s("×").i(c.K).s(" supply mesh\"").end()
	x.s("ground gnd").end()
	for s := 0; s < c.Supplies; s++ {
		r, col := corner(s, c.K)
		x.s("source vdd").i(s).s(" (p").i(s).s(", gnd) ").f(c.Volts).s(" V").end()
		x.s("resistor rp").i(s).s(" (p").i(s).s(", ").net(r, col).s(") ").ohms(c.Pad).end()
	}
	rating := func() {
		if c.Rated > 0 {
			x.s(" rated ").f(c.Rated).s(" W")
		}
		x.end()
	}
	for r := 0; r < c.K; r++ {
		for col := 0; col < c.K; col++ {
			if col+1 < c.K {
				x.s("resistor h").i(r).s("_").i(col).s(" (").net(r, col).s(", ").net(r, col+1).s(") ").ohms(c.Segment)
				rating()
			}
			if r+1 < c.K {
				x.s("resistor v").i(r).s("_").i(col).s(" (").net(r, col).s(", ").net(r+1, col).s(") ").ohms(c.Segment)
				rating()
			}
		}
	}
	for i, site := range m.LoadSites() {
		x.s("source i").i(i).s(" (").net(site[0], site[1]).s(", gnd) ").amps(c.Load).end()
	}
	return x.done()
}

// System returns the mesh's nodal equations G·v = b with the supply pads
// eliminated (their voltage is fixed by the sources): one unknown per mesh
// net, numbered row·K + column, G symmetric positive definite, given as
// coordinate triples with both triangles stored.
func (m *Mesh) System() (n int, rows, cols []int32, vals []float64, rhs []float64) {
	c := m.defaults()
	n = c.K * c.K
	g := 1 / c.Segment
	diag := make([]float64, n)
	rhs = make([]float64, n)
	add := func(a, b int) {
		rows = append(rows, int32(a), int32(b))
		cols = append(cols, int32(b), int32(a))
		vals = append(vals, -g, -g)
		diag[a] += g
		diag[b] += g
	}
	for r := 0; r < c.K; r++ {
		for col := 0; col < c.K; col++ {
			i := r*c.K + col
			if col+1 < c.K {
				add(i, i+1)
			}
			if r+1 < c.K {
				add(i, i+c.K)
			}
		}
	}
	for s := 0; s < c.Supplies; s++ {
		r, col := corner(s, c.K)
		i := r*c.K + col
		diag[i] += 1 / c.Pad
		rhs[i] += c.Volts / c.Pad
	}
	for _, site := range m.LoadSites() {
		rhs[site[0]*c.K+site[1]] -= c.Load
	}
	for i, d := range diag {
		rows = append(rows, int32(i))
		cols = append(cols, int32(i))
		vals = append(vals, d)
	}
	return n, rows, cols, vals, rhs
}

// WriteSystem writes System in the Matrix Market coordinate format (real,
// general) followed by nothing else; WriteVector writes the right-hand side
// as a Matrix Market array.
func (m *Mesh) WriteSystem(matrix, vector io.Writer) error {
	n, rows, cols, vals, rhs := m.System()
	x := newW(matrix)
	x.s("%%MatrixMarket matrix coordinate real general").end()
	x.i(n).s(" ").i(n).s(" ").i(len(vals)).end()
	for k := range vals {
		x.i(int(rows[k]) + 1).s(" ").i(int(cols[k]) + 1).s(" ").f(vals[k]).end()
	}
	if err := x.done(); err != nil {
		return err
	}
	y := newW(vector)
	y.s("%%MatrixMarket matrix array real general").end()
	y.i(n).s(" 1").end()
	for _, v := range rhs {
		y.f(v).end()
	}
	return y.done()
}

// Ladder describes a long resistor ladder: N rungs, each a series resistor
// along the rail and a shunt resistor to ground, fed by one source.
type Ladder struct {
	N    int
	Seed uint64 // varies the resistor values
}

// Parts returns how many parts the ladder has.
func (l *Ladder) Parts() int { return 2*l.N + 1 }

// Write writes the ladder design.
func (l *Ladder) Write(out io.Writer) error {
	x := newW(out)
	r := rand.New(rand.NewPCG(l.Seed, 0x6c6164))
	x.s("design ladder").i(l.N).end()
	x.s("ground gnd").end()
	x.s("source vin (r0, gnd) 5 V").end()
	for i := 0; i < l.N; i++ {
		x.s("resistor s").i(i).s(" (r").i(i).s(", r").i(i + 1).s(") ").ohms(float64(1 + r.IntN(99))).end()
		x.s("resistor t").i(i).s(" (r").i(i + 1).s(", gnd) ").ohms(float64(1+r.IntN(99)) * 1e3).s(" tol 1%").end()
	}
	return x.done()
}

// Random describes a random well-posed network of about Parts parts: a
// random tree over its nets rooted at ground (resistors, a few wires and
// inductors with dcr), one voltage source, extra resistors closing loops,
// capacitors, current sources and diodes between nets that already have a
// DC path. Only resistors of 100 Ω and more carry a power rating, which
// the 3.3 V supply cannot exceed, so the design stays clean once solved.
type Random struct {
	Parts int
	Seed  uint64
	// Tol, when set, gives every resistor and source this tolerance (a
	// fraction) instead of the few that have one, and Rated every
	// resistor this power rating in W: for the worst-case benchmarks.
	Tol, Rated float64
}

// Write writes the random design.
func (g *Random) Write(out io.Writer) error {
	x := newW(out)
	r := rand.New(rand.NewPCG(g.Seed, 0x72616e64))
	x.s("design random").i(g.Parts).s(" \"seed ").i(int(g.Seed)).s("\"").end()
	x.s("ground gnd").end()
	// Net 0 is gnd, net 1 the supply.
	x.s("source vs (n1, gnd) 3.3 V tol 5%").end()
	tolAll := func() {
		if g.Tol > 0 {
			x.s(" tol ").f(g.Tol * 100).s("%")
		}
		if g.Rated > 0 {
			x.s(" rated ").f(g.Rated).s(" W")
		}
	}
	nets := max(2, g.Parts/3)
	name := func(i int) *w {
		if i == 0 {
			return x.s("gnd")
		}
		return x.s("n").i(i)
	}
	part := 0
	res := func(a, b int) {
		x.s("resistor r").i(part).s(" (")
		name(a).s(", ")
		name(b).s(") ")
		switch r.IntN(4) {
		case 0:
			x.i(1 + r.IntN(9)).s("k").i(r.IntN(10))
		case 1:
			x.f(float64(1+r.IntN(999)) / 10).s("kΩ")
		case 2:
			x.i(1 + r.IntN(999)).s(" Ω")
			if g.Tol == 0 {
				x.s(" tol 1%")
			}
		default:
			x.i(1 + r.IntN(99)).s(" mΩ")
		}
		tolAll()
		x.end()
		part++
	}
	// Each new net hangs from an earlier one by a tree part, and also gets
	// a resistor to another earlier net, so it has at least two pins. Wires
	// only ever join a new net to its parent, so together with the single
	// source they form a forest and close no loop.
	for i := 2; i < nets; i++ {
		p := r.IntN(i)
		switch r.IntN(20) {
		case 0:
			x.s("wire w").i(part).s(" (")
			name(p).s(", n").i(i).s(")").end()
			part++
		case 1:
			x.s("inductor l").i(part).s(" (")
			name(p).s(", n").i(i).s(") 10 uH dcr 20 mΩ").end()
			part++
		default:
			res(p, i)
		}
		q := r.IntN(i)
		if q == p {
			q = (q + 1) % i
		}
		res(i, q)
	}
	for part+2 < g.Parts {
		a, b := 1+r.IntN(nets-1), r.IntN(nets)
		if a == b {
			continue
		}
		switch r.IntN(10) {
		case 0:
			x.s("capacitor c").i(part).s(" (n").i(a).s(", ")
			name(b).s(") 100 nF tol 10%").end()
		case 1:
			x.s("source j").i(part).s(" (n").i(a).s(", ")
			name(b).s(") ").i(1 + r.IntN(9)).s(" uA")
			if g.Tol > 0 {
				x.s(" tol ").f(g.Tol * 100).s("%")
			}
			x.end()
		case 2:
			x.s("diode d").i(part).s(" (anode=n").i(a).s(", cathode=")
			name(b).s(") vf 0.7 V at 10 mA").end()
		default:
			res(a, b)
			continue
		}
		part++
	}
	return x.done()
}

// Blocks describes a chain of N instances of one block: each cell a
// series pair of resistors with a load resistor and a decoupling capacitor
// at its midpoint, fed by one source and ended by a terminating resistor.
// The series resistance varies by instance through a parameter.
type Blocks struct {
	N    int
	Seed uint64
}

// Parts returns how many parts the design expands to.
func (g *Blocks) Parts() int { return 4*g.N + 2 }

// Write writes the block design.
func (g *Blocks) Write(out io.Writer) error {
	x := newW(out)
	r := rand.New(rand.NewPCG(g.Seed, 0x626c6b))
	x.s("design chain").i(g.N).s(" \"generated chain of ").i(g.N).s(" cells\"").end()
	x.s("block cell (in, out, ret) [r = 10 Ω, load = 1 kΩ] {").end()
	x.s("  resistor RS (in, mid) r").end()
	x.s("  resistor RM (mid, out) r").end()
	x.s("  resistor RL (mid, ret) load  tol 1%").end()
	x.s("  capacitor C (mid, ret) 100 nF").end()
	x.s("}").end()
	x.s("ground gnd").end()
	x.s("source vin (c0, gnd) 5 V").end()
	for i := 1; i <= g.N; i++ {
		x.s("cell x").i(i).s(" (c").i(i - 1).s(", c").i(i).s(", gnd)")
		if r.IntN(2) == 0 {
			x.s(" [r = ").i(1 + r.IntN(99)).s(" Ω]")
		}
		x.end()
	}
	x.s("resistor rend (c").i(g.N).s(", gnd) 1 kΩ").end()
	return x.done()
}
