package check

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"nodal/circuit"
)

// TestPortDriveThevenin: a port driven by V behind a source resistance
// R_s is, by Thévenin's theorem, that voltage in series with R_s; feeding
// a divider R1 over R2 the tap sits at V·R2/(R_s + R1 + R2) and the drive
// delivers V/(R_s + R1 + R2) (voltage division, Ohm's law), to 1e-9. The
// absorbed powers of all parts sum to zero (Tellegen's theorem, Philips
// Res. Rep. 7, 259 (1952), from memory).
func TestPortDriveThevenin(t *testing.T) {
	for _, c := range []struct{ v, rs, r1, r2 float64 }{
		{9, 600, 4700, 2200},
		{3.3, 50, 10e3, 10e3},
		{24, 0.47, 33e3, 4.7e3},
	} {
		src := fmt.Sprintf("ground gnd\nport vin %g V series %g Ω\nresistor R1 (vin, tap) %g Ω\nresistor R2 (tap, gnd) %g Ω\n", c.v, c.rs, c.r1, c.r2)
		d, v, i := opOf(t, src)
		r2, drive := partIndex(t, d, "R2"), partIndex(t, d, "vin")
		total := c.rs + c.r1 + c.r2
		if want := c.v * c.r2 / total; rel(v[r2], want) > 1e-9 {
			t.Errorf("%g V behind %g Ω: tap at %.12g V, Thévenin gives %.12g V", c.v, c.rs, v[r2], want)
		}
		// The drive's current flows from ground up through it into vin,
		// so through the part (port to ground) it is negative.
		if want := c.v / total; rel(-i[drive], want) > 1e-9 {
			t.Errorf("%g V behind %g Ω delivers %.12g A, want %.12g A", c.v, c.rs, -i[drive], want)
		}
		if want := c.v * (c.r1 + c.r2) / total; rel(v[drive], want) > 1e-9 {
			t.Errorf("port vin at %.12g V, want %.12g V", v[drive], want)
		}
		assertTellegen(t, d, v, i)
	}
}

// TestPortDriveLikeBattery: a port's voltage drive is the same behaviour as
// a battery's EMF behind its internal resistance, so the two give the same
// numbers, and without series both are an ideal voltage.
func TestPortDriveLikeBattery(t *testing.T) {
	for _, series := range []string{" series 2.2 Ω", ""} {
		dp, vp, ip := opOf(t, "ground gnd\nport vin 5 V"+series+"\nresistor RL (vin, gnd) 47 Ω\n")
		db, vb, ib := opOf(t, "ground gnd\nbattery B (vin, gnd) 5 V"+series+"\nresistor RL (vin, gnd) 47 Ω\n")
		p, b := partIndex(t, dp, "RL"), partIndex(t, db, "RL")
		if vp[p] != vb[b] || ip[p] != ib[b] || vp[p] <= 0 {
			t.Errorf("series %q: load at %g V, %g A behind the port drive; %g V, %g A behind the battery", series, vp[p], ip[p], vb[b], ib[b])
		}
	}
}

// TestPortDriveCurrent: a port driven by a current I into a resistor R sits
// at I·R (Ohm's law), to 1e-9.
func TestPortDriveCurrent(t *testing.T) {
	for _, c := range []struct{ i, r float64 }{{2.5e-3, 1800}, {1e-6, 1e6}, {0.75, 3.3}} {
		src := fmt.Sprintf("ground gnd\nport sense %g A\nresistor R (sense, gnd) %g Ω\n", c.i, c.r)
		d, v, i := opOf(t, src)
		r := partIndex(t, d, "R")
		if want := c.i * c.r; rel(v[r], want) > 1e-9 {
			t.Errorf("%g A into %g Ω: %.12g V, Ohm's law gives %.12g V", c.i, c.r, v[r], want)
		}
		if rel(i[r], c.i) > 1e-9 {
			t.Errorf("%g A into %g Ω: R carries %.12g A", c.i, c.r, i[r])
		}
	}
}

