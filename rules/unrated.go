package rules

// unrated.go: ratings the operating point cannot judge are named, never
// skipped silently (unrated-parts); and groups of ideal shorts in
// parallel, whose split the circuit leaves open, are judged on their
// determined total.

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"nodal/circuit"
	"nodal/diag"
	"nodal/solve"
	"nodal/units"
)

// UnratedParts reports the ratings that were not judged: every rating of a
// design that could not be solved, and the ratings of parts whose voltage
// or current the circuit does not determine.
var UnratedParts = &Analyzer{
	Name:     "unrated-parts",
	Severity: diag.Warning,
	Requires: []*Analyzer{Solve, Ratings},
	Doc: `ratings that could not be judged at the operating point
A design that cannot be solved (it has errors that stop it from being
modelled, no ground, contradictory sources, or is too large) has none of its
ratings checked; a part on a section with no DC path to ground has an
undetermined voltage, and an ideal short or voltage source on a loop of
them an undetermined current. The finding names the parts and why, so that
a clean check never hides a rating that was not judged. On a design that
cannot be solved it is left out while another error already fails the
check, and shown once none does.`,
	Run: func(p *Pass) (any, error) {
		s := solved(p)
		d := p.Design
		if s.OP == nil {
			reportUnsolved(p, s)
			return nil, nil
		}
		undetermined := judged(p).Undetermined
		if len(undetermined) == 0 {
			return nil, nil
		}
		pt := s.Point()
		judgedGroup := map[circuit.PartID]bool{}
		for _, g := range s.OP.Groups {
			if _, ok := groupUse(d, g, p.Config.Derating); ok {
				for _, id := range g.Parts {
					judgedGroup[id] = true
				}
			}
		}
		for _, id := range undetermined {
			q := &d.Parts[id]
			qs := pt.Part(id)
			all := qs
			all.VoltageUnknown, all.CurrentUnknown = false, false
			var missed []string
			judged := map[string]bool{}
			for _, u := range Judge(q, qs, p.Config.Derating) {
				judged[u.What] = true
			}
			for _, u := range Judge(q, all, p.Config.Derating) {
				if judged[u.What] || u.What == "current" && judgedGroup[id] {
					continue
				}
				missed = append(missed, u.What)
			}
			if len(missed) == 0 {
				continue
			}
			p.Report(diag.Diagnostic{Pos: q.Pos, End: q.End, Subject: d.NameOf(q),
				Message: fmt.Sprintf("%s's %s %s not judged: %s", d.NameOf(q), joinWords(missed), ratingWord(len(missed)), whyUnknown(p, s.OP, id))})
		}
		return nil, nil
	},
}

func ratingWord(n int) string {
	if n == 1 {
		return "rating was"
	}
	return "ratings were"
}

func joinWords(w []string) string {
	switch len(w) {
	case 1:
		return w[0]
	case 2:
		return w[0] + " and " + w[1]
	}
	return strings.Join(w[:len(w)-1], ", ") + " and " + w[len(w)-1]
}

// whyUnknown says why part id's values are not determined.
func whyUnknown(p *Pass, r *solve.Result, id circuit.PartID) string {
	d := p.Design
	q := &d.Parts[id]
	u := r.Undetermined[id]
	if u&solve.UnknownVoltage != 0 {
		n, nb := q.Ends()
		if r.Floating == nil || !r.Floating[n] {
			n = nb
		}
		return fmt.Sprintf("net %s has no DC path to ground, so the voltage across %s is not determined", netName(d, n), d.NameOf(q))
	}
	for _, g := range r.Groups {
		for _, m := range g.Parts {
			if m == id {
				return fmt.Sprintf("%s is an ideal short in parallel with %s, and how their current divides is not determined; give every one a current rating to have the group judged on its total", d.NameOf(q), otherNames(d, g.Parts, id))
			}
		}
	}
	return fmt.Sprintf("%s is on a loop of ideal shorts and voltage sources, around which any current may circulate, so its current is not determined", d.NameOf(q))
}

func otherNames(d *circuit.Design, ids []circuit.PartID, skip circuit.PartID) string {
	var names []string
	for _, id := range ids {
		if id != skip {
			names = append(names, d.NameOf(&d.Parts[id]))
		}
	}
	return joinWords(names)
}

