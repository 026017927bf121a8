package report

// worst.go: the worst case over tolerances and temperature beside the
// nominal operating point: every net's range and every part's worst use.

import (
	"bufio"
	"math"
	"sort"

	"nodal/circuit"
	"nodal/output"
	"nodal/rules"
	"nodal/units"
	"nodal/worst"
)

// AddWorst adds w's net ranges and each part's worst use to t, made for
// design d under derating der. A nil w adds nothing.
func (t *Table) AddWorst(d *circuit.Design, w *worst.Result, der rules.Derating) {
	if w == nil {
		return
	}
	t.RangeCorners = w.Corners
	t.HasRanges = true
	t.DriveRanges = len(d.DriveRanges) > 0
	byName := make(map[string]circuit.NetID, len(d.Nets))
	for i := range d.Nets {
		byName[d.NetName(circuit.NetID(i))] = circuit.NetID(i)
	}
	scale := 0.0
	for i := range w.NetHigh {
		scale = math.Max(scale, math.Max(math.Abs(w.NetLow[i]), math.Abs(w.NetHigh[i])))
	}
	for k := range t.Nets {
		n := &t.Nets[k]
		if id, ok := byName[n.Name]; ok && !n.Undetermined && int(id) < len(w.NetLow) {
			// The nominal voltage is shown with rounding noise cleared
			// (rules.Clean); the range holds it whatever the noise.
			lo, hi := rules.Clean(w.NetLow[id], scale, rules.FloorV), rules.Clean(w.NetHigh[id], scale, rules.FloorV)
			n.Low, n.High, n.HasRange = math.Min(lo, n.Voltage), math.Max(hi, n.Voltage), true
		}
	}
	parts := make(map[string]circuit.PartID, len(d.Parts))
	for i := range d.Parts {
		parts[d.PartName(circuit.PartID(i))] = circuit.PartID(i)
	}
	for k := range t.Parts {
		p := &t.Parts[k]
		i, ok := parts[p.Name]
		if !ok || int(i) >= len(w.Worst) || w.Worst[i] == nil {
			continue
		}
		for _, c := range w.Worst[i] {
			if !p.HasWorst || c.Frac > p.WorstUse {
				p.WorstUse, p.HasWorst = c.Frac, true
				p.WorstAt = worst.Describe(d, w.Params, c.At, w.RangeT, 4)
				if !c.Confirmed {
					p.WorstAt += " (first order)"
				}
			}
		}
	}
}

// writeWorst lists the parts whose worst use over tolerances and
// temperature passes their nominal use, worst first, with the corner.
func writeWorst(bw *bufio.Writer, t *Table) {
	var ps []*Part
	for i := range t.Parts {
		p := &t.Parts[i]
		// A rise below a millionth of the rating is rounding, not a worst
		// case worth a line.
		if u, ok := p.Use(); ok && p.HasWorst && p.WorstUse > u+1e-6 {
			ps = append(ps, p)
		}
	}
	if len(ps) == 0 {
		return
	}
	sort.SliceStable(ps, func(a, b int) bool { return ps[a].WorstUse > ps[b].WorstUse })
	bw.WriteString("\nWorst case over " + t.box() + "\n")
	rows := [][]string{{"part", "nominal", "worst", "at"}}
	for _, p := range ps {
		u, _ := p.Use()
		rows = append(rows, []string{output.LineSafe(p.Name), units.FormatPercent(u), units.FormatPercent(p.WorstUse), p.WorstAt})
	}
	writeColumns(bw, rows, []bool{false, true, true, false}, nil)
}

// box names what the worst case varies: the tolerances and the
// temperature, and the ports' drive ranges where a design has any.
func (t *Table) box() string {
	if t.DriveRanges {
		return "tolerances, drive ranges and temperature"
	}
	return "tolerances and temperature"
}
