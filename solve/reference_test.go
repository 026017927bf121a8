package solve

import (
	"fmt"
	"math"
	"testing"

	"nodal/circuit"
)

// vertex coordinates of the regular polyhedra, and their edge length.
type solid struct {
	name  string
	pts   [][3]float64
	edge  float64
	edges int
}

func cyclic(base [][3]float64) [][3]float64 {
	var out [][3]float64
	for _, p := range base {
		out = append(out, p, [3]float64{p[1], p[2], p[0]}, [3]float64{p[2], p[0], p[1]})
	}
	return out
}

func signs(p [3]float64) [][3]float64 {
	var out [][3]float64
	seen := map[[3]float64]bool{}
	for s := 0; s < 8; s++ {
		q := p
		for k := 0; k < 3; k++ {
			if s&(1<<k) != 0 {
				q[k] = -q[k]
			}
		}
		if !seen[q] {
			seen[q] = true
			out = append(out, q)
		}
	}
	return out
}

func solids() []solid {
	phi := (1 + math.Sqrt(5)) / 2
	cube := signs([3]float64{1, 1, 1})
	octa := cyclic(signs([3]float64{1, 0, 0}))
	ico := cyclic(signs([3]float64{0, 1, phi}))
	dodeca := append(append([][3]float64{}, cube...), cyclic(signs([3]float64{0, 1 / phi, phi}))...)
	tetra := [][3]float64{{1, 1, 1}, {1, -1, -1}, {-1, 1, -1}, {-1, -1, 1}}
	return []solid{
		{"tetrahedron", tetra, 2 * math.Sqrt2, 6},
		{"cube", cube, 2, 12},
		{"octahedron", octa, math.Sqrt2, 12},
		{"icosahedron", ico, 2, 30},
		{"dodecahedron", dodeca, 2 / phi, 30},
	}
}

func dist(a, b [3]float64) float64 {
	return math.Sqrt((a[0]-b[0])*(a[0]-b[0]) + (a[1]-b[1])*(a[1]-b[1]) + (a[2]-b[2])*(a[2]-b[2]))
}

// polyhedron wires a resistor of r ohms along every edge of s and returns
// the builder; vertex k is net "vk".
func polyhedron(t *testing.T, s solid, r float64) *builder {
	b := newBuilder()
	n := 0
	for i := range s.pts {
		for j := i + 1; j < len(s.pts); j++ {
			if math.Abs(dist(s.pts[i], s.pts[j])-s.edge) < 1e-9 {
				b.r(fmt.Sprintf("v%d", i), fmt.Sprintf("v%d", j), r)
				n++
			}
		}
	}
	if n != s.edges {
		t.Fatalf("%s: %d edges, want %d", s.name, n, s.edges)
	}
	return b
}

// TestPolyhedra checks the two-point resistances of the regular polyhedra
// of equal resistors against their closed forms: van Steenwijk, "Equivalent
// resistors of polyhedral resistive structures", Am. J. Phys. 66, 90
// (1998), as tabulated in /work/shared/reference/circuit-checks.md.
func TestPolyhedra(t *testing.T) {
	const R = 470.0
	type pair struct {
		solid string
		d     float64 // vertex distance in units of the edge length; 0: farthest
		want  float64 // in units of R
	}
	cases := []pair{
		{"tetrahedron", 1, 1.0 / 2},
		{"cube", 1, 7.0 / 12},
		{"cube", math.Sqrt2, 3.0 / 4},
		{"cube", 0, 5.0 / 6},
		{"octahedron", 1, 5.0 / 12},
		{"octahedron", 0, 1.0 / 2},
		{"dodecahedron", 1, 19.0 / 30},
		{"icosahedron", 1, 11.0 / 30},
	}
	byName := map[string]solid{}
	for _, s := range solids() {
		byName[s.name] = s
	}
	for _, c := range cases {
		s := byName[c.solid]
		far := 0.0
		for _, p := range s.pts {
			far = math.Max(far, dist(s.pts[0], p))
		}
		target := c.d * s.edge
		if c.d == 0 {
			target = far
		}
		other := -1
		for k, p := range s.pts {
			if math.Abs(dist(s.pts[0], p)-target) < 1e-9 {
				other = k
				break
			}
		}
		if other < 0 {
			t.Fatalf("%s: no vertex at distance %g", c.solid, target)
		}
		b := polyhedron(t, s, R)
		got := b.resistance(t, "v0", fmt.Sprintf("v%d", other)) / R
		if !near(got, c.want, 1e-12) {
			t.Errorf("%s, vertices %g apart: R = %.15g R, want %.15g R", c.solid, target, got, c.want)
		}
	}
}

