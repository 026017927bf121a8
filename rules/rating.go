package rules

// rating.go: the rating rules, which compare the operating point with the
// ratings written on each part.

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/diag"
	"nodal/units"
)

// Derating holds the fractions of a rating past which near-rating warns.
// A zero field takes its default. The defaults are common practice, not a
// standard; a project sets its own in nodal.toml ([derating]).
type Derating struct {
	ResistorPower    float64 // default 0.60
	CapacitorVoltage float64 // default 0.80
	DiodeCurrent     float64 // default 0.80
	LEDCurrent       float64 // default 0.80
	InductorCurrent  float64 // default 0.80
	FuseCurrent      float64 // default 0.75
	SupplyCurrent    float64 // default 0.90 (voltage sources)
}

// DefaultDerating returns the default limits.
func DefaultDerating() Derating {
	return Derating{ResistorPower: 0.60, CapacitorVoltage: 0.80, DiodeCurrent: 0.80, LEDCurrent: 0.80,
		InductorCurrent: 0.80, FuseCurrent: 0.75, SupplyCurrent: 0.90}
}

// Set sets the limit named by a nodal.toml derating key
// ("resistor-power", "capacitor-voltage", "diode-current", "led-current",
// "inductor-current", "fuse-current", "supply-current") and reports
// whether the key is known.
func (d *Derating) Set(key string, f float64) bool {
	slot := d.slot(key)
	if slot == nil {
		return false
	}
	*slot = f
	return true
}

func (d *Derating) slot(key string) *float64 {
	switch key {
	case "resistor-power":
		return &d.ResistorPower
	case "capacitor-voltage":
		return &d.CapacitorVoltage
	case "diode-current":
		return &d.DiodeCurrent
	case "led-current":
		return &d.LEDCurrent
	case "inductor-current":
		return &d.InductorCurrent
	case "fuse-current":
		return &d.FuseCurrent
	case "supply-current":
		return &d.SupplyCurrent
	}
	return nil
}

// Limit returns the derating limit for a use of a rating (Use.What) by a
// part of kind k, or 0 when none applies.
func (d Derating) Limit(k circuit.Kind, what string) float64 { return d.limit(k, what) }

// limit returns the derating limit for a use of a rating, or 0 when none
// applies.
func (d Derating) limit(k circuit.Kind, what string) float64 {
	def := DefaultDerating()
	pick := func(v, dv float64) float64 {
		if v > 0 {
			return v
		}
		return dv
	}
	switch {
	case k == circuit.Resistor && what == "power":
		return pick(d.ResistorPower, def.ResistorPower)
	case k == circuit.Capacitor && what == "voltage":
		return pick(d.CapacitorVoltage, def.CapacitorVoltage)
	case k == circuit.Diode && what == "current":
		return pick(d.DiodeCurrent, def.DiodeCurrent)
	case k == circuit.LED && what == "current":
		return pick(d.LEDCurrent, def.LEDCurrent)
	case k == circuit.Inductor && what == "current":
		return pick(d.InductorCurrent, def.InductorCurrent)
	case k == circuit.Fuse && what == "current":
		return pick(d.FuseCurrent, def.FuseCurrent)
	case k == circuit.VoltageSource && what == "current":
		return pick(d.SupplyCurrent, def.SupplyCurrent)
	}
	return 0
}

// Use is how much of one rating a part uses at the operating point.
type Use struct {
	What   string    // "power", "current", "voltage" or "reverse voltage"
	Dim    units.Dim // of Value and Rating
	Value  float64   // the magnitude the rating limits
	Rating float64
	Frac   float64 // Value / Rating
}

// Uses lists every rating of p with the use the operating point (v, i,
// pw: the part's voltage, current and power) makes of it. A part with no
// rating has none. A fuse's value is its rated current.
func Uses(p *circuit.Part, v, i, pw float64) []Use {
	var out []Use
	add := func(what string, d units.Dim, val, rating float64) {
		if rating > 0 {
			out = append(out, Use{What: what, Dim: d, Value: val, Rating: rating, Frac: val / rating})
		}
	}
	switch p.Kind {
	case circuit.Diode, circuit.LED:
		add("current", units.Current, math.Max(i, 0), p.RatedCurrent)
		add("reverse voltage", units.Voltage, math.Max(-v, 0), p.RatedVoltage)
		add("power", units.Power, math.Abs(pw), p.RatedPower)
		return out
	case circuit.Fuse:
		add("current", units.Current, math.Abs(i), p.Value)
	}
	add("power", units.Power, math.Abs(pw), p.RatedPower)
	add("current", units.Current, math.Abs(i), p.RatedCurrent)
	add("voltage", units.Voltage, math.Abs(v), p.RatedVoltage)
	return out
}

// overLimit is the use above which a rating counts as exceeded; the
// margin keeps a part sized exactly at its rating from firing on rounding.
const overLimit = 1 + 1e-9

