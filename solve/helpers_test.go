package solve

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/diag"
)

// builder makes designs in code, for networks too regular or too large to
// write by hand.
type builder struct {
	d *circuit.Design
	n int
}

func newBuilder() *builder {
	d := circuit.NewDesign("test")
	d.Ground = d.Net("gnd", diag.NoPos, diag.NoPos)
	return &builder{d: d}
}

func (b *builder) net(name string) circuit.NetID { return b.d.Net(name, diag.NoPos, diag.NoPos) }

func (b *builder) add(p circuit.Part, a, c string) circuit.PartID {
	b.n++
	if p.Local == "" {
		p.Local = fmt.Sprintf("X%d", b.n)
	}
	p.Pins = [circuit.MaxPins]circuit.NetID{b.net(a), b.net(c)}
	p.Inst = -1
	return b.d.AddPart(p)
}

func (b *builder) r(a, c string, ohms float64) circuit.PartID {
	return b.add(circuit.Part{Kind: circuit.Resistor, Value: ohms}, a, c)
}

func (b *builder) v(pos, neg string, volts float64) circuit.PartID {
	return b.add(circuit.Part{Kind: circuit.VoltageSource, Value: volts}, pos, neg)
}

func (b *builder) i(from, to string, amps float64) circuit.PartID {
	return b.add(circuit.Part{Kind: circuit.CurrentSource, Value: amps}, from, to)
}

func (b *builder) wire(a, c string) circuit.PartID {
	return b.add(circuit.Part{Kind: circuit.Wire}, a, c)
}

// tb is what both *testing.T and *rapid.T offer.
type tb interface {
	Helper()
	Fatalf(format string, args ...any)
}

func (b *builder) solve(t tb, opt *Options) *Result {
	t.Helper()
	r, err := Solve(b.d, opt)
	if err != nil {
		t.Fatalf("solve: %v", err)
	}
	return r
}

func (b *builder) volts(r *Result, net string) float64 { return r.NetV[b.d.LookupNet(net)] }

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300)
}

// resistance is the two-point resistance between nets a and c: drive 1 A
// from a to c outside the network and read V(a) − V(c). c is wired to
// ground.
func (b *builder) resistance(t tb, a, c string) float64 {
	t.Helper()
	b.wire(c, "gnd")
	b.i("gnd", a, 1)
	r := b.solve(t, &Options{Dense: true})
	return b.volts(r, a) - b.volts(r, c)
}
