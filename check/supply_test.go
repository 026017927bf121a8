package check

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/rules"
)

// powerTree is a battery-powered board: a converter from the pack, two
// regulators from the converter's rail (one lifted on its common pin),
// and loads of every sort, an LED among them.
const powerTree = `ground gnd
battery B1 (vbat, gnd) 14.8 V series 120 mΩ capacity 3 Ah rated 5 A
resistor RW (vbat, vpack) 50 mΩ rated 2 W
converter U1 (vpack, v5, gnd) 5 V efficiency 91% input 6 V to 28 V quiescent 60 µA rated 2 A, 1 W
regulator U2 (v5, v3, gnd) 3.3 V dropout 250 mV quiescent 45 µA limit 800 mA rated 500 mA, 1 W
regulator U3 (v5, v18, ref) 1.5 V dropout 300 mV quiescent 2 mA rated 300 mA, 1 W
resistor RREF (ref, gnd) 150 Ω
load MCU (v3, gnd) 85 mA
load RADIO (v5, gnd) 1.4 W
resistor RL (v18, gnd) 12 Ω rated 1 W
resistor RLED (v3, led) 150 Ω
led D1 (led, gnd) vf 2.0 V at 10 mA
`

// TestPowerTreeTellegen: over a whole design with regulators and
// converters, the sum over every part and every pin of the pin's net
// voltage times the current into the part there is zero (Tellegen's
// theorem, Philips Res. Rep. 7, 259 (1952), from memory: it follows from
// Kirchhoff's current law at every net, whatever the parts), to 1e-9 of
// the sum of the terms' magnitudes; so is the sum of the parts' absorbed
// powers. Each regulator and converter draws at its input the power it
// delivers plus what it dissipates (energy balance), to 1e-9, as the
// rules' figures give it.
func TestPowerTreeTellegen(t *testing.T) {
	res, err := Source("t.nodal", []byte(powerTree), nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("no operating point: %v", res.Diags)
	}
	d, r := res.Build.Design, res.Solved.OP
	sum, scale, psum, pscale := 0.0, 0.0, 0.0, 0.0
	supplies := 0
	pt := rules.NewPoint(r)
	for i := range d.Parts {
		p := &d.Parts[i]
		id := circuit.PartID(i)
		into := []float64{r.I[i], -r.I[i]}
		if mp := r.MultiAt(id); mp != nil {
			into = mp.I[:len(p.Nets())]
		}
		for k, n := range p.Nets() {
			sum += r.NetV[n] * into[k]
			scale += math.Abs(r.NetV[n] * into[k])
		}
		psum += r.P[i]
		pscale += math.Abs(r.P[i])
		s, ok := pt.SupplyFlow(p, id)
		if !ok || !s.HasInput {
			continue
		}
		supplies++
		// The power it absorbs in all (what the solve gives) is what it
		// draws less what it delivers.
		if math.Abs(s.PIn-(s.POut+r.P[i])) > 1e-9*s.PIn || math.Abs(s.Loss-r.P[i]) > 1e-9*s.PIn {
			t.Errorf("%s: draws %.12g W, delivers %.12g W and dissipates %.12g W (loss %.12g W)", p.Local, s.PIn, s.POut, r.P[i], s.Loss)
		}
		if p.Kind == circuit.Converter {
			// Pin = Pout/η + Vin·Iq (energy balance).
			if want := s.POut/p.Conv.Efficiency + s.VIn*p.Conv.Quiescent; math.Abs(s.PIn-want) > 1e-9*want {
				t.Errorf("%s draws %.12g W, want Pout/η + Vin·Iq = %.12g W", p.Local, s.PIn, want)
			}
		}
	}
	if supplies != 3 {
		t.Errorf("%d supplies with an input rail, want 3", supplies)
	}
	if math.Abs(sum) > 1e-9*scale || math.Abs(psum) > 1e-9*pscale {
		t.Errorf("Tellegen: Σ V·I over pins %g W of %g W; Σ P %g W of %g W", sum, scale, psum, pscale)
	}
	for _, dg := range res.Diags {
		t.Errorf("unexpected finding: %s [%s]", dg.Message, dg.Rule)
	}
}

