package solve

import (
	"math"

	"nodal/circuit"
)

// Physical constants, exact in the SI since 2019 (CODATA 2018).
const (
	Boltzmann = 1.380649e-23    // J/K
	Charge    = 1.602176634e-19 // C
	// RoomTemperature is 25 °C in kelvin.
	RoomTemperature = 298.15
	// Leakage is the conductance placed across every junction (S).
	Leakage = 1e-12
)

// ThermalVoltage returns kT/q at temperature t in kelvin.
func ThermalVoltage(t float64) float64 { return Boltzmann * t / Charge }

// Ideality returns a diode's or LED's ideality factor: the one written, or
// 1 for a diode and 2 for an LED (common practice).
func Ideality(p *circuit.Part) float64 {
	if p.Ideality > 0 {
		return p.Ideality
	}
	if n := p.Kind.Info().Ideality; n > 0 {
		return n
	}
	return 1
}

// SaturationCurrent returns the Is that makes a junction of ideality n
// carry p.VFAt at the junction voltage p.VF − p.VFAt·p.Series, and that
// junction voltage. ok is false when the series resistance alone drops vf.
func SaturationCurrent(p *circuit.Part, vt float64) (is, vj float64, ok bool) {
	vj = p.VF - p.VFAt*p.Series
	if vj <= 0 || p.VFAt <= 0 {
		return 0, vj, false
	}
	is = p.VFAt / math.Expm1(vj/(Ideality(p)*vt))
	return is, vj, is > 0 && !math.IsInf(is, 0)
}

// MaxOverdrive caps the exponent of the Shockley equation at the vf point
// plus MaxOverdrive·n·Vt, where a junction carries e^20 ≈ 4.9e8 times its vf
// current; above it the exponential is continued by its tangent, so that
// nothing overflows and a junction forced hard forward (an LED straight
// across a supply) still gives a well-scaled system. Any current in that
// range is far past every rating, and the rating rules say so.
const MaxOverdrive = 20

// junction is the Newton state of one diode or LED.
type junction struct {
	part    circuit.PartID
	a, c    int32   // junction unknowns: anode side (internal when there is series resistance) and cathode
	oa, oc  float64 // their potentials above those unknowns at full source values (see model.off)
	is, nvt float64
	vref    float64   // junction voltage at the vf point
	br      Breakdown // the reverse exponential; zero for a junction without breakdown
	vj      float64   // linearisation point; 0 V (off) when Newton starts
	iLin    float64   // current of the last linear solve
	vLast   float64   // junction voltage of the last linear solve
	settled bool
}

// eval returns the Shockley current and its derivative at v, with the
// breakdown's reverse exponential added.
func (j *junction) eval(v float64) (id, gd float64) {
	id, gd = j.shockley(v)
	ib, gb := j.br.Eval(v)
	return id + ib, gd + gb
}

// shockley returns the forward exponential's current and derivative at v.
func (j *junction) shockley(v float64) (id, gd float64) {
	arg := v / j.nvt
	if top := j.vref/j.nvt + MaxOverdrive; arg > top {
		e := math.Exp(top)
		return j.is * (e*(1+arg-top) - 1), j.is * e / j.nvt
	}
	e := math.Exp(arg)
	return j.is * (e - 1), j.is * e / j.nvt
}

// limit damps a forward step of the junction voltage from j.vj to vraw.
// Up to the vf point the junction carries at most its vf current, which
// the exponential cannot overshoot, so a step that ends there is taken
// whole, and a junction coming up from below its vf point moves at most
// to it. Past the vf point a step up of more than 2·n·Vt is replaced by
// the voltage at which the junction would carry the current its linear
// model predicts at vraw (current iteration; Vlach & Singhal, Computer
// Methods for Circuit Analysis and Design, 1983, from memory). (Damping
// every step of more than 2·n·Vt, below the vf point too, takes a junction
// up from a few tenths of a volt by a few n·Vt a step.) Steps down are taken
// whole unless the junction has a breakdown, whose own step limiting
// (Breakdown.limit) damps them, the mirror of this one about its knee.
func (j *junction) limit(vraw float64) (float64, bool) {
	vold := j.vj
	if vraw <= vold+2*j.nvt {
		return j.br.limit(vold, vraw)
	}
	if vraw <= j.vref {
		return vraw, false
	}
	if vold < j.vref {
		return j.vref, true
	}
	if vold >= j.vref+MaxOverdrive*j.nvt {
		return vraw, false // the tangent continuation is linear: no damping needed
	}
	id, gd := j.shockley(vold)
	ilin := id + gd*(vraw-vold)
	if ilin <= 0 {
		return vold + 2*j.nvt, true
	}
	v := j.nvt * math.Log1p(ilin/j.is)
	v = math.Min(math.Max(v, vold), vraw)
	return v, v != vraw
}
