package circuit

import "testing"

// TestSupplyPins checks every kind's Supply against its pins and its DC
// behaviour: a part that holds a voltage of its own at DC (a fixed
// voltage, or an EMF behind a resistance) drives a rail, so its kind must
// say which pins carry it, and a kind that names no input rail must hold
// such a voltage, or the power tree would show a supply that supplies
// nothing.
func TestSupplyPins(t *testing.T) {
	for _, k := range Kinds() {
		ki := k.Info()
		// A part of the kind with a value and an internal resistance, so
		// that an EMF behind series shows as one.
		dc := ki.DC(&Part{Kind: k, Value: 5, Series: 1, VF: 0.7, VFAt: 0.01})
		ownVoltage := dc.Model == VoltageDrop || dc.Model == Conductance && dc.E != 0
		s := ki.Supply
		if s == nil {
			if ownVoltage {
				t.Errorf("%s holds a voltage of its own at DC but declares no Supply", k)
			}
			continue
		}
		valid := func(pin int) bool { return pin >= 0 && pin < len(ki.Pins) }
		if !valid(s.Out) || !valid(s.OutRef) || s.Out == s.OutRef {
			t.Errorf("%s: output rail pins %d, %d: want two different pins of %v", k, s.Out, s.OutRef, ki.Pins)
		}
		switch {
		case s.In == NoPin && s.InRef == NoPin:
			if !ownVoltage {
				t.Errorf("%s draws from no rail and holds no voltage of its own (DC %+v)", k, dc)
			}
		case !valid(s.In) || !valid(s.InRef) || s.In == s.InRef || s.In == s.Out:
			t.Errorf("%s: input rail pins %d, %d: want two different pins of %v, not the output %d", k, s.In, s.InRef, ki.Pins, s.Out)
		}
		if s.HasInput() != (s.In != NoPin) {
			t.Errorf("%s: HasInput disagrees with In", k)
		}
	}
	// The kinds this table is known to hold as supplies (a regression
	// check of the declarations above).
	for _, k := range []Kind{VoltageSource, Battery, VoltageDrive} {
		if s := k.Info().Supply; s == nil || s.HasInput() {
			t.Errorf("%s: want a supply with no input rail", k)
		}
	}
	for _, k := range []Kind{CurrentSource, CurrentDrive, CurrentLoad, PowerLoad, Resistor} {
		if k.Info().Supply != nil {
			t.Errorf("%s: drives no rail, but declares a Supply", k)
		}
	}
}

// TestValueNotAtDC: a kind that says its value plays no part at DC has
// the same DC behaviour at two values, and is not varied by the worst
// case although it takes "tol".
func TestValueNotAtDC(t *testing.T) {
	n := 0
	for _, k := range Kinds() {
		info := k.Info()
		if !info.ValueNotAtDC {
			continue
		}
		n++
		if a, b := info.DC(&Part{Kind: k, Value: 1e-6}), info.DC(&Part{Kind: k, Value: 2}); a != b {
			t.Errorf("%s: DC %+v at one value, %+v at another", info.Word, a, b)
		}
		if k.Toleranced() {
			t.Errorf("%s: varied by the worst case", info.Word)
		}
	}
	if n == 0 {
		t.Error("no kind's value is left out at DC")
	}
	if !Resistor.Toleranced() || !Regulator.Toleranced() || Switch.Toleranced() {
		t.Error("a resistor and a regulator are varied by their tol, a switch (no tol) is not")
	}
}
