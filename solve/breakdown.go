package solve

// breakdown.go: a diode's reverse breakdown, the mirror of its forward
// exponential.

import (
	"math"

	"nodal/circuit"
)

// Breakdown is the reverse exponential of a diode with a breakdown
// attribute. Past its breakdown voltage a junction's reverse current grows
// exponentially with the reverse voltage; nodal models it as the forward
// Shockley term mirrored about the breakdown point (an empirical form,
// common practice for DC models of clamp and reference diodes):
//
//	Ib(V) = −It·(exp(−(V + Vb)/(n·Vt)) − exp(−Vb/(n·Vt)))
//
// where It is the test current of "breakdown BV at It", Vb = BV − It·Rs is
// the junction's share of BV behind the series resistance Rs, n the
// junction's ideality and Vt = kT/q at 25 °C. It carries exactly −It at
// V = −Vb and nothing at V = 0. The breakdown voltage is taken as the same
// at every temperature: its temperature coefficient is not modelled.
type Breakdown struct {
	It, Vb, Nvt float64
	c           float64 // exp(−Vb/(n·Vt)), so that Ib(0) = 0
}

// BreakdownOf returns p's reverse exponential. present is false when p
// has no breakdown attribute; ok is false when its series resistance alone
// drops the breakdown voltage at the test current.
func BreakdownOf(p *circuit.Part) (b Breakdown, present, ok bool) {
	if p.Breakdown <= 0 || p.BreakdownAt <= 0 {
		return Breakdown{}, false, true
	}
	nvt := Ideality(p) * ThermalVoltage(RoomTemperature)
	vb := p.Breakdown - p.BreakdownAt*p.Series
	if !(vb > 0) {
		return Breakdown{}, true, false
	}
	return Breakdown{It: p.BreakdownAt, Vb: vb, Nvt: nvt, c: math.Exp(-vb / nvt)}, true, true
}

// Eval returns the breakdown current from anode to cathode at junction
// voltage v (negative in breakdown) and its derivative dI/dV (positive).
// Past MaxOverdrive·n·Vt beyond the breakdown point the exponential is
// continued by its tangent, as the forward one is (see MaxOverdrive).
func (b Breakdown) Eval(v float64) (i, g float64) {
	if b.It == 0 {
		return 0, 0
	}
	arg := -(v + b.Vb) / b.Nvt
	if arg > MaxOverdrive {
		e := math.Exp(MaxOverdrive)
		return -b.It * (e*(1+arg-MaxOverdrive) - b.c), b.It * e / b.Nvt
	}
	e := math.Exp(arg)
	return -b.It * (e - b.c), b.It * e / b.Nvt
}

// knee returns the junction voltage at the test point, −Vb.
func (b Breakdown) knee() float64 { return -b.Vb }

// limit damps a reverse step of the junction voltage from vold to vraw,
// the mirror of junction.limit: a step down of more than 2·n·Vt is replaced
// by the voltage at which the breakdown would carry the current its linear
// model predicts at vraw (current iteration, as for the forward step), and
// a junction coming down from above its breakdown point moves at most to
// it. Steps up are taken whole here.
func (b Breakdown) limit(vold, vraw float64) (float64, bool) {
	if b.It == 0 || vraw >= vold-2*b.Nvt {
		return vraw, false
	}
	if vold > b.knee() {
		if vraw < b.knee() {
			return b.knee(), true
		}
		return vraw, false
	}
	if vold <= b.knee()-MaxOverdrive*b.Nvt {
		return vraw, false // the tangent continuation is linear
	}
	i, g := b.Eval(vold)
	ir := -(i + g*(vraw-vold)) // the reverse current the linear model predicts
	if ir <= 0 {
		return vold - 2*b.Nvt, true
	}
	v := -b.Vb - b.Nvt*math.Log(ir/b.It+b.c)
	v = math.Max(math.Min(v, vold), vraw)
	return v, v != vraw
}
