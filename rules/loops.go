package rules

import (
	"fmt"
	"slices"
	"strings"

	"nodal/circuit"
	"nodal/diag"
	"nodal/topology"
	"nodal/units"
)

// SourceLoop reports loops made of voltage sources, supplies' outputs and
// ideal shorts alone.
var SourceLoop = &Analyzer{
	Name:     "source-loop",
	Severity: diag.Error,
	Requires: []*Analyzer{Topology},
	Doc: `a loop of voltage sources and ideal shorts
Voltage sources, regulators' and converters' outputs, wires, closed switches,
and inductors and fuses without dcr all fix the voltage across themselves at
DC. Around a loop made only of them
Kirchhoff's voltage law decides everything: if their voltages do not sum to
zero it cannot hold (error); if they do, the current circulating in the loop
is undefined (warning). Add a resistance (dcr, a resistor) or remove one of
the sources.`,
	Run: func(p *Pass) (any, error) {
		t := topo(p)
		d := p.Design
		for i := range t.Loops {
			l := &t.Loops[i]
			closing := &d.Parts[l.Steps[0].Part]
			diagn := diag.Diagnostic{Pos: closing.Pos, End: closing.End, Subject: d.NameOf(closing)}
			path := loopPath(d, l)
			what := loopParts(d, l)
			if l.Balanced() {
				diagn.Severity = diag.Warning
				diagn.Message = what + " form a loop whose voltages sum to zero, so the current circulating in it is undefined: " + path
			} else {
				diagn.Severity = diag.Error
				diagn.Message = fmt.Sprintf("%s form a loop whose voltages sum to %s, not zero, so Kirchhoff's voltage law cannot hold: %s", what, units.Format(l.Sum, units.Voltage), path)
			}
			for _, s := range l.Steps[1:] {
				q := &d.Parts[s.Part]
				diagn.Related = append(diagn.Related, diag.Related{Pos: q.Pos, End: q.End, Message: d.NameOf(q) + " is in the loop"})
			}
			p.Report(diagn)
		}
		if t.LoopsLeft > 0 {
			first := &d.Parts[t.Loops[0].Steps[0].Part]
			p.Report(diag.Diagnostic{Pos: first.Pos, End: first.End, Severity: diag.Error, Subject: d.NameOf(first),
				Message: fmt.Sprintf("%d more loops of voltage sources and shorts were found and not listed", t.LoopsLeft)})
		}
		return nil, nil
	},
}

// loopParts says what the loop l is made of: "voltage sources and
// shorts", unless the outputs of supplies that convert from another rail
// (regulators, converters) are among its parts; then they are named by
// kind, in the order of the kinds table, whatever the order of the
// statements: "regulator outputs and voltage sources".
func loopParts(d *circuit.Design, l *topology.Loop) string {
	var supplies []circuit.Kind
	sources, shorts := false, false
	for _, s := range l.Steps {
		q := &d.Parts[s.Part]
		switch {
		case q.Kind.Info().Converts != circuit.NoConversion:
			if !slices.Contains(supplies, q.Kind) {
				supplies = append(supplies, q.Kind)
			}
		case q.IsShort():
			shorts = true
		default:
			sources = true
		}
	}
	if len(supplies) == 0 {
		return "voltage sources and shorts"
	}
	slices.Sort(supplies)
	var words []string
	for _, k := range supplies {
		words = append(words, k.String()+" outputs")
	}
	if sources {
		words = append(words, "voltage sources")
	}
	if shorts {
		words = append(words, "shorts")
	}
	if len(words) == 1 {
		return words[0]
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}

// loopPath writes "VIN (12 V) → L1 → W1 → back to vin".
func loopPath(d *circuit.Design, l *topology.Loop) string {
	var b strings.Builder
	for i, s := range l.Steps {
		if i > 0 {
			b.WriteString(" → ")
		}
		q := &d.Parts[s.Part]
		b.WriteString(d.NameOf(q))
		if q.DC().Model == circuit.VoltageDrop {
			b.WriteString(" (" + units.Format(q.Value, units.Voltage) + ")")
		}
	}
	b.WriteString(" → back to " + netName(d, l.Steps[0].From))
	return b.String()
}
