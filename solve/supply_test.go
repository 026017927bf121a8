package solve

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"nodal/circuit"
)

// reg adds a linear regulator from in to out against com.
func (b *builder) reg(name, in, out, com string, vset, dropout, iq, limit float64) circuit.PartID {
	p := circuit.Part{Kind: circuit.Regulator, Local: name, Value: vset, Inst: -1,
		Conv: &circuit.Conv{Dropout: dropout, Quiescent: iq, Limit: limit}}
	p.Pins = [circuit.MaxPins]circuit.NetID{b.net(in), b.net(out), b.net(com)}
	return b.d.AddPart(p)
}

// conv adds a switching converter from in to out against com.
func (b *builder) conv(name, in, out, com string, vset, eff, iq float64) circuit.PartID {
	p := circuit.Part{Kind: circuit.Converter, Local: name, Value: vset, Inst: -1,
		Conv: &circuit.Conv{Efficiency: eff, Quiescent: iq}}
	p.Pins = [circuit.MaxPins]circuit.NetID{b.net(in), b.net(out), b.net(com)}
	return b.d.AddPart(p)
}

// supplyFigures are a regulator's or converter's figures read back from a
// result: input and output voltage against common, input current, output
// current, current into common, and the power it absorbs.
type supplyFigures struct{ vin, vout, iin, iout, icom, p float64 }

func figures(t *testing.T, b *builder, r *Result, id circuit.PartID) supplyFigures {
	t.Helper()
	mp := r.MultiAt(id)
	if mp == nil {
		t.Fatalf("no operating point for part %d with three pins", id)
	}
	p := &b.d.Parts[id]
	v := func(k int) float64 { return r.NetV[p.Pins[k]] - r.NetV[p.Pins[2]] }
	return supplyFigures{vin: v(0), vout: v(1), iin: mp.I[0], iout: -mp.I[1], icom: mp.I[2], p: r.P[id]}
}

// TestRegulatorEnergyBalance: in every region a regulator draws its output
// current plus its quiescent current, the quiescent current leaves by
// common, and it dissipates (Vin − Vout)·Iout + Vin·Iq (common practice,
// from the energy balance); the power it draws at its input is the power
// it delivers plus what it dissipates, to 1e-9.
func TestRegulatorEnergyBalance(t *testing.T) {
	for _, c := range []struct {
		name     string
		vs, rl   float64
		limit    float64
		region   Region
		wantVout float64 // 0: the input less the dropout
	}{
		{"regulating", 12, 33, 0, Regulating, 3.3},
		{"dropout", 3.45, 33, 0, InDropout, 0},
		{"limit", 12, 10, 0.2, Limiting, 0.2 * 10},
	} {
		t.Run(c.name, func(t *testing.T) {
			b := newBuilder()
			b.v("vs", "gnd", c.vs)
			b.r("vs", "vin", 0.5)
			u := b.reg("U1", "vin", "vout", "gnd", 3.3, 0.3, 2e-3, c.limit)
			b.r("vout", "gnd", c.rl)
			r := b.solve(t, nil)
			f := figures(t, b, r, u)
			if got := r.MultiAt(u).Region; got != c.region {
				t.Fatalf("region %v, want %v", got, c.region)
			}
			if c.wantVout == 0 {
				c.wantVout = f.vin - 0.3
			}
			if !near(f.vout, c.wantVout, 1e-9) {
				t.Errorf("output %.12g V, want %.12g V", f.vout, c.wantVout)
			}
			if !near(f.iout, f.vout/c.rl, 1e-9) {
				t.Errorf("output current %.12g A, the load takes %.12g A", f.iout, f.vout/c.rl)
			}
			if !near(f.iin, f.iout+2e-3, 1e-9) || !near(-f.icom, 2e-3, 1e-9) {
				t.Errorf("input %.12g A, common %.12g A, for %.12g A out and 2 mA quiescent", f.iin, f.icom, f.iout)
			}
			diss := (f.vin-f.vout)*f.iout + f.vin*2e-3
			if !near(f.p, diss, 1e-9) {
				t.Errorf("dissipates %.12g W, want (Vin − Vout)·Iout + Vin·Iq = %.12g W", f.p, diss)
			}
			if pin, pout := f.vin*f.iin, f.vout*f.iout; math.Abs(pin-(pout+f.p)) > 1e-9*pin {
				t.Errorf("energy balance: in %.12g W, out %.12g W + dissipated %.12g W", pin, pout, f.p)
			}
		})
	}
}

