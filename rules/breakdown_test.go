package rules_test

import (
	"math"
	"testing"

	"nodal/circuit"
	"nodal/rules"
)

// TestJudgeBreakdown: a diode with a breakdown voltage that conducts in
// reverse has its current rating judged on the reverse current and its
// power, both by reverse-voltage; forward, and without breakdown, the
// ratings are judged as before.
func TestJudgeBreakdown(t *testing.T) {
	clamp := circuit.Part{Local: "D1", Kind: circuit.Diode, VF: 0.7, VFAt: 10e-3, Breakdown: 5.1, BreakdownAt: 5e-3,
		RatedCurrent: 10e-3, RatedPower: 50e-3}
	plain := clamp
	plain.Breakdown, plain.BreakdownAt = 0, 0
	find := func(us []rules.Use, what string) (rules.Use, bool) {
		for _, u := range us {
			if u.What == what {
				return u, true
			}
		}
		return rules.Use{}, false
	}
	// In breakdown: 12 mA at −5.2 V, 62.4 mW.
	rev := rules.Quantities{V: -5.2, I: -12e-3, P: 5.2 * 12e-3}
	us := rules.Judge(&clamp, rev, rules.DefaultDerating())
	cu, okC := find(us, "current in breakdown")
	pu, okP := find(us, "power in breakdown")
	if !okC || !okP || cu.Rule != "reverse-voltage" || pu.Rule != "reverse-voltage" {
		t.Fatalf("in breakdown: uses %+v", us)
	}
	if math.Abs(cu.Frac-1.2) > 1e-12 || !cu.Over() || math.Abs(pu.Frac-1.248) > 1e-12 || !pu.Over() {
		t.Errorf("in breakdown: current %g, power %g of their ratings; want 1.2 and 1.248", cu.Frac, pu.Frac)
	}
	if got := rules.Describe(nil, &clamp, cu); got != "D1 carries 12.0 mA in reverse breakdown, 120 % of its 10.0 mA rating" {
		t.Errorf("described as %q", got)
	}
	// The same quantities on a diode without breakdown: forward current 0,
	// power by over-power.
	us = rules.Judge(&plain, rev, rules.DefaultDerating())
	if u, ok := find(us, "current"); !ok || u.Value != 0 || u.Rule != "over-current" {
		t.Errorf("no breakdown: current use %+v", u)
	}
	if u, ok := find(us, "power"); !ok || u.Rule != "over-power" || !u.Over() {
		t.Errorf("no breakdown: power use %+v", u)
	}
	// Forward, the clamp is judged like any diode.
	us = rules.Judge(&clamp, rules.Quantities{V: 0.7, I: 8e-3, P: 5.6e-3}, rules.DefaultDerating())
	if u, ok := find(us, "current"); !ok || u.Rule != "over-current" || math.Abs(u.Frac-0.8) > 1e-12 {
		t.Errorf("forward: current use %+v", u)
	}
	if len(us) != 2 {
		t.Errorf("forward: %d uses, want 2 (current, power)", len(us))
	}
}
