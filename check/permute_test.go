package check_test

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"nodal/check"
	"nodal/circuit"
	"nodal/rules"
)

// No finding and no number depends on the order of statements. Random
// designs — a tree of resistors from a supply, then extra resistors,
// capacitors, current sources, wires, closed switches, fuses and
// inductors without dcr (so that ideal shorts land in parallel and in
// loops), linear regulators and switching converters (three pins each,
// their inputs and outputs anywhere), and sometimes a second supply equal
// to the first — are checked
// with their statements in two random orders. The findings must be the
// same, message for message once their figures are masked, and every
// part's voltage, current and power (by name) and every group of parallel
// shorts' current must agree to 1e-9 relative (of the largest value of
// its kind, for values near 0): the solve certifies each part's values to
// 1e-10 (extra-precise refinement), so two orders of the same equations
// can differ by twice that, and the figures in messages are compared
// masked because a value within that of a rounding boundary may print
// differently.
func TestStatementOrderDoesNotMatter(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		nets := rapid.IntRange(1, 6).Draw(t, "nets")
		name := func(i int) string {
			if i == 0 {
				return "gnd"
			}
			return fmt.Sprintf("n%d", i)
		}
		var lines []string
		add := func(format string, args ...any) {
			lines = append(lines, fmt.Sprintf(format, args...))
		}
		vs := rapid.SampledFrom([]string{"5 V", "12 V", "3.3 V"}).Draw(t, "supply")
		add("source V1 (n1, gnd) %s rated %d mA", vs, rapid.IntRange(10, 2000).Draw(t, "supply rating"))
		if rapid.Bool().Draw(t, "second supply") {
			add("source V2 (n1, gnd) %s rated 1 A", vs)
		}
		ohms := []string{"1 Ω", "10 Ω", "47 Ω", "100 Ω", "1 kΩ", "4.7 kΩ", "100 kΩ"}
		watts := []string{"100 mW", "250 mW", "1 W", "5 W"}
		count := 0
		part := func(prefix string) string {
			count++
			return fmt.Sprintf("%s%d", prefix, count)
		}
		for i := 2; i <= nets; i++ {
			add("resistor %s (%s, %s) %s rated %s", part("R"), name(i), name(rapid.IntRange(0, i-1).Draw(t, "parent")),
				rapid.SampledFrom(ohms).Draw(t, "ohms"), rapid.SampledFrom(watts).Draw(t, "watts"))
		}
		extra := rapid.IntRange(0, 8).Draw(t, "extra")
		for k := 0; k < extra; k++ {
			a, b := name(rapid.IntRange(0, nets).Draw(t, "a")), name(rapid.IntRange(0, nets).Draw(t, "b"))
			if a == b {
				continue
			}
			rated := rapid.SampledFrom([]string{"100 mA", "500 mA", "2 A"}).Draw(t, "amps")
			switch rapid.IntRange(0, 7).Draw(t, "kind") {
			case 7:
				out := name(rapid.IntRange(0, nets).Draw(t, "out"))
				if out == a || out == b {
					continue
				}
				if rapid.Bool().Draw(t, "converter") {
					add("converter %s (%s, %s, %s) 3.3 V efficiency 85%% input 4 V to 16 V quiescent 50 µA rated %s", part("U"), a, out, b, rated)
				} else {
					add("regulator %s (%s, %s, %s) %s dropout 300 mV quiescent 1 mA limit 1 A rated %s, 2 W", part("U"), a, out, b,
						rapid.SampledFrom([]string{"1.8 V", "3.3 V", "5 V"}).Draw(t, "set"), rated)
				}
			case 0:
				add("resistor %s (%s, %s) %s rated %s", part("R"), a, b, rapid.SampledFrom(ohms).Draw(t, "ohms"), rapid.SampledFrom(watts).Draw(t, "watts"))
			case 1:
				add("capacitor %s (%s, %s) 100 nF rated 16 V", part("C"), a, b)
			case 2:
				add("source %s (%s, %s) %s", part("I"), a, b, rapid.SampledFrom([]string{"1 mA", "10 mA"}).Draw(t, "current"))
			case 3:
				add("wire %s (%s, %s) rated %s", part("W"), a, b, rated)
			case 4:
				add("switch %s (%s, %s) closed rated %s", part("S"), a, b, rated)
			case 5:
				add("fuse %s (%s, %s) %s", part("F"), a, b, rated)
			default:
				add("inductor %s (%s, %s) 10 µH rated %s", part("L"), a, b, rated)
			}
		}
		order := func(label string) []string {
			p := append([]string(nil), lines...)
			for i := len(p) - 1; i > 0; i-- {
				j := rapid.IntRange(0, i).Draw(t, label)
				p[i], p[j] = p[j], p[i]
			}
			return p
		}
		a, b := order("order A"), order("order B")
		ra, rb := checkLines(t, a), checkLines(t, b)
		fa, fb := masked(ra), masked(rb)
		if strings.Join(fa, "\n") != strings.Join(fb, "\n") {
			t.Fatalf("findings differ with statement order:\n%s\n---\n%s\n--- design A:\n%s\n--- design B:\n%s",
				strings.Join(fa, "\n"), strings.Join(fb, "\n"), strings.Join(a, "\n"), strings.Join(b, "\n"))
		}
		if (ra.Solved.OP == nil) != (rb.Solved.OP == nil) {
			t.Fatalf("solved in one order only")
		}
		if ra.Solved.OP == nil {
			return
		}
		va, vb := values(ra), values(rb)
		for k, x := range va {
			y, ok := vb[k]
			if !ok {
				t.Fatalf("%s in one order only", k)
			}
			if strings.HasPrefix(k, "max ") {
				continue // a scale, not a value
			}
			scale := math.Max(va["max "+k[:1]], vb["max "+k[:1]])
			if math.Abs(x-y) > 1e-9*math.Max(math.Max(math.Abs(x), math.Abs(y)), scale) {
				t.Fatalf("%s: %.17g in one order, %.17g in the other\n--- design A:\n%s\n--- design B:\n%s", k, x, y, strings.Join(a, "\n"), strings.Join(b, "\n"))
			}
		}
	})
}

