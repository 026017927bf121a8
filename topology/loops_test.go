package topology_test

import (
	"math"
	"testing"

	"nodal/check"
	"nodal/topology"
)

// Loops of voltage sources and shorts, with the voltage sums Kirchhoff's
// voltage law gives by hand: around V1 (5 V) and V2 (3 V) in parallel the
// rises sum to ±2 V; around V3 and the wire chain W1–W2 shorting it, to
// ±1.5 V; the wire W3 in parallel with W4 closes a loop with no source,
// which is not reported as a source loop.
func TestLoops(t *testing.T) {
	src := []byte(`ground gnd
source V1 (a, gnd) 5 V
source V2 (a, gnd) 3 V
resistor R1 (a, b) 1 kΩ
source V3 (b, c) 1.5 V
wire W1 (c, d)
wire W2 (d, b)
resistor R2 (d, gnd) 1 kΩ
wire W3 (e, gnd)
wire W4 (e, gnd)
resistor R3 (e, a) 1 kΩ
`)
	res, err := check.Source("loops.nodal", src, nil)
	if err != nil {
		t.Fatal(err)
	}
	r := topology.Analyze(res.Build.Design)
	if len(r.Loops) != 2 {
		t.Fatalf("%d source loops, want 2", len(r.Loops))
	}
	want := []float64{2, 1.5}
	for i, l := range r.Loops {
		if math.Abs(math.Abs(l.Sum)-want[i]) > 1e-12 {
			t.Errorf("loop %d sums to %g V, want ±%g V", i, l.Sum, want[i])
		}
		// A loop closes: each step starts where the previous one ended.
		for k := range l.Steps {
			nextFrom := l.Steps[(k+1)%len(l.Steps)].From
			if l.Steps[k].To != nextFrom {
				t.Errorf("loop %d is broken after step %d", i, k)
			}
		}
	}
	if len(r.Loops[1].Steps) != 3 {
		t.Errorf("loop through V3 has %d steps, want 3 (V3, W1, W2)", len(r.Loops[1].Steps))
	}
}
