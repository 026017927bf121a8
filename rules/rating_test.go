package rules_test

import (
	"testing"

	"nodal/check"
	"nodal/rules"
)

// TestDeratingConfig: a project's derating limit replaces the default.
func TestDeratingConfig(t *testing.T) {
	src := []byte("ground gnd\nsource V1 (vin, gnd) 5 V\nresistor R1 (vin, gnd) 1kΩ rated 36 mW\n")
	count := func(cfg *rules.Config) int {
		res, err := check.Source("d.nodal", src, &check.Options{Config: cfg})
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		for _, d := range res.Diags {
			if d.Rule == "near-rating" {
				n++
			}
		}
		return n
	}
	if n := count(nil); n != 1 {
		t.Errorf("default 60 %% limit: %d near-rating findings at 69 %%, want 1", n)
	}
	var cfg rules.Config
	if !cfg.Derating.Set("resistor-power", 0.75) || cfg.Derating.Set("no-such-key", 0.5) {
		t.Fatal("Derating.Set accepts the wrong keys")
	}
	if n := count(&cfg); n != 0 {
		t.Errorf("75 %% limit: %d near-rating findings at 69 %%, want 0", n)
	}
}
