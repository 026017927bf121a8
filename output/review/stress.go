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

// compareParts lists the parts whose use of a rating moved by more than
// the threshold, at nominal or at the worst case over tolerances, the
// largest rise first. A side without a table is a design without parts:
// every rated part of the other counts from zero.
func compareParts(bs, hs *Side, th Thresholds) []PartChange {
	base, head := bs.Table, hs.Table
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
		pc.WorstBefore = worstUse(bs, name, pc.Before)
		pc.WorstAfter = worstUse(hs, name, pc.After)
		if d, w := pc.Delta(), pc.WorstDelta(); d > th.Use || -d > th.Use || w > th.Use || -w > th.Use {
			out = append(out, pc)
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		di, dj := out[i].rank(), out[j].rank()
		if di != dj {
			return di > dj
		}
		return out[i].Name < out[j].Name
	})
	return out
}

// worstUse is a part's worst-case use on one side: from the worst-case
// analysis, or its nominal use where nothing moves it; 0 without a use.
func worstUse(s *Side, name string, u *Use) float64 {
	if u == nil {
		return 0
	}
	if w, ok := s.WorstUse[name]; ok && w > u.Frac {
		return w
	}
	return u.Frac
}

// netRange is a net's range on one side, or the point v.
func netRange(s *Side, name string, v float64) [2]float64 {
	if r, ok := s.NetRange[name]; ok {
		return [2]float64{min(r[0], v), max(r[1], v)}
	}
	return [2]float64{v, v}
}

// compareNets lists the nets of both revisions whose voltage, or either
// end of its range over tolerances, moved past the threshold, largest
// move first.
func compareNets(bs, hs *Side, th Thresholds) []NetChange {
	base, head := bs.Table, hs.Table
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
		nc := NetChange{Name: n.Name, Before: before[n.Name], After: n.Voltage,
			BeforeRange: netRange(bs, n.Name, before[n.Name]), AfterRange: netRange(hs, n.Name, n.Voltage)}
		if th.netMoved(nc.Before, nc.After) || th.netMoved(nc.BeforeRange[0], nc.AfterRange[0]) || th.netMoved(nc.BeforeRange[1], nc.AfterRange[1]) {
			out = append(out, nc)
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
