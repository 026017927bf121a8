package report

import (
	"strings"
	"testing"
	"unicode/utf8"

	"nodal/circuit"
	"nodal/rules"
	"nodal/solve"
)

func TestBar(t *testing.T) {
	cases := []struct {
		use  float64
		want string
	}{
		{0, ""}, {-0.5, ""},
		{0.1, "█"},           // one cell per tenth
		{0.0125, "▏"},        // an eighth of a cell
		{0.25, "██▌"},        // two and a half cells
		{0.99, "█████████▉"}, // 9.9 cells round to 9 and 7/8
		{1, "██████████"},    // exactly at the rating: full, no arrow
		{5.75, "██████████▶"},
	}
	for _, c := range cases {
		if got := Bar(c.use); got != c.want {
			t.Errorf("Bar(%g) = %q, want %q", c.use, got, c.want)
		}
		if n := utf8.RuneCountInString(Bar(c.use)); n > BarCells+1 {
			t.Errorf("Bar(%g) is %d cells", c.use, n)
		}
	}
}

// design builds a 10 V source across a 1 kΩ resistor rated 250 mW and an
// unrated 4 kΩ one in series, and a capacitor across the first.
func design() *circuit.Design {
	d := circuit.NewDesign("t.nodal")
	gnd := d.Net("gnd", 0, 0)
	d.Ground = gnd
	a, b := d.Net("a", 0, 0), d.Net("b", 0, 0)
	d.Net("spare", 0, 0) // no pin: left out
	d.AddPart(circuit.Part{Kind: circuit.VoltageSource, Local: "V", Value: 10, Pins: [circuit.MaxPins]circuit.NetID{a, gnd}, Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Resistor, Local: "RU", Value: 4000, Pins: [circuit.MaxPins]circuit.NetID{a, b}, Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Resistor, Local: "R", Value: 1000, RatedPower: 0.25, Pins: [circuit.MaxPins]circuit.NetID{b, gnd}, Inst: -1})
	d.AddPart(circuit.Part{Kind: circuit.Capacitor, Local: "C", Value: 1e-6, RatedVoltage: 2.5, Pins: [circuit.MaxPins]circuit.NetID{b, gnd}, Inst: -1})
	return d
}

func TestNewOrderAndLevels(t *testing.T) {
	d := design()
	r, err := solve.Solve(d, nil)
	if err != nil {
		t.Fatal(err)
	}
	tb := New("t.nodal", d, r, rules.DefaultDerating())
	var names []string
	for _, p := range tb.Parts {
		names = append(names, p.Name)
	}
	// C sees 2 V of 2.5 V (80 %, exactly its derating limit: within); R
	// dissipates 4 mW of 250 mW (1.6 %); RU and V have no rating and keep
	// the design's order.
	if got := strings.Join(names, " "); got != "C R V RU" {
		t.Errorf("order %s, want C R V RU", got)
	}
	if len(tb.Nets) != 3 {
		t.Errorf("nets %v: the net no pin touches should be left out", tb.Nets)
	}
	levels := map[string]Level{}
	for i := range tb.Parts {
		levels[tb.Parts[i].Name] = tb.Parts[i].Level()
	}
	if levels["C"] != Within || levels["R"] != Within || levels["RU"] != Unrated || levels["V"] != Unrated {
		t.Errorf("levels %v", levels)
	}
	if tb.Undriven {
		t.Error("a design with a 10 V source is undriven")
	}
	// Past the derating limit, then past the rating.
	d.Parts[3].RatedVoltage = 2.4
	tb = New("t.nodal", d, r, rules.DefaultDerating())
	if p := tb.Parts[0]; p.Name != "C" || p.Level() != Derated {
		t.Errorf("%s level %d, want derated", p.Name, p.Level())
	}
	d.Parts[3].RatedVoltage = 1.5
	tb = New("t.nodal", d, r, rules.DefaultDerating())
	if p := tb.Parts[0]; p.Name != "C" || p.Level() != Over {
		t.Errorf("%s level %d, want over", p.Name, p.Level())
	}
	var b strings.Builder
	if err := tb.WriteText(&b, TextOptions{}); err != nil {
		t.Fatal(err)
	}
	if out := b.String(); !strings.Contains(out, "133 %") || !strings.Contains(out, "▶") || !strings.Contains(out, "design aid") || strings.Contains(out, "\x1b[") {
		t.Errorf("text:\n%s", out)
	}
	b.Reset()
	tb.WriteText(&b, TextOptions{Color: true})
	if !strings.Contains(b.String(), "\x1b[") {
		t.Error("no colour codes with Color set")
	}
}

func TestRound(t *testing.T) {
	if round(0.1+0.2) != 0.3 {
		t.Errorf("round(0.1+0.2) = %v", round(0.1+0.2))
	}
}
