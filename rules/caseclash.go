package rules

import (
	"strings"

	"nodal/diag"
)

// CaseClash reports names that differ only in letter case.
var CaseClash = &Analyzer{
	Name:     "case-clash",
	Severity: diag.Warning,
	Doc: `two names that differ only in letter case
Names are case-sensitive, so Vin and vin are two nets (or two parts). That
is rarely meant.`,
	Run: func(p *Pass) (any, error) {
		d := p.Design
		type first struct {
			name string
			pos  diag.Pos
		}
		nets := make(map[string]first, len(d.Nets))
		for i := range d.Nets {
			n := &d.Nets[i]
			if n.Pins == 0 && !n.Port {
				continue
			}
			key := strings.ToLower(n.Name)
			if f, ok := nets[key]; ok && f.name != n.Name {
				p.Report(diag.Diagnostic{Pos: n.Pos, End: n.End, Subject: n.Name, Message: "net " + netName(d, i32(i)) + " differs from net " + f.name + " only in letter case; names are case-sensitive, so they are two nets",
					Related: []diag.Related{{Pos: f.pos, Message: "net " + f.name + " is first used here"}}})
				continue
			}
			if _, ok := nets[key]; !ok {
				nets[key] = first{n.Name, n.Pos}
			}
		}
		parts := make(map[string]first, len(d.Parts))
		for i := range d.Parts {
			q := &d.Parts[i]
			key := strings.ToLower(q.Name)
			if f, ok := parts[key]; ok && f.name != q.Name {
				p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: q.Name, Message: "part " + q.Name + " differs from part " + f.name + " only in letter case",
					Related: []diag.Related{{Pos: f.pos, Message: f.name + " is here"}}})
				continue
			}
			if _, ok := parts[key]; !ok {
				parts[key] = first{q.Name, q.Pos}
			}
		}
		return nil, nil
	},
}