// TestRegulatorAtCorners: with tolerances, a regulator's output at a
// corner is its set voltage moved by its tolerance, so a load resistor's
// worst power is (Vset·(1 + tol))²/R (Ohm's law); and a regulator that
// regulates at nominal values but whose input, at the bottom of a
// battery's tolerance, is less than its dropout above its output is
// reported in dropout at that corner (common practice), with the corner
// named; a battery high enough at that corner gets no such finding.
func TestRegulatorAtCorners(t *testing.T) {
	const design = `ground gnd
battery B1 (vbat, gnd) %s tol 10%% series 100 mΩ rated 3 A
regulator U1 (vbat, v5, gnd) 5 V tol 2%% dropout 300 mV quiescent 1 mA rated 1 A, 5 W
resistor RL (v5, gnd) 10 Ω rated 2.55 W
`
	for _, c := range []struct {
		emf     string
		dropout bool
	}{{"5.9 V", true}, {"6.2 V", false}} {
		res, err := Source("t.nodal", []byte(fmt.Sprintf(design, c.emf)), nil)
		if err != nil {
			t.Fatal(err)
		}
		var rules []string
		for _, dg := range res.Diags {
			rules = append(rules, dg.Rule)
			switch dg.Rule {
			case "dropout":
				// At B1 −10 % the input is about 5.26 V: enough for U1 at
				// −2 % (4.9 V + 0.3 V), not at +2 % (5.1 V + 0.3 V).
				if !strings.Contains(dg.Message, "B1 −10 %, U1 +2 %") || !strings.Contains(dg.Message, "falls into dropout") ||
					!strings.Contains(dg.Message, "it needs 5.40 V (5.10 V set + 300 mV dropout)") {
					t.Errorf("%s: %s", c.emf, dg.Message)
				}
			case "corner-over-rating":
				// 5.1 V across 10 Ω: 2.601 W, past 2.55 W.
				if !strings.Contains(dg.Message, "2.60 W") || !strings.Contains(dg.Message, "U1 +2 %") {
					t.Errorf("%s: %s", c.emf, dg.Message)
				}
			}
		}
		got := strings.Join(rules, ",")
		if strings.Contains(got, "dropout") != c.dropout || !strings.Contains(got, "corner-over-rating") {
			t.Errorf("%s: findings %s", c.emf, got)
		}
	}
}

