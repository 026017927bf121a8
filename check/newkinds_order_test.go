package check

import (
	"math"
	"math/rand/v2"
	"sort"
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

// TestSupplyAcrossShortIsOrderFree: a regulator whose input and common are
// tied by a wire has exactly 0 V between them (Kirchhoff's voltage law
// around the wire), in every statement order, though the two nets' solved
// voltages may differ in their last bit depending on the order the shorts
// were joined in. Found by TestStatementOrderDoesNotMatter: one order said
// "0 V above common", the other "0.00 pV", and the report gave an
// efficiency of −1.8e17 % for a regulator driven backwards.
func TestSupplyAcrossShortIsOrderFree(t *testing.T) {
	lines := []string{
		"source V2 (n1, gnd) 5 V rated 1 A",
		"regulator U7 (n4, gnd, n3) 1.8 V dropout 300 mV quiescent 1 mA limit 1 A rated 100 mA, 2 W",
		"resistor R2 (n3, gnd) 1 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 10 Ω rated 100 mW",
		"resistor R4 (n5, n1) 10 Ω rated 100 mW",
		"wire W5 (n3, n5) rated 100 mA",
		"wire W6 (n4, n3) rated 100 mA",
		"source V1 (n1, gnd) 5 V rated 10 mA",
		"resistor R1 (n2, gnd) 1 Ω rated 100 mW",
	}
	var first string
	inOrders(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6, 7, 8}, {0, 8, 2, 3, 4, 5, 6, 1, 7}}, 20, 3, func(n int, _ string, res *Result) {
		var msg string
		for _, f := range res.Diags {
			if f.Rule == "dropout" {
				msg = f.Message
			}
		}
		if !strings.Contains(msg, "its input is 0 V above common") {
			t.Fatalf("order %d: dropout finding %q, want the input 0 V above common", n, msg)
		}
		if first == "" {
			first = msg
		} else if msg != first {
			t.Fatalf("order %d: %q, first order %q", n, msg, first)
		}
	})
}

// TestCurrentSourceIntoSupplyCertified: a current source that feeds a
// voltage source directly, beside resistors that carry nothing (their
// ends at one voltage, or a net with one pin), is solved exactly — the
// supply takes the source's 10 mA (Kirchhoff's current law at n1) — and
// certified in every statement order. Found by
// TestStatementOrderDoesNotMatter: the certification floor was scaled by
// the largest current through a conductance, here only rounding noise, so
// one order was certified and the other said it could not be.
func TestCurrentSourceIntoSupplyCertified(t *testing.T) {
	lines := []string{
		"resistor R1 (n2, n1) 1 Ω rated 100 mW",
		"resistor R2 (n3, n2) 1 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 1 Ω rated 100 mW",
		"resistor R4 (n5, gnd) 1 Ω rated 100 mW",
		"resistor R5 (n6, gnd) 1 Ω rated 100 mW",
		"resistor R6 (n1, n2) 4.7 kΩ rated 100 mW",
		"source I7 (gnd, n1) 10 mA",
		"source V1 (n1, gnd) 5 V rated 20 mA",
	}
	inOrders(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6, 7}, {1, 0, 2, 3, 4, 5, 6, 7}}, 30, 5, func(n int, src string, res *Result) {
		d, v, i := opOf(t, src)
		if op := res.Solved.OP; op == nil {
			t.Fatalf("order %d: not solved", n)
		} else {
			for k, u := range op.Uncertified {
				if u {
					t.Fatalf("order %d: %s not certified", n, d.PartName(circuit.PartID(k)))
				}
			}
		}
		for k := range d.Parts {
			if d.PartName(circuit.PartID(k)) == "V1" && (math.Abs(math.Abs(i[k])-10e-3) > 1e-12*10e-3 || math.Abs(v[k]-5) > 1e-12*5) {
				t.Fatalf("order %d: V1 at %.17g V, %.17g A; want 5 V and 10 mA", n, v[k], i[k])
			}
		}
	})
}

