package report_test

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"nodal/check"
	"nodal/circuit"
	"nodal/output/report"
	"nodal/rules"
	"nodal/units"
)

// harness is a 10 V supply behind 1 kΩ into net a; the part under test
// sits between a and gnd, one way round or the other, so that it has a
// voltage across it, a current through it, or both.
const harness = "ground gnd\nsource VH (top, gnd) 10 V\nresistor RH (top, a) 1 kΩ\n"

// forms holds, for every kind, statements of a part X with its pins as %s
// and %s. A kind without an entry fails TestEveryRatingJudged, so a new
// kind is covered as soon as it is added to the kind table.
var forms = map[circuit.Kind][]string{
	circuit.Resistor:      {"resistor X (%s, %s) 1 kΩ"},
	circuit.Capacitor:     {"capacitor X (%s, %s) 1 µF"},
	circuit.Inductor:      {"inductor X (%s, %s) 1 mH dcr 2 Ω", "inductor X (%s, %s) 1 mH"},
	circuit.VoltageSource: {"source X (%s, %s) 4 V"},
	circuit.CurrentSource: {"source X (%s, %s) 1 mA"},
	circuit.Diode:         {"diode X (%s, %s) vf 0.7 V at 10 mA"},
	circuit.LED:           {"led X (%s, %s) vf 2.0 V at 10 mA"},
	circuit.Fuse:          {"fuse X (%s, %s) 500 mA dcr 100 mΩ", "fuse X (%s, %s) 500 mA"},
	circuit.Switch:        {"switch X (%s, %s) open", "switch X (%s, %s) closed"},
	circuit.Wire:          {"wire X (%s, %s)"},
	circuit.Battery:       {"battery X (%s, %s) 4 V series 2 Ω", "battery X (%s, %s) 4 V"},
	circuit.CurrentLoad:   {"load X (%s, %s) 1 mA"},
	circuit.PowerLoad:     {"load X (%s, %s) 10 mW"}, // reversed, it has no operating point
	// Three-pin kinds: input from the supply, the two %s their output
	// and common (harnesses).
	circuit.Regulator: {"regulator X (top, %s, %s) 4 V dropout 300 mV quiescent 1 mA"},
	circuit.Converter: {"converter X (top, %s, %s) 4 V efficiency 80%% input 1 V to 20 V quiescent 1 mA"},
}

// harnesses holds the harness of a kind that needs another: a supply-like
// part fed from top delivers into a load from a to gnd (reversed, its
// common pin would have to sink the load's current, and no operating
// point exists).
var harnesses = map[circuit.Kind]string{
	circuit.Regulator: "ground gnd\nsource VH (top, gnd) 10 V\nresistor RH (a, gnd) 1 kΩ\n",
	circuit.Converter: "ground gnd\nsource VH (top, gnd) 10 V\nresistor RH (a, gnd) 1 kΩ\n",
}

// ratingRules are the rules that judge a use past its rating.
var ratingRules = map[string]bool{"over-power": true, "over-current": true, "over-voltage": true, "reverse-voltage": true}

// measure is what a rating in dimension dim limits on a part of kind k,
// as docs/language.md defines "rated": a diode's or LED's rated current is
// its forward current and its rated voltage its reverse voltage; a
// battery's rated current is its discharge current, out of its pos pin,
// and a regulator's or converter's its output current, out of its out pin;
// every other rating limits the magnitude.
func measure(k circuit.Kind, dim units.Dim, q rules.Quantities) float64 {
	junction := k == circuit.Diode || k == circuit.LED
	switch {
	case dim == units.Power:
		return math.Abs(q.P)
	case dim == units.Current && junction:
		return math.Max(q.I, 0)
	case dim == units.Current && (k == circuit.Battery || k.Info().Supply != nil && k.Info().Supply.HasInput()):
		return math.Max(-q.I, 0)
	case dim == units.Current:
		return math.Abs(q.I)
	case dim == units.Voltage && junction:
		return math.Max(-q.V, 0)
	}
	return math.Abs(q.V)
}

// TestEveryRatingJudged enumerates every kind and every unit "rated"
// accepts on it, from the kind table, and requires a finding from a rating
// rule just over the rating (by one part in a million) and none just
// under it; nodal report must judge the same part the same way.
func TestEveryRatingJudged(t *testing.T) {
	for _, k := range circuit.Kinds() {
		fs, ok := forms[k]
		if !ok && k.Info().OnPort && len(k.Info().RatedDims()) == 0 {
			// A port's drive takes no "rated" (refused, as
			// check.TestPortDriveErrors shows): nothing to judge.
			continue
		}
		if !ok {
			t.Errorf("kind %s has no statement in forms: add one", k)
			continue
		}
		harness := harness
		if h, ok := harnesses[k]; ok {
			harness = h
		}
		for _, dim := range k.Info().RatedDims() {
			seen := false // some form and orientation gives the quantity
			for _, form := range fs {
				for _, pins := range [][2]string{{"a", "gnd"}, {"gnd", "a"}} {
					stmt := fmt.Sprintf(form, pins[0], pins[1])
					q, ok := quantities(t, harness+stmt+"\n")
					if !ok {
						continue
					}
					m := measure(k, dim, q)
					if !(m > 0) {
						continue
					}
					seen = true
					for _, c := range []struct {
						scale float64
						over  bool
					}{{1 - 1e-6, true}, {1 + 1e-6, false}} {
						rating := strconv.FormatFloat(m*c.scale, 'e', 12, 64) + " " + dim.Symbol()
						src := harness + stmt + " rated " + rating + "\n"
						found, level := judge(t, src)
						if found != c.over {
							t.Errorf("%s rated %s with %s: rating finding %v, want %v\n%s", stmt, rating, units.Format(m, dim), found, c.over, src)
						}
						if (level == report.Over) != c.over {
							t.Errorf("%s rated %s: report level %d, check says over=%v", stmt, rating, level, found)
						}
					}
				}
			}
			if !seen {
				t.Errorf("kind %s, rated %s: no form puts a %s on it; add one to forms", k, dim.Symbol(), dim.Noun())
			}
		}
	}
}

