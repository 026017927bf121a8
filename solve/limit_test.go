package solve

import (
	"math"
	"testing"

	"pgregory.net/rapid"
)

// junction.limit on a junction without breakdown: the step it keeps runs
// from the old point towards the new one and never past it; a step down,
// and a step up that ends at or below the vf point (where the junction
// carries at most its vf current), is taken whole; a step past the vf
// point from below it stops at the vf point; and from at or above the vf
// point a step past 2·n·Vt keeps no more current than the linear model
// predicted at the new point (current iteration), so the exponential is
// never evaluated past what the linear solve asked for. Shockley's
// equation I = Is·(exp(V/(n·Vt)) − 1) is the model (W. Shockley, Bell
// Syst. Tech. J. 28, 1949, from memory).
func TestJunctionLimit(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		nvt := rapid.SampledFrom([]float64{1, 2}).Draw(t, "n") * ThermalVoltage(RoomTemperature)
		vref := rapid.Float64Range(0.2, 3.5).Draw(t, "vf")
		j := junction{nvt: nvt, vref: vref, is: 0.01 / math.Expm1(vref/nvt)}
		j.vj = rapid.Float64Range(-5, vref+1).Draw(t, "vold")
		vraw := rapid.Float64Range(-5, vref+3).Draw(t, "vraw")
		v, limited := j.limit(vraw)
		lo, hi := math.Min(j.vj, vraw), math.Max(j.vj, vraw)
		if v < lo || v > hi {
			t.Fatalf("from %g towards %g the limit gave %g, outside the step", j.vj, vraw, v)
		}
		if limited == (v == vraw) {
			t.Fatalf("from %g towards %g: kept %g, limited %v", j.vj, vraw, v, limited)
		}
		switch {
		case vraw <= j.vj+2*nvt || vraw <= vref:
			if v != vraw {
				t.Fatalf("from %g to %g (vf point %g): the step was cut to %g", j.vj, vraw, vref, v)
			}
		case j.vj < vref:
			if v != vref {
				t.Fatalf("from %g to %g past the vf point %g: kept %g, want the vf point", j.vj, vraw, vref, v)
			}
		case j.vj < vref+MaxOverdrive*nvt:
			id, gd := j.shockley(j.vj)
			ilin := id + gd*(vraw-j.vj)
			if got, _ := j.shockley(v); got > ilin*(1+1e-12) {
				t.Fatalf("from %g to %g: kept %g, where the junction carries %g A, past the linear model's %g A", j.vj, vraw, v, got, ilin)
			}
		}
	})
}

// While junction limiting cuts the Newton steps the forcing term stays at
// its loosest, whatever the residual did; once a step is taken whole the
// term follows Eisenstat & Walker's choice 2, γ·(f/f_prev)^α (SIAM J. Sci.
// Comput. 17(1), 1996).
func TestForcingWhileDamped(t *testing.T) {
	var p pcgSolver
	p.startNewton()
	if eta := p.forcing(1); eta != etaMax {
		t.Fatalf("first step: forcing term %g, want %g", eta, etaMax)
	}
	p.damped = true
	if eta := p.forcing(1e-3); eta != etaMax {
		t.Fatalf("after a limited step, residual fallen by 1000: forcing term %g, want %g", eta, etaMax)
	}
	p.damped = false
	want := etaGamma * math.Pow(1e-2, etaAlpha)
	if eta := p.forcing(1e-5); math.Abs(eta-want) > 1e-15 {
		t.Fatalf("after a whole step, residual fallen by 100: forcing term %g, want %g", eta, want)
	}
}
