package report_test

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"nodal/check"
	"nodal/output/report"
	"nodal/rules"
)

// The report shows what the circuit leaves open as such, never as a
// guessed 0: two wires in parallel carry 5 V / 10 Ω = 0.5 A together
// (Ohm's law), split between them in a way no ideal short fixes; a net
// reached only through a capacitor has no DC voltage.
func TestReportShowsUndetermined(t *testing.T) {
	src := "ground gnd\nport sig\ncapacitor C1 (sig, gnd) 100 nF rated 16 V\nsource V1 (vin, gnd) 5 V\nwire J1 (vin, mid) rated 300 mA\nwire J2 (vin, mid)\nresistor RL (mid, gnd) 10 Ω\n"
	res, err := check.Source("t.nodal", []byte(src), nil)
	if err != nil || res.Solved.OP == nil {
		t.Fatalf("no operating point: %v", err)
	}
	tab := report.NewAt("t.nodal", res.Build.Design, res.Solved.OP, rules.Derating{}, res.Solved.Ambient)
	var text bytes.Buffer
	if err := tab.WriteText(&text, report.TextOptions{}); err != nil {
		t.Fatal(err)
	}
	out := text.String()
	for _, want := range []string{"J1, J2 in parallel carry 500 mA together", "sig  undetermined", "not fixed by the circuit"} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q:\n%s", want, out)
		}
	}
	for _, line := range strings.Split(out, "\n") {
		if f := strings.Fields(line); len(f) > 4 && (f[0] == "J1" || f[0] == "J2") && f[4] != "undetermined" { // name, kind, "0", "V", current
			t.Errorf("%s's current shown as %q", f[0], f[4])
		}
	}
	var js bytes.Buffer
	if err := tab.WriteJSON(&js); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Groups []struct {
			Parts   []string
			Current float64
		}
		Parts []struct {
			Name         string
			Undetermined []string
		}
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Groups) != 1 || doc.Groups[0].Current != 0.5 || strings.Join(doc.Groups[0].Parts, ",") != "J1,J2" {
		t.Errorf("groups %+v, want J1 and J2 carrying 0.5 A", doc.Groups)
	}
	for _, p := range doc.Parts {
		if p.Name == "C1" && (len(p.Undetermined) == 0 || p.Undetermined[0] != "voltage") {
			t.Errorf("C1 undetermined %v, want its voltage", p.Undetermined)
		}
	}
}