// TestConverterInputCurrent: a converter draws Iin = Vout·Iout/(η·Vin) + Iq
// (hand algebra from the energy balance Pin = Pout/η + Vin·Iq), and its
// input power is its output power plus what it dissipates, to 1e-9.
// Behind a resistance its input settles where the rail's line
// V = Vs − R·Iin meets that draw.
func TestConverterInputCurrent(t *testing.T) {
	for _, c := range []struct{ vs, rs, vout, rl, eff, iq float64 }{
		{12, 0.2, 5, 10, 0.9, 100e-6},
		{24, 1, 3.3, 2.2, 0.82, 2e-3},
		{5, 0.05, 12, 60, 0.87, 0},
	} {
		b := newBuilder()
		b.v("vs", "gnd", c.vs)
		b.r("vs", "vin", c.rs)
		u := b.conv("U1", "vin", "vout", "gnd", c.vout, c.eff, c.iq)
		b.r("vout", "gnd", c.rl)
		r := b.solve(t, nil)
		f := figures(t, b, r, u)
		iout := c.vout / c.rl
		want := c.vout*iout/(c.eff*f.vin) + c.iq
		if !near(f.iin, want, 1e-9) {
			t.Errorf("%+v: input current %.12g A, want Vout·Iout/(η·Vin) + Iq = %.12g A", c, f.iin, want)
		}
		if !near(f.vin, c.vs-c.rs*f.iin, 1e-9) {
			t.Errorf("%+v: input at %.12g V, the rail gives %.12g V", c, f.vin, c.vs-c.rs*f.iin)
		}
		if pin, pout := f.vin*f.iin, f.vout*f.iout; math.Abs(pin-(pout+f.p)) > 1e-9*pin || !near(pout/c.eff+f.vin*c.iq, pin, 1e-9) {
			t.Errorf("%+v: energy balance: in %.12g W, out %.12g W, dissipated %.12g W", c, pin, pout, f.p)
		}
	}
}

// TestRegulatorDropoutBoundary sweeps a regulator's input across its set
// voltage plus its dropout: above, the output is the set voltage; below,
// the input less the dropout (common practice); the two meet at the
// boundary, so the output is continuous there.
func TestRegulatorDropoutBoundary(t *testing.T) {
	const vset, vdo = 3.3, 0.35
	boundary := vset + vdo
	out := func(vin float64) (float64, Region) {
		b := newBuilder()
		b.v("vin", "gnd", vin)
		u := b.reg("U1", "vin", "vout", "gnd", vset, vdo, 1e-3, 0)
		b.r("vout", "gnd", 47)
		r := b.solve(t, nil)
		return r.NetV[b.net("vout")], r.MultiAt(u).Region
	}
	for k := -20; k <= 20; k++ {
		vin := boundary + float64(k)*0.025
		got, region := out(vin)
		want := vset
		if vin < boundary {
			want = vin - vdo
		}
		if !near(got, want, 1e-9) {
			t.Errorf("input %.6g V: output %.12g V (%v), want %.12g V", vin, got, region, want)
		}
	}
	for _, eps := range []float64{1e-3, 1e-6, 1e-9} {
		below, _ := out(boundary - eps)
		above, _ := out(boundary + eps)
		if math.Abs(above-below) > 2*eps {
			t.Errorf("output jumps by %.3g V across the boundary (±%g V)", above-below, eps)
		}
	}
}

