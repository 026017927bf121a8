package config

// thermal.go: the [thermal] table: the ambient temperature and the
// default power derating of resistors.

import (
	"fmt"
	"math"
)

// Thermal is the [thermal] table, in °C.
type Thermal struct {
	// AmbientLow … AmbientHigh is the ambient temperature of designs that
	// state none; AmbientSet is false when nodal.toml gives none (25 °C).
	AmbientLow, AmbientHigh float64
	AmbientSet              bool
	// Knee and Zero are the power derating of resistors that give none of
	// their own: full power up to Knee, none at Zero (common practice for
	// thick-film chips: 70 °C and 155 °C).
	Knee, Zero float64
}

// Thermal defaults and bounds (°C).
const (
	DefaultAmbient = 25.0
	DefaultKnee    = 70.0
	DefaultZero    = 155.0
	MinAmbient     = -100.0
	MaxAmbient     = 300.0
	maxDerate      = 1000.0
)

type rawThermal struct {
	Ambient any      `toml:"ambient"`
	Knee    *float64 `toml:"resistor-knee"`
	Zero    *float64 `toml:"resistor-zero"`
}

func defaultThermal() Thermal {
	return Thermal{AmbientLow: DefaultAmbient, AmbientHigh: DefaultAmbient, Knee: DefaultKnee, Zero: DefaultZero}
}

func number(v any) (float64, bool) {
	switch x := v.(type) {
	case int64:
		return float64(x), true
	case float64:
		return x, !math.IsNaN(x) && !math.IsInf(x, 0)
	}
	return 0, false
}

// parseThermal reads r into c, reporting bad values with bad.
func parseThermal(r rawThermal, c *Config, origin func(string) string, bad func(key, format string, args ...any)) {
	if r.Ambient != nil {
		const key = "thermal.ambient"
		var lo, hi float64
		ok := false
		switch x := r.Ambient.(type) {
		case []any:
			if len(x) == 2 {
				var ok1, ok2 bool
				lo, ok1 = number(x[0])
				hi, ok2 = number(x[1])
				ok = ok1 && ok2
			}
		default:
			lo, ok = number(x)
			hi = lo
		}
		switch {
		case !ok:
			bad(key, "write a temperature in °C (ambient = 40) or a range (ambient = [0, 50])")
		case lo < MinAmbient || hi > MaxAmbient || hi < lo:
			bad(key, "%v … %v °C is not a range from low to high within %v … %v °C", lo, hi, MinAmbient, MaxAmbient)
		default:
			c.Thermal.AmbientLow, c.Thermal.AmbientHigh, c.Thermal.AmbientSet = lo, hi, true
			c.Origin[key] = origin(key)
		}
	}
	knee, zero := c.Thermal.Knee, c.Thermal.Zero
	if r.Knee != nil {
		knee = *r.Knee
	}
	if r.Zero != nil {
		zero = *r.Zero
	}
	if r.Knee == nil && r.Zero == nil {
		return
	}
	if !(knee > MinAmbient && knee < zero && zero <= maxDerate) {
		key := "thermal.resistor-knee"
		if r.Knee == nil {
			key = "thermal.resistor-zero"
		}
		bad(key, "resistor-knee %v °C must lie below resistor-zero %v °C, within %v … %v °C", knee, zero, MinAmbient, maxDerate)
		return
	}
	c.Thermal.Knee, c.Thermal.Zero = knee, zero
	if r.Knee != nil {
		c.Origin["thermal.resistor-knee"] = origin("thermal.resistor-knee")
	}
	if r.Zero != nil {
		c.Origin["thermal.resistor-zero"] = origin("thermal.resistor-zero")
	}
}

// FormatAmbient prints an ambient setting as nodal.toml takes it.
func (t Thermal) FormatAmbient() string {
	if t.AmbientLow == t.AmbientHigh {
		return fmt.Sprintf("%g", t.AmbientLow)
	}
	return fmt.Sprintf("[%g, %g]", t.AmbientLow, t.AmbientHigh)
}
