package check

import (
	"strings"
	"testing"

	"nodal/diag"
	"nodal/rules"
)

const base = "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1kΩ\n"

func rulesAt(t *testing.T, src string, cfg *rules.Config) []string {
	t.Helper()
	res, err := Source("s.nodal", []byte(src), &Options{Config: cfg})
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, d := range res.Diags {
		out = append(out, res.Fset.Position(d.Pos).String()+" "+d.Rule)
	}
	return out
}

func TestAllowComments(t *testing.T) {
	for _, c := range []struct {
		name, src string
		cfg       *rules.Config
		want      string
	}{
		{"none", base + "resistor R2 (vin, probe) 1kΩ\n", nil, "s.nodal:4:19 floating-net"},
		{"same line", base + "resistor R2 (vin, probe) 1kΩ # nodal: allow floating-net -- probe pad\n", nil, ""},
		{"line above", base + "# nodal: allow floating-net -- probe pad\nresistor R2 (vin, probe) 1kΩ\n", nil, ""},
		{"two lines above", base + "# nodal: allow floating-net -- probe pad\n\nresistor R2 (vin, probe) 1kΩ\n", nil,
			"s.nodal:4:1 unused-allow|s.nodal:6:19 floating-net"},
		{"trailing covers only its own line", base + "resistor R3 (vin, gnd) 1kΩ # nodal: allow floating-net -- pad\nresistor R2 (vin, probe) 1kΩ\n", nil,
			"s.nodal:4:29 unused-allow|s.nodal:5:19 floating-net"},
		{"other rule", base + "resistor R2 (vin, probe) 1kΩ # nodal: allow shorted-part -- pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 unused-allow"},
		{"no reason", base + "resistor R2 (vin, probe) 1kΩ # nodal: allow floating-net\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 allow-reason"},
		{"unknown rule", base + "resistor R2 (vin, probe) 1kΩ # nodal: allow floatingnet -- pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 bad-allow"},
		{"two rules", base + "resistor R2 (vin, vin) 1kΩ # nodal: allow shorted-part, floating-net -- bleeder\n", nil,
			"s.nodal:4:29 unused-allow"},
		{"rule off: no unused-allow", base + "resistor R3 (vin, gnd) 1kΩ # nodal: allow floating-net -- pad\n",
			&rules.Config{Severity: map[string]diag.Severity{"floating-net": diag.Off}}, ""},
		{"unused-allow off", base + "resistor R3 (vin, gnd) 1kΩ # nodal: allow floating-net -- pad\n",
			&rules.Config{Severity: map[string]diag.Severity{"unused-allow": diag.Off}}, ""},
		{"plain comment", base + "resistor R2 (vin, probe) 1kΩ # allow floating-net -- not for us\n", nil, "s.nodal:4:19 floating-net"},
	} {
		got := strings.Join(rulesAt(t, c.src, c.cfg), "|")
		if got != c.want {
			t.Errorf("%s: got %q, want %q", c.name, got, c.want)
		}
	}
}

func TestSuppressionRulesRegistered(t *testing.T) {
	for _, id := range []string{"allow-reason", "unused-allow", "bad-allow"} {
		if rules.Lookup(id) == nil {
			t.Errorf("%s is not registered", id)
		}
	}
}
