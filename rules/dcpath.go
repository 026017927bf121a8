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
		// A set with unbalanced current sources is reported by
		// current-cutset, which says more.
		cut := map[int32]bool{}
		for _, c := range t.Cutsets {
			cut[t.DCGroup[c.Nets[0]]] = true
		}
		for _, is := range t.NoDCPath {
			if is.AllFloating || cut[t.DCGroup[is.Nets[0]]] {
				continue // floating-net or current-cutset has said it
			}
			first := &d.Nets[is.Nets[0]]
			what, them, their := "net "+netList(d, is.Nets, 8)+" has", "it", "its"
			if len(is.Nets) > 1 {
				what, them, their = "nets "+netList(d, is.Nets, 8)+" have", "them", "their"
			}
			p.Report(diag.Diagnostic{Pos: first.Pos, End: first.End, Subject: d.NetNameOf(first),
				Message: fmt.Sprintf("%s no DC path to ground %s: only capacitors, current sources or open switches reach %s, so %s DC voltage is undefined", what, netName(d, d.Ground), them, their)})
		}
		return nil, nil
	},
}