// TestShortedConverterInputOrderFree: a converter whose input is tied to
// its common by a wire has 0 V across its input (Kirchhoff's voltage law
// around the wire) and cannot draw the 12.8 W its output needs (3.3 V
// into 1 Ω, over 85 %: energy balance), in every statement order. Found by
// TestStatementOrderDoesNotMatter: in one order the two nets' voltages,
// reached through a 1.8 V regulator output and back, differed by rounding,
// the converter drew its power as an enormous current across that
// rounding, and the check reported the draws not settling instead.
func TestShortedConverterInputOrderFree(t *testing.T) {
	lines := []string{
		"resistor R1 (n2, gnd) 1 Ω rated 100 mW",
		"resistor R2 (n3, gnd) 1 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 1 Ω rated 100 mW",
		"resistor R4 (n5, gnd) 1 Ω rated 100 mW",
		"regulator U5 (gnd, n2, n3) 1.8 V dropout 300 mV quiescent 1 mA limit 1 A rated 100 mA, 2 W",
		"wire W6 (gnd, n2) rated 100 mA",
		"converter U7 (gnd, n4, n2) 3.3 V efficiency 85% input 4 V to 16 V quiescent 50 µA rated 100 mA",
		"source V1 (n1, gnd) 5 V rated 10 mA",
	}
	inOrders(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6, 7}, {3, 1, 2, 6, 4, 5, 0, 7}}, 30, 7, func(n int, _ string, res *Result) {
		found := false
		for _, f := range res.Diags {
			if f.Rule == "no-convergence" {
				t.Fatalf("order %d: %s", n, f.Message)
			}
			if f.Rule == "starved-load" && strings.Contains(f.Message, "U7's input demands 12.8 W") {
				found = true
			}
		}
		if !found {
			t.Fatalf("order %d: no starved-load finding for U7: %v", n, res.Diags)
		}
	})
}

// TestDrawsSettleToTheSolvesAccuracy: a converter drawing 305 µW for a
// 100 kΩ load, its input below its common (a regulator in dropout holds
// it there), gives the same finding in every statement order. Found by
// TestStatementOrderDoesNotMatter: the draws were required to reproduce
// themselves to 1e-13, tighter than the solve's certified 1e-10, and in
// one order the draw swung between two values 7e-13 apart and the check
// said it did not settle.
func TestDrawsSettleToTheSolvesAccuracy(t *testing.T) {
	lines := []string{
		"resistor R1 (n2, gnd) 10 Ω rated 100 mW",
		"resistor R2 (n3, gnd) 1 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 100 kΩ rated 100 mW",
		"resistor R4 (n5, gnd) 1 Ω rated 100 mW",
		"resistor R5 (n6, n1) 1 Ω rated 100 mW",
		"regulator U6 (gnd, n5, n1) 5 V dropout 300 mV quiescent 1 mA limit 1 A rated 100 mA, 2 W",
		"converter U7 (n5, n4, n2) 3.3 V efficiency 85% input 4 V to 16 V quiescent 50 µA rated 100 mA",
		"wire W8 (n2, n6) rated 500 mA",
		"source V1 (n1, gnd) 5 V rated 10 mA",
	}
	sameFindings(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6, 7, 8}, {2, 1, 0, 3, 4, 5, 6, 7, 8}}, 30, 9, func(n int, s string) {
		if strings.Contains(s, "no-convergence") {
			t.Fatalf("order %d:\n%s", n, s)
		}
	})
}

