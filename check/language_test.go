package check_test

import (
	"math"
	"sort"
	"strings"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/diag"
)

// The designs in this file are written from the language description of
// the nodal language (docs/language.md), not from the implementation.

const greenhouse = `# Greenhouse sensor node, 12 V bench supply            (comments start with #)
design greenhouse_node "Soil probe and status light"   # optional header, once per file

ground gnd                      # the 0 V reference net; exactly one per design
port probe_out, ext_12v         # nets that leave this file: allowed to have one pin

source    VIN   (vin, gnd)        12 V    tol 5%   rated 500 mA   # volts: a voltage source
fuse      F1    (vin, vfused)     250 mA
resistor  R1    (vfused, led_a)   1 kΩ    tol 5%   rated 250 mW
led       D1    (led_a, gnd)      vf 2.0 V at 20 mA   rated 30 mA
resistor  R2    (vfused, probe_out) 10 kΩ tol 1%   rated 100 mW, 50 V
resistor  R3    (probe_out, gnd)  4.7kΩ   tol 1%   rated 100 mW
capacitor C1    (probe_out, gnd)  100 nF  rated 16 V
inductor  L1    (vfused, vsw)     22 µH   dcr 80 mΩ  rated 1.2 A
source    ILOAD (vsw, gnd)        35 mA              # amperes: a current source; 35 mA flows vsw -> gnd through it
switch    S1    (vsw, aux)        open               # open | closed
wire      W1    (aux, aux2)                          # zero-ohm link
diode     D2    (aux2, gnd)       vf 0.7 V at 10 mA  rated 1 A, 50 V
`

