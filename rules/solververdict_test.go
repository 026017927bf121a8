package rules

import (
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/diag"
	"nodal/solve"
)

// The solver's verdicts reach the judgement: a part whose values the
// solve could not certify is still judged, and its finding says so; a part
// whose current the circuit leaves open has its current rating left
// unjudged (here 10 V across 10 Ω: 1 A and 10 W by Ohm's law, past a
// 1 W rating).
func TestSolverVerdictsReachJudge(t *testing.T) {
	d := circuit.NewDesign("t.nodal")
	a := d.Net("a", diag.NoPos, diag.NoPos)
	g := d.Net("gnd", diag.NoPos, diag.NoPos)
	d.Ground = g
	d.AddPart(circuit.Part{Local: "R1", Kind: circuit.Resistor, Value: 10, RatedPower: 1, Pins: [circuit.MaxPins]circuit.NetID{a, g}, Inst: -1})
	d.AddPart(circuit.Part{Local: "W1", Kind: circuit.Wire, RatedCurrent: 0.1, Pins: [circuit.MaxPins]circuit.NetID{a, g}, Inst: -1})
	r := &solve.Result{NetV: []float64{10, 0}, V: []float64{10, 0}, I: []float64{1, 0}, P: []float64{10, 0},
		Uncertified: []bool{true, false}, Undetermined: []solve.Unknown{0, solve.UnknownCurrent}}
	pt := NewPoint(r)
	us := Judge(&d.Parts[0], pt.Part(0), Derating{})
	if len(us) != 1 || !us[0].Over() || !strings.Contains(Describe(nil, &d.Parts[0], us[0]), "could not certify") {
		t.Fatalf("R1: %+v; want one power use past its rating that says it is not certified", us)
	}
	q := pt.Part(1)
	if !q.CurrentUnknown || len(Judge(&d.Parts[1], q, Derating{})) != 0 {
		t.Fatalf("W1: %+v judged %v; want its current unknown and not judged", q, Judge(&d.Parts[1], q, Derating{}))
	}
}