// TestPortDriveFilteredInput: an input filtered by a capacitor to ground,
// with nothing else to ground, has no DC path while its port states no
// drive; with a drive it is solved and its parts rated: the capacitor
// sits at the drive's voltage (no DC current flows through R1), past its
// 4 V rating.
func TestPortDriveFilteredInput(t *testing.T) {
	body := "resistor R1 (vin, f) 10 kΩ rated 100 mW\ncapacitor C1 (f, gnd) 100 nF rated 4 V\n"
	res, err := Source("t.nodal", []byte("ground gnd\nport vin\n"+body), nil)
	if err != nil {
		t.Fatal(err)
	}
	if ids := driveRules(res); !slices.Contains(ids, "no-dc-path") || slices.Contains(ids, "over-voltage") {
		t.Errorf("undriven port: findings %v, want no-dc-path and no rating", ids)
	}
	res, err = Source("t.nodal", []byte("ground gnd\nport vin 5 V series 1 kΩ\n"+body), nil)
	if err != nil {
		t.Fatal(err)
	}
	ids := driveRules(res)
	if slices.Contains(ids, "no-dc-path") || !slices.Contains(ids, "over-voltage") {
		t.Fatalf("driven port: findings %v, want over-voltage on C1 and no no-dc-path", ids)
	}
	for _, f := range res.Diags {
		if f.Rule == "over-voltage" && !strings.Contains(f.Message, "C1") || f.Rule == "over-voltage" && !strings.Contains(f.Message, "5.00 V") {
			t.Errorf("over-voltage does not name C1 at 5.00 V: %s", f.Message)
		}
	}
}

// TestPortDriveErrors: a drive that cannot be placed gets a finding at the
// place to fix, and the design is not judged as if it were driven.
func TestPortDriveErrors(t *testing.T) {
	for _, c := range []struct{ src, rule, at, says string }{
		{"ground gnd\nport gnd 5 V\nresistor R (a, gnd) 1 kΩ\n", "bad-value", "2:6", "is the ground net"},
		{"port vin 5 V\nresistor R (vin, gnd) 1 kΩ\nground gnd\n", "", "", ""}, // ground may come later
		{"ground gnd\nport vin 5\nresistor R (vin, gnd) 1 kΩ\n", "unit-mismatch", "2:10", "write 5 V"},
		{"ground gnd\nport vin 5 V\nport vin\nresistor R (vin, gnd) 1 kΩ\n", "duplicate-name", "2:6", "also named on line 3"},
		{"ground gnd\nport vin\nport vin 5 mA\nresistor R (vin, gnd) 1 kΩ\n", "duplicate-name", "3:6", "also named on line 2"},
		{"resistor vin (vin, gnd) 1 kΩ\nground gnd\nport vin 5 V\n", "duplicate-name", "3:6", "the part on line 1 is named vin"},
		{"ground gnd\nport a, b 5 V\nresistor R (a, b) 1 kΩ\n", "syntax", "2:9", "belongs to one net"},
		{"ground gnd\nport vin series 50 Ω\nresistor R (vin, gnd) 1 kΩ\n", "missing-value", "2:10", "no drive"},
		{"ground gnd\nport vin 5 V tol 5%\nresistor R (vin, gnd) 1 kΩ\n", "bad-attribute", "2:14", "takes no tol"},
		{"ground gnd\nport vin 5 V rated 1 A\nresistor R (vin, gnd) 1 kΩ\n", "bad-attribute", "2:14", "takes no rating"},
		{"ground gnd\nport vin 2 mA series 50 Ω\nresistor R (vin, gnd) 1 kΩ\n", "bad-attribute", "2:15", "current drive takes no series"},
		{"ground gnd\nport vin 2 W\nresistor R (vin, gnd) 1 kΩ\n", "unit-mismatch", "2:10", "is a power"},
		{"port vin 5 V\n", "no-ground", "1:1", "no ground net"},
	} {
		res, err := Source("t.nodal", []byte(c.src), nil)
		if err != nil {
			t.Fatal(err)
		}
		if c.rule == "" {
			if len(res.Diags) > 0 || res.Solved == nil || res.Solved.OP == nil {
				t.Errorf("%q: findings %v, want none and an operating point", c.src, driveRules(res))
			}
			continue
		}
		wantRefused(t, c.src, res, c.rule, c.at, c.says, "could not be placed")
	}
}

