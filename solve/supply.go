// supply.go: parts with more than two pins (regulators, converters): the
// state iteration over each regulator's region, around the settling of
// what each draws from its input rail (draws.go), on the design with every
// such part replaced by two-pin stand-ins (standin.go).

package solve

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"nodal/circuit"
)

// Region is the state a regulator or converter settles in.
type Region uint8

const (
	// Regulating: the output is held at the set voltage above common.
	Regulating Region = iota
	// InDropout: the input is less than the dropout above the set
	// voltage, and the output tracks it: output = input − dropout.
	InDropout
	// Limiting: the output current is held at the limit, the output
	// below the set voltage.
	Limiting
	// Backfed: the rest of the circuit holds the output above the set
	// voltage, or would have it sink current; a linear regulator only
	// sources current, so it delivers none and its output is what the
	// circuit makes it.
	Backfed
)

func (g Region) String() string {
	switch g {
	case InDropout:
		return "dropout"
	case Limiting:
		return "current limit"
	case Backfed:
		return "back-fed"
	}
	return "regulating"
}

// MultiPoint is the operating point of a part with more than two pins.
type MultiPoint struct {
	Part circuit.PartID
	// I is the current flowing into the part at each pin, in its kind's
	// pin order; the currents sum to zero.
	I      [circuit.MaxPins]float64
	Region Region
}

// MultiAt returns the operating point of part id if it has more than two
// pins, else nil.
func (r *Result) MultiAt(id circuit.PartID) *MultiPoint { return r.multiAt(id) }

func (r *Result) multiAt(id circuit.PartID) *MultiPoint {
	if len(r.Multi) == 0 {
		return nil
	}
	k := sort.Search(len(r.Multi), func(k int) bool { return r.Multi[k].Part >= id })
	if k < len(r.Multi) && r.Multi[k].Part == id {
		return &r.Multi[k]
	}
	return nil
}

// Limits of the supply iterations. Each round solves the design at fixed
// regions until every input draw settles (a power tree, where no output
// feeds back to its own input, settles on the second solve: the first
// finds every output current, the second confirms the draws); then the
// regions are judged again.
const (
	maxDrawSolves  = 60
	maxRegionTurns = 40
	// drawTol is how closely a draw must reproduce itself: the
	// solve's own certified accuracy (certTol), not tighter, since a draw
	// read from a solution is known no better than that solution; held
	// to 1e-13, a converter's 305 µW draw behind 100 kΩ swung by 7e-13
	// between two values and never settled in one statement order.
	drawTol = certTol
	// maxDrawGain bounds ‖(S − I)⁻¹‖₁ of the draws' Jacobian that
	// Newton's method on them trusts: how many times a mismatch in the
	// draws a step may multiply.
	maxDrawGain = 1e6
)

// supplyState is the iteration state of one regulator or converter.
type supplyState struct {
	part   circuit.PartID
	conv   circuit.Conversion
	region Region
	// draw is what its stand-in draws from the input rail: a
	// regulator's input current (A) while it regulates, a converter's
	// input power (W).
	draw float64
	iout float64 // the output current of the last solve
}

// standIn is one two-pin part standing for a piece of a part with more
// pins: its owner and the owner's pins it joins.
type standIn struct {
	owner circuit.PartID
	pins  [2]int
}

// multiSolve solves a design with parts of more than two pins.
type multiSolve struct {
	d      *circuit.Design
	sup    []supplyState
	extras []standIn // the stand-ins appended after the design's parts
}

// hasMulti reports whether d has a part with more than two pins.
func hasMulti(d *circuit.Design) bool {
	for i := range d.Parts {
		if d.Parts[i].Multi() {
			return true
		}
	}
	return false
}

