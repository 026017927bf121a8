package check

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"nodal/circuit"
)

// TestNewKindsOrderFree: a design with batteries in parallel, constant-power
// and constant-current loads and a junction gives the same voltage and
// current for every part, to 1e-9, whatever the order of its statements.
// (Every load is updated from the same iterate, so none goes first.)
func TestNewKindsOrderFree(t *testing.T) {
	lines := []string{
		"battery B1 (vb, gnd) 12.6 V series 60 mΩ capacity 7 Ah rated 10 A",
		"battery B2 (vb, gnd) 12.4 V series 90 mΩ capacity 5 Ah rated 10 A",
		"resistor RW (vb, rail) 150 mΩ",
		"load P1 (rail, gnd) 20 W",
		"load P2 (rail, gnd) 35 W",
		"load C1 (rail, gnd) 400 mA",
		"resistor RL (rail, led_a) 680 Ω",
		"led D1 (led_a, gnd) vf 2.0 V at 10 mA",
	}
	type pt struct{ v, i float64 }
	var want map[string]pt
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 8; trial++ {
		perm := append([]string(nil), lines...)
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		src := "ground gnd\n" + strings.Join(perm, "\n") + "\n"
		d, v, i := opOf(t, src)
		got := map[string]pt{}
		for k := range d.Parts {
			got[d.PartName(circuit.PartID(k))] = pt{v[k], i[k]}
		}
		if want == nil {
			want = got
			// Power loads draw their power: V·I = P.
			for name, p := range map[string]float64{"P1": 20, "P2": 35} {
				if q := got[name]; math.Abs(q.v*q.i-p) > 1e-9*p {
					t.Errorf("%s draws %.12g W, want %g W", name, q.v*q.i, p)
				}
			}
			continue
		}
		for name, w := range want {
			g := got[name]
			if math.Abs(g.v-w.v) > 1e-9*math.Max(math.Abs(w.v), 1) || math.Abs(g.i-w.i) > 1e-9*math.Max(math.Abs(w.i), 1e-3) {
				t.Errorf("order %d: %s at %.12g V, %.12g A; first order %.12g V, %.12g A", trial, name, g.v, g.i, w.v, w.i)
			}
		}
	}
}
