package check

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"
)

// rangeOf checks src and returns the result with the named net's nominal
// voltage and its range over the worst case's box.
func rangeOf(t *testing.T, src, net string) (res *Result, nom, lo, hi float64) {
	t.Helper()
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Solved == nil || res.Solved.OP == nil || res.Worst == nil || res.Worst.R == nil {
		t.Fatalf("%q: not judged over its box: %v", src, driveRules(res))
	}
	d := res.Build.Design
	id := d.LookupNet(net)
	if id < 0 {
		t.Fatalf("no net %s", net)
	}
	return res, res.Solved.OP.NetV[id], res.Worst.R.NetLow[id], res.Worst.R.NetHigh[id]
}

// TestDriveRangeDivider: a port driven by LOW to HIGH behind R_s feeds a
// divider R1 over R2. By voltage division the tap sits at
// V·R2/(R_s + R1 + R2) for a drive V; nominal is the range's midpoint and
// the tap's range runs between the values at the two ends (the tap is
// affine in V). Likewise a current drive I_L to I_H into R sits between
// I_L·R and I_H·R (Ohm's law). To 1e-9.
func TestDriveRangeDivider(t *testing.T) {
	for _, c := range []struct{ lo, hi, rs, r1, r2 float64 }{
		{4.5, 5.5, 50, 1e3, 2e3},
		{10.8, 13.2, 0.5, 4.7e3, 1.2e3},
		{-1, 3.3, 220, 10e3, 10e3}, // a range through zero
	} {
		src := fmt.Sprintf("ground gnd\nport vin %g V to %g V series %g Ω\nresistor R1 (vin, tap) %g Ω\nresistor R2 (tap, gnd) %g Ω\n", c.lo, c.hi, c.rs, c.r1, c.r2)
		res, nom, lo, hi := rangeOf(t, src, "tap")
		div := c.r2 / (c.rs + c.r1 + c.r2)
		if want := (c.lo + c.hi) / 2 * div; math.Abs(nom-want) > 1e-9*math.Abs(c.hi*div) {
			t.Errorf("%g … %g V: nominal tap %.12g V, the midpoint gives %.12g V", c.lo, c.hi, nom, want)
		}
		if wantLo, wantHi := c.lo*div, c.hi*div; math.Abs(lo-wantLo) > 1e-9*math.Abs(c.hi*div) || math.Abs(hi-wantHi) > 1e-9*math.Abs(c.hi*div) {
			t.Errorf("%g … %g V: tap spans %.12g … %.12g V, voltage division gives %.12g … %.12g V", c.lo, c.hi, lo, hi, wantLo, wantHi)
		}
		if len(res.Diags) > 0 {
			t.Errorf("%g … %g V: findings %v", c.lo, c.hi, driveRules(res))
		}
	}
	_, nom, lo, hi := rangeOf(t, "ground gnd\nport loop 4 mA to 20 mA\nresistor RS (loop, gnd) 250 Ω\n", "loop")
	if rel(nom, 0.012*250) > 1e-9 || rel(lo, 0.004*250) > 1e-9 || rel(hi, 0.020*250) > 1e-9 {
		t.Errorf("4 … 20 mA into 250 Ω: %.12g V nominal, %.12g … %.12g V; Ohm's law gives 3 V, 1 V … 5 V", nom, lo, hi)
	}
}

