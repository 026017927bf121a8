// Package report turns a solved DC operating point into the table that
// "nodal report" prints for a person, and into its JSON form for scripts.
//
// # Sign convention
//
// A part's voltage is V(first pin) − V(second pin), its pins in the order
// its kind lists them; its current flows from the first pin to the second
// through the part; its power is voltage times current, positive when the
// part absorbs energy and negative when it delivers it (a supply driving a
// load). These are the values of package solve. A part with more than two
// pins (a regulator) gives its voltage and current across the two pins its
// kind's Ends name (out to common), and as power what it dissipates in
// all.
//
// # Use of a rating
//
// Every rating written on a part is compared with the operating point the
// way the rating rules compare it, by the same function (rules.Judge): a resistor's power, an
// LED's forward current and reverse voltage, a capacitor's voltage, a
// fuse's current against its value. A part's use is the largest of those
// fractions; parts are listed worst first, and parts with no rating last,
// in the order the design gives them.
//
// # Power tree
//
// The rails section (rails.go) draws every supply-like part (its kind's
// Supply in the kinds table), the rail it holds, and the supplies and
// parts that rail feeds, with the figures of rules.SupplyFlow.
package report

import (
	"math"
	"sort"
	"strconv"

	"nodal/circuit"
	"nodal/rules"
	"nodal/solve"
	"nodal/units"
)

// Net is one net's solved voltage (volts, against the design's ground).
type Net struct {
	Name    string
	Voltage float64
	// Undetermined: the net has no DC path to ground, so its voltage is
	// not fixed by the circuit (Voltage reads 0).
	Undetermined bool
	// Low … High is the net's voltage range over tolerances and
	// temperature, when HasRange (see AddWorst).
	Low, High float64
	HasRange  bool
}

// Group is a group of ideal shorts in parallel (solve.ShortGroup): the
// current through them together is determined, its split is not.
type Group struct {
	Parts   []string // by name
	Current float64  // from the first member's first pin to its second
}

// Rating is one rating of a part and the use the operating point makes of
// it, as the rating rules judge it (rules.Judge): Frac is Value / Rating,
// Limit the derating limit.
type Rating = rules.Use

// Part is one part at the operating point.
type Part struct {
	Name    string
	Kind    circuit.Kind
	Voltage float64 // V(first pin) − V(second pin)
	Current float64 // from the first pin to the second through the part
	Power   float64 // positive when absorbed
	Ratings []Rating
	// Worst indexes the rating with the largest use, or is -1 when the
	// part has no rating.
	Worst int
	// VoltageUnknown and CurrentUnknown say that the circuit does not
	// fix the part's voltage or current (they read 0, and the ratings
	// that need them are not judged: see rules.Quantities).
	VoltageUnknown, CurrentUnknown bool
	// Capacity is a battery's capacity in coulombs (0 for none given),
	// and Runtime how long it lasts at the operating point's discharge
	// current, in seconds: capacity ÷ current, a simple estimate that
	// ignores rate, temperature and age. 0 when it is not discharging.
	Capacity, Runtime float64
	// WorstUse is the largest use of any rating over tolerances and
	// temperature, and WorstAt the corner that reaches it, when HasWorst.
	WorstUse float64
	WorstAt  string
	HasWorst bool
	// DriveRange is the range of a port's drive written LOW to HIGH (V or
	// A), whose middle the operating point takes; nil for other parts.
	DriveRange *[2]float64
}

// Use returns the largest fraction of any rating, and false when the part
// has none.
func (p *Part) Use() (float64, bool) {
	if p.Worst < 0 {
		return 0, false
	}
	return p.Ratings[p.Worst].Frac, true
}

// Level says how close a use is to its rating.
type Level uint8

const (
	Unrated Level = iota // no rating
	Within               // within the rating and its derating limit
	Derated              // past the derating limit, within the rating
	Over                 // past the rating
)

// Level returns how close the part's worst rating is to being exceeded.
// The derating limit of every rating counts, not only the worst one's.
func (p *Part) Level() Level {
	if p.Worst < 0 {
		return Unrated
	}
	lv := Within
	for _, r := range p.Ratings {
		switch {
		case r.Over():
			return Over
		case r.Derated():
			lv = Derated
		}
	}
	return lv
}