// solveMulti finds the operating point of a design with regulators or
// converters. Each is replaced by two-pin stand-ins that the solver
// already models, according to its region:
//
//   - a regulator regulating: a fixed voltage, the set voltage, from out to
//     common, and a current from in to common equal to its output current
//     plus its quiescent current (common practice, from the energy
//     balance: what enters at in leaves at out and, the quiescent part, at
//     common);
//   - in dropout: a fixed voltage, the dropout, from in to out (the output
//     tracks the input), and the quiescent current from in to common;
//   - in current limit: the limit current from in to out, and the
//     quiescent current from in to common;
//   - back-fed (the circuit would have its output sink current, or holds
//     it above the set voltage; a linear regulator only sources): no
//     current from in to out, and the quiescent current from in to common;
//   - a converter: the set voltage from out to common, a constant-power
//     load from in to common drawing the output power divided by the
//     efficiency, and the quiescent current from in to common, so that
//     its input power is Vout·Iout/η + Vin·Iq (energy balance).
//
// The output current a stand-in draws on depends on the solution, so the
// draws are iterated to a fixed point (settleDraws): each solve holds the
// draws of the last, as the constant-power loads' currents are held
// (load.go), and Newton's method takes over where that does not settle at
// once. Around that, a state
// iteration over the regions: after the draws settle, a regulator whose
// region does not hold at the solution (regulating with less than the
// dropout across it, past its limit, or sinking current; tracking its
// input above its set voltage; limiting above its set voltage or into
// dropout; back-fed with its output below its set voltage) moves to the
// region that does, and the design is solved again. It terminates: an
// assignment of regions is never tried twice (a repeat is reported as no
// convergence) and there are finitely many, 4 to the number of
// regulators; maxRegionTurns bounds the turns taken. A converter has one
// region: outside its input range it is modelled as still regulating, and
// the rules say that it does not.
func solveMulti(d *circuit.Design, opt *Options) (*Result, error) {
	s := &multiSolve{d: d}
	for i := range d.Parts {
		p := &d.Parts[i]
		if !p.Multi() {
			continue
		}
		ki := p.Kind.Info()
		if ki.Supply == nil || ki.Converts == circuit.NoConversion || p.Conv == nil {
			return nil, &Error{Kind: BadPart, Parts: []circuit.PartID{circuit.PartID(i)},
				Msg: fmt.Sprintf("%s %s: the solver has no model for a %s", p.Kind, d.NameOf(p), p.Kind)}
		}
		st := supplyState{part: circuit.PartID(i), conv: ki.Converts}
		if st.conv == circuit.Linear {
			st.draw = quiescent(p)
		}
		s.sup = append(s.sup, st)
	}
	// In name order, so that messages name them, and stand-ins are
	// appended, whatever the order of the statements (names are unique).
	names := make(map[circuit.PartID]string, len(s.sup))
	for _, st := range s.sup {
		names[st.part] = d.PartName(st.part)
	}
	sort.Slice(s.sup, func(a, b int) bool { return names[s.sup[a].part] < names[s.sup[b].part] })
	o := *opt
	o.label = s.label
	tried := map[string]bool{}
	iters := 0
	for turn := 0; ; turn++ {
		tried[s.regions()] = true
		rs, settled, err := s.settleDraws(&o, &iters)
		var se *Error
		if errors.As(err, &se) && se.Kind == Singular && turn > 0 {
			// A regulator out of regulation ties its output to its
			// input (in dropout) or fixes its current (in limit), which
			// the rest of the circuit can contradict: then no region
			// holds. Which part the solver found closing the
			// contradiction depends on the order of the statements; the
			// regulators out of regulation do not.
			var parts []circuit.PartID
			var names []string
			for k := range s.sup {
				if st := &s.sup[k]; st.region != Regulating {
					parts = append(parts, st.part)
					names = append(names, d.PartName(st.part)+" ("+st.region.String()+")")
				}
			}
			return nil, &Error{Kind: Singular, Parts: parts,
				Msg: fmt.Sprintf("no operating point: %s cannot hold %s output, and out of regulation the rest of the circuit contradicts %s (%s)",
					s.names(), plural(len(s.sup), "its", "their"), plural(len(parts), "it", "them"), strings.Join(names, ", "))}
		}
		if err != nil {
			return nil, err
		}
		if !settled {
			return nil, &Error{Kind: NoConvergence, Parts: s.parts(),
				Msg: fmt.Sprintf("what %s draw from their input rails does not settle: no draw balances what they deliver", s.names())}
		}
		if !s.judgeRegions(rs) {
			r := s.result(rs)
			r.Iterations = iters
			if r.Undetermined != nil {
				if err := s.undeterminedDraw(r); err != nil {
					return nil, err
				}
				// The currents the circuit leaves open read 0, so
				// Kirchhoff's law is no longer met at their nets: the
				// stand-ins' solve checked it before they were cleared.
				return r, nil
			}
			r.KCL, r.KCLScale, r.PowerSum, r.PowerScale = 0, 0, 0, 0
			return r, r.selfCheck(d)
		}
		if key := s.regions(); tried[key] || turn >= maxRegionTurns {
			return nil, &Error{Kind: NoConvergence, Parts: s.parts(),
				Msg: fmt.Sprintf("the regions of %s (regulating, dropout, current limit, back-fed) did not settle: %s came round again", s.names(), s.describeRegions())}
		}
	}
}

