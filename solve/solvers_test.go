package solve

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"pgregory.net/rapid"

	"nodal/circuit"
)

// forced lists the linear solvers and formulations that the automatic
// choice picks between; every one must give the same operating point.
var forced = []struct {
	name string
	opt  Options
}{
	{"dense LU, eliminated", Options{Solver: DenseLU}},
	{"dense LU, MNA", Options{Solver: DenseLU, MNA: true}},
	{"sparse Cholesky", Options{Solver: SparseCholesky}},
	{"PCG+AMG", Options{Solver: PCGAMG}},
	{"sparse LU, eliminated", Options{Solver: SparseLU}},
	{"sparse LU, MNA", Options{Solver: SparseLU, MNA: true}},
}

// TestSolversAgree: on random well-posed circuits, with and without diodes,
// every linear solver and both formulations agree with gonum's dense LU on
// the branch-current (MNA) equations to 1e-9 of the largest voltage and
// current, and each result passes the self-checks (KCL, Tellegen).
func TestSolversAgree(t *testing.T) {
	// A forced solver may rarely fail to converge where the reference
	// did (rounding steers Newton differently); allowed as often as in
	// TestRandomJunctions.
	runs, unsettled := 0, 0
	defer func() {
		if unsettled > 1+runs/200 {
			t.Errorf("%d of %d solves with forced solvers did not converge", unsettled, runs)
		}
	}()
	rapid.Check(t, func(t *rapid.T) {
		b := randomCircuit(t)
		// Newton stops when a step is below vTolRel = 1e-9 of the
		// unknowns, so two solves of a circuit with junctions agree to a
		// few times that, not to rounding.
		tol := 1e-9
		if rapid.Bool().Draw(t, "junctions") {
			tol = 1e-8
			nets := len(b.d.Nets)
			for k := rapid.IntRange(1, 3).Draw(t, "count"); k > 0; k-- {
				x, y := rapid.IntRange(0, nets-1).Draw(t, "anode"), rapid.IntRange(0, nets-1).Draw(t, "cathode")
				if x != y {
					b.add(circuit.Part{Kind: circuit.Diode, VF: 0.7, VFAt: 0.01, Series: rapid.SampledFrom([]float64{0, 1}).Draw(t, "series")},
						b.d.Nets[x].Local, b.d.Nets[y].Local)
				}
			}
		}
		ref, err := Solve(b.d, &Options{Solver: DenseLU, MNA: true})
		var se *Error
		if errors.As(err, &se) && se.Kind == NoConvergence {
			t.Skip("reference did not converge") // counted by TestRandomJunctions
		}
		if err != nil {
			t.Fatalf("reference: %v", err)
		}
		// The reference carries its own rounding: forward error ≲ κ·u
		// (Higham, Accuracy and Stability of Numerical Algorithms, 2002,
		// §7.1). A junction forced hard forward across a source is a huge
		// conductance in the branch-current equations, and nothing in the
		// eliminated ones.
		tol = math.Max(tol, 10*ref.Cond*0x1p-53)
		vs, is := 0.0, 0.0
		for _, v := range ref.NetV {
			vs = math.Max(vs, math.Abs(v))
		}
		for _, v := range ref.I {
			is = math.Max(is, math.Abs(v))
		}
		// A current worked out from two node voltages is only as precise
		// as they are: judge currents against what a part would carry with
		// one end at 0 V, as the KCL self-check does (see the package doc).
		is = math.Max(is, ref.KCLScale)
		for _, f := range forced {
			runs++
			r, err := Solve(b.d, &f.opt)
			if errors.As(err, &se) && se.Kind == NoConvergence {
				unsettled++
				continue
			}
			if err != nil {
				t.Fatalf("%s: %v", f.name, err)
			}
			if r.MNA != f.opt.MNA {
				t.Fatalf("%s: MNA %v", f.name, r.MNA)
			}
			for i := range ref.NetV {
				if math.Abs(r.NetV[i]-ref.NetV[i]) > tol*vs+1e-12 {
					t.Fatalf("%s: net %s at %.12g V, reference %.12g V", f.name, b.d.Nets[i].Local, r.NetV[i], ref.NetV[i])
				}
			}
			for i := range ref.I {
				if math.Abs(r.I[i]-ref.I[i]) > tol*is+1e-15 {
					t.Fatalf("%s: part %s carries %.12g A, reference %.12g A", f.name, b.d.Parts[i].Local, r.I[i], ref.I[i])
				}
			}
			assertKirchhoff(t, b.d, r)
		}
	})
}

// mesh builds a k×k grid of equal resistors fed at one corner by a source
// through a pad resistor, with sinks at a few nets: the shape of the power
// meshes the iterative path is for.
func mesh(k int, seg float64, junctions bool) *builder {
	b := newBuilder()
	name := func(r, c int) string { return fmt.Sprintf("n%d_%d", r, c) }
	b.v("pad", "gnd", 1)
	b.r("pad", name(0, 0), 1e-3)
	for r := 0; r < k; r++ {
		for c := 0; c < k; c++ {
			if c+1 < k {
				b.r(name(r, c), name(r, c+1), seg)
			}
			if r+1 < k {
				b.r(name(r, c), name(r+1, c), seg)
			}
		}
	}
	for s := 1; s <= 5; s++ {
		r, c := (s*7)%k, (s*13)%k
		if junctions {
			b.add(circuit.Part{Kind: circuit.LED, VF: 0.5, VFAt: 0.02, Series: 2}, name(r, c), "gnd")
		} else {
			b.i(name(r, c), "gnd", 1e-3)
		}
	}
	return b
}

