package check

import (
	"math"
	"testing"

	"nodal/circuit"
)

// opOf checks src and returns its design and operating point, failing on
// any finding that is not a note.
func opOf(t *testing.T, src string) (*circuit.Design, []float64, []float64) {
	t.Helper()
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("no operating point: %v", res.Diags)
	}
	return res.Build.Design, res.Solved.OP.V, res.Solved.OP.I
}

func partIndex(t *testing.T, d *circuit.Design, name string) int {
	t.Helper()
	for i := range d.Parts {
		if d.PartName(circuit.PartID(i)) == name {
			return i
		}
	}
	t.Fatalf("no part %s", name)
	return -1
}

// TestBatteryTheveninAndEnergy: a battery is its EMF behind its internal
// resistance (Thévenin's theorem): into a load R_L its terminal voltage is
// E·R_L/(R_L + R_int) and its current E/(R_L + R_int). The EMF's power
// E·I is the internal loss I²·R_int plus the terminal power V·I (energy
// balance), and the absorbed powers of all parts sum to zero (Tellegen's
// theorem, Philips Res. Rep. 7, 259 (1952), from memory).
func TestBatteryTheveninAndEnergy(t *testing.T) {
	const e, rint, rl = 12.6, 0.085, 4.7
	src := "ground gnd\nbattery B (vb, gnd) 12.6 V series 85 mΩ capacity 3 Ah\nresistor RL (vb, gnd) 4.7 Ω\n"
	d, v, i := opOf(t, src)
	b, l := partIndex(t, d, "B"), partIndex(t, d, "RL")
	wantV, wantI := e*rl/(rl+rint), e/(rl+rint)
	if rel(v[b], wantV) > 1e-12 || rel(-i[b], wantI) > 1e-12 || rel(i[l], wantI) > 1e-12 {
		t.Errorf("battery at %.12g V, %.12g A; want %.12g V, %.12g A out of pos", v[b], -i[b], wantV, wantI)
	}
	iout := -i[b]
	if emf, loss, term := e*iout, iout*iout*rint, v[b]*iout; math.Abs(emf-(loss+term)) > 1e-9*emf {
		t.Errorf("energy balance: EMF %.12g W, internal loss %.12g W + terminal %.12g W", emf, loss, term)
	}
	assertTellegen(t, d, v, i)
}

// TestBatteriesInParallel: two batteries with internal resistance in
// parallel are no loop of voltage sources; they settle at the
// Millman voltage (E1/R1 + E2/R2)/(1/R1 + 1/R2) with no load, and the
// stronger charges the weaker (Millman's theorem, a form of Thévenin's;
// any circuit-theory text).
func TestBatteriesInParallel(t *testing.T) {
	src := "ground gnd\nbattery B1 (vb, gnd) 12.8 V series 50 mΩ\nbattery B2 (vb, gnd) 12.2 V series 150 mΩ\n"
	d, v, i := opOf(t, src)
	b1, b2 := partIndex(t, d, "B1"), partIndex(t, d, "B2")
	want := (12.8/0.05 + 12.2/0.15) / (1/0.05 + 1/0.15)
	if rel(v[b1], want) > 1e-12 {
		t.Errorf("bus at %.12g V, want %.12g V", v[b1], want)
	}
	if i[b1] >= 0 || math.Abs(i[b1]+i[b2]) > 1e-12 {
		t.Errorf("B1 carries %g A, B2 %g A: B1 should charge B2", i[b1], i[b2])
	}
}

// assertTellegen checks Tellegen's theorem on an operating point: the
// powers V·I of all parts, with one sign convention, sum to zero
// (Tellegen, Philips Res. Rep. 7, 259 (1952), from memory), to 1e-9 of
// their magnitudes.
func assertTellegen(t *testing.T, d *circuit.Design, v, i []float64) {
	t.Helper()
	sum, scale := 0.0, 0.0
	for k := range d.Parts {
		sum += v[k] * i[k]
		scale += math.Abs(v[k] * i[k])
	}
	if math.Abs(sum) > 1e-9*scale {
		t.Errorf("Tellegen: powers sum to %g W of %g W", sum, scale)
	}
}

func rel(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }
