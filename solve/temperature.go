package solve

// temperature.go: a junction's saturation current away from the
// temperature its vf point was measured at.

import (
	"math"

	"nodal/circuit"
)

// BandGap is silicon's band gap near 300 K in joules (1.12 eV; Sze & Ng,
// Physics of Semiconductor Devices, 3rd ed., 2007, from memory). nodal
// uses it for diodes and LEDs alike; an LED's own band gap is wider, so
// its modelled drift with temperature is only indicative.
const BandGap = 1.12 * Charge

// ScaleSaturation returns a saturation current is0 measured at t0 (K)
// moved to t (K), for a junction of ideality n:
//
//	Is(T) = Is(T0)·(T/T0)^(3/n)·exp(Eg/(n·k)·(1/T0 − 1/T))
//
// For n = 1 this is the diffusion current's Is ∝ T³·exp(−Eg/kT), for
// n = 2 the recombination current's ∝ nᵢ ∝ T^(3/2)·exp(−Eg/2kT) (Sze &
// Ng, Physics of Semiconductor Devices, 3rd ed., 2007, ch. 2, from
// memory).
func ScaleSaturation(is0, t0, t, n float64) float64 {
	if t == t0 {
		return is0
	}
	return is0 * math.Pow(t/t0, 3/n) * math.Exp(BandGap/(n*Boltzmann)*(1/t0-1/t))
}

// SaturationCurrentAt returns p's saturation current at temperature t (K),
// its vf point being measured at 25 °C, and the junction voltage at which
// it carries its vf current at t. ok is false when the series resistance
// alone drops vf.
func SaturationCurrentAt(p *circuit.Part, t float64) (is, vj float64, ok bool) {
	is, vj, ok = SaturationCurrent(p, ThermalVoltage(RoomTemperature))
	if !ok || math.Abs(t-RoomTemperature) < 1e-9 {
		return is, vj, ok
	}
	n := Ideality(p)
	is = ScaleSaturation(is, RoomTemperature, t, n)
	if !(is > 0) || math.IsInf(is, 0) {
		return is, vj, false
	}
	return is, n * ThermalVoltage(t) * math.Log1p(p.VFAt/is), true
}

// JunctionCurrentSlope returns ∂I/∂T of p's junction at junction voltage
// v and temperature t (A/K), from the Shockley equation with Is(T) as in
// ScaleSaturation: I = Is(T)·(exp(v/(n·kT/q)) − 1), differentiated by a
// central difference of 1 mK.
func JunctionCurrentSlope(p *circuit.Part, v, t float64) float64 {
	const h = 1e-3
	n := Ideality(p)
	is0, _, ok := SaturationCurrent(p, ThermalVoltage(RoomTemperature))
	if !ok {
		return 0
	}
	i := func(t float64) float64 {
		arg := math.Min(v/(n*ThermalVoltage(t)), 700)
		return ScaleSaturation(is0, RoomTemperature, t, n) * math.Expm1(arg)
	}
	return (i(t+h) - i(t-h)) / (2 * h)
}
