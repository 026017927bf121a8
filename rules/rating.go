package rules

// rating.go: the rating rules, which compare the operating point with the
// ratings written on each part.

import (
	"nodal/circuit"
	"nodal/diag"
	"nodal/units"
)

// Derating holds the fractions of a rating past which near-rating warns,
// by nodal.toml [derating] key. A key not set takes the default the kind
// table declares with the rating (common practice, not a standard). The
// zero value holds the defaults.
type Derating struct {
	set map[string]float64
	// ResistorKnee and ResistorZero are a resistor's power derating with
	// temperature, in °C, for resistors that give none of their own
	// (derate … to); zero takes DefaultKnee and DefaultZero.
	ResistorKnee, ResistorZero float64
}

// DefaultDerating returns the default limits.
func DefaultDerating() Derating { return Derating{} }

// DeratingDefaults returns every derating key the kind table declares
// with its default, in the order of the table.
func DeratingDefaults() (keys []string, defaults map[string]float64) {
	defaults = map[string]float64{}
	for _, k := range circuit.Kinds() {
		for _, r := range k.Info().Ratings {
			if r.Derating == "" {
				continue
			}
			if _, dup := defaults[r.Derating]; !dup {
				keys = append(keys, r.Derating)
			}
			defaults[r.Derating] = r.Default
		}
	}
	return keys, defaults
}

// Set sets the limit named by a nodal.toml derating key ("resistor-power",
// "fuse-current", …: the keys DeratingDefaults lists) and reports whether
// the key is known.
func (d *Derating) Set(key string, f float64) bool {
	if _, def := DeratingDefaults(); def[key] == 0 {
		return false
	}
	if d.set == nil {
		d.set = map[string]float64{}
	}
	d.set[key] = f
	return true
}

// limitOf returns the derating limit of rating r, or 0 when none applies.
func (d Derating) limitOf(r *circuit.Rating) float64 {
	if r.Derating == "" {
		return 0
	}
	if f := d.set[r.Derating]; f > 0 {
		return f
	}
	return r.Default
}

// ratingRule makes a rule that reports every use of a rating past the
// rating that the kind table gives to it (Use.Rule), on any kind: a rating
// the language accepts is always judged.
func ratingRule(name, doc string) *Analyzer {
	return &Analyzer{
		Name:     name,
		Severity: diag.Error,
		Requires: []*Analyzer{Solve, Ratings},
		Doc:      doc,
		Run: func(p *Pass) (any, error) {
			if op(p) == nil {
				return nil, nil
			}
			d := p.Design
			for _, f := range judged(p).Flagged {
				if u := f.Use; u.Rule == name && u.Over() {
					q := &d.Parts[f.Part]
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q), Message: Describe(d, q, u)})
				}
			}
			if name == "over-current" {
				reportGroups(p, false) // parallel ideal shorts, judged on their total (unrated.go)
			}
			return nil, nil
		},
	}
}

// OverPower reports parts dissipating more than their rated power.
var OverPower = ratingRule("over-power", `a part dissipates more than its rated power
Every part with a power rating (resistors, diodes, LEDs) is compared with
the power it absorbs at the DC operating point. A part past its power
rating overheats: it can char its board, burn, or fail open or short.`)

// OverCurrent reports parts carrying more than their rated current.
var OverCurrent = ratingRule("over-current", `a part carries more than its rated current
Every part with a current rating: LEDs and diodes (forward current),
inductors, fuses (their value is their rated current), wires and switches,
voltage sources asked for more than their rated current, and batteries
discharged past theirs. Ideal shorts in parallel are judged as a group:
their total current against the sum of their ratings. Past its current
rating a part overheats; a fuse may open.`)

// OverVoltage reports parts with more than their rated voltage across them.
var OverVoltage = ratingRule("over-voltage", `a part has more than its rated voltage across it
Every part with a voltage rating: capacitors, resistors, fuses, switches
(open or closed), and current sources beyond their compliance voltage
(rated V on a current source). A diode's or LED's rated voltage is its
reverse rating, judged by reverse-voltage.`)

// ReverseVoltage reports diodes and LEDs reverse-biased beyond their
// rated voltage.
var ReverseVoltage = ratingRule("reverse-voltage", `a diode or LED is reverse-biased beyond its rated voltage
The rated voltage of a diode or LED is its reverse rating: the most it may
see from cathode to anode. A diode given a breakdown voltage (breakdown
5.1 V at 5 mA: a clamp or reference diode) is meant to conduct in reverse:
while it does, its current rating limits the reverse current and its power
rating the power, and both are judged here, so a breakdown within them is
no finding.`)

// NearRating warns when a part is within its rating but past the usual
// derating limit.
var NearRating = &Analyzer{
	Name:     "near-rating",
	Severity: diag.Warning,
	Requires: []*Analyzer{Solve, WorstCase, Ratings},
	Doc: `a part is within its rating but past the usual derating limit
Defaults (common practice, set in nodal.toml under [derating]): resistor
power 60 %, capacitor voltage 80 %, diode and LED current 80 %, inductor
current 80 %, fuse current 75 %, supply current 90 %, regulator and
converter output current 80 %, regulator power 60 %. A part within the
limit at nominal but past it at the worst corner of its tolerances and
ambient temperature gets the warning too, naming the corner.`,
	Run: func(p *Pass) (any, error) {
		if op(p) == nil {
			return nil, nil
		}
		d, flagged := p.Design, judged(p).Flagged
		reportNominal := func(f PartUse) {
			if u := f.Use; u.Derated() {
				q := &d.Parts[f.Part]
				p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q), Message: Describe(d, q, u) + ", past the " + units.FormatPercent(u.Limit) + " derating limit"})
			}
		}
		if worstOf(p).R == nil {
			for _, f := range flagged {
				reportNominal(f)
			}
			reportGroups(p, true)
			return nil, nil
		}
		for i := range d.Parts {
			q := &d.Parts[i]
			for len(flagged) > 0 && flagged[0].Part == circuit.PartID(i) {
				reportNominal(flagged[0])
				flagged = flagged[1:]
			}
			// The worst case too: within the limit at nominal, past it (but
			// within the rating) at the worst corner.
			nominal, worstUse, cases := worstUses(p, i)
			for k, u := range worstUse {
				if u.Derated() && !nominal[k].Derated() && !nominal[k].Over() {
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: p.Design.NameOf(q), Message: Describe(p.Design, q, u) + ", past the " + units.FormatPercent(u.Limit) + " derating limit," + cornerText(p, cases[k])})
				}
			}
		}
		reportGroups(p, true) // parallel ideal shorts, judged on their total (unrated.go)
		return nil, nil
	},
}
