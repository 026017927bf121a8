package check

import (
	"strings"
	"testing"
)

// TestSubject checks that findings about a part or a net name it by its
// instance path, and that findings about a block's text or the file name
// nothing.
func TestSubject(t *testing.T) {
	src := `ground gnd
block stage (in, out) [r = 1 kΩ] {
  resistor R (in, mid) r
  resistor S (mid, out) 0 Ω
}
source V1 (vin, gnd) 5 V
stage ROW1 (vin, gnd)
stage ROW2 (vin, gnd) [r = 2 kΩ]
resistor R9 (vin, gnd) 1 kF
capacitor C1 (vin, lonely) 1 µF
capacitor C2 (vin, gnd) 1 µF
capacitor c2 (vin, gnd) 1 µF
`
	r := checkMem(t, map[string]string{"top.nodal": src}, "top.nodal", nil)
	want := map[string]string{
		"bad-value":     "ROW1.S", // the merged finding keeps the first instance
		"unit-mismatch": "R9",
		"floating-net":  "lonely",
		"case-clash":    "c2",
	}
	for rule, subject := range want {
		fs := findings(r, rule)
		if len(fs) != 1 {
			t.Fatalf("want one %s finding, got %d:\n%s", rule, len(fs), strings.Join(lines(r), "\n"))
		}
		if fs[0].Subject != subject {
			t.Errorf("%s: subject %q, want %q", rule, fs[0].Subject, subject)
		}
	}
	// A finding about the file names no subject.
	r = checkMem(t, map[string]string{"top.nodal": "resistor R1 (a, b) 1 kΩ\n"}, "top.nodal", nil)
	if d := wantOne(t, r, "no-ground"); d.Subject != "" {
		t.Errorf("no-ground: subject %q, want none", d.Subject)
	}
}
