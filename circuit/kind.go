package circuit

import "nodal/units"

// Kind is a built-in part kind. Every built-in part has two pins.
type Kind uint8

const (
	Resistor Kind = iota
	Capacitor
	Inductor
	VoltageSource
	CurrentSource
	Diode
	LED
	Fuse
	Switch
	Wire
	numKinds
)

// KindInfo describes how a kind is written.
type KindInfo struct {
	Word  string    // the keyword
	Pins  [2]string // pin names, in positional order
	Value units.Dim // the unit of the value; None when the kind takes none
	// Ratings lists the dimensions "rated" accepts for this kind.
	Ratings []units.Dim
	// Attrs lists the attributes the kind takes besides "rated".
	Attrs []string
}

var kinds = [numKinds]KindInfo{
	Resistor:      {"resistor", [2]string{"a", "b"}, units.Resistance, []units.Dim{units.Power, units.Voltage}, []string{"tol"}},
	Capacitor:     {"capacitor", [2]string{"a", "b"}, units.Capacitance, []units.Dim{units.Voltage}, []string{"tol"}},
	Inductor:      {"inductor", [2]string{"a", "b"}, units.Inductance, []units.Dim{units.Current}, []string{"tol", "dcr"}},
	VoltageSource: {"source", [2]string{"pos", "neg"}, units.Voltage, []units.Dim{units.Current}, []string{"tol"}},
	CurrentSource: {"source", [2]string{"from", "to"}, units.Current, []units.Dim{units.Voltage}, []string{"tol"}},
	Diode:         {"diode", [2]string{"anode", "cathode"}, units.None, []units.Dim{units.Current, units.Voltage, units.Power}, []string{"vf", "ideality", "series"}},
	LED:           {"led", [2]string{"anode", "cathode"}, units.None, []units.Dim{units.Current, units.Voltage, units.Power}, []string{"vf", "ideality", "series"}},
	Fuse:          {"fuse", [2]string{"a", "b"}, units.Current, []units.Dim{units.Voltage}, []string{"dcr"}},
	Switch:        {"switch", [2]string{"a", "b"}, units.None, []units.Dim{units.Current, units.Voltage}, nil},
	Wire:          {"wire", [2]string{"a", "b"}, units.None, []units.Dim{units.Current}, nil},
}

// Kinds lists every built-in kind, in a fixed order.
func Kinds() []Kind {
	out := make([]Kind, numKinds)
	for k := range out {
		out[k] = Kind(k)
	}
	return out
}

// Info returns how k is written.
func (k Kind) Info() *KindInfo { return &kinds[k] }

// String returns the kind's keyword; the two sources are told apart as
// "voltage source" and "current source".
func (k Kind) String() string {
	switch k {
	case VoltageSource:
		return "voltage source"
	case CurrentSource:
		return "current source"
	}
	if k < numKinds {
		return kinds[k].Word
	}
	return "unknown kind"
}

// KindWords lists the kind keywords, for "did you mean" and help.
var KindWords = []string{"resistor", "capacitor", "inductor", "source", "diode", "led", "fuse", "switch", "wire"}

func kindOf(word string) (Kind, bool) {
	for k := Kind(0); k < numKinds; k++ {
		if kinds[k].Word == word {
			return k, true
		}
	}
	return 0, false
}

// DC behaviour of a kind, which is all the topology rules need.

// IsShort reports whether p is an ideal short at DC: a wire, a closed
// switch, an inductor or fuse with no dcr. A voltage source is not a short
// but also fixes the voltage across it; see IsVoltageDefining.
func (p *Part) IsShort() bool {
	switch p.Kind {
	case Wire:
		return true
	case Switch:
		return p.Closed
	case Inductor, Fuse:
		return p.DCR == 0
	}
	return false
}

// IsVoltageDefining reports whether p forces the voltage across its pins at
// DC: a voltage source or an ideal short.
func (p *Part) IsVoltageDefining() bool { return p.Kind == VoltageSource || p.IsShort() }

// ConductsDC reports whether current can flow through p at DC with the
// voltage across it set by the rest of the circuit or by itself: everything
// but capacitors, open switches and current sources.
func (p *Part) ConductsDC() bool {
	switch p.Kind {
	case Capacitor, CurrentSource:
		return false
	case Switch:
		return p.Closed
	}
	return true
}