// quantities checks src and returns part X's quantities, as the rules see
// them; ok is false when the design has no operating point (a
// constant-power load the wrong way round), which must then be reported.
func quantities(t *testing.T, src string) (q rules.Quantities, ok bool) {
	t.Helper()
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Solved == nil || res.Solved.OP == nil {
		if len(res.Diags) == 0 {
			t.Errorf("no operating point and no finding for\n%s", src)
		}
		return q, false
	}
	pt := rules.NewPoint(res.Solved.OP)
	for i, p := range res.Build.Design.Parts {
		if p.Local == "X" {
			return pt.Part(circuit.PartID(i)), true
		}
	}
	t.Fatalf("no part X in\n%s", src)
	return q, false
}

// judge checks src and returns whether a rating rule fired on line 4 (the
// part under test) and the level nodal report gives part X.
func judge(t *testing.T, src string) (bool, report.Level) {
	t.Helper()
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, d := range res.Diags {
		if ratingRules[d.Rule] {
			if pos := res.Fset.Position(d.Pos); pos.Line != 4 {
				t.Errorf("%s finding on line %d, not the part's: %s", d.Rule, pos.Line, d.Message)
			}
			if !strings.HasPrefix(d.Message, "X ") {
				t.Errorf("finding does not name X: %s", d.Message)
			}
			found = true
		}
	}
	if res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("no operating point for\n%s", src)
	}
	tb := report.New("t.nodal", res.Build.Design, res.Solved.OP, rules.DefaultDerating())
	for i := range tb.Parts {
		if tb.Parts[i].Name == "X" {
			return found, tb.Parts[i].Level()
		}
	}
	t.Fatal("no part X in the report")
	return found, 0
}

// TestBatteryRuntime: a battery's runtime is its capacity over its
// discharge current (the simple estimate the report states; 1 Ah =
// 3600 C), and a battery being charged has none.
func TestBatteryRuntime(t *testing.T) {
	src := "ground gnd\nbattery B1 (vb, gnd) 12 V series 100 mΩ capacity 2.5 Ah\nresistor RL (vb, gnd) 10 Ω\n" +
		"source VC (vc, gnd) 14 V\nresistor RC (vc, vd) 1 Ω\nbattery B2 (vd, gnd) 12 V series 1 Ω capacity 1 Ah\n"
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved == nil || res.Solved.OP == nil {
		t.Fatalf("%v %v", err, res.Diags)
	}
	tb := report.New("t.nodal", res.Build.Design, res.Solved.OP, rules.DefaultDerating())
	for _, p := range tb.Parts {
		switch p.Name {
		case "B1":
			want := 2.5 * 3600 / (12 / 10.1)
			if math.Abs(p.Runtime-want) > 1e-9*want {
				t.Errorf("B1 runtime %v s, want %v s", p.Runtime, want)
			}
		case "B2":
			if p.Current <= 0 || p.Runtime != 0 {
				t.Errorf("B2 charging at %v A has runtime %v", p.Current, p.Runtime)
			}
		}
	}
	var b strings.Builder
	if err := tb.WriteText(&b, report.TextOptions{}); err != nil {
		t.Fatal(err)
	}
	if out := b.String(); !strings.Contains(out, "about 2.1 h") || !strings.Contains(out, "not discharging") || !strings.Contains(out, "fire") {
		t.Errorf("battery section:\n%s", out)
	}
}

// TestReportNamesDriveRanges: where a port's drive is a range, the nets'
// ranges and the worst case cover it, and the report's headings say so;
// without one they name tolerances and temperature only. The tap of a
// divider behind 4.5 V to 5.5 V through 1 kΩ over 1 kΩ spans 2.25 V to
// 2.75 V (voltage division at the range's ends).
func TestReportNamesDriveRanges(t *testing.T) {
	text := func(src string) string {
		res, err := check.Source("t.nodal", []byte(src), nil)
		if err != nil || res.Worst == nil || res.Worst.R == nil {
			t.Fatalf("%q: %v, no worst case", src, err)
		}
		tb := report.New("t.nodal", res.Build.Design, res.Solved.OP, rules.DefaultDerating())
		tb.AddWorst(res.Build.Design, res.Worst.R, rules.DefaultDerating())
		var b strings.Builder
		if err := tb.WriteText(&b, report.TextOptions{}); err != nil {
			t.Fatal(err)
		}
		return b.String()
	}
	got := text("ground gnd\nport vin 4.5 V to 5.5 V\nresistor R1 (vin, tap) 1 kΩ rated 10 mW\nresistor R2 (tap, gnd) 1 kΩ\n")
	for _, want := range []string{"range over tolerances, drive ranges and temperature", "2.25 V … 2.75 V", "Worst case over tolerances, drive ranges and temperature", "port vin at 5.50 V (top of its range)"} {
		if !strings.Contains(got, want) {
			t.Errorf("report lacks %q:\n%s", want, got)
		}
	}
	got = text("ground gnd\nport vin 5 V\nresistor R1 (vin, tap) 1 kΩ tol 1%\nresistor R2 (tap, gnd) 1 kΩ\n")
	if strings.Contains(got, "drive ranges") || !strings.Contains(got, "range over tolerances and temperature") {
		t.Errorf("report without a drive range:\n%s", got)
	}
}
