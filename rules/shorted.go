package rules

import (
	"nodal/circuit"
	"nodal/diag"
	"nodal/units"
)

// ShortedPart reports parts whose two pins are on one net.
var ShortedPart = &Analyzer{
	Name:     "shorted-part",
	Severity: diag.Warning,
	Requires: []*Analyzer{Topology},
	Doc: `a part with both pins on the same net
A part shorted across itself does nothing (warning). A voltage source
shorted across itself is an error: no current can make its voltage hold.`,
	Run: func(p *Pass) (any, error) {
		d := p.Design
		for _, id := range topo(p).Shorted {
			q := &d.Parts[id]
			a, _ := q.Ends()
			net := netName(d, a)
			pins := "both pins"
			if ki := q.Kind.Info(); q.Multi() {
				// A regulator's out and common.
				pins = "its " + ki.Pins[ki.Ends[0]] + " and " + ki.Pins[ki.Ends[1]] + " pins"
			}
			if q.DC().Model == circuit.VoltageDrop {
				p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Severity: diag.Error, Subject: d.NameOf(q),
					Message: q.Kind.String() + " " + d.NameOf(q) + " (" + units.Format(q.Value, units.Voltage) + ") has " + pins + " on net " + net + ": it is shorted across itself"})
				continue
			}
			p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q),
				Message: q.Kind.String() + " " + d.NameOf(q) + " has " + pins + " on net " + net + ", so it does nothing"})
		}
		return nil, nil
	},
}
