package output

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"nodal/check"
)

// sarifPrints checks src as design name and returns each result's rule and
// fingerprint, in output order.
func sarifPrints(t *testing.T, name, src string) (rules, prints []string) {
	t.Helper()
	res, err := check.Source(name, []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	fs := FromDiags(res.Fset, res.Diags)
	for i := range fs {
		fs[i].Design = name
	}
	var buf bytes.Buffer
	if err := Write(&buf, "sarif", &Report{Files: 1, Findings: fs}, Options{Root: "/repo", Dir: "/repo"}); err != nil {
		t.Fatal(err)
	}
	var log struct {
		Runs []struct {
			Results []struct {
				RuleID              string            `json:"ruleId"`
				PartialFingerprints map[string]string `json:"partialFingerprints"`
			} `json:"results"`
		} `json:"runs"`
	}
	if err := json.Unmarshal(buf.Bytes(), &log); err != nil {
		t.Fatal(err)
	}
	for _, r := range log.Runs[0].Results {
		fp := r.PartialFingerprints[FingerprintName]
		if fp == "" {
			t.Fatalf("result of %s without a %s fingerprint", r.RuleID, FingerprintName)
		}
		rules, prints = append(rules, r.RuleID), append(prints, fp)
	}
	return rules, prints
}

// An invented design with findings of several rules, one of whose
// messages names a line ("already used by the resistor on line 4").
const printDesign = `design fp "fingerprints"
ground gnd
source V1 (vin, gnd) 12 V
resistor R1 (vin, mid) 10kΩ
resistor R1 (mid, gnd) 4.7kΩ
resistor R3 (mid, pad) 1kΩ
resistor R4 (mid, lone) 1kΩ
`

// Inserting lines above the findings moves them but keeps every
// fingerprint; a fingerprint is not a line number.
func TestFingerprintsSurviveInsertedLines(t *testing.T) {
	rules, before := sarifPrints(t, "boards/fp.nodal", printDesign)
	if len(before) < 3 {
		t.Fatalf("the design makes %d findings; the test needs several", len(before))
	}
	moved := strings.Replace(printDesign, "ground gnd\n", "# a comment\n\n# and another\nground gnd\n\n", 1)
	rules2, after := sarifPrints(t, "boards/fp.nodal", moved)
	if strings.Join(rules, ",") != strings.Join(rules2, ",") {
		t.Fatalf("rules changed: %v → %v", rules, rules2)
	}
	for i := range before {
		if before[i] != after[i] {
			t.Errorf("%s: fingerprint %s became %s when lines were inserted above it", rules[i], before[i], after[i])
		}
	}
	// Fingerprints tell findings apart, and a design apart from another.
	seen := map[string]bool{}
	for _, p := range before {
		if seen[p] {
			t.Errorf("fingerprint %s given to two findings", p)
		}
		seen[p] = true
	}
	_, other := sarifPrints(t, "boards/other.nodal", printDesign)
	if other[0] == before[0] {
		t.Error("the same finding in another design has the same fingerprint")
	}
}

func TestShapeAndLineless(t *testing.T) {
	for _, c := range []struct{ in, shape, lineless string }{
		{"R1 dissipates 1.44 W, 575 % of its 250 mW rating", "R1 dissipates # W, # % of its # mW rating", "R1 dissipates 1.44 W, 575 % of its 250 mW rating"},
		{"part name R1 is already used by the resistor on line 4", "part name R1 is already used by the resistor on line #", "part name R1 is already used by the resistor on line #"},
		{"block led_row is already defined at lib/stages.nodal:12", "block led_row is already defined at lib/stages.nodal:#", "block led_row is already defined at lib/stages.nodal:#"},
		{"ROW2.C4.R carries 1e-3 A", "ROW2.C4.R carries # A", "ROW2.C4.R carries 1e-3 A"},
	} {
		if got := Shape(c.in); got != c.shape {
			t.Errorf("Shape(%q) = %q, want %q", c.in, got, c.shape)
		}
		if got := Lineless(c.in); got != c.lineless {
			t.Errorf("Lineless(%q) = %q, want %q", c.in, got, c.lineless)
		}
	}
}