// Table is a design's operating point, ready to print.
type Table struct {
	File   string // as the user named it
	Design string // the design's name, if it gives one
	Title  string
	// Temperature of the junctions in kelvin: the nominal ambient.
	Temperature float64
	// Ambient is the ambient temperature range the design is judged over.
	Ambient rules.Ambient `json:"-"`
	Nets    []Net         // in the order the design first uses them
	Parts   []Part        // worst first
	// Undriven is true when no source in the design has a non-zero value
	// (its supply comes in through ports, say): every value is then 0.
	Undriven bool
	// HasRanges says the nets carry their range over tolerances and
	// temperature, found at every corner when RangeCorners, to first
	// order otherwise.
	HasRanges, RangeCorners bool
	// DriveRanges says a port's drive is written as a range, which the
	// nets' ranges and the worst case cover too.
	DriveRanges bool `json:"-"`
	// Groups are the groups of ideal shorts in parallel, by the name of
	// their first member.
	Groups []Group
	// Rails is the power tree (rails.go): the supplies fed by no other,
	// by name, each with what its rail feeds. OffRail counts the parts
	// the tree does not reach.
	Rails   []*Supply
	OffRail int
}

// New builds the table of design d solved as r. der gives the derating
// limits the colours of the text form follow.
func New(file string, d *circuit.Design, r *solve.Result, der rules.Derating) *Table {
	return NewAt(file, d, r, der, rules.AmbientOf(d, nil))
}

// NewAt is New for a design solved at ambient temperature amb.Nominal and
// judged over amb.
func NewAt(file string, d *circuit.Design, r *solve.Result, der rules.Derating, amb rules.Ambient) *Table {
	t := &Table{File: file, Design: d.Name, Title: d.Title, Temperature: units.Kelvin(amb.Nominal), Ambient: amb}
	pt := rules.NewPoint(r).At(amb.Nominal)
	for i := range d.Nets {
		if d.Nets[i].Pins == 0 {
			continue // declared but never used: it has no voltage
		}
		t.Nets = append(t.Nets, Net{Name: d.NetName(circuit.NetID(i)), Voltage: pt.Net(circuit.NetID(i)),
			Undetermined: r.Floating != nil && r.Floating[i]})
	}
	t.Undriven = true
	t.Parts = make([]Part, len(d.Parts))
	uses := make([][]rules.Use, len(d.Parts))
	for i := range d.Parts {
		q := &d.Parts[i]
		if dc := q.DC(); (dc.Model == circuit.VoltageDrop || dc.Model == circuit.CurrentFlow) && q.Value != 0 || dc.E != 0 {
			t.Undriven = false
		}
		// The values the rating rules judge, by the same function.
		qs := pt.Part(circuit.PartID(i))
		p := Part{Name: d.NameOf(q), Kind: q.Kind, Voltage: qs.V, Current: qs.I, Power: qs.P,
			VoltageUnknown: qs.VoltageUnknown, CurrentUnknown: qs.CurrentUnknown}
		p.Ratings = rules.Judge(q, qs, der)
		if p.Capacity = q.Capacity; p.Capacity > 0 && qs.I < 0 {
			p.Runtime = p.Capacity / -qs.I // its current flows out of its first pin
		}
		p.Worst = rules.Worst(p.Ratings)
		if r, ok := d.RangeOf(circuit.PartID(i)); ok {
			p.DriveRange = &[2]float64{r.Low, r.High}
		}
		t.Parts[i], uses[i] = p, p.Ratings
	}
	t.Rails, t.OffRail = buildRails(d, pt, uses)
	for _, g := range r.Groups {
		var names []string
		for _, id := range g.Parts {
			names = append(names, d.PartName(id))
		}
		t.Groups = append(t.Groups, Group{Parts: names, Current: rules.Clean(g.I, 0, rules.FloorI)})
	}
	sort.SliceStable(t.Parts, func(a, b int) bool {
		ua, oka := t.Parts[a].Use()
		ub, okb := t.Parts[b].Use()
		if oka != okb {
			return oka
		}
		return ua > ub
	})
	return t
}

// round keeps ten significant figures, far more than any part's tolerance,
// so that the JSON form does not change with the last bits of a float.
func round(v float64) float64 {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 10, 64), 64)
	return r
}
