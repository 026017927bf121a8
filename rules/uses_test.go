package rules

import (
	"strings"
	"testing"

	"nodal/circuit"
	"nodal/solve"
)

func TestClean(t *testing.T) {
	if Clean(1e-19, 1, FloorI) != 0 || Clean(-1e-14, 1, FloorV) != 0 {
		t.Error("noise kept")
	}
	if Clean(5e-12, 0.066, FloorI) != 5e-12 {
		t.Error("a 5 pA leakage is not noise")
	}
	if v := Clean(-0.0, 1, FloorV); v != 0 || 1/v < 0 {
		t.Error("−0 kept")
	}
}

// TestFormatUse: a printed use never hides which side of its rating, or
// of a derating limit it is past, the part is on.
func TestFormatUse(t *testing.T) {
	cases := []struct {
		f, limit float64
		want     string
	}{
		{1.0016, 0, "100.2 %"}, // over: not "100 %"
		{1.000004, 0, "100.0004 %"},
		{0.9996, 0, "99.96 %"},   // within: not "100 %"
		{1, 0, "100 %"},          // exactly at the rating
		{1 + 1e-10, 0, "100 %"},  // within the rules' rounding margin: not over
		{1.25, 0, "125 %"},       // far from 100 %: the usual figures
		{0.597, 0.6, "60 %"},     // under a derating limit: the usual figures
		{0.6004, 0.6, "60.04 %"}, // past the limit: shown past it
		{0.724, 0.6, "72 %"},
		{0.005, 0, "0.5 %"},
	}
	for _, c := range cases {
		if got := FormatUse(c.f, c.limit); got != c.want {
			t.Errorf("FormatUse(%v, %v) = %q, want %q", c.f, c.limit, got, c.want)
		}
	}
}

// TestDeratingDefaultsAgree: kinds that share a derating key share its
// default, a fraction of the rating in (0, 1], so that the key has one
// default whichever kind comes first in the table.
func TestDeratingDefaultsAgree(t *testing.T) {
	keys, def := DeratingDefaults()
	if len(keys) != len(def) {
		t.Fatalf("keys %v, defaults %v", keys, def)
	}
	for _, k := range circuit.Kinds() {
		for _, r := range k.Info().Ratings {
			if r.Derating == "" {
				continue
			}
			if r.Default != def[r.Derating] || !(r.Default > 0 && r.Default <= 1) {
				t.Errorf("%s: %s default %v, the key's %v", k.Info().Word, r.Derating, r.Default, def[r.Derating])
			}
		}
	}
}

// TestUncertifiedSaysSo: a part whose values the solver could not certify
// is still judged, and its finding says that its accuracy is not
// certified.
func TestUncertifiedSaysSo(t *testing.T) {
	p := &circuit.Part{Kind: circuit.Resistor, Local: "R1", Value: 100, RatedPower: 0.25}
	r := &solve.Result{NetV: []float64{10, 0}, V: []float64{10}, I: []float64{0.1}, P: []float64{1}, Uncertified: []bool{true}}
	q := NewPoint(r).Part(0)
	if !q.Uncertified {
		t.Fatal("Point.Part drops the solver's uncertified mark")
	}
	us := Judge(p, q, Derating{})
	if len(us) != 1 || !us[0].Over() || !strings.Contains(Describe(nil, p, us[0]), "could not certify") {
		t.Errorf("uses %+v: %q", us, Describe(nil, p, us[0]))
	}
	r.Uncertified = nil
	if q := NewPoint(r).Part(0); q.Uncertified || strings.Contains(Describe(nil, p, Judge(p, q, Derating{})[0]), "certify") {
		t.Error("a certified solve marked uncertified")
	}
}