// grid builds a k × k square grid of r-ohm resistors; node (i, j) is net
// "gi_j".
func grid(k int, r float64) *builder {
	b := newBuilder()
	name := func(i, j int) string { return fmt.Sprintf("g%d_%d", i, j) }
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			if i+1 < k {
				b.r(name(i, j), name(i+1, j), r)
			}
			if j+1 < k {
				b.r(name(i, j), name(i, j+1), r)
			}
		}
	}
	return b
}

// TestSquareGrid approaches the infinite square lattice, R/2 between
// neighbours and 2R/π across a diagonal (Atkinson & van Steenwijk,
// "Infinite resistive lattices", Am. J. Phys. 67, 486 (1999)), with a
// finite grid measured at its centre.
//
// Tolerance: by Rayleigh's monotonicity law (Doyle & Snell, Random Walks
// and Electric Networks, 1984) the finite grid, a sub-network of the
// infinite one, can only be more resistive, so the infinite value is a hard
// lower bound. The excess comes from the dipole field cut off at the
// boundary; its energy outside radius L falls as 1/L², so the excess scales
// as (1/k)². The reference measurements on a 301 × 301 grid (excess 6e-6 R
// and 1.2e-5 R) scale to about 3.4e-4 R and 6.8e-4 R at k = 41; the bound
// below allows three times that.
func TestSquareGrid(t *testing.T) {
	const k = 41
	const R = 1000.0
	c := k / 2
	cases := []struct {
		di, dj int
		want   float64 // in units of R
		tol    float64
	}{
		{1, 0, 0.5, 3 * 3.4e-4},
		{1, 1, 2 / math.Pi, 3 * 6.8e-4},
	}
	for _, tc := range cases {
		b := grid(k, R)
		got := b.resistance(t, fmt.Sprintf("g%d_%d", c, c), fmt.Sprintf("g%d_%d", c+tc.di, c+tc.dj)) / R
		if got < tc.want-1e-12 || got > tc.want+tc.tol {
			t.Errorf("(%d,%d) on a %d×%d grid: %.6f R, want within [%.6f, %.6f] R", tc.di, tc.dj, k, k, got, tc.want, tc.want+tc.tol)
		}
	}
}

// TestR2RLadder: with bits switched by wires to Vref or ground, an
// unloaded R-2R ladder puts out Vref·code/2ⁿ (the R-2R identity of
// circuit-checks.md; any data-converter text, e.g. Horowitz & Hill, The Art
// of Electronics, 3rd ed., 2015, from memory).
func TestR2RLadder(t *testing.T) {
	const bits = 8
	const vref = 2.5
	const R = 10e3
	for _, code := range []int{0, 1, 2, 85, 128, 170, 254, 255} {
		b := newBuilder()
		b.v("vref", "gnd", vref)
		// n0 is the least significant end, terminated by 2R to ground.
		b.r("n0", "gnd", 2*R)
		for i := 0; i < bits; i++ {
			node := fmt.Sprintf("n%d", i)
			bit := fmt.Sprintf("b%d", i)
			b.r(node, bit, 2*R)
			if code&(1<<i) != 0 {
				b.wire(bit, "vref")
			} else {
				b.wire(bit, "gnd")
			}
			if i+1 < bits {
				b.r(node, fmt.Sprintf("n%d", i+1), R)
			}
		}
		r := b.solve(t, nil)
		got := b.volts(r, fmt.Sprintf("n%d", bits-1))
		want := vref * float64(code) / (1 << bits)
		if math.Abs(got-want) > 1e-12*vref {
			t.Errorf("code %d: %.15g V, want %.15g V", code, got, want)
		}
	}
}

