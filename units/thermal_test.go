package units

import (
	"math"
	"testing"
)

func TestTemperatureQuantities(t *testing.T) {
	cases := []struct {
		num, unit string
		v         float64
		d         Dim
	}{
		{"25", "°C", 25, Temperature},
		{"25°C", "", 25, Temperature},
		{"85", "degC", 85, Temperature},
		{"-40", "°C", -40, Temperature}, // the sign is part of the number here
		{"150", "K/W", 150, ThermalResistance},
		{"150K/W", "", 150, ThermalResistance},
		{"62.5", "°C/W", 62.5, ThermalResistance},
		{"100", "ppm/K", 100e-6, TempCoefficient},
		{"50ppm/°C", "", 50e-6, TempCoefficient},
	}
	for _, c := range cases {
		q, err := Parse(c.num, c.unit)
		if err != nil {
			t.Errorf("Parse(%q, %q): %v", c.num, c.unit, err)
			continue
		}
		if math.Abs(q.Value-c.v) > 1e-12*math.Abs(c.v) || q.Dim != c.d {
			t.Errorf("Parse(%q, %q) = %v %v, want %v %v", c.num, c.unit, q.Value, q.Dim, c.v, c.d)
		}
	}
	for _, bad := range [][2]string{{"25k", "°C"}, {"25", "m°C"}, {"25", "K"}, {"1", "ppm"}} {
		if _, err := Parse(bad[0], bad[1]); err == nil {
			t.Errorf("Parse(%q, %q) accepted", bad[0], bad[1])
		}
	}
}

func TestTemperatureFormat(t *testing.T) {
	// 0 °C is 273.15 K by the SI definition of the Celsius scale.
	if Kelvin(0) != 273.15 || Kelvin(25) != 298.15 {
		t.Errorf("Kelvin(0) = %v, Kelvin(25) = %v", Kelvin(0), Kelvin(25))
	}
	for v, want := range map[float64]string{25: "25.0 °C", -40: "-40.0 °C", 155: "155 °C", -0.01: "0.0 °C"} {
		if got := Format(v, Temperature); got != want {
			t.Errorf("Format(%v, Temperature) = %q, want %q", v, got, want)
		}
	}
	if got := Format(150, ThermalResistance); got != "150 K/W" {
		t.Errorf("thermal resistance formats as %q", got)
	}
	if !IsCompound("K/W") || IsCompound("°C") || IsCompound("V/A") {
		t.Error("IsCompound")
	}
}
