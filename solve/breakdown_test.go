package solve

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"

	"nodal/circuit"
)

// clamp builds a supply of vs volts feeding a diode with breakdown bv at
// it through r ohms, the diode's cathode on the resistor and its anode on
// ground, so that it is reverse-biased.
func clamp(vs, r, bv, it, series float64) (*builder, circuit.PartID, circuit.PartID) {
	b := newBuilder()
	b.v("vin", "gnd", vs)
	rp := b.r("vin", "ref", r)
	d := b.add(circuit.Part{Local: "D1", Kind: circuit.Diode, VF: 0.7, VFAt: 10e-3, Series: series, Breakdown: bv, BreakdownAt: it}, "gnd", "ref")
	return b, rp, d
}

// TestBreakdownAtTestPoint holds a clamp diode at its breakdown voltage:
// with the resistor chosen so that Ohm's law around the loop gives
// I = (Vs − BV)/R = It exactly, the diode must sit at −BV and carry −It,
// whatever the exponential's shape (hand algebra: Kirchhoff's voltage law
// around supply, resistor and diode, and Ohm's law for the resistor).
func TestBreakdownAtTestPoint(t *testing.T) {
	for _, c := range []struct{ vs, bv, it, series float64 }{
		{12, 5.1, 5e-3, 0},
		{12, 5.1, 5e-3, 8},
		{24, 15, 1e-3, 0},
		{5, 3.3, 20e-3, 2},
		{48, 39, 250e-6, 30},
	} {
		r := (c.vs - c.bv) / c.it
		b, rp, d := clamp(c.vs, r, c.bv, c.it, c.series)
		res := b.solve(t, nil)
		// The 1 pS across every junction (Leakage) adds Leakage·BV to its
		// current, which moves it along the resistor's line by at most
		// that current times R.
		leak := Leakage * c.bv
		if math.Abs(res.V[d]+c.bv) > 1e-9*c.bv+leak*r || math.Abs(res.I[d]+c.it) > 1e-9*c.it+leak {
			t.Errorf("%+v: diode at %.12g V, %.12g A; want %g V, %g A", c, res.V[d], res.I[d], -c.bv, -c.it)
		}
		// Ohm's law around the loop: Vs = R·I + |V_D|.
		if got := c.vs - r*res.I[rp]; !near(got, -res.V[d], 1e-9) {
			t.Errorf("%+v: Vs − R·I = %.12g V, diode %.12g V", c, got, res.V[d])
		}
	}
}

// TestBreakdownAwayFromTestPoint drives the clamp harder and softer than
// its test point: its current is Ohm's law around the loop,
// I = (Vs − |V_D|)/R, and its voltage the model's (Breakdown) at that
// current: |V_D| = Vb + n·Vt·ln(I/It + e^(−Vb/(n·Vt))) + I·Rs, the
// reverse exponential solved for V. Below its breakdown the current is
// negligible and the net follows the supply.
func TestBreakdownAwayFromTestPoint(t *testing.T) {
	for _, vs := range []float64{6, 9, 12, 30, 100} {
		b, rp, d := clamp(vs, 1e3, 5.1, 5e-3, 4)
		res := b.solve(t, nil)
		p := &b.d.Parts[d]
		br, _, _ := BreakdownOf(p)
		ir := -res.I[d]
		if ohm := (vs + res.V[d]) / 1e3; !near(res.I[rp], ohm, 1e-9) || !near(ir, ohm, 1e-9) {
			t.Errorf("Vs %g V: resistor %.12g A, diode %.12g A, Ohm's law %.12g A", vs, res.I[rp], ir, ohm)
		}
		want := br.Vb + br.Nvt*math.Log(ir/br.It+br.c) + ir*p.Series
		if math.Abs(-res.V[d]-want) > 1e-9*want {
			t.Errorf("Vs %g V: diode at %.12g V, the model gives %.12g V at %.6g A", vs, -res.V[d], want, ir)
		}
		if ir < 5e-4 || -res.V[d] < 5.0 || -res.V[d] > 5.1+ir*4+0.1 { // BV, its series drop and 0.1 V of the exponential
			t.Errorf("Vs %g V: diode at %.6g V, %.6g A: not held near its 5.1 V breakdown", vs, res.V[d], ir)
		}
	}
	// Below breakdown: the 3 V supply reaches the net almost whole.
	b, _, d := clamp(3, 1e3, 5.1, 5e-3, 0)
	res := b.solve(t, nil)
	if v := b.volts(res, "ref"); !near(v, 3, 1e-6) || -res.I[d] > 1e-9 {
		t.Errorf("below breakdown: ref at %.9g V, diode %.3g A; want 3 V and no current", v, res.I[d])
	}
}

