package rules

import (
	"testing"

	"nodal/circuit"
)

// TestEveryCodeHasOneRule: each kind of finding that elaboration makes is
// claimed by exactly one registered rule whose id is the code's, so none
// can be dropped for want of an analyzer or filed under a misspelt id.
func TestEveryCodeHasOneRule(t *testing.T) {
	owners := map[circuit.Code][]string{}
	for _, a := range All {
		for _, c := range a.Codes {
			owners[c] = append(owners[c], a.Name)
			if c.String() != a.Name {
				t.Errorf("rule %s claims code %d, whose id is %q", a.Name, c, c.String())
			}
		}
	}
	for c := circuit.NoCode + 1; c < circuit.NumCodes; c++ {
		if c.String() == "" {
			t.Errorf("code %d has no rule id", c)
		}
		if len(owners[c]) != 1 {
			t.Errorf("code %s is claimed by %v, want exactly one rule", c, owners[c])
		}
	}
	if len(owners[circuit.NoCode]) != 0 {
		t.Errorf("NoCode is claimed by %v", owners[circuit.NoCode])
	}
}

// TestRuleNamesUnique: configuration and accept comments name rules by id.
func TestRuleNamesUnique(t *testing.T) {
	seen := map[string]bool{}
	for _, a := range All {
		if seen[a.Name] {
			t.Errorf("two rules named %s", a.Name)
		}
		seen[a.Name] = true
	}
}
