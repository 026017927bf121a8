package rules

// topology.go: the pass that runs package topology once per design, and
// helpers the wiring rules share.

import (
	"fmt"
	"strings"

	"nodal/circuit"
	"nodal/topology"
)

// Topology computes the graph checks; it reports nothing itself. Its
// result is a *topology.Result.
var Topology = &Analyzer{
	Name: "topology",
	Doc:  "graph analysis shared by the wiring rules",
	Run: func(p *Pass) (any, error) {
		return topology.Analyze(p.Design), nil
	},
}

func topo(p *Pass) *topology.Result { return p.ResultOf[Topology].(*topology.Result) }

// netList names up to max nets, then says how many more.
func netList(d *circuit.Design, nets []circuit.NetID, max int) string {
	var b strings.Builder
	for i, n := range nets {
		if i == max {
			fmt.Fprintf(&b, " and %d more", len(nets)-max)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(netName(d, n))
	}
	return b.String()
}

// netName quotes a net name that is not a plain word.
func netName(d *circuit.Design, n circuit.NetID) string {
	s := d.NetNameOf(&d.Nets[n])
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c == '_' || c == '.' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9') {
			return fmt.Sprintf("%q", s)
		}
	}
	return s
}

func i32(i int) circuit.NetID { return circuit.NetID(i) }
