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
		var names suggestNames
		if len(t.Floating) > 0 {
			names.d = d
			for i := range d.Nets {
				// A candidate is a net that something touches: a "did
				// you mean" for a port or ground left unused would point
				// at another dangling name.
				if n := &d.Nets[i]; n.Pins > 1 || n.Pins > 0 && (n.Port || circuit.NetID(i) == d.Ground) {
					names.ids = append(names.ids, circuit.NetID(i))
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
			name := d.NetName(n)
			if p.Build.Unsure[name] {
				continue // a line that did not parse may use it too
			}
			msg := "net " + netName(d, n) + " touches only one pin"
			if o, ok := owner[n]; ok {
				part := &d.Parts[o.part]
				msg += " (pin " + part.Kind.Info().Pins[o.pin] + " of " + d.NameOf(part) + ")"
			}
			path := ""
			if net.Inst >= 0 {
				path = d.InstancePath(net.Inst) + "."
			}
			s := ""
			if h, ok := hints[net.Pos]; ok && net.Inst >= 0 {
				s = h.s
				if h.in != "" {
					s = path + h.in
				}
			} else if k < 100 { // suggestions compare against every net: keep that bounded
				k++
				s = names.suggest(name)
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
			p.Report(diag.Diagnostic{Pos: net.Pos, End: net.End, Message: msg, Subject: name, Fixes: floatingFixes(p, net, s)})
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
	if pos := p.Fset.Position(net.Pos); pos.IsValid() && !strings.Contains(net.Local, "\"") {
		lineStart := net.Pos - diag.Pos(pos.Column-1)
		fixes = append(fixes, diag.Fix{Message: "declare " + netNameText(net.Local) + " a port (a net that leaves the file)",
			Edits: []diag.Edit{{Pos: lineStart, End: lineStart, NewText: "port " + writtenName(net.Local) + "\n"}}})
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

// suggestNames are the nets a floating net's name is compared with. Their
// names are built only for nets whose name is within the edit distance in
// length (diag.Suggest), each once, and within a budget of bytes, so that
// nets deep in long-named instances cost no more than their count.
type suggestNames struct {
	d     *circuit.Design
	ids   []circuit.NetID
	built map[circuit.NetID]string
	bytes int
}

// maxSuggestBytes bounds the bytes of names built for suggestions in one
// design; past it no more names are built and the nets left get no "did
// you mean".
const maxSuggestBytes = 16 << 20

// suggest is diag.Suggest of name against the candidates, in their order.
func (sn *suggestNames) suggest(name string) string {
	const maxDist = 2 // diag.Suggest's largest distance
	var near []string
	for _, id := range sn.ids {
		net := &sn.d.Nets[id]
		n := len(net.Local)
		if net.Inst >= 0 {
			n += sn.d.PathLen(net.Inst) + 1
		}
		if n < len(name)-maxDist || n > len(name)+maxDist {
			continue
		}
		s, ok := sn.built[id]
		if !ok {
			if net.Inst >= 0 && sn.bytes+n > maxSuggestBytes {
				continue
			}
			s = sn.d.NetName(id)
			if net.Inst >= 0 {
				if sn.built == nil {
					sn.built = map[circuit.NetID]string{}
				}
				sn.built[id], sn.bytes = s, sn.bytes+n
			}
		}
		near = append(near, s)
	}
	return diag.Suggest(name, near)
}
