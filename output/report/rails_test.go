package report_test

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand"
	"strings"
	"testing"

	"nodal/check"
	"nodal/output/report"
	"nodal/rules"
)

// tableOf solves src and returns its report table.
func tableOf(t *testing.T, src string) *report.Table {
	t.Helper()
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("no operating point: %v %v", err, res.Diags)
	}
	return report.NewAt("t.nodal", res.Build.Design, res.Solved.OP, rules.Derating{}, res.Solved.Ambient)
}

// eachSupply calls f for every supply in the tree, depth first.
func eachSupply(ss []*report.Supply, f func(*report.Supply)) {
	for _, s := range ss {
		f(s)
		eachSupply(s.Feeds, f)
	}
}

// threeRails has a battery, a bench source and a port's drive, each with
// its own rail and loads across it, and an LED behind a resistor (a part
// on no rail).
const threeRails = `ground gnd
port vext 12 V series 2 Ω
battery   BAT  (pos=vbat, neg=gnd) 7.4 V series 150 mΩ rated 2 A
source    PSU  (v5, gnd)  5 V rated 1 A
load      RADIO (vbat, gnd) 1.5 W rated 12 V
load      CLK   (vbat, gnd) 3 mA
resistor  RH    (vbat, gnd) 47 Ω rated 2 W
load      MCU   (v5, gnd) 400 mW rated 6 V
resistor  RL    (v5, led) 150 Ω rated 250 mW
led       D1    (led, gnd) vf 2.0 V at 20 mA rated 30 mA
load      HEAT  (vext, gnd) 250 mA
resistor  RX    (vext, gnd) 1 kΩ rated 500 mW
`

// TestRailsEnergyBalance: at every rail the currents the parts under it
// take add up to what its supply delivers (Kirchhoff's current law); for
// parts across the rail their powers add up to the power it delivers, and
// over the whole design the supplies deliver what every other part absorbs
// (Tellegen's theorem: Σ vₖ·iₖ = 0, Philips Res. Rep. 7, 259 (1952), from
// memory); each supply takes what it delivers plus what it loses (energy
// balance). All to 1e-9.
func TestRailsEnergyBalance(t *testing.T) {
	tab := tableOf(t, threeRails)
	if len(tab.Rails) != 3 {
		t.Fatalf("%d roots, want BAT, PSU and vext", len(tab.Rails))
	}
	delivered := 0.0
	eachSupply(tab.Rails, func(s *report.Supply) {
		f := s.Flow
		if !s.Judged || f.CurrentUnknown || f.VoltageUnknown {
			t.Fatalf("%s not judged", s.Name)
		}
		sumI, sumP, across := 0.0, 0.0, true
		for _, l := range s.Loads {
			sumI += l.Current
			sumP += l.Power
			across = across && len(l.Towards) == 0
		}
		if math.Abs(sumI-f.IOut) > 1e-9*f.IOut {
			t.Errorf("%s: its parts take %.12g A, it delivers %.12g A (KCL)", s.Name, sumI, f.IOut)
		}
		if across && math.Abs(sumP-f.POut) > 1e-9*f.POut {
			t.Errorf("%s: its parts absorb %.12g W, it delivers %.12g W (Tellegen)", s.Name, sumP, f.POut)
		}
		if math.Abs(f.Taken-f.POut-f.Loss) > 1e-12 || f.Loss < 0 {
			t.Errorf("%s: takes %g W, delivers %g W, loses %g W", s.Name, f.Taken, f.POut, f.Loss)
		}
		delivered += f.POut
	})
	absorbed := 0.0
	for _, p := range tab.Parts {
		if p.Kind.Info().Supply == nil {
			absorbed += p.Power
		}
	}
	if math.Abs(absorbed-delivered) > 1e-9*delivered {
		t.Errorf("supplies deliver %.12g W, the other parts absorb %.12g W (Tellegen)", delivered, absorbed)
	}
	// D1 is reached through RL, and takes what RL passes on (KCL at led).
	if tab.OffRail != 0 {
		t.Errorf("%d parts not in the tree, want none", tab.OffRail)
	}
	eachSupply(tab.Rails, func(s *report.Supply) {
		for _, l := range s.Loads {
			if l.Name == "RL" && (l.Net != "led" || len(l.Loads) != 1 || l.Loads[0].Name != "D1" || math.Abs(l.Loads[0].Current-l.Current) > 1e-15) {
				t.Errorf("RL leads to %q, feeding %+v", l.Net, l.Loads)
			}
		}
	})
	// The battery's loss is I²·R in its 150 mΩ (Joule's law).
	eachSupply(tab.Rails, func(s *report.Supply) {
		if s.Name == "BAT" && math.Abs(s.Flow.Loss-s.Flow.IOut*s.Flow.IOut*0.15) > 1e-12 {
			t.Errorf("BAT loses %g W, I²R = %g W", s.Flow.Loss, s.Flow.IOut*s.Flow.IOut*0.15)
		}
	})
}

