package solve

import (
	"bytes"
	"errors"
	"math"
	"testing"

	"nodal/circuit"
	"nodal/diag"
	"nodal/grammar"
	"nodal/internal/gen"
)

// randomDesign parses a random network from the generator.
func randomDesign(t *testing.T, parts int, seed uint64) *circuit.Design {
	t.Helper()
	var src bytes.Buffer
	if err := (&gen.Random{Parts: parts, Seed: seed}).Write(&src); err != nil {
		t.Fatal(err)
	}
	fset := diag.NewFileSet()
	file := fset.AddFile("random.nodal", src.Bytes())
	r := circuit.Build(file, grammar.Parse("random.nodal", src.Bytes()))
	if r.Design == nil {
		t.Fatal("random design did not build")
	}
	return r.Design
}

// The iterative fallbacks of random networks (no small separators), forced
// by Options.Solver, agree with gonum's dense LU (the reference) on every
// net voltage and pass the KCL self-check, diodes and their Newton
// iterations included, and say which solver ran. Plain aggregation, the
// fallback PCGAMG takes, agrees to 1e-9 of the largest voltage. Jacobi, the
// last resort, is held to 3e-8: diagonal scaling leaves the contrast
// between milliohm clusters and the kiloohms between them, so its error is
// up to κ(D⁻¹A) times its 1e-12 residual (Golub & Van Loan, Matrix
// Computations, 4th ed., 2013, §2.6, from memory), and a tighter residual
// is past what its recurrence attains on some of these designs.
func TestRandomNetworkFallbacksMatchDense(t *testing.T) {
	for _, seed := range []uint64{1, 2, 3} {
		d := randomDesign(t, 3000, seed)
		ref, err := Solve(d, &Options{Solver: DenseLU})
		if err != nil {
			t.Fatalf("seed %d: dense reference: %v", seed, err)
		}
		vmax := 0.0
		for _, v := range ref.NetV {
			vmax = math.Max(vmax, math.Abs(v))
		}
		for _, kind := range []LinearSolver{PCGPlainAMG, PCGJacobi} {
			tol := 1e-9
			if kind == PCGJacobi {
				tol = 3e-8
			}
			r, err := Solve(d, &Options{Solver: kind})
			if err != nil {
				t.Fatalf("seed %d, %v: %v", seed, kind, err)
			}
			if r.Linear != kind {
				t.Errorf("seed %d: asked for %v, solved by %v", seed, kind, r.Linear)
			}
			if r.PCGIterations == 0 {
				t.Errorf("seed %d, %v: no PCG iterations counted", seed, kind)
			}
			worst := 0.0
			for i := range ref.NetV {
				worst = math.Max(worst, math.Abs(r.NetV[i]-ref.NetV[i])/vmax)
				if math.Abs(r.NetV[i]-ref.NetV[i]) > tol*vmax {
					t.Fatalf("seed %d, %v: net %s: %.12g V, dense %.12g V", seed, kind, d.Nets[i].Local, r.NetV[i], ref.NetV[i])
				}
			}
			t.Logf("seed %d, %v: %d PCG iterations, largest difference %.2g of the largest voltage", seed, kind, r.PCGIterations, worst)
			if !(r.KCL <= KCLTol*r.KCLScale) {
				t.Errorf("seed %d, %v: KCL residual %g of %g", seed, kind, r.KCL, r.KCLScale)
			}
		}
	}
}

// On a random network the smoothed-aggregation hierarchy fills in past
// maxComplexity at its first coarse level; PCGAMG then runs on plain
// aggregation instead of refusing, and agrees with the dense reference.
func TestRandomNetworkAMGFallsBack(t *testing.T) {
	d := randomDesign(t, 12000, 1)
	r, err := Solve(d, &Options{Solver: PCGAMG})
	if err != nil {
		t.Fatal(err)
	}
	if r.Linear != PCGPlainAMG {
		t.Fatalf("solved by %v, want %v", r.Linear, PCGPlainAMG)
	}
	if !(r.KCL <= KCLTol*r.KCLScale) {
		t.Errorf("KCL residual %g of %g", r.KCL, r.KCLScale)
	}
}

// The automatic choice gives a mid-sized random network to Cholesky by
// size, whose symbolic analysis (before any numeric work) finds the factor
// past fillBudget when the budget is small; with the real budget the
// fallback is taken only when the analysis says so. Here the analysis is
// checked directly with a budget of a tenth of the true fill.
func TestCholeskyFillDetectedBeforeFactor(t *testing.T) {
	d := randomDesign(t, 3000, 1)
	m, err := build(d, ThermalVoltage(RoomTemperature), false)
	if err != nil {
		t.Fatal(err)
	}
	m.assemble(1, 0)
	c := &cholSolver{}
	if err := c.probe(m.sys); err != nil {
		t.Fatalf("probe with the real budget: %v", err)
	}
	nl := c.ch.NnzL()
	c2 := &cholSolver{}
	c2.m.update(m.sys)
	err = c2.ch.AnalyzeBudget(c2.m.a, nl/10)
	if err == nil {
		t.Fatalf("budget %d of %d entries accepted", nl/10, nl)
	}
	if c2.analysed {
		t.Fatal("a refused analysis left the solver analysed")
	}
	var se *Error
	if errors.As(err, &se) {
		t.Fatalf("sparse layer returned a solve error: %v", err)
	}
}