func run(t *testing.T, src string) *check.Result {
	t.Helper()
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func lines(res *check.Result) []string {
	var out []string
	for _, d := range res.Diags {
		out = append(out, diag.Format(res.Fset, d))
	}
	return out
}

func part(t *testing.T, d *circuit.Design, name string) *circuit.Part {
	t.Helper()
	for i := range d.Parts {
		if d.PartName(circuit.PartID(i)) == name {
			return &d.Parts[i]
		}
	}
	t.Fatalf("no part %s", name)
	return nil
}

func near(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(math.Abs(a), math.Abs(b)) }

// solveRules are the findings of the DC solve and the rating checks,
// which this file does not test.
var solveRules = map[string]bool{"ill-conditioned": true, "near-rating": true, "over-power": true, "over-current": true,
	"over-voltage": true, "reverse-voltage": true, "solve-failed": true, "no-convergence": true,
	"corner-over-rating": true, "over-temperature": true, "starved-load": true}

func TestGreenhouseExample(t *testing.T) {
	res := run(t, greenhouse)
	var kept []diag.Diagnostic
	for _, d := range res.Diags {
		if !solveRules[d.Rule] {
			kept = append(kept, d)
		}
	}
	res.Diags = kept
	if len(res.Diags) != 0 {
		t.Fatalf("the full example has findings:\n%s", strings.Join(lines(res), "\n"))
	}
	d := res.Build.Design
	if d.Name != "greenhouse_node" || d.Title != "Soil probe and status light" {
		t.Errorf("header: %q %q", d.Name, d.Title)
	}
	if len(d.Parts) != 12 {
		t.Errorf("%d parts; want 12", len(d.Parts))
	}
	if d.Ground == circuit.NoNet || d.Nets[d.Ground].Local != "gnd" {
		t.Error("ground is not gnd")
	}
	net := func(id circuit.NetID) string { return d.NetName(id) }
	vin := part(t, d, "VIN")
	if vin.Kind != circuit.VoltageSource || vin.Value != 12 || net(vin.Pins[0]) != "vin" || !near(vin.Tol, 0.05) || !near(vin.RatedCurrent, 0.5) {
		t.Errorf("VIN: %+v", vin)
	}
	il := part(t, d, "ILOAD")
	if il.Kind != circuit.CurrentSource || !near(il.Value, 35e-3) || net(il.Pins[0]) != "vsw" || net(il.Pins[1]) != "gnd" {
		t.Errorf("ILOAD: %+v", il)
	}
	if f := part(t, d, "F1"); f.Kind != circuit.Fuse || !near(f.Value, 0.25) {
		t.Errorf("F1: %+v", f)
	}
	if r := part(t, d, "R2"); !near(r.Value, 10e3) || !near(r.Tol, 0.01) || !near(r.RatedPower, 0.1) || r.RatedVoltage != 50 {
		t.Errorf("R2: %+v", r)
	}
	if r := part(t, d, "R3"); !near(r.Value, 4700) {
		t.Errorf("R3 = %g", r.Value)
	}
	if c := part(t, d, "C1"); !near(c.Value, 100e-9) || c.RatedVoltage != 16 {
		t.Errorf("C1: %+v", c)
	}
	if l := part(t, d, "L1"); !near(l.Value, 22e-6) || !near(l.DCR, 0.08) || !near(l.RatedCurrent, 1.2) {
		t.Errorf("L1: %+v", l)
	}
	if led := part(t, d, "D1"); led.Kind != circuit.LED || led.VF != 2 || !near(led.VFAt, 0.02) || !near(led.RatedCurrent, 0.03) {
		t.Errorf("D1: %+v", led)
	}
	if s := part(t, d, "S1"); s.Kind != circuit.Switch || s.Closed {
		t.Errorf("S1: %+v", s)
	}
	if w := part(t, d, "W1"); w.Kind != circuit.Wire {
		t.Errorf("W1: %+v", w)
	}
	if d2 := part(t, d, "D2"); d2.Kind != circuit.Diode || !near(d2.VF, 0.7) || d2.RatedCurrent != 1 || d2.RatedVoltage != 50 {
		t.Errorf("D2: %+v", d2)
	}
	for i := range d.Nets {
		if n := &d.Nets[i]; (n.Local == "probe_out" || n.Local == "ext_12v") && !n.Port {
			t.Errorf("%s is not a port", n.Local)
		}
	}
}

// Every way the language lets a quantity be written.
func TestQuantityForms(t *testing.T) {
	cases := []struct {
		value string
		want  float64
	}{
		{"4.7kΩ", 4700}, {"4.7 kΩ", 4700}, {"4.7k Ω", 4700},
		{"4.7 k\u2126", 4700}, {"4.7 k\u03a9", 4700}, // ohm sign and Greek omega
		{"470 ohm", 470}, {"4.7 kohm", 4700},
		{"4k7", 4700}, {"2R2", 2.2}, {"1M0", 1e6}, {"R47", 0.47}, // IEC 60062
		{"1 MΩ", 1e6}, {"1 mΩ", 1e-3}, {"2.2e3 Ω", 2200},
	}
	for _, c := range cases {
		res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor RX (a, gnd) "+c.value+"\n")
		if len(res.Diags) != 0 {
			t.Errorf("%s: %s", c.value, strings.Join(lines(res), "; "))
			continue
		}
		if r := part(t, res.Build.Design, "RX"); !near(r.Value, c.want) {
			t.Errorf("%s = %g Ω; want %g", c.value, r.Value, c.want)
		}
	}
	for _, mu := range []string{"\u00b5", "\u03bc", "u"} {
		res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor R1 (a, gnd) 1 kΩ\ncapacitor C1 (a, gnd) 4.7 "+mu+"F\ninductor L1 (a, b) 10"+mu+"H dcr 1 Ω\nresistor R2 (b, gnd) 1 kΩ\n")
		if len(res.Diags) != 0 {
			t.Errorf("micro %U: %s", []rune(mu)[0], strings.Join(lines(res), "; "))
			continue
		}
		if c := part(t, res.Build.Design, "C1"); !near(c.Value, 4.7e-6) {
			t.Errorf("micro %U: C1 = %g", []rune(mu)[0], c.Value)
		}
		if l := part(t, res.Build.Design, "L1"); !near(l.Value, 10e-6) {
			t.Errorf("micro %U: L1 = %g", []rune(mu)[0], l.Value)
		}
	}
}

// ruleIDs returns the rule ids of the findings, sorted and without repeats.
func ruleIDs(res *check.Result) []string {
	seen := map[string]bool{}
	var ids []string
	for _, d := range res.Diags {
		if !seen[d.Rule] {
			seen[d.Rule] = true
			ids = append(ids, d.Rule)
		}
	}
	sort.Strings(ids)
	return ids
}

// Wrong quantities: each gives its rule and a message with the hint, and
// points at the value or attribute it is about (at; the statement when
// nothing is written).
func TestQuantityErrors(t *testing.T) {
	cases := []struct {
		line, rule, hint, at string
	}{
		{"resistor RX (a, gnd) 1 meg", "unit-mismatch", "M for mega", "1 meg"},
		{"resistor RX (a, gnd) 1 MEG", "unit-mismatch", "M for mega", "1 MEG"},
		{"resistor RX (a, gnd) 1meg", "unit-mismatch", "M for mega", "1meg"},
		{"resistor RX (a, gnd) 10", "unit-mismatch", "write 10 Ω", "10"},
		{"resistor RX (a, gnd) 10 k", "unit-mismatch", "write 10 kΩ", "10 k"},
		{"resistor RX (a, gnd) 10k", "unit-mismatch", "write 10 kΩ", "10k"},
		{"capacitor CX (a, gnd) 10u", "unit-mismatch", "write 10 uF", "10u"},
		{"source VX (a, gnd) 5m", "unit-mismatch", "write 5 mV for a voltage source or 5 mA for a current source", "5m"},
		{"capacitor CX (a, gnd) 10 Ω", "unit-mismatch", "capacitance in F", "10 Ω"},
		{"resistor RX (a, gnd) 1e999 Ω", "bad-value", "too large", "1e999 Ω"},
		{"resistor RX (a, gnd) 1e-400 Ω", "bad-value", "1e-400 Ω underflows", "1e-400 Ω"},
		{"resistor RX (a, gnd) NaN Ω", "bad-value", "NaN is not a number", "NaN Ω"},
		{"resistor RX (a, gnd) inf", "bad-value", "inf is not a number", "inf"},
		{"resistor RX (a, gnd) 0 Ω", "bad-value", "use a wire", "0 Ω"},
		{"resistor RX (a, gnd) -1 kΩ", "bad-value", "must be positive", "-1 kΩ"},
		{"resistor RX (a, gnd) 1 kΩ tol 150%", "bad-value", "100 %", "tol 150%"},
		{"resistor RX (a, gnd) 1 kΩ tol 5", "unit-mismatch", "percentage", "tol 5"},
		{"resistor RX (a, gnd) 1 kΩ rated 1 A", "unit-mismatch", "rated in W (power) or V (voltage)", "rated 1 A"},
		{"resistor RX (a, gnd) 1 kΩ rated 1 W, 1 A", "unit-mismatch", "rated in W (power) or V (voltage)", "rated 1 W, 1 A"},
		{"resistor RX (a, gnd)", "missing-value", "needs a value in Ω", ""},
		{"switch SX (a, gnd)", "missing-value", "open or closed", ""},
		{"switch SX (a, gnd) ajar", "bad-value", "write open or closed", "ajar"},
		{"led DX (a, gnd) vf 2 V", "missing-value", "at 10 mA", "vf 2 V"},
		{"diode DX (a, gnd)", "missing-value", "vf 0.7 V at 10 mA", ""},
		{"led DX (a, gnd)", "missing-value", "vf 2.0 V at 10 mA", ""},
		// A voltage written as an LED's value is its forward voltage: one
		// finding, showing that value in the form that says so.
		{"led DX (a, gnd) 2 V", "bad-value", "vf 2 V at 10 mA", "2 V"},
		{"diode DX (a, gnd) 0.6 V", "bad-value", "vf 0.6 V at 10 mA", "0.6 V"},
		{"led DX (a, gnd) 20 mA", "bad-value", "vf 2.0 V at 10 mA", "20 mA"},
		{"source VX (a, gnd) 5", "unit-mismatch", "5 V for a voltage source or 5 A for a current source", "5"},
		// A diode's breakdown: a voltage at a current, both positive, on a
		// diode only, and a reverse rating no lower than it.
		{"diode DX (a, gnd) vf 0.7 V at 10 mA breakdown 5.1 V", "missing-value", "breakdown 5.1 V at 10 mA", "breakdown 5.1 V"},
		{"diode DX (a, gnd) vf 0.7 V at 10 mA breakdown 5.1 mA at 5 mA", "unit-mismatch", "must be a voltage", "breakdown 5.1 mA at 5 mA"},
		{"diode DX (a, gnd) vf 0.7 V at 10 mA breakdown 5.1 V at 5 V", "unit-mismatch", "must be a current", "breakdown 5.1 V at 5 V"},
		{"diode DX (a, gnd) vf 0.7 V at 10 mA breakdown -5.1 V at 5 mA", "bad-value", "both must be positive", "breakdown -5.1 V at 5 mA"},
		{"led DX (a, gnd) vf 2 V at 10 mA breakdown 5 V at 1 mA", "bad-attribute", "an LED takes no breakdown", "breakdown 5 V at 1 mA"},
		{"diode DX (a, gnd) vf 0.7 V at 10 mA breakdown 5.1 V at 5 mA rated 3 V", "bad-value", "below its breakdown voltage", ""},
		{"source VX (a, gnd) 5 W", "unit-mismatch", "in V (voltage source) or A (current source)", "5 W"},
		// A port's drive: a voltage (behind series) or a current, on one
		// net other than ground, with no rating.
		// (The ground net is check.TestPortDriveErrors's case: here net a
		// would be left with one pin.)
		{"port a 5", "unit-mismatch", "write 5 V for a voltage drive or 5 A for a current drive", "5"},
		{"port a 5 W", "unit-mismatch", "in V (voltage drive) or A (current drive)", "5 W"},
		{"port a 5 mA tol 5%", "bad-attribute", "a current drive takes no tol", "tol 5%"},
		{"port a 2 mA rated 1 A", "bad-attribute", "a current drive takes no rating", "rated 1 A"},
		{"port a series 50 Ω", "missing-value", "port a gives series but no drive", "series 50 Ω"},
		{"port a, py 5 V", "syntax", "belongs to one net", "py 5 V"},
	}
	for _, c := range cases {
		res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n")
		// A design that cannot be modelled also says which ratings were
		// not checked (unrated-parts); this table is about the build's
		// own finding.
		var got []string
		for _, l := range lines(res) {
			if !strings.HasSuffix(l, "[unrated-parts]") {
				got = append(got, l)
			}
		}
		if len(got) != 1 || !strings.HasSuffix(got[0], "["+c.rule+"]") || !strings.Contains(got[0], c.hint) {
			t.Errorf("%s:\n  got  %s\n  want one [%s] mentioning %q", c.line, strings.Join(got, "\n       "), c.rule, c.hint)
			continue
		}
		if strings.Contains(c.line, "led") && strings.Contains(got[0], "0.7 V") {
			t.Errorf("%s: an LED is given a silicon diode's forward voltage: %s", c.line, got[0])
		}
		col, width := 1, len(c.line)
		if c.at != "" {
			col, width = strings.Index(c.line, c.at)+1, len(c.at)
		}
		var d diag.Diagnostic
		for _, x := range res.Diags {
			if x.Rule == c.rule {
				d = x
				break
			}
		}
		from, to := res.Fset.Position(d.Pos), res.Fset.Position(d.End)
		if from.Line != 3 || from.Column != col || to.Column != col+width {
			t.Errorf("%s: finding covers %d:%d-%d, want 3:%d-%d (%q)", c.line, from.Line, from.Column, to.Column, col, col+width, c.at)
		}
	}
}

// Every attribute on a kind that takes it, and the error for one that does
// not, naming the kinds that do.
func TestAttributes(t *testing.T) {
	ok := `ground gnd
source    V1 (a, gnd) 5 V     tol 1%  rated 1 A
source    I1 (gnd, a) 1 mA    tol 2%  rated 20 V
resistor  R1 (a, b)   1 kΩ    tol 1%  rated 250 mW, 200 V
capacitor C1 (b, gnd) 1 µF    tol 10% rated 50 V
inductor  L1 (b, c)   1 mH    tol 20% dcr 1.5 Ω rated 500 mA
fuse      F1 (c, d)   1 A     dcr 50 mΩ rated 250 V
diode     D1 (d, e)   vf 0.65 V at 1 mA ideality 1.8 series 0.5 Ω rated 1 A, 100 V, 500 mW
led       D2 (e, f)   vf 1.9 V at 5 mA ideality 2 series 10 Ω rated 20 mA
switch    S1 (f, g)   closed  rated 2 A, 30 V
wire      W1 (g, h)   rated 3 A
resistor  R2 (h, gnd) 100 Ω
`
	res := run(t, ok)
	if len(res.Diags) != 0 {
		t.Fatalf("every attribute on a kind that takes it:\n%s", strings.Join(lines(res), "\n"))
	}
	d := res.Build.Design
	if p := part(t, d, "D1"); p.Ideality != 1.8 || p.Series != 0.5 || !near(p.RatedPower, 0.5) {
		t.Errorf("D1: %+v", p)
	}
	if p := part(t, d, "I1"); p.RatedVoltage != 20 || !near(p.Tol, 0.02) {
		t.Errorf("I1: %+v", p)
	}
	if p := part(t, d, "F1"); !near(p.DCR, 0.05) || p.RatedVoltage != 250 {
		t.Errorf("F1: %+v", p)
	}
	bad := []struct{ line, kinds string }{
		{"capacitor CX (a, gnd) 1 µF dcr 1 Ω", "dcr is for: inductor, fuse"},
		{"resistor RX (a, gnd) 1 kΩ vf 2 V at 1 mA", "vf is for: diode, led"},
		{"resistor RX (a, gnd) 1 kΩ ideality 2", "ideality is for: diode, led"},
		{"inductor LX (a, gnd) 1 mH series 1 Ω", "series is for: diode, led"},
		{"wire WX (a, gnd) tol 5%", "tol is for: resistor, capacitor, inductor, source"},
		{"port a 2 mA series 1 Ω", "a current drive takes no series (series is for: diode, led, battery, port)"},
		{"resistor RX (a, gnd) 1 kΩ colour red", "a resistor takes tol, tempco, derate … to and rated"},
		// A switch takes no attribute but a rating.
		{"switch SX (a, gnd) open ajar", "a switch takes only rated (its state is open or closed)"},
	}
	for _, c := range bad {
		var got []string
		for _, l := range lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n")) {
			if strings.HasSuffix(l, "[bad-attribute]") {
				got = append(got, l)
			}
		}
		if len(got) == 0 || !strings.Contains(got[0], c.kinds) {
			t.Errorf("%s:\n  got %v\n  want one [bad-attribute] naming %q", c.line, got, c.kinds)
		}
	}
}

