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
// tolerance) or the ambient temperature (Part = -1).
type Param struct {
	Part circuit.PartID
	Tol  float64
}

// Ambient is the ambient temperature range and the nominal temperature
// within it, in °C.
type Ambient struct{ Low, High, Nominal float64 }

// Corner is a point of the box: S[k] in [−1, 1] for each part parameter k
// (its value is v·(1 + S[k]·tol)) and the ambient temperature T in °C.
type Corner struct {
	S []float64
	T float64
}

// params lists the parameters of d: every resistor and source with a
// tolerance, in statement order, and the ambient temperature last when it
// is a range.
func params(d *circuit.Design, amb Ambient) (ps []Param, hasT bool) {
	for i := range d.Parts {
		p := &d.Parts[i]
		switch p.Kind {
		case circuit.Resistor, circuit.VoltageSource, circuit.CurrentSource,
			circuit.Battery, circuit.CurrentLoad, circuit.PowerLoad:
			if p.Tol > 0 {
				ps = append(ps, Param{Part: circuit.PartID(i), Tol: p.Tol})
			}
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
		q.Value *= 1 + c.S[k]*p.Tol
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
// part off its nominal value with its deviation, by part name, then the
// temperature when it is a range: "VIN +5 %, R2 −1 %, R3 +1 % at 50 °C".
// At most max parts are named.
func Describe(d *circuit.Design, ps []Param, c Corner, rangeT bool, max int) string {
	type item struct {
		name string
		dev  float64
	}
	var items []item
	for k, p := range ps {
		if c.S[k] != 0 {
			items = append(items, item{d.Parts[p.Part].Name, c.S[k] * p.Tol})
		}
	}
	sort.Slice(items, func(a, b int) bool { return items[a].name < items[b].name })
	var parts []string
	for i, it := range items {
		if i == max {
			parts = append(parts, fmt.Sprintf("%d more off nominal", len(items)-max))
			break
		}
		parts = append(parts, it.name+" "+signedPercent(it.dev))
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
