package rules

import (
	"nodal/circuit"
	"nodal/diag"
)

// FloatingNet reports nets that only one pin touches.
var FloatingNet = &Analyzer{
	Name:     "floating-net",
	Severity: diag.Warning,
	Requires: []*Analyzer{Topology},
	Doc: `a net that touches only one pin
A pin alone on its net carries no current and is usually a misspelt net name
or a forgotten connection. Declare nets that leave the file with "port" to
allow a single pin. A close name elsewhere in the design gets a "did you
mean".`,
	Run: func(p *Pass) (any, error) {
		t := topo(p)
		d := p.Design
		var names []string
		if len(t.Floating) > 0 {
			names = make([]string, 0, len(d.Nets))
			for i := range d.Nets {
				if d.Nets[i].Pins > 1 || d.Nets[i].Port || circuit.NetID(i) == d.Ground {
					names = append(names, d.Nets[i].Name)
				}
			}
		}
		owner := pinOwners(d, t.Floating)
		for k, n := range t.Floating {
			net := &d.Nets[n]
			msg := "net " + netName(d, n) + " touches only one pin"
			if o, ok := owner[n]; ok {
				part := &d.Parts[o.part]
				msg += " (" + part.Name + " " + part.Kind.Info().Pins[o.pin] + ")"
			}
			// Suggestions compare against every net; keep that bounded.
			if k < 100 {
				if s := diag.Suggest(net.Name, names); s != "" {
					msg += "; did you mean " + s + "?"
				}
			}
			if k >= 100 || diag.Suggest(net.Name, names) == "" {
				msg += "; connect it, or declare it with port if it leaves the file"
			}
			p.Reportf(net.Pos, net.End, "%s", msg)
		}
		return nil, nil
	},
}

type pinRef struct {
	part circuit.PartID
	pin  int
}

// pinOwners finds the part and pin on each of the given nets.
func pinOwners(d *circuit.Design, nets []circuit.NetID) map[circuit.NetID]pinRef {
	if len(nets) == 0 {
		return nil
	}
	want := make(map[circuit.NetID]bool, len(nets))
	for _, n := range nets {
		want[n] = true
	}
	out := make(map[circuit.NetID]pinRef, len(nets))
	for i := range d.Parts {
		for j, n := range d.Parts[i].Pins {
			if want[n] {
				out[n] = pinRef{circuit.PartID(i), j}
			}
		}
	}
	return out
}