// describe says what a use is, e.g. "R3 dissipates 312 mW, 125 % of its
// 250 mW rating".
func describeUse(p *circuit.Part, u Use) string {
	val, rating, frac := units.Format(u.Value, u.Dim), units.Format(u.Rating, u.Dim), units.FormatPercent(u.Frac)
	switch {
	case u.What == "power":
		return fmt.Sprintf("%s dissipates %s, %s of its %s rating", p.Name, val, frac, rating)
	case u.What == "reverse voltage":
		return fmt.Sprintf("%s is reverse-biased by %s, %s of its %s reverse rating", p.Name, val, frac, rating)
	case u.What == "current" && p.Kind == circuit.VoltageSource:
		return fmt.Sprintf("%s is asked for %s, %s of its %s rating", p.Name, val, frac, rating)
	case u.What == "current":
		return fmt.Sprintf("%s carries %s, %s of its %s rating", p.Name, val, frac, rating)
	case p.Kind == circuit.CurrentSource:
		return fmt.Sprintf("%s must develop %s, %s of its %s compliance voltage", p.Name, val, frac, rating)
	}
	return fmt.Sprintf("%s has %s across it, %s of its %s rating", p.Name, val, frac, rating)
}

// ratingRule makes a rule that reports uses of a rating above 1 for the
// given kinds.
func ratingRule(name, what, doc string, kinds ...circuit.Kind) *Analyzer {
	return &Analyzer{
		Name:     name,
		Severity: diag.Error,
		Requires: []*Analyzer{Solve},
		Doc:      doc,
		Run: func(p *Pass) (any, error) {
			r := op(p)
			if r == nil {
				return nil, nil
			}
			d := p.Design
			for i := range d.Parts {
				q := &d.Parts[i]
				if !hasKind(kinds, q.Kind) {
					continue
				}
				for _, u := range Uses(q, r.V[i], r.I[i], r.P[i]) {
					if u.What == what && u.Frac > overLimit {
						p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: q.Name, Message: describeUse(q, u)})
					}
				}
			}
			return nil, nil
		},
	}
}

func hasKind(ks []circuit.Kind, k circuit.Kind) bool {
	for _, x := range ks {
		if x == k {
			return true
		}
	}
	return false
}

// OverPower reports parts dissipating more than their rated power.
var OverPower = ratingRule("over-power", "power", `a part dissipates more than its rated power
Resistors, diodes and LEDs with a power rating are compared with the power
they absorb at the DC operating point. A part past its power rating
overheats: it can char its board, burn, or fail open or short.`,
	circuit.Resistor, circuit.Diode, circuit.LED)

// OverCurrent reports parts carrying more than their rated current.
var OverCurrent = ratingRule("over-current", "current", `a part carries more than its rated current
LEDs and diodes (forward current), inductors, fuses (their value is their
rated current), wires and switches with a current rating, and voltage
sources asked for more than their rated current. Past its current rating a
part overheats; a fuse may open.`,
	circuit.LED, circuit.Diode, circuit.Inductor, circuit.Fuse, circuit.Wire, circuit.Switch, circuit.VoltageSource)

// OverVoltage reports parts with more than their rated voltage across them.
var OverVoltage = ratingRule("over-voltage", "voltage", `a part has more than its rated voltage across it
Capacitors and resistors with a voltage rating, and current sources beyond
their compliance voltage (rated V on a current source).`,
	circuit.Capacitor, circuit.Resistor, circuit.CurrentSource)

// ReverseVoltage reports diodes and LEDs reverse-biased beyond their
// rated voltage.
var ReverseVoltage = ratingRule("reverse-voltage", "reverse voltage", `a diode or LED is reverse-biased beyond its rated voltage
The rated voltage of a diode or LED is its reverse rating: the most it may
see from cathode to anode.`,
	circuit.Diode, circuit.LED)

// NearRating warns when a part is within its rating but past the usual
// derating limit.
var NearRating = &Analyzer{
	Name:     "near-rating",
	Severity: diag.Warning,
	Requires: []*Analyzer{Solve},
	Doc: `a part is within its rating but past the usual derating limit
Defaults (common practice, set in nodal.toml under [derating]): resistor
power 60 %, capacitor voltage 80 %, diode and LED current 80 %, inductor
current 80 %, fuse current 75 %, supply current 90 %.`,
	Run: func(p *Pass) (any, error) {
		r := op(p)
		if r == nil {
			return nil, nil
		}
		d := p.Design
		for i := range d.Parts {
			q := &d.Parts[i]
			for _, u := range Uses(q, r.V[i], r.I[i], r.P[i]) {
				lim := p.Config.Derating.limit(q.Kind, u.What)
				if lim > 0 && u.Frac > lim*overLimit && u.Frac <= overLimit { // a part exactly at the limit is not past it
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: q.Name, Message: describeUse(q, u) + ", past the " + units.FormatPercent(lim) + " derating limit"})
				}
			}
		}
		return nil, nil
	},
}
