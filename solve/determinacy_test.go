package solve

import (
	"errors"
	"testing"

	"nodal/circuit"
)

// Two wires in parallel feeding 100 Ω from 10 V: by Ohm's law the pair
// carries 0.1 A in all, but how it divides between two ideal shorts is not
// determined (any split satisfies Kirchhoff's laws). Both currents are
// marked undetermined and read 0, the group carries 0.1 A, and the answer
// does not depend on which wire is written first.
func TestParallelShortsGroup(t *testing.T) {
	for _, swap := range []bool{false, true} {
		b := newBuilder()
		b.v("in", "gnd", 10)
		names := []string{"W1", "W2"}
		if swap {
			names = []string{"W2", "W1"}
		}
		for _, n := range names {
			b.add(circuit.Part{Local: n, Kind: circuit.Wire}, "in", "mid")
		}
		load := b.r("mid", "gnd", 100)
		r := b.solve(t, nil)
		if !near(r.I[load], 0.1, 1e-12) {
			t.Fatalf("load current %g A, want 0.1 A", r.I[load])
		}
		for i := range b.d.Parts {
			p := &b.d.Parts[i]
			if p.Kind != circuit.Wire {
				continue
			}
			if r.Undetermined == nil || r.Undetermined[i] != UnknownCurrent || r.I[i] != 0 {
				t.Fatalf("swap %v: %s: undetermined %v, I %g; want its current marked and 0", swap, p.Local, r.Undetermined, r.I[i])
			}
		}
		if len(r.Groups) != 1 || len(r.Groups[0].Parts) != 2 || b.d.Parts[r.Groups[0].Parts[0]].Local != "W1" || !near(r.Groups[0].I, 0.1, 1e-12) {
			t.Fatalf("swap %v: groups %+v, want W1 and W2 carrying 0.1 A", swap, r.Groups)
		}
	}
}

// A wire in series with the parallel pair is a bridge of the graph of
// shorts: Kirchhoff's current law fixes its current (0.1 A), so it is not
// marked; only the pair is.
func TestBridgeShortDetermined(t *testing.T) {
	b := newBuilder()
	b.v("in", "gnd", 10)
	w0 := b.wire("in", "a")
	b.wire("a", "mid")
	b.wire("a", "mid")
	b.r("mid", "gnd", 100)
	r := b.solve(t, nil)
	if r.Undetermined[w0] != 0 || !near(r.I[w0], 0.1, 1e-12) {
		t.Fatalf("series wire: %v, %g A; want determined 0.1 A", r.Undetermined[w0], r.I[w0])
	}
}

// Two equal supplies tied together: a loop of voltage sources whose
// voltages sum to zero (Kirchhoff's voltage law holds) but whose
// circulating current is undetermined (Chua, Desoer & Kuh, Linear and
// Nonlinear Circuits, 1987, from memory: no unique solution). The node
// voltages are determined and solved on both formulations; both sources'
// currents are marked. Unequal supplies have no solution at all.
func TestEqualSourcesLoop(t *testing.T) {
	for _, mna := range []bool{false, true} {
		b := newBuilder()
		v1 := b.v("a", "gnd", 5)
		v2 := b.v("a", "gnd", 5)
		load := b.r("a", "gnd", 10)
		r := b.solve(t, &Options{MNA: mna})
		if !near(r.I[load], 0.5, 1e-12) || !near(b.volts(r, "a"), 5, 1e-12) {
			t.Fatalf("MNA %v: load %g A at %g V, want 0.5 A at 5 V", mna, r.I[load], b.volts(r, "a"))
		}
		if r.Undetermined[v1] != UnknownCurrent || r.Undetermined[v2] != UnknownCurrent || len(r.Groups) != 0 {
			t.Fatalf("MNA %v: undetermined %v, groups %v", mna, r.Undetermined, r.Groups)
		}
	}
	b := newBuilder()
	b.v("a", "gnd", 5)
	b.v("a", "gnd", 6)
	_, err := Solve(b.d, nil)
	var se *Error
	if !errors.As(err, &se) || se.Kind != Singular {
		t.Fatalf("5 V against 6 V: %v, want a Singular error", err)
	}
}

// An input port reached only through a capacitor has no DC path: its
// voltage is not determined, the capacitor's voltage is marked, and the
// rest is solved (10 V across 10 Ω: 1 A by Ohm's law).
func TestFloatingSectionSolvesTheRest(t *testing.T) {
	b := newBuilder()
	b.v("vin", "gnd", 10)
	load := b.r("vin", "gnd", 10)
	c := b.add(circuit.Part{Kind: circuit.Capacitor, Value: 1e-6}, "in", "gnd")
	r := b.solve(t, nil)
	if !near(r.I[load], 1, 1e-12) {
		t.Fatalf("load %g A, want 1 A", r.I[load])
	}
	if r.Floating == nil || !r.Floating[b.d.LookupNet("in")] || r.Undetermined[c] != UnknownVoltage {
		t.Fatalf("floating %v, undetermined %v", r.Floating, r.Undetermined)
	}
}

// TestParallelWiresBelowASource: two wires in parallel on a net that a
// 300 mV source holds below ground, in a design with 5 V elsewhere, close
// a loop whose voltages sum to zero (Kirchhoff's voltage law around two
// ideal shorts), in every statement order: the potentials compared carry
// the rounding of the 5 V path, which must not read as a contradiction.
func TestParallelWiresBelowASource(t *testing.T) {
	add := []func(b *builder){
		func(b *builder) { b.v("n1", "gnd", 5) },
		func(b *builder) { b.v("gnd", "n2", 0.3) },
		func(b *builder) { b.r("n6", "gnd", 1) },
		func(b *builder) { b.wire("n2", "n6") },
		func(b *builder) { b.r("gnd", "n1", 1) },
		func(b *builder) { b.r("n2", "gnd", 1) },
		func(b *builder) { b.v("n1", "gnd", 5) },
		func(b *builder) { b.wire("n2", "n6") },
		func(b *builder) { b.i("gnd", "n1", 1e-3) },
	}
	for _, order := range [][]int{{0, 1, 2, 3, 4, 5, 6, 7, 8}, {0, 5, 2, 7, 4, 1, 6, 3, 8}, {8, 7, 6, 5, 4, 3, 2, 1, 0}, {3, 7, 1, 0, 6, 2, 5, 4, 8}} {
		b := newBuilder()
		for _, k := range order {
			add[k](b)
		}
		r, err := Solve(b.d, nil)
		if err != nil {
			t.Fatalf("order %v: %v", order, err)
		}
		if v := b.volts(r, "n6"); !near(v, -0.3, 1e-12) {
			t.Errorf("order %v: n6 at %.15g V, want −0.3 V", order, v)
		}
	}
}
