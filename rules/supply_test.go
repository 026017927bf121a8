package rules_test

import (
	"math"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/rules"
)

// supplyFlow solves src and returns the flow of its part named name.
func supplyFlow(t *testing.T, src, name string) rules.Flow {
	t.Helper()
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("no operating point: %v %v", err, res.Diags)
	}
	d := res.Build.Design
	pt := rules.NewPoint(res.Solved.OP)
	for i := range d.Parts {
		if d.NameOf(&d.Parts[i]) == name {
			f, ok := pt.SupplyFlow(&d.Parts[i], circuit.PartID(i))
			if !ok {
				t.Fatalf("%s: no flow", name)
			}
			return f
		}
	}
	t.Fatalf("no part %s", name)
	return rules.Flow{}
}

// TestSupplyFlowEMFBehindSeries: an EMF E behind R into a load R_L
// delivers I = E/(R + R_L) (Ohm's law) at V = E − I·R; it converts E·I,
// delivers V·I and loses I²·R in its own resistance (Joule's law; energy
// balance: taken = delivered + lost), so its efficiency is V/E. The same
// for a battery and a port's voltage drive.
func TestSupplyFlowEMFBehindSeries(t *testing.T) {
	for _, c := range []struct {
		src, name    string
		e, r, rl     float64
		wantV, wantI float64
	}{
		{"ground gnd\nbattery B (pos=v, neg=gnd) 9 V series 1 Ω\nresistor RL (v, gnd) 8 Ω\n", "B", 9, 1, 8, 8, 1},
		{"ground gnd\nport v 5 V series 1 Ω\nresistor RL (v, gnd) 4 Ω\n", "v", 5, 1, 4, 4, 1},
		{"ground gnd\nbattery B (pos=v, neg=gnd) 3.7 V series 150 mΩ\nresistor RL (v, gnd) 2.2 Ω\n", "B", 3.7, 0.15, 2.2, 0, 0},
	} {
		i := c.e / (c.r + c.rl)
		v := c.e - i*c.r
		if c.wantV != 0 && (v != c.wantV || i != c.wantI) {
			t.Fatalf("hand algebra: %g V, %g A", v, i)
		}
		f := supplyFlow(t, c.src, c.name)
		for _, k := range []struct {
			what      string
			got, want float64
		}{
			{"VOut", f.VOut, v}, {"IOut", f.IOut, i}, {"POut", f.POut, v * i},
			{"Taken", f.Taken, c.e * i}, {"Loss", f.Loss, i * i * c.r}, {"Efficiency", f.Efficiency, v / c.e},
		} {
			if math.Abs(k.got-k.want) > 1e-9*math.Abs(k.want) {
				t.Errorf("%s: %s = %.12g, want %.12g", c.name, k.what, k.got, k.want)
			}
		}
		if f.HasInput || !f.HasEfficiency {
			t.Errorf("%s: HasInput %v, HasEfficiency %v", c.name, f.HasInput, f.HasEfficiency)
		}
	}
}

// TestSupplyFlowIdealAndIdle: an ideal source loses nothing (taken =
// delivered); one that delivers nothing has no efficiency, and a part of a
// kind that is no supply has no flow.
func TestSupplyFlowIdealAndIdle(t *testing.T) {
	f := supplyFlow(t, "ground gnd\nsource V (a, gnd) 10 V\nresistor R (a, gnd) 5 Ω\n", "V")
	if f.VOut != 10 || f.IOut != 2 || f.POut != 20 || f.Taken != 20 || f.Loss != 0 || f.Efficiency != 1 {
		t.Errorf("ideal 10 V into 5 Ω (Ohm's law: 2 A, 20 W): %+v", f)
	}
	f = supplyFlow(t, "ground gnd\nsource V (a, gnd) 10 V\ncapacitor C (a, gnd) 1 µF\n", "V")
	if f.IOut != 0 || f.HasEfficiency || math.Signbit(f.IOut) {
		t.Errorf("idle source: %+v", f)
	}
	res, _ := check.Source("t.nodal", []byte("ground gnd\nsource V (a, gnd) 10 V\nresistor R (a, gnd) 5 Ω\n"), nil)
	if _, ok := rules.NewPoint(res.Solved.OP).SupplyFlow(&res.Build.Design.Parts[1], 1); ok {
		t.Error("a resistor has a supply flow")
	}
}