// TestBreakdownOfBadSeries refuses a diode whose series resistance alone
// drops its breakdown voltage at the test current.
func TestBreakdownOfBadSeries(t *testing.T) {
	b, _, _ := clamp(12, 1e3, 5.1, 5e-3, 2000)
	_, err := Solve(b.d, nil)
	var se *Error
	if !errors.As(err, &se) || se.Kind != BadPart {
		t.Fatalf("got %v, want a bad part", err)
	}
}

// TestRandomBreakdown adds clamp diodes to random circuits: Newton with the
// breakdown's step limiting must converge, each junction must sit on its
// curve (Shockley's forward term plus the reverse exponential), and
// Kirchhoff's current law and Tellegen's theorem (Tellegen, Philips Res.
// Rep. 7, 259 (1952), from memory) must hold.
func TestRandomBreakdown(t *testing.T) {
	vt := ThermalVoltage(RoomTemperature)
	runs, unsettled := 0, 0
	defer func() {
		t.Logf("%d of %d random circuits with breakdown diodes did not converge", unsettled, runs)
		if unsettled > 1+runs/200 { // the bound TestRandomJunctions allows
			t.Errorf("%d of %d random circuits did not converge; more than 0.5 %% + 1", unsettled, runs)
		}
	}()
	rapid.Check(t, func(t *rapid.T) {
		b := randomCircuit(t)
		nets := len(b.d.Nets)
		var js []circuit.PartID
		for k := rapid.IntRange(1, 4).Draw(t, "diodes"); k > 0; k-- {
			x, y := rapid.IntRange(0, nets-1).Draw(t, "anode"), rapid.IntRange(0, nets-1).Draw(t, "cathode")
			if x == y {
				continue
			}
			p := circuit.Part{Kind: circuit.Diode, VF: 0.7, VFAt: 10e-3,
				Series:      rapid.SampledFrom([]float64{0, 0.5, 5}).Draw(t, "series"),
				Breakdown:   rapid.Float64Range(0.8, 60).Draw(t, "bv"),
				BreakdownAt: math.Pow(10, rapid.Float64Range(-5, -1).Draw(t, "it"))}
			if p.Breakdown-p.BreakdownAt*p.Series <= 0.05 {
				continue
			}
			js = append(js, b.add(p, b.d.Nets[x].Local, b.d.Nets[y].Local))
		}
		runs++
		r, err := Solve(b.d, nil)
		var se *Error
		if errors.As(err, &se) && se.Kind == NoConvergence {
			if len(se.Parts) == 0 {
				t.Fatalf("no-convergence names no part: %v", err)
			}
			unsettled++
			return
		}
		if err != nil {
			t.Fatalf("solve: %v", err)
		}
		for _, j := range js {
			p := &b.d.Parts[j]
			is, vref, _ := SaturationCurrent(p, vt)
			br, _, _ := BreakdownOf(p)
			nvt := Ideality(p) * vt
			vj := r.V[j] - r.I[j]*p.Series
			if vj > vref+MaxOverdrive*nvt || vj < -br.Vb-MaxOverdrive*br.Nvt {
				continue // continued linearly, see MaxOverdrive
			}
			ib, _ := br.Eval(vj)
			want := is*math.Expm1(vj/nvt) + ib + Leakage*vj
			if math.Abs(r.I[j]-want) > 1e-9*math.Max(math.Abs(want), r.KCLScale)+1e-15 {
				t.Fatalf("diode %s: %g A at %g V, its curve gives %g A", p.Local, r.I[j], vj, want)
			}
		}
		assertKirchhoff(t, b.d, r)
	})
}
