package review

// stress.go: parts whose use of a rating moved, and nets whose voltage
// moved, between two operating points.

import (
	"sort"

	"nodal/output/report"
)

// worst returns a part's worst use of a rating, or nil when it has none.
func worst(p *report.Part) *Use {
	if p == nil || p.Worst < 0 || p.Worst >= len(p.Ratings) {
		return nil
	}
	u := p.Ratings[p.Worst]
	return &u
}

// compareParts lists the parts whose worst use moved by more than the
// threshold, worst first. A nil table is a design without parts: every
// rated part of the other counts from zero.
func compareParts(base, head *report.Table, th Thresholds) []PartChange {
	before := map[string]*report.Part{}
	var order []string
	if base != nil {
		for i := range base.Parts {
			p := &base.Parts[i]
			before[p.Name] = p
			order = append(order, p.Name)
		}
	}
	after := map[string]*report.Part{}
	if head == nil {
		head = &report.Table{}
	}
	for i := range head.Parts {
		p := &head.Parts[i]
		after[p.Name] = p
		if before[p.Name] == nil {
			order = append(order, p.Name)
		}
	}
	var out []PartChange
	for _, name := range order {
		b, a := before[name], after[name]
		pc := PartChange{Name: name, Before: worst(b), After: worst(a)}
		if a != nil {
			pc.Kind = a.Kind.String()
		} else {
			pc.Kind = b.Kind.String()
		}
		if pc.Before == nil && pc.After == nil {
			continue
		}
		if d := pc.Delta(); d > th.Use || -d > th.Use {
			out = append(out, pc)
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		di, dj := out[i].Delta(), out[j].Delta()
		if di != dj {
			return di > dj
		}
		return out[i].Name < out[j].Name
	})
	return out
}

// compareNets lists the nets of both revisions whose voltage moved past
// the threshold, largest move first.
func compareNets(base, head *report.Table, th Thresholds) []NetChange {
	before := map[string]float64{}
	seen := map[string]bool{}
	for _, n := range base.Nets {
		before[n.Name], seen[n.Name] = n.Voltage, true
	}
	var out []NetChange
	for _, n := range head.Nets {
		if !seen[n.Name] {
			continue
		}
		if th.netMoved(before[n.Name], n.Voltage) {
			out = append(out, NetChange{Name: n.Name, Before: before[n.Name], After: n.Voltage})
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		di, dj := abs(out[i].After-out[i].Before), abs(out[j].After-out[j].Before)
		if di != dj {
			return di > dj
		}
		return out[i].Name < out[j].Name
	})
	return out
}
