// standin.go: a regulator or converter as two-pin stand-ins the solver
// already models, by its region (common practice, from the energy balance:
// what enters at in leaves at out and common), and their solution read
// back as the part's pin currents and power.

package solve

import (
	"errors"
	"fmt"
	"sort"

	"nodal/circuit"
)

// standIns returns the design with every regulator and converter replaced
// by its stand-ins: the first in its place (same PartID), the others
// appended (s.extras says whose they are).
func (s *multiSolve) standIns() *circuit.Design {
	d := s.d
	sd := *d
	sd.Parts = make([]circuit.Part, len(d.Parts), len(d.Parts)+2*len(s.sup))
	copy(sd.Parts, d.Parts)
	s.extras = s.extras[:0]
	for k := range s.sup {
		st := &s.sup[k]
		p := &d.Parts[st.part]
		sp := p.Kind.Info().Supply
		in, out, com := sp.In, sp.Out, sp.OutRef
		mk := func(kind circuit.Kind, a, b int, v float64) circuit.Part {
			q := circuit.Part{Kind: kind, Local: p.Local, Value: v, Pos: p.Pos, End: p.End, Inst: p.Inst}
			q.Pins[0], q.Pins[1] = p.Pins[a], p.Pins[b]
			return q
		}
		add := func(q circuit.Part, a, b int) {
			sd.Parts = append(sd.Parts, q)
			s.extras = append(s.extras, standIn{owner: st.part, pins: [2]int{a, b}})
		}
		iq := quiescent(p)
		switch {
		case st.region == Backfed && st.conv == circuit.Switched:
			sd.Parts[st.part] = mk(circuit.CurrentSource, out, com, 0)
			add(mk(circuit.CurrentSource, in, com, iq), in, com)
		case st.conv == circuit.Switched:
			sd.Parts[st.part] = mk(circuit.VoltageSource, out, com, p.Value)
			add(mk(circuit.PowerLoad, in, com, st.draw), in, com)
			add(mk(circuit.CurrentSource, in, com, iq), in, com)
		case st.region == InDropout:
			sd.Parts[st.part] = mk(circuit.VoltageSource, in, out, p.Conv.Dropout)
			add(mk(circuit.CurrentSource, in, com, iq), in, com)
		case st.region == Limiting:
			sd.Parts[st.part] = mk(circuit.CurrentSource, in, out, p.Conv.Limit)
			add(mk(circuit.CurrentSource, in, com, iq), in, com)
		case st.region == Backfed:
			sd.Parts[st.part] = mk(circuit.CurrentSource, in, out, 0)
			add(mk(circuit.CurrentSource, in, com, iq), in, com)
		default:
			sd.Parts[st.part] = mk(circuit.VoltageSource, out, com, p.Value)
			add(mk(circuit.CurrentSource, in, com, st.draw), in, com)
		}
	}
	return &sd
}

// mainPins returns the owner's pins that the stand-in in a supply's own
// place joins, by its region.
func (s *multiSolve) mainPins(st *supplyState) [2]int {
	sp := s.d.Parts[st.part].Kind.Info().Supply
	if st.conv == circuit.Linear && st.region != Regulating {
		return [2]int{sp.In, sp.Out} // dropout, limit, back-fed: in to out
	}
	return [2]int{sp.Out, sp.OutRef}
}

// label names a stand-in in the solver's messages by the part it stands
// for: "converter U2's input".
func (s *multiSolve) label(id circuit.PartID) (string, bool) {
	k := int(id) - len(s.d.Parts)
	if k < 0 || k >= len(s.extras) {
		return "", false
	}
	p := &s.d.Parts[s.extras[k].owner]
	return fmt.Sprintf("%s %s's input", p.Kind, s.d.NameOf(p)), true
}

// mapError names the design's parts in an error about the stand-ins.
func (s *multiSolve) mapError(err error) error {
	var e *Error
	if !errors.As(err, &e) {
		return err
	}
	out := *e
	out.Parts = nil
	seen := map[circuit.PartID]bool{}
	for _, id := range e.Parts {
		if k := int(id) - len(s.d.Parts); k >= 0 && k < len(s.extras) {
			id = s.extras[k].owner
		}
		if !seen[id] {
			seen[id] = true
			out.Parts = append(out.Parts, id)
		}
	}
	return &out
}

// result turns the stand-ins' solution rs into the design's: the
// stand-ins' currents summed into each part's pin currents (MultiPoint),
// its power the sum of theirs, which is what it dissipates; its voltage
// and current those across its Ends (for a regulator, out to common, the
// current into out: minus its output current).
func (s *multiSolve) result(rs *Result) *Result {
	d := s.d
	n := len(d.Parts)
	r := *rs
	r.V, r.I, r.P, r.Junction = rs.V[:n:n], rs.I[:n:n], rs.P[:n:n], rs.Junction[:n:n]
	if rs.Uncertified != nil {
		r.Uncertified = rs.Uncertified[:n:n]
	}
	if rs.Undetermined != nil {
		r.Undetermined = rs.Undetermined[:n:n]
	}
	r.Multi = make([]MultiPoint, len(s.sup))
	at := make(map[circuit.PartID]int, len(s.sup))
	bypart := append([]supplyState(nil), s.sup...)
	sort.Slice(bypart, func(a, b int) bool { return bypart[a].part < bypart[b].part }) // MultiAt searches by part
	for k := range bypart {
		st := &bypart[k]
		at[st.part] = k
		mp := &r.Multi[k]
		mp.Part, mp.Region = st.part, st.region
		pins := s.mainPins(st)
		i := st.part
		mp.I[pins[0]] += rs.I[i]
		mp.I[pins[1]] -= rs.I[i]
	}
	for k, x := range s.extras {
		j := n + k
		o := at[x.owner]
		mp := &r.Multi[o]
		mp.I[x.pins[0]] += rs.I[j]
		mp.I[x.pins[1]] -= rs.I[j]
		r.P[x.owner] += rs.P[j]
		if rs.Uncertified != nil && rs.Uncertified[j] {
			r.Uncertified[x.owner] = true
		}
		if rs.Undetermined != nil {
			r.Undetermined[x.owner] |= rs.Undetermined[j]
		}
	}
	for k := range r.Multi {
		mp := &r.Multi[k]
		p := &d.Parts[mp.Part]
		e := p.Kind.Info().Ends
		a, b := p.Ends()
		r.V[mp.Part] = r.NetV[a] - r.NetV[b]
		r.I[mp.Part] = mp.I[e[0]]
		r.Junction[mp.Part] = 0
	}
	return &r
}
