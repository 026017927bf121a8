package main

import (
	"fmt"
	"strconv"
	"strings"

	"nodal/circuit"
	"nodal/rules"
)

// ambientFlag is --ambient: one temperature or a range, in °C, that
// overrides every design's own ambient statement.
type ambientFlag struct{ a circuit.Ambient }

func (f *ambientFlag) String() string {
	if !f.a.Set {
		return ""
	}
	if f.a.Low == f.a.High {
		return fmt.Sprintf("%g °C", f.a.Low)
	}
	return fmt.Sprintf("%g °C to %g °C", f.a.Low, f.a.High)
}

// Set reads "40", "40 °C", "-20 degC to 50 °C" or "-20,50".
// Type names the value in usage text.
func (f *ambientFlag) Type() string { return "temperature" }

func (f *ambientFlag) Set(s string) error {
	parts := strings.Split(s, " to ")
	if len(parts) == 1 {
		parts = strings.Split(s, ",")
	}
	if len(parts) > 2 {
		return fmt.Errorf("write one temperature (40 °C) or a range (0 °C to 50 °C)")
	}
	var v [2]float64
	for i, p := range parts {
		p = strings.TrimSpace(p)
		p = strings.TrimSpace(strings.TrimSuffix(strings.TrimSuffix(p, "°C"), "degC"))
		x, err := strconv.ParseFloat(p, 64)
		if err != nil {
			return fmt.Errorf("%q is not a temperature in °C", parts[i])
		}
		v[i] = x
	}
	if len(parts) == 1 {
		v[1] = v[0]
	}
	if !(v[0] >= circuit.MinAmbient && v[1] <= circuit.MaxAmbient && v[0] <= v[1]) {
		return fmt.Errorf("%s: the range must run from low to high within %g °C … %g °C", s, circuit.MinAmbient, circuit.MaxAmbient)
	}
	f.a = circuit.Ambient{Low: v[0], High: v[1], Set: true}
	return nil
}

// withAmbient returns rc with --ambient applied, leaving rc itself (shared
// by every file under one nodal.toml) unchanged.
func withAmbient(rc *rules.Config, f ambientFlag) *rules.Config {
	if !f.a.Set {
		return rc
	}
	c := *rc
	c.ForceAmbient = f.a
	return &c
}