func TestNamedPinsAndQuotedNets(t *testing.T) {
	res := run(t, `ground gnd
source   V33 (pos="+3V3", neg=gnd) 3.3 V
resistor R1  (b="+3V3", a=led_a)    150 Ω
led      D1  (cathode=gnd, anode=led_a) vf 2.0 V at 10 mA
`)
	if len(res.Diags) != 0 {
		t.Fatalf("%s", strings.Join(lines(res), "\n"))
	}
	d := res.Build.Design
	if d.LookupNet("+3V3") == circuit.NoNet {
		t.Fatal("quoted net +3V3 not found")
	}
	led := part(t, d, "D1")
	if d.Nets[led.Pins[0]].Local != "led_a" || d.Nets[led.Pins[1]].Local != "gnd" {
		t.Errorf("D1 pins: anode %s, cathode %s", d.Nets[led.Pins[0]].Local, d.Nets[led.Pins[1]].Local)
	}
	if r := part(t, d, "R1"); d.Nets[r.Pins[0]].Local != "led_a" {
		t.Errorf("R1 pin a is %s", d.Nets[r.Pins[0]].Local)
	}
	bad := []struct{ line, want string }{
		{"led DX (anode=a, drain=gnd) vf 2 V at 1 mA", `no pin named "drain"`},
		{"led DX (anode=a, gnd) vf 2 V at 1 mA", "mixes named and positional"},
		{"led DX (anode=a, anode=gnd) vf 2 V at 1 mA", "binds pin anode twice"},
		{"resistor RX (a) 1 kΩ", "has 1 pin;"},
	}
	for _, c := range bad {
		got := lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n"))
		if len(got) == 0 || !strings.Contains(strings.Join(got, "\n"), c.want) || !strings.Contains(got[0], "[pin-count]") {
			t.Errorf("%s: got %v; want [pin-count] %q", c.line, got, c.want)
		}
	}
}

