package worst

// box.go: the toleranced parameters and a design at a point of their box.

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"nodal/circuit"
	"nodal/units"
)

// Param is one toleranced parameter: a part's value (Part ≥ 0, Tol its
// tolerance), a port's drive over its range (Part ≥ 0, Low < High: a
// range, port vin 4.5 V to 5.5 V) or the ambient temperature (Part = -1).
type Param struct {
	Part      circuit.PartID
	Tol       float64
	Low, High float64
}

// isRange says p is a drive's range rather than a tolerance.
func (p Param) isRange() bool { return p.High > p.Low }

// step returns how far one unit of position moves part q's value: q's
// value times its tolerance, or half a range's width.
func (p Param) step(q *circuit.Part) float64 {
	if p.isRange() {
		return (p.High - p.Low) / 2
	}
	return q.Value * p.Tol
}

// valueAt returns the value of p's part at position s of [−1, 1]: v·(1 +
// s·tol) for a tolerance; for a range its ends as written at ±1 and the
// point between them elsewhere.
func (p Param) valueAt(v, s float64) float64 {
	if !p.isRange() {
		return v * (1 + s*p.Tol)
	}
	switch s {
	case -1:
		return p.Low
	case 1:
		return p.High
	}
	return p.Low + (s+1)*(p.High-p.Low)/2
}

// Ambient is the ambient temperature range and the nominal temperature
// within it, in °C.
type Ambient struct{ Low, High, Nominal float64 }

// Corner is a point of the box: S[k] in [−1, 1] for each part parameter k
// (its value is v·(1 + S[k]·tol), or a drive's range from its bottom at
// −1 to its top at +1) and the ambient temperature T in °C.
type Corner struct {
	S []float64
	T float64
}

// params lists the parameters of d: every part with a tolerance whose
// kind the worst case varies (circuit.Kind.Toleranced) and every port's drive written as a range, in the order of
// d's parts, and the ambient temperature last when it is a range.
func params(d *circuit.Design, amb Ambient) (ps []Param, hasT bool) {
	var ranges map[circuit.PartID]circuit.DriveRange // nil, and never read, without ranges
	for _, r := range d.DriveRanges {
		if r.High > r.Low {
			if ranges == nil {
				ranges = map[circuit.PartID]circuit.DriveRange{}
			}
			ranges[r.Part] = r
		}
	}
	for i := range d.Parts {
		p := &d.Parts[i]
		if r, ok := ranges[circuit.PartID(i)]; ok {
			ps = append(ps, Param{Part: circuit.PartID(i), Low: r.Low, High: r.High})
			continue
		}
		if p.Tol > 0 && p.Kind.Toleranced() {
			ps = append(ps, Param{Part: circuit.PartID(i), Tol: p.Tol})
		}
	}
	return ps, amb.High > amb.Low
}

// at returns d with every part parameter at its place in c and resistor
// values moved to c.T; scratch, when it holds len(d.Parts) parts, is
// reused for the copy.
func at(d *circuit.Design, ps []Param, c Corner, scratch []circuit.Part) *circuit.Design {
	cp := *d
	cp.Parts = append(scratch[:0], d.Parts...)
	for k, p := range ps {
		q := &cp.Parts[p.Part]
		q.Value = p.valueAt(q.Value, c.S[k])
	}
	for i := range cp.Parts {
		q := &cp.Parts[i]
		if q.Kind == circuit.Resistor {
			q.Value = q.ValueAt(c.T)
		}
	}
	return &cp
}

// Describe names the corner c of d's parameters ps for a message: each
// part off its nominal value with its deviation, and each port's drive
// off the middle of its range with where it is, by name, then the
// temperature when it is a range: "VIN +5 %, R2 −1 %, port vin at 5.50 V
// (top of its range) at 50 °C". At most max parts are named.
func Describe(d *circuit.Design, ps []Param, c Corner, rangeT bool, max int) string {
	type item struct {
		name, text string
	}
	var items []item
	for k, p := range ps {
		if c.S[k] == 0 {
			continue
		}
		q := &d.Parts[p.Part]
		name := d.NameOf(q)
		if !p.isRange() {
			items = append(items, item{name, name + " " + signedPercent(c.S[k]*p.Tol)})
			continue
		}
		where := ""
		switch c.S[k] {
		case -1:
			where = " (bottom of its range)"
		case 1:
			where = " (top of its range)"
		}
		v := p.valueAt(q.Value, c.S[k])
		items = append(items, item{name, "port " + name + " at " + units.Format(v, q.Kind.Info().Value) + where})
	}
	sort.Slice(items, func(a, b int) bool { return items[a].name < items[b].name })
	var parts []string
	for i, it := range items {
		if i == max {
			parts = append(parts, fmt.Sprintf("%d more off nominal", len(items)-max))
			break
		}
		parts = append(parts, it.text)
	}
	s := strings.Join(parts, ", ")
	if s == "" {
		s = "every part at its nominal value"
	}
	if rangeT {
		s += " at " + units.FormatCelsius(c.T)
	}
	return s
}

// signedPercent prints a deviation as "+5 %", "−1 %" or "+0.4 %".
func signedPercent(f float64) string {
	sign := "+"
	if f < 0 {
		sign = "−"
	}
	p := math.Abs(f) * 100
	if math.Abs(p-math.Round(p)) < 1e-9 {
		return fmt.Sprintf("%s%.0f %%", sign, p)
	}
	return fmt.Sprintf("%s%.2g %%", sign, p)
}
