package rules

import (
	"fmt"

	"nodal/diag"
)

// NoDCPath reports sections of the circuit whose DC voltage is undefined.
var NoDCPath = &Analyzer{
	Name:     "no-dc-path",
	Severity: diag.Error,
	Requires: []*Analyzer{Topology},
	Doc: `nets with no DC path to ground
Capacitors, current sources and open switches pass no DC current that the
voltage across them could set, so a section reached only through them, or
touching nothing at all, floats: its DC voltage is undefined and the
operating point cannot be solved. Each island is listed once.`,
	Run: func(p *Pass) (any, error) {
		if p.Build.Incomplete {
			return nil, nil
		}
		t := topo(p)
		d := p.Design
		for _, is := range t.NoDCPath {
			if is.AllFloating {
				continue // floating-net has said it
			}
			first := &d.Nets[is.Nets[0]]
			what := "net " + netList(d, is.Nets, 8) + " has"
			if len(is.Nets) > 1 {
				what = "nets " + netList(d, is.Nets, 8) + " have"
			}
			p.Report(diag.Diagnostic{Pos: first.Pos, End: first.End, Related: relatedForNet(p, is.Nets[0]),
				Message: fmt.Sprintf("%s no DC path to ground %s: only capacitors, current sources or open switches reach them, so their DC voltage is undefined", what, netName(d, d.Ground))})
		}
		return nil, nil
	},
}
