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

func TestAcceptComments(t *testing.T) {
	for _, c := range []struct {
		name, src string
		cfg       *rules.Config
		want      string
	}{
		{"none", base + "resistor R2 (vin, probe) 1kΩ\n", nil, "s.nodal:4:19 floating-net"},
		{"same line", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net because probe pad\n", nil, ""},
		{"line above", base + "# nodal: accept floating-net because probe pad\nresistor R2 (vin, probe) 1kΩ\n", nil, ""},
		{"two lines above", base + "# nodal: accept floating-net because probe pad\n\nresistor R2 (vin, probe) 1kΩ\n", nil,
			"s.nodal:4:1 stale-accept|s.nodal:6:19 floating-net"},
		{"trailing covers only its own line", base + "resistor R3 (vin, gnd) 1kΩ # nodal: accept floating-net because pad\nresistor R2 (vin, probe) 1kΩ\n", nil,
			"s.nodal:4:29 stale-accept|s.nodal:5:19 floating-net"},
		{"other rule", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept shorted-part because pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 stale-accept"},
		{"no reason", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 accept-reason"},
		{"empty reason", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net because  \n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 accept-reason"},
		{"unknown rule", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floatingnet because pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 bad-accept"},
		{"two rules", base + "resistor R2 (vin, vin) 1kΩ # nodal: accept shorted-part, floating-net because bleeder\n", nil,
			"s.nodal:4:29 stale-accept"},
		{"rule ids need commas", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept shorted-part floating-net because pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 bad-accept"},
		{"because inside the reason", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net because pad, because the fixture needs it\n", nil, ""},
		{"rule off: no stale-accept", base + "resistor R3 (vin, gnd) 1kΩ # nodal: accept floating-net because pad\n",
			&rules.Config{Severity: map[string]diag.Severity{"floating-net": diag.Off}}, ""},
		{"stale-accept off", base + "resistor R3 (vin, gnd) 1kΩ # nodal: accept floating-net because pad\n",
			&rules.Config{Severity: map[string]diag.Severity{"stale-accept": diag.Off}}, ""},
		{"plain comment", base + "resistor R2 (vin, probe) 1kΩ # accept floating-net because not for us\n", nil, "s.nodal:4:19 floating-net"},
		// The form of an earlier version accepts nothing: its finding stays.
		{"old form", base + "resistor R2 (vin, probe) 1kΩ # nodal: allow floating-net -- probe pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 bad-accept"},
		{"old separator", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net -- probe pad\n", nil,
			"s.nodal:4:19 floating-net|s.nodal:4:31 bad-accept"},
		{"accept findings of the accept rules", base + "resistor R2 (vin, probe) 1kΩ # nodal: accept floating-net, stale-accept because pad\n", nil,
			"s.nodal:4:31 bad-accept"},
	} {
		got := strings.Join(rulesAt(t, c.src, c.cfg), "|")
		if got != c.want {
			t.Errorf("%s: got %q, want %q", c.name, got, c.want)
		}
	}
}

// The messages about an old or broken comment show the comment as it is
// read now, and bad-accept is an error: such a comment never passes a
// check while accepting nothing.
func TestAcceptMessages(t *testing.T) {
	for _, c := range []struct{ comment, want string }{
		{"# nodal: allow floating-net, case-clash -- probe pad", `error: the form "allow RULE -- reason" is not read and accepts nothing; write "# nodal: accept floating-net, case-clash because probe pad" [bad-accept]`},
		{"# nodal: allow floating-net", `write "# nodal: accept floating-net because REASON"`},
		{"# nodal: allow unused-allow -- old", `write "# nodal: accept stale-accept because old"`},
		{"# nodal: accept floating-net -- probe pad", `the reason follows the word because, not --; write "# nodal: accept floating-net because probe pad"`},
		{"# nodal: accept unused-allow because old", `accept names "unused-allow", which is not a rule; it is now called stale-accept`},
		{"# nodal: ignore floating-net", `unknown nodal: instruction "ignore"; write "# nodal: accept RULE because reason"`},
		{"# nodal: accept because nothing", `error: accept names no rule`},
	} {
		res, err := Source("s.nodal", []byte(base+"resistor R2 (vin, probe) 1kΩ "+c.comment+"\n"), nil)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, d := range res.Diags {
			got = append(got, diag.Format(res.Fset, d))
		}
		if !strings.Contains(strings.Join(got, "\n"), c.want) {
			t.Errorf("%s:\n  got  %s\n  want %s", c.comment, strings.Join(got, "\n       "), c.want)
		}
	}
}

func TestSuppressionRulesRegistered(t *testing.T) {
	for _, id := range []string{"accept-reason", "stale-accept", "bad-accept"} {
		if rules.Lookup(id) == nil {
			t.Errorf("%s is not registered", id)
		}
	}
}
