package check

import (
	"strings"
	"testing"
)

// checkSrc checks one in-memory file named t.nodal.
func checkSrc(t *testing.T, src string) *Result {
	t.Helper()
	return checkMem(t, map[string]string{"t.nodal": src}, "t.nodal", nil)
}

// TestPinCountNoFloating: a part refused for its pin count says so once;
// the nets only it names are not reported floating besides.
func TestPinCountNoFloating(t *testing.T) {
	r := checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, x, y) 1 kΩ\nresistor R2 (vin, gnd) 1 kΩ\n")
	wantOne(t, r, "pin-count", "R1 has 3 pins; a resistor has two")
	if fs := findings(r, "floating-net"); len(fs) != 0 {
		t.Errorf("floating-net beside pin-count:\n%s", strings.Join(lines(r), "\n"))
	}
	r = checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin) 1 kΩ\n")
	wantOne(t, r, "pin-count", "R1 has 1 pin;")
}

// TestUndefinedBlock: an instance of a block that is not defined is
// unknown-block whether it gives parameters or not; after an include that
// failed, the message says so.
func TestUndefinedBlock(t *testing.T) {
	for _, line := range []string{"stage S1 (vin, gnd)", "stage S1 (vin, gnd) [r = 1 kΩ]"} {
		r := checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\n"+line+"\n")
		wantOne(t, r, "unknown-block", `no block or part kind is named "stage" (for S1)`)
		if n := len(findings(r, "unknown-kind")); n != 0 {
			t.Errorf("%s: unknown-kind besides unknown-block:\n%s", line, strings.Join(lines(r), "\n"))
		}
	}
	r := checkSrc(t, "include \"lib/stages.nodal\"\nground gnd\nsource V1 (vin, gnd) 5 V\nstage S1 (vin, gnd)\n")
	wantOne(t, r, "bad-include")
	wantOne(t, r, "unknown-block", "include lib/stages.nodal (line 1) failed")
	// A near miss of a kind stays a misspelt kind.
	r = checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\nresister R1 (vin, gnd) 1 kΩ\n")
	wantOne(t, r, "unknown-kind", `did you mean "resistor"?`)
}

// TestUnderflow: a value too small for a float64 is reported as written,
// not as the zero it would read as. (The smallest positive float64 is
// about 4.9e-324: IEEE 754-2008, binary64.)
func TestUnderflow(t *testing.T) {
	r := checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1e-400 Ω\n")
	d := wantOne(t, r, "bad-value", "1e-400 Ω underflows")
	if strings.Contains(d.Message, "use a wire") {
		t.Errorf("underflow reported as a zero resistance: %q", d.Message)
	}
	// Prefixes can underflow what the number alone does not.
	r = checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\ncapacitor C1 (vin, gnd) 1e-320 pF\n")
	wantOne(t, r, "bad-value", "underflows")
	// Zero written as zero is still zero.
	r = checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 0e-400 Ω\n")
	wantOne(t, r, "bad-value", "is 0 Ω; use a wire")
}

// TestIslandGrammar: one net "reaches it", several "reach them"; the
// currents go "into it" or "into them".
func TestIslandGrammar(t *testing.T) {
	r := checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\ncapacitor C1 (vin, mid) 1 µF\ncapacitor C2 (mid, gnd) 1 µF\n")
	wantOne(t, r, "no-dc-path", "net mid has no DC path", "reach it, so its DC voltage")
	r = checkSrc(t, "ground gnd\nsource V1 (vin, gnd) 5 V\ncapacitor C1 (vin, x) 1 µF\nresistor R1 (x, y) 1 kΩ\ncapacitor C2 (y, gnd) 1 µF\n")
	wantOne(t, r, "no-dc-path", "nets x, y have no DC path", "reach them, so their DC voltage")
	r = checkSrc(t, "ground gnd\nsource I1 (gnd, x) 1 mA\nresistor R1 (x, y) 1 kΩ\ncapacitor C1 (y, gnd) 1 µF\n")
	wantOne(t, r, "current-cutset", "nets x, y are reached", "the currents into them sum")
	r = checkSrc(t, "ground gnd\nsource I1 (gnd, x) 1 mA\ncapacitor C1 (x, gnd) 1 µF\n")
	wantOne(t, r, "current-cutset", "net x is reached", "the currents into it sum")
}

// TestInstancePinCountGrammar: counts of nets and pins read as English.
func TestInstancePinCountGrammar(t *testing.T) {
	r := checkSrc(t, "block one (p) {\n  resistor R (p, gnd) 1 kΩ\n}\nground gnd\nsource V1 (vin, gnd) 5 V\none A (vin, gnd)\n")
	wantOne(t, r, "block-pin", "binds 2 nets; block one has 1 pin: (p)")
}

// TestNoSuggestionOfUnusedNet: a "did you mean" never points at a net no
// pin touches (here a port declared and left unused).
func TestNoSuggestionOfUnusedNet(t *testing.T) {
	r := checkSrc(t, "ground gnd\nport spare\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, spore) 1 kΩ\n")
	d := wantOne(t, r, "floating-net", "net spore touches only one pin")
	if strings.Contains(d.Message, "did you mean") {
		t.Errorf("suggests an unused net: %q", d.Message)
	}
	// Near miss: a port that a pin does touch is a fair suggestion.
	r = checkSrc(t, "ground gnd\nport spare\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, spore) 1 kΩ\nresistor R2 (spare, gnd) 1 kΩ\n")
	wantOne(t, r, "floating-net", "did you mean spare?")
}