func TestNamesAreCaseSensitive(t *testing.T) {
	res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor r1 (a, gnd) 1 kΩ\nresistor R1 (a, gnd) 1 kΩ\n")
	if ids := ruleIDs(res); strings.Join(ids, ",") != "case-clash" {
		t.Errorf("r1 and R1: %v", lines(res))
	}
}

// Syntax errors say what was expected, at the byte column of the token.
func TestSyntaxMessages(t *testing.T) {
	cases := []struct{ line, want string }{
		{"resistor R1 (a gnd) 1 kΩ", `3:16: error: unexpected "gnd"; expected , or ) [syntax]`},
		{"resistor R1 (a, ) 1 kΩ", `3:17: error: unexpected ")"; expected a net name [syntax]`},
		{"resistor R1 a, gnd) 1 kΩ", `3:13: error: unexpected "a"; expected ( and the part's nets [syntax]`},
		{"resistor (a, gnd) 1 kΩ", `3:10: error: unexpected "("; expected a part name`},
		{"resistor R1 (a, gnd) 1 kΩ rated 1 W,", `3:38: error: unexpected end of line; expected another value`},
		{"resistor R1 (\"µa\", gnd) 1 kΩ )", `3:32: error: unexpected ")"; expected an attribute`}, // µ and Ω are two bytes each
		{"resistor R1 (µa, gnd) 1 kΩ", `3:14: error: unexpected "µa", which is not valid here (names use A-Z, a-z, 0-9 and _`},
		{"resistor R1 (\"+3V3, gnd) 1 kΩ", `3:14: error: string is not closed`},
		{"ground", `3:7: error: unexpected end of line; expected the name of the ground net`},
		{"port a,", `3:8: error: unexpected end of line; expected a net name`},
		{"resistor R1 (a, gnd) 1 kΩ @", `3:28: error: unexpected "@"`},
		{".param x = 1", `3:1: error: unexpected "."`},
	}
	for _, c := range cases {
		got := lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n"))
		found := false
		for _, g := range got {
			if strings.HasPrefix(g, "t.nodal:"+c.want) || strings.Contains(g, c.want) && strings.HasPrefix(g, "t.nodal:3:") {
				found = true
			}
		}
		if !found {
			t.Errorf("%s:\n  got  %s\n  want t.nodal:%s", c.line, strings.Join(got, "\n       "), c.want)
		}
	}
}