// TestDriveRangeSuperposition: in a linear resistive network with one
// drive every node voltage is an affine function of the drive (the
// superposition theorem), so its extremes over the drive's range lie at
// the range's two ends. On random networks, each net's range from the
// worst case must match the network solved with the drive fixed at LOW and
// at HIGH; and with many toleranced resistors beside it (more parameters
// than every corner is solved for, so the ranges are first-order) the
// drive alone still moves each net by its affine share.
func TestDriveRangeSuperposition(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 5))
	for trial := 0; trial < 20; trial++ {
		nets := 3 + rng.IntN(5)
		var body strings.Builder
		name := func(k int) string {
			if k == 0 {
				return "gnd"
			}
			return fmt.Sprintf("n%d", k)
		}
		// A spanning chain so that every net has a DC path, then chords.
		for k := 1; k <= nets; k++ {
			fmt.Fprintf(&body, "resistor R%d (%s, %s) %.4g Ω\n", k, name(k), name(rng.IntN(k)), 100+rng.Float64()*1e4)
		}
		for k := 0; k < nets; k++ {
			a, b := rng.IntN(nets+1), rng.IntN(nets+1)
			if a != b {
				fmt.Fprintf(&body, "resistor C%d (%s, %s) %.4g Ω\n", k, name(a), name(b), 100+rng.Float64()*1e4)
			}
		}
		lo := -5 + 10*rng.Float64()
		hi := lo + 0.1 + 20*rng.Float64()
		drive := fmt.Sprintf("port n1 %.6g %s to %.6g %s series 10 Ω\n", lo, "V", hi, "V")
		fixed := func(v float64) map[string]float64 {
			res, nv := solvedNets(t, fmt.Sprintf("ground gnd\nport n1 %.6g V series 10 Ω\n", v)+body.String())
			out := map[string]float64{}
			for n, net := range res.Build.Design.Nets {
				out[net.Local] = nv[n]
			}
			return out
		}
		// The ends as written, read back the same way as the range's.
		var l, h float64
		fmt.Sscanf(fmt.Sprintf("%.6g %.6g", lo, hi), "%g %g", &l, &h)
		atLo, atHi := fixed(l), fixed(h)
		res, err := Source("t.nodal", []byte("ground gnd\n"+drive+body.String()), nil)
		if err != nil || res.Worst == nil || res.Worst.R == nil {
			t.Fatalf("trial %d: %v %v", trial, err, driveRules(res))
		}
		w := res.Worst.R
		scale := math.Max(math.Abs(l), math.Abs(h))
		for n, net := range res.Build.Design.Nets {
			wantLo, wantHi := math.Min(atLo[net.Local], atHi[net.Local]), math.Max(atLo[net.Local], atHi[net.Local])
			if math.Abs(w.NetLow[n]-wantLo) > 1e-9*scale || math.Abs(w.NetHigh[n]-wantHi) > 1e-9*scale {
				t.Errorf("trial %d net %s: %.12g … %.12g V, solved at the ends %.12g … %.12g V", trial, res.Build.Design.Nets[n].Local, w.NetLow[n], w.NetHigh[n], wantLo, wantHi)
			}
			// Affine: the nominal point, at the midpoint, is the mean of the ends.
			if mid, avg := res.Solved.OP.NetV[n], (atLo[net.Local]+atHi[net.Local])/2; math.Abs(mid-avg) > 1e-9*scale {
				t.Errorf("trial %d net %s: %.12g V at the midpoint, the ends average %.12g V", trial, net.Local, mid, avg)
			}
		}
		// First-order ranges: thirteen 1 % resistors on a divider of their
		// own, away from the driven network, push the box past the size
		// whose every corner is solved. The driven network's ranges are
		// then the linearised ones, exact for an affine dependence.
		var extra strings.Builder
		extra.WriteString("source VX (x0, gnd) 1 V\n")
		for k := 0; k < 13; k++ {
			fmt.Fprintf(&extra, "resistor X%d (x%d, x%d) 1 kΩ tol 1%%\n", k, k, k+1)
		}
		extra.WriteString("resistor X13 (x13, gnd) 1 kΩ\n")
		res, err = Source("t.nodal", []byte("ground gnd\n"+drive+body.String()+extra.String()), nil)
		if err != nil || res.Worst == nil || res.Worst.R == nil {
			t.Fatalf("trial %d with extras: %v %v", trial, err, driveRules(res))
		}
		if res.Worst.R.Corners {
			t.Fatalf("trial %d: every corner was solved; the test wants the first-order ranges", trial)
		}
		w = res.Worst.R
		d := res.Build.Design
		for n := range d.Nets {
			name := d.Nets[n].Local
			if !strings.HasPrefix(name, "n") {
				continue
			}
			wantLo, wantHi := math.Min(atLo[name], atHi[name]), math.Max(atLo[name], atHi[name])
			if math.Abs(w.NetLow[n]-wantLo) > 1e-9*scale || math.Abs(w.NetHigh[n]-wantHi) > 1e-9*scale {
				t.Errorf("trial %d net %s, first order: %.12g … %.12g V, solved at the ends %.12g … %.12g V", trial, d.Nets[n].Local, w.NetLow[n], w.NetHigh[n], wantLo, wantHi)
			}
		}
	}
}

// solvedNets solves src and returns every net's voltage.
func solvedNets(t *testing.T, src string) (*Result, []float64) {
	t.Helper()
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("%q: %v %v", src, err, driveRules(res))
	}
	return res, res.Solved.OP.NetV
}

