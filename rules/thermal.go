package rules

// thermal.go: ratings that depend on temperature: a resistor's power
// derated above its knee, and a junction's temperature against its
// maximum.

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/units"
)

// Default resistor power derating: full rating up to 70 °C, none at
// 155 °C (common practice for thick-film chip resistors).
const (
	DefaultKnee = 70.0
	DefaultZero = 155.0
	// RoomCelsius is the ambient temperature when none is stated (°C).
	RoomCelsius = 25.0
)

// DeratingFactor returns the fraction of its power rating a resistor may
// dissipate at ambient temperature t: 1 up to the knee, then falling
// linearly to 0 at zero, and 0 beyond (the shape of the derating curve of
// IEC 60115-1, from memory).
func DeratingFactor(knee, zero, t float64) float64 {
	switch {
	case t <= knee:
		return 1
	case t >= zero:
		return 0
	}
	return (zero - t) / (zero - knee)
}

// JunctionTemperature returns Tj = Ta + θ·P: the ambient temperature ta
// (°C) plus the rise of a junction dissipating p watts through a thermal
// resistance theta (K/W) to ambient (JEDEC JESD51-2's junction-to-ambient
// resistance θJA, from memory).
func JunctionTemperature(ta, theta, p float64) float64 { return ta + theta*p }

// ambientOf returns the ambient temperature of q in °C.
func ambientOf(q Quantities) float64 {
	if q.HasAmbient {
		return q.Ambient
	}
	return RoomCelsius
}

// knee returns p's derating temperatures: its own, or der's, or the
// defaults.
func kneeOf(p *circuit.Part, der Derating) (knee, zero float64) {
	if h := p.Heat; h != nil && h.HasDerate {
		return h.Knee, h.Zero
	}
	knee, zero = DefaultKnee, DefaultZero
	if der.ResistorKnee != 0 {
		knee = der.ResistorKnee
	}
	if der.ResistorZero != 0 {
		zero = der.ResistorZero
	}
	return knee, zero
}

// resistorPowerUse is a resistor's use of its power rating rated (with
// near-rating's limit), derated for
// the ambient temperature of q. A rating derated to nothing makes any
// power infinitely over it, and no power none of it.
func resistorPowerUse(p *circuit.Part, q Quantities, rated, limit float64, der Derating) Use {
	ta := ambientOf(q)
	knee, zero := kneeOf(p, der)
	f := DeratingFactor(knee, zero, ta)
	pw := math.Abs(q.P)
	u := Use{What: "power", Rule: "over-power", Dim: units.Power, Value: pw, Rating: rated * f, Limit: limit, Uncertified: q.Uncertified}
	if f < 1 {
		u.Nameplate, u.At = rated, ta
	}
	switch {
	case u.Rating > 0:
		u.Frac = pw / u.Rating
	case pw > 0:
		u.Frac = math.Inf(1)
	}
	return u
}

// junctionUse is a diode's or LED's use of its maximum junction
// temperature: the share of the headroom from ambient to tjmax that its
// rise θ·P takes, (Tj − Ta)/(tjmax − Ta), so that it passes 1 exactly when
// Tj passes tjmax. With no headroom at all (tjmax at or below ambient) any
// rise is past it. ok is false unless theta and tjmax are both written.
func junctionUse(p *circuit.Part, q Quantities) (Use, bool) {
	h := p.Heat
	if h == nil || h.Theta <= 0 || !h.HasTjMax || q.unknown(units.Power) {
		return Use{}, false
	}
	ta := ambientOf(q)
	tj := JunctionTemperature(ta, h.Theta, math.Abs(q.P))
	u := Use{What: "junction temperature", Rule: "over-temperature", Dim: units.Temperature, Value: tj, Rating: h.TjMax, At: ta, Uncertified: q.Uncertified}
	switch room := h.TjMax - ta; {
	case room > 0:
		u.Frac = (tj - ta) / room
	case tj > ta || room < 0:
		u.Frac = math.Inf(1)
	default:
		u.Frac = 1 // tjmax at ambient, no rise: at the limit
	}
	return u, true
}

// describeJunction says what a junction-temperature use is.
func describeJunction(d *circuit.Design, p *circuit.Part, u Use) string {
	h := p.Heat
	rise := u.Value - u.At
	s := fmt.Sprintf("%s's junction reaches %s (%s ambient + %s × %s)", d.NameOf(p), units.FormatCelsius(u.Value),
		units.FormatCelsius(u.At), units.Format(h.Theta, units.ThermalResistance), units.Format(rise/h.Theta, units.Power))
	if u.Frac > overLimit {
		return s + fmt.Sprintf(", past its %s maximum", units.FormatCelsius(u.Rating))
	}
	return s + fmt.Sprintf(", %s of the headroom to its %s maximum", FormatUse(u.Frac, u.Limit), units.FormatCelsius(u.Rating))
}

// OverTemperature reports diodes and LEDs whose junction passes its
// maximum temperature.
var OverTemperature = ratingRule("over-temperature", `a junction runs hotter than its maximum temperature
A diode or LED with both theta (its thermal resistance from junction to
ambient, K/W) and tjmax gets a junction temperature Tj = Ta + θ·P from the
power it dissipates at the DC operating point and the ambient temperature;
past tjmax the part degrades quickly and can fail. The electrical operating
point itself is solved with the junction at ambient temperature.`)
