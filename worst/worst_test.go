package worst

import (
	"math"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"nodal/circuit"
	"nodal/solve"
)

// design builds a design from parts; nets are named as given, "gnd" is the
// ground.
type builder struct{ d *circuit.Design }

func newBuilder() *builder {
	d := circuit.NewDesign("t")
	d.Ground = d.Net("gnd", 0, 0)
	return &builder{d}
}

func (b *builder) add(k circuit.Kind, name, a, c string, v, tol float64) circuit.PartID {
	return b.d.AddPart(circuit.Part{Kind: k, Local: name, Pins: [circuit.MaxPins]circuit.NetID{b.d.Net(a, 0, 0), b.d.Net(c, 0, 0)}, Value: v, Tol: tol, Inst: -1})
}

func analyze(t *testing.T, d *circuit.Design, amb Ambient, j Judge, opt Options) *Result {
	t.Helper()
	r, err := solve.Solve(d.AtTemperature(amb.Nominal), &solve.Options{Temperature: 273.15 + amb.Nominal})
	if err != nil {
		t.Fatal(err)
	}
	res, err := Analyze(d, r, amb, j, opt)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

var room = Ambient{25, 25, 25}

// TestDividerRange checks a divider's output range against its closed
// form (algebra, re-computed in the reference sheet): V·Rb/(Rt + Rb) rises
// with V and Rb and falls with Rt, so 12 V ±2 %, Rt = 10 kΩ ±1 %,
// Rb = 4.7 kΩ ±1 % give 3.70903 … 3.96691 V.
func TestDividerRange(t *testing.T) {
	b := newBuilder()
	b.add(circuit.VoltageSource, "V1", "in", "gnd", 12, 0.02)
	b.add(circuit.Resistor, "RT", "in", "out", 10e3, 0.01)
	b.add(circuit.Resistor, "RB", "out", "gnd", 4.7e3, 0.01)
	out := b.d.LookupNet("out")
	lo := 12 * 0.98 * 4.7e3 * 0.99 / (10e3*1.01 + 4.7e3*0.99)
	hi := 12 * 1.02 * 4.7e3 * 1.01 / (10e3*0.99 + 4.7e3*1.01)
	if math.Abs(lo-3.70903) > 0.5e-5 || math.Abs(hi-3.96691) > 0.5e-5 {
		t.Fatalf("closed form %.5f … %.5f", lo, hi)
	}
	none := func(circuit.PartID, float64, float64, float64, float64) []float64 { return nil }
	// Every corner: exact.
	res := analyze(t, b.d, room, none, Options{})
	if !res.Corners || math.Abs(res.NetLow[out]-lo) > 1e-9 || math.Abs(res.NetHigh[out]-hi) > 1e-9 {
		t.Errorf("corners: %.9f … %.9f V, want %.9f … %.9f V", res.NetLow[out], res.NetHigh[out], lo, hi)
	}
	// First order: the second-order terms of 1 % and 2 % tolerances are
	// below 0.05 % of the output.
	res = analyze(t, b.d, room, none, Options{MaxCorners: -1})
	if res.Corners || math.Abs(res.NetLow[out]-lo) > 5e-4*lo || math.Abs(res.NetHigh[out]-hi) > 5e-4*hi {
		t.Errorf("first order: %.6f … %.6f V, want about %.6f … %.6f V", res.NetLow[out], res.NetHigh[out], lo, hi)
	}
}

// powerJudge judges every resistor's power against 1 W.
func powerJudge(d *circuit.Design) Judge {
	return func(i circuit.PartID, v, c, p, t float64) []float64 {
		if d.Parts[i].Kind != circuit.Resistor {
			return nil
		}
		return []float64{math.Abs(p)}
	}
}

// TestInteriorMaximum checks the maximum power transfer theorem (any
// circuit-theory text): a load RL fed from (Vs, Rs) absorbs Vs²·RL/(Rs +
// RL)², most at RL = Rs. With 10 V, Rs = 50 Ω ±1 %, RL = 50 Ω ±20 % every
// corner gives less than the maximum 0.505051 W, reached at Rs = RL =
// 49.5 Ω (reference sheet).
func TestInteriorMaximum(t *testing.T) {
	b := newBuilder()
	b.add(circuit.VoltageSource, "VS", "in", "gnd", 10, 0)
	b.add(circuit.Resistor, "RS", "in", "out", 50, 0.01)
	rl := b.add(circuit.Resistor, "RL", "out", "gnd", 50, 0.20)
	want := 100 / (4 * 49.5)
	for _, opt := range []Options{{}, {MaxCorners: -1}} {
		res := analyze(t, b.d, room, powerJudge(b.d), opt)
		w := res.Worst[rl][0]
		if !w.Confirmed || math.Abs(w.Frac-want) > 1e-6*want {
			t.Errorf("corners %v: RL's worst power %.6f W, want %.6f W", res.Corners, w.Frac, want)
		}
		if rlAt := 50 * (1 + w.At.S[1]*0.2); math.Abs(rlAt-49.5) > 0.05 {
			t.Errorf("found at RL = %.3f Ω, want 49.5 Ω", rlAt)
		}
	}
	// Every corner alone stays below the maximum: the search is needed.
	best := 0.0
	for _, s := range [][2]float64{{-1, -1}, {-1, 1}, {1, -1}, {1, 1}} {
		rs, rl := 50*(1+0.01*s[0]), 50*(1+0.2*s[1])
		best = math.Max(best, 100*rl/((rs+rl)*(rs+rl)))
	}
	if !(best < want*(1-1e-3)) {
		t.Errorf("corners reach %.6f W, the maximum is %.6f W", best, want)
	}
}

// TestSensitivityMatchesCorners is a property test: on random small
// resistive designs with toleranced sources and resistors, the worst
// voltage and current of every part found from sensitivities (confirmed
// at the chosen corner) is never above the largest over every corner,
// which is where the maximum of a quantity monotone in each parameter lies
// (each is a ratio of affine functions of any one resistor, or linear in
// any one source, by Cramer's rule), and falls short of it by no more than
// the second-order terms the first-order choice of corner cannot see (a
// bridge balanced at nominal). Those terms are products of two
// parameters' deviations: Σ tol times the first-order change, that is
// Σ tol · (every corner − nominal) (Taylor's theorem), which is (Σ tol)²
// of the quantity where it does not nearly cancel at nominal and more
// where it does (a voltage that passes through 0 V inside the box). A
// wrong end for any parameter would cost a first-order 2·tol·|∂q/∂p|.
func TestSensitivityMatchesCorners(t *testing.T) {
	rapid.Check(t, func(rt *rapid.T) {
		b := newBuilder()
		nets := rapid.IntRange(2, 5).Draw(rt, "nets")
		name := func(i int) string {
			if i == 0 {
				return "gnd"
			}
			return string(rune('a' + i))
		}
		tol := func(label string) float64 {
			return float64(rapid.IntRange(0, 10).Draw(rt, label)) / 100
		}
		b.add(circuit.VoltageSource, "V1", name(1), "gnd", rapid.Float64Range(1, 24).Draw(rt, "v"), tol("vtol"))
		// A resistor chain keeps every net connected to ground.
		for i := 1; i < nets; i++ {
			b.add(circuit.Resistor, "RC"+name(i), name(i), name(i+1-boolInt(i+1 >= nets)*(i+1)), rapid.Float64Range(10, 1e4).Draw(rt, "r"), tol("rtol"))
		}
		extra := rapid.IntRange(0, 4).Draw(rt, "extra")
		for e := 0; e < extra; e++ {
			x, y := rapid.IntRange(0, nets-1).Draw(rt, "x"), rapid.IntRange(0, nets-1).Draw(rt, "y")
			if x == y {
				continue
			}
			b.add(circuit.Resistor, "RX"+string(rune('0'+e)), name(x), name(y), rapid.Float64Range(10, 1e4).Draw(rt, "r"), tol("rtol"))
		}
		if rapid.Bool().Draw(rt, "isrc") {
			b.add(circuit.CurrentSource, "I1", name(rapid.IntRange(2, nets).Draw(rt, "from")%nets), "gnd", rapid.Float64Range(1e-4, 1e-2).Draw(rt, "i"), tol("itol"))
		}
		d := b.d
		sum := 0.0
		for i := range d.Parts {
			sum += d.Parts[i].Tol
		}
		judge := func(i circuit.PartID, v, c, p, t float64) []float64 { return []float64{math.Abs(v), math.Abs(c)} }
		nom, err := solve.Solve(d, &solve.Options{Temperature: 273.15 + room.Nominal})
		if err != nil {
			rt.Fatal(err)
		}
		sens := analyze(t, d, room, judge, Options{MaxCorners: -1, ConfirmAbove: -1})
		all := analyze(t, d, room, judge, Options{})
		if sens == nil || all == nil {
			if sens != all {
				rt.Fatalf("with no tolerance: %v and %v", sens, all)
			}
			return
		}
		if !all.Corners {
			rt.Skip("too many parameters for every corner")
		}
		for i := range d.Parts {
			for m := range all.Worst[i] {
				s, e := sens.Worst[i][m].Frac, all.Worst[i][m].Frac
				f0 := judge(circuit.PartID(i), nom.V[i], nom.I[i], nom.P[i], room.Nominal)[m]
				if !sens.Worst[i][m].Confirmed || s < e-sum*(e-f0)-1e-15 || s > e*(1+1e-9)+1e-15 {
					rt.Fatalf("%s quantity %d: sensitivities %.12g (confirmed %v), every corner %.12g, nominal %.12g", d.Parts[i].Local, m, s, sens.Worst[i][m].Confirmed, e, f0)
				}
			}
		}
	})
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// TestTemperatureRangeMatchesCorners is TestSensitivityMatchesCorners with
// an ambient temperature range and resistors with a tempco: every corner
// (each temperature end included) is the reference, and the sensitivity
// method's worst never passes it nor falls short of it by more than the
// second-order terms.
func TestTemperatureRangeMatchesCorners(t *testing.T) {
	rapid.Check(t, func(rt *rapid.T) {
		b := newBuilder()
		b.add(circuit.VoltageSource, "V1", "a", "gnd", rapid.Float64Range(1, 24).Draw(rt, "v"), 0.02)
		sum := 0.02
		for _, pair := range [][2]string{{"a", "b"}, {"b", "gnd"}, {"b", "c"}, {"c", "gnd"}} {
			id := b.add(circuit.Resistor, "R"+pair[0]+pair[1], pair[0], pair[1], rapid.Float64Range(10, 1e4).Draw(rt, "r"), 0.01)
			sum += 0.01
			tc := float64(rapid.IntRange(-500, 500).Draw(rt, "tempco")) * 1e-6
			b.d.Parts[id].Heat = &circuit.Thermal{Tempco: tc}
			sum += math.Abs(tc) * 60 // the temperature range's relative swing
		}
		amb := Ambient{Low: -10, High: 50, Nominal: 25}
		judge := func(i circuit.PartID, v, c, p, t float64) []float64 { return []float64{math.Abs(v), math.Abs(c)} }
		sens := analyze(t, b.d, amb, judge, Options{MaxCorners: -1, ConfirmAbove: -1})
		all := analyze(t, b.d, amb, judge, Options{})
		if !all.Corners || !all.RangeT {
			rt.Fatalf("every corner was not solved")
		}
		for i := range b.d.Parts {
			for m := range all.Worst[i] {
				s, e := sens.Worst[i][m].Frac, all.Worst[i][m].Frac
				if s < e*(1-sum*sum)-1e-15 || s > e*(1+1e-9)+1e-15 {
					rt.Fatalf("%s quantity %d: sensitivities %.12g, every corner %.12g", b.d.Parts[i].Local, m, s, e)
				}
			}
		}
	})
}

// TestPowerLoadFirstOrder checks the linearisation of a constant-power
// load against the derivatives of its closed form. Fed through R from Vs,
// a load drawing P sits at V = (Vs + √(Vs² − 4PR))/2 (Ohm's law with
// I = P/V, the upper root), so ∂V/∂Vs = (1 + Vs/√(Vs² − 4PR))/2 and
// ∂V/∂P = −R/√(Vs² − 4PR); first order, the range of V over Vs ± tV and
// P ± tP is V ± (∂V/∂Vs·Vs·tV + |∂V/∂P|·P·tP). Without the load's slope
// −P/V² in the linearised equations the source's share comes out wrong.
func TestPowerLoadFirstOrder(t *testing.T) {
	const vs, r, p, tv, tp = 10.0, 100.0, 0.2, 0.05, 0.1
	b := newBuilder()
	b.add(circuit.VoltageSource, "V1", "in", "gnd", vs, tv)
	b.add(circuit.Resistor, "R1", "in", "out", r, 0)
	b.add(circuit.PowerLoad, "L1", "out", "gnd", p, tp)
	root := math.Sqrt(vs*vs - 4*p*r)
	v0 := (vs + root) / 2
	half := (1+vs/root)/2*vs*tv + r/root*p*tp
	none := func(circuit.PartID, float64, float64, float64, float64) []float64 { return nil }
	res := analyze(t, b.d, room, none, Options{MaxCorners: -1})
	out := b.d.LookupNet("out")
	if res.Corners || math.Abs(res.NetLow[out]-(v0-half)) > 1e-9*v0 || math.Abs(res.NetHigh[out]-(v0+half)) > 1e-9*v0 {
		t.Errorf("first order: %.12g … %.12g V, the closed form's derivatives give %.12g … %.12g V", res.NetLow[out], res.NetHigh[out], v0-half, v0+half)
	}
}

// TestWorkBudgetReadsTheRealFill checks the work bound against the
// factor's real fill, not the n(n+1)/2 entries a full factor of n unknowns
// could have: a series string of toleranced resistors fills in hardly at
// all, so a budget between the two is judged, and one below the real work
// is skipped with the reason.
func TestWorkBudgetReadsTheRealFill(t *testing.T) {
	b := newBuilder()
	const n = 40
	b.add(circuit.VoltageSource, "V1", "n0", "gnd", 12, 0.02)
	for i := 0; i < n; i++ {
		to := "gnd"
		if i < n-1 {
			to = "n" + string(rune('A'+i/26)) + string(rune('a'+i%26))
		}
		from := "n0"
		if i > 0 {
			from = "n" + string(rune('A'+(i-1)/26)) + string(rune('a'+(i-1)%26))
		}
		b.add(circuit.Resistor, "R"+string(rune('A'+i/26))+string(rune('a'+i%26)), from, to, 1e3, 0.01)
	}
	none := func(circuit.PartID, float64, float64, float64, float64) []float64 { return nil }
	// 41 parameters on 41 unknowns: a full factor would make the work
	// about 1.4e5 operations, the chain's about 2e4.
	res := analyze(t, b.d, room, none, Options{MaxCorners: -1, MaxWork: 6e4})
	if res == nil || res.Corners || len(res.NetLow) == 0 {
		t.Fatalf("a budget above the chain's real work was not judged: %+v", res)
	}
	r, err := solve.Solve(b.d, &solve.Options{})
	if err != nil {
		t.Fatal(err)
	}
	_, err = Analyze(b.d, r, room, none, Options{MaxCorners: -1, MaxWork: 5e3})
	if s, ok := err.(*Skipped); !ok || !strings.Contains(s.Reason, "more work than") {
		t.Fatalf("a budget below the chain's real work gave %v, not the work it skips", err)
	}
}

// TestEveryCornerKeepsItsLargest: with every corner solved, a part's worst
// use is the largest over the corners, each corner solved here on its own
// as the reference (the definition of the worst case over the box). Found
// by TestSensitivityMatchesCorners: the solve at a first-order estimate's
// own corner, lower than the estimate, replaced it, and with it a larger
// value solved at another corner while the estimate was held.
func TestEveryCornerKeepsItsLargest(t *testing.T) {
	b := newBuilder()
	b.add(circuit.VoltageSource, "V1", "b", "gnd", 1.25, 0)
	b.add(circuit.Resistor, "RCb", "b", "c", 104.75, 0)
	b.add(circuit.Resistor, "RCc", "c", "d", 10, 0)
	b.add(circuit.Resistor, "RCd", "d", "e", 10, 0)
	rce := b.add(circuit.Resistor, "RCe", "e", "gnd", 10.96875, 0)
	toled := []circuit.PartID{
		b.add(circuit.Resistor, "RX0", "gnd", "e", 11.984375, 0.01),
		b.add(circuit.Resistor, "RX1", "c", "d", 10, 0.01),
		b.add(circuit.CurrentSource, "I1", "c", "gnd", 0.0087890625, 0.01),
	}
	b.add(circuit.Resistor, "RX2", "b", "e", 16, 0)
	d := b.d
	judge := func(i circuit.PartID, v, c, p, t float64) []float64 { return []float64{math.Abs(v), math.Abs(c)} }
	res := analyze(t, d, room, judge, Options{})
	if !res.Corners {
		t.Fatal("not every corner was solved")
	}
	want := 0.0
	for mask := 0; mask < 1<<len(toled); mask++ {
		dc := *d
		dc.Parts = append([]circuit.Part(nil), d.Parts...)
		for k, id := range toled {
			s := -1.0
			if mask&(1<<k) != 0 {
				s = 1
			}
			dc.Parts[id].Value *= 1 + s*dc.Parts[id].Tol
		}
		r, err := solve.Solve(&dc, &solve.Options{Temperature: 273.15 + room.Nominal})
		if err != nil {
			t.Fatal(err)
		}
		want = math.Max(want, math.Abs(r.V[rce]))
	}
	if got := res.Worst[rce][0].Frac; math.Abs(got-want) > 1e-12*want {
		t.Fatalf("RCe's worst |V| %.12g, the largest over every corner %.12g", got, want)
	}
}