func plural(n int, one, more string) string {
	if n == 1 {
		return one
	}
	return more
}

// undeterminedDraw returns an error when the circuit leaves a supply's
// output current open (its output tied to another part that holds a
// voltage, with equal voltages): then what it draws from its input rail,
// and the current of every part upstream, are not determined either,
// and no figure of theirs can be given as checked.
func (s *multiSolve) undeterminedDraw(r *Result) error {
	var parts []circuit.PartID
	for k := range s.sup {
		if id := s.sup[k].part; r.Undetermined[id]&UnknownCurrent != 0 {
			parts = append(parts, id)
		}
	}
	if len(parts) == 0 {
		return nil
	}
	var names []string
	for _, id := range parts {
		names = append(names, s.d.PartName(id))
	}
	return &Error{Kind: Singular, Parts: parts,
		Msg: fmt.Sprintf("the circuit does not fix how much of the load %s %s (%s output is tied to another part that holds the same voltage), so what %s from %s, and the currents upstream, are not determined",
			strings.Join(names, " and "), plural(len(parts), "carries", "carry"), plural(len(parts), "its", "each"), plural(len(parts), "it draws", "they draw"), plural(len(parts), "its input rail", "their input rails"))}
}

// quiescent returns a regulator's or converter's quiescent current.
func quiescent(p *circuit.Part) float64 {
	if p.Conv == nil {
		return 0
	}
	return p.Conv.Quiescent
}

// regions is the assignment of regions, as a key.
func (s *multiSolve) regions() string {
	b := make([]byte, len(s.sup))
	for k := range s.sup {
		b[k] = '0' + byte(s.sup[k].region)
	}
	return string(b)
}

func (s *multiSolve) describeRegions() string {
	var out []string
	for k := range s.sup {
		out = append(out, s.d.PartName(s.sup[k].part)+" "+s.sup[k].region.String())
	}
	return strings.Join(out, ", ")
}

func (s *multiSolve) parts() []circuit.PartID {
	out := make([]circuit.PartID, len(s.sup))
	for k := range s.sup {
		out[k] = s.sup[k].part
	}
	return out
}

func (s *multiSolve) names() string {
	var out []string
	for k := range s.sup {
		out = append(out, s.d.PartName(s.sup[k].part))
	}
	if len(out) > 8 {
		out = append(out[:8], fmt.Sprintf("%d more", len(out)-8))
	}
	return strings.Join(out, ", ")
}

// judgeRegions moves every regulator whose region does not hold at the
// solution rs to the one that does, and reports whether any moved.
func (s *multiSolve) judgeRegions(rs *Result) bool {
	moved := false
	for k := range s.sup {
		st := &s.sup[k]
		p := &s.d.Parts[st.part]
		sp := p.Kind.Info().Supply
		vin := rs.NetV[p.Pins[sp.In]]
		vout := rs.NetV[p.Pins[sp.Out]]
		vcom := rs.NetV[p.Pins[sp.OutRef]]
		scale := math.Max(math.Max(math.Abs(vin), math.Abs(vout)), math.Max(math.Abs(vcom), math.Abs(p.Value)))
		tol := 1e-9*scale + 1e-12
		head := vin - vout // across the pass element
		set := vout - vcom
		lim := p.Conv.Limit
		over := lim > 0 && st.iout > lim*(1+1e-9)
		// Sinking: current into the output, past rounding.
		sinking := st.iout < -(1e-9*(math.Abs(st.draw)+lim) + 1e-15)
		next := st.region
		switch {
		case st.conv == circuit.Switched:
			// A converter regulates or, made to sink, is back-fed (taken
			// as delivering nothing, as most do).
			switch {
			case st.region == Regulating && sinking:
				next = Backfed
			case st.region == Backfed && set < p.Value-tol:
				next = Regulating
			}
		case st.region == Regulating:
			switch {
			case head < p.Conv.Dropout-tol:
				next = InDropout
			case over:
				next = Limiting
			case sinking:
				next = Backfed
			}
		case st.region == InDropout:
			switch {
			case set > p.Value+tol:
				next = Regulating
			case over:
				next = Limiting
			case sinking:
				next = Backfed
			}
		case st.region == Backfed:
			if set < p.Value-tol {
				next = Regulating
			}
		case st.region == Limiting:
			switch {
			case set > p.Value+tol:
				next = Regulating
			case head < p.Conv.Dropout-tol:
				next = InDropout
			}
		}
		if next != st.region {
			st.region = next
			moved = true
		}
	}
	return moved
}