// reportUnsolved reports, on the design, that none of its ratings were
// judged, naming the rated parts (sorted by name, so that the finding does
// not depend on statement order) and why.
func reportUnsolved(p *Pass, s *SolveResult) {
	d := p.Design
	var rated []circuit.PartID
	for i := range d.Parts {
		if len(Judge(&d.Parts[i], Quantities{}, p.Config.Derating)) > 0 {
			rated = append(rated, circuit.PartID(i))
		}
	}
	if len(rated) == 0 {
		return
	}
	sort.Slice(rated, func(a, b int) bool { return d.NameOf(&d.Parts[rated[a]]) < d.NameOf(&d.Parts[rated[b]]) })
	why := s.NotRun
	switch {
	case s.Skipped != nil:
		why = "the design is too large for this version's solver: " + s.Skipped.Error()
	case s.Err != nil:
		why = "the operating point could not be found: " + s.Err.Error()
	case why == "":
		why = "the operating point was not solved"
	}
	first := &d.Parts[rated[0]]
	dg := diag.Diagnostic{Pos: first.Pos, End: first.End, Subject: d.NameOf(first),
		Message: fmt.Sprintf("ratings not checked on %s: %s", plural(len(rated), "part"), why) + "; not judged: " + partNames(d, rated, 8)}
	for _, id := range rated[1:] {
		if len(dg.Related) == 10 {
			break
		}
		q := &d.Parts[id]
		dg.Related = append(dg.Related, diag.Related{Pos: q.Pos, End: q.End, Message: d.NameOf(q) + "'s ratings were not checked"})
	}
	p.Report(dg)
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// groupUse judges a group of ideal shorts in parallel on what the circuit
// determines: the group's total current against the sum of its members'
// current ratings. A total past that sum overloads at least one member
// however the current divides; a total within it is met by some division,
// but which one the real parts take depends on contact and wire
// resistances the design does not give. The derating limit is the
// smallest of the members'. ok is false when a member has no current
// rating (the group is then not judged; unrated-parts names the members).
func groupUse(d *circuit.Design, g solve.ShortGroup, der Derating) (Use, bool) {
	u := Use{What: "current", Dim: units.Current, Value: math.Abs(g.I)}
	for _, id := range g.Parts {
		q := &d.Parts[id]
		found := false
		for _, x := range Judge(q, Quantities{}, der) {
			if x.What == "current" && x.Dim == units.Current {
				u.Rating += x.Rating
				if x.Limit > 0 && (u.Limit == 0 || x.Limit < u.Limit) {
					u.Limit = x.Limit
				}
				found = true
			}
		}
		if !found {
			return Use{}, false
		}
	}
	u.Frac = u.Value / u.Rating
	return u, true
}

// reportGroups reports the groups of parallel shorts past their summed
// current rating (derated false) or past its derating limit (derated
// true), at the member first by name.
func reportGroups(p *Pass, derated bool) {
	r := op(p)
	if r == nil {
		return
	}
	d := p.Design
	for _, g := range r.Groups {
		u, ok := groupUse(d, g, p.Config.Derating)
		if !ok || derated && !u.Derated() || !derated && !u.Over() {
			continue
		}
		first := &d.Parts[g.Parts[0]]
		names := make([]string, len(g.Parts))
		for i, id := range g.Parts {
			names[i] = d.NameOf(&d.Parts[id])
		}
		msg := fmt.Sprintf("%s in parallel carry %s together, %s of their combined %s rating; how it divides between them is not determined (ideal shorts)",
			joinWords(names), units.Format(u.Value, units.Current), FormatUse(u.Frac, u.Limit), units.Format(u.Rating, units.Current))
		if derated {
			msg += ", past the " + units.FormatPercent(u.Limit) + " derating limit"
		}
		dg := diag.Diagnostic{Pos: first.Pos, End: first.End, Subject: d.NameOf(first), Message: msg}
		for _, id := range g.Parts[1:] {
			q := &d.Parts[id]
			dg.Related = append(dg.Related, diag.Related{Pos: q.Pos, End: q.End, Message: d.NameOf(q) + " is in the group"})
		}
		p.Report(dg)
	}
}
