package report

// railtext.go: the power tree in the text form, drawn with box-drawing
// branches: each supply on two lines (the rail it holds and what it
// delivers; what it takes and loses), then the supplies and parts its rail
// feeds, one branch each.

import (
	"bufio"
	"strconv"

	"nodal/output"
	"nodal/rules"
	"nodal/solve"
	"nodal/units"
)

// writeRails writes the power tree, when the design has a supply.
func (t *Table) writeRails(bw *bufio.Writer) {
	if len(t.Rails) == 0 {
		return
	}
	bw.WriteString("\nRails: each supply, the rail it holds, and what the rail feeds, worst use first\n")
	hot := false
	for _, s := range t.Rails {
		hot = writeSupply(bw, s, "  ", "  ") || hot
	}
	bw.WriteString("Currents under a rail are taken from its net and add up to what its\n" +
		"supplies deliver (Kirchhoff's current law); powers are each part's own.\n")
	if t.OffRail > 0 {
		bw.WriteString(plural(t.OffRail, "part is", "parts are") + " not in the tree: on no rail, or further than " +
			strconv.Itoa(maxDepth) + " parts from one.\n")
	}
	if hot {
		bw.WriteString("A supply's loss is heat in it: a regulator can run hot enough to burn\n" +
			"or to fail. Check each against its datasheet's thermal limits; nodal\n" +
			"is a design aid, not a sign-off.\n")
	}
}

// writeSupply writes s and everything under it: first prefixes its own
// line, rest the lines below it. It reports whether any supply written
// loses power.
func writeSupply(bw *bufio.Writer, s *Supply, first, rest string) bool {
	bw.WriteString(first + supplyHead(s) + "\n")
	cont := rest + "   "
	if len(s.Feeds)+len(s.Loads) > 0 {
		cont = rest + "│  "
	}
	if !s.Loop {
		bw.WriteString(cont + supplyTakes(s) + "\n")
	}
	// Heat worth a note: a loss in a supply fed from a rail of the design
	// (a battery's has its own note, and a port's is outside the design).
	hot := s.Judged && s.Input != "" && !s.Flow.CurrentUnknown && !s.Flow.VoltageUnknown && s.Flow.Loss > 0
	return writeBranches(bw, s.Feeds, s.Loads, rest) || hot
}

// writeBranches writes the supplies and parts fed from one rail or net,
// one branch each, below a line whose continuation prefix is rest.
func writeBranches(bw *bufio.Writer, feeds []*Supply, loads []*Load, rest string) bool {
	hot := false
	kids := len(feeds) + len(loads)
	for i := 0; i < kids; i++ {
		branch, next := "├─ ", "│  "
		if i == kids-1 {
			branch, next = "└─ ", "   "
		}
		if i < len(feeds) {
			hot = writeSupply(bw, feeds[i], rest+branch, rest+next) || hot
			continue
		}
		l := loads[i-len(feeds)]
		bw.WriteString(rest + branch + loadLine(l) + "\n")
		hot = writeBranches(bw, l.Feeds, l.Loads, rest+next) || hot
	}
	return hot
}

// supplyHead is a supply's first line: the rail it holds and what it
// delivers into it.
func supplyHead(s *Supply) string {
	h := output.LineSafe(s.Name) + " (" + s.Kind.String() + ") holds " + output.TextSafe(s.Rail)
	f := &s.Flow
	switch {
	case !s.Judged:
	case f.VoltageUnknown:
		h += " at an " + undetermined + " voltage"
	default:
		h += " at " + units.Format(f.VOut, units.Voltage)
	}
	if !s.RefGround {
		h += " against " + output.TextSafe(s.Ref)
	}
	if s.Judged && s.Flow.HasRegion && s.Flow.Region != solve.Regulating {
		// Out of regulation: its output is not the value it was set to.
		state := "in dropout"
		if s.Flow.Region == solve.Limiting {
			state = "at its current limit"
		}
		h += " (" + state + "; set to " + units.Format(s.Set, units.Voltage) + ")"
	}
	if s.Loop {
		return h + " (drawn above: these supplies feed each other in a loop)"
	}
	if s.InLoop {
		h += " (in a loop of supplies that feed each other)"
	}
	switch {
	case !s.Judged:
		h += ": what it delivers could not be judged"
	case f.CurrentUnknown:
		h += ": delivers an " + undetermined + " current"
	case f.VoltageUnknown:
		h += ": delivers " + units.Format(f.IOut, units.Current)
	default:
		h += ": delivers " + units.Format(f.IOut, units.Current) + ", " + units.Format(f.POut, units.Power)
	}
	return h + useText(s.Use, s.HasUse)
}

// supplyTakes is a supply's second line: where its power comes from and
// what it loses.
func supplyTakes(s *Supply) string {
	f := &s.Flow
	var l string
	switch {
	case !s.Judged:
		l = "what it takes and loses could not be judged at this operating point"
		if s.Input != "" {
			l = "draws from " + output.TextSafe(s.Input) + "; " + l
		}
	case f.CurrentUnknown || f.VoltageUnknown:
		l = "what it takes and loses is " + undetermined
		if s.Input != "" {
			l = "draws from " + output.TextSafe(s.Input) + "; " + l
		}
	case s.Input != "":
		l = "takes " + units.Format(f.IIn, units.Current) + ", " + units.Format(f.PIn, units.Power) + " from " + output.TextSafe(s.Input)
	default:
		l = "converts " + units.Format(f.Taken, units.Power) + " of its own"
	}
	if s.Judged && !f.CurrentUnknown && !f.VoltageUnknown {
		l += "; loses " + units.Format(f.Loss, units.Power)
		if f.HasEfficiency {
			l += ", " + Efficiency(f.Efficiency) + " efficient"
		}
	}
	if s.Unfed {
		l += " (no supply drives " + output.TextSafe(s.Input) + ")"
	}
	if s.Alongside != "" {
		l += "; the rail's parts are listed under " + output.TextSafe(s.Alongside)
	}
	return l
}

// loadLine is one part on a rail.
func loadLine(l *Load) string {
	s := output.LineSafe(l.Name) + " (" + l.Kind.String() + ") takes "
	if l.CurrentUnknown {
		s += "an " + undetermined + " current"
	} else {
		s += units.Format(l.Current, units.Current)
	}
	for k, n := range l.Towards {
		if k == 0 {
			s += " towards "
		} else {
			s += ", "
		}
		s += output.TextSafe(n)
	}
	if l.CurrentUnknown || l.VoltageUnknown {
		s += ", power " + undetermined
	} else {
		s += ", absorbs " + units.Format(l.Power, units.Power)
	}
	return s + useText(l.Use, l.HasUse)
}

// useText is ", 24 % of its 500 mA current rating", with a mark past the
// derating limit or the rating; "" for a part with no rating.
func useText(u rules.Use, ok bool) string {
	if !ok {
		return ""
	}
	s := ", " + rules.FormatUse(u.Frac, u.Limit) + " of its " + units.Format(u.Rating, u.Dim) + " " + u.What + " rating"
	switch {
	case u.Over():
		s += " ▶ past it"
	case u.Derated():
		s += " (past its " + units.FormatPercent(u.Limit) + " derating limit)"
	}
	return s
}

// Efficiency prints a fraction as a percentage to a tenth: "97.7 %".
func Efficiency(f float64) string { return strconv.FormatFloat(f*100, 'f', 1, 64) + " %" }

// plural is "1 part touches" or "3 parts touch".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}
