package units

import (
	"math"
	"strconv"
)

// # Temperatures
//
// A temperature is written in °C (or degC, for keyboards without a degree
// sign): 25 °C, -40 °C. It is the one unit with an offset, so its
// quantities are held in °C rather than in kelvin, a negative value keeps
// its sign, and °C takes no prefix. Kelvin converts to the absolute scale
// for the physics (kT/q). A temperature difference appears only inside the
// compound units K/W (°C/W is the same) and ppm/K (ppm/°C is the same).

// ZeroCelsius is 0 °C in kelvin (the SI definition of the Celsius scale).
const ZeroCelsius = 273.15

type thermalUnit struct {
	scale float64
	d     Dim
}

var thermalUnits = map[string]thermalUnit{
	"\u00b0C": {1, Temperature}, "degC": {1, Temperature},
	"K/W": {1, ThermalResistance}, "\u00b0C/W": {1, ThermalResistance}, "degC/W": {1, ThermalResistance},
	"ppm/K": {1e-6, TempCoefficient}, "ppm/\u00b0C": {1e-6, TempCoefficient}, "ppm/degC": {1e-6, TempCoefficient},
}

// IsCompound reports whether s is one of the units written with a slash
// (K/W, ppm/K ...). The lexer uses it to read such a unit as one word.
func IsCompound(s string) bool {
	u, ok := thermalUnits[s]
	return ok && u.d != Temperature
}

// Kelvin converts a temperature in °C to kelvin.
func Kelvin(celsius float64) float64 { return celsius + ZeroCelsius }

// FormatCelsius prints a temperature in °C with one decimal below 100 °C
// and none above: "25.0 °C", "-40.0 °C", "155 °C".
func FormatCelsius(c float64) string {
	if math.IsNaN(c) || math.IsInf(c, 0) {
		return strconv.FormatFloat(c, 'g', -1, 64) + " °C"
	}
	d := 1
	if math.Abs(c) >= 100 {
		d = 0
	}
	s := strconv.FormatFloat(c, 'f', d, 64)
	if s == "-0.0" || s == "-0" {
		s = s[1:]
	}
	return s + " °C"
}