func checkLines(t *rapid.T, lines []string) *check.Result {
	res, err := check.Source("t.nodal", []byte("ground gnd\n"+strings.Join(lines, "\n")+"\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

var figure = regexp.MustCompile(`(^|[^\w.])-?[0-9]+(\.[0-9]+)?`)

// masked returns the findings as "severity rule: message" with every
// figure replaced by #, sorted. Digits inside a name (n2, R3) are not a
// figure: which net a finding names must not depend on statement order
// either.
func masked(res *check.Result) []string {
	var out []string
	for _, d := range res.Diags {
		out = append(out, fmt.Sprintf("%v %s: %s", d.Severity, d.Rule, figure.ReplaceAllString(d.Message, "${1}#")))
	}
	sort.Strings(out)
	return out
}

// values returns every part's V, I and P as the rules judge them (with
// rounding noise cleared: rules.Point) and every group's current, keyed by
// kind of value and part name, with "max V", "max I", "max P" the largest
// magnitude of each.
func values(res *check.Result) map[string]float64 {
	d, r := res.Build.Design, res.Solved.OP
	pt := res.Solved.Point()
	out := map[string]float64{}
	put := func(k string, v float64) {
		out[k] = v
		m := "max " + k[:1]
		out[m] = math.Max(out[m], math.Abs(v))
	}
	for i := range d.Parts {
		n := d.Parts[i].Local
		q := pt.Part(circuit.PartID(i))
		put("V "+n, q.V)
		put("I "+n, q.I)
		put("P "+n, q.P)
		if mp := r.MultiAt(circuit.PartID(i)); mp != nil {
			for k, pin := range d.Parts[i].Kind.Info().Pins {
				put("I "+n+"."+pin, rules.Clean(mp.I[k], out["max I"], rules.FloorI))
			}
		}
		if r.Undetermined != nil {
			put("U "+n, float64(r.Undetermined[i]))
		}
	}
	for _, g := range r.Groups {
		// A group is named by its members (sorted by name); its current
		// runs from the first member's first pin.
		var names []string
		for _, id := range g.Parts {
			names = append(names, d.Parts[id].Local)
		}
		// Cleaned of rounding noise as the parts' currents are (a group
		// that carries nothing reads 1e-34 A in one order, 0 in another).
		put("G "+strings.Join(names, ","), rules.Clean(g.I, out["max I"], rules.FloorI))
	}
	return out
}