// TestPortDriveOrderFree: the operating point of a design with port drives
// does not depend on the order of its statements (ground included).
func TestPortDriveOrderFree(t *testing.T) {
	lines := []string{
		"ground gnd",
		"port vin 12 V series 3.3 Ω",
		"port sense 1.5 mA",
		"port aux 5 V",
		"resistor R1 (vin, mid) 4.7 kΩ",
		"resistor R2 (mid, gnd) 2.2 kΩ",
		"resistor R3 (sense, mid) 10 kΩ",
		"resistor R4 (aux, mid) 22 kΩ",
		"capacitor C1 (mid, gnd) 1 µF",
		"diode D1 (mid, gnd) vf 0.7 V at 1 mA",
	}
	var want map[string][2]float64
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 8; trial++ {
		perm := append([]string(nil), lines...)
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		d, v, i := opOf(t, strings.Join(perm, "\n")+"\n")
		got := map[string][2]float64{}
		for k := range d.Parts {
			got[d.Parts[k].Kind.String()+" "+d.PartName(circuit.PartID(k))] = [2]float64{v[k], i[k]}
		}
		if want == nil {
			want = got
			continue
		}
		for name, w := range want {
			g := got[name]
			if math.Abs(g[0]-w[0]) > 1e-9*math.Max(math.Abs(w[0]), 1) || math.Abs(g[1]-w[1]) > 1e-9*math.Max(math.Abs(w[1]), 1e-3) {
				t.Errorf("order %d: %s at %v, first order %v", trial, name, g, w)
			}
		}
	}
}

// driveRules returns the rule ids of the findings, in order.
func driveRules(res *Result) []string {
	var ids []string
	for _, d := range res.Diags {
		ids = append(ids, d.Rule)
	}
	return ids
}

// TestPortDriveWorstCase: behind a port's voltage drive, a divider with a
// toleranced top resistor spans V·R2/(R_s + R1·(1 ± t) + R2) at the tap
// (voltage division at the two ends of R1's band; the tap voltage falls
// monotonically as R1 grows), to 1e-9. And a filtered input behind a
// drive is judged over its tolerances too: the worst-case analysis stamps
// the drive's source resistance as the solve does, where without it the
// input's net would have nothing in its linearised equations
// (corners-not-judged).
func TestPortDriveWorstCase(t *testing.T) {
	filtered := "ground gnd\nport vin 1.6 V series 2.2 kΩ\nresistor R1 (vin, adc) 10 kΩ tol 1% rated 63 mW\ncapacitor C1 (adc, gnd) 470 nF rated 6.3 V\n"
	if res, err := Source("t.nodal", []byte(filtered), nil); err != nil || len(res.Diags) > 0 || res.Worst == nil || res.Worst.R == nil {
		t.Fatalf("filtered input: %v, findings %v", err, driveRules(res))
	}
	const v, rs, r1, r2, tol = 10.0, 1e3, 1e3, 2e3, 0.05
	src := "ground gnd\nport vin 10 V series 1 kΩ\nresistor R1 (vin, tap) 1 kΩ tol 5%\nresistor R2 (tap, gnd) 2 kΩ\n"
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Diags) > 0 || res.Worst == nil || res.Worst.R == nil {
		t.Fatalf("findings %v, worst case %v", driveRules(res), res.Worst)
	}
	tap := -1
	for i, n := range res.Build.Design.Nets {
		if n.Inst < 0 && n.Local == "tap" {
			tap = i
		}
	}
	lo, hi := res.Worst.R.NetLow[tap], res.Worst.R.NetHigh[tap]
	wantLo, wantHi := v*r2/(rs+r1*(1+tol)+r2), v*r2/(rs+r1*(1-tol)+r2)
	if rel(lo, wantLo) > 1e-9 || rel(hi, wantHi) > 1e-9 {
		t.Errorf("tap spans %.12g … %.12g V, voltage division gives %.12g … %.12g V", lo, hi, wantLo, wantHi)
	}
}

// wantRefused checks that the design src gave a finding of rule at at
// (line:column) whose message says says, and was not judged (why says
// what became of its drive).
func wantRefused(t *testing.T, src string, res *Result, rule, at, says, why string) {
	t.Helper()
	found := false
	for _, f := range res.Diags {
		if f.Rule == rule {
			found = true
			pos := res.Fset.Position(f.Pos)
			if got := fmt.Sprintf("%d:%d", pos.Line, pos.Column); got != at || !strings.Contains(f.Message, says) {
				t.Errorf("%q: %s at %s %q, want at %s saying %q", src, f.Rule, got, f.Message, at, says)
			}
		}
	}
	if !found {
		t.Errorf("%q: findings %v, want %s", src, driveRules(res), rule)
	}
	if res.Solved != nil && res.Solved.OP != nil {
		t.Errorf("%q: judged although its drive %s", src, why)
	}
}
