package report

import (
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/rules"
	"nodal/solve"
)

// TestRailsLoopOfSupplies: two regulators that feed each other (no solve
// gives such a point, so the operating point is written by hand: the tree
// must still be drawn from whatever it is given) are drawn once, from the
// first by name, and the loop is said where it closes, without recursing
// for ever; a regulator whose input no supply reaches is a root that says
// so.
func TestRailsLoopOfSupplies(t *testing.T) {
	d := circuit.NewDesign("t.nodal")
	gnd := d.Net("gnd", 0, 0)
	d.Ground = gnd
	a, b, c, e := d.Net("a", 0, 0), d.Net("b", 0, 0), d.Net("c", 0, 0), d.Net("e", 0, 0)
	pins := func(n ...circuit.NetID) (p [circuit.MaxPins]circuit.NetID) { copy(p[:], n); return }
	d.AddPart(circuit.Part{Kind: circuit.Regulator, Local: "UB", Value: 5, Pins: pins(b, a, gnd), Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Regulator, Local: "UA", Value: 3, Pins: pins(a, b, gnd), Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Resistor, Local: "R", Value: 100, Pins: pins(a, gnd), Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Regulator, Local: "UC", Value: 1, Pins: pins(c, e, gnd), Inst: -1})
	r := &solve.Result{NetV: []float64{0, 5, 3, 2, 1}, V: []float64{5, 3, 5, 1}, I: make([]float64, 4), P: make([]float64, 4),
		Multi: []solve.MultiPoint{{Part: 0, I: [3]float64{0.01, -0.06, 0.05}}, {Part: 1, I: [3]float64{0.06, -0.01, -0.05}}, {Part: 3}}}
	r.I[2] = 0.05
	r.P[2] = 0.25
	tab := New("t.nodal", d, r, rules.DefaultDerating())
	var names []string
	for _, s := range tab.Rails {
		names = append(names, s.Name)
	}
	if strings.Join(names, " ") != "UC UA" {
		t.Fatalf("roots %v, want UC (unfed) then the loop from UA", names)
	}
	uc, ua := tab.Rails[0], tab.Rails[1]
	if !uc.Unfed || !ua.InLoop || len(ua.Feeds) != 1 || ua.Feeds[0].Name != "UB" || len(ua.Feeds[0].Feeds) != 1 || !ua.Feeds[0].Feeds[0].Loop {
		t.Fatalf("loop drawn as %+v", ua)
	}
	var b2 strings.Builder
	if err := tab.WriteText(&b2, TextOptions{}); err != nil {
		t.Fatal(err)
	}
	out := b2.String()
	for _, want := range []string{"UA (regulator) holds b at 3.00 V (in a loop of supplies that feed each other)", "(drawn above: these supplies feed each other in a loop)", "(no supply drives c)"} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q:\n%s", want, out)
		}
	}
	var js strings.Builder
	if err := tab.WriteJSON(&js); err != nil || !strings.Contains(js.String(), `"repeated": true`) || !strings.Contains(js.String(), `"in_loop": true`) {
		t.Errorf("JSON: %v\n%s", err, js.String())
	}
}
