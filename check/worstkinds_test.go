package check

import (
	"math"
	"testing"
)

// TestWorstCaseSupplyAndLoadTolerances: the tolerance written on a
// battery or a load moves the operating point over its band, as on a
// source or a resistor; none is accepted and left unused. Each range is
// checked at the ends of the band against its closed form, to 1e-9:
//   - a battery E behind its series resistance Rs into R: V = E·R/(Rs + R)
//     (voltage division);
//   - a constant-current load I fed through R from Vs: V = Vs − I·R (Ohm's
//     law);
//   - a constant-power load P fed through R from Vs: V = (Vs + √(Vs² − 4PR))/2,
//     the upper root of V² − Vs·V + PR = 0 (Ohm's law with I = P/V).
func TestWorstCaseSupplyAndLoadTolerances(t *testing.T) {
	const vs, r = 10.0, 100.0
	power := func(p float64) float64 { return (vs + math.Sqrt(vs*vs-4*p*r)) / 2 }
	for _, c := range []struct {
		name, src      string
		wantLo, wantHi float64
	}{
		{"battery", "ground gnd\nbattery B1 (out, gnd) 12 V tol 10% series 1 Ω\nresistor R1 (out, gnd) 9 Ω\n",
			12 * 0.9 * 9 / 10, 12 * 1.1 * 9 / 10},
		{"ideal battery", "ground gnd\nbattery B1 (out, gnd) 12 V tol 10%\nresistor R1 (out, gnd) 9 Ω\n",
			12 * 0.9, 12 * 1.1},
		{"current load", "ground gnd\nsource V1 (in, gnd) 10 V\nresistor R1 (in, out) 100 Ω\nload L1 (out, gnd) 20 mA tol 10%\n",
			vs - 0.022*r, vs - 0.018*r},
		{"power load", "ground gnd\nsource V1 (in, gnd) 10 V\nresistor R1 (in, out) 100 Ω\nload L1 (out, gnd) 200 mW tol 10%\n",
			power(0.22), power(0.18)},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, err := Source("t.nodal", []byte(c.src), nil)
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Diags) > 0 || res.Worst == nil || res.Worst.R == nil {
				t.Fatalf("findings %v, worst case %v", res.Diags, res.Worst)
			}
			out := res.Build.Design.LookupNet("out")
			lo, hi := res.Worst.R.NetLow[out], res.Worst.R.NetHigh[out]
			if rel(lo, c.wantLo) > 1e-9 || rel(hi, c.wantHi) > 1e-9 {
				t.Errorf("out spans %.12g … %.12g V, the closed form gives %.12g … %.12g V", lo, hi, c.wantLo, c.wantHi)
			}
		})
	}
}