// TestBackfedConverterStarvedInputOrderFree: a converter whose output a
// 5 V source holds above its 3.3 V through 1 Ω is back-fed (it delivers
// nothing), and its 50 µA quiescent current through 100 kΩ from the same
// 5 V leaves its input at 0 V (Ohm's law: 50 µA × 100 kΩ = 5 V), below
// its 4 V to 16 V range, in every statement order. Found by
// TestStatementOrderDoesNotMatter: the input's voltage came out a
// rounding below 0 V in one order, and the solver called the input,
// asked then for no power at all, starved.
func TestBackfedConverterStarvedInputOrderFree(t *testing.T) {
	lines := []string{
		"resistor R1 (n2, n1) 100 kΩ rated 100 mW",
		"resistor R2 (n3, n2) 10 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 1 Ω rated 100 mW",
		"resistor R4 (n5, n2) 1 Ω rated 100 mW",
		"resistor R5 (n6, n1) 1 Ω rated 100 mW",
		"converter U6 (n2, n6, gnd) 3.3 V efficiency 85% input 4 V to 16 V quiescent 50 µA rated 100 mA",
		"source V1 (n1, gnd) 5 V rated 10 mA",
	}
	inOrders(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6}, {2, 1, 3, 0, 4, 5, 6}}, 30, 11, func(n int, _ string, res *Result) {
		rules := map[string]bool{}
		for _, f := range res.Diags {
			rules[f.Rule] = true
		}
		if rules["starved-load"] || !rules["input-range"] || !rules["back-fed"] {
			t.Fatalf("order %d: want input-range and back-fed, no starved-load: %v", n, res.Diags)
		}
	})
}

// TestStarvedInputAtZeroOrderFree: converter U6's input (n2 to its common
// n1) sits across R1 with U4's output wired back to its input, so the
// rail offers it 0 V (Kirchhoff's voltage law around the wire) and it is
// starved; the message gives that 0 V alike in every statement order.
// Found by TestStatementOrderDoesNotMatter: the Thévenin voltage, a sum of
// terms that cancel, came out as a few pV in one order.
func TestStarvedInputAtZeroOrderFree(t *testing.T) {
	lines := []string{
		"resistor R1 (n2, n1) 1 Ω rated 100 mW",
		"resistor R2 (n3, n2) 1 Ω rated 100 mW",
		"resistor R3 (n4, gnd) 1 Ω rated 100 mW",
		"converter U4 (n1, n3, n2) 3.3 V efficiency 85% input 4 V to 16 V quiescent 50 µA rated 100 mA",
		"wire W5 (n1, n3) rated 100 mA",
		"converter U6 (n2, n4, n1) 3.3 V efficiency 85% input 4 V to 16 V quiescent 50 µA rated 100 mA",
		"source V1 (n1, gnd) 5 V rated 10 mA",
	}
	sameFindings(t, lines, [][]int{{0, 1, 2, 3, 4, 5, 6}, {1, 2, 0, 3, 4, 5, 6}}, 30, 13, func(n int, s string) {
		if !strings.Contains(s, "starved-load: converter U6's input") {
			t.Fatalf("order %d: no starved-load finding for U6:\n%s", n, s)
		}
	})
}

// sameFindings checks the design of lines in inOrders' orders, hands
// judge each order's findings ("rule: message" lines, sorted: findings
// come in line order, which the order of statements moves), and fails
// unless every order gives the first order's.
func sameFindings(t *testing.T, lines []string, given [][]int, n int, seed uint64, judge func(order int, findings string)) {
	t.Helper()
	var first string
	inOrders(t, lines, given, n, seed, func(k int, _ string, res *Result) {
		var got []string
		for _, f := range res.Diags {
			got = append(got, f.Rule+": "+f.Message)
		}
		sort.Strings(got)
		s := strings.Join(got, "\n")
		judge(k, s)
		if k == 0 {
			first = s
		} else if s != first {
			t.Fatalf("order %d:\n%s\nfirst order:\n%s", k, s, first)
		}
	})
}

// inOrders checks the design of lines, after "ground gnd", in the orders
// given (each a permutation of the lines' indices) and in n more random
// ones drawn from seed, and hands each order's number, source and result
// to judge.
func inOrders(t *testing.T, lines []string, given [][]int, n int, seed uint64, judge func(order int, src string, res *Result)) {
	t.Helper()
	orders := append([][]int(nil), given...)
	rng := rand.New(rand.NewPCG(seed, seed+1))
	for k := 0; k < n; k++ {
		orders = append(orders, rng.Perm(len(lines)))
	}
	for i, o := range orders {
		perm := make([]string, len(o))
		for k, j := range o {
			perm[k] = lines[j]
		}
		src := "ground gnd\n" + strings.Join(perm, "\n") + "\n"
		res, err := Source("t.nodal", []byte(src), nil)
		if err != nil {
			t.Fatal(err)
		}
		judge(i, src, res)
	}
}
