package rules_test

import (
	"strings"
	"testing"

	"nodal/check"
)

// TestSourceLoopNamesSupplies: a loop closed by regulators' outputs is
// worded from the kinds in it, not as one of voltage sources and shorts.
// The sums are Kirchhoff's voltage law around the loop, by hand.
func TestSourceLoopNamesSupplies(t *testing.T) {
	for _, c := range []struct {
		name, src, want string
	}{
		{
			// Around gnd → a → b → gnd: U1 raises 5 V, U2 3.3 V, and V2
			// falls 9 V: 5 + 3.3 − 9 = −0.7 V.
			"two regulators and a source",
			"ground gnd\nsource V1 (vin, gnd) 12 V\n" +
				"regulator U1 (vin, a, gnd) 5 V dropout 300 mV\n" +
				"regulator U2 (vin, b, a) 3.3 V dropout 300 mV\n" +
				"source V2 (b, gnd) 9 V\nresistor R1 (b, gnd) 1 kΩ\n",
			"regulator outputs and voltage sources form a loop whose voltages sum to ",
		},
		{
			// Two outputs tied by a wire: 5 V against 3.3 V.
			"a regulator, a converter and a wire",
			"ground gnd\nsource V1 (vin, gnd) 12 V\n" +
				"regulator U1 (vin, a, gnd) 5 V dropout 300 mV\n" +
				"converter U2 (vin, b, gnd) 3.3 V efficiency 90% input 6 V to 28 V\n" +
				"wire W1 (a, b)\nresistor R1 (a, gnd) 1 kΩ\n",
			"regulator outputs, converter outputs and shorts form a loop whose voltages sum to ",
		},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, err := check.Source("t.nodal", []byte(c.src), nil)
			if err != nil {
				t.Fatal(err)
			}
			var msgs []string
			for _, d := range res.Diags {
				if d.Rule == "source-loop" {
					msgs = append(msgs, d.Message)
				}
			}
			if len(msgs) != 1 {
				t.Fatalf("want one source-loop finding, got %q (all: %v)", msgs, res.Diags)
			}
			if !strings.HasPrefix(msgs[0], c.want) {
				t.Errorf("message %q\nwant it to start %q", msgs[0], c.want)
			}
			if strings.Contains(msgs[0], "voltage sources and shorts") {
				t.Errorf("message %q still says voltage sources and shorts", msgs[0])
			}
		})
	}
}
