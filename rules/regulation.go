package rules

// regulation.go: the rules for regulators and converters that cannot hold
// their set output: dropout, current limit, an input outside a
// converter's range. What each delivers and draws is Point.SupplyFlow's.

import (
	"fmt"
	"math"

	"nodal/circuit"
	"nodal/diag"
	"nodal/solve"
	"nodal/units"
	"nodal/worst"
)

// supplyRule makes a rule that reports each regulator or converter for
// which nominal returns a message at the operating point, or, when it
// returns none there, corner does at the corners of the box of tolerances
// and temperature (when every corner was solved: worst.Result.Supplies).
func supplyRule(name string, sev diag.Severity, doc string, nominal func(d *circuit.Design, q *circuit.Part, s Flow, g solve.Region) string,
	corner func(d *circuit.Design, q *circuit.Part, sr *worst.SupplyRange, where func(worst.Corner) string) string) *Analyzer {
	return &Analyzer{
		Name:     name,
		Severity: sev,
		Requires: []*Analyzer{Solve, WorstCase},
		Doc:      doc,
		Run: func(p *Pass) (any, error) {
			r := op(p)
			if r == nil {
				return nil, nil
			}
			d, pt := p.Design, solved(p).Point()
			said := map[circuit.PartID]bool{}
			for _, mp := range r.Multi {
				q := &d.Parts[mp.Part]
				s, ok := pt.SupplyFlow(q, mp.Part)
				if !ok || q.Conv == nil || !s.HasInput || s.VoltageUnknown {
					continue
				}
				if msg := nominal(d, q, s, mp.Region); msg != "" {
					said[mp.Part] = true
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q), Message: msg})
				}
			}
			w := worstOf(p).R
			if w == nil {
				return nil, nil
			}
			where := func(c worst.Corner) string { return worst.Describe(d, w.Params, c, w.RangeT, worstNames) }
			for k := range w.Supplies {
				sr := &w.Supplies[k]
				q := &d.Parts[sr.Part]
				if said[sr.Part] || q.Conv == nil || math.IsInf(sr.InLow, 0) {
					continue
				}
				if msg := corner(d, q, sr, where); msg != "" {
					p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q), Message: msg})
				}
			}
			return nil, nil
		},
	}
}

func fmtV(v float64) string { return units.Format(v, units.Voltage) }
func fmtA(v float64) string { return units.Format(v, units.Current) }

// Dropout reports linear regulators whose input is too low to hold their
// output.
var Dropout = supplyRule("dropout", diag.Error, `a regulator's input is too low to hold its output
A linear regulator holds its output at its set voltage only while its
input is at least its dropout voltage above the output (common practice,
from its datasheet). Below that its output tracks the input, less the
dropout, and every part it feeds sees less than it was designed for. The
finding gives the input the regulator has and the input it needs, and the
output it falls to; where the design has tolerances or an ambient range,
a regulator that regulates at nominal values but drops out at a corner of
them is reported with that corner.`, func(d *circuit.Design, q *circuit.Part, s Flow, g solve.Region) string {
	if g != solve.InDropout {
		return ""
	}
	return fmt.Sprintf("%s %s is in dropout: its input is %s above common, it needs %s (%s set + %s dropout), so its output falls to %s",
		q.Kind, d.NameOf(q), fmtV(s.VIn), fmtV(q.Value+q.Conv.Dropout), fmtV(q.Value), fmtV(q.Conv.Dropout), fmtV(s.VOut))
}, func(d *circuit.Design, q *circuit.Part, sr *worst.SupplyRange, where func(worst.Corner) string) string {
	if sr.Region != solve.InDropout {
		return ""
	}
	return fmt.Sprintf("%s %s falls into dropout with %s: its input is %s above common, it needs %s (%s set + %s dropout), so its output falls to %s",
		q.Kind, d.NameOf(q), where(sr.Out), fmtV(sr.OutIn), fmtV(sr.OutSet+q.Conv.Dropout), fmtV(sr.OutSet), fmtV(q.Conv.Dropout), fmtV(sr.OutOut))
})