// A syntax error costs only its line: the rest of the file is checked.
func TestSyntaxErrorKeepsTheRest(t *testing.T) {
	res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor R1 (a gnd) 1 kΩ\nresistor R2 (a, gnd) 1 kΩ\ncapacitor C1 (a, gnd) 1 Ω\n")
	if ids := strings.Join(ruleIDs(res), ","); ids != "syntax,unit-mismatch" {
		t.Errorf("rules %s; want syntax and unit-mismatch:\n%s", ids, strings.Join(lines(res), "\n"))
	}
}

func TestReservedWords(t *testing.T) {
	for _, w := range []string{"block", "include", "design", "ground", "port"} {
		res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor "+w+" (a, gnd) 1 kΩ\n")
		if len(res.Diags) == 0 {
			t.Errorf("%s accepted as a part name", w)
		}
	}
	// param is no statement word: it is a name like any other.
	if res := run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor param (a, gnd) 1 kΩ\n"); len(res.Diags) != 0 {
		t.Errorf("param refused as a part name: %v", lines(res))
	}
}

// Values in a block: a lone parameter name, an expression in parentheses,
// in the part's value, an attribute, an instance's parameter and a
// header's default. The numbers follow from Ohm's law, R = V / I (Ohm,
// Die galvanische Kette, mathematisch bearbeitet, 1827).
func TestParameterNotation(t *testing.T) {
	src := `block led_channel (supply, sink) [vs = 12 V, i = 10 mA, vdrop = 2.0 V, p = (2 * 250 mW)] {
  resistor R (supply, a) ((vs - vdrop) / i)  rated p
  led      D (a, sink)   vf vdrop at 20 mA  rated 30 mA
}
ground gnd
source      V  (vin, gnd) 9 V
led_channel C1 (vin, gnd) [vs = 9 V, i = (10 mA / 2)]
resistor    R9 (vin, gnd) (2 * 4.7 kΩ)
`
	res := run(t, src)
	if len(res.Diags) != 0 {
		t.Fatalf("findings on a valid design: %v", lines(res))
	}
	want := map[string]float64{"C1.R": (9 - 2.0) / 5e-3, "R9": 9400}
	for name, v := range want {
		if p := part(t, res.Build.Design, name); math.Abs(p.Value-v) > 1e-9*v {
			t.Errorf("%s = %g Ω, want %g Ω", name, p.Value, v)
		}
	}
	if p := part(t, res.Build.Design, "C1.R"); math.Abs(p.RatedPower-0.5) > 1e-12 {
		t.Errorf("C1.R rated %g W, want 0.5 W", p.RatedPower)
	}
	if p := part(t, res.Build.Design, "C1.D"); math.Abs(p.VF-2.0) > 1e-12 {
		t.Errorf("C1.D vf %g V, want 2.0 V", p.VF)
	}
}

