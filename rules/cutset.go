package rules

import (
	"fmt"
	"strings"

	"nodal/diag"
	"nodal/units"
)

// CurrentCutset reports sets of nets fed only by current sources whose
// currents do not balance.
var CurrentCutset = &Analyzer{
	Name:     "current-cutset",
	Severity: diag.Error,
	Requires: []*Analyzer{Topology},
	Doc: `current sources that cannot all be obeyed
When a set of nets is joined to the rest of the circuit only through
current sources (and capacitors or open switches, which carry no DC
current), those sources alone decide the current into the set. If it is not
zero, Kirchhoff's current law cannot hold: two current sources in series
with different currents, or a current source feeding a node that only
capacitors touch.`,
	Run: func(p *Pass) (any, error) {
		if p.Build.Incomplete {
			return nil, nil
		}
		t := topo(p)
		d := p.Design
		for _, c := range t.Cutsets {
			first := &d.Nets[c.Nets[0]]
			var srcs []string
			dg := diag.Diagnostic{Pos: first.Pos, End: first.End, Subject: d.NetNameOf(first)}
			inSet := map[int32]bool{}
			for _, n := range c.Nets {
				inSet[int32(n)] = true
			}
			for _, s := range c.Sources {
				q := &d.Parts[s]
				dir := "out"
				if _, to := q.Ends(); inSet[int32(to)] {
					dir = "in"
				}
				srcs = append(srcs, fmt.Sprintf("%s %s %s", d.NameOf(q), units.Format(q.Value, units.Current), dir))
				dg.Related = append(dg.Related, diag.Related{Pos: q.Pos, End: q.End, Message: d.NameOf(q) + " crosses the cut"})
			}
			which, it := "net "+netList(d, c.Nets, 8)+" is", "it"
			if len(c.Nets) > 1 {
				which, it = "nets "+netList(d, c.Nets, 8)+" are", "them"
			}
			dg.Message = fmt.Sprintf("%s reached only through current sources (%s): the currents into %s sum to %s, not zero, so Kirchhoff's current law cannot hold", which, strings.Join(srcs, ", "), it, units.Format(c.Net, units.Current))
			p.Report(dg)
		}
		return nil, nil
	},
}