// TestMeshSolversAgree: on meshes of a few thousand nets — past the dense
// crossover, and with LEDs so that Newton refactors — the sparse solvers
// agree with each other and with the dense LU, and the PCG path passes
// the KCL self-check (≤ 1e-9 of the largest current).
func TestMeshSolversAgree(t *testing.T) {
	for _, led := range []bool{false, true} {
		b := mesh(40, 0.01, led)
		ref := b.solve(t, &Options{Solver: DenseLU})
		for _, kind := range []LinearSolver{SparseCholesky, PCGAMG, SparseLU} {
			r := b.solve(t, &Options{Solver: kind})
			if r.Linear != kind {
				t.Errorf("LEDs %v: asked for %v, solved by %v", led, kind, r.Linear)
			}
			for i := range ref.NetV {
				if math.Abs(r.NetV[i]-ref.NetV[i]) > 1e-9 {
					t.Fatalf("LEDs %v, %v: net %s at %.12g V, dense %.12g V", led, kind, b.d.Nets[i].Local, r.NetV[i], ref.NetV[i])
				}
			}
			if !(r.KCL <= KCLTol*r.KCLScale) {
				t.Errorf("LEDs %v, %v: KCL residual %g of %g", led, kind, r.KCL, r.KCLScale)
			}
		}
	}
}

// TestAutoChoice: the automatic choice takes the dense LU for tiny
// systems, sparse Cholesky for the eliminated equations of mid-sized ones
// and PCG+AMG beyond AutoCholeskyMax; no size is refused.
func TestAutoChoice(t *testing.T) {
	cases := []struct {
		k    int
		want LinearSolver
	}{{5, DenseLU}, {20, SparseCholesky}, {210, PCGAMG}}
	for _, c := range cases {
		r := mesh(c.k, 0.01, false).solve(t, nil)
		if r.Linear != c.want || r.MNA {
			t.Errorf("%d×%d mesh (%d unknowns): %v, MNA %v; want %v", c.k, c.k, r.Unknowns, r.Linear, r.MNA, c.want)
		}
		if c.want == PCGAMG && (r.CondEstimated || r.Cond != 0) {
			t.Errorf("PCG path reports a condition estimate %g", r.Cond)
		}
	}
}

// greenhouse is the sensor node of the language description (issue 2):
// D2 sits behind an open switch, at 0 V with about 1e-12 S, beside an
// 80 mΩ dcr and 10 kΩ resistors.
func greenhouse() *builder {
	b := newBuilder()
	b.v("vin", "gnd", 12)
	b.add(circuit.Part{Kind: circuit.Fuse, Value: 0.25}, "vin", "vfused")
	b.r("vfused", "led_a", 1e3)
	b.add(circuit.Part{Kind: circuit.LED, VF: 2, VFAt: 0.02}, "led_a", "gnd")
	b.r("vfused", "probe_out", 10e3)
	b.r("probe_out", "gnd", 4.7e3)
	b.add(circuit.Part{Kind: circuit.Capacitor, Value: 100e-9}, "probe_out", "gnd")
	b.add(circuit.Part{Kind: circuit.Inductor, Value: 22e-6, DCR: 0.08}, "vfused", "vsw")
	b.i("vsw", "gnd", 0.035)
	b.add(circuit.Part{Kind: circuit.Switch}, "vsw", "aux")
	b.wire("aux", "aux2")
	b.add(circuit.Part{Kind: circuit.Diode, VF: 0.7, VFAt: 0.01}, "aux2", "gnd")
	return b
}

// TestConditionEquilibrated: the condition estimate is that of the
// symmetrically equilibrated system (van der Sluis, "Condition numbers and
// equilibration of matrices", Numer. Math. 14, 1969), so unknowns of very
// different scale alone raise no alarm, while values that really cancel
// do. For R–r–R in series from a source (r ≪ R) the two unknowns give
// A = [[G+g, −G], [−G, G+g]], G = 1/r, g = 1/R; its Jacobi-scaled form has
// κ₁ = κ₂ = (2G + g)/g = 2R/r + 1 (worked by hand from the 2×2 inverse).
// Hager's estimate is a lower bound, almost always within a small factor
// (Higham, ACM TOMS 14(4), 1988); from above it can only be off by the
// accuracy of the solves it uses, about κ·u.
func TestConditionEquilibrated(t *testing.T) {
	kinds := []Options{{Solver: DenseLU}, {Solver: SparseCholesky}, {Solver: SparseLU}, {Solver: DenseLU, MNA: true}, {Solver: SparseLU, MNA: true}}
	for _, opt := range kinds {
		g := greenhouse()
		r := g.solve(t, &opt)
		if !r.CondEstimated || r.Cond > 1e6 {
			t.Errorf("%v MNA %v: greenhouse node condition %g (estimated %v), want ≤ 1e6", opt.Solver, opt.MNA, r.Cond, r.CondEstimated)
		}
		for _, small := range []float64{1e-3, 1} {
			b := newBuilder()
			b.v("a", "gnd", 1)
			b.r("a", "b", 1e12)
			b.r("b", "c", small)
			b.r("c", "gnd", 1e12)
			r := b.solve(t, &opt)
			want := 2*1e12/small + 1
			if opt.MNA {
				want = 0 // the source row changes the matrix: only the order of magnitude is checked
			}
			if !(r.Cond >= 1e12/small) || !(r.Cond <= 1e13/small) || want > 0 && !(r.Cond >= want/3 && r.Cond <= want*(1+2*want*0x1p-52)) {
				t.Errorf("%v MNA %v: 1 TΩ, %g Ω, 1 TΩ in series: condition %g, want about %g", opt.Solver, opt.MNA, small, r.Cond, 2e12/small)
			}
		}
	}
}
