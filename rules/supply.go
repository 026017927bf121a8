package rules

// supply.go: what a supply-like part delivers to its rail, what it takes
// to do so and what it loses, read from the same cleaned operating point
// the rating function judges (Point). "nodal report" draws the power tree
// from these figures and never recomputes them.

import (
	"nodal/circuit"
	"nodal/solve"
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
	// converts power into its rail (Taken > 0, POut ≥ 0); a part driven
	// backwards has none.
	Efficiency    float64
	HasEfficiency bool
	// VoltageUnknown and CurrentUnknown are the part's quantities' own:
	// the circuit does not fix the rail's voltage or the part's current.
	// The figures that need them read 0 and are not to be shown as values.
	VoltageUnknown, CurrentUnknown bool
	// Region is the state a part with more than two pins (a regulator, a
	// converter) settled in, when HasRegion: regulating, in dropout, at
	// its current limit.
	Region    solve.Region
	HasRegion bool
}

// SupplyFlow returns the energy balance of part id, p, of a supply-like
// kind (its KindInfo.Supply set), at the operating point pt. ok is false
// for a part of any other kind, or one whose pin currents pt does not
// know (PinCurrent).
func (pt *Point) SupplyFlow(p *circuit.Part, id circuit.PartID) (f Flow, ok bool) {
	s := p.Kind.Info().Supply
	if s == nil {
		return Flow{}, false
	}
	q := pt.Part(id)
	f.VoltageUnknown, f.CurrentUnknown = q.VoltageUnknown, q.CurrentUnknown
	iOut, ok := pt.PinCurrent(p, id, s.Out)
	if !ok {
		return Flow{}, false
	}
	if mp := pt.r.MultiAt(id); mp != nil {
		f.Region, f.HasRegion = mp.Region, true
	}
	f.VOut = pt.across(p, q, s.Out, s.OutRef)
	f.IOut = 0 - iOut // 0 − x: no −0 for a part that delivers nothing
	f.POut = f.VOut * f.IOut
	switch dc := p.DC(); {
	case s.HasInput():
		iIn, ok := pt.PinCurrent(p, id, s.In)
		if !ok {
			return Flow{}, false
		}
		f.HasInput = true
		f.VIn, f.IIn = pt.across(p, q, s.In, s.InRef), iIn
		f.PIn = f.VIn * f.IIn
		f.Taken = f.PIn
	case dc.Model == circuit.Conductance:
		// An EMF behind a resistance, first end positive: the EMF
		// converts E times the current out of the first end.
		e := &p.Kind.Info().Ends
		out := 0 - q.I
		if int(e[0]) != s.Out {
			out = q.I
		}
		f.Taken = dc.E * out
	default:
		f.Taken = f.POut // an ideal voltage loses nothing
	}
	f.Loss = f.Taken - f.POut
	if f.Taken > 0 && f.POut >= 0 && !f.CurrentUnknown && !f.VoltageUnknown {
		f.Efficiency, f.HasEfficiency = f.POut/f.Taken, true
	}
	return f, true
}

// across returns V(pin a) − V(pin b) of part p: its own voltage q.V (or
// its negative) when a and b are its ends, else the difference of the two
// nets' voltages.
func (pt *Point) across(p *circuit.Part, q Quantities, a, b int) float64 {
	e := &p.Kind.Info().Ends
	switch {
	case int(e[0]) == a && int(e[1]) == b:
		return q.V
	case int(e[0]) == b && int(e[1]) == a:
		return 0 - q.V
	}
	// Cleaned as a part's own voltage is: two nets tied by an ideal short
	// may differ by rounding in the last place, depending on the order
	// the shorts were joined in, and that must read 0 in every order.
	return Clean(pt.Net(p.Pins[a])-pt.Net(p.Pins[b]), pt.vs, FloorV)
}

// PinCurrent returns the current flowing into part id, p, at its pin (an
// index into its kind's Pins) from the net there, cleaned as Part cleans
// it: I into the first end and −I into the second, in the sign convention
// of Quantities. ok is false for a pin whose current the operating point
// does not give.
func (pt *Point) PinCurrent(p *circuit.Part, id circuit.PartID, pin int) (float64, bool) {
	if p.Multi() {
		// A part with more than two pins: the solve gives the current
		// into each pin (solve.Result.Multi).
		mp := pt.r.MultiAt(id)
		if mp == nil || pin < 0 || pin >= len(p.Nets()) {
			return 0, false
		}
		return Clean(mp.I[pin], pt.is, FloorI), true
	}
	q := pt.Part(id)
	e := &p.Kind.Info().Ends
	switch pin {
	case int(e[0]):
		return q.I, true
	case int(e[1]):
		return 0 - q.I, true
	}
	return 0, false
}
