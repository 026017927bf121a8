package check

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// TestPowerLoadClosedForm: a load drawing P through R from V_s settles at
// V = (V_s + √(V_s² − 4·P·R))/2, the stable root of V² − V_s·V + P·R = 0
// (algebra); its power V·I is P, and the source delivers P + I²·R (energy
// balance), to 1e-9.
func TestPowerLoadClosedForm(t *testing.T) {
	for _, c := range []struct{ vs, r, p float64 }{
		{5, 1, 4}, // the reference's example: 4.000 V, 1.000 A
		{12, 0.5, 10},
		{3.3, 2.2, 1.2},
		{48, 10, 57},
	} {
		src := fmt.Sprintf("ground gnd\nsource VS (vs, gnd) %g V\nresistor RS (vs, rail) %g Ω\nload L (rail, gnd) %g W\n", c.vs, c.r, c.p)
		d, v, i := opOf(t, src)
		l, s := partIndex(t, d, "L"), partIndex(t, d, "VS")
		want := (c.vs + math.Sqrt(c.vs*c.vs-4*c.p*c.r)) / 2
		if rel(v[l], want) > 1e-9 {
			t.Errorf("%g V, %g Ω, %g W: load at %.12g V, want %.12g V", c.vs, c.r, c.p, v[l], want)
		}
		if rel(v[l]*i[l], c.p) > 1e-9 {
			t.Errorf("%g W load draws %.12g W", c.p, v[l]*i[l])
		}
		if delivered := -v[s] * i[s]; rel(delivered, c.p+i[l]*i[l]*c.r) > 1e-9 {
			t.Errorf("source delivers %.12g W, load %g W + loss %.12g W", delivered, c.p, i[l]*i[l]*c.r)
		}
	}
}

// TestPowerLoadBoundary: with V_s behind R there is an operating point
// only while P ≤ V_s²/(4·R) (maximum power transfer theorem): just under
// it the load is fed, near V_s/2; just over it nodal reports starved-load,
// not a convergence failure.
func TestPowerLoadBoundary(t *testing.T) {
	const vs, r = 5.0, 1.0
	limit := vs * vs / (4 * r) // 6.25 W
	for _, c := range []struct {
		scale   float64
		starved bool
	}{{1 - 1e-6, false}, {1 + 1e-6, true}, {0.5, false}, {2, true}} {
		src := fmt.Sprintf("ground gnd\nsource VS (vs, gnd) 5 V\nresistor RS (vs, rail) 1 Ω\nload L (rail, gnd) %.15g W\n", limit*c.scale)
		res, err := Source("t.nodal", []byte(src), nil)
		if err != nil {
			t.Fatal(err)
		}
		var found []string
		for _, d := range res.Diags {
			found = append(found, d.Rule)
			if d.Rule == "starved-load" && !strings.Contains(d.Message, "at most 6.25 W") {
				t.Errorf("message does not give the limit: %s", d.Message)
			}
		}
		got := strings.Join(found, ",")
		if c.starved && got != "starved-load" || !c.starved && got != "" {
			t.Errorf("load at %g of the limit: findings %q", c.scale, got)
		}
		if !c.starved {
			op := res.Solved.OP
			l := partIndex(t, res.Build.Design, "L")
			p := limit * c.scale
			want := (vs + math.Sqrt(vs*vs-4*p*r)) / 2
			if math.Abs(op.V[l]-want) > 1e-6 {
				t.Errorf("load at %g of the limit: %.9g V, want %.9g V", c.scale, op.V[l], want)
			}
		}
	}
}

// TestPowerLoadsShareARail: two constant-power loads on one rail draw as
// one load of their sum (KCL: their currents add at the same voltage), so
// the closed form holds for P1 + P2; and the powers of all parts sum to
// zero (Tellegen's theorem, Philips Res. Rep. 7, 259 (1952), from
// memory).
func TestPowerLoadsShareARail(t *testing.T) {
	src := "ground gnd\nsource VS (vs, gnd) 12 V\nresistor RS (vs, rail) 2 Ω\nload L1 (rail, gnd) 7 W\nload L2 (rail, gnd) 9 W\nresistor RB (rail, gnd) 100 Ω\n"
	d, v, i := opOf(t, src)
	// With the 100 Ω bleeder the rail is the Thévenin source 12·100/102 V
	// behind 2‖100 Ω.
	vth, rth := 12*100.0/102, 2*100.0/102
	want := (vth + math.Sqrt(vth*vth-4*16*rth)) / 2
	l1 := partIndex(t, d, "L1")
	if rel(v[l1], want) > 1e-9 {
		t.Errorf("rail at %.12g V, want %.12g V", v[l1], want)
	}
	assertTellegen(t, d, v, i)
}

// TestCurrentLoad: a constant-current load draws its current whatever its
// voltage (Ohm's law for the rest).
func TestCurrentLoad(t *testing.T) {
	d, v, i := opOf(t, "ground gnd\nsource VS (vs, gnd) 12 V\nresistor RS (vs, rail) 10 Ω\nload L (rail, gnd) 250 mA\n")
	l := partIndex(t, d, "L")
	if rel(i[l], 0.25) > 1e-12 || rel(v[l], 12-2.5) > 1e-12 {
		t.Errorf("load at %g V, %g A; want 9.5 V, 250 mA", v[l], i[l])
	}
}

// TestIdleConverterAtZeroVolts: a converter whose input is tied to its
// common and whose output feeds nothing asks for no power (energy balance:
// Pin = Pout/η = 0), so it is not a load "demanding more power than the
// rail can deliver" (it said "demands 0 W"); what is wrong is that its
// input, 0 V, is below its input range.
func TestIdleConverterAtZeroVolts(t *testing.T) {
	src := `ground gnd
source V1 (vin, gnd) 12 V
resistor RB (vin, gnd) 1 kΩ
converter U1 (in=gnd, out=v5, common=gnd) 5 V efficiency 90% input 6 V to 28 V rated 1 A
resistor RL (v5, x) 1 kΩ
port x
`
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	var rules []string
	for _, f := range res.Diags {
		rules = append(rules, f.Rule)
	}
	if got := strings.Join(rules, " "); got != "input-range" {
		t.Fatalf("findings %q, want only input-range:\n%v", got, res.Diags)
	}
}
