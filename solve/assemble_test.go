package solve

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// An assembly that restores the fixed stamps saved for its lambda and
// stamps only the junctions, loads and gmin gives, bit for bit, the system
// a full assembly gives: the off-diagonal values, the diagonal and the
// right side with what their double-double sums carry below them, and the
// sparse matrix refreshed from the fixed stamps' sums. Checked
// on random networks with diodes, sources and current sources, in the
// eliminated and the branch-current formulation, across Newton-like
// changes of the junctions' points and changes of lambda (source
// stepping) and gmin.
func TestAssemblyRestoresFixedStamps(t *testing.T) {
	for _, seed := range []uint64{1, 2} {
		d := randomDesign(t, 2000, seed)
		for _, mna := range []bool{false, true} {
			vt := ThermalVoltage(RoomTemperature)
			fast, err := build(d, vt, mna)
			if err != nil {
				t.Fatal(err)
			}
			full, err := build(d, vt, mna)
			if err != nil {
				t.Fatal(err)
			}
			if len(fast.junc) == 0 {
				t.Fatalf("seed %d: no junctions to vary", seed)
			}
			r := rand.New(rand.NewPCG(seed, 7))
			restored := 0
			var sm sparseMatrix
			for step, lambda := range []float64{1, 1, 1, 0.25, 0.25, 1, 0.5, 1} {
				for k := range fast.junc {
					v := 1.5*r.Float64() - 0.7
					fast.junc[k].vj, full.junc[k].vj = v, v
				}
				gmin := 0.0
				if step%3 == 2 {
					gmin = math.Pow(10, -float64(2+step))
				}
				if fast.linear.ok && fast.linear.lambda == lambda {
					restored++
				}
				fast.assemble(lambda, gmin)
				full.linear.ok = false
				full.assemble(lambda, gmin)
				a, b := fast.sys, full.sys
				// The matrix refreshed from the fixed stamps' sums equals
				// one summed from every stamp.
				sm.update(a)
				if step > 0 {
					ref := sm.a.Copy()
					ref.SetValues(a.val, sm.slot)
					if !slices.Equal(sm.a.X, ref.X) {
						t.Fatalf("seed %d, mna %v, step %d: the refreshed matrix differs from the stamps' sums", seed, mna, step)
					}
				}
				for _, c := range []struct {
					name   string
					fa, fb []float64
				}{{"entries", a.val, b.val}, {"diagonal", a.diag, b.diag}, {"diagonal's low part", a.diagLo, b.diagLo},
					{"right side", a.rhs, b.rhs}, {"right side's low part", a.rhsLo, b.rhsLo}} {
					if !slices.Equal(c.fa, c.fb) {
						t.Fatalf("seed %d, mna %v, step %d (lambda %g, gmin %g): the %s differ from a full assembly", seed, mna, step, lambda, gmin, c.name)
					}
				}
			}
			if restored < 3 {
				t.Fatalf("seed %d, mna %v: the fixed stamps were restored %d times, want at least 3", seed, mna, restored)
			}
		}
	}
}