// TestRailsWorstFirstAnyOrder: parts under a rail come worst use of a
// rating first, unrated last, ties by name; the tree, text and JSON do not
// depend on the order of statements.
func TestRailsWorstFirstAnyOrder(t *testing.T) {
	tab := tableOf(t, threeRails)
	var bat *report.Supply
	eachSupply(tab.Rails, func(s *report.Supply) {
		if s.Name == "BAT" {
			bat = s
		}
	})
	var names []string
	for _, l := range bat.Loads {
		names = append(names, l.Name)
	}
	// RADIO uses 7.3 V of its 12 V rating (61 %); RH dissipates
	// 7.3²/47 ≈ 1.13 W of 2 W (57 %); CLK is unrated.
	if got := strings.Join(names, " "); got != "RADIO RH CLK" {
		t.Errorf("BAT feeds %s, want RADIO RH CLK", got)
	}
	text, _ := render(t, tab)
	if !strings.Contains(rails(text), "BAT (battery) holds vbat") {
		t.Fatalf("no rails section:\n%s", text)
	}
	for _, src := range []string{threeRails, regulatorChain, fanIn} {
		sameInAnyOrder(t, src)
	}
}

// fanIn has a net reached from two rails (mid, through RA and RB): the
// tree follows it past the first part by name, whatever the order.
const fanIn = `ground gnd
source   VA (va, gnd) 5 V
source   VB (vb, gnd) 3.3 V
resistor RB (vb, mid) 1 kΩ rated 100 mW
resistor RA (va, mid) 1 kΩ rated 100 mW
resistor RM (mid, gnd) 2 kΩ
load     LB (vb, gnd) 10 mA
`

// sameInAnyOrder checks that the rails of src, text and JSON, are the same
// with its statements shuffled.
func sameInAnyOrder(t *testing.T, src string) {
	t.Helper()
	text, js := render(t, tableOf(t, src))
	if rails(text) == "" {
		t.Fatalf("no rails section:\n%s", text)
	}
	lines := strings.Split(strings.TrimSpace(src), "\n")
	rng := rand.New(rand.NewSource(12))
	for k := 0; k < 5; k++ {
		body := append([]string(nil), lines[1:]...)
		rng.Shuffle(len(body), func(i, j int) { body[i], body[j] = body[j], body[i] })
		src := lines[0] + "\n" + strings.Join(body, "\n") + "\n"
		t2, j2 := render(t, tableOf(t, src))
		if rails(t2) != rails(text) {
			t.Errorf("statements shuffled: rails\n%s\nwant\n%s", rails(t2), rails(text))
		}
		var a, b struct{ Rails any }
		if json.Unmarshal([]byte(js), &a) != nil || json.Unmarshal([]byte(j2), &b) != nil || a.Rails == nil {
			t.Fatal("JSON without rails")
		}
		ja, _ := json.Marshal(a)
		jb, _ := json.Marshal(b)
		if string(ja) != string(jb) {
			t.Errorf("statements shuffled: JSON rails differ\n%s\n%s", ja, jb)
		}
	}
}

