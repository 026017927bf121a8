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
	Codes:    []circuit.Code{circuit.CodeFloatingNet}, // a block pin nothing inside touches
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
				// A candidate is a net that something touches: a "did
				// you mean" for a port or ground left unused would point
				// at another dangling name.
				if n := &d.Nets[i]; n.Pins > 1 || n.Pins > 0 && (n.Port || circuit.NetID(i) == d.Ground) {
					names = append(names, d.Nets[i].Name)
				}
			}
		}
		owner := pinOwners(d, t.Floating)
		// A net of a block floats in each instance: the suggestion made
		// for the first is reused, with the instance's own path, so that
		// the repeats stay alike and the last pass merges them.
		type hint struct{ s, in string }
		hints := map[diag.Pos]hint{}
		k := 0
		for _, n := range t.Floating {
			net := &d.Nets[n]
			if p.Build.Unsure[net.Name] {
				continue // a line that did not parse may use it too
			}
			msg := "net " + netName(d, n) + " touches only one pin"
			if o, ok := owner[n]; ok {
				part := &d.Parts[o.part]
				msg += " (pin " + part.Kind.Info().Pins[o.pin] + " of " + part.Name + ")"
			}
			path := ""
			if net.Inst >= 0 {
				path = d.Instances[net.Inst].Path + "."
			}
			s := ""
			if h, ok := hints[net.Pos]; ok && net.Inst >= 0 {
				s = h.s
				if h.in != "" {
					s = path + h.in
				}
			} else if k < 100 { // suggestions compare against every net: keep that bounded
				k++
				s = diag.Suggest(net.Name, names)
				if net.Inst >= 0 {
					h := hint{s: s}
					if path != "" && strings.HasPrefix(s, path) {
						h = hint{in: strings.TrimPrefix(s, path)}
					}
					hints[net.Pos] = h
				}
			}
			switch {
			case s != "":
				msg += "; did you mean " + s + "?"
			case net.Inst >= 0:
				in := &d.Instances[net.Inst]
				msg += "; connect it inside block " + in.Block + ", or make it a pin of the block"
			default:
				msg += "; connect it, or declare it with port if it leaves the file"
			}
			p.Report(diag.Diagnostic{Pos: net.Pos, End: net.End, Message: msg, Subject: net.Name, Fixes: floatingFixes(p, net, s)})
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
		for j, n := range d.Parts[i].Nets() {
			if want[n] {
				out[n] = pinRef{circuit.PartID(i), j}
			}
		}
	}
	return out
}

// floatingFixes are the edits an editor can offer for a net of the top
// level that only one pin touches: the close name, and a port statement
// on a line of its own above the net's first use.
func floatingFixes(p *Pass, net *circuit.Net, suggestion string) []diag.Fix {
	if net.Inst >= 0 || !net.Pos.IsValid() {
		return nil
	}
	var fixes []diag.Fix
	if suggestion != "" && !strings.Contains(suggestion, "\"") && net.End.IsValid() {
		fixes = append(fixes, diag.Fix{Message: "write " + suggestion,
			Edits: []diag.Edit{{Pos: net.Pos, End: net.End, NewText: writtenName(suggestion)}}})
	}
	if pos := p.Fset.Position(net.Pos); pos.IsValid() && !strings.Contains(net.Name, "\"") {
		lineStart := net.Pos - diag.Pos(pos.Column-1)
		fixes = append(fixes, diag.Fix{Message: "declare " + netNameText(net.Name) + " a port (a net that leaves the file)",
			Edits: []diag.Edit{{Pos: lineStart, End: lineStart, NewText: "port " + writtenName(net.Name) + "\n"}}})
	}
	return fixes
}

// writtenName is a net name as a statement writes it: quoted unless it is
// a plain name.
func writtenName(s string) string {
	if s != "" && netNameText(s) == s && (s[0] < '0' || s[0] > '9') && !strings.Contains(s, ".") {
		return s
	}
	return "\"" + s + "\""
}

// netNameText is netName for a name alone.
func netNameText(s string) string {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9') {
			return "\"" + s + "\""
		}
	}
	return s
}
