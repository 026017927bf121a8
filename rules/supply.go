package rules

// supply.go: what a supply-like part delivers to its rail, what it takes
// to do so and what it loses, read from the same quantities the rating
// function judges. "nodal report" draws the power tree from these figures
// and never recomputes them.

import (
	"nodal/circuit"
)

// Flow is a supply-like part's energy balance at an operating point. Its
// output is the rail on its kind's Supply.Out pin, held against
// Supply.OutRef.
type Flow struct {
	// VOut is the output rail's voltage, V(Out) − V(OutRef); IOut the
	// current the part delivers out of its Out pin into the rail; POut
	// = VOut·IOut the power it delivers (negative while the rail drives
	// it, a battery being charged).
	VOut, IOut, POut float64
	// HasInput says the part draws from another rail of the design (its
	// kind's Supply names one); VIn is then that rail's voltage,
	// V(In) − V(InRef), IIn the current drawn into its In pin and PIn the
	// power drawn. Zero without an input rail.
	HasInput      bool
	VIn, IIn, PIn float64
	// Taken is the power the part converts: PIn for a part with an input
	// rail; otherwise the power of its own EMF, E·IOut for an EMF behind
	// series resistance, POut for an ideal voltage.
	Taken float64
	// Loss is the power dissipated inside the part, Taken − POut (energy
	// balance): I²R in a battery's internal resistance, 0 in an ideal
	// source.
	Loss float64
	// Efficiency is POut / Taken, when HasEfficiency: only while the part
	// converts power into its rail (Taken > 0).
	Efficiency    float64
	HasEfficiency bool
	// VoltageUnknown and CurrentUnknown are the quantities' own: the
	// circuit does not fix the rail's voltage or the part's current. The
	// figures that need them read 0 and are not to be shown as values.
	VoltageUnknown, CurrentUnknown bool
}

// SupplyFlow returns the energy balance of p, a part of a supply-like kind
// (its KindInfo.Supply set), from the quantities q that Point.Part gives
// for it. ok is false for a part of any other kind, or of a kind whose
// input rail these quantities do not describe.
func SupplyFlow(p *circuit.Part, q Quantities) (f Flow, ok bool) {
	s := p.Kind.Info().Supply
	if s == nil || s.HasInput() {
		// A kind that draws from another rail needs the current at its
		// input pin as well, which two-pin quantities do not carry.
		return Flow{}, false
	}
	f.VoltageUnknown, f.CurrentUnknown = q.VoltageUnknown, q.CurrentUnknown
	// Quantities run from the first pin to the second: the rail is +V
	// when Out is the first pin, −V when it is the second. The part
	// delivers into the rail the current that leaves it at Out.
	sign := 1.0
	if s.Out != 0 {
		sign = -1
	}
	f.VOut = sign * q.V
	f.IOut = 0 - PinCurrent(q, s.Out) // 0 − x: no −0 for a part that delivers nothing
	f.POut = 0 - q.P                  // VOut·IOut
	switch dc := p.DC(); dc.Model {
	case circuit.Conductance:
		// An EMF behind a resistance, first pin positive: the EMF
		// converts E·IOut, the resistance takes the rest.
		f.Taken = sign * dc.E * f.IOut
	default:
		f.Taken = f.POut // an ideal voltage loses nothing
	}
	f.Loss = f.Taken - f.POut
	if f.Taken > 0 && !f.CurrentUnknown && !f.VoltageUnknown {
		f.Efficiency, f.HasEfficiency = f.POut/f.Taken, true
	}
	return f, true
}

// PinCurrent returns the current flowing into a part at its pin (an index
// into its kind's Pins) from the net there, in the quantities' sign
// convention: I into the first pin, −I into the second.
func PinCurrent(q Quantities, pin int) float64 {
	if pin == 0 {
		return q.I
	}
	return -q.I
}
