package rules

// rating.go: the rating rules, which compare the operating point with the
// ratings written on each part.

import (
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

// ratingRule makes a rule that reports every use of a rating named what
// (Use.What) past the rating, on any kind: a rating the language accepts
// is always judged.
func ratingRule(name, what, doc string) *Analyzer {
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
			d, pt := p.Design, NewPoint(r)
			for i := range d.Parts {
				q := &d.Parts[i]
				for _, u := range Judge(q, pt.Part(circuit.PartID(i)), p.Config.Derating) {
					if u.What == what && u.Over() {
						p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: q.Name, Message: Describe(q, u)})
					}
				}
			}
			return nil, nil
		},
	}
}

// OverPower reports parts dissipating more than their rated power.
var OverPower = ratingRule("over-power", "power", `a part dissipates more than its rated power
Every part with a power rating (resistors, diodes, LEDs) is compared with
the power it absorbs at the DC operating point. A part past its power
rating overheats: it can char its board, burn, or fail open or short.`)

// OverCurrent reports parts carrying more than their rated current.
var OverCurrent = ratingRule("over-current", "current", `a part carries more than its rated current
Every part with a current rating: LEDs and diodes (forward current),
inductors, fuses (their value is their rated current), wires and switches,
and voltage sources asked for more than their rated current. Past its
current rating a part overheats; a fuse may open.`)

// OverVoltage reports parts with more than their rated voltage across them.
var OverVoltage = ratingRule("over-voltage", "voltage", `a part has more than its rated voltage across it
Every part with a voltage rating: capacitors, resistors, fuses, switches
(open or closed), and current sources beyond their compliance voltage
(rated V on a current source). A diode's or LED's rated voltage is its
reverse rating, judged by reverse-voltage.`)

// ReverseVoltage reports diodes and LEDs reverse-biased beyond their
// rated voltage.
var ReverseVoltage = ratingRule("reverse-voltage", "reverse voltage", `a diode or LED is reverse-biased beyond its rated voltage
The rated voltage of a diode or LED is its reverse rating: the most it may
see from cathode to anode.`)

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
		d, pt := p.Design, NewPoint(r)
		for i := range d.Parts {
			q := &d.Parts[i]
			for _, u := range Judge(q, pt.Part(circuit.PartID(i)), p.Config.Derating) {
				if u.Derated() {
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: q.Name, Message: Describe(q, u) + ", past the " + units.FormatPercent(u.Limit) + " derating limit"})
				}
			}
		}
		return nil, nil
	},
}