// CurrentLimit reports linear regulators held at their current limit.
var CurrentLimit = supplyRule("current-limit", diag.Error, `a regulator is held at its current limit
A linear regulator given a limit (limit 1.5 A) delivers at most that
current: a load that asks for more pulls its output below its set
voltage, and the regulator runs at the limit, hot. The finding gives the
limit and the output it falls to, at nominal values or at the corner of
the tolerances and ambient range where it happens.`, func(d *circuit.Design, q *circuit.Part, s Flow, g solve.Region) string {
	if g != solve.Limiting {
		return ""
	}
	return fmt.Sprintf("%s %s is held at its %s current limit: its load asks for more, so its output falls to %s of its %s",
		q.Kind, d.NameOf(q), fmtA(q.Conv.Limit), fmtV(s.VOut), fmtV(q.Value))
}, func(d *circuit.Design, q *circuit.Part, sr *worst.SupplyRange, where func(worst.Corner) string) string {
	if sr.Region != solve.Limiting {
		return ""
	}
	return fmt.Sprintf("%s %s is held at its %s current limit with %s: its load asks for more, so its output falls to %s",
		q.Kind, d.NameOf(q), fmtA(q.Conv.Limit), where(sr.Out), fmtV(sr.OutOut))
})

// InputRange reports converters whose input lies outside their input
// range.
var InputRange = supplyRule("input-range", diag.Error, `a converter's input is outside its input range
A switching converter regulates only over the input range its datasheet
gives (input 6 V to 28 V). nodal models it as still holding its set
output, so the operating point downstream is what the design intends, not
what the board will do: below the range a converter drops out or stops,
above it it can be damaged. The finding gives the input and the range, at
nominal values or at the corner of the tolerances and ambient range where
the input leaves it.`, func(d *circuit.Design, q *circuit.Part, s Flow, _ solve.Region) string {
	return outOfRange(d, q, s.VIn, s.VIn, "", "")
}, func(d *circuit.Design, q *circuit.Part, sr *worst.SupplyRange, where func(worst.Corner) string) string {
	return outOfRange(d, q, sr.InLow, sr.InHigh, " with "+where(sr.LowAt), " with "+where(sr.HighAt))
})

// outOfRange words converter q's input leaving its input range: low, the
// lowest input, below it (at lowAt, a phrase or ""), else high, the
// highest, above it (at highAt); "" while both are inside.
func outOfRange(d *circuit.Design, q *circuit.Part, low, high float64, lowAt, highAt string) string {
	c := q.Conv
	if c.InHigh <= 0 {
		return ""
	}
	tol := 1e-9 * c.InHigh
	switch {
	case low < c.InLow-tol:
		return fmt.Sprintf("%s %s has %s at its input%s, below its %s to %s input range: it cannot hold its %s output there",
			q.Kind, d.NameOf(q), fmtV(low), lowAt, fmtV(c.InLow), fmtV(c.InHigh), fmtV(q.Value))
	case high > c.InHigh+tol:
		return fmt.Sprintf("%s %s has %s at its input%s, above its %s to %s input range: past its datasheet's limit it may be damaged",
			q.Kind, d.NameOf(q), fmtV(high), highAt, fmtV(c.InLow), fmtV(c.InHigh))
	}
	return ""
}

// Backfed reports regulators and converters whose output the rest of the
// circuit holds above their set voltage.
var Backfed = supplyRule("back-fed", diag.Warning, `a regulator's or converter's output is held above its set voltage
A linear regulator only sources current, and nodal takes a converter to
do the same (most do). Where the rest of the circuit holds its output
above its set voltage (another supply on the same rail, a pull-up to a
higher rail) it delivers nothing, and nodal solves it so: no current out,
only its quiescent current from its input. The finding gives the output
and the set voltage. A regulator whose output is pulled above its input
can be damaged by the reverse current; check its datasheet.`, func(d *circuit.Design, q *circuit.Part, s Flow, g solve.Region) string {
	if g != solve.Backfed {
		return ""
	}
	return fmt.Sprintf("%s %s is back-fed: the rest of the circuit holds its output at %s, above its %s set voltage, so it delivers nothing",
		q.Kind, d.NameOf(q), fmtV(s.VOut), fmtV(q.Value))
}, func(d *circuit.Design, q *circuit.Part, sr *worst.SupplyRange, where func(worst.Corner) string) string {
	if sr.Region != solve.Backfed {
		return ""
	}
	return fmt.Sprintf("%s %s is back-fed with %s: the rest of the circuit holds its output at %s, above its set voltage, so it delivers nothing",
		q.Kind, d.NameOf(q), where(sr.Out), fmtV(sr.OutOut))
})
