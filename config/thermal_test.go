package config

import (
	"strings"
	"testing"
)

func TestThermalTable(t *testing.T) {
	known := func(string) bool { return true }
	none := func(string) string { return "" }
	c, err := Parse("nodal.toml", []byte("[thermal]\nambient = [0, 50.5]\nresistor-knee = 85\n"), known, none, testDerating)
	if err != nil {
		t.Fatal(err)
	}
	if th := c.Thermal; !th.AmbientSet || th.AmbientLow != 0 || th.AmbientHigh != 50.5 || th.Knee != 85 || th.Zero != DefaultZero {
		t.Errorf("thermal %+v", th)
	}
	if c.Origin["thermal.ambient"] != "nodal.toml:2" || c.Origin["thermal.resistor-knee"] != "nodal.toml:3" {
		t.Errorf("origins %v", c.Origin)
	}
	if c, err := Parse("nodal.toml", []byte("[thermal]\nambient = 40\n"), known, none, testDerating); err != nil || c.Thermal.AmbientLow != 40 || c.Thermal.AmbientHigh != 40 {
		t.Errorf("one value: %+v, %v", c, err)
	}
	if d := Default().Thermal; d.AmbientSet || d.Knee != 70 || d.Zero != 155 {
		t.Errorf("defaults %+v", d)
	}
	for src, want := range map[string]string{
		"[thermal]\nambient = \"hot\"\n":         "nodal.toml:2: thermal.ambient: write a temperature",
		"[thermal]\nambient = [50, 0]\n":         "from low to high",
		"[thermal]\nambient = [0, 500]\n":        "from low to high",
		"[thermal]\nresistor-zero = 60\n":        "nodal.toml:2: thermal.resistor-zero: resistor-knee 70 °C must lie below resistor-zero 60 °C",
		"[thermal]\nresistor-knee = 160\n":       "thermal.resistor-knee: resistor-knee 160",
		"[thermal]\nknee = 60\n":                 "[thermal] takes ambient, resistor-knee and resistor-zero",
		"[thermal]\nambient = [1, 2, 3]\n":       "or a range",
		"[thermal]\nresistor-knee = \"70 °C\"\n": "wrong type",
	} {
		_, err := Parse("nodal.toml", []byte(src), known, none, testDerating)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: error %v, want one containing %q", src, err, want)
		}
	}
}