// TestConverterStarvedBoundary: a converter behind a source Vs with
// resistance R draws a constant power Pin at its input, which has an
// operating point only while Pin ≤ Vs²/(4R) (maximum power transfer
// theorem); just under it the input sits at (Vs + √(Vs² − 4·Pin·R))/2
// (the upper root of V² − Vs·V + Pin·R = 0), just over it the solve says
// that the rail cannot deliver it and names the converter.
func TestConverterStarvedBoundary(t *testing.T) {
	const vs, rs, vout, eff = 12.0, 4.0, 5.0, 0.9
	limit := vs * vs / (4 * rs) // 9 W
	for _, scale := range []float64{1 - 1e-6, 0.5, 1 + 1e-6, 2} {
		pin := limit * scale
		rl := vout * vout / (pin * eff)
		b := newBuilder()
		b.v("vs", "gnd", vs)
		b.r("vs", "vin", rs)
		u := b.conv("U1", "vin", "vout", "gnd", vout, eff, 0)
		b.r("vout", "gnd", rl)
		r, err := Solve(b.d, nil)
		if scale > 1 {
			var se *Error
			if !errors.As(err, &se) || se.Kind != Starved || len(se.Parts) != 1 || se.Parts[0] != u ||
				!strings.Contains(se.Msg, "converter U1's input") || !strings.Contains(se.Msg, "at most 9.00 W") {
				t.Errorf("%g of the limit: %v", scale, err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%g of the limit: %v", scale, err)
		}
		want := (vs + math.Sqrt(vs*vs-4*pin*rs)) / 2
		// Near the boundary the root is as sensitive as √(1 − scale):
		// 1e-6 of the limit leaves about 1e-3 of the voltage.
		tol := 1e-9
		if scale > 0.99 {
			tol = 1e-6
		}
		if got := figures(t, b, r, u).vin; !near(got, want, tol) {
			t.Errorf("%g of the limit: input at %.12g V, want %.12g V", scale, got, want)
		}
	}
}

// TestSupplyTreeAgainstDenseMNA: a power tree with a path from a
// regulator's output back to its input (so the draws need more than one
// round to settle) against an independent modified nodal analysis of the
// same circuit (Ho, Ruehli & Brennan, IEEE Trans. Circuits and Systems
// 22(6), 1975), written here from the regulator's equations — V(out) −
// V(com) = Vset, current into in = Iout + Iq, into com = −Iq — and solved
// by gonum's dense LU, to 1e-9.
func TestSupplyTreeAgainstDenseMNA(t *testing.T) {
	b := newBuilder()
	b.v("vs", "gnd", 9)
	b.r("vs", "a", 2) // source resistance
	u1 := b.reg("U1", "a", "b", "gnd", 5, 0.4, 3e-3, 0)
	b.r("b", "gnd", 25)
	b.r("b", "a", 150) // feedback path from output to input
	u2 := b.reg("U2", "b", "c", "k", 3.3, 0.2, 1e-3, 0)
	b.r("k", "gnd", 10) // U2's common lifted above ground
	b.r("c", "gnd", 40)
	r := b.solve(t, nil)

	// Unknowns: V(vs), V(a), V(b), V(c), V(k), I(VS), Iout1, Iout2.
	idx := map[string]int{"vs": 0, "a": 1, "b": 2, "c": 3, "k": 4}
	const iVS, iU1, iU2, n = 5, 6, 7, 8
	A := mat.NewDense(n, n, nil)
	rhs := mat.NewVecDense(n, nil)
	res := func(x, y string, ohms float64) {
		g := 1 / ohms
		for _, e := range [][3]any{{x, x, g}, {y, y, g}, {x, y, -g}, {y, x, -g}} {
			i, oki := idx[e[0].(string)]
			j, okj := idx[e[1].(string)]
			if oki && okj {
				A.Set(i, j, A.At(i, j)+e[2].(float64))
			}
		}
	}
	res("vs", "a", 2)
	res("b", "gnd", 25)
	res("b", "a", 150)
	res("k", "gnd", 10)
	res("c", "gnd", 40)
	// Voltage source: current I(VS) leaves vs into the source.
	A.Set(idx["vs"], iVS, 1)
	A.Set(iVS, idx["vs"], 1)
	rhs.SetVec(iVS, 9)
	// A regulator's rows: KCL gets +(Iout + Iq) leaving at in, −Iout at
	// out, −Iq at com; its own row fixes V(out) − V(com).
	regRows := func(in, out, com string, k int, vset, iq float64) {
		if i, ok := idx[in]; ok {
			A.Set(i, k, A.At(i, k)+1)
			rhs.SetVec(i, rhs.AtVec(i)-iq)
		}
		if i, ok := idx[out]; ok {
			A.Set(i, k, A.At(i, k)-1)
			A.Set(k, i, 1)
		}
		if i, ok := idx[com]; ok {
			rhs.SetVec(i, rhs.AtVec(i)+iq)
			A.Set(k, i, -1)
		}
		rhs.SetVec(k, vset)
	}
	regRows("a", "b", "gnd", iU1, 5, 3e-3)
	regRows("b", "c", "k", iU2, 3.3, 1e-3)
	var x mat.VecDense
	if err := x.SolveVec(A, rhs); err != nil {
		t.Fatal(err)
	}
	for name, i := range idx {
		if got, want := r.NetV[b.net(name)], x.AtVec(i); !near(got, want, 1e-9) {
			t.Errorf("net %s at %.12g V, dense MNA %.12g V", name, got, want)
		}
	}
	for _, c := range []struct {
		id circuit.PartID
		k  int
	}{{u1, iU1}, {u2, iU2}} {
		if got, want := figures(t, b, r, c.id).iout, x.AtVec(c.k); !near(got, want, 1e-9) {
			t.Errorf("part %d delivers %.12g A, dense MNA %.12g A", c.id, got, want)
		}
		if r.MultiAt(c.id).Region != Regulating {
			t.Errorf("part %d not regulating", c.id)
		}
	}
}

// TestRegulatorOutputsTied: two regulators with their outputs tied at
// different voltages have no operating point (Kirchhoff's voltage law):
// the solve says so rather than picking one.
func TestRegulatorOutputsTied(t *testing.T) {
	b := newBuilder()
	b.v("vin", "gnd", 12)
	b.reg("U1", "vin", "vout", "gnd", 5, 0.3, 0, 0)
	b.reg("U2", "vin", "vout", "gnd", 3.3, 0.3, 0, 0)
	b.r("vout", "gnd", 100)
	if _, err := Solve(b.d, nil); err == nil {
		t.Fatal("tied outputs at 5 V and 3.3 V solved")
	}
}

// TestRegulatorsInParallel: two regulators at the same voltage with their
// outputs tied satisfy Kirchhoff's voltage law, but nothing fixes how they
// share the load (a loop of parts that each hold a voltage), so nothing
// fixes what each draws from its input either: the solve says so and
// names both, rather than give the upstream currents of one arbitrary
// split.
func TestRegulatorsInParallel(t *testing.T) {
	b := newBuilder()
	b.v("vin", "gnd", 12)
	b.r("vin", "va", 1)
	b.r("vin", "vb", 2)
	u1 := b.reg("U1", "va", "vout", "gnd", 5, 0.3, 0, 0)
	u2 := b.reg("U2", "vb", "vout", "gnd", 5, 0.3, 0, 0)
	b.r("vout", "gnd", 100)
	_, err := Solve(b.d, nil)
	var se *Error
	if !errors.As(err, &se) || len(se.Parts) != 2 || se.Parts[0] != u1 || se.Parts[1] != u2 || !strings.Contains(se.Msg, "not determined") {
		t.Fatalf("got %v", err)
	}
}

// TestRegulatorBackfed: a linear regulator only sources current (common
// practice). Pulled up through Rp from Vs into a load Rl, its output is
// the divider's Vs·Rl/(Rp + Rl) where that is above its set voltage, and
// it delivers nothing; below, it holds the set voltage and sources the
// rest of the load's current. The output is continuous where the divider
// meets the set voltage.
func TestRegulatorBackfed(t *testing.T) {
	const vs, rl, vset = 5.0, 100.0, 3.3
	solveWith := func(rp float64) (float64, float64, Region) {
		b := newBuilder()
		b.v("vin", "gnd", vs)
		u := b.reg("U1", "vin", "vout", "gnd", vset, 0.3, 1e-3, 0)
		b.r("vin", "vout", rp)
		b.r("vout", "gnd", rl)
		r := b.solve(t, nil)
		return r.NetV[b.net("vout")], figures(t, b, r, u).iout, r.MultiAt(u).Region
	}
	for _, rp := range []float64{10, 22, 47, 51.5151, 60, 100, 1000} {
		out, iout, region := solveWith(rp)
		div := vs * rl / (rp + rl)
		switch {
		case div > vset:
			if region != Backfed || !near(out, div, 1e-9) || iout != 0 {
				t.Errorf("Rp %g Ω: %v at %.12g V delivering %g A, want back-fed at %.12g V", rp, region, out, iout, div)
			}
		default:
			want := vset/rl - (vs-vset)/rp
			if region != Regulating || !near(out, vset, 1e-9) || !near(iout, want, 1e-9) {
				t.Errorf("Rp %g Ω: %v at %.12g V delivering %.12g A, want %g V, %.12g A", rp, region, out, iout, vset, want)
			}
		}
	}
	// The divider meets 3.3 V at Rp = Rl·(Vs − Vset)/Vset.
	edge := rl * (vs - vset) / vset
	below, _, _ := solveWith(edge * (1 - 1e-6))
	above, _, _ := solveWith(edge * (1 + 1e-6))
	if math.Abs(below-above) > 1e-5 {
		t.Errorf("output jumps from %.9g V to %.9g V across the edge", below, above)
	}
}

// TestConverterBackfed: a converter taken to source only (as most do):
// pulled up above its set voltage through Rp from Vs into a load Rl, its
// output is the divider's Vs·Rl/(Rp + Rl), it delivers nothing and draws
// only its quiescent current; the rail feeding it then carries just that.
func TestConverterBackfed(t *testing.T) {
	b := newBuilder()
	b.v("vin", "gnd", 12)
	b.v("vhi", "gnd", 9)
	u := b.conv("U1", "vin", "vout", "gnd", 5, 0.9, 1e-4)
	b.r("vhi", "vout", 10)
	b.r("vout", "gnd", 100)
	r := b.solve(t, nil)
	f := figures(t, b, r, u)
	if r.MultiAt(u).Region != Backfed || !near(f.vout, 9*100/110.0, 1e-9) || f.iout != 0 || !near(f.iin, 1e-4, 1e-9) {
		t.Errorf("%v at %.12g V, %g A out, %.12g A in", r.MultiAt(u).Region, f.vout, f.iout, f.iin)
	}
}