func render(t *testing.T, tab *report.Table) (string, string) {
	t.Helper()
	var tx, js bytes.Buffer
	if err := tab.WriteText(&tx, report.TextOptions{}); err != nil {
		t.Fatal(err)
	}
	if err := tab.WriteJSON(&js); err != nil {
		t.Fatal(err)
	}
	return tx.String(), js.String()
}

// rails cuts the rails section out of the text form.
func rails(text string) string {
	i := strings.Index(text, "\nRails:")
	if i < 0 {
		return ""
	}
	rest := text[i+1:]
	if j := strings.Index(rest, "\n\n"); j >= 0 {
		rest = rest[:j]
	}
	return rest
}

// TestRailsShapes: a rail below ground, a rail two batteries share, nets
// joined to a rail by a wire, a section with no DC path to ground, and a
// design with no supply.
func TestRailsShapes(t *testing.T) {
	// −5 V across 1 kΩ: 5 mA out of ground (Ohm's law).
	tab := tableOf(t, "ground gnd\nsource VN (pos=gnd, neg=vneg) 5 V\nresistor R (vneg, gnd) 1 kΩ\n")
	s := tab.Rails[0]
	if s.Rail != "vneg" || s.Flow.VOut != -5 || math.Abs(s.Flow.IOut+0.005) > 1e-15 || math.Abs(s.Flow.POut-0.025) > 1e-15 {
		t.Errorf("rail below ground: %s %+v", s.Rail, s.Flow)
	}
	if len(s.Loads) != 1 || s.Loads[0].Current != -0.005 {
		t.Errorf("rail below ground feeds %+v", s.Loads)
	}

	// Two cells in parallel share one rail: the first by name lists it.
	tab = tableOf(t, "ground gnd\nbattery B2 (pos=v, neg=gnd) 3.7 V series 100 mΩ\nbattery B1 (pos=v, neg=gnd) 3.6 V series 100 mΩ\nresistor R (v, gnd) 10 Ω\n")
	if len(tab.Rails) != 2 || tab.Rails[0].Name != "B1" || len(tab.Rails[0].Loads) != 1 || tab.Rails[1].Alongside != "B1" || len(tab.Rails[1].Loads) != 0 {
		t.Errorf("shared rail: %+v %+v", tab.Rails[0], tab.Rails[1])
	}
	// KCL at v: what the two deliver is what R takes (B2 charges B1).
	if sum := tab.Rails[0].Flow.IOut + tab.Rails[1].Flow.IOut; math.Abs(sum-tab.Rails[0].Loads[0].Current) > 1e-12 {
		t.Errorf("B1 + B2 deliver %g A, R takes %g A", sum, tab.Rails[0].Loads[0].Current)
	}

	// A wire extends the rail: the load past it is on the rail, the wire
	// is not listed, and the resistor across is.
	tab = tableOf(t, "ground gnd\nsource V (vin, gnd) 5 V\nwire J (vin, far)\nload L (far, gnd) 20 mA\nresistor R (vin, gnd) 1 kΩ\ncapacitor C (vin, gnd) 1 µF\n")
	var names []string
	for _, l := range tab.Rails[0].Loads {
		names = append(names, l.Name)
	}
	if strings.Join(names, " ") != "L R" {
		t.Errorf("rail through a wire feeds %v, want L R (no wire, no capacitor)", names)
	}

	// A supply on a section with no DC path to ground: its figures are
	// undetermined, and said so.
	tab = tableOf(t, "ground gnd\nsource V (vin, gnd) 5 V\nresistor R (vin, gnd) 1 kΩ\nbattery B (pos=a, neg=b) 3 V series 1 Ω\nresistor RB (a, b) 2 Ω\n")
	text, js := render(t, tab)
	if !strings.Contains(rails(text), "B (battery) holds a at an undetermined voltage against b: delivers an undetermined current") {
		t.Errorf("undetermined supply:\n%s", rails(text))
	}
	if !strings.Contains(js, `"undetermined": [`) {
		t.Errorf("JSON lacks undetermined:\n%s", js)
	}

	// No supply, no section.
	tab = tableOf(t, "ground gnd\nport sig 2 mA\nresistor R (sig, gnd) 1 kΩ\n")
	if text, js := render(t, tab); len(tab.Rails) != 0 || rails(text) != "" || strings.Contains(js, `"rails"`) {
		t.Errorf("a design with no voltage supply has rails:\n%s", text)
	}
}