// The braces of another notation are refused where a value goes, and the
// message shows the value written the language's way; an attribute word,
// a unit or a keyword cannot name a parameter.
func TestParameterNotationMistakes(t *testing.T) {
	cases := []struct{ src, want string }{
		{"block b (p, n) [r = 1 kΩ] {\n  resistor R (p, n) {r}\n}\n",
			`2:21: error: braces do not hold values: write r; a quantity or a lone parameter stands as it is, and an expression is written in parentheses [syntax]`},
		{"block b (p, n) [r = 1 kΩ] {\n  resistor R (p, n) {2 * r} tol 1%\n}\n",
			`2:21: error: braces do not hold values: write (2 * r); a quantity or a lone parameter stands as it is`},
		{"block b (p, n) [r = {1 kΩ}] {\n  resistor R (p, n) r\n}\n",
			`1:21: error: braces do not hold values: write 1 kΩ`},
		{"block b (p, n) [vf = 2 V] {\n  resistor R (p, n) 1 kΩ\n}\n",
			`1:17: error: parameter vf of block b: vf is an attribute word, so it cannot stand for a value; rename it (for example vdrop) [syntax]`},
		{"block b (p, n) [mA = 2 mA] {\n  resistor R (p, n) 1 kΩ\n}\n",
			`1:17: error: parameter mA of block b: mA reads as a unit`},
		{"block b (p, n) [ground = 2 V] {\n  resistor R (p, n) 1 kΩ\n}\n",
			`1:17: error: unexpected "ground"; expected a parameter name; ground is a statement word: choose another name [syntax]`},
	}
	for _, c := range cases {
		got := lines(run(t, c.src))
		if !strings.Contains(strings.Join(got, "\n"), "t.nodal:"+c.want) {
			t.Errorf("%q:\n  got  %s\n  want t.nodal:%s", c.src, strings.Join(got, "\n       "), c.want)
		}
	}
}

