package check

import (
	"strings"
	"testing"
)

// TestBreakdownWorstCorner: a clamp diode fed from a supply with 10 %
// tolerance through a 5 % resistor carries its most current at the
// supply's highest and the resistor's lowest value. Ohm's law around the
// loop bounds it by hand: I = (13.2 V − Vz)/1425 Ω with the clamp's
// voltage Vz between its 5.1 V breakdown at 5 mA and 5.11 V (a few n·Vt
// above it at the currents in play), so 5.681 mA ≤ I ≤ 5.688 mA, shown as
// "5.68 mA", past the 5 mA rating at that corner only.
func TestBreakdownWorstCorner(t *testing.T) {
	src := `ground gnd
source   V1 (vin, gnd) 12 V  tol 10%
resistor R1 (vin, ref) 1.5 kΩ  tol 5%  rated 250 mW
diode    D1 (gnd, ref) vf 0.7 V at 10 mA  breakdown 5.1 V at 5 mA  rated 5 mA, 500 mW
`
	res, err := Source("clamp.nodal", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, d := range res.Diags {
		switch d.Rule {
		case "reverse-voltage":
			t.Errorf("within its ratings at nominal, yet: %s", d.Message)
		case "corner-over-rating":
			found = true
			if !strings.Contains(d.Message, "D1 carries 5.68 mA in reverse breakdown") || !strings.Contains(d.Message, "R1 −5 %, V1 +10 %") {
				t.Errorf("worst corner: %s", d.Message)
			}
		}
	}
	if !found {
		t.Errorf("no corner-over-rating for D1: %v", res.Diags)
	}
}