// TestRailsEscaped: names in the tree are escaped for the terminal; the
// JSON encoder escapes them for JSON.
func TestRailsEscaped(t *testing.T) {
	tab := tableOf(t, "ground gnd\nsource V (\"v\x1b[31m\", gnd) 5 V\nresistor R (\"v\x1b[31m\", \"w\u202e\") 1 kΩ\nresistor R2 (\"w\u202e\", gnd) 1 kΩ\n")
	text, js := render(t, tab)
	r := rails(text)
	if strings.ContainsAny(r, "\x1b\u202e") || !strings.Contains(r, `holds v\x1b[31m at`) || !strings.Contains(r, `towards w\u202e`) {
		t.Errorf("rails not escaped:\n%s", r)
	}
	var doc struct {
		Rails []struct {
			Rail  string
			Loads []struct{ Towards []string }
		}
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil || doc.Rails[0].Rail != "v\x1b[31m" || doc.Rails[0].Loads[0].Towards[0] != "w\u202e" {
		t.Errorf("JSON names: %v %+v", err, doc)
	}
}

// regulatorChain: a 12 V bench supply feeds a 5 V converter, which feeds a
// 3.3 V regulator, which feeds a 1.8 V regulator; a fuse stands between
// the supply and the converter.
const regulatorChain = `ground gnd
source    VS   (vs, gnd) 12 V rated 2 A
fuse      F1   (vs, vf) 1 A dcr 100 mΩ
converter BUCK (in=vf, out=v5, common=gnd) 5 V efficiency 90% input 6 V to 28 V quiescent 1 mA rated 1 A
load      HOT  (v5, gnd) 200 mA
regulator LA   (in=v5, out=v33, common=gnd) 3.3 V dropout 300 mV quiescent 50 µA rated 500 mA
load      MCU  (v33, gnd) 100 mA
regulator LB   (in=v33, out=v18, common=gnd) 1.8 V dropout 200 mV quiescent 20 µA rated 200 mA
load      CORE (v18, gnd) 60 mA
`

// TestRailsRegulatorChain: the tree hangs each regulator under the supply
// of the rail its input is on (the converter under the fuse that feeds
// it), and each supply's figures follow the regulator models (common
// practice, from the energy balance): a linear regulator draws
// I_in = I_out + I_q and dissipates (V_in − V_out)·I_out + V_in·I_q; a
// converter draws P_out/η + V_in·I_q. What each rail delivers is what its
// parts and fed supplies take (Kirchhoff's current law), to 1e-9.
func TestRailsRegulatorChain(t *testing.T) {
	tab := tableOf(t, regulatorChain)
	text, _ := render(t, tab)
	if len(tab.Rails) != 1 || tab.Rails[0].Name != "VS" {
		t.Fatalf("roots %v, want VS alone:\n%s", tab.Rails, rails(text))
	}
	vs := tab.Rails[0]
	if len(vs.Loads) != 1 || vs.Loads[0].Name != "F1" || len(vs.Loads[0].Feeds) != 1 {
		t.Fatalf("VS feeds %+v, want F1 feeding BUCK:\n%s", vs.Loads, rails(text))
	}
	buck := vs.Loads[0].Feeds[0]
	if buck.Name != "BUCK" || len(buck.Feeds) != 1 || buck.Feeds[0].Name != "LA" || len(buck.Feeds[0].Feeds) != 1 || buck.Feeds[0].Feeds[0].Name != "LB" {
		t.Fatalf("tree:\n%s", rails(text))
	}
	la, lb := buck.Feeds[0], buck.Feeds[0].Feeds[0]
	near := func(what string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-9*math.Abs(want) {
			t.Errorf("%s = %.12g, want %.12g", what, got, want)
		}
	}
	// From the bottom up, by hand.
	iLB := 0.060
	inLB := iLB + 20e-6
	near("LB delivers", lb.Flow.IOut, iLB)
	near("LB draws", lb.Flow.IIn, inLB)
	near("LB dissipates", lb.Flow.Loss, (3.3-1.8)*iLB+3.3*20e-6)
	iLA := 0.100 + inLB
	near("LA delivers", la.Flow.IOut, iLA)
	near("LA draws", la.Flow.IIn, iLA+50e-6)
	near("LA dissipates", la.Flow.Loss, (5-3.3)*iLA+5*50e-6)
	near("LA efficiency", la.Flow.Efficiency, 3.3*iLA/(5*(iLA+50e-6)))
	iBuck := 0.200 + iLA + 50e-6
	near("BUCK delivers", buck.Flow.IOut, iBuck)
	vf := buck.Flow.VIn
	near("BUCK draws", buck.Flow.PIn, 5*iBuck/0.9+vf*1e-3)
	// The fuse passes what the converter draws (KCL at vf), and the
	// bench supply delivers it.
	near("F1 carries", vs.Loads[0].Current, buck.Flow.IIn)
	near("VS delivers", vs.Flow.IOut, buck.Flow.IIn)
	near("vf", vf, 12-0.1*buck.Flow.IIn) // Ohm's law across the fuse
	for _, s := range []*report.Supply{buck, la, lb} {
		near(s.Name+" loss", s.Flow.Loss, s.Flow.PIn-s.Flow.POut)
		sum := 0.0
		for _, l := range s.Loads {
			sum += l.Current
		}
		for _, f := range s.Feeds {
			sum += f.Flow.IIn
		}
		near(s.Name+" rail KCL", sum, s.Flow.IOut)
	}
	if !strings.Contains(rails(text), "A supply's loss is heat") {
		t.Errorf("no note on heat:\n%s", text)
	}
}

// TestRailsDropout: a regulator whose input is below its set output plus
// its dropout tracks its input, output = input − dropout (common
// practice); the tree says it is in dropout and what it was set to, and
// the JSON gives its region.
func TestRailsDropout(t *testing.T) {
	tab := tableOf(t, "ground gnd\nsource VB (vb, gnd) 3.4 V\nregulator U (in=vb, out=vo, common=gnd) 3.3 V dropout 250 mV\nload L (vo, gnd) 50 mA\n")
	text, js := render(t, tab)
	u := tab.Rails[0].Feeds[0]
	if math.Abs(u.Flow.VOut-(3.4-0.25)) > 1e-9 || !strings.Contains(rails(text), "U (regulator) holds vo at 3.15 V (in dropout; set to 3.30 V)") {
		t.Errorf("dropout: %g V\n%s", u.Flow.VOut, rails(text))
	}
	if !strings.Contains(js, `"region": "dropout"`) {
		t.Errorf("JSON lacks the region:\n%s", js)
	}
	tab = tableOf(t, "ground gnd\nsource VB (vb, gnd) 5 V\nregulator U (in=vb, out=vo, common=gnd) 3.3 V dropout 250 mV\nload L (vo, gnd) 50 mA\n")
	if text, js := render(t, tab); strings.Contains(rails(text), "dropout;") || !strings.Contains(js, `"region": "regulating"`) {
		t.Errorf("regulating:\n%s", rails(text))
	}
}