// TestDriveRangeCornerOverRating: a fires / near-miss pair. Behind 4.5 V to
// 5.5 V through 50 Ω, R1 = 1 kΩ over R2 = 2 kΩ dissipates
// (V/(R_s + R1 + R2))²·R1 (Ohm's law, P = I²R): 2.69 mW at the midpoint
// 5 V, 3.26 mW at the top. Rated 3 mW it is within its rating at nominal
// and past it at the top of the range, which the finding names; rated
// 3.3 mW it is within at every point of the range and nothing is past a
// rating.
func TestDriveRangeCornerOverRating(t *testing.T) {
	const rs, r1, r2 = 50.0, 1e3, 2e3
	p := func(v float64) float64 { i := v / (rs + r1 + r2); return i * i * r1 }
	if !(p(5) < 3e-3 && p(5.5) > 3e-3 && p(5.5) < 3.3e-3) {
		t.Fatalf("the pair's ratings do not straddle %g W … %g W", p(5), p(5.5))
	}
	src := func(rating string) string {
		return "ground gnd\nport vin 4.5 V to 5.5 V series 50 Ω\nresistor R1 (vin, tap) 1 kΩ rated " + rating + "\nresistor R2 (tap, gnd) 2 kΩ\n"
	}
	res, err := Source("t.nodal", []byte(src("3 mW")), nil)
	if err != nil {
		t.Fatal(err)
	}
	var msgs []string
	for _, f := range res.Diags {
		if f.Rule == "corner-over-rating" {
			msgs = append(msgs, f.Message)
		} else if f.Rule != "near-rating" {
			t.Errorf("fires: unexpected %s: %s", f.Rule, f.Message)
		}
	}
	if len(msgs) != 1 {
		t.Fatalf("fires: corner-over-rating %d times, want once: %v", len(msgs), driveRules(res))
	}
	want := fmt.Sprintf("%.2f mW", p(5.5)*1e3)
	for _, s := range []string{"R1", want, "port vin at 5.50 V (top of its range)"} {
		if !strings.Contains(msgs[0], s) {
			t.Errorf("fires: %q does not say %q", msgs[0], s)
		}
	}
	res, err = Source("t.nodal", []byte(src("3.3 mW")), nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range res.Diags {
		if f.Rule == "corner-over-rating" || f.Rule == "over-power" {
			t.Errorf("near miss: %s: %s", f.Rule, f.Message)
		}
	}
	// The bottom of the range: R1 from a fixed 5 V to a port driven at
	// 0 V to 4 V dissipates (5 V − V)²/R1 (Ohm's law), 9 mW at the
	// midpoint 2 V and 25 mW at the bottom. Rated 20 mW it is past its
	// rating only at the bottom, which the finding names.
	res, err = Source("t.nodal", []byte("ground gnd\nport vin 5 V\nport sink 0 V to 4 V\nresistor R1 (vin, sink) 1 kΩ rated 20 mW\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	msgs = nil
	for _, f := range res.Diags {
		if f.Rule == "corner-over-rating" {
			msgs = append(msgs, f.Message)
		}
	}
	if len(msgs) != 1 || !strings.Contains(msgs[0], "25.0 mW") || !strings.Contains(msgs[0], "port sink at 0 V (bottom of its range)") {
		t.Errorf("bottom of the range: %v, want R1 at 25.0 mW with port sink at 0 V (bottom of its range)", msgs)
	}
}

// TestDriveRangeErrors: a range that cannot be read is an error at its
// place, and the design is not judged as if it were driven.
func TestDriveRangeErrors(t *testing.T) {
	for _, c := range []struct{ src, rule, at, says string }{
		{"port vin 5.5 V to 4.5 V series 50 Ω\n", "bad-value", "2:10", "runs downwards"},
		{"port vin 4.5 V to 5.5 mA\n", "unit-mismatch", "2:10", "in one unit"},
		{"port vin 4.5 to 5.5 V\n", "unit-mismatch", "2:10", "unit on both ends"},
		{"port vin 4.5 W to 5.5 W\n", "unit-mismatch", "2:10", "is a power"},
		{"port vin 4 % to 5 %\n", "unit-mismatch", "2:10", "not percentages"},
		{"port vin 4.5 V to 5.5 V to 6 V\n", "bad-value", "2:25", "two ends"},
		{"port vin 4.5 V to\n", "missing-value", "2:16", "needs the top of the range"},
		{"port vin 4.5 V to 5.5 V tol 1%\n", "bad-attribute", "2:25", "takes no tol"},
		{"port vin 4 mA to 20 mA series 10 Ω\n", "bad-attribute", "2:24", "takes no series"},
		{"port vin 5 V series 1 Ω to 2 Ω\n", "bad-attribute", "2:14", "only derate takes"},
		{"port vin 5 V\nresistor R0 (vin, gnd) 1 kΩ to 2 kΩ\n", "bad-value", "3:30", "not a range"},
		{"port vin to 5 V\n", "syntax", "2:10", "the bottom of the range before to"},
		{"port vin -1.7e308 V to 1.7e308 V\n", "bad-value", "2:10", "wider than nodal can compute with"},
	} {
		src := "ground gnd\n" + c.src
		if !strings.Contains(src, "resistor") {
			src += "resistor R (vin, gnd) 1 kΩ\n"
		}
		res, err := Source("t.nodal", []byte(src), nil)
		if err != nil {
			t.Fatal(err)
		}
		wantRefused(t, c.src, res, c.rule, c.at, c.says, "is refused")
	}
}

// TestDriveRangeOrderFree: the findings and every net's range of a design
// with drive ranges, tolerances and an ambient range do not depend on the
// order of its statements.
func TestDriveRangeOrderFree(t *testing.T) {
	lines := []string{
		"ground gnd",
		"ambient 0 °C to 60 °C",
		"port vin 10.8 V to 13.2 V series 0.5 Ω",
		"port loop 4 mA to 20 mA",
		"port aux 3.3 V",
		"resistor R1 (vin, mid) 1 kΩ tol 1% rated 63 mW",
		"resistor R2 (mid, gnd) 2.2 kΩ tol 1% rated 63 mW",
		"resistor R3 (loop, mid) 470 Ω tol 5% rated 100 mW",
		"resistor R4 (aux, mid) 10 kΩ tempco 200 ppm/K",
		"resistor R5 (loop, gnd) 100 Ω rated 50 mW",
		"capacitor C1 (mid, gnd) 1 µF rated 10 V",
	}
	type out struct {
		msgs   []string
		ranges map[string][2]float64
	}
	var first *out
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := 0; trial < 8; trial++ {
		perm := append([]string(nil), lines...)
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		res, err := Source("t.nodal", []byte(strings.Join(perm, "\n")+"\n"), nil)
		if err != nil || res.Worst == nil || res.Worst.R == nil {
			t.Fatalf("order %d: %v %v", trial, err, driveRules(res))
		}
		o := &out{ranges: map[string][2]float64{}}
		for _, f := range res.Diags {
			o.msgs = append(o.msgs, f.Rule+": "+f.Message)
		}
		sort.Strings(o.msgs)
		for n, net := range res.Build.Design.Nets {
			o.ranges[net.Local] = [2]float64{res.Worst.R.NetLow[n], res.Worst.R.NetHigh[n]}
		}
		if first == nil {
			first = o
			if len(o.msgs) == 0 {
				t.Fatal("the design has no findings to compare")
			}
			continue
		}
		if strings.Join(o.msgs, "\n") != strings.Join(first.msgs, "\n") {
			t.Errorf("order %d: findings\n%s\nfirst order:\n%s", trial, strings.Join(o.msgs, "\n"), strings.Join(first.msgs, "\n"))
		}
		for name, w := range first.ranges {
			g := o.ranges[name]
			if math.Abs(g[0]-w[0]) > 1e-9*math.Max(math.Abs(w[0]), 1) || math.Abs(g[1]-w[1]) > 1e-9*math.Max(math.Abs(w[1]), 1) {
				t.Errorf("order %d: %s spans %v, first order %v", trial, name, g, w)
			}
		}
	}
}

// TestDriveRangeDropout: a regulator fed from a port driven over a range
// is judged at the range's ends. In dropout a regulator's output is its
// input less its dropout (the regulator model, common practice), and its
// input is the drive V_L less the drop across R_s of the load current and
// the quiescent current (Ohm's law), so the output is
// (V_L − R_s·I_q − V_do)/(1 + R_s/R_L). With 4.5 V to 6 V behind 0.2 Ω, a
// 1.5 V dropout and 3.3 V set, the middle (5.25 V) regulates and the bottom
// falls into dropout, which the finding names; from 5 V to 6 V it
// regulates throughout (near miss).
func TestDriveRangeDropout(t *testing.T) {
	const vl, rs, iq, vdo, rl = 4.5, 0.2, 50e-6, 1.5, 33.0
	src := func(lo string) string {
		return "ground gnd\nport vin " + lo + " to 6 V series 0.2 Ω\nregulator U1 (in=vin, out=v3, common=gnd) 3.3 V dropout 1.5 V quiescent 50 µA rated 500 mA, 2 W\nresistor RL (v3, gnd) 33 Ω rated 1 W\n"
	}
	res, err := Source("t.nodal", []byte(src("4.5 V")), nil)
	if err != nil {
		t.Fatal(err)
	}
	want := fmt.Sprintf("falls to %.2f V", (vl-rs*iq-vdo)/(1+rs/rl))
	found := false
	for _, f := range res.Diags {
		if f.Rule == "dropout" {
			found = strings.Contains(f.Message, "port vin at 4.50 V (bottom of its range)") && strings.Contains(f.Message, want)
			if !found {
				t.Errorf("dropout: %q, want the bottom of the range named and %q", f.Message, want)
			}
		}
	}
	if !found {
		t.Errorf("4.5 V to 6 V: findings %v, want dropout at the bottom of the range", driveRules(res))
	}
	res, err = Source("t.nodal", []byte(src("5 V")), nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Diags) > 0 {
		t.Errorf("5 V to 6 V: findings %v, want none", driveRules(res))
	}
}
