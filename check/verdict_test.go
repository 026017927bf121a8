package check_test

import (
	"strings"
	"testing"

	"nodal/check"
	"nodal/diag"
	"nodal/output/report"
	"nodal/rules"
)

// Ratings are judged whatever the wiring findings' severities: each design
// below has wiring a rule questions (a warning, an accepted error, an
// error switched off) and a 10 Ω load on 5 V dissipating 2.5 W, 250 % of
// its 1 W rating (Ohm's law: P = V²/R). Each must report over-power, and
// nodal report must show the same load past its rating.
func TestRatingsJudgedWhateverTheWiringSeverities(t *testing.T) {
	const load = "resistor RL (vin, gnd) 10 Ω rated 1 W\n"
	cases := []struct {
		name, src string
		cfg       *rules.Config
	}{
		{"equal supplies tied together (a warning)", "ground gnd\nsource V1 (vin, gnd) 5 V\nsource V2 (vin, gnd) 5 V\n" + load, nil},
		{"parallel wires", "ground gnd\nsource V1 (a, gnd) 5 V\nwire W1 (a, vin)\nwire W2 (a, vin)\n" + load, nil},
		{"an accepted no-dc-path", "ground gnd\nport sig  # nodal: accept no-dc-path because driven on the other board\ncapacitor C1 (sig, x) 100 nF\nresistor R9 (x, gnd) 10 kΩ\nsource V1 (vin, gnd) 5 V\n" + load, nil},
		{"no-dc-path switched off", "ground gnd\nport sig\ncapacitor C1 (sig, x) 100 nF\nresistor R9 (x, gnd) 10 kΩ\nsource V1 (vin, gnd) 5 V\n" + load,
			&rules.Config{Severity: map[string]diag.Severity{"no-dc-path": diag.Off}}},
	}
	for _, c := range cases {
		res, err := check.Source("t.nodal", []byte(c.src), &check.Options{Config: c.cfg})
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, d := range res.Diags {
			if d.Rule == "over-power" && strings.Contains(d.Message, "RL dissipates 2.50 W, 250 %") {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: no over-power finding for RL:\n%s", c.name, strings.Join(lines(res), "\n"))
			continue
		}
		if res.Solved == nil || res.Solved.OP == nil {
			t.Errorf("%s: report would have no operating point", c.name)
			continue
		}
		tab := report.NewAt("t.nodal", res.Build.Design, res.Solved.OP, rules.Derating{}, res.Solved.Ambient)
		for _, p := range tab.Parts {
			if p.Name == "RL" && p.Level() != report.Over {
				t.Errorf("%s: report shows RL at level %v, check says over-power", c.name, p.Level())
			}
		}
	}
}

// A design that cannot be solved says so, naming its rated parts, instead
// of passing with no findings: here 5 V and 6 V sources contradict each
// other around a loop, and that error is switched off.
func TestUnsolvableDesignSaysRatingsNotChecked(t *testing.T) {
	src := "ground gnd\nsource V1 (vin, gnd) 5 V rated 1 A\nsource V2 (vin, gnd) 6 V\nresistor RL (vin, gnd) 10 Ω rated 1 W\n"
	res, err := check.Source("t.nodal", []byte(src), &check.Options{Config: &rules.Config{Severity: map[string]diag.Severity{"source-loop": diag.Off}}})
	if err != nil {
		t.Fatal(err)
	}
	got := lines(res)
	if len(got) != 1 || !strings.Contains(got[0], "ratings not checked on 2 parts") || !strings.Contains(got[0], "not judged: RL, V1") || !strings.HasSuffix(got[0], "[unrated-parts]") {
		t.Fatalf("got\n%s\nwant one unrated-parts finding naming RL and V1", strings.Join(got, "\n"))
	}
}

// Wires in parallel, each rated, judged on their total (Ohm's law: 5 V
// across 1 Ω draws 5 A, past 2 × 300 mA however it divides — at least one
// wire must carry more than half of it), in either statement order; a
// total within the sum but past the smallest derating limit warns.
func TestParallelShortsJudgedAsGroup(t *testing.T) {
	for _, c := range []struct {
		ohms, rule, want string
	}{
		{"1 Ω", "over-current", "J1 and J2 in parallel carry 5.00 A together, 833 % of their combined 600 mA rating; how it divides between them is not determined (ideal shorts)"},
		{"100 Ω", "", ""},
	} {
		for _, order := range [][2]string{{"J1", "J2"}, {"J2", "J1"}} {
			src := "ground gnd\nsource V1 (vin, gnd) 5 V\nwire " + order[0] + " (vin, mid) rated 300 mA\nwire " + order[1] + " (vin, mid) rated 300 mA\nresistor RL (mid, gnd) " + c.ohms + "\n"
			res := run(t, src)
			got := lines(res)
			if c.rule == "" {
				if len(got) != 0 {
					t.Errorf("%s, %v: want no findings, got\n%s", c.ohms, order, strings.Join(got, "\n"))
				}
				continue
			}
			if len(got) != 1 || !strings.Contains(got[0], c.want) || !strings.HasSuffix(got[0], "["+c.rule+"]") {
				t.Errorf("%s, %v: got\n%s\nwant one %s: %s", c.ohms, order, strings.Join(got, "\n"), c.rule, c.want)
			}
		}
	}
}

// A design that cannot be modelled because of an error shows that error,
// which fails the check, and not unrated-parts as well on a part that is
// not at fault. Once the error no longer fails the check (accepted,
// switched off or made a warning), unrated-parts says that the ratings
// were not judged and why, so that a passing check never hides it.
func TestUnratedPartsBesideBuildErrors(t *testing.T) {
	const body = "ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, a) 1 kΩ rated 1 W\ncapacitor C1 (a, gnd) 1 µF rated 10 V\n"
	const bad = "resistor R2 (a, gnd) 2 meg rated 1 W"
	rulesOf := func(res *check.Result) (ids []string, errs int) {
		for _, d := range res.Diags {
			ids = append(ids, d.Rule)
			if d.Severity == diag.Error {
				errs++
			}
		}
		return ids, errs
	}
	res, err := check.Source("t.nodal", []byte(body+bad+"\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	if ids, errs := rulesOf(res); len(ids) != 1 || ids[0] != "unit-mismatch" || errs != 1 {
		t.Errorf("shown error: findings %v, want unit-mismatch alone, as an error", ids)
	}
	for _, c := range []struct {
		name, src string
		cfg       *rules.Config
	}{
		{"accepted", body + bad + " # nodal: accept unit-mismatch because the value is fixed on the bench\n", nil},
		{"switched off", body + bad + "\n", &rules.Config{Severity: map[string]diag.Severity{"unit-mismatch": diag.Off}}},
		{"a warning", body + bad + "\n", &rules.Config{Severity: map[string]diag.Severity{"unit-mismatch": diag.Warning}}},
	} {
		res, err := check.Source("t.nodal", []byte(c.src), &check.Options{Config: c.cfg})
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, d := range res.Diags {
			if d.Rule == "unrated-parts" {
				found = strings.Contains(d.Message, "ratings not checked on 3 parts: the design has errors that stop it from being modelled") &&
					strings.Contains(d.Message, "not judged: C1, R1, R2")
			}
		}
		if ids, errs := rulesOf(res); !found || errs != 0 {
			t.Errorf("%s: findings %v (%d errors), want unrated-parts naming C1, R1 and R2 and no error", c.name, ids, errs)
		}
	}
}