// Small slips with their own messages: a byte-order mark an editor wrote
// at the start of the file is no token; an empty quoted name is refused
// where it stands; a capital K is told to be a lower-case k (SI Brochure,
// 9th edition, 2019, section 3: prefix symbols are case-sensitive and kilo
// is k); two ratings without a comma are told to take one.
func TestSmallSlips(t *testing.T) {
	res := run(t, "\ufeffground gnd\nsource V1 (a, gnd) 1 V\nresistor R1 (a, gnd) 1 kΩ\n")
	if len(res.Diags) != 0 {
		t.Errorf("a byte-order mark at the start: %v", lines(res))
	}
	cases := []struct{ line, want string }{
		{`resistor R1 (a, "") 1 kΩ`, `3:17: error: a name cannot be empty`},
		{`port ""`, `3:6: error: a name cannot be empty`},
		{`resistor R1 (a, gnd) 1.5 KΩ`, `3:26: error: "KΩ" is not a unit; write kΩ (k is kilo, in lower case) [syntax]`},
		{`resistor R1 (a, gnd) 1.5 Kohm`, `write kohm (k is kilo, in lower case) [unit-mismatch]`},
		{`resistor R1 (a, gnd) 1.5KΩ`, `write kΩ (k is kilo, in lower case) [unit-mismatch]`},
		{`resistor R1 (a, gnd) 100 MOHM`, `write Mohm or mohm (unit symbols and prefixes are case-sensitive)`},
		{`resistor R1 (a, gnd) 1 kΩ rated 0.5 W 50 V`, `3:40: error: unexpected "50"; expected a comma between the values of rated (rated 0.5 W, 50 V) [syntax]`},
	}
	for _, c := range cases {
		got := lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\n"+c.line+"\n"))
		if !strings.Contains(strings.Join(got, "\n"), c.want) {
			t.Errorf("%s:\n  got  %s\n  want %s", c.line, strings.Join(got, "\n       "), c.want)
		}
	}
	// An empty name costs its line like any syntax error, and the nets the
	// line names are not then reported as floating.
	got := lines(run(t, "ground gnd\nsource V1 (a, gnd) 1 V\nresistor R1 (a, \"\") 1 kΩ\n"))
	if len(got) != 1 {
		t.Errorf("an empty net name: %v, want the one syntax finding", got)
	}
}

// An attribute written before any value is an attribute, not a parameter
// standing alone in the value's place.
func TestAttributeBeforeValue(t *testing.T) {
	src := "ground gnd\nsource V (a, gnd) 5 V\nresistor R1 (a, b) 1 kΩ\nled D1 (b, gnd) theta 300 K/W vf 2 V at 10 mA\n"
	if got := lines(run(t, src)); len(got) != 0 {
		t.Errorf("theta before vf: %v", got)
	}
}