// TestRegulatorStatements: a three-pin part binds its pins by position or
// by name, in any order, inside blocks as at the top level; a wrong count
// or name is a pin-count error that lists the kind's three pins.
func TestRegulatorStatements(t *testing.T) {
	for _, c := range []struct{ line, rule, says string }{
		{"regulator U1 (vin, vout, gnd) 3.3 V dropout 300 mV", "", ""},
		{"regulator U1 (common=gnd, out=vout, in=vin) 3.3 V dropout 300 mV", "", ""},
		{"regulator U1 (vin, vout) 3.3 V dropout 300 mV", "pin-count", "has 2 pins; a regulator has three: (in, out, common)"},
		{"regulator U1 (in=vin, out=vout, ref=gnd) 3.3 V dropout 300 mV", "pin-count", "its pins are in, out and common"},
		{"regulator U1 (in=vin, vout, gnd) 3.3 V dropout 300 mV", "pin-count", "name all three (in=…, out=…, common=…) or none"},
		{"converter U1 (vin, vout, gnd) 3.3 V efficiency 90% input 2 V to 1 V", "bad-value", "runs downwards"},
	} {
		src := "ground gnd\nsource VIN (vin, gnd) 5 V\n" + c.line + "\nresistor RL (vout, gnd) 33 Ω\n"
		res, err := Source("t.nodal", []byte(src), nil)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, dg := range res.Diags {
			got = append(got, dg.Rule)
			if dg.Rule == c.rule && !strings.Contains(dg.Message, c.says) {
				t.Errorf("%s: %s", c.line, dg.Message)
			}
		}
		if c.rule == "" && len(got) > 0 || c.rule != "" && (len(got) == 0 || got[0] != c.rule) {
			t.Errorf("%s: findings %v, want %q", c.line, got, c.rule)
		}
		if c.rule == "" {
			d := res.Build.Design
			u := &d.Parts[partIndex(t, d, "U1")]
			if d.NetName(u.Pins[0]) != "vin" || d.NetName(u.Pins[1]) != "vout" || d.NetName(u.Pins[2]) != "gnd" {
				t.Errorf("%s: pins %v", c.line, u.Nets())
			}
		}
	}
	// In a block, expanded twice: each instance's regulator holds its own
	// output (Ohm's law gives the load current, the energy balance the
	// dissipation: (5 − 3.3)·0.1 + 5·0.001 W).
	src := `ground gnd
block ldo (vin, vout) [vset = 3.3 V] {
  regulator U (vin, vout, gnd) vset dropout 300 mV quiescent 1 mA
}
source VIN (vin, gnd) 5 V
ldo A (vin, va) [vset = 3.3 V]
ldo B (vin, vb) [vset = 2.5 V]
resistor RA (va, gnd) 33 Ω
resistor RB (vb, gnd) 25 Ω
`
	res, err := Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil || len(res.Diags) > 0 {
		t.Fatalf("%v %v", err, res.Diags)
	}
	d, r := res.Build.Design, res.Solved.OP
	for name, want := range map[string][2]float64{"A.U": {3.3, (5-3.3)*0.1 + 5*0.001}, "B.U": {2.5, (5-2.5)*0.1 + 5*0.001}} {
		var id int = -1
		for i := range d.Parts {
			if d.PartName(circuit.PartID(i)) == name {
				id = i
			}
		}
		if id < 0 {
			t.Fatalf("no part %s", name)
		}
		if rel(r.V[id], want[0]) > 1e-9 || rel(r.P[id], want[1]) > 1e-9 {
			t.Errorf("%s: %.12g V, dissipates %.12g W; want %g V, %.12g W", name, r.V[id], r.P[id], want[0], want[1])
		}
	}
}

// TestConverterInputRangeAtCorner: a 30 V bus of ±10 % is 33 V at its top
// (30 × 1.1), past a converter's 8 V to 32 V input range, though 30 V at
// nominal is inside it: the worst case over the tolerances finds the
// corner and the finding names it; at ±5 % (31.5 V) nothing fires.
func TestConverterInputRangeAtCorner(t *testing.T) {
	for _, c := range []struct {
		tol   string
		fires bool
	}{{"10%", true}, {"5%", false}} {
		src := "ground gnd\nsource VBUS (vbus, gnd) 30 V tol " + c.tol + "\n" +
			"converter U1 (vbus, v5, gnd) 5 V efficiency 90% input 8 V to 32 V rated 1 A\n" +
			"resistor RL (v5, gnd) 10 Ω rated 5 W\n"
		res, err := Source("t.nodal", []byte(src), nil)
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, dg := range res.Diags {
			if dg.Rule != "input-range" {
				continue
			}
			found = true
			if !strings.Contains(dg.Message, "converter U1 has 33.0 V at its input with ") || !strings.Contains(dg.Message, "above its 8.00 V to 32.0 V input range") {
				t.Errorf("tol %s: %s", c.tol, dg.Message)
			}
		}
		if found != c.fires {
			t.Errorf("tol %s: input-range fired %v, want %v: %v", c.tol, found, c.fires, res.Diags)
		}
	}
}