// TestThermalVoltage: kT/q from the exact SI constants (CODATA 2018) is
// 25.6926 mV at 25 °C and 25.8520 mV at 300 K (circuit-checks.md).
func TestThermalVoltage(t *testing.T) {
	if got := ThermalVoltage(RoomTemperature); math.Abs(got-25.6926e-3) > 0.00005e-3 {
		t.Errorf("Vt(298.15 K) = %.7g V, want 25.6926 mV", got)
	}
	if got := ThermalVoltage(300); math.Abs(got-25.8520e-3) > 0.00005e-3 {
		t.Errorf("Vt(300 K) = %.7g V, want 25.8520 mV", got)
	}
}

// TestShockley solves a source, a resistor and a junction, and checks the
// solved point against the Shockley equation I = Is·(exp(V/(n·Vt)) − 1)
// with Vt from the CODATA 2018 constants, and against Kirchhoff's voltage
// law around the loop.
func TestShockley(t *testing.T) {
	vt := 1.380649e-23 * 298.15 / 1.602176634e-19 // CODATA 2018, at 25 °C
	cases := []struct {
		kind               circuit.Kind
		vs, r, vf, at, ser float64
		n                  float64
	}{
		{circuit.Diode, 5, 1e3, 0.7, 10e-3, 0, 0},
		{circuit.Diode, 12, 220, 0.65, 1e-3, 0.5, 1.8},
		{circuit.LED, 5, 150, 2.0, 20e-3, 0, 0},
		{circuit.LED, 3.3, 47, 1.9, 10e-3, 5, 0},
		{circuit.Diode, -5, 1e3, 0.7, 10e-3, 0, 0}, // reverse biased
		{circuit.Diode, 100, 10, 0.8, 1, 0.05, 0},  // hard forward drive
	}
	for _, c := range cases {
		b := newBuilder()
		b.v("in", "gnd", c.vs)
		b.r("in", "a", c.r)
		d := b.add(circuit.Part{Kind: c.kind, VF: c.vf, VFAt: c.at, Series: c.ser, Ideality: c.n}, "a", "gnd")
		r := b.solve(t, nil)
		n := c.n
		if n == 0 {
			n = 1 // diode, common practice
			if c.kind == circuit.LED {
				n = 2 // LED, common practice
			}
		}
		vj0 := c.vf - c.at*c.ser
		is := c.at / (math.Exp(vj0/(n*vt)) - 1)
		vj := r.V[d] - r.I[d]*c.ser
		want := is*(math.Exp(vj/(n*vt))-1) + Leakage*vj
		if !near(r.I[d], want, 1e-9) && math.Abs(r.I[d]-want) > 1e-18 {
			t.Errorf("%v at %g V: I = %.12g A, Shockley gives %.12g A at %.9g V", c.kind, c.vs, r.I[d], want, vj)
		}
		if kvl := c.vs - r.I[d]*c.r - r.V[d]; math.Abs(kvl) > 1e-9*math.Abs(c.vs) {
			t.Errorf("%v at %g V: KVL residual %g V", c.kind, c.vs, kvl)
		}
		if c.vs > 0 && r.I[d] <= 0 || c.vs < 0 && r.I[d] >= 0 {
			t.Errorf("%v at %g V: current %g A has the wrong sign", c.kind, c.vs, r.I[d])
		}
	}
}
