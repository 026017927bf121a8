package rules

import (
	"strings"

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
		for _, d := range p.Build.Diags {
			if d.Rule == "floating-net" { // a block pin nothing inside touches
				p.Report(d)
			}
		}
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
		shared := sharedFloating(d, t.Floating)
		k := 0
		for _, n := range t.Floating {
			net := &d.Nets[n]
			if p.Build.Unsure[net.Name] {
				continue // a line that did not parse may use it too
			}
			if g, ok := shared[net.Pos]; ok {
				if g.nets[0] == n {
					reportShared(p, g, owner)
				}
				continue
			}
			msg := "net " + netName(d, n) + " touches only one pin"
			if o, ok := owner[n]; ok {
				part := &d.Parts[o.part]
				msg += " (pin " + part.Kind.Info().Pins[o.pin] + " of " + part.Name + ")"
			}
			// Suggestions compare against every net; keep that bounded.
			s := ""
			if k < 100 {
				s = diag.Suggest(net.Name, names)
			}
			k++
			if s != "" {
				msg += "; did you mean " + s + "?"
			} else {
				msg += "; connect it, or declare it with port if it leaves the file"
			}
			p.Report(diag.Diagnostic{Pos: net.Pos, End: net.End, Message: msg, Subject: net.Name, Related: relatedForNet(p, n)})
		}
		return nil, nil
	},
}

// floatGroup is one net of a block that floats in every instance.
type floatGroup struct {
	block string
	local string // the net's name inside the block
	nets  []circuit.NetID
}

// sharedFloating groups floating nets local to instances by the place they
// are written. When every instance of the block leaves that net floating,
// the group is reported once, at the block.
func sharedFloating(d *circuit.Design, floating []circuit.NetID) map[diag.Pos]*floatGroup {
	groups := map[diag.Pos]*floatGroup{}
	for _, n := range floating {
		net := &d.Nets[n]
		if net.Inst < 0 {
			continue
		}
		g := groups[net.Pos]
		if g == nil {
			in := &d.Instances[net.Inst]
			g = &floatGroup{block: in.Block, local: strings.TrimPrefix(net.Name, in.Path+".")}
			groups[net.Pos] = g
		}
		g.nets = append(g.nets, n)
	}
	if len(groups) == 0 {
		return nil
	}
	uses := map[string]int{}
	for i := range d.Instances {
		uses[d.Instances[i].Block]++
	}
	for pos, g := range groups {
		if len(g.nets) < 2 || len(g.nets) != uses[g.block] {
			delete(groups, pos)
		}
	}
	return groups
}

func reportShared(p *Pass, g *floatGroup, owner map[circuit.NetID]pinRef) {
	d := p.Design
	first := &d.Nets[g.nets[0]]
	msg := "net " + g.local + " of block " + g.block + " touches only one pin in every instance (" + netList(d, g.nets, 4) + ")"
	if o, ok := owner[g.nets[0]]; ok {
		part := &d.Parts[o.part]
		in := &d.Instances[first.Inst]
		msg += ": " + strings.TrimPrefix(part.Name, in.Path+".") + " " + part.Kind.Info().Pins[o.pin]
	}
	msg += "; connect it inside the block, or make it a pin of the block"
	dg := diag.Diagnostic{Pos: first.Pos, End: first.End, Message: msg, Subject: first.Name}
	for i, n := range g.nets {
		if i == 8 {
			break
		}
		in := &d.Instances[d.Nets[n].Inst]
		dg.Related = append(dg.Related, diag.Related{Pos: in.Pos, End: in.End, Message: "in " + in.Path + " (block " + in.Block + ")"})
	}
	p.Report(dg)
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
